"""Two throats side by side: a group has invented the 'ember' and 'lantern' backgrounds (demo files
in metrics/, no physical claim) and wants to know which one confines more strongly, where the
Coulomb-to-linear crossover sits, and how their lightest glueballs compare.

Run:  python examples/compare_throats.py [OUTPUT_FOLDER]
"""

import sys
from pathlib import Path

import holostring as hs

ROOT = Path(__file__).resolve().parents[1]
THROATS = {
    "ember": ROOT / "metrics" / "ember-throat.toml",
    "lantern": ROOT / "metrics" / "lantern-wall.toml",
}


def main(out: Path) -> None:
    rows = []
    results = {}
    for label, path in THROATS.items():
        bg = hs.load_background(path)
        diag = hs.diagnose(bg)
        pot = hs.compute_potential(bg, points=120)
        glue = hs.solve_spectrum(bg, "scalar-glueball", states=4)
        results[label] = pot
        rows.append((label, diag, pot, glue))

    print(
        f"{'':10}{'sigma (symbolic)':>18}{'sigma (V at large L)':>22}{'r0':>12}{'m(0++)':>12}{'m(0++*)/m(0++)':>16}"
    )
    for label, diag, pot, glue in rows:
        r0 = f"{pot.r0:.6f}" if pot.r0 is not None else "none"
        ratio = glue.masses[1] / glue.masses[0]
        print(
            f"{label:10}{diag.string_tension:18.10f}{pot.string_tension:22.10f}{r0:>12}"
            f"{glue.masses[0]:12.6f}{ratio:16.6f}"
        )
        assert pot.converged and glue.converged, f"{label}: {pot.message} / {glue.message}"
    print("(model units; classical string and fields at large N; model numbers, not QCD predictions)")

    out.mkdir(parents=True, exist_ok=True)
    import matplotlib

    matplotlib.use("Agg")
    import matplotlib.pyplot as plt

    fig, ax = plt.subplots(figsize=(6.4, 4.4))
    for label, pot in results.items():
        ax.plot(pot.L, pot.V, label=f"{label} throat")
    ax.set_xlabel("quark separation L [model units]")
    ax.set_ylabel("V(L) [model units] (uv-pole scheme)")
    ax.set_ylim(-6, None)
    ax.legend()
    ax.set_title("Two invented throats: static potential")
    fig.savefig(out / "compare_throats.png", dpi=120, bbox_inches="tight")
    print(f"wrote {out / 'compare_throats.png'}")


if __name__ == "__main__":
    main(Path(sys.argv[1]) if len(sys.argv) > 1 else Path("example-output"))
