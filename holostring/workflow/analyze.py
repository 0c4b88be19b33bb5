"""Run every analysis that applies to a background and collect the results.

Order: (calibration, if targets are given: the rest then runs at the calibrated parameters, in
physical units) -> symbolic diagnostics -> V(L) -> spectra of every channel the background
supports -> Hawking-Page and screening where a black-brane partner exists. An analysis that does
not apply is recorded in ``skipped`` with its reason; one that fails numerically is recorded with
its message, and the others still run.
"""

from __future__ import annotations

import time
from collections.abc import Callable
from dataclasses import dataclass, field
from typing import Any

from holostring.errors import ConvergenceError, HolostringError, NotApplicableError

#: the analysis steps, in order, with a human label (for progress display)
STEPS = ("calibration", "diagnostics", "potential", "spectra", "temperature")


@dataclass(frozen=True)
class AnalysisResult:
    """Everything ``analyze`` computed for one background.

    Attributes
    ----------
    background
        The background analysed (at the calibrated parameters when targets were given).
    diagnostics, potential, spectra, transition, screening, calibration
        Result objects of each analysis (``None`` / empty where skipped).
    skipped
        analysis -> reason it did not run or failed.
    settings
        Options used (states, points, scheme...).
    timings
        analysis -> seconds.
    """

    background: Any
    diagnostics: Any
    potential: Any = None
    spectra: dict[str, Any] = field(default_factory=dict)
    transition: Any = None
    screening: Any = None
    calibration: Any = None
    skipped: dict[str, str] = field(default_factory=dict)
    settings: dict[str, Any] = field(default_factory=dict)
    timings: dict[str, float] = field(default_factory=dict)

    @property
    def converged(self) -> bool:
        """True when every result that was computed reports convergence."""
        parts = [self.potential, self.transition, self.screening, self.calibration, *self.spectra.values()]
        return all(getattr(p, "converged", True) for p in parts if p is not None)


def analyze(
    background: Any,
    *,
    targets: Any = None,
    states: int = 10,
    points: int = 200,
    scheme: str = "uv-pole",
    progress: Callable[[str, int, int], None] | None = None,
) -> AnalysisResult:
    """Run every applicable analysis on ``background``.

    Parameters
    ----------
    background
        A :class:`~holostring.background.Background`.
    targets
        Optional :class:`~holostring.fit.targets.TargetSet`: calibrate first, then analyse the
        calibrated model in physical units.
    states
        Number of states per spectral channel.
    points
        Number of separations for V(L).
    scheme
        Regularisation scheme of V(L).
    progress
        Called as ``progress(step_label, done, total)`` before each step.

    Returns
    -------
    AnalysisResult
    """
    from holostring.background.diagnostics import diagnose

    bg = background
    skipped: dict[str, str] = {}
    timings: dict[str, float] = {}
    channel_names = _channels(bg)
    total = 4 + len(channel_names) + (1 if targets is not None else 0)
    done = 0

    def step(label: str) -> None:
        nonlocal done
        if progress is not None:
            progress(label, done, total)
        done += 1

    calibration = None
    if targets is not None:
        step("calibration")
        from holostring.fit.calibrate import calibrate

        calibration = _timed(timings, "calibration", lambda: calibrate(bg, targets))
        bg = bg.with_units(targets.energy_unit).with_params(**calibration.parameters)

    step("diagnostics")
    diagnostics = _timed(timings, "diagnostics", lambda: diagnose(bg))

    step("potential")
    potential = _attempt(skipped, timings, "potential", lambda: _potential(bg, points, scheme))

    spectra: dict[str, Any] = {}
    for name in channel_names:
        step(f"spectrum {name}")
        res = _attempt(skipped, timings, f"spectrum:{name}", lambda name=name: _spectrum(bg, name, states))
        if res is not None:
            spectra[name] = res

    step("Hawking-Page")
    transition = _attempt(skipped, timings, "transition", lambda: _transition(bg))
    step("screening")
    screening = _attempt(skipped, timings, "screening", lambda: _screening(bg, transition))
    if progress is not None:
        progress("done", total, total)
    return AnalysisResult(
        background=bg,
        diagnostics=diagnostics,
        potential=potential,
        spectra=spectra,
        transition=transition,
        screening=screening,
        calibration=calibration,
        skipped=skipped,
        settings={"states": states, "points": points, "scheme": scheme},
        timings=timings,
    )


def _channels(bg: Any) -> list[str]:
    from holostring.spectra import available_channels

    return list(available_channels(bg))


def _potential(bg: Any, points: int, scheme: str) -> Any:
    from holostring.strings import compute_potential

    return compute_potential(bg, points=points, scheme=scheme)


def _spectrum(bg: Any, name: str, states: int) -> Any:
    from holostring.spectra import solve_spectrum

    return solve_spectrum(bg, name, states=states)


def _transition(bg: Any) -> Any:
    from holostring.thermo import compute_transition

    return compute_transition(bg)


def _screening(bg: Any, transition: Any) -> Any:
    from holostring.thermo import compute_screening

    return compute_screening(bg, transition=transition)


def _timed(timings: dict[str, float], key: str, fn: Callable[[], Any]) -> Any:
    t0 = time.perf_counter()
    try:
        return fn()
    finally:
        timings[key] = time.perf_counter() - t0


def _attempt(skipped: dict[str, str], timings: dict[str, float], key: str, fn: Callable[[], Any]) -> Any:
    try:
        return _timed(timings, key, fn)
    except NotApplicableError as err:
        skipped[key] = f"does not apply: {err}"
    except ConvergenceError as err:
        skipped[key] = f"did not converge: {err}"
        return err.partial
    except HolostringError as err:
        skipped[key] = f"failed: {err}"
    return None
