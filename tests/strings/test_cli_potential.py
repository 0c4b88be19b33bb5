"""The potential command through typer's CliRunner."""

import json

from typer.testing import CliRunner

from holostring.cli import app

runner = CliRunner()


def test_potential_json_keys_and_values():
    r = runner.invoke(app, ["potential", "ads-black-brane", "--points", "20", "--json"])
    assert r.exit_code == 0, r.output
    d = json.loads(r.output)
    for key in (
        "L",
        "V",
        "string_tension",
        "coulomb_coefficient",
        "r0",
        "scheme",
        "error_estimate",
        "screening_length",
        "max_separation",
    ):
        assert key in d
    # Rey-Theisen-Yee hep-th/9803135: L_max pi T ~ 0.869 (from memory, 3 digits)
    assert abs(d["max_separation"] - 0.869) < 1e-3


def test_potential_out_writes_files(tmp_path):
    r = runner.invoke(
        app,
        [
            "potential",
            "soft-wall",
            "--param",
            "c=1",
            "--points",
            "30",
            "--range",
            "0.1:5",
            "--out",
            str(tmp_path),
        ],
    )
    assert r.exit_code == 0, r.output
    names = {p.name for p in tmp_path.iterdir()}
    assert {"potential.json", "potential.png", "profiles.png", "potential_minimum.csv"} <= names


def test_potential_bad_range_exits_2():
    r = runner.invoke(app, ["potential", "ads", "--range", "5:1"])
    assert r.exit_code == 2
    assert "--range" in r.output


def test_potential_summary_flags_kappa_on_non_ads_background():
    r = runner.invoke(app, ["potential", "d4-soliton", "--points", "20"])
    assert r.exit_code == 0, r.output
    assert "kappa: not meaningful" in r.output
