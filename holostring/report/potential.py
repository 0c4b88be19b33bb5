"""Reporting for static potentials: summary table, CSV/JSON files and plots.

matplotlib is imported only inside the plotting functions, through style.pyplot().
"""

from __future__ import annotations

from pathlib import Path
from typing import Any

import numpy as np

from holostring.report.files import prepare_dir, write_csv, write_figure, write_json
from holostring.report.tables import fmt, limits_statement


def summary_lines(res: Any, symbolic: Any = None) -> list[str]:
    """Readable summary of a PotentialResult (plain lines, units when available)."""
    prov = res.provenance
    params = ", ".join(f"{k}={v:g}" for k, v in prov.parameters.items())
    phys = res.physical or {}
    lines = [
        f"V(L) for {prov.background} ({params}), scheme {res.scheme}",
        f"  L grid: {len(res.L)} points on [{fmt(res.L.min(), 6)}, {fmt(res.L.max(), 6)}]",
    ]

    def row(name: str, value: float | None, err: float | None = None, extra: str = "") -> None:
        if value is None:
            lines.append(f"  {name:<26} —  {extra}")
            return
        e = "" if err is None else (f" ± {err:.1e}" if err > 0 else " ± <1e-16")
        lines.append(f"  {name:<26} {fmt(value, 12)}{e}  {extra}".rstrip())

    sym = None if symbolic is None else getattr(symbolic, "string_tension", None)
    row(
        "string tension (large L)",
        res.string_tension,
        res.errors.get("string_tension"),
        (f"symbolic {fmt(sym, 12)}" if sym is not None else "")
        + (
            f"  [{fmt(phys.get('string_tension_GeV2'), 6)} GeV^2]"
            if phys.get("string_tension_GeV2") is not None
            else ""
        ),
    )
    if res.string_tension is None:
        lines[-1] += f"({res.notes.get('string_tension', '')})"
    if res.cornell is not None:
        c = res.cornell
        ek, es, ec = c.errors
        lines.append(
            f"  Cornell fit on L in [{fmt(c.L_range[0], 6)}, {fmt(c.L_range[1], 6)}] "
            f"({c.points} points, {c.weights} weights, rms {c.rms:.2e}):"
        )
        row("  kappa", c.kappa, ek)
        if "coulomb_coefficient" in res.notes:
            lines.append(f"    kappa: {res.notes['coulomb_coefficient']}")
        row("  sigma", c.sigma, es)
        row("  C", c.C, ec)
    for key in ("r0", "r1"):
        val = getattr(res, key)
        unit = phys.get(f"{key}_fm")
        row(
            f"Sommer {key}",
            val,
            res.errors.get(key),
            (f"[{fmt(unit, 6)} fm]" if unit is not None else "")
            + (res.notes.get(key, "") if val is None else ""),
        )
    if res.max_separation is not None:
        row("max separation L_max", res.max_separation, res.errors.get("max_separation"))
    if res.screening_length is not None or "screening_length" in res.errors:
        row(
            "screening length",
            res.screening_length,
            res.errors.get("screening_length"),
            res.notes.get("screening_length", ""),
        )
    for L_c, e in res.transitions:
        row("first-order jump at L_c", L_c, e, "(V multi-valued: kink between branches)")
    for b in res.branches:
        lo, hi = b.L_range
        lines.append(
            f"  branch {b.label:<34} L in [{fmt(lo, 6)}, {fmt(hi, 6)}]{'' if b.stable else '  (unstable)'}"
        )
    lines.append(
        f"  error estimate (two resolutions): {res.error_estimate:.2e}; "
        f"{'converged' if res.converged else 'NOT CONVERGED: ' + res.message}"
    )
    if res.converged and res.message != "converged":
        lines.append(f"  note: {res.message}")
    lines.append(limits_statement())
    return lines


