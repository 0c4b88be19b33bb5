"""Incremental scan store: finished rows are appended to a JSON-lines file as they arrive.

The first line is a header naming the background, fixed parameters, observables and plan; every
further line is one finished :class:`~holostring.scan.results.ScanRow`. An interrupted scan loses at
most the rows still being computed; reopening the store with the same header returns the finished
rows so that only the missing points are computed. A different scan in the same file is refused.
"""

from __future__ import annotations

import json
import os
from pathlib import Path
from typing import IO, Any

from holostring.errors import InputError
from holostring.scan.results import ScanRow

FORMAT = "holostring-scan"
VERSION = 1
# header keys that must agree for a stored row to be reused
MATCH = ("background", "structure", "parameters", "observables", "plan")


class ScanStore:
    """Append-only JSON-lines record of a scan.

    Parameters
    ----------
    path
        The ``.jsonl`` file (created with its folder if missing).
    header
        Plain data identifying the scan (keys of :data:`MATCH`).

    Raises
    ------
    InputError
        When the file exists but holds a different scan or is not a scan store.
    """

    def __init__(self, path: str | Path, header: dict[str, Any]) -> None:
        self.path = Path(path)
        self.header = {"format": FORMAT, "version": VERSION, **header}
        self.rows: dict[tuple[float, ...], ScanRow] = {}
        self._fh: IO[str] | None = None
        self.path.parent.mkdir(parents=True, exist_ok=True)
        self._fh = open(self.path, "a", encoding="utf-8")  # held until close()
        try:
            _lock(self._fh, self.path)
            if self.path.stat().st_size > 0:
                self._load()
            else:
                self._fh.write(json.dumps(self.header) + "\n")
                self._fh.flush()
        except BaseException:
            self.close()
            raise

    def _load(self) -> None:
        data = self.path.read_bytes()
        cut = data.rfind(b"\n") + 1
        if cut < len(data):
            # the last line was cut short by an interruption: drop it, it is recomputed
            with open(self.path, "r+b") as fh:
                fh.truncate(cut)
            data = data[:cut]
        lines = data.decode("utf-8", errors="replace").splitlines()
        try:
            head = json.loads(lines[0]) if lines else {}
        except json.JSONDecodeError:
            head = {}
        if not isinstance(head, dict) or head.get("format") != FORMAT:
            raise InputError("--out", f"'{self.path}' exists and is not a holostring scan file")
        for key in MATCH:
            if _plain(head.get(key)) != _plain(self.header.get(key)):
                raise InputError(
                    "--out",
                    f"'{self.path}' holds a different scan ({key} differs); "
                    "use another folder or delete the file to start afresh",
                )
        for line in lines[1:]:
            try:
                row = ScanRow.from_dict(json.loads(line))
            except (json.JSONDecodeError, KeyError, TypeError, ValueError):
                continue  # damaged line: that point is computed again
            self.rows[row.key()] = row

    def append(self, rows: list[ScanRow]) -> None:
        """Write finished rows and flush them to disk."""
        if not rows:
            return
        if self._fh is None:
            raise ValueError("the scan store is closed")
        self._fh.write("".join(json.dumps(r.to_dict()) + "\n" for r in rows))
        self._fh.flush()
        os.fsync(self._fh.fileno())
        for r in rows:
            self.rows[r.key()] = r

    def close(self) -> None:
        """Close the file (rows already appended stay on disk)."""
        if self._fh is not None:
            self._fh.close()
            self._fh = None

    def __enter__(self) -> ScanStore:
        return self

    def __exit__(self, *exc: object) -> None:
        self.close()


def _lock(fh: IO[str], path: Path) -> None:
    """Hold an exclusive lock on the store, so two runs never write the same file."""
    try:
        import fcntl
    except ImportError:  # pragma: no cover - no advisory locks on this platform
        return
    try:
        fcntl.flock(fh.fileno(), fcntl.LOCK_EX | fcntl.LOCK_NB)
    except OSError:
        raise InputError("--out", f"another scan is writing to '{path}' right now") from None


def _plain(x: Any) -> Any:
    """JSON round trip, so that tuples and lists, ints and floats compare alike."""
    return json.loads(json.dumps(x))
