"""CSV/JSON writers. Every file is written to a temporary name and renamed into place, so a
failure never leaves a half-written file or damages an existing one."""

from __future__ import annotations

import csv
import io
import json
import os
import tempfile
from collections.abc import Iterable, Sequence
from pathlib import Path
from typing import Any

from holostring.errors import InputError
from holostring.report.serialize import to_jsonable


def prepare_dir(path: str | Path, field: str = "--out") -> Path:
    """Create the output folder if needed and check that it is writable."""
    p = Path(path)
    if p.exists() and not p.is_dir():
        raise InputError(field, f"'{p}' exists and is not a folder")
    try:
        p.mkdir(parents=True, exist_ok=True)
    except OSError as err:
        raise InputError(field, f"cannot create '{p}' ({err.strerror})") from None
    if not os.access(p, os.W_OK | os.X_OK):
        raise InputError(field, f"folder '{p}' is not writable")
    return p


def write_bytes_atomic(path: str | Path, data: bytes) -> Path:
    """Write bytes to ``path`` through a temporary file in the same folder, then rename."""
    p = Path(path)
    try:
        fd, tmp = tempfile.mkstemp(prefix=f".{p.name}.", suffix=".tmp", dir=p.parent)
    except OSError as err:
        raise InputError("--out", f"cannot write in '{p.parent}' ({err.strerror})") from None
    try:
        with os.fdopen(fd, "wb") as fh:
            fh.write(data)
        os.replace(tmp, p)
    except BaseException:
        Path(tmp).unlink(missing_ok=True)
        raise
    return p


def write_text_atomic(path: str | Path, text: str) -> Path:
    """Write UTF-8 text atomically."""
    return write_bytes_atomic(path, text.encode("utf-8"))


def write_json(path: str | Path, data: Any) -> Path:
    """Write plain JSON (non-finite floats become null) atomically."""
    return write_text_atomic(path, json.dumps(to_jsonable(data), indent=2) + "\n")


def write_csv(
    path: str | Path, header: Sequence[str], rows: Iterable[Sequence[Any]], comments: Sequence[str] = ()
) -> Path:
    """Write a CSV table atomically; ``comments`` become leading ``# `` lines."""
    buf = io.StringIO()
    for line in comments:
        buf.write(f"# {line}\n")
    w = csv.writer(buf, lineterminator="\n")
    w.writerow(header)
    for row in rows:
        w.writerow([_fmt(v) for v in row])
    return write_text_atomic(path, buf.getvalue())


def _fmt(v: Any) -> Any:
    if isinstance(v, float):
        return repr(v)
    return v


def write_figure(fig: Any, path: str | Path, dpi: int = 150) -> Path:
    """Save a matplotlib figure as PNG atomically."""
    buf = io.BytesIO()
    fig.savefig(buf, format="png", dpi=dpi, bbox_inches="tight")
    return write_bytes_atomic(path, buf.getvalue())
