"""Tables, files and plots for the temperature module (Hawking-Page and screening)."""

from __future__ import annotations

import math
from pathlib import Path
from typing import Any

import numpy as np

from holostring.report.tables import fmt, limits_statement


def _mev(x: float | None, unit: str | None) -> float | None:
    from holostring.units import energy_in_gev

    if x is None or unit is None or not math.isfinite(x):
        return None
    v = energy_in_gev(x, unit, 1.0)
    return None if v is None else 1e3 * v


def _fm(x: float, unit: str | None) -> float | None:
    from holostring.units import length_in_fm

    if unit is None or not math.isfinite(x):
        return None
    return length_in_fm(x, unit)


def thermo_data(transition: Any, screening: Any | None) -> dict[str, Any]:
    """Plain data for JSON: T_c, the free-energy curve and per-temperature screening rows."""
    unit = transition.energy_unit
    data: dict[str, Any] = {
        "background": transition.background,
        "construction": transition.construction,
        "energy_unit": unit,
        "critical_temperature": transition.critical_temperature,
        "critical_temperature_error": transition.critical_temperature_error,
        "critical_temperature_gev": transition.critical_temperature_gev,
        "critical_temperature_mev": _mev(transition.critical_temperature, unit),
        "critical_horizon": transition.critical_horizon,
        "transitions": list(transition.transitions),
        "on_shell": transition.on_shell,
        "regularisation": transition.regularisation,
        "assumptions": list(transition.assumptions),
        "free_energy_normalisation": "2 kappa^2 (F_black_brane - F_thermal) / (L^3 V_3); "
        "times N^2/(8 pi^2) with the AdS5/CFT normalisation",
        "free_energy": [
            {
                "temperature": float(t),
                "horizon": float(h),
                "free_energy_difference": float(f),
                "error": float(e),
                "dominant": "black brane" if f < 0 else "thermal",
            }
            for t, h, f, e in zip(
                transition.temperatures,
                transition.horizons,
                transition.free_energy_difference,
                transition.free_energy_error,
                strict=True,
            )
        ],
        "converged": transition.converged,
        "message": transition.message,
        "provenance": transition.provenance.to_dict(),
    }
    if screening is not None:
        rows = []
        for i, t in enumerate(screening.temperatures):
            lm, ls = float(screening.max_separation[i]), float(screening.screening_length[i])
            row = {
                "temperature": float(t),
                "horizon": float(screening.horizons[i]),
                "max_separation": lm if math.isfinite(lm) else None,
                "screening_length": ls if math.isfinite(ls) else None,
                "max_separation_times_T": lm * float(t) if math.isfinite(lm) else None,
                "screening_length_times_T": ls * float(t) if math.isfinite(ls) else None,
                "spatial_string_tension": float(screening.spatial_string_tension[i]),
                "error": float(screening.errors[i]),
                "converged": bool(screening.converged_points[i]),
            }
            if unit is not None:
                row["temperature_mev"] = _mev(float(t), unit)
                row["max_separation_fm"] = _fm(lm, unit)
                row["screening_length_fm"] = _fm(ls, unit)
            rows.append(row)
        data["screening"] = rows
        data["string_tension_below_tc"] = screening.string_tension_below
        data["screening_converged"] = screening.converged
        data["screening_message"] = screening.message
        data["screening_provenance"] = screening.provenance.to_dict()
    return data


