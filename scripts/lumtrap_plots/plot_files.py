"""`lumtrap plot`: writes the charts of result, sweep and fit folders as PNG + SVG.

Input: folder paths (result folders, sweep folders, fit folders, in any mix), the
comparison folder (--out) and the Context facts. Output: the list of files
written (each written atomically) and notes on charts skipped. Every folder
is read and checked before anything is written.
"""
from __future__ import annotations

import os

from . import charts as charts_mod
from .errors import PlotError
from .figure_style import close, save_chart
from .fit_folder import is_fit_folder, read_fit_folder
from .parallel import run_all
from .result_folder import is_result_folder, read_result_folder, short_labels
from .sweep_folder import is_sweep_folder, read_sweep_folder


def read_folders(folders: list[str]):
    """(result folders, sweep folders, fit folders), read and checked."""
    for f in folders:
        if not os.path.isdir(f):
            raise PlotError(f"{f}: no such folder: give result folders (lumtrap run/planar) or sweep folders")
        if not is_result_folder(f) and not is_sweep_folder(f) and not is_fit_folder(f):
            raise PlotError(f"{f}: not a result folder (no summary.json), a sweep folder (no sweep.json) nor a "
                            "fit folder (no fit.json): give a folder written by lumtrap run, lumtrap planar, "
                            "lumtrap sweep plan or lumtrap fit")
    result_paths = [f for f in folders if is_result_folder(f)]
    labels = short_labels(result_paths)
    results = [read_result_folder(f, lab) for f, lab in zip(result_paths, labels)]
    sweeps = [read_sweep_folder(f) for f in folders if not is_result_folder(f) and is_sweep_folder(f)]
    fits = [read_fit_folder(f) for f in folders
            if not is_result_folder(f) and not is_sweep_folder(f) and is_fit_folder(f)]
    return results, sweeps, fits


def _write(chart_list, folder: str) -> list[str]:
    os.makedirs(folder, exist_ok=True)
    written = []
    for c in chart_list:
        written += save_chart(c, folder)
        close(c)
    return written


def _draw(kind: str, item, ctx, target: str = ""):
    """Draws and writes the charts of one task: (files written, notes)."""
    if kind == "result":
        cs, skipped = charts_mod.result_charts(item, ctx)
        return _write(cs, charts_mod.plots_dir(item.path)), [f"skipped {s}" for s in skipped]
    if kind == "sweep":
        cs, skipped = charts_mod.sweep_charts(item, ctx)
        return _write(cs, charts_mod.plots_dir(item.path)), [f"{item.path}: skipped {x}" for x in skipped]
    if kind == "fit":
        return _write(charts_mod.fit_charts(item, ctx), charts_mod.plots_dir(item.path)), []
    return _write(charts_mod.comparison_charts(item, ctx), target), []


def plot_folders(folders, out, version, materials_dir, lumtrap_exe):
    ctx = charts_mod.Context(version, materials_dir, lumtrap_exe)
    results, sweeps, fits = read_folders(folders)
    if out and len(results) < 2:
        raise PlotError("--out names the folder of the comparison charts: give two or more result folders, "
                        "or leave it out (charts of one folder go into FOLDER/plots/)")
    tasks = [("result", r, ctx) for r in results] + [("sweep", s, ctx) for s in sweeps] + [("fit", f, ctx) for f in fits]
    if len(results) >= 2:
        target = out or os.path.join(os.path.dirname(os.path.abspath(results[0].path)), "comparison-plots")
        tasks.append(("comparison", results, ctx, target))
    written, notes = [], []
    for w, n in run_all(_draw, tasks):
        written += w
        notes += n
    return written, notes
