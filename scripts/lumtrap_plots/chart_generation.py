"""The photogeneration profile G(z) on log axes, one line per result folder.

Input: generation.csv (depth bins in µm below the front surface, G and its σ
in cm⁻³ s⁻¹ under the run's spectrum). Drawn as steps over the bins with a
±1σ band; bins with G = 0 have no place on a log axis and are skipped.
SVG ids: series-<k>-line, series-<k>-band.
"""
from __future__ import annotations

import numpy as np

from . import palette
from .figure_style import Chart, add_caption, new_figure

FIRST_EDGE_UM = 1e-4  # the first bin starts at 0; drawn from here on the log axis


def generation_chart(results, caption: str) -> Chart | None:
    have = [r for r in results if r.generation is not None and len(r.generation)]
    if not have:
        return None
    fig = new_figure(8.2, 4.2)
    ax = fig.add_axes([0.1, 0.15, 0.86, 0.74])
    for k, r in enumerate(have):
        g = r.generation
        top = np.where(g[:, 0] > 0, g[:, 0], FIRST_EDGE_UM)
        edges = np.append(top, g[-1, 1])
        G = np.where(g[:, 2] > 0, g[:, 2], np.nan)
        st = palette.line_style(k)
        ax.stairs(G, edges, color=st["color"], linestyle=st["linestyle"], linewidth=1.4,
                  label=r.label if len(have) > 1 else "G(z)", gid=f"series-{k}-line")
        lo = np.where(g[:, 2] - g[:, 3] > 0, g[:, 2] - g[:, 3], np.nan)
        hi = np.where(g[:, 2] > 0, g[:, 2] + g[:, 3], np.nan)
        ax.fill_between(edges[:-1], lo, hi, step="post", color=st["color"], alpha=0.2, linewidth=0,
                        gid=f"series-{k}-band")
    ax.set_xscale("log")
    ax.set_yscale("log")
    ax.set_xlabel("depth below the front surface [µm]")
    ax.set_ylabel("generation rate G [cm⁻³ s⁻¹]")
    ax.set_title("Photogeneration profile G(z) (band: ±1σ)", loc="left")
    ax.legend(loc="lower left", frameon=False)
    add_caption(fig, caption)
    return Chart("generation", fig, "Photogeneration rate against depth, log axes")
