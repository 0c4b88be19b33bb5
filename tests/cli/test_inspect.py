"""CLI: inspect and backgrounds, and the bad-input contract (exit 2, one line)."""

import json
import math
import subprocess
import sys

import mpmath as mp
import pytest
from typer.testing import CliRunner

from holostring.cli import app

runner = CliRunner()


def run(*args):
    return runner.invoke(app, list(args))


def test_soft_wall_json():
    r = run("inspect", "soft-wall", "--param", "c=1", "--json")
    assert r.exit_code == 0, r.output
    d = json.loads(r.stdout)
    assert d["confining"] is True
    # sigma = e c/2 (Andreev-Zakharov hep-ph/0604204)
    assert d["string_tension"] == pytest.approx(math.e / 2, rel=1e-12)
    assert d["asymptotically_ads"] is True


def test_hard_wall_json():
    d = json.loads(run("inspect", "hard-wall", "--param", "z0=1", "--json").stdout)
    assert d["confining"] is True and d["string_tension"] == pytest.approx(1.0, rel=1e-14)


def test_ads_json():
    d = json.loads(run("inspect", "ads", "--json").stdout)
    assert d["confining"] is False and d["string_tension"] is None
    # Maldacena hep-th/9803002, evaluated with mpmath
    assert d["coulomb_coefficient"] == pytest.approx(float(8 * mp.pi**3 / mp.gamma(0.25) ** 4), rel=1e-12)


def test_table_output_states_limits():
    r = run("inspect", "soft-wall")
    assert r.exit_code == 0
    assert "not QCD predictions" in r.stdout.replace("\n", " ")


def test_backgrounds_lists_catalogue():
    r = run("backgrounds", "--json")
    names = [e["name"] for e in json.loads(r.stdout)]
    assert "soft-wall" in names and "d4-soliton" in names


MALICIOUS = [
    '__import__("os").system("touch {marker}")',
    "z.__class__",
    "(lambda: 1)()",
    "__builtins__",
    "exp(z^2",
    "undeclared*z",
    "(1 - z)/z^2",
]


@pytest.mark.parametrize("formula", MALICIOUS)
def test_bad_background_files_exit_2_with_one_line(tmp_path, formula):
    marker = tmp_path / "marker"
    path = tmp_path / "bad.toml"
    body = formula.format(marker=marker).replace("\\", "\\\\").replace('"', '\\"')
    path.write_text(f'[background]\nname = "bad"\n[metric]\nwarp = "{body}"\n')
    r = run("inspect", str(path), "--json")
    assert r.exit_code == 2
    lines = [ln for ln in r.stderr.splitlines() if ln.strip()]
    assert len(lines) == 1 and lines[0].startswith("error:")
    assert "Traceback" not in r.output
    if "negative" not in lines[0]:
        assert str(path) in lines[0] and "metric.warp" in lines[0]
    assert not marker.exists()


@pytest.mark.parametrize(
    "args",
    [
        ["inspect", "soft-wall", "--param", "c=nan"],
        ["inspect", "soft-wall", "--param", "c=-1"],
        ["inspect", "soft-wall", "--param", "c=abc"],
        ["inspect", "soft-wall", "--param", "c"],
        ["inspect", "soft-wall", "--param", "q=1"],
        ["inspect", "nowhere.toml"],
    ],
)
def test_bad_parameters_exit_2(args):
    r = run(*args)
    assert r.exit_code == 2
    assert len([ln for ln in r.stderr.splitlines() if ln.strip()]) == 1


def test_help_does_not_import_heavy_libraries():
    # start-up cost: the CLI root must not import the numerical stack
    code = (
        "import sys; import holostring.cli; "
        "heavy = [m for m in ('numpy', 'sympy', 'scipy', 'jax', 'matplotlib') if m in sys.modules]; "
        "print(','.join(heavy))"
    )
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.strip() == ""


def test_module_entry_point():
    out = subprocess.run([sys.executable, "-m", "holostring", "--version"], capture_output=True, text=True)
    assert out.returncode == 0 and out.stdout.startswith("holostring ")
