"""Scan results: one row per parameter point, frozen, with a plain-data view."""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Any

from holostring.provenance import Provenance

OK = "ok"
FAILED = "failed"


@dataclass(frozen=True)
class ScanRow:
    """The outcome at one parameter point.

    Attributes
    ----------
    index
        Position of the point in the plan.
    point
        Varied parameter values, by name.
    values
        Observable spec -> ``(value, error)``, or ``None`` where it could not be computed.
    status
        ``"ok"`` when every observable was computed, ``"failed"`` otherwise.
    message
        Why the point (or some of its observables) failed; empty when ok.
    """

    index: int
    point: dict[str, float]
    values: dict[str, tuple[float, float] | None]
    status: str = OK
    message: str = ""

    @property
    def ok(self) -> bool:
        """Whether every observable was computed."""
        return self.status == OK

    def key(self) -> tuple[float, ...]:
        """The point's parameter values (identifies it when resuming)."""
        return tuple(self.point.values())

    def to_dict(self) -> dict[str, Any]:
        """Plain-JSON view (non-finite numbers become ``None``)."""
        return {
            "index": self.index,
            "point": dict(self.point),
            "values": {
                k: None if v is None else {"value": _finite(v[0]), "error": _finite(v[1])}
                for k, v in self.values.items()
            },
            "status": self.status,
            "message": self.message,
        }

    @classmethod
    def from_dict(cls, d: dict[str, Any]) -> ScanRow:
        """Inverse of :meth:`to_dict`."""
        values: dict[str, tuple[float, float] | None] = {}
        for k, v in d["values"].items():
            values[k] = None if v is None else (_num(v["value"]), _num(v["error"]))
        point = {str(k): float(x) for k, x in d["point"].items()}
        return cls(int(d["index"]), point, values, str(d["status"]), str(d.get("message", "")))


def _finite(x: float) -> float | None:
    return x if math.isfinite(x) else None


def _num(x: Any) -> float:
    return math.nan if x is None else float(x)


@dataclass(frozen=True)
class ScanResult:
    """A finished scan: one :class:`ScanRow` per planned point, in plan order.

    Attributes
    ----------
    background
        Background name.
    parameters
        Fixed parameter values (those not varied).
    varied
        Varied parameter names, in plan order.
    observables
        Observable specs, in the order given.
    kind
        ``"grid"`` or ``"random"``.
    shape
        Grid shape (one length per varied parameter), ``None`` for random samples.
    rows
        One row per point.
    units
        Unit text per parameter and observable name (empty when dimensionless).
    computed, reused
        Points evaluated in this run, and points taken from an earlier run's store.
    elapsed
        Wall time of this run in seconds.
    executor
        What ran the points (``"this process"``, ``"processes(2)"``, ``"dask"``, or a class name).
    provenance
        Background, fixed parameters and scan settings.
    """

    background: str
    parameters: dict[str, float]
    varied: tuple[str, ...]
    observables: tuple[str, ...]
    kind: str
    shape: tuple[int, ...] | None
    rows: tuple[ScanRow, ...]
    units: dict[str, str] = field(default_factory=dict)
    computed: int = 0
    reused: int = 0
    elapsed: float = 0.0
    executor: str = ""
    provenance: Provenance | None = None

    @property
    def n_ok(self) -> int:
        """Number of points where every observable was computed."""
        return sum(r.ok for r in self.rows)

    @property
    def n_failed(self) -> int:
        """Number of points with at least one failed observable."""
        return len(self.rows) - self.n_ok

    @property
    def message(self) -> str:
        """One line: points, failures, how they were run."""
        text = f"{len(self.rows)} points: {self.n_ok} ok, {self.n_failed} failed"
        if self.reused:
            text += f" ({self.reused} taken from an earlier run)"
        return text

    def column(self, name: str) -> list[float]:
        """A varied parameter's values, or an observable's values (NaN where it failed)."""
        if name in self.varied:
            return [r.point[name] for r in self.rows]
        if name in self.observables:
            return [math.nan if r.values.get(name) is None else r.values[name][0] for r in self.rows]  # type: ignore[index]
        raise KeyError(name)

    def errors(self, name: str) -> list[float]:
        """An observable's error estimates (NaN where it failed)."""
        return [math.nan if r.values.get(name) is None else r.values[name][1] for r in self.rows]  # type: ignore[index]

    def failures(self) -> dict[str, int]:
        """Failure messages with how many points gave each, most frequent first."""
        counts: dict[str, int] = {}
        for r in self.rows:
            if not r.ok:
                counts[r.message] = counts.get(r.message, 0) + 1
        return dict(sorted(counts.items(), key=lambda kv: -kv[1]))

    def to_dict(self) -> dict[str, Any]:
        """Plain-JSON view."""
        return {
            "background": self.background,
            "parameters": dict(self.parameters),
            "varied": list(self.varied),
            "observables": list(self.observables),
            "kind": self.kind,
            "shape": None if self.shape is None else list(self.shape),
            "units": dict(self.units),
            "summary": {
                "points": len(self.rows),
                "ok": self.n_ok,
                "failed": self.n_failed,
                "computed": self.computed,
                "reused": self.reused,
                "elapsed_seconds": self.elapsed,
                "executor": self.executor,
                "message": self.message,
            },
            "rows": [r.to_dict() for r in self.rows],
            "provenance": None if self.provenance is None else self.provenance.to_dict(),
        }
