"""How a quartic deformation of the hard wall moves its string tension and glueballs.

The 'lantern wall' (metrics/lantern-wall.toml, an invented demo) has w = (1 + q z^4/z0^4)/z^2
with a wall at z0. For q <= 1, F = w decreases all the way to the wall and the long string lies on
it: sigma = g (1 + q)/z0^2. For q > 1, F has an interior minimum at z_m = z0 q^(-1/4), the string
no longer reaches the wall and sigma = 2 g sqrt(q)/z0^2 (the Kinar-Schreiber-Sonnenschein
criterion). The scan checks the numbers against both closed forms and follows the lightest scalar
glueballs as q grows.

Run:  python examples/quartic_hard_wall.py
"""

from pathlib import Path

import holostring as hs
from holostring.scan import run_scan

FILE = Path(__file__).resolve().parents[1] / "metrics" / "lantern-wall.toml"


def main() -> None:
    bg = hs.load_background(FILE)
    scan = run_scan(bg, ["q=0:2:9"], ["string_tension", "mass:scalar-glueball:0", "mass:scalar-glueball:1"])
    print(f"{'q':>6}{'sigma':>14}{'closed form':>14}{'m0':>12}{'m1':>12}")
    for row in scan.rows:
        q = row.point["q"]
        sigma = row.values["string_tension"][0]
        m0 = row.values["mass:scalar-glueball:0"][0]
        m1 = row.values["mass:scalar-glueball:1"][0]
        z0 = bg.params["z0"]
        exact = bg.g * ((1 + q) if q <= 1 else 2 * q**0.5) / z0**2
        assert abs(sigma - exact) < 1e-12 * exact, (q, sigma, exact)
        print(f"{q:6.2f}{sigma:14.10f}{exact:14.10f}{m0:12.6f}{m1:12.6f}")
    print(
        f"{scan.n_ok} points, {scan.n_failed} failed; q = 0 is the plain hard wall "
        "(m0 z0 = first zero of J_2 = 5.135622)"
    )


if __name__ == "__main__":
    main()
