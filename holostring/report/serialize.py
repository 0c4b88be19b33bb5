"""Results to plain JSON-able data."""

from __future__ import annotations

import math
from typing import Any


def to_jsonable(obj: Any) -> Any:
    """Turn results into plain JSON: numpy arrays to lists, non-finite floats to null."""
    try:
        import numpy as np
    except ImportError:  # pragma: no cover
        np = None  # type: ignore[assignment]
    if isinstance(obj, dict):
        return {str(k): to_jsonable(v) for k, v in obj.items()}
    if isinstance(obj, list | tuple):
        return [to_jsonable(v) for v in obj]
    if np is not None and isinstance(obj, np.ndarray):
        return [to_jsonable(v) for v in obj.tolist()]
    if np is not None and isinstance(obj, np.generic):
        obj = obj.item()
    if isinstance(obj, float):
        return obj if math.isfinite(obj) else None
    if hasattr(obj, "to_dict"):
        return to_jsonable(obj.to_dict())
    return obj
