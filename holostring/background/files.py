"""Background files (TOML) to :class:`Background` objects.

The format is documented in README.md ("Background files"). Every check names the file, the key
and, for formulas, the offending token. Formulas go through :mod:`holostring.background.formula`.
"""

from __future__ import annotations

import hashlib
import math
import re
import tomllib
from pathlib import Path
from typing import Any

import sympy as sp

from holostring.background.formula import Z, parse_formula
from holostring.background.frames import Frame, FrameRule
from holostring.background.model import (
    STRING_COUPLING,
    Background,
    FieldDeclaration,
    IREnd,
    IRKind,
    Parameter,
    string_coupling_parameter,
)
from holostring.errors import BackgroundFileError, FormulaError, HolostringError

TOP_KEYS = {"background", "parameters", "let", "metric", "ir", "fields"}
BACKGROUND_KEYS = {"name", "title", "source", "notes", "frame", "frame_rule", "energy_unit"}
PARAMETER_KEYS = {"default", "range", "dimension", "meaning"}
METRIC_KEYS = {
    "warp",
    "A",
    "blackening",
    "dilaton",
    "G_tt",
    "G_xx",
    "G_zz",
    "circle",
    "internal_measure",
    "flat_directions",
}
IR_KEYS = {"kind", "at"}
FIELD_KEYS = {"name", "spin", "mass_squared", "dilaton_coupling", "frame"}
NAME_RE = re.compile(r"^[A-Za-z][A-Za-z0-9_]*$")
RESERVED = {"z", "pi"}
MAX_FILE_BYTES = 200_000


def load_file(path: str | Path, origin: str | None = None) -> Background:
    """Load a background file.

    Parameters
    ----------
    path
        Path to a TOML background file.
    origin
        Label stored as the background's origin (defaults to the path).

    Returns
    -------
    Background
        With parameters at their defaults (those without a default must then be set with
        ``with_params``, which :func:`holostring.load_background` does from its arguments).

    Raises
    ------
    BackgroundFileError
        Naming the file, the key and the reason.
    """
    p = Path(path)
    label = str(path)
    try:
        data = p.read_bytes()
    except FileNotFoundError:
        raise BackgroundFileError(label, None, "no such file") from None
    except IsADirectoryError:
        raise BackgroundFileError(label, None, "is a directory, not a background file") from None
    except OSError as err:
        raise BackgroundFileError(label, None, f"cannot be read ({err.strerror})") from None
    if len(data) > MAX_FILE_BYTES:
        raise BackgroundFileError(label, None, f"larger than {MAX_FILE_BYTES} bytes")
    try:
        text = data.decode("utf-8")
    except UnicodeDecodeError:
        raise BackgroundFileError(label, None, "is not UTF-8 text") from None
    bg = parse_document(text, label, origin=origin or label)
    return _replace_hash(bg, hashlib.sha256(data).hexdigest())


def _replace_hash(bg: Background, digest: str) -> Background:
    from dataclasses import replace

    return replace(bg, origin_hash=digest, _compiled=bg._compiled)


def parse_document(text: str, label: str, origin: str | None = None) -> Background:
    """Parse the text of a background file (see :func:`load_file`)."""
    try:
        doc = tomllib.loads(text)
    except tomllib.TOMLDecodeError as err:
        raise BackgroundFileError(label, None, f"malformed TOML: {err}") from None
    return _Reader(doc, label).read(origin or label)


