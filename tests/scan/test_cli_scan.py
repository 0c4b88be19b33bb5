"""The scan command: files, resuming after Ctrl-C, bad input (exit 2, one line), plots.

Reference: soft wall string tension sigma = g e c / 2 (Andreev-Zakharov hep-ph/0604204).
"""

import json
import math

import pytest
from typer.testing import CliRunner

import holostring.scan
from holostring.cli import app
from holostring.errors import InputError

runner = CliRunner()
PNG = b"\x89PNG\r\n\x1a\n"


def run(*args):
    return runner.invoke(app, list(args))


def test_summary_states_failures_and_limits():
    r = run("scan", "soft-wall", "--vary", "c=-1:1:5", "--observe", "string_tension", "--param", "g=2")
    assert r.exit_code == 0, r.output
    text = " ".join(r.stdout.split())
    assert "5 points: 2 ok, 3 failed" in text
    assert "outside the allowed range" in text
    assert "not QCD predictions" in text


def test_interrupted_cli_scan_resumes_from_its_folder(tmp_path, monkeypatch):
    real = holostring.scan.run_scan

    def interrupted(*args, **kwargs):
        user_progress = kwargs["progress"]

        def progress(done, total):
            user_progress(done, total)
            if done >= 7:
                raise KeyboardInterrupt

        return real(*args, **{**kwargs, "progress": progress})

    args = ["scan", "soft-wall", "--vary", "c=0.2:1.8:5", "--vary", "g=1:3:4", "--observe", "string_tension"]
    args += ["--out", str(tmp_path), "--json"]
    monkeypatch.setattr(holostring.scan, "run_scan", interrupted)
    r = runner.invoke(app, args)
    assert r.exit_code == 130
    assert "interrupted: 7 of 20 points are saved" in " ".join(r.stderr.split())
    monkeypatch.setattr(holostring.scan, "run_scan", real)
    r = runner.invoke(app, args)
    assert r.exit_code == 0, r.output
    data = json.loads(r.stdout)
    assert data["summary"]["reused"] == 7 and data["summary"]["computed"] == 13
    for row in data["rows"]:
        p = row["point"]
        assert row["values"]["string_tension"]["value"] == pytest.approx(
            p["g"] * math.e * p["c"] / 2, rel=1e-12
        )
    again = json.loads(runner.invoke(app, args).stdout)
    assert again["summary"]["computed"] == 0 and again["rows"] == data["rows"]


def test_one_parameter_and_random_scans_write_plots(tmp_path):
    r = run(
        "scan", "soft-wall", "--vary", "c=-0.5:2:11", "--observe", "string_tension",
        "--observe", "sqrt_string_tension", "--out", str(tmp_path / "a"),
    )  # fmt: skip
    assert r.exit_code == 0, r.output
    pngs = sorted((tmp_path / "a").glob("*.png"))
    assert [p.name for p in pngs] == ["scan_0_string_tension.png", "scan_1_sqrt_string_tension.png"]
    assert all(p.read_bytes().startswith(PNG) for p in pngs)
    r = run(
        "scan", "soft-wall", "--vary", "c=-0.5:2", "--vary", "g=0.5:2", "--random", "30", "--seed", "4",
        "--observe", "string_tension", "--out", str(tmp_path / "b"), "--json",
    )  # fmt: skip
    assert r.exit_code == 0, r.output
    data = json.loads(r.stdout)
    assert data["kind"] == "random" and len(data["rows"]) == 30
    assert (tmp_path / "b" / "scan_0_string_tension.png").read_bytes().startswith(PNG)


@pytest.mark.parametrize(
    ("args", "words"),
    [
        (["--vary", "c=1:2"], "--vary c: a grid needs NAME=START:STOP:COUNT"),
        (["--vary", "q=1:2:3"], "--vary q: unknown"),
        (["--vary", "c=1:2:3", "--param", "c=1"], "--param c: is also given with --vary"),
        (["--vary", "c=1:2:3", "--workers", "0"], "--workers"),
        (["--vary", "c=1:2", "--random", "0"], "--random"),
    ],
)
def test_bad_input_exits_2_with_one_line(args, words):
    r = run("scan", "soft-wall", "--observe", "string_tension", *args)
    assert r.exit_code == 2
    lines = [ln for ln in r.stderr.splitlines() if ln.strip() and not ln.startswith("scan ")]
    assert len(lines) == 1 and lines[0].startswith("error:") and words in lines[0], r.stderr
    assert "Traceback" not in r.output


def test_unknown_observable_exits_2():
    r = run("scan", "soft-wall", "--vary", "c=1:2:3", "--observe", "tension")
    assert r.exit_code == 2 and "observable tension: unknown" in r.stderr


def test_unreachable_scheduler_is_an_input_error():
    pytest.importorskip("distributed")
    from holostring.scan.executors import dask_executor

    with pytest.raises(InputError) as info, dask_executor("tcp://127.0.0.1:9", timeout=1.0):
        pass
    assert info.value.field == "--scheduler" and "cannot reach" in str(info.value)
