"""Parameter scans: exact values, identical tables on every executor, failed points, resuming.

Reference values:
- soft wall string tension sigma = g e c / 2 (Andreev-Zakharov hep-ph/0604204, sigma = e c R^2/(4 pi
  alpha') with g = R^2/(2 pi alpha')).
- AdS Coulomb coefficient kappa = g 8 pi^3 / Gamma(1/4)^4 (Maldacena hep-th/9803002, in the convention
  g = R^2/(2 pi alpha')), evaluated with mpmath.
"""

import csv
import json
import math

import mpmath as mp
import pytest
from typer.testing import CliRunner

import holostring.scan.grid as grid_module
from holostring.background import load_background
from holostring.cli import app
from holostring.errors import InputError
from holostring.scan import ScanStore, run_scan

runner = CliRunner()
VARY = ["c=0.1:2:20", "g=0.5:2.5:20"]  # 400 points
SIGMA = "string_tension"


def sigma_soft_wall(c, g):
    """Andreev-Zakharov hep-ph/0604204: sigma = g e c / 2."""
    return g * math.e * c / 2


@pytest.fixture(scope="module")
def soft_wall():
    return load_background("soft-wall")


@pytest.fixture(scope="module")
def reference(soft_wall):
    """The 400-point scan in this process."""
    return run_scan(soft_wall, VARY, [SIGMA])


def test_in_process_scan_matches_exact_string_tension(reference):
    assert len(reference.rows) == 400 and reference.n_ok == 400
    assert reference.shape == (20, 20) and reference.varied == ("c", "g")
    for r in reference.rows:
        value, error = r.values[SIGMA]
        exact = sigma_soft_wall(r.point["c"], r.point["g"])
        assert value == pytest.approx(exact, rel=1e-12)
        assert abs(value - exact) <= max(error, 1e-12 * exact)


def test_cli_two_workers_gives_complete_table_and_progress(tmp_path, reference):
    out = tmp_path / "scan"
    args = ["scan", "soft-wall", "--observe", SIGMA, "--workers", "2", "--out", str(out), "--json"]
    for v in VARY:
        args += ["--vary", v]
    r = runner.invoke(app, args)
    assert r.exit_code == 0, r.output
    assert "400/400" in r.stderr and "100%" in r.stderr  # the progress bar ran (final line off a TTY)
    data = json.loads(r.stdout)
    assert data["summary"]["ok"] == 400 and data["summary"]["executor"] == "processes(2)"
    assert [row["index"] for row in data["rows"]] == list(range(400))
    for row, ref in zip(data["rows"], reference.rows, strict=True):
        assert row["point"] == ref.point
        assert row["values"][SIGMA]["value"] == ref.values[SIGMA][0]  # identical, bit for bit
        assert row["values"][SIGMA]["value"] == pytest.approx(sigma_soft_wall(**row["point"]), rel=1e-12)
    with open(out / "scan.csv") as fh:
        table = list(csv.DictReader(line for line in fh if not line.startswith("#")))
    assert len(table) == 400 and {t["status"] for t in table} == {"ok"}
    assert float(table[123]["string_tension"]) == reference.rows[123].values[SIGMA][0]
    assert sorted(p.name for p in out.glob("*.png")) == ["scan_0_string_tension.png"]
    assert (out / "scan.png").exists() is False and (out / "scan.jsonl").exists()


def test_dask_local_cluster_gives_the_identical_table(soft_wall, reference):
    distributed = pytest.importorskip("distributed")
    with distributed.LocalCluster(
        n_workers=2, threads_per_worker=1, processes=True, dashboard_address=None
    ) as cluster:
        res = run_scan(soft_wall, VARY, [SIGMA], scheduler=cluster.scheduler_address)
    assert res.executor == "dask"
    assert res.rows == reference.rows


