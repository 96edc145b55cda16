"""Top view of where light is absorbed in the texture tile, one wavelength band.

Input: an absorption_map*.exr of a result folder (multi-channel OpenEXR, a
channel per end-state bin named like the bins of spectral.csv, rows = y and
columns = x of the texture tile, value = absorbed fraction of the band's
incident photons per pixel; one file per band, e.g.
absorption_map_300-500nm.exr), read through exr_channels. Output: a panel
per channel that is not zero everywhere (all channels when every one is),
the tile seen from above (y up) in units of the tile width, each with its
colour bar. SVG ids: series-<k>-<channel>.
"""
from __future__ import annotations

import os

import numpy as np

from . import palette
from .figure_style import Chart, add_caption, new_figure
from .result_folder import absorption_band


def absorption_map_chart(exr_path: str, channels: dict[str, np.ndarray], caption: str) -> Chart:
    shown = [(n, v) for n, v in channels.items() if np.any(v != 0)] or list(channels.items())
    cols = min(3, len(shown))
    rows = (len(shown) + cols - 1) // cols
    fig = new_figure(3.3 * cols + 0.4, 2.7 * rows + 0.8)
    axes = fig.subplots(rows, cols, squeeze=False)
    fig.subplots_adjust(left=0.08, right=0.9, top=1 - 0.55 / (2.7 * rows + 0.8),
                        bottom=0.55 / (2.7 * rows + 0.8), hspace=0.55, wspace=0.55)
    cmap = palette.sequential_cmap()
    for k, (name, img) in enumerate(shown):
        ax = axes[k // cols][k % cols]
        im = ax.imshow(img, cmap=cmap, origin="lower", extent=[0, 1, 0, 1], interpolation="nearest",
                       gid=f"series-{k}-{name}")
        ax.grid(False)
        ax.set_title(f"{name}\nsum {img.sum():.4g}", fontsize=7)
        ax.set_xlabel("x [tile widths]", fontsize=7)
        ax.set_ylabel("y [tile widths]", fontsize=7)
        cb = fig.colorbar(im, ax=ax, fraction=0.046, pad=0.04)
        cb.set_label("absorbed fraction per pixel", fontsize=6.5)
        cb.ax.tick_params(labelsize=6)
    for j in range(len(shown), rows * cols):
        axes[j // cols][j % cols].set_visible(False)
    zero = [n for n, v in channels.items() if not np.any(v != 0)]
    if zero and len(zero) < len(channels):
        fig.text(0.99, 0.995, "zero everywhere (not drawn): " + ", ".join(zero), ha="right", va="top", fontsize=7,
                 color="#555555")
    band = absorption_band(exr_path)
    fig.text(0.01, 0.995, f"Where light is absorbed in the texture tile (top view), {band}", va="top", fontsize=9.5)
    add_caption(fig, caption)
    stem = os.path.splitext(os.path.basename(exr_path))[0]
    return Chart(stem, fig, f"Top view of absorption in the texture tile, {band}")
