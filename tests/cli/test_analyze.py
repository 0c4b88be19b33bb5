"""holostring analyze: the report folder, its numbers against the single commands, safety."""

import hashlib
import json
from pathlib import Path

import pytest
from typer.testing import CliRunner

from holostring.cli import app

runner = CliRunner()
ROOT = Path(__file__).resolve().parents[2]
SW = str(ROOT / "metrics" / "soft-wall.toml")


@pytest.fixture(scope="module")
def report(tmp_path_factory):
    out = tmp_path_factory.mktemp("rep") / "soft"
    r = runner.invoke(app, ["analyze", SW, "--out", str(out)])
    assert r.exit_code == 0, r.output
    return out


def test_folder_contents(report):
    names = {p.name for p in report.iterdir()}
    assert {"summary.md", "report.html", "report.json", "figures", "tables"} <= names
    pngs = list((report / "figures").glob("*.png"))
    csvs = list((report / "tables").glob("*.csv"))
    assert len(pngs) >= 8 and len(csvs) >= 5
    html = (report / "report.html").read_text()
    assert html.count("data:image/png;base64,") == len(pngs)
    assert "not QCD predictions" in (report / "summary.md").read_text()


def test_numbers_match_the_single_commands(report):
    data = json.loads((report / "report.json").read_text())
    inspect = json.loads(runner.invoke(app, ["inspect", SW, "--json"]).stdout)
    assert data["diagnostics"]["string_tension"] == inspect["string_tension"]
    pot = json.loads(runner.invoke(app, ["potential", SW, "--json"]).stdout)
    assert data["potential"]["V"] == pot["V"] and data["potential"]["L"] == pot["L"]
    assert data["potential"]["r0"] == pot["r0"]
    spec = json.loads(runner.invoke(app, ["spectrum", SW, "--channel", "vector-meson", "--json"]).stdout)
    assert data["spectra"]["vector-meson"]["masses"] == spec["masses"]
    thermo = json.loads(runner.invoke(app, ["thermo", SW, "--json"]).stdout)
    assert data["thermo"]["critical_temperature"] == thermo["critical_temperature"]


def test_reproducibility_fields(report):
    data = json.loads((report / "report.json").read_text())
    assert data["holostring_version"]
    assert data["background"]["metric"]["G_xx"]
    assert data["settings"]["points"] == 200
    assert "limits" in data


def _snapshot(folder: Path) -> dict[str, str]:
    return {
        str(p.relative_to(folder)): hashlib.sha256(p.read_bytes()).hexdigest()
        for p in sorted(folder.rglob("*"))
        if p.is_file()
    }


def test_existing_report_is_never_overwritten(report):
    before = _snapshot(report)
    r = runner.invoke(app, ["analyze", "hard-wall", "--out", str(report)])
    assert r.exit_code == 2 and "--force" in r.stderr
    # with --force but bad input: still untouched
    r = runner.invoke(app, ["analyze", "soft-wall", "--param", "c=-1", "--out", str(report), "--force"])
    assert r.exit_code == 2
    assert _snapshot(report) == before


def test_force_replaces_atomically(tmp_path):
    out = tmp_path / "r"
    out.mkdir()
    (out / "old.txt").write_text("old")
    r = runner.invoke(
        app, ["analyze", "hard-wall", "--out", str(out), "--force", "--states", "4", "--points", "40"]
    )
    assert r.exit_code == 0, r.output
    assert not (out / "old.txt").exists() and (out / "report.json").exists()
    assert not [p for p in tmp_path.iterdir() if p.name.startswith(".")]


def test_default_background_is_the_bundled_example(tmp_path, monkeypatch):
    monkeypatch.chdir(ROOT)
    out = tmp_path / "ex"
    r = runner.invoke(app, ["analyze", "--out", str(out), "--states", "4", "--points", "40"])
    assert r.exit_code == 0, r.output
    assert json.loads((out / "report.json").read_text())["background"]["name"] == "ember-throat"


def test_targets_calibrate_first(tmp_path):
    out = tmp_path / "cal"
    r = runner.invoke(
        app,
        [
            "analyze",
            "soft-wall",
            "--targets",
            str(ROOT / "examples/targets/soft-wall-rho.toml"),
            "--out",
            str(out),
            "--states",
            "4",
            "--points",
            "60",
        ],
    )
    assert r.exit_code == 0, r.output
    data = json.loads((out / "report.json").read_text())
    # c = m_rho^2/4 (KKSS hep-ph/0602229), rho mass 0.775 GeV (PDG, from memory)
    assert data["calibration"]["fitted"]["c"]["value"] == pytest.approx(0.775**2 / 4, rel=1e-9)
    assert data["background"]["energy_unit"] == "GeV"
    assert data["spectra"]["vector-meson"]["masses"][0] == pytest.approx(0.775, rel=1e-9)
