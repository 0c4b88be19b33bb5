"""Imports point down the layers of DESIGN.md section 7; heavy libraries stay where they belong."""

import ast
from pathlib import Path

import pytest

PKG = Path(__file__).resolve().parents[1] / "holostring"

# layer rank: a module may import only from its own layer or lower ones
RANK = {
    "errors": 0,
    "provenance": 0,
    "units": 0,
    "_jax": 0,
    "background": 1,
    "strings": 2,
    "spectra": 2,
    "thermo": 3,
    "fit": 3,
    "scan": 4,
    "calibrate": 4,
    "workflow": 4,
    "report": 5,
    "cli": 6,
}


def modules():
    return sorted(p for p in PKG.rglob("*.py"))


def layer_of(path: Path) -> str | None:
    rel = path.relative_to(PKG).parts
    name = rel[0].removesuffix(".py")
    return name if name in RANK else None


def imported(path: Path):
    tree = ast.parse(path.read_text())
    for node in ast.walk(tree):
        if isinstance(node, ast.Import):
            for a in node.names:
                yield a.name
        elif isinstance(node, ast.ImportFrom) and node.module and node.level == 0:
            yield node.module


@pytest.mark.parametrize("path", modules(), ids=lambda p: str(p.relative_to(PKG)))
def test_imports_point_down(path):
    mine = layer_of(path)
    if mine is None:
        return
    for name in imported(path):
        parts = name.split(".")
        if parts[0] != "holostring" or len(parts) < 2:
            continue
        theirs = parts[1]
        if theirs in RANK:
            assert RANK[theirs] <= RANK[mine], f"{path.name} ({mine}) imports {name} ({theirs})"


@pytest.mark.parametrize("path", modules(), ids=lambda p: str(p.relative_to(PKG)))
def test_heavy_imports_stay_in_place(path):
    mine = layer_of(path)
    for name in imported(path):
        top = name.split(".")[0]
        if top == "matplotlib":
            assert mine == "report", f"{path} imports matplotlib"
        if top == "jax":
            assert path.name == "_jax.py", f"{path} imports jax directly; use holostring._jax"
        if top == "typer":
            assert mine == "cli", f"{path} imports typer"


def test_no_eval_or_sympify_on_text():
    for path in modules():
        text = path.read_text()
        for banned in ("eval(", "exec(", "sympify(", "parse_expr("):
            lines = [
                ln
                for ln in text.splitlines()
                if banned in ln
                and not ln.lstrip().startswith("#")
                and "literal_eval" not in ln
                and 'mode="eval"' not in ln
            ]
            assert not lines, f"{path}: {banned} {lines}"
