"""Tables, files and plots for spectra: the mass table, CSV/JSON, U(z) with levels, modes, Regge."""

from __future__ import annotations

from pathlib import Path
from typing import Any

import numpy as np

from holostring.report.tables import fmt, limits_statement


def _units(result: Any) -> tuple[str, str, str]:
    """Axis unit strings for m, m^2 and z."""
    u = result.energy_unit
    if u is None:
        return "model units", "model units", "model units"
    return u, f"{u}$^2$", f"{u}$^{{-1}}$"


def spectrum_data(result: Any, fit: Any | None = None) -> dict[str, Any]:
    """Plain data for JSON: the result without grids, plus the Regge fit and a state table."""
    data = result.to_dict(include_arrays=False)
    gev = result.masses_in_gev()
    data["table"] = [
        {
            "n": n,
            "mass_squared": float(result.masses_squared[n]),
            "mass": float(result.masses[n]),
            "error_estimate": float(result.error_estimate[n]),
            "mass_error": float(result.mass_error[n]),
            **({"mass_gev": float(gev[n])} if gev is not None else {}),
        }
        for n in range(result.states)
    ]
    if fit is not None:
        data["regge_fit"] = fit.to_dict()
    data["limits"] = limits_statement()
    return data


def _caption(result: Any) -> str:
    params = ", ".join(f"{k}={v:g}" for k, v in result.provenance.parameters.items())
    lo, hi = result.resolution
    return (
        f"{result.provenance.background} ({params}); channel {result.channel}; "
        f"{result.boundaries['statement']}; Gauss-Jacobi nodes {lo}/{hi}"
    )


def print_summary(result: Any, fit: Any | None = None) -> None:
    """Print the mass table (n, m^2, m, error), the Regge fit, the status and the limits."""
    from rich.table import Table

    from holostring.report.tables import console

    out = console()
    info = result.channel_info
    label = f" ({info['label']})" if info.get("label") else ""
    out.print(
        f"[bold]{result.provenance.background}[/bold]: {result.channel}{label}, spin "
        f"{info['spin']}, M5^2 = {info['mass_squared']:g}, coupling exp(-"
        f"{info['dilaton_coupling']:g} Phi), {info['frame']} frame"
    )
    out.print(f"boundary: {result.boundaries['statement']}")
    unit = result.energy_unit
    mu = unit or "model units"
    gev = result.masses_in_gev()
    table = Table(title=f"{result.channel} spectrum")
    table.add_column("n", justify="right")
    table.add_column(f"m^2 [{mu}^2]" if unit else "m^2", justify="right")
    table.add_column(f"m [{mu}]" if unit else "m", justify="right")
    table.add_column("error (m^2)", justify="right")
    if gev is not None and unit != "GeV":
        table.add_column("m [GeV]", justify="right")
    for n in range(result.states):
        cells = [
            str(n),
            fmt(float(result.masses_squared[n]), 13),
            fmt(float(result.masses[n]), 13),
            f"{float(result.error_estimate[n]):.1e}",
        ]
        if gev is not None and unit != "GeV":
            cells.append(fmt(float(gev[n]), 8))
        table.add_row(*cells)
    out.print(table)
    if fit is not None:
        out.print(
            f"Regge fit m_n^2 = a n + b (n = {fit.n[0]}..{fit.n[-1]}): "
            f"a = {fit.slope:.10g} ± {fit.slope_error:.1e}, "
            f"b = {fit.intercept:.10g} ± {fit.intercept_error:.1e}"
            + (_scaling_note(fit) if fit.scaled else "")
        )
    status = "converged" if result.converged else "NOT CONVERGED"
    out.print(f"{status}: {result.message}")
    out.print(f"[dim]{limits_statement()}[/dim]")


