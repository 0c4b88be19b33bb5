"""``holostring inspect``: symbolic diagnostics of a background."""

from __future__ import annotations

import typer

from holostring.cli.common import BACKGROUND_HELP, PARAM_HELP, echo_json, guarded, resolve_background


@guarded
def inspect(
    background: str = typer.Argument(..., help=BACKGROUND_HELP),
    param: list[str] = typer.Option(None, "--param", "-p", help=PARAM_HELP),
    as_json: bool = typer.Option(False, "--json", help="Print JSON instead of a table."),
) -> None:
    """Diagnose a background: UV and IR behaviour, confinement, string tension, Coulomb term."""
    from holostring.background.diagnostics import diagnose

    bg = resolve_background(background, param)
    result = diagnose(bg)
    if as_json:
        data = result.to_dict()
        data["background_definition"] = bg.describe()
        echo_json(data)
        return
    from holostring.report.diagnostics import diagnostics_table
    from holostring.report.tables import console, limits_statement

    out = console()
    out.print(diagnostics_table(bg, result))
    out.print(f"[dim]{limits_statement()}[/dim]")
