"""Scan reports: tidy tables (CSV, JSON), plots and the terminal summary of a ScanResult.

The table is tidy: one line per parameter point with the varied parameters, then for each
observable its value and error, then ``status`` and ``message``. Plots show each observable against
the varied parameter with error bars and the failed points marked, or a heat map over two varied
parameters with the failed cells hatched grey.
"""

from __future__ import annotations

import math
import re
from pathlib import Path
from typing import Any

from holostring.report.files import write_csv, write_figure, write_json

NAMES = {
    "string_tension": r"string tension $\sigma$",
    "sqrt_string_tension": r"$\sqrt{\sigma}$",
    "coulomb_coefficient_uv": r"UV Coulomb coefficient $\kappa$",
    "coulomb_coefficient": r"Coulomb coefficient $\kappa$",
    "r0": r"Sommer scale $r_0$",
    "r1": r"Sommer scale $r_1$",
    "critical_temperature": r"critical temperature $T_c$",
}
FAILED_STYLE = {"facecolor": "#d9d9d9", "edgecolor": "#8c8c8c", "hatch": "///"}


def pretty(spec: str) -> str:
    """A readable axis name for an observable spec."""
    if spec in NAMES:
        return NAMES[spec]
    m = re.match(r"^(mass|mass_squared):([^:]+):(\d+)$", spec)
    if m:
        sym = "m" if m.group(1) == "mass" else "m^2"
        return rf"${sym}$ ({m.group(2)}, n={m.group(3)})"
    return spec


def _label(name: str, unit: str, text: str | None = None) -> str:
    shown = text if text is not None else name
    if not unit:
        return shown
    return f"{shown} [{unit}]" if "^" not in unit else f"{shown} [${_tex_unit(unit)}$]"


def _tex_unit(unit: str) -> str:
    base, _, power = unit.partition("^")
    return rf"\mathrm{{{base}}}^{{{power}}}"


# --------------------------------------------------------------------------- tables
def scan_table(result: Any) -> tuple[list[str], list[list[Any]]]:
    """The tidy table: header and one list of cells per point (``None`` where a value is missing)."""
    header = ["index", *result.varied]
    for s in result.observables:
        header += [s, f"{s}_error"]
    header += ["status", "message"]
    rows = []
    for r in result.rows:
        cells: list[Any] = [r.index, *(r.point[n] for n in result.varied)]
        for s in result.observables:
            v = r.values.get(s)
            cells += [None, None] if v is None else [_finite(v[0]), _finite(v[1])]
        cells += [r.status, r.message]
        rows.append(cells)
    return header, rows


def _finite(x: float) -> float | None:
    return x if math.isfinite(x) else None


def write_scan_tables(result: Any, out: str | Path, stem: str = "scan") -> list[Path]:
    """Write ``scan.csv`` (tidy table) and ``scan.json`` (table plus metadata) into ``out``."""
    out = Path(out)
    header, rows = scan_table(result)
    fixed = ", ".join(f"{k}={v:g}" for k, v in result.parameters.items())
    units = ", ".join(f"{k} [{u}]" for k, u in result.units.items() if u) or "all dimensionless"
    comments = [
        f"holostring scan of {result.background} (fixed: {fixed or 'none'}); {result.message}",
        f"units (model units): {units}",
    ]
    csv_rows = [["" if c is None else c for c in row] for row in rows]
    paths = [write_csv(out / f"{stem}.csv", header, csv_rows, comments)]
    paths.append(write_json(out / f"{stem}.json", result.to_dict()))
    return paths


