#!/usr/bin/env python3
"""Makes the SYNTHETIC "measured" curve of the K7 fit example
(scenes/k7_fit_recipe_b_measured.csv): lumtrap traces the recipe B cell with
known film thicknesses (front SiNx 82 nm, rear SiO2 140 nm) at 20 000 photons
per wavelength with seed 2 (other streams than the fit's seed 1), takes the
total reflectance (reflected_front + escaped_front) and adds Gaussian noise
of 0.003 (absolute) from Python's random.Random(18). The uncertainty column
is that noise and the trace's own standard error together.

    python3 scripts/k7_fit_synthetic_data.py build/lumtrap
"""
import csv
import math
import pathlib
import random
import subprocess
import sys
import tempfile

TRUTH = {"front SiNx": "82 nm", "rear SiO2": "140 nm"}
NOISE = 0.003


def main():
    binary = sys.argv[1] if len(sys.argv) > 1 else "build/lumtrap"
    root = pathlib.Path(__file__).resolve().parent.parent
    scene = (root / "scenes" / "k7_fit_recipe_b.toml").read_text()
    scene = scene.split("[fit]")[0]
    scene = scene.replace('thickness = "75 nm"', f'thickness = "{TRUTH["front SiNx"]}"')
    scene = scene.replace('thickness = "100 nm"', f'thickness = "{TRUTH["rear SiO2"]}"')
    scene = scene.replace('from = "300 nm", to = "1200 nm", step = "10 nm"',
                          'from = "400 nm", to = "1150 nm", step = "25 nm"')
    scene = scene.replace("photons = 2000", "photons = 20000").replace("seed = 1", "seed = 2")
    with tempfile.TemporaryDirectory() as tmp:
        path = pathlib.Path(tmp) / "k7_truth.toml"
        path.write_text(scene)
        subprocess.run([binary, "run", str(path), "-o", str(pathlib.Path(tmp) / "out")], check=True,
                       stdout=subprocess.DEVNULL)
        lines = [l for l in open(pathlib.Path(tmp) / "out" / "spectral.csv") if not l.startswith("#")]
        rows = list(csv.DictReader(lines))
    rng = random.Random(18)
    out = root / "scenes" / "k7_fit_recipe_b_measured.csv"
    with open(out, "w") as f:
        f.write("# SYNTHETIC data, not a measurement: line K7 (fictional) recipe B test wafer,\n")
        f.write(f"# made by scripts/k7_fit_synthetic_data.py: lumtrap total reflectance at front SiNx "
                f"{TRUTH['front SiNx']}, rear SiO2 {TRUTH['rear SiO2']}\n")
        f.write(f"# (20000 photons, seed 2) plus Gaussian noise sd {NOISE} (random.Random(18)).\n")
        f.write("wavelength_nm,reflectance,uncertainty\n")
        for r in rows:
            wl = float(r["wavelength [nm]"])
            p = float(r["reflected_front"]) + float(r["escaped_front"])
            sigma_mc = math.sqrt(p * (1 - p) / 20000)
            value = min(max(p + rng.gauss(0.0, NOISE), 0.0), 1.0)
            f.write(f"{wl:g},{value:.5f},{math.hypot(NOISE, sigma_mc):.5f}\n")
    print(out)


if __name__ == "__main__":
    main()
