"""The thermo command: JSON keys, files written, units and the bad-input contract."""

import json
import math

import pytest
from scipy.special import jn_zeros
from typer.testing import CliRunner

from holostring.cli import app
from tests.thermo import reference as ref

runner = CliRunner()


def run(*args):
    return runner.invoke(app, list(args))


def test_hard_wall_json_no_screening():
    r = run("thermo", "hard-wall", "--param", "z0=2", "--json", "--no-screening")
    assert r.exit_code == 0, r.output
    d = json.loads(r.stdout)
    value, tol, _ = ref.HARD_WALL_TC_Z0
    assert d["critical_temperature"] * 2 == pytest.approx(value, rel=tol)
    assert d["critical_temperature_gev"] is None
    assert d["free_energy"] and {"temperature", "free_energy_difference"} <= set(d["free_energy"][0])
    assert "cutoff" in d["regularisation"]
    assert any("back-reacted" in a for a in d["assumptions"])


def test_soft_wall_in_mev_with_units():
    c = ref.M_RHO_GEV**2 / 4
    r = run("thermo", "soft-wall", "-p", f"c={c!r}", "--unit", "GeV", "--json", "--no-screening")
    assert r.exit_code == 0, r.output
    d = json.loads(r.stdout)
    value, tol, _ = ref.SOFT_WALL_TC_MEV
    assert abs(d["critical_temperature_mev"] - value) <= tol
    assert d["critical_temperature_gev"] == pytest.approx(d["critical_temperature"], rel=1e-15)


def test_hard_wall_in_mev_from_rho_mass():
    z0 = float(jn_zeros(0, 1)[0]) / ref.M_RHO_GEV
    d = json.loads(
        run("thermo", "hard-wall", "-p", f"z0={z0!r}", "--unit", "GeV", "--json", "--no-screening").stdout
    )
    value, tol, _ = ref.HARD_WALL_TC_MEV
    assert abs(d["critical_temperature_mev"] - value) <= tol


def test_table_output_has_tc_and_limits():
    r = run("thermo", "soft-wall", "--no-screening")
    assert r.exit_code == 0, r.output
    assert "T_c = 0.49172780" in r.stdout
    assert "large N" in r.stdout


def test_out_writes_files(tmp_path):
    r = run("thermo", "hard-wall", "--no-screening", "--out", str(tmp_path / "o"))
    assert r.exit_code == 0, r.output
    for name in ("thermo.json", "free_energy.csv", "free_energy.png"):
        assert (tmp_path / "o" / name).stat().st_size > 0
    d = json.loads((tmp_path / "o" / "thermo.json").read_text())
    assert math.isfinite(d["critical_temperature"])


@pytest.mark.parametrize(
    ("args", "needle"),
    [
        (("soft-wall", "-p", "c=-1"), "parameter c"),
        (("ads-soliton",), "soliton"),
        (("hard-wall", "--unit", "furlong"), "--unit"),
        (("hard-wall", "--points", "1"), "--points"),
        (("hard-wall", "--t-max", "0.5"), "--t-max"),
        (("no-such-background",), "background"),
    ],
)
def test_bad_input_exit_2_one_line(args, needle):
    r = run("thermo", *args)
    assert r.exit_code == 2
    assert needle in r.output
    assert "Traceback" not in r.output


def test_json_screening_rows_and_plots(tmp_path):
    out = tmp_path / "hw"
    r = run("thermo", "hard-wall", "-p", "z0=1", "--points", "2", "--json", "--out", str(out))
    assert r.exit_code == 0, r.output
    d = json.loads(r.stdout)
    rows = d["screening"]
    assert len(rows) == 2
    lmax_ref, ls_ref = ref.ads_black_brane_screening()  # hard wall above T_c = AdS black brane
    for row in rows:
        assert row["max_separation"] * row["temperature"] * math.pi == pytest.approx(lmax_ref, rel=1e-9)
        assert row["screening_length"] * row["temperature"] * math.pi == pytest.approx(ls_ref, rel=1e-9)
    assert d["string_tension_below_tc"] == pytest.approx(1.0, rel=1e-10)
    for name in ("screening.csv", "screening_length.png", "free_energy.png"):
        assert (out / name).stat().st_size > 0
