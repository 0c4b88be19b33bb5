"""``holostring calibrate``: fit a background's free parameters to physical targets."""

from __future__ import annotations

import typer

from holostring.cli.common import BACKGROUND_HELP, PARAM_HELP, echo_json, guarded, resolve_background


@guarded
def calibrate(
    background: str = typer.Argument(..., help=BACKGROUND_HELP),
    targets_file: str = typer.Argument(..., help="TOML file of targets and free parameters."),
    param: list[str] = typer.Option(None, "--param", "-p", help=PARAM_HELP),
    as_json: bool = typer.Option(False, "--json", help="Print JSON instead of tables."),
    out: str = typer.Option(
        None, "--out", help="Write calibration.json, predictions.csv, residuals.png here."
    ),
) -> None:
    """Fit the free parameters of BACKGROUND to the targets in TARGETS_FILE (weighted least squares)."""
    from holostring.fit.calibrate import calibrate as run
    from holostring.fit.targets import load_targets

    bg = resolve_background(background, param)
    targets = load_targets(targets_file)
    if out is not None:
        from holostring.report.files import prepare_dir

        prepare_dir(out)
    result = run(bg, targets)
    if out is not None:
        from holostring.report.calibration import write_calibration

        write_calibration(result, out)
    if as_json:
        echo_json(result.to_dict())
    else:
        from holostring.report.calibration import calibration_tables
        from holostring.report.tables import console, limits_statement

        con = console()
        for table in calibration_tables(result):
            con.print(table)
        con.print(f"[dim]{limits_statement()}[/dim]")
    if not result.converged:
        typer.echo(f"warning: {result.message}", err=True)
