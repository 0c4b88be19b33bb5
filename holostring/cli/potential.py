"""``holostring potential``: the static quark-antiquark potential V(L) with its analysis."""

from __future__ import annotations

from enum import StrEnum
from pathlib import Path

import typer

from holostring.cli.common import (
    BACKGROUND_HELP,
    PARAM_HELP,
    UNIT_HELP,
    echo_json,
    guarded,
    resolve_background,
)


class SchemeChoice(StrEnum):
    """Regularisation schemes (mirrors holostring.strings.Scheme, kept here so --help is fast)."""

    uv_pole = "uv-pole"
    straight_strings = "straight-strings"


#: separations outside [1e-12, 1e12] (model units), or spanning more than 12 decades, are refused
L_LIMITS = (1e-12, 1e12)


def _parse_range(text: str | None, field: str = "--range") -> tuple[float, float] | None:
    from holostring.errors import InputError

    if text is None:
        return None
    lo, sep, hi = text.partition(":")
    try:
        a, b = float(lo), float(hi)
    except ValueError:
        raise InputError(field, f"expected LMIN:LMAX, got '{text}'") from None
    if not sep or not (0 < a < b) or b == float("inf"):
        raise InputError(field, f"need 0 < LMIN < LMAX, got '{text}'")
    if a < L_LIMITS[0] or b > L_LIMITS[1]:
        raise InputError(
            field, f"separations must lie in [{L_LIMITS[0]:g}, {L_LIMITS[1]:g}] model units, got '{text}'"
        )
    return a, b


@guarded
def potential(
    background: str = typer.Argument(..., help=BACKGROUND_HELP),
    param: list[str] = typer.Option(None, "--param", "-p", help=PARAM_HELP),
    range_: str = typer.Option(None, "--range", help="Separations LMIN:LMAX (model units)."),
    points: int = typer.Option(200, "--points", help="Number of separations on the grid."),
    scheme: SchemeChoice = typer.Option(
        SchemeChoice.uv_pole, "--scheme", help="Regularisation scheme of the energy."
    ),
    fit_range: str = typer.Option(
        None, "--fit-range", help="L range LMIN:LMAX of the Cornell fit (default: --range)."
    ),
    as_json: bool = typer.Option(False, "--json", help="Print JSON instead of the summary."),
    out: Path = typer.Option(None, "--out", help="Write CSV per branch, JSON and PNG plots here."),
    unit: str = typer.Option(None, "--unit", help=UNIT_HELP),
) -> None:
    """Static potential V(L): every string branch, Cornell fit, Sommer scales, screening.

    Solves the Nambu-Goto string hanging from the boundary for each separation L (no
    interpolation), with an error estimate from a second quadrature resolution.
    """
    from holostring.background.diagnostics import diagnose
    from holostring.errors import InputError
    from holostring.strings import compute_potential, profiles_along

    if points < 2:
        raise InputError("--points", f"need at least 2 separations, got {points}")
    bg = resolve_background(background, param, unit)
    res = compute_potential(
        bg,
        scheme=scheme.value,
        L_range=_parse_range(range_),
        points=points,
        fit_range=_parse_range(fit_range, "--fit-range"),
    )
    symbolic = diagnose(bg)
    from holostring.report.potential import summary_lines, write_potential_outputs

    if out is not None:
        paths = write_potential_outputs(res, out, profiles_along(bg, res), symbolic)
        if not as_json:
            typer.echo("wrote " + ", ".join(str(p) for p in paths))
    if as_json:
        data = res.to_dict()
        data["symbolic"] = {
            "string_tension": symbolic.string_tension,
            "coulomb_coefficient": symbolic.coulomb_coefficient,
        }
        echo_json(data)
        return
    for line in summary_lines(res, symbolic):
        typer.echo(line)
