"""``holostring thermo``: deconfinement temperature (Hawking-Page) and screening versus T."""

from __future__ import annotations

from pathlib import Path

import typer

from holostring.cli.common import BACKGROUND_HELP, PARAM_HELP, echo_json, guarded, resolve_background


@guarded
def thermo(
    background: str = typer.Argument(..., help=BACKGROUND_HELP),
    param: list[str] = typer.Option(None, "--param", "-p", help=PARAM_HELP),
    as_json: bool = typer.Option(False, "--json", help="Print JSON instead of tables."),
    out: Path = typer.Option(None, "--out", help="Write thermo.json, CSV tables and PNG plots here."),
    unit: str = typer.Option(
        None, "--unit", help="Read dimensionful parameters in this energy unit (GeV, MeV, TeV)."
    ),
    t_max: float = typer.Option(
        3.0, "--t-max", help="Screening up to this multiple of T_c (or of the lowest T scanned)."
    ),
    points: int = typer.Option(12, "--points", help="Number of temperatures for screening."),
    screening: bool = typer.Option(
        True, "--screening/--no-screening", help="Compute the screening length versus T."
    ),
) -> None:
    """Deconfinement temperature T_c, free-energy difference and screening length versus T.

    Builds the black-brane partner of BACKGROUND (hard or soft wall, a user throat, or a file
    with its own blackening f).

    Compares the regularised on-shell actions of the thermal and black-brane geometries
    (Hawking-Page) and scans the static string in the black brane.
    """
    import math

    from holostring.errors import InputError, NotApplicableError
    from holostring.thermo import compute_screening, compute_transition, thermal_family

    if points < 2:
        raise InputError("--points", f"need at least 2 temperatures, got {points}")
    if not t_max > 1.0:
        raise InputError("--t-max", f"must be larger than 1, got {t_max:g}")
    bg = resolve_background(background, param, unit)
    family = thermal_family(bg)
    transition = compute_transition(family)
    scr = None
    if screening:
        t0 = transition.critical_temperature
        if t0 is None:
            zh0 = 0.9 * family.wall if math.isfinite(family.wall) else 2.0 * family.scale
            t0 = float(family.temperature(zh0))
        try:
            scr = compute_screening(family, transition=transition, t_range=(t0, t_max * t0), points=points)
        except NotApplicableError as err:
            typer.echo(f"note: no screening scan ({err})", err=True)
    from holostring.report.thermo import print_summary, thermo_data, write_outputs

    if out is not None:
        paths = write_outputs(out, transition, scr)
        if not as_json:
            typer.echo("wrote " + ", ".join(str(p) for p in paths))
    if as_json:
        echo_json(thermo_data(transition, scr))
        return
    print_summary(transition, scr)
