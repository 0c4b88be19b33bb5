"""``holostring scan``: observables over a parameter grid or random sample, in parallel."""

from __future__ import annotations

from pathlib import Path

import typer

from holostring.cli.common import BACKGROUND_HELP, PARAM_HELP, echo_json, guarded

STORE_NAME = "scan.jsonl"


@guarded
def scan(
    background: str = typer.Argument(..., help=BACKGROUND_HELP),
    vary: list[str] = typer.Option(
        ...,
        "--vary",
        help="Varied parameter NAME=START:STOP:COUNT (add :log for log spacing) or NAME=V1,V2,... "
        "(repeatable; two give a 2-D grid).",
    ),
    observe: list[str] = typer.Option(
        ...,
        "--observe",
        help="Observable to evaluate at each point (repeatable), e.g. string_tension, r0, "
        "mass:vector-meson:0, critical_temperature.",
    ),
    param: list[str] = typer.Option(None, "--param", help=PARAM_HELP + " Fixed during the scan."),
    random: int = typer.Option(
        None, "--random", help="Draw N random points over the --vary ranges instead of a grid."
    ),
    seed: int = typer.Option(0, "--seed", help="Seed of the random points (same seed, same points)."),
    workers: int = typer.Option(1, "--workers", help="Local worker processes (1 runs in this process)."),
    scheduler: str = typer.Option(
        None,
        "--scheduler",
        help="Run on a Dask cluster at this address, e.g. tcp://host:8786 (needs the optional extra holostring\\[dask]).",
    ),
    out: Path = typer.Option(
        None,
        "--out",
        help="Folder for scan.csv, scan.json and plots; finished points are saved there as they "
        "arrive, and rerunning the same command resumes an interrupted scan.",
    ),
    retry_failed: bool = typer.Option(
        False, "--retry-failed", help="When resuming, compute failed points again."
    ),
    as_json: bool = typer.Option(False, "--json", help="Print the full table as JSON on stdout."),
) -> None:
    """Evaluate observables over a grid (or random sample) of parameter values.

    Points where a parameter is out of range or an observable cannot be computed are recorded as failed with the reason; the scan goes on.
    """
    from holostring.cli.common import parse_params, resolve_background
    from holostring.errors import InputError

    fixed = parse_params(param)
    varied = [v.partition("=")[0].strip() for v in vary]
    for name in varied:
        if name in fixed:
            raise InputError(f"--param {name}", "is also given with --vary; give it once")
    bg = resolve_background(background, param)
    # validate the plan and the observables before anything is drawn or written
    from holostring.fit.observables import parse_observable
    from holostring.scan.plan import grid_plan, random_plan

    plan = random_plan(vary, random, seed) if random is not None else grid_plan(vary)
    for spec in observe:
        parse_observable(spec)
    store = None
    if out is not None:
        from holostring.report.files import prepare_dir

        store = prepare_dir(out) / STORE_NAME

    from holostring.scan import run_scan

    state = {"done": 0, "total": 0}
    try:
        with _progress_bar() as bar:

            def progress(done: int, total: int) -> None:
                state.update(done=done, total=total)
                bar(done, total)

            result = run_scan(
                bg, plan, observe, seed=seed, workers=workers, scheduler=scheduler,
                progress=progress, store=store, retry_failed=retry_failed,
            )  # fmt: skip
    except KeyboardInterrupt:
        kept = (
            f"{state['done']} of {state['total']} points are saved in {store}; run the same command "
            "again to resume"
            if store is not None
            else "nothing was saved (use --out DIR to keep finished points)"
        )
        typer.echo(f"interrupted: {kept}", err=True)
        raise typer.Exit(code=130) from None

    files: list[Path] = []
    if out is not None:
        from holostring.report.scan import write_scan_plots, write_scan_tables

        files = write_scan_tables(result, out) + write_scan_plots(result, out)
    if as_json:
        echo_json({**result.to_dict(), "files": [str(f) for f in files]})
        return
    from holostring.report.scan import scan_summary
    from holostring.report.tables import console, limits_statement

    con = console()
    for part in scan_summary(result):
        con.print(part)
    con.print(f"{result.elapsed:.1f} s on {result.executor}; {result.computed} points computed now")
    for f in files:
        con.print(f"wrote {f}")
    if out is None:
        con.print("(no --out: nothing written; the table is printed with --json)")
    con.print(limits_statement())


class _progress_bar:  # noqa: N801 - used as a context manager like a function
    """A rich progress bar on stderr (drawn live on a terminal, a final line otherwise)."""

    def __enter__(self):
        from rich.console import Console
        from rich.progress import (
            BarColumn,
            MofNCompleteColumn,
            Progress,
            TaskProgressColumn,
            TextColumn,
            TimeElapsedColumn,
            TimeRemainingColumn,
        )

        self.progress = Progress(
            TextColumn("scan"),
            BarColumn(),
            MofNCompleteColumn(),
            TaskProgressColumn(),
            TimeElapsedColumn(),
            TextColumn("left"),
            TimeRemainingColumn(),
            console=Console(stderr=True),
        )
        self.progress.__enter__()
        self.task = self.progress.add_task("points", total=None)
        return self

    def __call__(self, done: int, total: int) -> None:
        self.progress.update(self.task, completed=done, total=total)

    def __exit__(self, *exc: object) -> None:
        self.progress.__exit__(*exc)
