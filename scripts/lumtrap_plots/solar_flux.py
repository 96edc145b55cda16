"""Photon flux of the run's spectrum, for the faint background of the spectra.

Input: the spectrum name of summary.json ("AM1.5G", "AM1.5D", "AM0": columns
am15g, am15d, am0 of materials/astm_g173_03.csv, ASTM G173-03 (2003); or the
path of a user's `wavelength_nm,irradiance_W_m2_nm` CSV). Output: wavelengths
in nm and photon flux Φ = E λ / (h c) in photons m⁻² s⁻¹ nm⁻¹ (h, c: SI 2019
exact values), or None when the spectrum file cannot be found — the chart is
then drawn without its background.
"""
from __future__ import annotations

import csv
import os

import numpy as np

H_PLANCK = 6.62607015e-34   # J s (SI 2019, exact)
C_LIGHT = 299792458.0       # m/s (exact)
BUILTIN = {"AM1.5G": "am15g", "AM1.5D": "am15d", "AM0": "am0"}


def _read(path: str, column: str | None) -> tuple[np.ndarray, np.ndarray]:
    with open(path, newline="", encoding="utf-8") as f:
        rows = list(csv.reader(ln for ln in f if not ln.startswith("#") and ln.strip()))
    header, body = rows[0], rows[1:]
    ci = header.index(column) if column else 1
    wl = np.array([float(r[0]) for r in body])
    e = np.array([float(r[ci]) for r in body])
    return wl, e


def photon_flux(spectrum: str, materials_dir: str, scene_dir: str = "") -> tuple[np.ndarray, np.ndarray] | None:
    try:
        if spectrum in BUILTIN:
            wl, e = _read(os.path.join(materials_dir, "astm_g173_03.csv"), BUILTIN[spectrum])
        else:
            path = spectrum if os.path.isabs(spectrum) else os.path.join(scene_dir, spectrum)
            wl, e = _read(path, None)
    except (OSError, ValueError, IndexError):
        return None
    return wl, e * wl * 1e-9 / (H_PLANCK * C_LIGHT)
