"""``holostring analyze``: every analysis that applies to a background, in one report folder."""

from __future__ import annotations

import sys

import typer

from holostring.cli.common import BACKGROUND_HELP, PARAM_HELP, UNIT_HELP, guarded, resolve_background

DEFAULT_EXAMPLE = "ember-throat"


@guarded
def analyze(
    background: str = typer.Argument(None, help=BACKGROUND_HELP + " Default: the bundled example."),
    param: list[str] = typer.Option(None, "--param", "-p", help=PARAM_HELP),
    targets: str = typer.Option(
        None, "--targets", help="Targets file: calibrate first, then analyse the calibrated model."
    ),
    out: str = typer.Option(
        "holostring-report", "--out", help="Report folder (created; never overwritten without --force)."
    ),
    force: bool = typer.Option(False, "--force", help="Replace an existing report folder."),
    states: int = typer.Option(10, "--states", help="States per spectral channel."),
    points: int = typer.Option(200, "--points", help="Separations for V(L)."),
    unit: str = typer.Option(None, "--unit", help=UNIT_HELP),
) -> None:
    """Run diagnostics, V(L), spectra, temperature (and calibration) and write a report folder.

    The folder gets summary.md, report.html (figures embedded), figures/*.png, tables/*.csv and
    report.json with every number, its error estimate, the settings, the formulas, the version
    and the input file's hash.
    """
    from holostring.errors import InputError
    from holostring.report.bundle import check_target

    if not 1 <= states <= 200:
        raise InputError("--states", f"must be between 1 and 200, got {states}")
    if not 10 <= points <= 20000:
        raise InputError("--points", f"must be between 10 and 20000, got {points}")
    check_target(out, force)  # refuse early, before any work
    spec = background if background is not None else _example()
    bg = resolve_background(spec, param, unit)
    ts = None
    if targets is not None:
        from holostring.fit.targets import load_targets

        ts = load_targets(targets)

    from rich.progress import BarColumn, Progress, TextColumn, TimeElapsedColumn

    from holostring.workflow import analyze as run

    with Progress(
        TextColumn("{task.description:<28}"),
        BarColumn(),
        TextColumn("{task.completed}/{task.total}"),
        TimeElapsedColumn(),
        transient=False,
        console=_stderr_console(),
    ) as bar:
        task = bar.add_task("starting", total=1)

        def progress(label: str, done: int, total: int) -> None:
            bar.update(task, description=label, completed=done, total=total)

        result = run(bg, targets=ts, states=states, points=points, progress=progress)
        bar.update(task, description="figures and report")
        profiles = _profiles(result)
        from holostring.report.analysis import write_report

        folder = write_report(result, out, force=force, profiles=profiles, command=sys.argv)
        bar.update(task, description="done")
    typer.echo(f"report written to {folder}/ (summary.md, report.html, report.json, figures/, tables/)")
    if result.skipped:
        for k, v in result.skipped.items():
            typer.echo(f"  {k}: {v}")
    if not result.converged:
        typer.echo("warning: some results did not converge; see the report", err=True)


def _example() -> str:
    from pathlib import Path

    from holostring.background import catalogue

    local = Path("metrics") / f"{DEFAULT_EXAMPLE}.toml"
    return str(local) if local.exists() else catalogue.path_of("soft-wall")


def _profiles(result: object) -> object:
    pot = getattr(result, "potential", None)
    if pot is None:
        return None
    from holostring.errors import HolostringError
    from holostring.strings import profiles_along

    try:
        return profiles_along(result.background, pot)  # type: ignore[attr-defined]
    except HolostringError:
        return None


def _stderr_console() -> object:
    from rich.console import Console

    return Console(stderr=True)