def write_potential_outputs(
    res: Any, out: str | Path, profiles: Any = None, symbolic: Any = None
) -> list[Path]:
    """CSV per branch, JSON and PNG plots into ``out``; returns the written paths."""
    d = prepare_dir(out)
    written = []
    comments = [
        f"background {res.provenance.background} {res.provenance.parameters}",
        f"scheme {res.scheme}; V in units of the background's scale times g",
    ]
    for i, b in enumerate(res.branches):
        name = f"potential_branch{i + 1}_{b.kind}.csv"
        rows = zip(b.L.tolist(), b.V.tolist(), b.zstar.tolist(), b.error.tolist(), strict=True)
        written.append(
            write_csv(
                d / name,
                ["L", "V", "zstar", "error"],
                rows,
                [*comments, f"branch: {b.label}, stable={b.stable}"],
            )
        )
    rows = zip(
        res.L.tolist(), res.V.tolist(), res.force.tolist(), res.branch_of_minimum.tolist(), strict=True
    )
    written.append(write_csv(d / "potential_minimum.csv", ["L", "V", "force", "branch"], rows, comments))
    data = res.to_dict()
    if symbolic is not None:
        data["symbolic"] = {
            "string_tension": getattr(symbolic, "string_tension", None),
            "coulomb_coefficient": getattr(symbolic, "coulomb_coefficient", None),
        }
    written.append(write_json(d / "potential.json", data))
    written.append(write_figure(plot_potential(res), d / "potential.png"))
    if profiles is not None:
        written.append(write_figure(plot_profiles(profiles, res), d / "profiles.png"))
    if any(b.kind == "disconnected" or not b.stable for b in res.branches):
        written.append(write_figure(plot_branches(res), d / "branches.png"))
    return written


def _caption(res: Any) -> str:
    p = res.provenance
    params = ", ".join(f"{k}={v:g}" for k, v in p.parameters.items())
    return f"{p.background} ({params}); scheme {res.scheme}; holostring {p.version}"


def plot_potential(res: Any, ax: Any = None) -> Any:
    """V(L) of the minimum-energy strings, the Cornell fit and its two asymptotes."""
    from holostring.report.style import caption, pyplot

    plt = pyplot()
    fig, ax = (ax.figure, ax) if ax is not None else plt.subplots()
    ok = np.isfinite(res.V)
    ax.plot(res.L[ok], res.V[ok], lw=2.2, label="V(L), minimum energy", zorder=3)
    lo, hi = float(np.nanmin(res.V)), float(np.nanmax(res.V))
    if res.cornell is not None:
        c = res.cornell
        Lf = np.linspace(res.L.min(), res.L.max(), 400)
        ax.plot(
            Lf,
            c(Lf),
            "--",
            lw=1.3,
            label=rf"Cornell fit: $-\kappa/L+\sigma L+C$, $\kappa$={c.kappa:.4g}, "
            rf"$\sigma$={c.sigma:.4g}, C={c.C:.4g}",
        )
        ax.plot(Lf, -c.kappa / Lf + c.C, ":", lw=1.1, label=r"Coulomb asymptote $-\kappa/L+C$")
        ax.plot(Lf, c.sigma * Lf + c.C, ":", lw=1.1, label=r"linear asymptote $\sigma L+C$")
        if c.L_range[0] > res.L.min() * 1.001 or c.L_range[1] < res.L.max() * 0.999:
            ax.axvspan(c.L_range[0], c.L_range[1], color="0.93", zorder=0, lw=0, label="Cornell fit range")
    if res.screening_length is not None:
        ax.axvline(res.screening_length, color="0.4", lw=0.8, ls="-.")
        ax.annotate(
            r"$L_s$", (res.screening_length, lo), textcoords="offset points", xytext=(3, 3), fontsize=9
        )
    pad = 0.08 * (hi - lo if hi > lo else 1.0)
    ax.set_ylim(lo - pad, hi + pad)
    ax.set_xlim(0, res.L.max() * 1.02)
    unit = (res.physical or {}).get("energy_unit")
    ax.set_xlabel("quark separation L" + (f"  [1/{unit}]" if unit else "  [units of the model scale]"))
    ax.set_ylabel("V(L)" + (f"  [{unit}]" if unit else "") + f"  ({res.scheme})")
    ax.set_title(f"Static potential, {res.provenance.background}")
    ax.legend(fontsize=8, loc="lower right")
    caption(fig, _caption(res))
    return fig


