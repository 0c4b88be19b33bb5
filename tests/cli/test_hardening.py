"""Bad input across the CLI: exit code 2, one line naming what is wrong, no traceback, and a
pre-existing output folder left byte for byte as it was."""

import hashlib
from pathlib import Path

import pytest
from typer.testing import CliRunner

from holostring.cli import app

runner = CliRunner()

GOOD = '[background]\nname = "t"\n[parameters.a]\ndefault = 1.0\nrange = "(0, 5)"\n[metric]\nwarp = "exp(a*z^2/2)/z^2"\n'


def files(tmp: Path) -> dict[str, str]:
    bad = {
        "malformed.toml": "[background\nname = 1\n",
        "unknown_key.toml": GOOD + "colour = 'red'\n",
        "unknown_table.toml": GOOD + "\n[extras]\nx = 1\n",
        "construct.toml": GOOD.replace("exp(a*z^2/2)/z^2", "(lambda: 1)()"),
        "attribute.toml": GOOD.replace("exp(a*z^2/2)/z^2", "z.real"),
        "dunder.toml": GOOD.replace("exp(a*z^2/2)/z^2", "__import__('os')"),
        "undeclared.toml": GOOD.replace("exp(a*z^2/2)/z^2", "exp(b*z^2)/z^2"),
        "negative.toml": GOOD.replace("exp(a*z^2/2)/z^2", "(1 - a*z^2)/z^2"),
        "vanishing.toml": GOOD.replace("exp(a*z^2/2)/z^2", "(1 - a*z)^2/z^2"),
    }
    out = {}
    for name, text in bad.items():
        p = tmp / name
        p.write_text(text)
        out[name] = str(p)
    return out


def snapshot(folder: Path) -> dict[str, str]:
    return {
        str(p.relative_to(folder)): hashlib.sha256(p.read_bytes()).hexdigest()
        for p in sorted(folder.rglob("*"))
        if p.is_file()
    }


def check(args: list[str], words: str | None = None) -> str:
    r = runner.invoke(app, args)
    assert r.exit_code == 2, (args, r.output)
    lines = [ln for ln in r.stderr.splitlines() if ln.strip()]
    assert len(lines) == 1, (args, r.stderr)
    assert lines[0].startswith("error: ")
    assert "Traceback" not in r.output
    if words:
        assert words in lines[0], (args, lines[0])
    return lines[0]


@pytest.fixture()
def existing(tmp_path):
    out = tmp_path / "existing"
    out.mkdir()
    (out / "summary.md").write_text("an earlier report\n")
    (out / "report.json").write_text('{"kept": true}\n')
    return out


FILE_CASES = [
    ("malformed.toml", "malformed TOML"),
    ("unknown_key.toml", "unknown key"),
    ("unknown_table.toml", "unknown table"),
    ("construct.toml", "only named functions"),
    ("attribute.toml", "attribute access"),
    ("dunder.toml", "dunder"),
    ("undeclared.toml", "undeclared symbol 'b'"),
    ("negative.toml", "vanishes or turns negative"),
    ("vanishing.toml", "vanishes or turns negative"),
]


@pytest.mark.parametrize(("name", "words"), FILE_CASES)
@pytest.mark.parametrize("command", ["inspect", "potential", "spectrum", "thermo", "analyze"])
def test_bad_background_files(tmp_path, existing, name, words, command):
    path = files(tmp_path)[name]
    before = snapshot(existing)
    extra = ["--out", str(existing), "--force"] if command == "analyze" else []
    check([command, path, *extra], words)
    assert snapshot(existing) == before


BAD_PARAMS = [
    ("c=nan", "not a finite number"),
    ("c=inf", "not a finite number"),
    ("c=-2", "outside the allowed range"),
    ("c=abc", "not a number"),
    ("c", "expected NAME=VALUE"),
    ("q=1", "unknown for background"),
]


@pytest.mark.parametrize(("param", "words"), BAD_PARAMS)
@pytest.mark.parametrize("command", ["inspect", "potential", "spectrum", "thermo", "analyze"])
def test_bad_parameters(existing, param, words, command):
    before = snapshot(existing)
    extra = ["--out", str(existing), "--force"] if command == "analyze" else []
    check([command, "soft-wall", "--param", param, *extra], words)
    assert snapshot(existing) == before


@pytest.mark.parametrize(
    ("args", "field"),
    [
        (["potential", "soft-wall", "--range", "5:1"], "--range"),
        (["potential", "soft-wall", "--range", "-1:3"], "--range"),
        (["potential", "soft-wall", "--range", "1:1"], "--range"),
        (["potential", "soft-wall", "--points", "0"], "--points"),
        (["potential", "soft-wall", "--points", "-5"], "--points"),
        (["potential", "soft-wall", "--points", "1000000000"], "points"),
        (["spectrum", "soft-wall", "--states", "0"], "--states"),
        (["spectrum", "soft-wall", "--states", "-1"], "--states"),
        (["spectrum", "soft-wall", "--states", "100000"], "states"),
        (["spectrum", "soft-wall", "--channel", "nonsense"], "channel"),
        (["analyze", "soft-wall", "--states", "0"], "--states"),
        (["analyze", "soft-wall", "--points", "100000000"], "--points"),
        (["scan", "soft-wall", "--vary", "c=1:2:0", "--observe", "string_tension"], "--vary"),
        (["scan", "soft-wall", "--vary", "c=1:2:1000000000", "--observe", "string_tension"], "--vary"),
        (["scan", "soft-wall", "--vary", "c=1:2:3", "--observe", "nonsense"], "observable"),
    ],
)
def test_bad_ranges_and_counts(existing, args, field):
    before = snapshot(existing)
    line = check(args)
    assert field in line
    assert snapshot(existing) == before


def test_absurd_l_range():
    check(["potential", "soft-wall", "--range", "1e-300:1e300"], "--range")


@pytest.mark.parametrize("command", ["potential", "spectrum", "thermo", "scan", "calibrate"])
def test_unwritable_output_folder(tmp_path, command):
    blocker = tmp_path / "a-file"
    blocker.write_text("not a folder")
    target = str(blocker / "out")
    args = {
        "potential": ["potential", "hard-wall", "--points", "20", "--out", target],
        "spectrum": ["spectrum", "hard-wall", "--states", "3", "--out", target],
        "thermo": ["thermo", "hard-wall", "--out", target],
        "scan": ["scan", "hard-wall", "--vary", "z0=1:2:3", "--observe", "string_tension", "--out", target],
        "calibrate": ["calibrate", "hard-wall", str(tmp_path / "t.toml"), "--out", target],
    }[command]
    (tmp_path / "t.toml").write_text(
        '[parameters.z0]\nfree = true\n[[targets]]\nobservable = "string_tension"\nvalue = 0.2\nuncertainty = 0.01\nunit = "GeV^2"\n'
    )
    check(args, "--out")
    assert blocker.read_text() == "not a folder"


def test_analyze_unwritable(tmp_path):
    blocker = tmp_path / "a-file"
    blocker.write_text("x")
    check(["analyze", "hard-wall", "--out", str(blocker / "r")], "--out")


def test_not_ads_background_refuses_only_what_needs_ads():
    # d4-soliton: G_xx ~ z^(-3/2) (Witten hep-th/9803131); Coulomb coefficient needs AdS
    r = runner.invoke(app, ["inspect", "d4-soliton", "--json"])
    assert r.exit_code == 0
    assert '"coulomb_coefficient": null' in r.stdout
    assert "not asymptotically AdS" in r.stdout