def print_summary(transition: Any, screening: Any | None) -> None:
    """Print T_c, a short free-energy table and the screening table, then the limits."""
    from rich.table import Table

    from holostring.report.tables import console

    out = console()
    unit = transition.energy_unit
    tc = transition.critical_temperature
    out.print(f"[bold]{transition.background}[/bold]: {transition.construction}")
    if tc is None:
        out.print(f"T_c: none ({transition.message})")
    else:
        line = f"T_c = {fmt(tc, 12)} ± {transition.critical_temperature_error:.1e}"
        line += f" {unit}" if unit else " (model units)"
        mev = _mev(tc, unit)
        if mev is not None:
            line += f"  = {mev:.2f} MeV"
        out.print(line)
        if transition.message != "ok":
            out.print(f"note: {transition.message}")
    out.print(f"regularisation: {transition.regularisation}")
    tu = unit or "model units"
    table = Table(title="free-energy difference (negative: deconfined)")
    table.add_column(f"T [{tu}]", justify="right")
    table.add_column("T/T_c", justify="right")
    table.add_column("2κ²ΔF/L³" + (f" [{unit}^4]" if unit else ""), justify="right")
    idx = np.unique(np.linspace(0, len(transition.temperatures) - 1, 9).round().astype(int))
    for i in idx:
        t = float(transition.temperatures[i])
        table.add_row(
            fmt(t, 6), fmt(t / tc, 4) if tc else "—", fmt(float(transition.free_energy_difference[i]), 6)
        )
    out.print(table)
    if screening is not None:
        st = Table(title="screening in the black-brane phase")
        if unit:
            st.add_column("T (MeV)", justify="right")
            st.add_column("L_max (fm)", justify="right")
            st.add_column("L_s (fm)", justify="right")
        else:
            st.add_column("T", justify="right")
            st.add_column("L_max", justify="right")
            st.add_column("L_s", justify="right")
        st.add_column("L_max·T", justify="right")
        st.add_column("L_s·T", justify="right")
        st.add_column("error", justify="right")
        st.add_column("ok", justify="center")
        for i, t in enumerate(screening.temperatures):
            t = float(t)
            lm, ls = float(screening.max_separation[i]), float(screening.screening_length[i])
            if unit:
                cells = [fmt(_mev(t, unit), 5), fmt(_fm(lm, unit), 5), fmt(_fm(ls, unit), 5)]
            else:
                cells = [
                    fmt(t, 6),
                    fmt(lm if math.isfinite(lm) else None, 7),
                    fmt(ls if math.isfinite(ls) else None, 7),
                ]
            cells += [
                fmt(lm * t if math.isfinite(lm) else None, 7),
                fmt(ls * t if math.isfinite(ls) else None, 7),
                f"{float(screening.errors[i]):.0e}",
                "yes" if screening.converged_points[i] else "NO",
            ]
            st.add_row(*cells)
        out.print(st)
        s0 = screening.string_tension_below
        if s0:
            su = f" {unit}^2 (sqrt: {_mev(math.sqrt(s0), unit):.1f} MeV)" if unit else ""
            if screening.critical_temperature is None:
                out.print(
                    f"zero-temperature string tension: {fmt(s0, 8)}{su} (no transition "
                    "found, so no confined range of T)"
                )
            else:
                out.print(
                    f"string tension below T_c: {fmt(s0, 8)}{su}, T-independent (the "
                    "thermal geometry does not change with T)"
                )
        else:
            out.print("string tension below T_c: none (the zero-temperature background does not confine)")
        if screening.message != "ok":
            out.print(f"note: {screening.message}")
    out.print(f"[dim]{limits_statement()}[/dim]")