def plot_potential(result: Any, ax: Any = None, levels: int = 8) -> Any:
    """U(z) with the first levels m_n^2 drawn between their turning points, and psi_n on them.

    Levels are coloured along a sequential colour map (dark for n = 0), so no two share a
    colour however many are drawn.
    """
    from holostring.report.style import pyplot

    plt = pyplot()
    import matplotlib

    cmap = matplotlib.colormaps["viridis"]
    if ax is None:
        _, ax = plt.subplots(figsize=(7.0, 4.8))
    z, U = result.z, result.potential
    use_xi = not np.allclose(result.xi, result.z, rtol=1e-8, atol=0.0)
    if use_xi:  # not conformally flat: draw the Schrodinger problem in its own coordinate
        z = result.xi
    k = min(levels, result.states)
    lam = result.masses_squared[:k]
    top = float(lam[-1]) if k else float(np.nanmax(U))
    gap = float(np.min(np.diff(lam))) if k > 1 else max(abs(top), 1.0)
    # x range: the whole interval, or up to past the last turning point on a half line
    if result.boundary == "decaying":
        beyond = np.nonzero((U > top) & (z > z[np.nanargmin(U)]))[0]
        xmax = float(z[beyond[0]]) * 1.25 if beyond.size else float(z[-1])
    else:
        xmax = float(z[-1]) if use_xi else float(result.domain[1])
    finite = np.isfinite(U) & (z <= xmax)
    lo = min(float(np.nanmin(U[finite])), float(lam[0]) if k else 0.0)
    ymin = max(lo, float(lam[0]) - 1.5 * gap) if k else lo
    ymin = min(ymin, 0.0) if ymin > 0 and float(lam[0]) < 2 * gap else ymin
    ymax = top + 1.2 * gap
    ax.plot(z, U, color="black", lw=1.6, label="U")
    scale = 0.4 * gap
    for i in range(k):
        # stop short of viridis' pale yellow end, which is hard to see on white
        color = cmap(0.88 * i / max(k - 1, 1))
        allowed = U <= lam[i]
        zs = z[allowed] if allowed.any() else z
        ax.hlines(lam[i], zs.min(), zs.max(), color=color, lw=0.9, ls="--")
        psi = result.modes[i]
        amp = np.nanmax(np.abs(psi)) or 1.0
        ax.plot(z, lam[i] + scale * psi / amp, color=color, lw=1.2, label=f"n={i}: $m^2$={lam[i]:.6g}")
    ax.set_xlim(0.0, xmax)
    ax.set_ylim(ymin, ymax)
    _, m2u, zu = _units(result)
    ax.set_xlabel(r"$\xi = \int_0^z \sqrt{W/P}\,dz$" + f" [{zu}]" if use_xi else f"z [{zu}]")
    ax.set_ylabel(f"U, $m_n^2$ [{m2u}]")
    ax.set_title(f"Schrödinger potential and levels: {result.channel}")
    ax.legend(loc="upper left", bbox_to_anchor=(1.01, 1.0), fontsize=8.5)
    return ax


def plot_modes(result: Any, ax: Any = None, count: int = 4) -> Any:
    """The first normalised mode functions psi_n(z) (int psi^2 d xi = 1)."""
    from holostring.report.style import pyplot

    plt = pyplot()
    if ax is None:
        _, ax = plt.subplots()
    z = result.z
    k = min(count, result.states)
    # show where the highest plotted mode lives
    mask = np.zeros_like(z, dtype=bool)
    for i in range(k):
        psi = np.abs(result.modes[i])
        mask |= psi > 1e-4 * np.nanmax(psi)
    xmax = float(z[mask].max()) * 1.05 if mask.any() else float(z[-1])
    xmax = min(xmax, float(result.domain[1]))
    for i in range(k):
        ax.plot(z, result.modes[i], lw=1.4, label=f"n={i} ($m$={result.masses[i]:.6g})")
    ax.axhline(0.0, color="#999999", lw=0.6)
    ax.set_xlim(0.0, xmax)
    _, _, zu = _units(result)
    ax.set_xlabel(f"z [{zu}]")
    ax.set_ylabel(r"$\psi_n(z)$,  $\int\psi_n^2\,d\xi = 1$")
    ax.set_title(f"Normal modes: {result.channel} ({result.boundary})")
    ax.legend(fontsize=8.5)
    return ax


