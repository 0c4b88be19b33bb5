"""The Background: an immutable symbolic 5D (or reduced 10D) background with named parameters.

Every analysis takes a :class:`Background`. It holds sympy expressions in ``z`` (the holographic
coordinate, boundary at z -> 0) and the parameter symbols, the current parameter values, the frame
convention, the dilaton and the IR end. Numbers come from :meth:`Background.function`, which
compiles an expression once per background structure (shared by every ``with_params`` copy) and
binds the current parameter values.

Metric convention (DESIGN.md section 1), string frame unless ``frame`` says otherwise::

    ds^2 = G_tt(z)(-dt^2) + G_xx(z) dx_i dx_i + G_yy(z) dy^2 + G_zz(z) dz^2 (+ internal space)

``n_flat`` is the number of flat spatial directions x_i (3, or 2 when one of them is the compact
circle y of a soliton); ``internal_measure`` is the square root of the determinant of any further
internal directions, used only by fluctuation equations.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Mapping
from dataclasses import dataclass, field, replace
from enum import StrEnum
from typing import Any

import numpy as np
import sympy as sp

from holostring.background.formula import Z
from holostring.background.frames import Frame, FrameRule, convert
from holostring.errors import InputError

STRING_COUPLING = "g"


class IRKind(StrEnum):
    """How space ends in the infrared."""

    INFINITY = "infinity"  #: z runs to infinity
    WALL = "wall"  #: space is cut at z = z0 (hard wall)
    HORIZON = "horizon"  #: a black-brane horizon at z = z_h, G_tt -> 0
    CAP = "cap"  #: a smooth end where a compact circle shrinks (soliton), G_tt stays finite


@dataclass(frozen=True)
class Parameter:
    """A named background parameter.

    Attributes
    ----------
    name
        Identifier used in formulas and on the command line.
    default
        Default value, or ``None`` when the user must give one.
    lower, upper
        Allowed range; ``lower_open``/``upper_open`` make an end exclusive.
    dimension
        Mass dimension (c of the soft wall: 2; a wall position z0: -1; g: 0). With an energy
        unit on the background this fixes the parameter's physical unit.
    meaning
        One line for humans.
    """

    name: str
    default: float | None
    lower: float = -math.inf
    upper: float = math.inf
    lower_open: bool = False
    upper_open: bool = False
    dimension: float = 0.0
    meaning: str = ""

    @property
    def range_text(self) -> str:
        """The allowed range in interval notation, e.g. ``(0, inf)``."""
        left = "(" if self.lower_open or math.isinf(self.lower) else "["
        right = ")" if self.upper_open or math.isinf(self.upper) else "]"
        return f"{left}{_num(self.lower)}, {_num(self.upper)}{right}"

    def unit(self, energy_unit: str | None) -> str:
        """Physical unit for an energy unit such as ``GeV`` (empty when dimensionless)."""
        if not self.dimension:
            return ""
        base = energy_unit or "E"
        return base if self.dimension == 1 else f"{base}^{_num(self.dimension)}"

    def check(self, value: Any) -> float:
        """Validate a value for this parameter; return it as a float.

        Raises
        ------
        InputError
            Naming the parameter when the value is not a finite real number in range.
        """
        if isinstance(value, bool) or not isinstance(value, int | float | np.floating | np.integer):
            raise InputError(f"parameter {self.name}", f"expected a number, got {type(value).__name__}")
        x = float(value)
        if not math.isfinite(x):
            raise InputError(f"parameter {self.name}", f"{x} is not a finite number")
        low_bad = x < self.lower or (self.lower_open and x == self.lower)
        high_bad = x > self.upper or (self.upper_open and x == self.upper)
        if low_bad or high_bad:
            raise InputError(
                f"parameter {self.name}", f"{x:g} is outside the allowed range {self.range_text}"
            )
        return x

    @property
    def symbol(self) -> sp.Symbol:
        """The sympy symbol standing for this parameter (positive when the range allows)."""
        if self.lower > 0 or (self.lower == 0 and self.lower_open):
            return sp.Symbol(self.name, positive=True)
        if self.lower >= 0:
            return sp.Symbol(self.name, nonnegative=True)
        return sp.Symbol(self.name, real=True)


def _num(x: float) -> str:
    if math.isinf(x):
        return "inf" if x > 0 else "-inf"
    return f"{x:g}"


def string_coupling_parameter(default: float = 1.0) -> Parameter:
    """The overall string coupling g = R^2/(2 pi alpha'), present on every background."""
    return Parameter(
        STRING_COUPLING,
        default,
        lower=0.0,
        lower_open=True,
        meaning="string coupling R^2/(2 pi alpha'), multiplies every Nambu-Goto energy",
    )


@dataclass(frozen=True)
class IREnd:
    """The infrared end of the radial direction: its kind and its position (an expression)."""

    kind: IRKind
    at: sp.Expr | None = None


@dataclass(frozen=True)
class FieldDeclaration:
    """A bulk field declared by a background file, for the spectra module.

    Attributes
    ----------
    name
        Channel name (e.g. ``my-scalar``).
    spin
        0 (scalar), 1 (vector) or 2 (transverse-traceless tensor).
    mass_squared
        Bulk mass M5^2 in units of the AdS radius.
    dilaton_coupling
        k in the action factor exp(-k Phi).
    frame
        The frame of the metric the field's action is written in.
    """

    name: str
    spin: int
    mass_squared: float = 0.0
    dilaton_coupling: float = 1.0
    frame: Frame = Frame.EINSTEIN


class _Compiled:
    """Per-structure cache of lambdified functions, shared by ``with_params`` copies."""

    def __init__(self) -> None:
        self.functions: dict[tuple[str, str], Callable[..., Any]] = {}
        self.expressions: dict[str, sp.Expr] = {}
        self.memo: dict[str, Any] = {}

    def __getstate__(self) -> dict[str, Any]:
        # compiled functions do not pickle; a worker process recompiles them once
        return {}

    def __setstate__(self, state: dict[str, Any]) -> None:
        self.__init__()  # type: ignore[misc]


@dataclass(frozen=True, eq=False)
class Background:
    """An immutable holographic background.

    Build one with :func:`holostring.load_background` (catalogue name or file), or with
    :meth:`from_warp` / :meth:`from_components` in Python. Use :meth:`with_params` for new values.

    Attributes
    ----------
    name, title, source, notes
        Identification and the published source.
    parameters
        Declared parameters, the string coupling ``g`` always among them.
    values
        Current values, aligned with ``parameters``.
    frame, frame_rule
        Frame of the stored metric, and the string/Einstein convention.
    G_tt, G_xx, G_zz, G_yy
        Metric components in ``frame`` (``G_yy`` is ``None`` without a compact circle).
    dilaton
        Phi(z) (0 when absent).
    blackening
        f(z) when the metric has one (informational: temperature, thermal partners).
    n_flat
        Number of flat spatial directions with G_xx.
    internal_measure
        sqrt(det) of internal directions, for fluctuation equations (1 in five dimensions).
    ir
        The IR end.
    energy_unit
        ``None`` (dimensionless, units of the model's scale) or e.g. ``"GeV"``.
    fields
        Bulk fields declared by the file.
    origin
        ``catalogue:NAME`` or the file path; ``origin_hash`` is the file's SHA-256.
    """

    name: str
    parameters: tuple[Parameter, ...]
    values: tuple[float, ...]
    G_tt: sp.Expr
    G_xx: sp.Expr
    G_zz: sp.Expr
    frame: Frame = Frame.STRING
    frame_rule: FrameRule = FrameRule.TEN_D
    dilaton: sp.Expr = sp.Integer(0)  # noqa: RUF009 - sympy numbers are immutable
    blackening: sp.Expr | None = None
    G_yy: sp.Expr | None = None
    n_flat: int = 3
    internal_measure: sp.Expr = sp.Integer(1)  # noqa: RUF009
    ir: IREnd = IREnd(IRKind.INFINITY)
    title: str = ""
    source: str = ""
    notes: str = ""
    energy_unit: str | None = None
    fields: tuple[FieldDeclaration, ...] = ()
    origin: str = ""
    origin_hash: str | None = None
    formulas: tuple[tuple[str, str], ...] = ()
    _compiled: _Compiled = field(default_factory=_Compiled, repr=False, compare=False)

    # ----------------------------------------------------------------- construction
    def __post_init__(self) -> None:
        names = [p.name for p in self.parameters]
        if STRING_COUPLING not in names:
            object.__setattr__(self, "parameters", (*self.parameters, string_coupling_parameter()))
            object.__setattr__(self, "values", (*self.values, 1.0))
        if len(self.values) != len(self.parameters):
            raise InputError("parameters", "values and parameters differ in number")

    @classmethod
    def from_components(
        cls,
        name: str,
        *,
        G_tt: sp.Expr,
        G_xx: sp.Expr,
        G_zz: sp.Expr,
        parameters: tuple[Parameter, ...] = (),
        values: Mapping[str, float] | None = None,
        **kwargs: Any,
    ) -> Background:
        """Build a background from its metric components (a Python-side constructor).

        Parameters
        ----------
        name
            Name used in outputs.
        G_tt, G_xx, G_zz
            sympy expressions in :data:`holostring.background.formula.Z` and parameter symbols.
        parameters
            Declared parameters; ``values`` overrides their defaults.
        **kwargs
            Any further :class:`Background` field (dilaton, ir, frame, ...).
        """
        vals = []
        given = dict(values or {})
        for p in parameters:
            v = given.pop(p.name, p.default)
            if v is None:
                raise InputError(f"parameter {p.name}", "no value given and no default")
            vals.append(p.check(v))
        bg = cls(
            name=name,
            parameters=tuple(parameters),
            values=tuple(vals),
            G_tt=G_tt,
            G_xx=G_xx,
            G_zz=G_zz,
            **kwargs,
        )
        return bg.with_params(**given) if given else bg

    @classmethod
    def from_warp(
        cls,
        name: str,
        *,
        warp: sp.Expr,
        blackening: sp.Expr | None = None,
        **kwargs: Any,
    ) -> Background:
        """Build a conformally flat background: G_tt = w f, G_xx = w, G_zz = w / f."""
        f = sp.Integer(1) if blackening is None else blackening
        return cls.from_components(
            name, G_tt=warp * f, G_xx=warp, G_zz=warp / f, blackening=blackening, **kwargs
        )

    # ----------------------------------------------------------------- parameters
    @property
    def params(self) -> dict[str, float]:
        """Current parameter values by name."""
        return {p.name: v for p, v in zip(self.parameters, self.values, strict=True)}

    @property
    def symbols(self) -> dict[str, sp.Symbol]:
        """Parameter symbols by name."""
        return {p.name: p.symbol for p in self.parameters}

    def parameter(self, name: str) -> Parameter:
        """The declared parameter called ``name``."""
        for p in self.parameters:
            if p.name == name:
                return p
        known = ", ".join(p.name for p in self.parameters)
        raise InputError(f"parameter {name}", f"unknown for background '{self.name}' (known: {known})")

    @property
    def g(self) -> float:
        """The string coupling g = R^2/(2 pi alpha')."""
        return self.params[STRING_COUPLING]

    def with_params(self, **updates: float) -> Background:
        """Return a copy with new parameter values, validated against their ranges.

        Raises
        ------
        InputError
            For an unknown name or a value that is not finite or out of range.
        """
        new = dict(self.params)
        for name, value in updates.items():
            new[name] = self.parameter(name).check(value)
        values = tuple(new[p.name] for p in self.parameters)
        return replace(self, values=values, _compiled=self._compiled)

    def with_units(self, energy_unit: str | None) -> Background:
        """Return a copy whose parameters are read in powers of ``energy_unit`` (e.g. GeV)."""
        return replace(self, energy_unit=energy_unit, _compiled=self._compiled)

    def substitutions(self) -> dict[sp.Symbol, float]:
        """Map parameter symbols to current values (for sympy ``subs``)."""
        return {p.symbol: v for p, v in zip(self.parameters, self.values, strict=True)}

    # ----------------------------------------------------------------- geometry
    def metric(self, frame: Frame | str = Frame.STRING) -> dict[str, sp.Expr]:
        """Metric components ``G_tt, G_xx, G_zz`` (and ``G_yy`` if present) in ``frame``."""
        key = f"metric:{Frame(frame)}"
        cached = self._compiled.expressions.get(key)
        if cached is not None:
            return dict(cached)  # type: ignore[arg-type]
        comps = {"G_tt": self.G_tt, "G_xx": self.G_xx, "G_zz": self.G_zz}
        if self.G_yy is not None:
            comps["G_yy"] = self.G_yy
        out = {
            k: convert(v, self.dilaton, self.frame_rule, self.frame, Frame(frame)) for k, v in comps.items()
        }
        self._compiled.expressions[key] = out  # type: ignore[assignment]
        return dict(out)

    def expression(self, name: str) -> sp.Expr:
        """A named derived expression (string frame unless stated).

        Names: ``G_tt, G_xx, G_zz, G_yy`` (string frame), ``F = sqrt(G_tt G_xx)``,
        ``H = sqrt(G_tt G_zz)``, ``dF``, ``dH`` (z-derivatives), ``Phi``, ``dPhi``.
        """
        cache = self._compiled.expressions
        if name in cache:
            return cache[name]
        m = self.metric(Frame.STRING)
        if name in m:
            expr = m[name]
        elif name == "F":
            expr = positive_sqrt(m["G_tt"] * m["G_xx"])
        elif name == "H":
            expr = positive_sqrt(m["G_tt"] * m["G_zz"])
        elif name == "Phi":
            expr = self.dilaton
        elif name.startswith("d") and name[1:] in {"F", "H", "Phi", "G_tt", "G_xx", "G_zz"}:
            expr = sp.diff(self.expression(name[1:]), Z)
        else:
            raise KeyError(name)
        cache[name] = expr
        return expr

    @property
    def z_ir(self) -> float:
        """Numeric position of the IR end (``inf`` when space does not end)."""
        if self.ir.kind is IRKind.INFINITY or self.ir.at is None:
            return math.inf
        return float(sp.N(self.ir.at.subs(self.substitutions())))

    # ----------------------------------------------------------------- numerics
    def function(self, expr: sp.Expr | str, backend: str = "numpy") -> Callable[[Any], Any]:
        """Compile an expression in z (and parameters) once; return f(z) at current values.

        Parameters
        ----------
        expr
            A sympy expression, or a name accepted by :meth:`expression`.
        backend
            ``"numpy"`` or ``"jax"``.

        Returns
        -------
        callable
            Vectorised ``f(z)``; constants are broadcast to the shape of ``z``.
        """
        raw = self.raw_function(expr, backend)
        vals = tuple(self.values)

        def bound(z: Any) -> Any:
            return raw(z, *vals)

        return bound

    def raw_function(self, expr: sp.Expr | str, backend: str = "numpy") -> Callable[..., Any]:
        """Compiled ``f(z, *values)`` with parameters as arguments (in ``parameters`` order)."""
        if isinstance(expr, str):
            key_name = expr
            expr = self.expression(expr)
        else:
            key_name = sp.srepr(expr)
        key = (key_name, backend)
        fn = self._compiled.functions.get(key)
        if fn is None:
            fn = _lambdify(expr, [p.symbol for p in self.parameters], backend)
            self._compiled.functions[key] = fn
        return fn

    def describe(self) -> dict[str, Any]:
        """Plain-data description: name, source, parameters, formulas, frame, IR end."""
        return {
            "name": self.name,
            "title": self.title,
            "source": self.source,
            "origin": self.origin,
            "origin_sha256": self.origin_hash,
            "frame": str(self.frame),
            "frame_rule": str(self.frame_rule),
            "energy_unit": self.energy_unit,
            "parameters": {
                p.name: {
                    "value": v,
                    "default": p.default,
                    "range": p.range_text,
                    "unit": p.unit(self.energy_unit),
                    "meaning": p.meaning,
                }
                for p, v in zip(self.parameters, self.values, strict=True)
            },
            "metric": {k: str(v) for k, v in self.metric(self.frame).items()},
            "dilaton": str(self.dilaton),
            "ir_end": {"kind": str(self.ir.kind), "at": None if self.ir.at is None else str(self.ir.at)},
        }


def positive_sqrt(x: sp.Expr) -> sp.Expr:
    """sqrt of an expression known to be positive on the domain, with powers combined."""
    return sp.powsimp(sp.powdenest(sp.sqrt(sp.powsimp(x, force=True)), force=True), force=True)


def _lambdify(expr: sp.Expr, params: list[sp.Symbol], backend: str) -> Callable[..., Any]:
    args = [Z, *params]
    if backend == "jax":
        from holostring._jax import jnp

        fn = sp.lambdify(args, expr, modules=[jnp, "jax"])
        if Z not in expr.free_symbols:
            return lambda z, *v: jnp.zeros_like(jnp.asarray(z, dtype=float)) + fn(z, *v)
        return fn
    fn = sp.lambdify(args, expr, modules=["scipy", "numpy"])
    if Z not in expr.free_symbols:
        return lambda z, *v: np.zeros_like(np.asarray(z, dtype=float)) + fn(z, *v)
    return fn
