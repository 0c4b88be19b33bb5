"""Calibration results: terminal table, files and the residual (pull) plot."""

from __future__ import annotations

from pathlib import Path
from typing import Any

from holostring.report.files import prepare_dir, write_csv, write_figure, write_json
from holostring.report.tables import fmt


def calibration_tables(res: Any) -> list[Any]:
    """Rich tables: fitted parameters, then predictions against targets."""
    from rich.table import Table

    fitted = Table(title=f"calibration of {res.background}: {res.message}", title_justify="left")
    for col in ("parameter", "value", "uncertainty", "unit"):
        fitted.add_column(col)
    for n in res.names:
        fitted.add_row(n, fmt(res.values[n], 10), fmt(res.uncertainties[n], 3), res.units[n])
    chi = f"chi^2 = {res.chi2:.4g}, dof = {res.dof}"
    if res.chi2_per_dof is not None:
        chi += f", chi^2/dof = {res.chi2_per_dof:.4g}"
    fitted.caption = chi
    if len(res.names) > 1:
        pairs = [
            f"{a}-{b}: {res.correlation[i, j]:+.3f}"
            for i, a in enumerate(res.names)
            for j, b in enumerate(res.names)
            if i < j
        ]
        fitted.caption += "; correlations " + ", ".join(pairs)
    methods = res.provenance.settings.get("gradients") or {}
    if methods:
        fitted.caption += "; gradients: " + "; ".join(f"{k}: {v.split(':')[0]}" for k, v in methods.items())
    pred = Table(title="predictions of the calibrated model", title_justify="left")
    pred.add_column("observable", overflow="fold")
    for col in ("model", "± propagated", "target", "pull", "unit"):
        pred.add_column(col)
    for p in res.predictions:
        pull = p.pull
        pred.add_row(
            p.observable,
            fmt(p.value, 8),
            fmt(p.uncertainty, 3),
            "—" if p.target is None else f"{p.target:g} ± {p.target_uncertainty:g}",
            "—" if pull is None else f"{pull:+.2f}",
            p.unit,
        )
    return [fitted, pred]


def write_calibration(res: Any, out: str | Path) -> list[Path]:
    """Write calibration.json, predictions.csv and residuals.png into ``out``."""
    folder = prepare_dir(out)
    paths = [write_json(folder / "calibration.json", res.to_dict())]
    paths.append(
        write_csv(
            folder / "predictions.csv",
            [
                "observable",
                "value",
                "uncertainty",
                "numerical_error",
                "unit",
                "target",
                "target_uncertainty",
                "pull",
            ],
            [
                [
                    p.observable,
                    p.value,
                    p.uncertainty,
                    p.numerical_error,
                    p.unit,
                    p.target,
                    p.target_uncertainty,
                    p.pull,
                ]
                for p in res.predictions
            ],
            comments=[
                f"calibration of {res.background}: "
                + ", ".join(f"{n} = {res.values[n]:.8g} ± {res.uncertainties[n]:.3g}" for n in res.names)
            ],
        )
    )
    ax = plot_residuals(res)
    paths.append(write_figure(ax.figure, folder / "residuals.png"))
    from holostring.report.style import pyplot

    pyplot().close(ax.figure)
    return paths


def plot_residuals(res: Any, ax: Any = None) -> Any:
    """Pulls (model - target)/uncertainty per target, with the +-1 band."""
    from holostring.report.style import caption, pyplot

    plt = pyplot()
    targets = [p for p in res.predictions if p.target is not None]
    if ax is None:
        fig, ax = plt.subplots(figsize=(6.4, 0.9 + 0.55 * max(len(targets), 2)))
    else:
        fig = ax.figure
    y = list(range(len(targets)))
    pulls = [p.pull or 0.0 for p in targets]
    ax.axvspan(-1, 1, color="#2e8b57", alpha=0.12, label="±1 target uncertainty")
    ax.axvline(0, color="#444444", lw=0.8)
    ax.scatter(pulls, y, color="#1f4e79", zorder=3)
    for yi, p in zip(y, targets, strict=True):
        ax.annotate(
            f"{p.value:.4g} vs {p.target:g} {p.unit}",
            (p.pull or 0.0, yi),
            textcoords="offset points",
            xytext=(8, 4),
            fontsize=8,
        )
    ax.set_yticks(y, [p.observable for p in targets])
    lim = max(2.0, 1.3 * max((abs(v) for v in pulls), default=1.0))
    ax.set_xlim(-lim, lim)
    ax.set_ylim(-0.7, len(targets) - 0.3)
    ax.set_xlabel("pull = (model − target) / uncertainty")
    fitted = ", ".join(f"{n} = {res.values[n]:.4g} ± {res.uncertainties[n]:.2g}" for n in res.names)
    ax.set_title(f"{res.background}: {fitted}", fontsize=10)
    ax.legend(loc="lower right", fontsize=8)
    dof = (
        f"χ²/dof = {res.chi2_per_dof:.3g}"
        if res.chi2_per_dof is not None
        else f"χ² = {res.chi2:.2g} (exactly determined)"
    )
    caption(fig, f"{dof}; classical string/bulk fields at large N; model numbers, not QCD predictions")
    return ax
