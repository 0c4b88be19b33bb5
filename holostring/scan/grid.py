"""Parameter scans: evaluate observables over a grid or random sample of parameter points.

Points are sent to an executor in chunks; each chunk is evaluated by :func:`evaluate_chunk`, a
top-level function that any process pool or cluster can pickle. A point that cannot be computed
(a parameter outside its range, an observable that does not exist there, a solver that fails) is
recorded as a failed row with the reason; it never stops the scan. Finished rows can be appended to
a store file as they arrive, so an interrupted scan resumes where it stopped.
"""

from __future__ import annotations

import concurrent.futures as cf
import contextlib
import hashlib
import json
import math
import time
from collections.abc import Callable, Iterable, Iterator, Sequence
from dataclasses import replace
from pathlib import Path
from typing import Any

from holostring.errors import HolostringError, InputError
from holostring.fit.observables import evaluate, parse_observable
from holostring.provenance import Provenance
from holostring.scan.plan import Axis, ScanPlan, grid_plan, random_plan
from holostring.scan.results import FAILED, OK, ScanResult, ScanRow

#: exceptions that mark a point as failed instead of stopping the scan
FAILURES: tuple[type[BaseException], ...] = (HolostringError, ArithmeticError, ValueError)

Progress = Callable[[int, int], None]

# per worker process: the background of the running scan, with its compiled functions and
# symbolic results, kept across chunks (keyed by a token naming the scan's background)
_WORKER_BACKGROUNDS: dict[str, Any] = {}


# --------------------------------------------------------------------------- worker side
def evaluate_point(
    bg: Any, names: Sequence[str], specs: Sequence[str], index: int, values: Sequence[float]
) -> ScanRow:
    """Evaluate every observable at one parameter point; failures become a failed row.

    Parameters
    ----------
    bg
        The background at the fixed parameter values.
    names, values
        Varied parameter names and this point's values.
    specs
        Observable specs.
    index
        The point's position in the plan.

    Returns
    -------
    ScanRow
        ``status="failed"`` with the reasons when a parameter is out of range or any observable
        fails (the observables that succeeded keep their values).
    """
    point = {n: float(v) for n, v in zip(names, values, strict=True)}
    out: dict[str, tuple[float, float] | None] = dict.fromkeys(specs)
    try:
        here = bg.with_params(**point)
    except FAILURES as err:
        return ScanRow(index, point, out, FAILED, _reason(err))
    memo: dict[str, Any] = {}
    problems: list[str] = []
    for spec in specs:
        try:
            m = evaluate(here, [spec], memo)[spec]
            value, error = float(m.value), float(m.error)
        except FAILURES as err:
            problems.append(_reason(err, spec))
            continue
        if not math.isfinite(value):
            problems.append(f"{spec}: the value is not a finite number ({value})")
            continue
        out[spec] = (value, error)
    if problems:
        return ScanRow(index, point, out, FAILED, "; ".join(problems))
    return ScanRow(index, point, out, OK, "")


def _reason(err: BaseException, spec: str | None = None) -> str:
    text = " ".join(str(err).split()) or type(err).__name__
    if not isinstance(err, HolostringError):
        text = f"{type(err).__name__}: {text}"
    if spec is not None and not text.startswith(spec):
        text = f"{spec}: {text}"
    return text


def evaluate_chunk(
    task: tuple[str, Any, tuple[str, ...], tuple[str, ...], list[tuple[int, tuple[float, ...]]]],
) -> list[ScanRow]:
    """Evaluate a chunk of points (the function executors run; picklable, top level).

    Parameters
    ----------
    task
        ``(token, background, names, specs, [(index, values), ...])``; the background is kept per
        process under ``token`` so that its compiled functions serve every later chunk.

    Returns
    -------
    list of ScanRow
    """
    token, bg, names, specs, items = task
    base = _WORKER_BACKGROUNDS.get(token)
    if base is None:
        if len(_WORKER_BACKGROUNDS) >= 4:
            _WORKER_BACKGROUNDS.clear()
        base = _WORKER_BACKGROUNDS[token] = bg
    return [evaluate_point(base, names, specs, i, v) for i, v in items]