def test_negative_and_zero_c_fail_with_a_reason_and_the_rest_completes(soft_wall):
    res = run_scan(soft_wall, ["c=-1:1:21"], [SIGMA], workers=2, chunk_size=3)
    assert len(res.rows) == 21
    cs = [r.point["c"] for r in res.rows]
    assert 0.0 in cs  # the grid hits c = 0 exactly
    for r in res.rows:
        if r.point["c"] <= 0:
            assert r.status == "failed" and r.values[SIGMA] is None
            assert r.message.startswith("parameter c:") and "outside the allowed range (0, inf)" in r.message
        else:
            assert r.ok and r.message == ""
            assert r.values[SIGMA][0] == pytest.approx(sigma_soft_wall(r.point["c"], 1.0), rel=1e-12)
    assert res.n_failed == 11 and res.n_ok == 10


def test_one_failed_observable_keeps_the_others():
    ads = load_background("ads")
    res = run_scan(ads, ["g=0.5:2:4"], [SIGMA, "coulomb_coefficient_uv"])
    kappa1 = float(8 * mp.pi**3 / mp.gamma(0.25) ** 4)  # Maldacena hep-th/9803002
    for r in res.rows:
        assert r.status == "failed" and "does not confine" in r.message and r.message.startswith(SIGMA)
        assert r.values[SIGMA] is None
        assert r.values["coulomb_coefficient_uv"][0] == pytest.approx(r.point["g"] * kappa1, rel=1e-12)


def test_numerical_errors_fail_the_point_but_bugs_are_not_hidden(soft_wall, monkeypatch):
    real = grid_module.evaluate

    def flaky(bg, specs, memo):
        if bg.params["c"] > 1.5:
            raise FloatingPointError("overflow in exp")
        return real(bg, specs, memo)

    monkeypatch.setattr(grid_module, "evaluate", flaky)
    res = run_scan(soft_wall, ["c=1:2:3"], [SIGMA])
    assert [r.status for r in res.rows] == ["ok", "ok", "failed"]
    assert res.rows[2].message == "string_tension: FloatingPointError: overflow in exp"

    def buggy(bg, specs, memo):
        raise TypeError("a bug")

    monkeypatch.setattr(grid_module, "evaluate", buggy)
    with pytest.raises(TypeError):
        run_scan(soft_wall, ["c=1:2:3"], [SIGMA])


class _Stop(KeyboardInterrupt):
    pass


def _interrupt_after(n):
    def progress(done, total):
        if done >= n:
            raise _Stop

    return progress


def test_resume_computes_only_missing_points(tmp_path, soft_wall, monkeypatch):
    vary = ["c=0.2:1:6", "g=1:2:5"]  # 30 points
    fresh = run_scan(soft_wall, vary, [SIGMA, "sqrt_string_tension"])
    path = tmp_path / "scan.jsonl"
    with pytest.raises(_Stop):
        run_scan(soft_wall, vary, [SIGMA, "sqrt_string_tension"], store=path, progress=_interrupt_after(11))
    stored = path.read_text().splitlines()
    assert len(stored) == 1 + 11  # header + finished rows
    path.write_text("\n".join(stored) + "\n" + stored[-1][:25])  # a row cut short by the interruption

    calls = []
    real = grid_module.evaluate_point

    def counting(bg, names, specs, index, values):
        calls.append(index)
        return real(bg, names, specs, index, values)

    monkeypatch.setattr(grid_module, "evaluate_point", counting)
    res = run_scan(soft_wall, vary, [SIGMA, "sqrt_string_tension"], store=path)
    assert sorted(calls) == list(range(11, 30))
    assert res.reused == 11 and res.computed == 19
    assert res.rows == fresh.rows
    for r in res.rows:
        assert r.values["sqrt_string_tension"][0] == pytest.approx(
            math.sqrt(sigma_soft_wall(**r.point)), rel=1e-12
        )
    calls.clear()
    again = run_scan(soft_wall, vary, [SIGMA, "sqrt_string_tension"], store=path)
    assert calls == [] and again.rows == fresh.rows
    assert len(path.read_text().splitlines()) == 31


