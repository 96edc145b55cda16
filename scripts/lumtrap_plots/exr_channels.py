"""Channels of an OpenEXR image, read through `lumtrap exr-channels FILE`.

Debian 12 ships no Python binding of OpenEXR, so the lumtrap binary (which
links Debian's libopenexr) prints the image as CSV and this module parses it:
first line `# width W height H`, then `y,x,<channel>...` with one row per
pixel (y = row from the top of the file's data window, x = column), values as
32-bit floats in their shortest exact text. Output: {channel: array (H, W)}.
"""
from __future__ import annotations

import subprocess

import numpy as np

from .errors import PlotError


def read_exr_channels(lumtrap_exe: str, path: str) -> dict[str, np.ndarray]:
    if not lumtrap_exe:
        raise PlotError(f"{path}: reading OpenEXR needs the lumtrap binary: run this through lumtrap plot")
    try:
        p = subprocess.run([lumtrap_exe, "exr-channels", path], capture_output=True, text=True, check=False)
    except OSError as e:
        raise PlotError(f"{path}: cannot run {lumtrap_exe} to read it ({e})") from None
    if p.returncode != 0:
        msg = (p.stderr.strip().splitlines() or ["unknown error"])[-1]
        raise PlotError(f"{path}: {msg}")
    lines = p.stdout.splitlines()
    try:
        head = lines[0].split()
        width, height = int(head[2]), int(head[4])
        names = lines[1].split(",")[2:]
        data = np.array([[float(c) for c in ln.split(",")] for ln in lines[2:]], dtype=float)
        out = {}
        for k, name in enumerate(names):
            img = np.zeros((height, width))
            img[data[:, 0].astype(int), data[:, 1].astype(int)] = data[:, 2 + k]
            out[name] = img
        return out
    except (IndexError, ValueError) as e:
        raise PlotError(f"{path}: unexpected output of lumtrap exr-channels ({e})") from None