# --------------------------------------------------------------------------- driver side
def run_scan(
    background: Any,
    vary: Sequence[str | Axis] | ScanPlan,
    observe: Sequence[str],
    *,
    samples: int | None = None,
    seed: int = 0,
    executor: Any = None,
    workers: int = 1,
    scheduler: str | None = None,
    chunk_size: int | None = None,
    progress: Progress | None = None,
    store: str | Path | None = None,
    retry_failed: bool = False,
) -> ScanResult:
    """Evaluate observables at every point of a parameter grid or random sample.

    Main arguments
    --------------
    background
        A :class:`~holostring.background.Background`; its current values fix the parameters that
        are not varied.
    vary
        ``NAME=START:STOP:COUNT`` specs (see :mod:`holostring.scan.plan`), axes, or a ready plan.
    observe
        Observable specs (see :mod:`holostring.fit.observables`), checked before anything runs.

    Other arguments
    ---------------
    samples, seed
        Draw ``samples`` random points over the ``vary`` ranges instead of a grid.
    executor
        Any object with ``map`` (``submit`` is used when present), e.g. a process pool or
        ``distributed.Client(...).get_executor()``. It is not shut down here.
    workers
        Without ``executor``: 1 runs in this process; more starts a local process pool.
    scheduler
        Address of a running Dask scheduler to run on (needs the optional ``dask`` extra).
    chunk_size
        Points per task (default: a few tasks per worker, at most 25 points each).
    progress
        Called as ``progress(done, total)`` at the start and whenever points finish.
    store
        A JSON-lines file: finished rows are appended as they arrive; rows already in it (from an
        interrupted run of the same scan) are reused and only the missing points are computed.
    retry_failed
        Compute again the stored points that had failed.

    Returns
    -------
    ScanResult
        One row per point, in plan order.

    Raises
    ------
    InputError
        For a malformed or unknown parameter or observable, a store holding a different scan, or an
        unreachable scheduler. Points outside a parameter's range are not refused: they are
        recorded as failed.

    Examples
    --------
    >>> from holostring.background import load_background
    >>> res = run_scan(load_background("soft-wall"), ["c=-1:1:3"], ["string_tension"])
    >>> [r.status for r in res.rows]
    ['failed', 'failed', 'ok']
    """
    t0 = time.perf_counter()
    specs = _check_observables(observe)
    plan = _make_plan(vary, samples, seed)
    names = plan.names
    for n in names:
        try:
            background.parameter(n)
        except InputError as err:
            raise InputError(f"--vary {n}", err.reason) from None
    if isinstance(workers, bool) or not isinstance(workers, int) or workers < 1:
        raise InputError("--workers", f"expected a whole number >= 1, got {workers}")
    if chunk_size is not None and (not isinstance(chunk_size, int) or chunk_size < 1):
        raise InputError("chunk_size", f"expected a whole number >= 1, got {chunk_size}")
    fixed = {k: v for k, v in background.params.items() if k not in names}
    structure = _structure(background)
    header = {
        "background": background.name,
        "structure": structure,
        "parameters": fixed,
        "observables": list(specs),
        "plan": {**plan.describe(), "fingerprint": plan.fingerprint()},
    }
    total = len(plan)
    done_rows: dict[int, ScanRow] = {}
    with contextlib.ExitStack() as stack:
        sink = None
        if store is not None:
            from holostring.scan.store import ScanStore

            sink = stack.enter_context(ScanStore(store, header))
            for i, pt in enumerate(plan.points):
                row = sink.rows.get(tuple(pt))
                if row is not None and (row.ok or not retry_failed):
                    done_rows[i] = row if row.index == i else replace(row, index=i)
        reused = len(done_rows)
        todo = [(i, pt) for i, pt in enumerate(plan.points) if i not in done_rows]
        if progress is not None:
            progress(len(done_rows), total)

        def finished(rows: list[ScanRow]) -> None:
            if sink is not None:
                sink.append(rows)
            for r in rows:
                done_rows[r.index] = r
            if progress is not None:
                progress(len(done_rows), total)

        label = _execute(
            background, structure, names, specs, todo, finished, stack,
            executor=executor, workers=workers, scheduler=scheduler, chunk_size=chunk_size,
        )  # fmt: skip
    rows = tuple(done_rows[i] for i in range(total))
    units = {n: background.parameter(n).unit(background.energy_unit) for n in names}
    units.update({s: _unit(parse_observable(s).dimension, background.energy_unit) for s in specs})
    settings = {
        "kind": plan.kind,
        "vary": [a.spec for a in plan.axes],
        "samples": total if plan.kind == "random" else None,
        "seed": plan.seed,
        "observe": list(specs),
        "executor": label,
    }
    prov = Provenance(background.name, dict(fixed), str(background.frame), settings)
    return ScanResult(
        background=background.name,
        parameters=fixed,
        varied=names,
        observables=specs,
        kind=plan.kind,
        shape=plan.shape,
        rows=rows,
        units=units,
        computed=len(todo),
        reused=reused,
        elapsed=time.perf_counter() - t0,
        executor=label,
        provenance=prov,
    )