def plot_free_energy(transition: Any, ax: Any = None) -> Any:
    """Free-energy difference over T^4 versus T/T_c, with T_c, the phases and the conformal limit."""
    from holostring.report.style import COLORS, pyplot

    plt = pyplot()
    if ax is None:
        _, ax = plt.subplots()
    tc = transition.critical_temperature
    unit = transition.energy_unit
    T = np.asarray(transition.temperatures)
    y = np.asarray(transition.free_energy_difference) / T**4
    x = T / tc if tc else T
    ax.axhline(0.0, color="black", lw=0.8)
    ax.axhline(-(np.pi**4), color="#888888", lw=0.9, ls=":")
    ax.plot(x, y, color=COLORS[0], lw=1.9)
    ax.set_ylabel(r"$2\kappa^2\,(F_{\rm black\ brane} - F_{\rm thermal}) \,/\, (L^3\, T^4)$")
    ylo, yhi = min(np.nanmin(y), -(np.pi**4)), max(np.nanmax(y), 0.0)
    pad = 0.08 * (yhi - ylo or 1.0)
    ax.set_ylim(ylo - pad, yhi + pad)
    ax.set_xlim(x[0], x[-1])
    ax.text(
        x[-1], -(np.pi**4), r"conformal plasma $-\pi^4$ ", fontsize=8.5, color="#666666", ha="right", va="top"
    )
    if tc:
        ax.set_xlabel(r"$T / T_c$")
        ax.axvline(1.0, color="#666666", lw=0.8, ls="--")
        ax.axvspan(x[0], 1.0, color=COLORS[1], alpha=0.06, lw=0)
        ax.axvspan(1.0, x[-1], color=COLORS[0], alpha=0.06, lw=0)
        label = rf"$T_c = {tc:.6g}$" + (f" {unit}" if unit else " (model units)")
        mev = _mev(tc, unit)
        if mev is not None:
            label += f"\n= {mev:.1f} MeV"
        ax.text(
            1.0,
            0.62,
            " " + label.replace("\n", "\n "),
            transform=ax.get_xaxis_transform(),
            fontsize=9,
            va="center",
            ha="left",
        )
        ax.text(
            0.02,
            0.30,
            "thermal geometry\ndominates\n(confined)",
            transform=ax.transAxes,
            fontsize=8.5,
            color=COLORS[1],
            va="bottom",
        )
        ax.text(
            0.98,
            0.96,
            "black brane dominates\n(deconfined)",
            transform=ax.transAxes,
            fontsize=8.5,
            color=COLORS[0],
            ha="right",
            va="top",
        )
        if unit:
            k = tc * _mev(1.0, unit)
            top = ax.secondary_xaxis("top", functions=(lambda v: v * k, lambda v: v / k))
            top.set_xlabel("T [MeV]")
    else:
        ax.set_xlabel(f"T [{unit or 'model units'}]")
        ax.text(
            0.98,
            0.5,
            transition.message.split(";")[0].replace(": ", ":\n"),
            transform=ax.transAxes,
            fontsize=8.5,
            ha="right",
            va="center",
        )
    ax.set_title(f"Hawking-Page transition: {transition.background}", fontsize=11)
    return ax


def plot_screening(screening: Any, axes: Any = None) -> Any:
    """Screening length and largest separation versus T (left) and times T (right)."""
    from holostring.report.style import COLORS, pyplot

    plt = pyplot()
    if axes is None:
        _, axes = plt.subplots(1, 2, figsize=(10.5, 4.2))
    ax1, ax2 = axes
    unit = screening.energy_unit
    T = np.asarray(screening.temperatures, dtype=float)
    lm = np.asarray(screening.max_separation, dtype=float)
    ls = np.asarray(screening.screening_length, dtype=float)
    if unit:
        tx = np.array([_mev(t, unit) for t in T])
        to_fm = np.vectorize(lambda v: _fm(v, unit) if math.isfinite(v) else math.nan)
        ylm, yls = to_fm(lm), to_fm(ls)
        ax1.set_xlabel("T [MeV]")
        ax1.set_ylabel("length [fm]")
    else:
        tx, ylm, yls = T, lm, ls
        ax1.set_xlabel("T [model units]")
        ax1.set_ylabel("length [model units]")
    ax1.plot(tx, ylm, "o-", ms=3.5, color=COLORS[0], label=r"$L_{\max}$ (largest connected string)")
    ax1.plot(tx, yls, "s-", ms=3.5, color=COLORS[1], label=r"$L_s$ (screening length)")
    ax1.set_ylim(bottom=0)
    if tc := screening.critical_temperature:
        xc = _mev(tc, unit) if unit else tc
        ax1.axvline(xc, color="#666666", lw=0.8, ls="--")
        ax1.text(xc, 0.03, r" $T_c$", transform=ax1.get_xaxis_transform(), fontsize=9)
    ax1.legend(fontsize=9)
    ax1.set_title("separations in the black-brane phase", fontsize=11)
    xr = T / tc if tc else T
    ax2.plot(xr, lm * T, "o-", ms=3.5, color=COLORS[0], label=r"$L_{\max}\,T$")
    ax2.plot(xr, ls * T, "s-", ms=3.5, color=COLORS[1], label=r"$L_s\,T$")
    # conformal (AdS5 black brane) values L pi T = 0.869, 0.754 (Rey-Theisen-Yee hep-th/9803135)
    ax2.axhline(
        0.869 / np.pi, color=COLORS[0], lw=0.8, ls=":", label=r"AdS$_5$ black brane: $0.869/\pi$, $0.754/\pi$"
    )
    ax2.axhline(0.754 / np.pi, color=COLORS[1], lw=0.8, ls=":")
    ax2.set_xlabel(r"$T / T_c$" if tc else ("T [" + (unit or "model units") + "]"))
    ax2.set_ylabel(r"$L\,T$ (dimensionless)")
    ax2.legend(fontsize=9)
    ax2.set_title("scaled by T (conformal values dotted)", fontsize=11)
    return axes


