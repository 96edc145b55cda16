"""Reading a lumtrap result folder (the files of `lumtrap run`/`planar`).

Input: a folder with summary.json (format "lumtrap result N") and
spectral.csv; optional generation.csv, escape_angles.csv, rear_angles.csv,
passes.csv, scene.toml and absorption_map*.exr. Output: a ResultFolder of
numpy arrays. Units as in the files: wavelengths nm, fractions of incident
photons, currents mA/cm², depths µm, G in cm⁻³ s⁻¹, angles degrees.

The end-state bins are read from the header of spectral.csv (never a fixed
list); each bin's group comes from summary.json losses[<bin>].group, with
absorbed_silicon in "generation" and a bin summary.json does not know in
"other". Problems are PlotError with the file and what to do.
"""
from __future__ import annotations

import csv
import glob
import json
import os
import re
from dataclasses import dataclass, field

import numpy as np

from .errors import PlotError

SILICON_BIN = "absorbed_silicon"


@dataclass
class Bin:
    name: str
    group: str
    meaning: str
    mA_cm2: float
    sigma_mA_cm2: float


@dataclass
class AngleMap:
    polar_lo: np.ndarray   # deg, one per polar row
    polar_hi: np.ndarray
    azimuth_lo: np.ndarray  # deg, one per azimuth column
    azimuth_hi: np.ndarray
    current: np.ndarray    # mA/cm² per bin, shape (polar, azimuth)


@dataclass
class ResultFolder:
    path: str
    label: str                       # short name for legends
    summary: dict
    wavelength_nm: np.ndarray
    photons: np.ndarray
    bins: list[Bin]                  # absorbed_silicon first, then the losses, in file order
    fraction: dict[str, np.ndarray]  # bin -> fraction of incident photons per wavelength
    sigma: dict[str, np.ndarray]
    generation: np.ndarray | None = None   # columns: top [um], bottom [um], G, G_sigma
    escape_angles: AngleMap | None = None
    rear_angles: AngleMap | None = None
    passes: np.ndarray | None = None       # columns: passes, current [mA/cm2]
    scene_toml: str = ""
    absorption_maps: list[str] = field(default_factory=list)  # absorption_map*.exr paths

    @property
    def scene_name(self) -> str:
        return self.summary.get("scene_name") or os.path.basename(os.path.normpath(self.path))

    @property
    def spectrum(self) -> str:
        return str(self.summary.get("spectrum", ""))

    @property
    def exact(self) -> bool:
        return int(self.summary.get("photons", 0) or 0) == 0

    def bin(self, name: str) -> Bin | None:
        return next((b for b in self.bins if b.name == name), None)


def _csv_rows(path: str) -> tuple[list[str], list[list[str]]]:
    with open(path, newline="", encoding="utf-8") as f:
        lines = [ln for ln in f if not ln.startswith("#") and ln.strip()]
    rows = list(csv.reader(lines))
    if not rows:
        raise PlotError(f"{path}: no header line: the file is empty or not written by lumtrap")
    return rows[0], rows[1:]


def _numeric_table(path: str, expect: list[str]) -> np.ndarray:
    header, rows = _csv_rows(path)
    if header[:len(expect)] != expect:
        raise PlotError(f"{path}: header {','.join(header)!r} is not {','.join(expect)!r}: "
                        "not a file of this lumtrap version")
    try:
        return np.array([[float(c) for c in r[:len(expect)]] for r in rows], dtype=float).reshape(-1, len(expect))
    except ValueError as e:
        raise PlotError(f"{path}: a value is not a number ({e})") from None


def _angle_map(path: str) -> AngleMap:
    t = _numeric_table(path, ["polar_lo [deg]", "polar_hi [deg]", "azimuth_lo [deg]", "azimuth_hi [deg]",
                              "current [mA/cm2]"])
    polar = np.unique(t[:, 0])
    azim = np.unique(t[:, 2])
    cur = np.zeros((len(polar), len(azim)))
    pi = np.searchsorted(polar, t[:, 0])
    ai = np.searchsorted(azim, t[:, 2])
    cur[pi, ai] = t[:, 4]
    polar_hi = np.array([t[t[:, 0] == p, 1][0] for p in polar])
    azim_hi = np.array([t[t[:, 2] == a, 3][0] for a in azim])
    return AngleMap(polar, polar_hi, azim, azim_hi, cur)


def is_result_folder(path: str) -> bool:
    return os.path.isfile(os.path.join(path, "summary.json"))


