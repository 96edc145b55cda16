"""Where the photons end, against wavelength.

One folder: the fractions of every end-state bin stacked to 1 (silicon at the
bottom, then parasitic, transmission, escape, reflection, numerical, unknown
groups), bins that are zero at every wavelength left out and named; the
run's photon flux as a faint background on a right axis. Several folders: a
panel per group (fractions summed over the group's bins), a line per folder.
Units: wavelength nm, fraction of incident photons (1 = all), photon flux
10¹⁸ m⁻² s⁻¹ nm⁻¹. SVG ids: series-<k>-... per drawn series k.
"""
from __future__ import annotations

import numpy as np

from . import palette
from .figure_style import Chart, add_caption, new_figure

FLUX_UNIT = 1e18


def _flux_background(ax, flux, spectrum: str, wl: np.ndarray):
    """The photon flux as a faint veil on a right axis (drawn over the data so
    that it shows through the stack); returns that axis, or None."""
    if flux is None or len(wl) < 2:
        return None
    fw, fphi = flux
    keep = (fw >= wl.min()) & (fw <= wl.max())
    if not keep.any():
        return None
    ax2 = ax.twinx()
    ax2.fill_between(fw[keep], fphi[keep] / FLUX_UNIT, color="#000000", alpha=0.07, linewidth=0,
                     gid="background-flux", label=f"{spectrum} photon flux (right axis)")
    ax2.plot(fw[keep], fphi[keep] / FLUX_UNIT, color="#ffffff", alpha=0.55, linewidth=0.6, gid="background-flux-edge")
    ax2.set_ylim(0, 1.05 * fphi[keep].max() / FLUX_UNIT)
    ax2.set_ylabel(f"{spectrum} photon flux [10¹⁸ m⁻² s⁻¹ nm⁻¹]", color="#777777")
    ax2.tick_params(axis="y", colors="#777777")
    ax2.grid(False)
    ax2.spines["right"].set_visible(True)
    ax2.spines["right"].set_color("#aaaaaa")
    return ax2


def stacked_bins(r) -> tuple[list, list[str]]:
    """The bins drawn (in stack order) and the names of the all-zero ones."""
    order = sorted(r.bins, key=lambda b: palette.group_rank(b.group))
    drawn = [b for b in order if np.any(r.fraction[b.name] != 0)]
    zero = [b.name for b in order if not np.any(r.fraction[b.name] != 0)]
    return drawn, zero


def spectra_single(r, flux, caption: str) -> Chart:
    fig = new_figure(8.2, 4.4)
    ax = fig.add_axes([0.08, 0.14, 0.52, 0.78])
    drawn, zero = stacked_bins(r)
    colours = palette.bin_colours([(b.name, b.group) for b in sorted(r.bins, key=lambda b: palette.group_rank(b.group))])
    wl = r.wavelength_nm
    bottom = np.zeros(len(wl))
    for k, b in enumerate(drawn):
        top = bottom + r.fraction[b.name]
        if len(wl) > 1:
            ax.fill_between(wl, bottom, top, color=colours[b.name], linewidth=0.4, edgecolor="white",
                            label=b.name, gid=f"series-{k}-{b.name}")
        else:
            ax.bar(wl, top - bottom, bottom=bottom, width=8, color=colours[b.name], label=b.name,
                   gid=f"series-{k}-{b.name}")
        bottom = top
    ax.set_xlim(wl.min() - (5 if len(wl) == 1 else 0), wl.max() + (5 if len(wl) == 1 else 0))
    ax.set_ylim(0, 1.0)
    ax.set_xlabel("wavelength [nm]")
    ax.set_ylabel("fraction of incident photons")
    ax.set_title(f"Where the photons end — {r.scene_name}", loc="left")
    ax2 = _flux_background(ax, flux, r.spectrum, wl)
    handles, labels = ax.get_legend_handles_labels()
    if ax2 is not None:
        h2, l2 = ax2.get_legend_handles_labels()
        handles, labels = h2 + handles[::-1], l2 + labels[::-1]
    else:
        handles, labels = handles[::-1], labels[::-1]
    leg = fig.legend(handles, labels, loc="upper left", bbox_to_anchor=(0.70, 0.93),
                     title="end state (top of stack first)", title_fontsize=7.5, frameon=False)
    leg.set_gid("legend")
    if zero:
        fig.text(0.70, 0.16, "zero at every wavelength (not drawn):\n" + "\n".join(zero), fontsize=7,
                 color="#555555", va="bottom")
    add_caption(fig, caption)
    return Chart("spectra", fig, "Where the photons end, against wavelength (stacked to 1)")


def group_fractions(r) -> dict[str, np.ndarray]:
    out: dict[str, np.ndarray] = {}
    for b in r.bins:
        out[b.group] = out.get(b.group, np.zeros(len(r.wavelength_nm))) + r.fraction[b.name]
    return out


GROUP_TITLES = {"generation": "absorbed in silicon (J_G)", "reflection": "reflected by the front",
                "escape": "escaped after entering", "parasitic": "parasitic absorption (all films, metal)",
                "transmission": "transmitted through the rear", "numerical": "numerical (unresolved, lost)"}


def spectra_comparison(results, flux, caption: str) -> Chart:
    per = [group_fractions(r) for r in results]
    groups = sorted({g for p in per for g, v in p.items() if np.any(v != 0)}, key=palette.group_rank)
    n = len(groups)
    cols = 2 if n > 1 else 1
    rows = (n + cols - 1) // cols
    fig = new_figure(8.2, 1.2 + 2.3 * rows)
    axes = fig.subplots(rows, cols, squeeze=False)
    fig.subplots_adjust(left=0.08, right=0.97, top=1 - 0.55 / (1.2 + 2.3 * rows),
                        bottom=0.95 / (1.2 + 2.3 * rows), hspace=0.45, wspace=0.22)
    for i, g in enumerate(groups):
        ax = axes[i // cols][i % cols]
        for k, (r, p) in enumerate(zip(results, per)):
            st = palette.line_style(k)
            y = p.get(g, np.zeros(len(r.wavelength_nm)))
            ax.plot(r.wavelength_nm, y, color=st["color"], linestyle=st["linestyle"], marker=st["marker"],
                    markevery=max(1, len(y) // 8), markersize=3.5, linewidth=1.3, label=r.label,
                    gid=f"series-{k}-{g}")
        ax.set_title(GROUP_TITLES.get(g, g), loc="left")
        ax.set_xlabel("wavelength [nm]")
        ax.set_ylabel("fraction of incident photons")
        ax.set_ylim(bottom=0)
        if len({r.spectrum for r in results}) == 1:
            _flux_background(ax, flux, results[0].spectrum, np.concatenate([r.wavelength_nm for r in results]))
    for j in range(n, rows * cols):
        axes[j // cols][j % cols].set_visible(False)
    handles, labels = axes[0][0].get_legend_handles_labels()
    fig.legend(handles, labels, loc="upper right", ncol=min(3, len(labels)), frameon=False,
               bbox_to_anchor=(0.99, 1.0))
    fig.text(0.01, 0.995, "Where the photons end — comparison", va="top", fontsize=10)
    add_caption(fig, caption)
    return Chart("spectra", fig, "Where the photons end, by group, one line per result folder")