# --------------------------------------------------------------------------- plots
def plot_scan_line(result: Any, observable: str, parameter: str | None = None, ax: Any = None) -> Any:
    """An observable against one varied parameter, with error bars; failed points marked.

    Parameters
    ----------
    result
        A :class:`~holostring.scan.ScanResult`.
    observable
        One of its observables.
    parameter
        The varied parameter on the x axis (default: the first).
    ax
        Axes to draw on (a new figure when ``None``).

    Returns
    -------
    matplotlib Axes
    """
    from holostring.report.style import pyplot

    plt = pyplot()
    if ax is None:
        _, ax = plt.subplots()
    name = parameter or result.varied[0]
    x = result.column(name)
    y = result.column(observable)
    e = result.errors(observable)
    good = [i for i in range(len(x)) if math.isfinite(y[i])]
    bad = [i for i in range(len(x)) if not math.isfinite(y[i])]
    one_line = len(result.varied) == 1 and result.kind == "grid"
    if good:
        order = sorted(good, key=lambda i: x[i])
        ax.errorbar(
            [x[i] for i in order], [y[i] for i in order],
            yerr=[e[i] if math.isfinite(e[i]) else 0.0 for i in order],
            fmt="o-" if one_line else "o", ms=3.5 if one_line else 2.5, lw=1.2, capsize=2,
            alpha=1.0 if one_line else 0.6, label=f"computed ({len(good)})",
        )  # fmt: skip
    if bad:
        ax.plot(
            [x[i] for i in bad], [0.03] * len(bad), "x", color="#c0392b", ms=6, mew=1.5,
            transform=ax.get_xaxis_transform(), label=f"failed ({len(bad)})", clip_on=False,
        )  # fmt: skip
    ax.set_xlabel(_label(name, result.units.get(name, "")))
    ax.set_ylabel(_label(observable, result.units.get(observable, ""), pretty(observable)))
    ax.legend(loc="best", fontsize=8.5)
    return ax


def plot_scan_map(result: Any, observable: str, ax: Any = None) -> Any:
    """A heat map of an observable over two varied parameters; failed cells hatched grey.

    Grid scans draw cells around each grid point; random samples are drawn as coloured dots
    (failed ones as grey crosses).

    Returns
    -------
    matplotlib Axes
    """
    import numpy as np
    from matplotlib.collections import PatchCollection
    from matplotlib.patches import Patch, Rectangle

    from holostring.report.style import pyplot

    plt = pyplot()
    if ax is None:
        _, ax = plt.subplots(figsize=(6.4, 5.0))
    px, py = result.varied[:2]
    xs = np.array(result.column(px))
    ys = np.array(result.column(py))
    vals = np.array(result.column(observable), dtype=float)
    failed = ~np.isfinite(vals)
    handles = []
    if result.kind == "grid" and result.shape is not None and len(result.shape) == 2:
        nx, ny = result.shape
        gx, gy = xs.reshape(nx, ny)[:, 0], ys.reshape(nx, ny)[0, :]
        ex, ey = _edges(gx), _edges(gy)
        z = np.ma.masked_invalid(vals.reshape(nx, ny)).T
        mesh = ax.pcolormesh(ex, ey, z, cmap="viridis", shading="flat")
        rects = [
            Rectangle(
                (min(ex[i], ex[i + 1]), min(ey[j], ey[j + 1])), abs(ex[i + 1] - ex[i]), abs(ey[j + 1] - ey[j])
            )
            for i in range(nx)
            for j in range(ny)
            if failed.reshape(nx, ny)[i, j]
        ]
        if rects:
            ax.add_collection(PatchCollection(rects, linewidth=0, **FAILED_STYLE))
        ax.set_xlim(min(ex[0], ex[-1]), max(ex[0], ex[-1]))
        ax.set_ylim(min(ey[0], ey[-1]), max(ey[0], ey[-1]))
        ax.grid(False)
        if failed.any():
            handles.append(Patch(label=f"failed ({int(failed.sum())})", **FAILED_STYLE))
    else:
        mesh = ax.scatter(xs[~failed], ys[~failed], c=vals[~failed], cmap="viridis", s=14)
        if failed.any():
            (cross,) = ax.plot(
                xs[failed], ys[failed], "x", color="#8c8c8c", ms=5, label=f"failed ({int(failed.sum())})"
            )
            handles.append(cross)
    if handles:
        ax.legend(handles=handles, loc="upper left", bbox_to_anchor=(0.0, 1.12), fontsize=8.5, ncols=1)
    if (~failed).any():
        cb = ax.figure.colorbar(mesh, ax=ax)
        cb.set_label(_label(observable, result.units.get(observable, ""), pretty(observable)))
    ax.set_xlabel(_label(px, result.units.get(px, "")))
    ax.set_ylabel(_label(py, result.units.get(py, "")))
    return ax