def read_result_folder(path: str, label: str = "") -> ResultFolder:
    summary_path = os.path.join(path, "summary.json")
    spectral_path = os.path.join(path, "spectral.csv")
    if not os.path.isdir(path):
        raise PlotError(f"{path}: no such folder: give a result folder written by lumtrap run or lumtrap planar")
    if not os.path.isfile(summary_path):
        raise PlotError(f"{path}: not a result folder (no summary.json): give a folder written by "
                        "lumtrap run or lumtrap planar")
    try:
        with open(summary_path, encoding="utf-8") as f:
            summary = json.load(f)
    except (OSError, ValueError) as e:
        raise PlotError(f"{summary_path}: cannot read it as JSON ({e}): run lumtrap again to rewrite it") from None
    fmt = str(summary.get("format", ""))
    if not fmt.startswith("lumtrap result"):
        raise PlotError(f"{summary_path}: format {fmt!r} is not a lumtrap result: give a folder written by "
                        "lumtrap run or lumtrap planar")
    for key in ("J_G_mA_cm2", "J_max_mA_cm2", "losses"):
        if key not in summary:
            raise PlotError(f"{summary_path}: key {key!r} is missing: the folder was written by another "
                            "lumtrap version; run it again with this one")
    if not os.path.isfile(spectral_path):
        raise PlotError(f"{path}: spectral.csv is missing: the result folder is incomplete; run lumtrap again")

    header, rows = _csv_rows(spectral_path)
    if len(header) < 4 or header[0] != "wavelength [nm]" or header[1] != "photons":
        raise PlotError(f"{spectral_path}: header starts {','.join(header[:2])!r}, expected "
                        "'wavelength [nm],photons': not a file of this lumtrap version")
    try:
        data = np.array([[float(c) for c in r] for r in rows], dtype=float).reshape(-1, len(header))
    except ValueError as e:
        raise PlotError(f"{spectral_path}: a value is not a number or a row is short ({e})") from None
    col = {name: i for i, name in enumerate(header)}
    names = [h for h in header[2:] if not h.endswith("_sigma")]
    losses = summary["losses"]
    bins, fraction, sigma = [], {}, {}
    for name in names:
        fraction[name] = data[:, col[name]]
        sigma[name] = data[:, col[name + "_sigma"]] if name + "_sigma" in col else np.zeros(len(data))
        if name == SILICON_BIN:
            bins.append(Bin(name, "generation", "absorbed in the silicon bulk: J_G",
                            float(summary["J_G_mA_cm2"]), float(summary.get("J_G_sigma_mA_cm2", 0.0))))
        else:
            info = losses.get(name, {})
            bins.append(Bin(name, str(info.get("group", "other")), str(info.get("meaning", "")),
                            float(info.get("mA_cm2", 0.0)), float(info.get("sigma_mA_cm2", 0.0))))
    bins.sort(key=lambda b: b.name != SILICON_BIN)  # stable: silicon first, the rest in file order

    r = ResultFolder(path=path, label=label or os.path.basename(os.path.normpath(path)), summary=summary,
                     wavelength_nm=data[:, 0], photons=data[:, 1], bins=bins, fraction=fraction, sigma=sigma)
    g = os.path.join(path, "generation.csv")
    if os.path.isfile(g):
        r.generation = _numeric_table(g, ["depth_top [um]", "depth_bottom [um]", "G [cm-3 s-1]",
                                          "G_sigma [cm-3 s-1]"])
    for attr, fname in (("escape_angles", "escape_angles.csv"), ("rear_angles", "rear_angles.csv")):
        p = os.path.join(path, fname)
        if os.path.isfile(p):
            setattr(r, attr, _angle_map(p))
    p = os.path.join(path, "passes.csv")
    if os.path.isfile(p):
        r.passes = _numeric_table(p, ["passes", "current [mA/cm2]"])
    p = os.path.join(path, "scene.toml")
    if os.path.isfile(p):
        with open(p, encoding="utf-8") as f:
            r.scene_toml = f.read()
    r.absorption_maps = sorted(glob.glob(os.path.join(glob.escape(path), "absorption_map*.exr")))
    return r


_BAND = re.compile(r"absorption_map(?:_(\d+(?:\.\d+)?)-(\d+(?:\.\d+)?)nm)?\.exr$")


def absorption_band(exr_path: str) -> str:
    """'300–500 nm' for absorption_map_300-500nm.exr, 'all wavelengths' for absorption_map.exr."""
    m = _BAND.search(os.path.basename(exr_path))
    if not m:
        return os.path.basename(exr_path)
    return f"{m.group(1)}–{m.group(2)} nm" if m.group(1) else "all wavelengths"


def short_labels(paths: list[str]) -> list[str]:
    """Folder names for legends, made unique with their parent when needed."""
    base = [os.path.basename(os.path.normpath(p)) for p in paths]
    if len(set(base)) == len(base):
        return base
    return [os.path.join(os.path.basename(os.path.dirname(os.path.normpath(p))), b) for p, b in zip(paths, base)]
