"""Text and rich tables for the terminal, including the statement of the tool's limits."""

from __future__ import annotations

from typing import Any

LIMITS = (
    "Classical Nambu-Goto string and classical bulk fields: valid at large N and strong coupling; "
    "no quantum string corrections (e.g. the Luscher term) unless computed; the backgrounds are "
    "models, and their numbers are not QCD predictions."
)


def limits_statement() -> str:
    """The one-paragraph statement of what the numbers mean and do not mean."""
    return LIMITS


def console() -> Any:
    """A rich console on stdout (plain text when not a terminal)."""
    from rich.console import Console

    return Console(highlight=False, soft_wrap=False)


def fmt(x: float | None, digits: int = 10) -> str:
    """Format a number for tables; None becomes an em dash."""
    if x is None:
        return "—"
    return f"{x:.{digits}g}"


def catalogue_table(entries: list[dict[str, Any]]) -> Any:
    """Rich table of catalogue entries (name, parameters with units and ranges, source)."""
    from rich.table import Table

    table = Table(title="holostring catalogue", show_lines=True)
    table.add_column("name", style="bold")
    table.add_column("parameters (default, range, unit)")
    table.add_column("IR end")
    table.add_column("source")
    for e in entries:
        params = "\n".join(
            f"{k} = {v['default']:g}  {v['range']}" + (f"  [{v['unit']}]" if v["unit"] else "")
            for k, v in e["parameters"].items()
        )
        ir = e["ir_end"]["kind"] + (f" at {e['ir_end']['at']}" if e["ir_end"]["at"] else "")
        table.add_row(f"{e['name']}\n[dim]{e['title']}[/dim]", params, ir, e["source"])
    return table
