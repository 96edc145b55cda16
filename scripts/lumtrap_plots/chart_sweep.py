"""Charts of a merged sweep: J_G and each loss against a swept parameter, and
a heat map of J_G over two numeric parameters; the best variant (highest
J_G) is marked on both.

Lines (`sweep_lines`): x = the swept parameter with the most values
(numbers preferred; text values such as a material are placed as
categories); a line per combination of the other swept parameters when
there are at most MAX_SERIES, else a line per value of the other parameter
with fewest values, the rest held at the best variant's values (said in the
chart). Panels: J_G, then every loss that is not zero in some variant.
Error bars ±1σ. Heat map (`sweep_heatmap`, when two or more parameters are
numbers): the two numeric parameters with the most values; a panel per
combination of the others (at most MAX_PANELS, else held at the best
variant's values). Units: mA/cm²; parameter units from the merged.csv
header. SVG ids: series-<k>-<panel> for line k, series-<p>-heat for panel p.
"""
from __future__ import annotations

import itertools

import numpy as np

from . import palette
from .figure_style import Chart, add_caption, new_figure
from .sweep_folder import SweepFolder, describe

MAX_SERIES = 10
MAX_PANELS = 4


def _swept(s: SweepFolder):
    return [p for p in s.parameters if len(p.distinct) > 1]


def _pick_x(params):
    numeric = [p for p in params if p.numeric is not None]
    pool = numeric or params
    return max(pool, key=lambda p: len(p.distinct))  # first of the largest


def _key(params, k):
    return tuple(p.values[k] for p in params)


def _series_plan(s: SweepFolder, x, others):
    """(series params, held params): which parameters make lines, which are held at the best variant."""
    combos = {_key(others, k) for k in range(len(s.ids))}
    if len(combos) <= MAX_SERIES:
        return others, []
    by_size = sorted(others, key=lambda p: len(p.distinct))
    series = [p for p in by_size if len(p.distinct) <= MAX_SERIES][:1]
    return series, [p for p in others if p not in series]


def _positions(p):
    if p.numeric is not None:
        return p.numeric, None
    cats = p.distinct
    return np.array([cats.index(v) for v in p.values], dtype=float), cats