def plot_regge(result: Any, fit: Any | None = None, ax: Any = None) -> Any:
    """m_n^2 versus n with error bars and the fitted line a n + b."""
    from holostring.report.style import COLORS, pyplot

    plt = pyplot()
    if ax is None:
        _, ax = plt.subplots()
    n = np.arange(result.states)
    ax.errorbar(
        n,
        result.masses_squared,
        yerr=result.error_estimate,
        fmt="o",
        ms=4.5,
        color=COLORS[0],
        label=f"{result.channel} (error bars: N vs 2N)",
    )
    if fit is not None:
        nn = np.linspace(0, max(result.states - 1, 1), 50)
        ax.plot(
            nn,
            fit.slope * nn + fit.intercept,
            color=COLORS[1],
            lw=1.2,
            label=f"fit: a = {fit.slope:.6g} ± {fit.slope_error:.1e}, "
            f"b = {fit.intercept:.6g} ± {fit.intercept_error:.1e}"
            + ("\n" + _scaling_note(fit).strip() if fit.scaled else ""),
        )
    _, m2u, _ = _units(result)
    ax.set_xlabel("n (radial excitation)")
    ax.set_ylabel(f"$m_n^2$ [{m2u}]")
    ax.set_title(f"Regge plot: {result.channel}")
    ax.legend(fontsize=8.5, loc="upper left")
    return ax


def write_outputs(out: str | Path, result: Any, fit: Any | None = None) -> list[Path]:
    """Write spectrum.json, spectrum.csv, modes.csv and three PNG plots into ``out``."""
    from holostring.report.files import prepare_dir, write_csv, write_figure, write_json
    from holostring.report.style import caption, pyplot

    d = prepare_dir(out)
    paths = [write_json(d / "spectrum.json", spectrum_data(result, fit))]
    gev = result.masses_in_gev()
    header = ["n", "mass_squared", "mass", "error_mass_squared", "error_mass"]
    if gev is not None:
        header.append("mass_gev")
    rows = []
    for n in range(result.states):
        row = [
            n,
            float(result.masses_squared[n]),
            float(result.masses[n]),
            float(result.error_estimate[n]),
            float(result.mass_error[n]),
        ]
        if gev is not None:
            row.append(float(gev[n]))
        rows.append(row)
    comments = [
        _caption(result),
        f"converged={result.converged}: {result.message}",
        f"units: {result.energy_unit or 'model units (the background scale)'}",
    ]
    paths.append(write_csv(d / "spectrum.csv", header, rows, comments))
    mode_header = ["z", "xi", "U"] + [f"psi_{n}" for n in range(result.states)]
    mode_rows = np.column_stack([result.z, result.xi, result.potential, result.modes.T])
    paths.append(
        write_csv(
            d / "modes.csv",
            mode_header,
            mode_rows.tolist(),
            [_caption(result), "psi_n normalised: int psi_n^2 d xi = 1"],
        )
    )
    plt = pyplot()
    for name, draw in (
        ("potential.png", lambda ax: plot_potential(result, ax)),
        ("modes.png", lambda ax: plot_modes(result, ax)),
        ("regge.png", lambda ax: plot_regge(result, fit, ax)),
    ):
        fig, ax = plt.subplots(figsize=(7.0, 4.6))
        draw(ax)
        caption(fig, _caption(result))
        paths.append(write_figure(fig, d / name))
        plt.close(fig)
    return paths


def _scaling_note(fit: Any) -> str:
    """Why the Regge errors were scaled, in words that match the size of the residuals."""
    rel = float(np.max(np.abs(fit.residuals)) / max(abs(fit.intercept) + abs(fit.slope) * fit.n[-1], 1e-300))
    if rel < 1e-9:
        return f"  (errors scaled by chi2/dof = {fit.chi2 / fit.dof:.2g}; residuals {rel:.0e} relative: linear to solver precision)"
    return f"  (errors scaled by chi2/dof = {fit.chi2 / fit.dof:.2g}: the spectrum is not exactly linear)"
