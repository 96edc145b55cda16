"""Chart of a fit: measured and fitted curves, and the residuals below.

Top panel: the measured points with ±1σ error bars (their uncertainty, as
weighted in the fit) and the fitted model curve with a ±1σ band of its
Monte Carlo error (no band for the exact planar solver). Bottom panel: the
normalized residuals (measured − fitted)/σ, with the ±1 and ±3 levels, so
that structure the model misses stands out. When transmittance was fitted
too, its measured points and fitted curve are drawn in the top panel
(series-3-measured-transmittance, series-4-fitted-transmittance). Title line: the best values
± standard errors and χ² per degree of freedom. Units: reflectance as a
fraction; wavelength in nm. SVG ids: series-0-measured, series-1-fitted,
series-2-residual.
"""
from __future__ import annotations

import numpy as np

from . import palette
from .figure_style import Chart, add_caption, new_figure
from .fit_folder import FitFolder


def _parameter_line(f: FitFolder) -> str:
    parts = []
    for p in f.fit.get("parameters", []):
        unit = f" {p['unit']}" if p.get("unit") else ""
        parts.append(f"{p.get('key', '?')} = {p.get('best', float('nan')):.4g} ± "
                     f"{p.get('standard_error', float('nan')):.2g}{unit}")
    return "; ".join(parts)


def fit_chart(f: FitFolder, caption: str) -> Chart:
    height = 5.6
    fig = new_figure(8.2, height)
    gs = fig.add_gridspec(2, 1, height_ratios=[3, 1.3], left=0.10, right=0.97, top=1 - 0.55 / height,
                          bottom=0.75 / height, hspace=0.12)
    ax, axr = fig.add_subplot(gs[0]), fig.add_subplot(gs[1])
    wl = f.wavelength_nm
    measured_colour, fitted_colour = palette.LINE_COLOURS[1], palette.LINE_COLOURS[0]
    ax.errorbar(wl, f.measured, yerr=f.uncertainty, fmt="o", markersize=3.2, color=measured_colour,
                elinewidth=0.8, capsize=1.5, label="measured ±1σ", gid="series-0-measured")
    ax.plot(wl, f.fitted, color=fitted_colour, linewidth=1.4, label="fitted model", gid="series-1-fitted")
    if np.any(f.fitted_sigma > 0):
        ax.fill_between(wl, f.fitted - f.fitted_sigma, f.fitted + f.fitted_sigma, color=fitted_colour,
                        alpha=0.18, linewidth=0, label="model ±1σ (Monte Carlo)")
    ylabel = f"{'total' if 'total' in f.quantity else 'first-surface'} reflectance"
    if f.measured_transmittance is not None:
        t_colour = palette.LINE_COLOURS[2]
        ax.plot(wl, f.measured_transmittance, "s", markersize=3.0, color=t_colour, label="measured transmittance",
                gid="series-3-measured-transmittance")
        ax.plot(wl, f.fitted_transmittance, color=t_colour, linewidth=1.2, linestyle="--",
                label="fitted transmittance", gid="series-4-fitted-transmittance")
        ylabel += ", transmittance"
    ax.set_ylabel(ylabel)
    ax.set_ylim(bottom=0)
    ax.tick_params(labelbottom=False)
    ax.legend(loc="upper right", frameon=False)
    chi2 = f.fit.get("chi2_per_degree_of_freedom")
    chi2_text = f"χ²/dof = {chi2:.2f}" if isinstance(chi2, (int, float)) else ""
    ax.set_title(f"{f.quantity}: {len(wl)} points" + (f", {chi2_text}" if chi2_text else ""), loc="left")
    fig.text(0.01, 0.995, "Fit: " + _parameter_line(f), va="top", fontsize=8.5)

    axr.axhline(0, color="#555555", linewidth=0.8)
    for level, style in ((1, ":"), (3, "--")):
        for sign in (1, -1):
            axr.axhline(sign * level, color="#999999", linewidth=0.7, linestyle=style)
    axr.plot(wl, f.normalized_residual, "o", markersize=3.0, color=measured_colour, gid="series-2-residual")
    axr.set_ylabel("residual / σ")
    axr.set_xlabel("wavelength [nm]")
    axr.set_xlim(ax.get_xlim())
    add_caption(fig, caption)
    return Chart("fit", fig, "Measured and fitted reflectance, with normalized residuals")
