"""Passes per absorbed photon: the share of J_G by the number of bulk
crossings before absorption (passes.csv; the last row counts that many or
more), one line per result folder, with the mean number of passes (a lower
bound when the last row is not empty). Units: passes (count), share of J_G
in %. SVG ids: series-<k>-line.
"""
from __future__ import annotations

import numpy as np

from . import palette
from .figure_style import Chart, add_caption, new_figure


def passes_chart(results, caption: str) -> Chart | None:
    have = [r for r in results if r.passes is not None and len(r.passes) and r.passes[:, 1].sum() > 0]
    if not have:
        return None
    fig = new_figure(8.2, 4.0)
    ax = fig.add_axes([0.1, 0.15, 0.86, 0.74])
    for k, r in enumerate(have):
        n, cur = r.passes[:, 0], r.passes[:, 1]
        share = 100 * cur / cur.sum()
        mean = float((n * cur).sum() / cur.sum())
        more = "≥ " if cur[-1] > 0 else ""
        st = palette.line_style(k)
        ax.plot(n, np.where(share > 0, share, np.nan), color=st["color"], linestyle=st["linestyle"],
                marker=st["marker"], markersize=3, linewidth=1.2, drawstyle="steps-mid",
                label=f"{r.label}: mean {more}{mean:.1f} passes", gid=f"series-{k}-line")
    ax.set_yscale("log")
    ax.set_xlabel("bulk passes before absorption [count]")
    ax.set_ylabel("share of J_G [%]")
    ax.set_title("Passes per absorbed photon (last point: that many or more)", loc="left")
    ax.legend(loc="upper right", frameon=False)
    add_caption(fig, caption)
    return Chart("passes", fig, "Share of J_G by number of bulk passes before absorption")
