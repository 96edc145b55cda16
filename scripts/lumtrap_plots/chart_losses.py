"""The breakdown of J_max in mA/cm², one or several result folders.

Top panel: one bar per folder across J_max, split into J_G and every loss
bin (colours by bin as in the spectra). Bottom panel: every loss bin that is
not zero in some folder as a horizontal bar per folder with its ±1σ
statistical error (planar-solver results have σ = 0), the value written
beside it. Units: mA/cm² (currents under the run's spectrum). SVG ids:
series-<k>-bar-<j> for folder k and loss j; breakdown-<k>-<bin>.
"""
from __future__ import annotations

import numpy as np

from . import palette
from .figure_style import Chart, add_caption, new_figure
from .result_folder import SILICON_BIN


SHOWN_FROM = 5e-4  # mA/cm²: losses below this in every folder print as 0.000 and are only named


def loss_bins(results) -> list[tuple[str, str]]:
    """(name, group) of every loss bin that reaches SHOWN_FROM in some folder, in group order."""
    seen: dict[str, str] = {}
    for r in results:
        for b in r.bins:
            if b.name != SILICON_BIN and abs(b.mA_cm2) >= SHOWN_FROM and b.name not in seen:
                seen[b.name] = b.group
    return sorted(seen.items(), key=lambda kv: palette.group_rank(kv[1]))


def small_bins(results, shown) -> list[str]:
    names = {n for n, _ in shown}
    return list(dict.fromkeys(b.name for r in results for b in r.bins
                              if b.name != SILICON_BIN and b.name not in names))


def losses_chart(results, caption: str) -> Chart:
    losses = loss_bins(results)
    nf = len(results)
    nl = max(1, len(losses))
    all_bins = []
    for r in results:
        for b in r.bins:
            if (b.name, b.group) not in all_bins:
                all_bins.append((b.name, b.group))
    all_bins.sort(key=lambda kv: palette.group_rank(kv[1]))
    colours = palette.bin_colours(all_bins)
    all_bins = [(n, g) for n, g in all_bins if any(r.bin(n) and r.bin(n).mA_cm2 > 0 for r in results)]
    legend_h = 0.15 * ((len(all_bins) + 1) // 2)
    top_h = 0.2 + 0.3 * nf
    bottom_h = 0.35 + nl * (0.16 + 0.16 * nf)
    height = 0.55 + 0.35 + bottom_h + 0.3 + legend_h + 0.5 + top_h + 0.3
    fig = new_figure(8.2, height)
    left, width = 0.33, 0.50
    y0 = 0.55 + 0.35  # caption and x label of the bottom panel
    ax = fig.add_axes([left, y0 / height, width, bottom_h / height])
    y1 = y0 + bottom_h + 0.3 + legend_h + 0.5
    ax_top = fig.add_axes([left, y1 / height, width, top_h / height])

    for k, r in enumerate(results):
        x = 0.0
        for b in sorted(r.bins, key=lambda b: palette.group_rank(b.group)):
            if b.mA_cm2 <= 0:
                continue
            ax_top.barh(k, b.mA_cm2, left=x, color=colours[b.name], height=0.6, edgecolor="white",
                        linewidth=0.5, label=b.name, gid=f"breakdown-{k}-{b.name}")
            x += b.mA_cm2
        jg = r.bin(SILICON_BIN)
        ax_top.text(1.01, k, f"J_G {jg.mA_cm2:.2f} of {r.summary['J_max_mA_cm2']:.2f}",
                    transform=ax_top.get_yaxis_transform(), va="center", fontsize=7.5)
    ax_top.set_yticks(range(nf), [r.label for r in results])
    ax_top.invert_yaxis()
    ax_top.set_xlim(0, max(r.summary["J_max_mA_cm2"] for r in results))
    ax_top.set_xlabel("current [mA/cm²]")
    ax_top.grid(axis="y", visible=False)
    handles, labels = ax_top.get_legend_handles_labels()
    uniq = dict(zip(labels, handles))
    fig.legend(list(uniq.values()), list(uniq.keys()), loc="upper left", ncol=2, frameon=False, fontsize=7,
               bbox_to_anchor=(0.06, (y1 - 0.45) / height))
    fig.text(0.01, (y1 + top_h + 0.08) / height, "Breakdown of J_max: J_G and the losses", fontsize=9.5)

    bar_h = 0.8 / nf
    vmax = 0.0
    for k, r in enumerate(results):
        st = palette.line_style(k)
        colour = st["color"] if nf > 1 else None
        for j, (name, group) in enumerate(losses):
            b = r.bin(name)
            v = b.mA_cm2 if b else 0.0
            s = b.sigma_mA_cm2 if b else 0.0
            y = j + (k - (nf - 1) / 2) * bar_h
            c = colour or colours[name]
            ax.barh(y, v, height=bar_h * 0.9, color=c, xerr=s if s > 0 else None,
                    error_kw={"ecolor": "#222222", "elinewidth": 0.9, "capsize": 2.5},
                    label=r.label if j == 0 else None, gid=f"series-{k}-bar-{j}")
            vmax = max(vmax, v + s)
            txt = f"{v:.3f}" if s == 0 else f"{v:.3f} ± {s:.3f}"
            ax.text(v + s, y, "  " + txt, va="center", fontsize=6.8, color="#333333")
    ax.set_yticks(range(len(losses)), [n for n, _ in losses])
    ax.invert_yaxis()
    ax.set_xlim(0, max(vmax, 1e-9) * 1.35)
    ax.set_xlabel("loss current [mA/cm²]  (error bars: ±1σ statistical)")
    ax.set_title("Losses", loc="left")
    ax.grid(axis="y", visible=False)
    if nf > 1:
        ax.legend(loc="lower right", frameon=False)
    if not losses:
        ax.text(0.5, 0.5, "no losses", transform=ax.transAxes, ha="center")
    small = small_bins(results, losses)
    if small:
        fig.text(0.01, 0.3 / height, f"below {SHOWN_FROM} mA/cm² in every folder (not drawn): " + ", ".join(small),
                 fontsize=6.5, color="#555555", va="bottom")
    add_caption(fig, caption)
    return Chart("losses", fig, "Breakdown of J_max and the losses in mA/cm² with ±1σ errors")
