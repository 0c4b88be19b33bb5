"""``holostring spectrum``: glueball and meson masses of a background (Sturm-Liouville modes)."""

from __future__ import annotations

from enum import StrEnum
from pathlib import Path

import typer

from holostring.cli.common import BACKGROUND_HELP, PARAM_HELP, echo_json, guarded, resolve_background


class WallCondition(StrEnum):
    """Condition on the field at a hard wall (mirrors holostring.spectra.BoundaryKind)."""

    dirichlet = "dirichlet"
    neumann = "neumann"


@guarded
def spectrum(
    background: str = typer.Argument(..., help=BACKGROUND_HELP),
    param: list[str] = typer.Option(None, "--param", "-p", help=PARAM_HELP),
    channel: str = typer.Option(
        "scalar-glueball",
        "--channel",
        "-c",
        help="scalar-glueball, tensor-glueball, vector-meson, or a field declared in the file.",
    ),
    states: int = typer.Option(10, "--states", "-n", help="Number of states n = 0..N-1."),
    boundary: WallCondition = typer.Option(
        None, "--boundary", help="At a hard wall: condition on the field (default dirichlet)."
    ),
    as_json: bool = typer.Option(False, "--json", help="Print JSON instead of a table."),
    out: Path = typer.Option(None, "--out", help="Write JSON, CSV and PNG plots here."),
    unit: str = typer.Option(
        None, "--unit", help="Read dimensionful parameters in this energy unit (GeV, MeV, TeV)."
    ),
) -> None:
    """Masses m_n of a channel: -psi'' + U psi = m^2 psi on BACKGROUND.

    Solved by a spectral Galerkin method at two resolutions; the difference is the error shown.
    Needs a confining IR end (hard wall, cap, or a confining potential at infinity).
    """
    from holostring.errors import InputError

    if states < 1:
        raise InputError("--states", f"must be at least 1, got {states}")
    bg = resolve_background(background, param, unit)
    from holostring.spectra import fit_regge, solve_spectrum

    result = solve_spectrum(bg, channel, states=states, boundary=None if boundary is None else boundary.value)
    fit = fit_regge(result) if result.states >= 2 else None
    from holostring.report.spectrum import print_summary, spectrum_data, write_outputs

    if out is not None:
        paths = write_outputs(out, result, fit)
        if not as_json:
            typer.echo("wrote " + ", ".join(str(p) for p in paths))
    if as_json:
        echo_json(spectrum_data(result, fit))
        return
    print_summary(result, fit)
