"""Reading a fit result folder (`lumtrap fit`).

Input: fit.json (what was compared, method, χ², the parameters with best
values and standard errors) and curve.csv (`wavelength_nm, measured,
uncertainty, fitted, fitted_sigma, residual, normalized_residual`, then
`measured_transmittance, fitted_transmittance` when the measured file had a
transmittance column; one row per measured point used). Output: a FitFolder; reflectances as fractions
(0..1), wavelengths in nm, residual = measured − fitted.
"""
from __future__ import annotations

import csv
import json
import os
from dataclasses import dataclass

import numpy as np

from .errors import PlotError

CURVE_COLUMNS = ["wavelength_nm", "measured", "uncertainty", "fitted", "fitted_sigma", "residual",
                 "normalized_residual"]
TRANSMITTANCE_COLUMNS = ["measured_transmittance", "fitted_transmittance"]


@dataclass
class FitFolder:
    path: str
    fit: dict                    # fit.json as read
    wavelength_nm: np.ndarray
    measured: np.ndarray
    uncertainty: np.ndarray      # the σ each point was weighted with
    fitted: np.ndarray
    fitted_sigma: np.ndarray     # Monte Carlo error of the model curve (0 for the exact solver)
    residual: np.ndarray         # measured − fitted
    normalized_residual: np.ndarray
    measured_transmittance: np.ndarray | None = None
    fitted_transmittance: np.ndarray | None = None

    @property
    def scene_name(self) -> str:
        return os.path.basename(str(self.fit.get("scene", ""))) or os.path.basename(os.path.normpath(self.path))

    @property
    def quantity(self) -> str:
        return {"total_reflectance": "total reflectance (front reflection + escape)",
                "first_surface_reflectance": "first-surface reflectance"}.get(
                    str(self.fit.get("compare", "")), str(self.fit.get("compare", "reflectance")))


def is_fit_folder(path: str) -> bool:
    return os.path.isfile(os.path.join(path, "fit.json")) and os.path.isfile(os.path.join(path, "curve.csv"))


def read_fit_folder(path: str) -> FitFolder:
    fj, cc = os.path.join(path, "fit.json"), os.path.join(path, "curve.csv")
    try:
        with open(fj, encoding="utf-8") as f:
            fit = json.load(f)
    except (OSError, ValueError) as e:
        raise PlotError(f"{fj}: cannot read it ({e}): give a folder written by lumtrap fit") from None
    with open(cc, newline="", encoding="utf-8") as f:
        rows = list(csv.reader(f))
    if not rows or rows[0] not in (CURVE_COLUMNS, CURVE_COLUMNS + TRANSMITTANCE_COLUMNS):
        raise PlotError(f"{cc}: header {rows[0] if rows else '(empty file)'} is not "
                        f"{','.join(CURVE_COLUMNS)}[,{','.join(TRANSMITTANCE_COLUMNS)}]: "
                        "write it again with this lumtrap version")
    if len(rows) < 2:
        raise PlotError(f"{cc}: no points: the fit used none; check the wavelength range of [fit]")
    try:
        cols = np.array([[float(v) for v in r] for r in rows[1:]]).T
    except ValueError as e:
        raise PlotError(f"{cc}: a value is not a number ({e})") from None
    if cols.ndim != 2 or cols.shape[0] != len(rows[0]):
        raise PlotError(f"{cc}: every row needs {len(rows[0])} values, as the header")
    return FitFolder(path, fit, *cols)
