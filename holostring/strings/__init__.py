"""Static strings: the quark-antiquark potential V(L) on every background, with its analysis.

Three lines in a notebook::

    import holostring as hs
    res = hs.compute_potential(hs.load_background("soft-wall", c=1.0))
    res.string_tension, res.r0, res.V
"""

from holostring.strings.compute import compute_potential
from holostring.strings.profile import profiles_along, string_profile
from holostring.strings.results import (
    CornellFit,
    PotentialResult,
    ProfileResult,
    StringBranch,
    StringProfile,
)
from holostring.strings.schemes import SCHEME_HELP, Scheme

__all__ = [
    "SCHEME_HELP",
    "CornellFit",
    "PotentialResult",
    "ProfileResult",
    "Scheme",
    "StringBranch",
    "StringProfile",
    "compute_potential",
    "profiles_along",
    "string_profile",
]