def write_outputs(out_dir: str | Path, transition: Any, screening: Any | None) -> list[Path]:
    """Write thermo.json, free_energy.csv, screening.csv and the two PNG plots into ``out_dir``."""
    from holostring.report.files import prepare_dir, write_csv, write_figure, write_json
    from holostring.report.style import caption, pyplot

    d = prepare_dir(out_dir)
    data = thermo_data(transition, screening)
    paths = [write_json(d / "thermo.json", data)]
    params = ", ".join(f"{k}={v:g}" for k, v in transition.provenance.parameters.items())
    comments = [
        f"background {transition.background} ({params})",
        transition.regularisation,
        "free_energy_difference = 2 kappa^2 (F_bb - F_thermal)/(L^3 V_3)",
    ]
    paths.append(
        write_csv(
            d / "free_energy.csv",
            ["temperature", "horizon", "free_energy_difference", "error"],
            zip(
                transition.temperatures.tolist(),
                transition.horizons.tolist(),
                transition.free_energy_difference.tolist(),
                transition.free_energy_error.tolist(),
                strict=True,
            ),
            comments,
        )
    )
    plt = pyplot()
    fig, ax = plt.subplots()
    plot_free_energy(transition, ax)
    caption(
        fig,
        f"{transition.background} ({params}); {transition.construction}; "
        "not back-reacted; classical gravity (large N)",
    )
    paths.append(write_figure(fig, d / "free_energy.png"))
    plt.close(fig)
    if screening is not None:
        paths.append(
            write_csv(
                d / "screening.csv",
                [
                    "temperature",
                    "horizon",
                    "max_separation",
                    "screening_length",
                    "spatial_string_tension",
                    "error",
                    "converged",
                ],
                zip(
                    screening.temperatures.tolist(),
                    screening.horizons.tolist(),
                    screening.max_separation.tolist(),
                    screening.screening_length.tolist(),
                    screening.spatial_string_tension.tolist(),
                    screening.errors.tolist(),
                    screening.converged_points.tolist(),
                    strict=True,
                ),
                [
                    f"background {screening.background} ({params})",
                    f"string scheme {screening.provenance.settings.get('scheme')}",
                ],
            )
        )
        fig, axes = plt.subplots(1, 2, figsize=(10.5, 4.2))
        plot_screening(screening, axes)
        fig.tight_layout()
        caption(
            fig,
            f"{screening.background} ({params}); static Nambu-Goto string in the black "
            "brane; classical string (large N, strong coupling)",
        )
        paths.append(write_figure(fig, d / "screening_length.png"))
        plt.close(fig)
    return paths
