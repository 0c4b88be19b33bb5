"""Numeric sanity checks of a background on its domain, at the current parameter values."""

from __future__ import annotations

import math

import numpy as np

from holostring.background.model import Background, IRKind
from holostring.errors import InputError


def sample_domain(bg: Background, n: int = 400) -> np.ndarray:
    """Points spread over (0, z_IR), geometrically near the boundary, excluding the end points."""
    z_ir = bg.z_ir
    if math.isinf(z_ir):
        return np.geomspace(1e-4, 1e3, n)
    if z_ir <= 0:
        raise InputError("ir.at", f"the IR end must lie at z > 0 (got {z_ir:g})")
    head = np.geomspace(1e-4 * z_ir, 0.5 * z_ir, n // 2)
    tail = z_ir * (1.0 - np.geomspace(0.5, 1e-6, n - n // 2))
    return np.concatenate([head, tail])


def check_metric(bg: Background) -> None:
    """Refuse a metric component that vanishes, turns negative or is not finite inside the domain.

    Raises
    ------
    InputError
        Naming the component, the point z and the parameter values.
    """
    z = sample_domain(bg)
    comps = ["G_tt", "G_xx", "G_zz"] + (["G_yy"] if bg.G_yy is not None else [])
    params = ", ".join(f"{k}={v:g}" for k, v in bg.params.items())
    for name in comps:
        with np.errstate(all="ignore"):
            values = np.asarray(bg.function(name)(z), dtype=complex)
        bad_imag = np.abs(values.imag) > 1e-12 * np.maximum(np.abs(values.real), 1.0)
        real = values.real
        overflow = np.isinf(real) & (real > 0)
        if math.isinf(bg.z_ir) and np.any(overflow):
            # exp(c z^2) overflows far out on an infinite domain: numerics, not a singularity
            cut = int(np.argmax(overflow))
            real, bad_imag = real[:cut], bad_imag[:cut]
        bad = ~np.isfinite(real) | bad_imag | (real <= 0)
        if np.any(bad):
            i = int(np.argmax(bad))
            what = (
                "is not finite"
                if not np.isfinite(real[i])
                else ("is complex" if bad_imag[i] else "vanishes or turns negative")
            )
            raise InputError(
                f"metric {name}",
                f"{what} inside the domain at z={z[i]:.4g} "
                f"(parameters {params}, IR end {bg.ir.kind} at {bg.z_ir:g})",
            )
    if bg.ir.kind is IRKind.HORIZON:
        f_tt = bg.function("G_tt")(np.array([bg.z_ir]))
        if abs(float(np.real(f_tt[0]))) > 1e-8 * float(np.real(bg.function("G_xx")(np.array([bg.z_ir])))[0]):
            raise InputError("ir.at", "G_tt does not vanish at the declared horizon")
