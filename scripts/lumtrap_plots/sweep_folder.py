"""Reading a merged sweep folder (`lumtrap sweep plan` + `sweep merge`).

Input: sweep.json (format "lumtrap sweep N"), merged.csv (`id`, parameter
columns — `key [unit]` with plain numbers, or raw values —, `J_G [mA/cm2]`,
`J_G_sigma [mA/cm2]`, `J_G_minus_reference [mA/cm2]` and its `_sigma` (the
error of the difference from paired photon groups; empty when unknown),
`<loss> [mA/cm2]`, `<loss>_sigma [mA/cm2]`, ...,
`J_max [mA/cm2]`, `photons`), merged.json (missing variants, run facts) and
one variant's summary.json for the scene name, spectrum and loss groups.
Output: a SweepFolder; currents in mA/cm².
"""
from __future__ import annotations

import csv
import json
import os
from dataclasses import dataclass, field

import numpy as np

from .errors import PlotError


@dataclass
class Parameter:
    column: str                 # header of merged.csv, e.g. "front.films[0].thickness [nm]"
    values: list[str]           # per variant, as written
    numeric: np.ndarray | None  # per variant, when every value is a number

    @property
    def distinct(self) -> list[str]:
        if self.numeric is not None:
            return [self.values[i] for i in np.unique(self.numeric, return_index=True)[1]]
        return list(dict.fromkeys(self.values))


@dataclass
class SweepFolder:
    path: str
    sweep: dict
    merged: dict
    ids: list[str]
    parameters: list[Parameter]
    J_G: np.ndarray
    J_G_sigma: np.ndarray
    losses: dict[str, tuple[np.ndarray, np.ndarray]]  # name -> (value, sigma) per variant
    J_max: np.ndarray
    photons: np.ndarray
    groups: dict[str, str] = field(default_factory=dict)
    meanings: dict[str, str] = field(default_factory=dict)
    scene_name: str = ""
    spectrum: str = ""
    warnings: dict[str, list[str]] = field(default_factory=dict)  # warning -> variant ids
    best_scene_toml: str = ""

    @property
    def best(self) -> int:
        return int(np.argmax(self.J_G))


def is_sweep_folder(path: str) -> bool:
    return os.path.isfile(os.path.join(path, "sweep.json"))


def _num(s: str) -> float | None:
    try:
        return float(s)
    except ValueError:
        return None


def read_sweep_folder(path: str) -> SweepFolder:
    sj = os.path.join(path, "sweep.json")
    mc = os.path.join(path, "merged.csv")
    mj = os.path.join(path, "merged.json")
    try:
        with open(sj, encoding="utf-8") as f:
            sweep = json.load(f)
    except (OSError, ValueError) as e:
        raise PlotError(f"{sj}: cannot read it ({e}): give a folder written by lumtrap sweep plan") from None
    if not str(sweep.get("format", "")).startswith("lumtrap sweep"):
        raise PlotError(f"{sj}: format {sweep.get('format')!r} is not a lumtrap sweep folder")
    if not os.path.isfile(mc):
        raise PlotError(f"{path}: no merged.csv: run `lumtrap sweep merge {path}` first")
    merged = {}
    if os.path.isfile(mj):
        with open(mj, encoding="utf-8") as f:
            merged = json.load(f)
    with open(mc, newline="", encoding="utf-8") as f:
        rows = list(csv.reader(f))
    if len(rows) < 2:
        raise PlotError(f"{mc}: no variant has finished yet: see `lumtrap sweep status {path}`")
    header, body = rows[0], rows[1:]
    try:
        jg = header.index("J_G [mA/cm2]")
    except ValueError:
        raise PlotError(f"{mc}: no column 'J_G [mA/cm2]': merge it again with this lumtrap version") from None
    col = {h: i for i, h in enumerate(header)}

    def column(name: str) -> np.ndarray:
        return np.array([float(r[col[name]]) for r in body])

    params = []
    for i in range(1, jg):
        values = [r[i] for r in body]
        nums = [_num(v) for v in values]
        params.append(Parameter(header[i], values, np.array(nums) if all(n is not None for n in nums) else None))
    losses = {}
    for h in header[jg + 2:]:
        if h.endswith(" [mA/cm2]") and not h.endswith("_sigma [mA/cm2]") and not h.startswith("J_"):
            name = h[: -len(" [mA/cm2]")]
            losses[name] = (column(h), column(f"{name}_sigma [mA/cm2]") if f"{name}_sigma [mA/cm2]" in col
                            else np.zeros(len(body)))
    s = SweepFolder(path=path, sweep=sweep, merged=merged, ids=[r[0] for r in body], parameters=params,
                    J_G=column("J_G [mA/cm2]"), J_G_sigma=column("J_G_sigma [mA/cm2]"), losses=losses,
                    J_max=column("J_max [mA/cm2]") if "J_max [mA/cm2]" in col else np.zeros(len(body)),
                    photons=column("photons") if "photons" in col else np.zeros(len(body)))
    # scene name, spectrum, groups and warnings from the variants' summary.json files
    for k, vid in enumerate(s.ids):
        vdir = os.path.join(path, "variants", vid, "result")
        try:
            with open(os.path.join(vdir, "summary.json"), encoding="utf-8") as f:
                summ = json.load(f)
        except (OSError, ValueError):
            continue
        if not s.scene_name:
            s.scene_name = str(summ.get("scene_name", ""))
            s.spectrum = str(summ.get("spectrum", ""))
            for name, info in summ.get("losses", {}).items():
                s.groups[name] = str(info.get("group", "other"))
                s.meanings[name] = str(info.get("meaning", ""))
        for w in summ.get("warnings", []):
            s.warnings.setdefault(w, []).append(vid)
        if k == s.best:
            try:
                with open(os.path.join(vdir, "scene.toml"), encoding="utf-8") as f:
                    s.best_scene_toml = f.read()
            except OSError:
                pass
    if not s.scene_name:
        s.scene_name = os.path.basename(os.path.normpath(path))
    return s


def describe(s: SweepFolder, k: int) -> str:
    """'v0007 (rear.medium = ag_johnson1972, front.films[0].thickness [nm] = 70)'."""
    return f"{s.ids[k]} (" + ", ".join(f"{p.column} = {p.values[k]}" for p in s.parameters) + ")"