def test_interrupted_process_pool_keeps_finished_rows(tmp_path, soft_wall):
    path = tmp_path / "scan.jsonl"
    vary = ["c=0.1:1:10", "g=1:2:4"]
    with pytest.raises(_Stop):
        run_scan(soft_wall, vary, [SIGMA], workers=2, chunk_size=4, store=path, progress=_interrupt_after(4))
    kept = len(path.read_text().splitlines()) - 1
    assert 4 <= kept < 40
    res = run_scan(soft_wall, vary, [SIGMA], workers=2, chunk_size=4, store=path)
    assert res.reused == kept and res.n_ok == 40
    for r in res.rows:
        assert r.values[SIGMA][0] == pytest.approx(sigma_soft_wall(**r.point), rel=1e-12)


def test_failed_points_are_kept_unless_retried(tmp_path, soft_wall):
    path = tmp_path / "s.jsonl"
    run_scan(soft_wall, ["c=-1:1:5"], [SIGMA], store=path)
    assert run_scan(soft_wall, ["c=-1:1:5"], [SIGMA], store=path).computed == 0
    again = run_scan(soft_wall, ["c=-1:1:5"], [SIGMA], store=path, retry_failed=True)
    assert again.computed == 3 and again.n_failed == 3


def test_a_store_of_another_scan_is_refused(tmp_path, soft_wall):
    path = tmp_path / "s.jsonl"
    run_scan(soft_wall, ["c=1:2:3"], [SIGMA], store=path)
    with pytest.raises(InputError, match="different scan"):
        run_scan(soft_wall, ["c=1:2:4"], [SIGMA], store=path)
    with pytest.raises(InputError, match="different scan"):
        run_scan(soft_wall.with_params(g=2.0), ["c=1:2:3"], [SIGMA], store=path)
    (tmp_path / "other.jsonl").write_text("not a scan\n")
    with pytest.raises(InputError, match="not a holostring scan file"):
        ScanStore(tmp_path / "other.jsonl", {})


def test_any_object_with_map_is_an_executor(soft_wall):
    class MapOnly:
        def map(self, fn, items):
            return map(fn, items)

    vary = ["c=-0.5:2:6", "g=0.5:2.5:5"]
    res = run_scan(soft_wall, vary, [SIGMA], executor=MapOnly(), chunk_size=7)
    assert res.executor == "MapOnly" and res.rows == run_scan(soft_wall, vary, [SIGMA]).rows
    assert res.n_ok == 20 and res.n_failed == 10


def test_random_samples_evaluate_the_planned_points(soft_wall):
    res = run_scan(soft_wall, ["c=-0.5:2", "g=0.5:2"], [SIGMA], samples=50, seed=3, workers=2)
    assert res.kind == "random" and res.shape is None and len(res.rows) == 50
    for r in res.rows:
        if r.point["c"] <= 0:
            assert not r.ok and "parameter c" in r.message
        else:
            assert r.values[SIGMA][0] == pytest.approx(sigma_soft_wall(**r.point), rel=1e-12)


@pytest.mark.parametrize(
    ("kwargs", "field"),
    [
        ({"vary": ["x=1:2:3"], "observe": [SIGMA]}, "--vary x"),
        ({"vary": ["c=1:2:3"], "observe": ["tension"]}, "observable tension"),
        ({"vary": ["c=1:2:3"], "observe": [SIGMA, SIGMA]}, "--observe string_tension"),
        ({"vary": ["c=1:2:3"], "observe": [SIGMA], "workers": 0}, "--workers"),
    ],
)
def test_bad_input_is_refused_before_running(soft_wall, kwargs, field):
    with pytest.raises(InputError) as info:
        run_scan(soft_wall, **kwargs)
    assert info.value.field == field


def test_two_runs_never_write_the_same_store(tmp_path):
    path = tmp_path / "s.jsonl"
    header = {"background": "soft-wall", "structure": "x", "parameters": {}, "observables": [], "plan": {}}
    with ScanStore(path, header), pytest.raises(InputError, match="another scan is writing"):
        ScanStore(path, header)
    with ScanStore(path, header) as again:  # free again once the first is closed
        assert again.rows == {}
