"""Temperature: black-brane partners, Hawking-Page deconfinement and screening versus T.

Public API::

    from holostring.thermo import compute_transition, compute_screening, thermal_family
    res = compute_transition(load_background("soft-wall", c=1.0))
    res.critical_temperature          # 0.4917... sqrt(c)
"""

from __future__ import annotations

from holostring.thermo.hawking_page import compute_transition
from holostring.thermo.partners import ThermalFamily, thermal_family
from holostring.thermo.results import ScreeningResult, TransitionResult
from holostring.thermo.screening import compute_screening

__all__ = [
    "ScreeningResult",
    "ThermalFamily",
    "TransitionResult",
    "compute_screening",
    "compute_transition",
    "thermal_family",
]
