"""A report folder: summary.md, a self-contained report.html, PNG figures, CSV tables and one JSON.

The folder is assembled in a temporary sibling and moved into place at the end, so a failure never
leaves a half-written report, and an existing folder is only replaced when ``force`` is given
(then the old one is removed only after the new one is complete).
"""

from __future__ import annotations

import base64
import csv
import html
import io
import json
import os
import shutil
import tempfile
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from holostring.errors import InputError
from holostring.report.serialize import to_jsonable


@dataclass
class TableBlock:
    """A table: written as CSV and shown in the summary."""

    name: str
    header: list[str]
    rows: list[list[Any]]
    caption: str = ""
    show_rows: int = 25


@dataclass
class FigureBlock:
    """A PNG figure (bytes) with a caption."""

    name: str
    png: bytes
    caption: str = ""


@dataclass
class Section:
    """One part of a report (diagnostics, potential, a spectrum, temperature, calibration)."""

    title: str
    paragraphs: list[str] = field(default_factory=list)
    facts: list[tuple[str, str]] = field(default_factory=list)
    tables: list[TableBlock] = field(default_factory=list)
    figures: list[FigureBlock] = field(default_factory=list)


def figure_png(fig: Any, dpi: int = 150) -> bytes:
    """Render a matplotlib figure to PNG bytes and close it."""
    from holostring.report.style import pyplot

    buf = io.BytesIO()
    fig.savefig(buf, format="png", dpi=dpi, bbox_inches="tight")
    pyplot().close(fig)
    return buf.getvalue()


def check_target(folder: str | Path, force: bool) -> Path:
    """Refuse an existing, non-empty report folder unless ``force``; check the parent is writable."""
    p = Path(folder)
    if p.exists() and not p.is_dir():
        raise InputError("--out", f"'{p}' exists and is not a folder")
    if p.exists() and any(p.iterdir()) and not force:
        raise InputError("--out", f"'{p}' already exists; use --force to replace it")
    parent = p.resolve().parent
    try:
        parent.mkdir(parents=True, exist_ok=True)
    except OSError as err:
        raise InputError("--out", f"cannot create '{parent}' ({err.strerror})") from None
    if not os.access(parent, os.W_OK | os.X_OK):
        raise InputError("--out", f"folder '{parent}' is not writable")
    return p


def write_bundle(
    folder: str | Path,
    title: str,
    sections: list[Section],
    data: dict[str, Any],
    *,
    force: bool = False,
    intro: str = "",
    limits: str = "",
) -> Path:
    """Write the report folder atomically.

    Parameters
    ----------
    folder
        Destination; must not exist (or be empty) unless ``force``.
    title
        Report title.
    sections
        The report's parts, in order.
    data
        Everything for report.json (numbers, errors, settings, formulas, versions, hashes).
    force
        Replace an existing folder (only after the new one is complete).
    intro, limits
        Opening paragraph and the statement of limits.

    Returns
    -------
    Path
        The folder.
    """
    target = check_target(folder, force)
    parent = target.resolve().parent
    tmp = Path(tempfile.mkdtemp(prefix=f".{target.name}.", suffix=".tmp", dir=parent))
    try:
        (tmp / "figures").mkdir()
        (tmp / "tables").mkdir()
        for s in sections:
            for f in s.figures:
                (tmp / "figures" / f"{f.name}.png").write_bytes(f.png)
            for t in s.tables:
                _write_csv(tmp / "tables" / f"{t.name}.csv", t)
        (tmp / "report.json").write_text(json.dumps(to_jsonable(data), indent=2) + "\n")
        (tmp / "summary.md").write_text(_markdown(title, intro, sections, limits))
        (tmp / "report.html").write_text(_html(title, intro, sections, limits))
        if target.exists():
            old = parent / f".{target.name}.old"
            if old.exists():
                shutil.rmtree(old)
            os.replace(target, old)
            os.replace(tmp, target)
            shutil.rmtree(old, ignore_errors=True)
        else:
            os.replace(tmp, target)
    except BaseException:
        shutil.rmtree(tmp, ignore_errors=True)
        raise
    return target


def _write_csv(path: Path, t: TableBlock) -> None:
    buf = io.StringIO()
    if t.caption:
        buf.write(f"# {t.caption}\n")
    w = csv.writer(buf, lineterminator="\n")
    w.writerow(t.header)
    for row in t.rows:
        w.writerow([repr(v) if isinstance(v, float) else ("" if v is None else v) for v in row])
    path.write_text(buf.getvalue())


def _cell(v: Any) -> str:
    if v is None:
        return "—"
    if isinstance(v, float):
        return f"{v:.10g}"
    return str(v)


