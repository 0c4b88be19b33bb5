"""Parameter scans: observables over grids or random samples, on local processes or a cluster.

Example::

    from holostring.background import load_background
    from holostring.scan import run_scan
    res = run_scan(load_background("soft-wall"), ["c=0.1:2:20", "g=0.5:2:20"], ["string_tension"], workers=2)
"""

from holostring.scan.grid import evaluate_chunk, evaluate_point, run_scan
from holostring.scan.plan import Axis, ScanPlan, grid_plan, parse_vary, random_plan
from holostring.scan.results import ScanResult, ScanRow
from holostring.scan.store import ScanStore

__all__ = [
    "Axis",
    "ScanPlan",
    "ScanResult",
    "ScanRow",
    "ScanStore",
    "evaluate_chunk",
    "evaluate_point",
    "grid_plan",
    "parse_vary",
    "random_plan",
    "run_scan",
]
