"""holostring: holographic confinement from a background formula.

Three lines in a notebook::

    import holostring as hs
    bg = hs.load_background("soft-wall", c=0.5)
    hs.diagnose(bg).string_tension

Names are imported lazily, so ``import holostring`` and the CLI start fast.
"""

from __future__ import annotations

import importlib
from typing import Any

from holostring.provenance import package_version

__version__ = package_version()

#: public name -> module that defines it
_EXPORTS: dict[str, str] = {
    "Background": "holostring.background",
    "Parameter": "holostring.background",
    "load_background": "holostring.background",
    "diagnose": "holostring.background.diagnostics",
    "Diagnostics": "holostring.background.diagnostics",
    "HolostringError": "holostring.errors",
    "InputError": "holostring.errors",
    "BackgroundFileError": "holostring.errors",
    "ConvergenceError": "holostring.errors",
    "compute_potential": "holostring.strings",
    "PotentialResult": "holostring.strings",
    "string_profile": "holostring.strings",
    "solve_spectrum": "holostring.spectra",
    "SpectrumResult": "holostring.spectra",
    "fit_regge": "holostring.spectra",
    "mass_squared_gradient": "holostring.spectra",
    "compute_transition": "holostring.thermo",
    "compute_screening": "holostring.thermo",
    "calibrate": "holostring.fit.calibrate",
    "load_targets": "holostring.fit.targets",
    "analyze": "holostring.workflow",
    "run_scan": "holostring.scan",
    "ScanResult": "holostring.scan",
    "thermal_family": "holostring.thermo",
    "TransitionResult": "holostring.thermo",
    "ScreeningResult": "holostring.thermo",
}

__all__ = ["__version__", *sorted(_EXPORTS)]


def __getattr__(name: str) -> Any:
    module = _EXPORTS.get(name)
    if module is None:
        raise AttributeError(f"module 'holostring' has no attribute '{name}'")
    return getattr(importlib.import_module(module), name)


def __dir__() -> list[str]:
    return __all__