def _markdown(title: str, intro: str, sections: list[Section], limits: str) -> str:
    out = [f"# {title}", ""]
    if intro:
        out += [intro, ""]
    for s in sections:
        out += [f"## {s.title}", ""]
        for p in s.paragraphs:
            out += [p, ""]
        if s.facts:
            out += ["| quantity | value |", "|---|---|"]
            out += [f"| {k} | {v} |" for k, v in s.facts]
            out.append("")
        for f in s.figures:
            out += [f"![{f.caption or f.name}](figures/{f.name}.png)", ""]
            if f.caption:
                out += [f"*{f.caption}*", ""]
        for t in s.tables:
            out += [f"**{t.caption or t.name}** (full table: `tables/{t.name}.csv`)", ""]
            out += ["| " + " | ".join(t.header) + " |", "|" + "---|" * len(t.header)]
            for row in t.rows[: t.show_rows]:
                out.append("| " + " | ".join(_cell(v) for v in row) + " |")
            if len(t.rows) > t.show_rows:
                out.append(f"| … {len(t.rows) - t.show_rows} more rows |" + " |" * (len(t.header) - 1))
            out.append("")
    if limits:
        out += ["## Limits", "", limits, ""]
    return "\n".join(out)


_CSS = """
body{font-family:-apple-system,"Segoe UI",Helvetica,Arial,sans-serif;max-width:60rem;margin:2rem auto;
padding:0 1.2rem;color:#1b1f24;line-height:1.5}
h1{font-size:1.7rem;border-bottom:2px solid #1f4e79;padding-bottom:.3rem}
h2{font-size:1.25rem;color:#1f4e79;margin-top:2.2rem;border-bottom:1px solid #d0d7de;padding-bottom:.2rem}
table{border-collapse:collapse;margin:.6rem 0 1.2rem;font-size:.88rem}
th,td{border:1px solid #d0d7de;padding:.25rem .6rem;text-align:left;vertical-align:top}
th{background:#f3f6f9}
td.num{font-family:ui-monospace,Menlo,Consolas,monospace;text-align:right}
figure{margin:1rem 0 1.6rem}
figure img{max-width:min(100%,46rem);border:1px solid #e5e9ee}
figcaption{font-size:.85rem;color:#57606a}
.limits{background:#fff8e5;border-left:4px solid #d68910;padding:.6rem 1rem;font-size:.9rem}
.intro{color:#333}
code{font-size:.9em}
"""


def _html(title: str, intro: str, sections: list[Section], limits: str) -> str:
    e = html.escape
    parts = [
        "<!DOCTYPE html><html lang='en'><head><meta charset='utf-8'>",
        f"<title>{e(title)}</title><style>{_CSS}</style></head><body>",
        f"<h1>{e(title)}</h1>",
    ]
    if intro:
        parts.append(f"<p class='intro'>{e(intro)}</p>")
    if limits:
        parts.append(f"<p class='limits'>{e(limits)}</p>")
    for s in sections:
        parts.append(f"<h2>{e(s.title)}</h2>")
        for p in s.paragraphs:
            parts.append(f"<p>{e(p)}</p>")
        if s.facts:
            parts.append("<table>")
            for k, v in s.facts:
                parts.append(f"<tr><th>{e(k)}</th><td>{e(v)}</td></tr>")
            parts.append("</table>")
        for f in s.figures:
            b64 = base64.b64encode(f.png).decode("ascii")
            parts.append(f"<figure><img alt='{e(f.name)}' src='data:image/png;base64,{b64}'>")
            if f.caption:
                parts.append(f"<figcaption>{e(f.caption)}</figcaption>")
            parts.append("</figure>")
        for t in s.tables:
            parts.append(
                f"<p><b>{e(t.caption or t.name)}</b> <small>(tables/{e(t.name)}.csv)</small></p><table>"
            )
            parts.append("<tr>" + "".join(f"<th>{e(h)}</th>" for h in t.header) + "</tr>")
            for row in t.rows[: t.show_rows]:
                cells = "".join(
                    f"<td class='num'>{e(_cell(v))}</td>"
                    if isinstance(v, int | float)
                    else f"<td>{e(_cell(v))}</td>"
                    for v in row
                )
                parts.append(f"<tr>{cells}</tr>")
            if len(t.rows) > t.show_rows:
                parts.append(
                    f"<tr><td colspan='{len(t.header)}'>… {len(t.rows) - t.show_rows} more rows in the CSV</td></tr>"
                )
            parts.append("</table>")
    parts.append("</body></html>")
    return "\n".join(parts)