def _edges(c: Any) -> Any:
    """Cell edges around centres ``c`` (midpoints inside, half a step beyond the ends)."""
    import numpy as np

    c = np.asarray(c, dtype=float)
    if len(c) == 1:
        return np.array([c[0] - 0.5, c[0] + 0.5])
    mid = 0.5 * (c[1:] + c[:-1])
    return np.concatenate([[c[0] - (mid[0] - c[0])], mid, [c[-1] + (c[-1] - mid[-1])]])


def _caption_text(result: Any) -> str:
    fixed = ", ".join(f"{k}={v:g}" for k, v in result.parameters.items())
    return f"{result.background} ({fixed or 'no fixed parameters'}); {result.message}; model units"


def write_scan_plots(result: Any, out: str | Path, stem: str = "scan") -> list[Path]:
    """One PNG per observable: a heat map for two varied parameters, else curves per parameter."""
    from holostring.report.style import caption, pyplot

    plt = pyplot()
    out = Path(out)
    paths = []
    for k, spec in enumerate(result.observables):
        slug = re.sub(r"[^A-Za-z0-9_.-]+", "_", spec)
        if len(result.varied) == 2:
            fig, ax = plt.subplots(figsize=(6.4, 5.0))
            plot_scan_map(result, spec, ax=ax)
        else:
            n = len(result.varied)
            fig, axes = plt.subplots(1, n, figsize=(6.4 if n == 1 else 4.2 * n, 4.4), squeeze=False)
            for ax, name in zip(axes[0], result.varied, strict=True):
                plot_scan_line(result, spec, name, ax=ax)
        fig.suptitle(pretty(spec), fontsize=11)
        caption(fig, _caption_text(result))
        paths.append(write_figure(fig, out / f"{stem}_{k}_{slug}.png"))
        plt.close(fig)
    return paths


# --------------------------------------------------------------------------- terminal
def _pattern(message: str) -> str:
    return re.sub(r"-?\d+(\.\d+)?(e[-+]?\d+)?", "#", message)


def failure_groups(result: Any, limit: int = 6) -> list[tuple[str, int, str]]:
    """Failure reasons grouped by their wording (numbers aside): (example message, count, where)."""
    groups: dict[str, list[Any]] = {}
    for r in result.rows:
        if r.ok:
            continue
        g = groups.setdefault(_pattern(r.message), [r.message, 0, r.point])
        g[1] += 1
    out = []
    ordered = sorted(groups.values(), key=lambda g: -g[1])
    for msg, count, point in ordered[:limit]:
        where = ", ".join(f"{k}={v:.6g}" for k, v in point.items())
        out.append((msg, count, where))
    rest = ordered[limit:]
    if rest:
        out.append(
            (f"{len(rest)} other reasons (see the message column of the table)", sum(g[1] for g in rest), "")
        )
    return out


def scan_summary(result: Any) -> list[Any]:
    """Rich renderables for the terminal: per-observable ranges and the failure reasons."""
    from rich.table import Table

    from holostring.report.tables import fmt

    head = Table(title=f"scan of {result.background}: {result.message}", title_justify="left")
    head.add_column("observable", no_wrap=True)
    head.add_column("unit")
    head.add_column("computed", justify="right")
    head.add_column("min", justify="right")
    head.add_column("max", justify="right")
    head.add_column("max error", justify="right")
    for s in result.observables:
        vals = [v for v in result.column(s) if math.isfinite(v)]
        errs = [v for v in result.errors(s) if math.isfinite(v)]
        head.add_row(
            s, result.units.get(s, "") or "-", f"{len(vals)}/{len(result.rows)}",
            fmt(min(vals) if vals else None, 6), fmt(max(vals) if vals else None, 6),
            fmt(max(errs) if errs else None, 3),
        )  # fmt: skip
    parts: list[Any] = [head]
    groups = failure_groups(result)
    if groups:
        fail = Table(title="failed points (grouped by reason)", title_justify="left")
        fail.add_column("points", justify="right")
        fail.add_column("reason (first example)")
        fail.add_column("at")
        for msg, count, where in groups:
            fail.add_row(str(count), msg, where)
        parts.append(fail)
    return parts
