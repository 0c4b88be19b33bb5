"""A student's soft wall: fix the dilaton slope c from the rho meson, then read off what the
calibrated model predicts for the string tension, the glueball and the deconfinement temperature.

Run:  python examples/calibrate_soft_wall.py
"""

from pathlib import Path

import holostring as hs

TARGETS = Path(__file__).resolve().parent / "targets" / "soft-wall-rho.toml"


def main() -> None:
    bg = hs.load_background("soft-wall")
    result = hs.calibrate(bg, hs.load_targets(TARGETS))
    c, dc = result.values["c"], result.uncertainties["c"]
    print(f"c = {c:.6f} ± {dc:.6f} {result.units['c']}   ({result.message})")
    for p in result.predictions:
        target = "" if p.target is None else f"   target {p.target:g} ± {p.target_uncertainty:g}"
        print(f"  {p.observable:28} {p.value:12.6f} ± {p.uncertainty:.2g} {p.unit}{target}")
    tc = next(p for p in result.predictions if p.observable == "critical_temperature")
    print(
        f"Hawking-Page T_c = {1000 * tc.value:.1f} MeV "
        "(Herzog hep-th/0608151 quotes 191 MeV for this calibration)"
    )
    print("Model numbers from a classical bulk at large N: not QCD predictions.")


if __name__ == "__main__":
    main()
