"""Which charts a folder gets, as Chart objects (not yet saved).

- a result folder: spectra, losses, generation, angles, passes; the angle
  maps of the .exr files as images (escape_angles, rear_angles); a top view
  per absorption_map*.exr. Charts whose input file is absent (e.g. a planar
  result has no generation.csv) are skipped with the reason.
- several result folders together: spectra, losses, generation, passes with
  a line (or bar) per folder.
- a sweep folder: sweep_lines, sweep_heatmap (when two parameters are numbers).
- a fit folder (`lumtrap fit`): fit (measured vs fitted with residuals).
"""
from __future__ import annotations

import os

from . import chart_absorption_map, chart_angles, chart_generation, chart_losses, chart_passes, chart_spectra
from . import chart_fit, chart_sweep
from .exr_channels import read_exr_channels
from .figure_style import caption_text
from .solar_flux import photon_flux


class Context:
    """What the charts need besides the folders."""

    def __init__(self, version: str, materials_dir: str, lumtrap_exe: str):
        self.version = version
        self.materials_dir = materials_dir
        self.lumtrap_exe = lumtrap_exe

    def flux(self, r):
        return photon_flux(r.spectrum, self.materials_dir, r.path)


def result_charts(r, ctx: Context):
    """(charts, skipped reasons) of one result folder."""
    cap = caption_text([r.scene_name], [r.spectrum], ctx.version, r.summary.get("method", ""))
    charts = [chart_spectra.spectra_single(r, ctx.flux(r), cap), chart_losses.losses_chart([r], cap)]
    skipped = []
    for make, what, need in ((chart_generation.generation_chart, "generation", "generation.csv"),
                             (chart_angles.angles_chart, "angles", "escape_angles.csv, rear_angles.csv"),
                             (chart_passes.passes_chart, "passes", "passes.csv")):
        c = make([r], cap) if what != "angles" else make(r, cap)
        if c is None:
            skipped.append(f"{what} (no {need} in {r.path}{': planar result' if r.exact else ''})")
        else:
            charts.append(c)
    for name in ("escape_angles", "rear_angles"):
        c = chart_angles.angle_map_image(r, name, cap)
        if c is not None:
            charts.append(c)
    for exr in r.absorption_maps:
        channels = read_exr_channels(ctx.lumtrap_exe, exr)
        charts.append(chart_absorption_map.absorption_map_chart(exr, channels, cap))
    return charts, skipped


def comparison_charts(results, ctx: Context):
    cap = caption_text([r.scene_name for r in results], [r.spectrum for r in results], ctx.version,
                       f"{len(results)} result folders")
    flux = ctx.flux(results[0])
    charts = [chart_spectra.spectra_comparison(results, flux, cap), chart_losses.losses_chart(results, cap)]
    for c in (chart_generation.generation_chart(results, cap), chart_passes.passes_chart(results, cap)):
        if c is not None:
            charts.append(c)
    return charts


def sweep_charts(s, ctx: Context):
    cap = caption_text([s.scene_name], [s.spectrum], ctx.version,
                       f"sweep {s.sweep.get('sweep_hash', '')}, {len(s.ids)} variants")
    charts, skipped = [], []
    for make, what in ((chart_sweep.sweep_lines, "sweep_lines"), (chart_sweep.sweep_heatmap, "sweep_heatmap")):
        c = make(s, cap)
        if c is None:
            skipped.append(f"{what} ({'fewer than two numeric swept parameters' if 'heat' in what else 'nothing swept'})")
        else:
            charts.append(c)
    return charts, skipped


def fit_charts(f, ctx: Context):
    cap = caption_text([f.scene_name], ["measured reflectance"], ctx.version, str(f.fit.get("method", "")))
    return [chart_fit.fit_chart(f, cap)]


def plots_dir(folder: str) -> str:
    return os.path.join(folder, "plots")
