"""Terminal table for background diagnostics."""

from __future__ import annotations

from typing import Any

from holostring.report.tables import fmt


def diagnostics_table(bg: Any, d: Any) -> Any:
    """Rich table of a :class:`~holostring.background.diagnostics.Diagnostics` result."""
    from rich.table import Table

    params = ", ".join(f"{k}={v:g}" for k, v in bg.params.items())
    table = Table(title=f"{bg.name}  ({params})", show_header=False, title_justify="left")
    table.add_column("quantity", style="bold")
    table.add_column("value")
    table.add_row("source", bg.source or bg.origin)
    table.add_row(
        "frame", f"stored in the {bg.frame} frame (rule {bg.frame_rule}); strings use the string frame"
    )
    table.add_row("F = sqrt(G_tt G_xx)", d.formulas.get("F", ""))
    table.add_row("H = sqrt(G_tt G_zz)", d.formulas.get("H", ""))
    uv = "asymptotically AdS5" if d.asymptotically_ads else "not asymptotically AdS"
    if d.uv_power is not None:
        uv += f"  (G_xx ~ z^{d.uv_power:g})"
    table.add_row("UV", uv)
    ir = d.ir_kind + ("" if d.ir_position is None else f" at z = {fmt(d.ir_position)}")
    table.add_row("IR end", ir)
    table.add_row("confining", ("yes" if d.confining else "no") + f"  [dim]{d.criterion}[/dim]")
    if d.confinement_point is not None:
        table.add_row("z_m", fmt(d.confinement_point, 12))
    if d.string_tension is not None:
        err = "exact" if not d.string_tension_error else f"± {d.string_tension_error:.1e}"
        closed = f" = {d.string_tension_exact}" if d.string_tension_exact else ""
        table.add_row("string tension sigma", f"{fmt(d.string_tension, 12)}  ({err}){closed}")
    if d.coulomb_coefficient is not None:
        table.add_row(
            "Coulomb coefficient kappa", f"{fmt(d.coulomb_coefficient, 12)} = {d.coulomb_coefficient_exact}"
        )
    if d.expansion_slope is not None:
        table.add_row(
            "small-L slope b (V = -kappa/L + C + b L)",
            f"{fmt(d.expansion_slope, 12)} = {d.expansion_slope_exact}",
        )
    if d.crossover_length is not None:
        table.add_row("crossover sqrt(kappa/sigma)", fmt(d.crossover_length, 8))
    if d.temperature is not None:
        table.add_row("temperature T", fmt(d.temperature, 12))
    for note in d.notes:
        table.add_row("note", note)
    return table
