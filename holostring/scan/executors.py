"""Executors a scan can run on: local processes (standard library) and an optional Dask cluster.

A scan only needs an object with ``map`` (and uses ``submit`` when there is one, to record results
as soon as they finish). Dask is imported only by :func:`dask_executor`.
"""

from __future__ import annotations

import multiprocessing
import signal
import sys
from collections.abc import Iterator
from concurrent.futures import ProcessPoolExecutor
from contextlib import contextmanager
from typing import Any

from holostring.errors import InputError


def _ignore_interrupt() -> None:
    # Ctrl-C is handled once, by the parent, which stops the pool; workers stay quiet
    signal.signal(signal.SIGINT, signal.SIG_IGN)


def process_pool(workers: int) -> ProcessPoolExecutor:
    """A local process pool whose workers leave Ctrl-C to the parent.

    Forked workers start in milliseconds; once jax is loaded (it runs threads) a fork server is used.
    """
    methods = multiprocessing.get_all_start_methods()
    if "fork" in methods and "jax" not in sys.modules:
        ctx = multiprocessing.get_context("fork")
    elif "forkserver" in methods:
        ctx = multiprocessing.get_context("forkserver")
    else:  # pragma: no cover - platforms without fork
        ctx = multiprocessing.get_context("spawn")
    return ProcessPoolExecutor(max_workers=workers, mp_context=ctx, initializer=_ignore_interrupt)


def stop_pool(pool: ProcessPoolExecutor, *, interrupted: bool) -> None:
    """Shut a pool down; after an interruption, end its worker processes first (they hold no results)."""
    if interrupted:
        procs = list((getattr(pool, "_processes", None) or {}).values())
        for p in procs:
            if p.is_alive():
                p.terminate()
        for p in procs:
            p.join(timeout=5)
    pool.shutdown(wait=True, cancel_futures=True)


@contextmanager
def dask_executor(address: str, timeout: float = 10.0) -> Iterator[Any]:
    """Connect to a running Dask scheduler and yield its ``concurrent.futures`` executor.

    Every Dask worker must have the same holostring version installed: tasks name the worker
    function by module and carry the background (formulas and values), not compiled code.

    Parameters
    ----------
    address
        Scheduler address such as ``tcp://10.0.0.5:8786`` (or a ``LocalCluster`` object).
    timeout
        Seconds to wait for the connection.

    Raises
    ------
    InputError
        When Dask is not installed or the scheduler cannot be reached.
    """
    try:
        from distributed import Client
    except ImportError:
        raise InputError(
            "--scheduler", "Dask is not installed; install it with: pip install 'holostring[dask]'"
        ) from None
    try:
        client = Client(address, timeout=timeout, set_as_default=False)
    except (OSError, TimeoutError, ValueError) as err:
        raise InputError("--scheduler", f"cannot reach a Dask scheduler at '{address}' ({err})") from None
    try:
        yield client.get_executor()
    finally:
        client.close()