def sweep_lines(s: SweepFolder, caption: str) -> Chart | None:
    params = _swept(s)
    if not params:
        return None
    x = _pick_x(params)
    others = [p for p in params if p is not x]
    series, held = _series_plan(s, x, others)
    best = s.best
    keep = [k for k in range(len(s.ids)) if all(p.values[k] == p.values[best] for p in held)]
    xs, cats = _positions(x)
    quantities = [("J_G", s.J_G, s.J_G_sigma)] + [(n, v, e) for n, (v, e) in s.losses.items() if np.any(v != 0)]
    cols = 3
    rows = 1 + (len(quantities) - 1 + cols - 1) // cols
    height = 1.3 + 2.5 * rows
    fig = new_figure(9.0, height)
    gs = fig.add_gridspec(rows, cols, left=0.08, right=0.98, top=1 - 1.0 / height, bottom=0.75 / height,
                          hspace=0.62, wspace=0.32)
    axes = [fig.add_subplot(gs[0, :])]
    for i in range(1, len(quantities)):
        axes.append(fig.add_subplot(gs[1 + (i - 1) // cols, (i - 1) % cols]))
    keys = list(dict.fromkeys(_key(series, k) for k in keep))
    for qi, (name, val, err) in enumerate(quantities):
        ax = axes[qi]
        for si, key in enumerate(keys):
            idx = sorted((k for k in keep if _key(series, k) == key), key=lambda k: xs[k])
            st = palette.line_style(si)
            label = ", ".join(f"{p.column} = {v}" for p, v in zip(series, key)) or "all variants"
            ax.errorbar(xs[idx], val[idx], yerr=err[idx], color=st["color"], marker=st["marker"],
                        linestyle=st["linestyle"], markersize=4 if qi == 0 else 3, capsize=2.5, linewidth=1.2,
                        elinewidth=0.9, label=label, gid=f"series-{si}-{name}")
        ax.set_xlabel(x.column if x.numeric is not None and "[" in x.column else x.column)
        ax.set_ylabel(f"{name} [mA/cm²]" if qi == 0 else "[mA/cm²]")
        ax.set_title(name if qi else "J_G (error bars: ±1σ)", loc="left", fontsize=9 if qi == 0 else 7.5)
        if cats is not None:
            ax.set_xticks(range(len(cats)), cats, fontsize=7)
    ax0 = axes[0]
    ax0.plot([xs[best]], [s.J_G[best]], marker="*", markersize=15, color="#000000", markerfacecolor="none",
             linestyle="none", gid="best-variant", label=f"best: {s.ids[best]}")
    ax0.legend(loc="best", frameon=False, fontsize=7)
    head = (f"Sweep: J_G and losses against {x.column}\nbest {describe(s, best)}: "
            f"J_G = {s.J_G[best]:.3f} ± {s.J_G_sigma[best]:.3f} mA/cm²")
    fig.text(0.01, 1 - 0.12 / height, head, va="top", fontsize=8.5)
    if held:
        fig.text(0.01, 1 - 0.55 / height, "held at the best variant's values: " +
                 ", ".join(f"{p.column} = {p.values[best]}" for p in held), va="top", fontsize=7.5, color="#555555")
    add_caption(fig, caption)
    return Chart("sweep_lines", fig, f"J_G and each loss against {x.column}, a line per series, ±1σ")


def sweep_heatmap(s: SweepFolder, caption: str) -> Chart | None:
    params = _swept(s)
    numeric = sorted([p for p in params if p.numeric is not None], key=lambda p: -len(p.distinct))
    if len(numeric) < 2:
        return None
    px, py = numeric[0], numeric[1]
    others = [p for p in params if p is not px and p is not py]
    best = s.best
    combos = list(dict.fromkeys(_key(others, k) for k in range(len(s.ids))))
    if len(combos) > MAX_PANELS:
        combos = [_key(others, best)]
        held = others
    else:
        held = []
    xv = np.unique(px.numeric)
    yv = np.unique(py.numeric)
    grids = []
    for key in combos:
        g = np.full((len(yv), len(xv)), np.nan)
        for k in range(len(s.ids)):
            if _key(others, k) == key:
                g[np.searchsorted(yv, py.numeric[k]), np.searchsorted(xv, px.numeric[k])] = s.J_G[k]
        grids.append(g)
    vmin = np.nanmin([np.nanmin(g) for g in grids])
    vmax = np.nanmax([np.nanmax(g) for g in grids])
    n = len(combos)
    fig = new_figure(min(4.2 * n + 1.4, 14), 4.6)
    axes = fig.subplots(1, n, squeeze=False)[0]
    fig.subplots_adjust(left=0.09, right=0.86, top=0.78, bottom=0.2, wspace=0.3)
    cmap = palette.sequential_cmap()

    def edges(v):
        if len(v) == 1:
            return np.array([v[0] - 0.5, v[0] + 0.5])
        mid = 0.5 * (v[1:] + v[:-1])
        return np.concatenate([[v[0] - (mid[0] - v[0])], mid, [v[-1] + (v[-1] - mid[-1])]])

    for p, (ax, key, g) in enumerate(zip(axes, combos, grids)):
        mesh = ax.pcolormesh(edges(xv), edges(yv), np.ma.masked_invalid(g), cmap=cmap, vmin=vmin, vmax=vmax,
                             shading="flat", gid=f"series-{p}-heat")
        if g.size <= 144:
            for i, j in itertools.product(range(len(yv)), range(len(xv))):
                if not np.isnan(g[i, j]):
                    light = (g[i, j] - vmin) / max(vmax - vmin, 1e-12) > 0.6
                    ax.text(xv[j], yv[i], f"{g[i, j]:.2f}", ha="center", va="center", fontsize=6.5,
                            color="#111111" if light else "#ffffff")
        if _key(others, best) == key:
            ax.plot([px.numeric[best]], [py.numeric[best]], marker="s", markersize=22, markerfacecolor="none",
                    markeredgecolor="#e1691e", markeredgewidth=2.2, linestyle="none", gid="best-variant")
        ax.set_xlabel(px.column)
        ax.set_ylabel(py.column)
        ax.grid(False)
        ax.set_title(", ".join(f"{o.column} = {v}" for o, v in zip(others, key)) or "J_G", loc="left", fontsize=8)
    cax = fig.add_axes([0.89, 0.2, 0.02, 0.6])
    fig.colorbar(mesh, cax=cax).set_label("J_G [mA/cm²]")
    fig.text(0.01, 0.97, f"Sweep: J_G over {px.column} and {py.column}\nbest (box) {describe(s, best)}",
             va="top", fontsize=8.5)
    if held:
        fig.text(0.01, 0.87, "held at the best variant's values: " +
                 ", ".join(f"{o.column} = {o.values[best]}" for o in held), va="top", fontsize=7.5, color="#555555")
    add_caption(fig, caption)
    return Chart("sweep_heatmap", fig, f"J_G over {px.column} and {py.column}, best variant boxed")