def plot_branches(res: Any, ax: Any = None) -> Any:
    """Every branch of V(L): stable and unstable connected strings, wall, disconnected pair."""
    from holostring.report.style import COLORS, caption, pyplot

    plt = pyplot()
    fig, ax = (ax.figure, ax) if ax is not None else plt.subplots()
    for i, b in enumerate(res.branches):
        if b.L.size == 0:
            continue
        ls = "-" if b.stable else "--"
        label = b.label + ("" if b.stable else ", dL/dz* < 0")
        ax.plot(b.L, b.V, ls, color=COLORS[i % len(COLORS)], lw=1.6, label=label)
    ok = np.isfinite(res.V)
    ax.plot(res.L[ok], res.V[ok], color="k", lw=0.8, alpha=0.6, label="minimum energy")
    if res.max_separation is not None:
        ax.axvline(res.max_separation, color="0.5", lw=0.8, ls=":")
        ax.annotate(
            rf"$L_{{max}}$={res.max_separation:.6g}",
            (res.max_separation, 0.02),
            xycoords=("data", "axes fraction"),
            fontsize=8,
            rotation=90,
            ha="right",
        )
    if res.screening_length is not None:
        ax.axvline(res.screening_length, color="0.5", lw=0.8, ls="-.")
        ax.annotate(
            rf"$L_s$={res.screening_length:.6g}",
            (res.screening_length, 0.02),
            xycoords=("data", "axes fraction"),
            fontsize=8,
            rotation=90,
            ha="right",
        )
    for L_c, _e in res.transitions:
        ax.axvline(L_c, color="0.3", lw=0.8, ls=(0, (1, 2)))
        ax.annotate(
            rf"$L_c$={L_c:.6g} (first-order jump)",
            (L_c, 0.02),
            xycoords=("data", "axes fraction"),
            fontsize=8,
            rotation=90,
            ha="right",
        )
    unstable = [b for b in res.branches if b.kind == "connected" and not b.stable and b.L.size]
    if res.max_separation is None and unstable:
        # a swallowtail: zoom on the window where several connected strings coexist
        lo_L = min(b.L_range[0] for b in unstable)
        hi_L = max(b.L_range[1] for b in unstable)
        width = hi_L - lo_L
        x0, x1 = max(lo_L - 0.6 * width, float(res.L.min())), min(hi_L + 0.6 * width, float(res.L.max()))
        vals = np.concatenate([b.V[(b.L >= x0) & (b.L <= x1)] for b in res.branches])
        if vals.size:
            lo, hi = float(np.nanmin(vals)), float(np.nanmax(vals))
            pad = 0.1 * (hi - lo if hi > lo else 1.0)
            ax.set_ylim(lo - pad, hi + pad)
            ax.set_xlim(x0, x1)
    if res.max_separation is not None:
        # zoom on the region where the branches meet (the Coulomb part dominates otherwise)
        vals = np.concatenate([b.V[b.L >= 0.3 * res.max_separation] for b in res.branches])
        if vals.size:
            lo, hi = float(np.nanmin(vals)), float(np.nanmax(vals))
            pad = 0.1 * (hi - lo if hi > lo else 1.0)
            ax.set_ylim(lo - pad, hi + pad)
            ax.set_xlim(0.25 * res.max_separation, res.L.max())
    ax.set_xlabel("quark separation L  [units of the model scale]")
    ax.set_ylabel(f"V(L)  ({res.scheme})")
    ax.set_title(f"All string branches, {res.provenance.background}")
    ax.legend(fontsize=8)
    caption(fig, _caption(res))
    return fig


def plot_profiles(profiles: list[Any], res: Any, ax: Any = None) -> Any:
    """String profiles x(z) (boundary at the top, z growing downwards)."""
    from holostring.report.style import caption, pyplot

    plt = pyplot()
    fig, ax = (ax.figure, ax) if ax is not None else plt.subplots()
    cmap = plt.get_cmap("viridis")
    for i, pr in enumerate(profiles):
        col = cmap(i / max(len(profiles) - 1, 1))
        for p in pr.profiles:
            ls = "-" if p.minimum else ("--" if p.stable else ":")
            label = f"L={pr.L:.3g}" + ("" if p.minimum else f" ({p.kind}, not minimal)")
            if p.segments:
                k = p.segments[0]
                ax.plot(p.x[:k], p.z[:k], ls, color=col, lw=1.4, label=label)
                ax.plot(p.x[k:], p.z[k:], ls, color=col, lw=1.4)
            else:
                ax.plot(p.x, p.z, ls, color=col, lw=1.4, label=label)
    if res.confinement_point is not None:
        ax.axhline(res.confinement_point, color="0.5", lw=0.8, ls="-.")
        ax.annotate(
            f"confinement point / IR end z = {res.confinement_point:.4g}",
            (0.99, res.confinement_point),
            xycoords=("axes fraction", "data"),
            fontsize=8,
            va="top",
            ha="right",
            xytext=(0, -3),
            textcoords="offset points",
        )
    ax.invert_yaxis()
    ax.set_xlabel("x  [units of the model scale]")
    ax.set_ylabel("holographic coordinate z  (boundary at z = 0)")
    ax.set_title(f"String profiles, {res.provenance.background}")
    ax.legend(fontsize=7, loc="upper left", bbox_to_anchor=(1.01, 1.0))
    caption(fig, _caption(res))
    return fig