def _check_observables(observe: Sequence[str]) -> tuple[str, ...]:
    if isinstance(observe, str):
        observe = [observe]
    specs = tuple(parse_observable(s).spec for s in observe)
    if not specs:
        raise InputError("--observe", "give at least one observable")
    if len(set(specs)) != len(specs):
        dup = next(s for s in specs if specs.count(s) > 1)
        raise InputError(f"--observe {dup}", "given twice")
    return specs


def _make_plan(vary: Sequence[str | Axis] | ScanPlan, samples: int | None, seed: int) -> ScanPlan:
    if isinstance(vary, ScanPlan):
        return vary
    if samples is not None:
        return random_plan(vary, samples, seed)
    return grid_plan(vary)


def _structure(bg: Any) -> str:
    """A token naming the background's formulas and fixed values (the worker cache key)."""
    text = json.dumps(bg.describe(), sort_keys=True, default=str)
    return hashlib.sha256(text.encode()).hexdigest()[:16]


def _unit(dimension: float, energy_unit: str | None) -> str:
    if dimension == 0:
        return ""
    base = energy_unit or "E"
    return base if dimension == 1 else f"{base}^{dimension:g}"


def _chunks(todo: list[Any], size: int) -> Iterator[list[Any]]:
    for k in range(0, len(todo), size):
        yield todo[k : k + size]


def _execute(
    bg: Any,
    token: str,
    names: tuple[str, ...],
    specs: tuple[str, ...],
    todo: list[tuple[int, tuple[float, ...]]],
    finished: Callable[[list[ScanRow]], None],
    stack: contextlib.ExitStack,
    *,
    executor: Any,
    workers: int,
    scheduler: str | None,
    chunk_size: int | None,
) -> str:
    """Run the points on the chosen executor; return a label saying what ran them."""
    if executor is None and scheduler is None and workers == 1:
        for i, pt in todo:  # in process: one row at a time, for a fine progress bar
            finished([evaluate_point(bg, names, specs, i, pt)])
        return "this process"
    pool = None
    if executor is not None:
        label = type(executor).__name__
        slots = max(8, 4 * workers)
    elif scheduler is not None:
        from holostring.scan.executors import dask_executor

        executor = stack.enter_context(dask_executor(scheduler))
        label, slots = "dask", max(16, 4 * workers)
    else:
        from holostring.scan.executors import process_pool

        if todo:  # the first point here warms the background; forked workers inherit it
            i, pt = todo[0]
            finished([evaluate_point(bg, names, specs, i, pt)])
            todo = todo[1:]
            _WORKER_BACKGROUNDS[token] = bg
        executor = pool = process_pool(workers)
        label, slots = f"processes({workers})", 2 * workers
    size = chunk_size or max(1, min(25, math.ceil(len(todo) / (slots * 2))))
    tasks = ((token, bg, names, specs, chunk) for chunk in _chunks(todo, size))
    interrupted = True
    try:
        _drive(executor, tasks, finished, slots)
        interrupted = False
    finally:
        if pool is not None:
            from holostring.scan.executors import stop_pool

            stop_pool(pool, interrupted=interrupted)
    return label


def _drive(
    executor: Any, tasks: Iterable[Any], finished: Callable[[list[ScanRow]], None], slots: int
) -> None:
    """Feed tasks to the executor, at most ``slots`` in flight, recording results as they finish."""
    if not hasattr(executor, "submit"):
        runner = getattr(executor, "imap_unordered", None) or executor.map
        for rows in runner(evaluate_chunk, tasks):
            finished(rows)
        return
    it = iter(tasks)
    pending: set[Any] = set()

    def fill() -> None:
        while len(pending) < slots:
            task = next(it, None)
            if task is None:
                return
            pending.add(executor.submit(evaluate_chunk, task))

    fill()
    try:
        while pending:
            done, pending = cf.wait(pending, return_when=cf.FIRST_COMPLETED)
            for fut in done:
                finished(fut.result())
            fill()
    finally:
        for fut in pending:
            fut.cancel()