class _Reader:
    def __init__(self, doc: dict[str, Any], label: str) -> None:
        self.doc = doc
        self.label = label

    def fail(self, key: str | None, reason: str, token: str | None = None) -> BackgroundFileError:
        return BackgroundFileError(self.label, key, reason, token)

    def table(self, key: str, allowed: set[str], required: bool = False) -> dict[str, Any]:
        value = self.doc.get(key)
        if value is None:
            if required:
                raise self.fail(key, "missing table")
            return {}
        if not isinstance(value, dict):
            raise self.fail(key, "must be a table")
        self.only(key, value, allowed)
        return value

    def only(self, where: str, table: dict[str, Any], allowed: set[str]) -> None:
        for k in table:
            if k not in allowed:
                raise self.fail(f"{where}.{k}", f"unknown key (allowed: {', '.join(sorted(allowed))})")

    def text(self, key: str, value: Any) -> str:
        if not isinstance(value, str):
            raise self.fail(key, f"must be text, got {type(value).__name__}")
        return value

    def number(self, key: str, value: Any) -> float:
        if isinstance(value, bool) or not isinstance(value, int | float):
            raise self.fail(key, f"must be a number, got {type(value).__name__}")
        x = float(value)
        if not math.isfinite(x):
            raise self.fail(key, "must be a finite number")
        return x

    def formula(self, key: str, value: Any, names: dict[str, sp.Expr]) -> sp.Expr:
        if isinstance(value, int | float) and not isinstance(value, bool):
            value = repr(value)
        text = self.text(key, value)
        try:
            return parse_formula(text, names)
        except FormulaError as err:
            raise self.fail(key, err.reason, err.token) from None

    def read(self, origin: str) -> Background:
        for k in self.doc:
            if k not in TOP_KEYS:
                raise self.fail(k, f"unknown table (allowed: {', '.join(sorted(TOP_KEYS))})")
        head = self.table("background", BACKGROUND_KEYS, required=True)
        name = self.text("background.name", head.get("name", Path(self.label).stem))
        if not name.strip():
            raise self.fail("background.name", "must not be empty")
        frame = self.choice("background.frame", head.get("frame", "string"), Frame)
        rule = self.choice("background.frame_rule", head.get("frame_rule", "10d"), FrameRule)
        unit = head.get("energy_unit")
        if unit is not None:
            unit = self.text("background.energy_unit", unit).strip() or None

        params, defaults = self.parameters()
        names: dict[str, sp.Expr] = {p.name: p.symbol for p in params}
        for k, v in self.table("let", set(self.doc.get("let", {}) or {})).items():
            self.check_name(f"let.{k}", k, names)
            names[k] = self.formula(f"let.{k}", v, names)

        metric = self.table("metric", METRIC_KEYS, required=True)
        comps = self.metric(metric, names)
        ir = self.ir_end(names)
        fields = self.fields()
        formulas = tuple((f"metric.{k}", str(v)) for k, v in metric.items())
        bg = Background(
            name=name,
            parameters=tuple(params),
            values=tuple(defaults),
            frame=frame,
            frame_rule=rule,
            ir=ir,
            title=str(head.get("title", "")),
            source=str(head.get("source", "")),
            notes=str(head.get("notes", "")),
            energy_unit=unit,
            fields=fields,
            origin=origin,
            formulas=formulas,
            **comps,
        )
        return bg

    def choice(self, key: str, value: Any, enum: type) -> Any:
        text = self.text(key, value)
        try:
            return enum(text)
        except ValueError:
            allowed = ", ".join(e.value for e in enum)
            raise self.fail(key, f"must be one of {allowed}", text) from None

    def check_name(self, key: str, name: str, taken: dict[str, Any]) -> None:
        if not NAME_RE.match(name) or name.startswith("_"):
            raise self.fail(key, "a name must start with a letter and hold letters, digits, _", name)
        if name in RESERVED or name in taken:
            raise self.fail(key, "name already in use (z and pi are reserved)", name)
        from holostring.background.formula import FUNCTIONS

        if name in FUNCTIONS:
            raise self.fail(key, "name clashes with a function", name)

    def parameters(self) -> tuple[list[Parameter], list[float]]:
        raw = self.doc.get("parameters", {})
        if not isinstance(raw, dict):
            raise self.fail("parameters", "must be a table of tables")
        params: list[Parameter] = []
        defaults: list[float] = []
        taken: dict[str, Any] = {}
        for pname, spec in raw.items():
            key = f"parameters.{pname}"
            self.check_name(key, pname, taken)
            taken[pname] = True
            if isinstance(spec, int | float) and not isinstance(spec, bool):
                spec = {"default": spec}
            if not isinstance(spec, dict):
                raise self.fail(key, "must be a table (default, range, dimension, meaning)")
            self.only(key, spec, PARAMETER_KEYS)
            default = spec.get("default")
            low, high, lo_open, hi_open = (-math.inf, math.inf, False, False)
            if "range" in spec:
                low, high, lo_open, hi_open = self.interval(f"{key}.range", spec["range"])
            if pname == STRING_COUPLING and "range" not in spec:
                low, lo_open = 0.0, True
            dim = self.number(f"{key}.dimension", spec.get("dimension", 0))
            param = Parameter(pname, None, low, high, lo_open, hi_open, dim, str(spec.get("meaning", "")))
            if default is not None:
                dval = self.number(f"{key}.default", default)
                try:
                    param.check(dval)
                except HolostringError as err:
                    raise self.fail(f"{key}.default", str(err)) from None
                param = Parameter(pname, dval, low, high, lo_open, hi_open, dim, param.meaning)
            params.append(param)
            defaults.append(param.default if param.default is not None else math.nan)
        if STRING_COUPLING not in taken:
            params.append(string_coupling_parameter())
            defaults.append(1.0)
        return params, defaults

    def interval(self, key: str, value: Any) -> tuple[float, float, bool, bool]:
        text = self.text(key, value).strip()
        m = re.fullmatch(r"([\[(])\s*([^,\s]+)\s*,\s*([^\])\s]+)\s*([\])])", text)
        if not m:
            raise self.fail(key, "expected an interval such as '(0, inf)' or '[1, 10]'", text)
        try:
            low = float(m.group(2))
            high = float(m.group(3))
        except ValueError:
            raise self.fail(key, "interval ends must be numbers or inf", text) from None
        if math.isnan(low) or math.isnan(high) or low > high:
            raise self.fail(key, "interval is empty", text)
        return low, high, m.group(1) == "(", m.group(4) == ")"

    def metric(self, metric: dict[str, Any], names: dict[str, sp.Expr]) -> dict[str, Any]:
        has_warp = "warp" in metric or "A" in metric
        has_comp = any(k in metric for k in ("G_tt", "G_xx", "G_zz"))
        if has_warp and has_comp:
            raise self.fail("metric", "give either warp/A (with blackening) or G_tt, G_xx, G_zz, not both")
        if "warp" in metric and "A" in metric:
            raise self.fail("metric.A", "give either warp or A, not both")
        out: dict[str, Any] = {}
        f = None
        if "blackening" in metric:
            f = self.formula("metric.blackening", metric["blackening"], names)
            out["blackening"] = f
        if has_warp:
            if "warp" in metric:
                w = self.formula("metric.warp", metric["warp"], names)
            else:
                a = self.formula("metric.A", metric["A"], names)
                w = sp.exp(2 * a) / Z**2
            ff = f if f is not None else sp.Integer(1)
            out.update(G_tt=w * ff, G_xx=w, G_zz=w / ff)
        elif has_comp:
            for k in ("G_tt", "G_xx", "G_zz"):
                if k not in metric:
                    raise self.fail(f"metric.{k}", "missing (all three of G_tt, G_xx, G_zz are needed)")
                out[k] = self.formula(f"metric.{k}", metric[k], names)
        else:
            raise self.fail("metric", "needs warp (or A) or the components G_tt, G_xx, G_zz")
        if "dilaton" in metric:
            out["dilaton"] = self.formula("metric.dilaton", metric["dilaton"], names)
        if "circle" in metric:
            out["G_yy"] = self.formula("metric.circle", metric["circle"], names)
        if "internal_measure" in metric:
            out["internal_measure"] = self.formula(
                "metric.internal_measure", metric["internal_measure"], names
            )
        n_default = 2 if "circle" in metric else 3
        n = metric.get("flat_directions", n_default)
        if isinstance(n, bool) or not isinstance(n, int) or not 1 <= n <= 3:
            raise self.fail("metric.flat_directions", "must be 1, 2 or 3")
        out["n_flat"] = n
        return out

    def ir_end(self, names: dict[str, sp.Expr]) -> IREnd:
        ir = self.table("ir", IR_KEYS)
        kind = self.choice("ir.kind", ir.get("kind", "infinity"), IRKind)
        if kind is IRKind.INFINITY:
            if "at" in ir:
                raise self.fail("ir.at", "an IR end at infinity takes no position")
            return IREnd(kind)
        if "at" not in ir:
            raise self.fail("ir.at", f"an IR end of kind '{kind}' needs its position")
        at = self.formula("ir.at", ir["at"], names)
        if Z in at.free_symbols:
            raise self.fail("ir.at", "the IR position cannot depend on z", "z")
        return IREnd(kind, at)

    def fields(self) -> tuple[FieldDeclaration, ...]:
        raw = self.doc.get("fields", [])
        if not isinstance(raw, list):
            raise self.fail("fields", "must be an array of tables ([[fields]])")
        out = []
        for i, spec in enumerate(raw):
            key = f"fields[{i}]"
            if not isinstance(spec, dict):
                raise self.fail(key, "must be a table")
            self.only(key, spec, FIELD_KEYS)
            if "name" not in spec:
                raise self.fail(f"{key}.name", "missing")
            name = self.text(f"{key}.name", spec["name"])
            spin = spec.get("spin", 0)
            if isinstance(spin, bool) or spin not in (0, 1, 2):
                raise self.fail(f"{key}.spin", "must be 0, 1 or 2")
            out.append(
                FieldDeclaration(
                    name=name,
                    spin=int(spin),
                    mass_squared=self.number(f"{key}.mass_squared", spec.get("mass_squared", 0.0)),
                    dilaton_coupling=self.number(
                        f"{key}.dilaton_coupling", spec.get("dilaton_coupling", 1.0)
                    ),
                    frame=self.choice(f"{key}.frame", spec.get("frame", "einstein"), Frame),
                )
            )
        return tuple(out)
