"""Shared matplotlib setup for every holostring figure (Agg backend, one consistent style).

Only modules under holostring/report import matplotlib, and only inside functions.
"""

from __future__ import annotations

from typing import Any

COLORS = ["#1f4e79", "#c0392b", "#2e8b57", "#8e44ad", "#d68910", "#5d6d7e"]


def pyplot() -> Any:
    """matplotlib.pyplot on the Agg backend with the house style applied."""
    import matplotlib

    matplotlib.use("Agg", force=True)
    import matplotlib.pyplot as plt

    plt.rcParams.update(
        {
            "figure.figsize": (6.4, 4.4),
            "figure.dpi": 110,
            "axes.grid": True,
            "grid.alpha": 0.3,
            "axes.spines.top": False,
            "axes.spines.right": False,
            "axes.prop_cycle": matplotlib.cycler(color=COLORS),
            "font.size": 10.5,
            "legend.frameon": False,
            "mathtext.fontset": "cm",
        }
    )
    return plt


def caption(fig: Any, text: str) -> None:
    """A small grey footer line (background, parameters, scheme) below everything else drawn.

    Call it last, after labels and legends: it measures the drawn figure and sits under it.
    """
    renderer = fig.canvas.get_renderer()
    box = fig.get_tightbbox(renderer)
    height = fig.get_figheight()
    y = box.y0 / height - 0.012 * 6.4 / height
    x = max(box.x0 / fig.get_figwidth(), 0.0)
    fig.text(x, y, text, fontsize=7.5, color="#666666", ha="left", va="top")
