"""Angle maps of light escaping through the front and arriving at the rear.

Input: escape_angles.csv and rear_angles.csv (photon current in mA/cm² per
polar × azimuth bin; polar angle from the wafer normal, azimuth from the
texture's x axis, degrees) — the same numbers as the .exr maps.

- `angles_chart`: polar plots (azimuth around, polar angle outward), colour
  = current per solid angle, mA cm⁻² sr⁻¹ (bin solid angle
  (cos θ_lo − cos θ_hi)·Δφ), with the polar-angle distribution (current per
  degree, summed over azimuth) beside. SVG ids: series-<k>-map, -profile.
- `angle_map_image`: the map exactly as stored in the .exr (rows polar angle
  top to bottom, columns azimuth), with a colour bar in mA/cm² per bin; PNG.
"""
from __future__ import annotations

import numpy as np
from matplotlib.colors import LogNorm

from . import palette
from .figure_style import Chart, add_caption, new_figure

TITLES = {"escape_angles": "escaping through the front", "rear_angles": "arriving at the rear"}


def _per_sr(m) -> np.ndarray:
    omega = (np.cos(np.radians(m.polar_lo)) - np.cos(np.radians(m.polar_hi)))[:, None] * \
        np.radians(m.azimuth_hi - m.azimuth_lo)[None, :]
    return m.current / omega


def _log_norm(v: np.ndarray) -> LogNorm:
    """Log colour scale over three decades below the largest value."""
    top = float(v.max()) if np.any(v > 0) else 1.0
    return LogNorm(vmin=top * 1e-3, vmax=top, clip=True)


def angles_chart(r, caption: str) -> Chart | None:
    maps = [(name, getattr(r, name)) for name in ("escape_angles", "rear_angles") if getattr(r, name) is not None]
    if not maps:
        return None
    fig = new_figure(8.2, 3.6 * len(maps) + 0.4)
    cmap = palette.sequential_cmap()
    h = 1.0 / len(maps)
    for k, (name, m) in enumerate(maps):
        base = 1 - (k + 1) * h
        ax = fig.add_axes([0.04, base + 0.12 * h, 0.36, 0.76 * h], projection="polar")
        theta = np.radians(np.append(m.azimuth_lo, m.azimuth_hi[-1]))
        rad = np.append(m.polar_lo, m.polar_hi[-1])
        val = _per_sr(m)
        mesh = ax.pcolormesh(theta, rad, np.ma.masked_less_equal(val, 0), cmap=cmap, norm=_log_norm(val),
                             shading="flat", rasterized=True, gid=f"series-{k}-map")
        ax.set_ylim(0, 90)
        ax.set_yticks([30, 60, 90], ["30°", "60°", "90°"], fontsize=6.5)
        ax.set_xlabel("azimuth [deg] (around), polar angle [deg] (outward)", fontsize=7.5)
        ax.grid(color="#ffffff", alpha=0.35, linewidth=0.5)
        ax.set_title(f"Light {TITLES[name]}", loc="left", fontsize=9)
        cb = fig.colorbar(mesh, ax=ax, pad=0.12, fraction=0.05)
        cb.set_label("current per solid angle [mA cm⁻² sr⁻¹] (log; white: 0)", fontsize=7)
        ax2 = fig.add_axes([0.62, base + 0.18 * h, 0.34, 0.66 * h])
        centres = 0.5 * (m.polar_lo + m.polar_hi)
        per_deg = m.current.sum(axis=1) / (m.polar_hi - m.polar_lo)
        ax2.plot(centres, per_deg, color=palette.line_style(k)["color"], linewidth=1.3, gid=f"series-{k}-profile")
        ax2.set_xlim(0, 90)
        ax2.set_xlabel("polar angle from the wafer normal [deg]")
        ax2.set_ylabel("current per degree [mA cm⁻² deg⁻¹]")
        ax2.set_title(f"total {m.current.sum():.3f} mA/cm²", loc="left", fontsize=8)
    add_caption(fig, caption)
    return Chart("angles", fig, "Escape and rear angle distributions (polar plots)")


def angle_map_image(r, name: str, caption: str) -> Chart | None:
    m = getattr(r, name)
    if m is None:
        return None
    fig = new_figure(6.4, 5.6)
    ax = fig.add_axes([0.11, 0.14, 0.68, 0.76])
    im = ax.imshow(np.ma.masked_less_equal(m.current, 0), cmap=palette.sequential_cmap(), norm=_log_norm(m.current),
                   aspect="auto", interpolation="nearest",
                   extent=[m.azimuth_lo[0], m.azimuth_hi[-1], m.polar_hi[-1], m.polar_lo[0]])
    ax.grid(False)
    ax.set_xlabel("azimuth [deg]")
    ax.set_ylabel("polar angle [deg]")
    ax.set_title(f"{name}.exr: light {TITLES[name]}", loc="left")
    cax = fig.add_axes([0.83, 0.14, 0.035, 0.76])
    cb = fig.colorbar(im, cax=cax)
    cb.set_label("current per bin [mA/cm²] (log scale; white: 0)")
    add_caption(fig, caption)
    return Chart(name, fig, f"{name}.exr as an image with a colour bar", svg=False)
