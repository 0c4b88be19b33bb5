"""The spectrum command: table, JSON keys, files, and one-line errors (exit code 2)."""

from __future__ import annotations

import json

from scipy.special import jn_zeros
from typer.testing import CliRunner

from holostring.cli import app

runner = CliRunner()


def test_json_has_the_promised_keys():
    res = runner.invoke(app, ["spectrum", "hard-wall", "--states", "3", "--boundary", "neumann", "--json"])
    assert res.exit_code == 0, res.output
    data = json.loads(res.output)
    for key in ("channel", "masses", "masses_squared", "error_estimate"):
        assert key in data
    assert data["boundary"] == "neumann"
    # Neumann on the field: zeros of J_1 (Boschi-Filho & Braga, hep-th/0209080)
    assert abs(data["masses"][0] / jn_zeros(1, 1)[0] - 1) < 1e-10


def test_table_and_files(tmp_path):
    res = runner.invoke(
        app,
        [
            "spectrum",
            "soft-wall",
            "--param",
            "c=1",
            "--channel",
            "vector-meson",
            "--states",
            "4",
            "--out",
            str(tmp_path),
        ],
    )
    assert res.exit_code == 0, res.output
    assert "Regge fit" in res.output and "converged" in res.output
    for name in ("spectrum.json", "spectrum.csv", "modes.csv", "potential.png", "modes.png", "regge.png"):
        assert (tmp_path / name).stat().st_size > 0


def test_errors_are_one_line_exit_2():
    for args in (
        ["spectrum", "soft-wall", "--boundary", "neumann"],
        ["spectrum", "ads-black-brane"],
        ["spectrum", "hard-wall", "--channel", "pion"],
        ["spectrum", "hard-wall", "--states", "0"],
    ):
        res = runner.invoke(app, args)
        assert res.exit_code == 2, (args, res.output)
        assert "Traceback" not in res.output


def test_potential_plot_levels_have_distinct_colours():
    from holostring.background import load_background
    from holostring.report.spectrum import plot_potential
    from holostring.report.style import pyplot
    from holostring.spectra import solve_spectrum

    r = solve_spectrum(load_background("soft-wall", c=1.0), "vector-meson", states=10)
    plt = pyplot()
    fig, ax = plt.subplots()
    plot_potential(r, ax, levels=10)
    colours = [
        tuple(line.get_color()) if not isinstance(line.get_color(), str) else line.get_color()
        for line in ax.get_lines()[1:]
    ]
    plt.close(fig)
    assert len(colours) == 10 and len(set(colours)) == 10
