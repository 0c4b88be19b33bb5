"""``holostring backgrounds``: list the catalogue with parameters, units and sources."""

from __future__ import annotations

import typer

from holostring.cli.common import echo_json, guarded


@guarded
def backgrounds(
    as_json: bool = typer.Option(False, "--json", help="Print JSON instead of a table."),
) -> None:
    """List the built-in backgrounds with their parameters, units and published sources."""
    from holostring.background import catalogue

    entries = [catalogue.entry(name).describe() for name in catalogue.names()]
    if as_json:
        echo_json(entries)
        return
    from holostring.report.tables import catalogue_table, console

    console().print(catalogue_table(entries))
