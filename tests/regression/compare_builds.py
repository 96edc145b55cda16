#!/usr/bin/env python3
"""Runs every scene in scenes/ and tests/regression/scenes/ with two lumtrap
binaries and checks that the per-wavelength results are the same numbers.

    python3 tests/regression/compare_builds.py OLD_LUMTRAP NEW_LUMTRAP [--photons N]

Column names may differ between the two builds (a renamed end state, a unit
written another way); the numbers may not. The CSV files of each result
folder are compared cell by cell after mapping the old column names to the
new ones (RENAMES below; a column of the old build that is not renamed must
keep its name). Exit status 0 when every file agrees, 1 otherwise.
"""
import argparse
import csv
import os
import re
import subprocess
import sys
import tempfile

HERE = os.path.dirname(os.path.abspath(__file__))
ROOT = os.path.dirname(os.path.dirname(HERE))

# Old column name -> new column name (regular expressions, first match wins;
# "{k}" marks a film number, counted from 1 before and from 0 now).
RENAMES = [
    (r"^A_si(_sigma)?$", r"absorbed_silicon\1"),
    (r"^R_front(_sigma)?$", r"reflected_front\1"),
    (r"^R_escape(_sigma)?$", r"escaped_front\1"),
    (r"^A_front_(\d+)_(.*?)(_sigma)?$", "absorbed_front_film{k}_{0}{1}"),
    (r"^A_rear_medium(_sigma)?$", r"absorbed_rear_medium\1"),
    (r"^A_rear_(\d+)_(.*?)(_sigma)?$", "absorbed_rear_film{k}_{0}{1}"),
    (r"^T(_sigma)?$", r"transmitted_rear\1"),
    (r"^wavelength_nm$", "wavelength [nm]"),
    (r"^depth_top_um$", "depth_top [um]"),
    (r"^depth_bottom_um$", "depth_bottom [um]"),
    (r"^G_cm3_s$", "G [cm-3 s-1]"),
    (r"^G_sigma_cm3_s$", "G_sigma [cm-3 s-1]"),
    (r"^polar_lo_deg$", "polar_lo [deg]"),
    (r"^polar_hi_deg$", "polar_hi [deg]"),
    (r"^azimuth_lo_deg$", "azimuth_lo [deg]"),
    (r"^azimuth_hi_deg$", "azimuth_hi [deg]"),
    (r"^current_mA_cm2$", "current [mA/cm2]"),
    (r"^(.*)-(.*)um$", r"\1-\2 [um]"),
]


def renamed(name):
    for pat, rep in RENAMES:
        m = re.match(pat, name)
        if not m:
            continue
        if "{k}" in rep:  # films were numbered from 1, now from 0 as in the scene keys
            return rep.format(m.group(2), m.group(3) or "", k=int(m.group(1)) - 1)
        return re.sub(pat, rep, name)
    return name


def table(path):
    with open(path) as f:
        rows = list(csv.reader(l for l in f if not l.startswith("#")))
    return rows[0], rows[1:]


def scenes():
    out = []
    for d in (os.path.join(ROOT, "scenes"), os.path.join(HERE, "scenes")):
        for name in sorted(os.listdir(d)):
            path = os.path.join(d, name)
            # a sweep file is run by the sweep commands, not by `run`
            # (a fit file, by `lumtrap fit`)
            if name.endswith(".toml") and not re.search(r"^\[(sweep|fit)", open(path).read(), re.M):
                out.append(path)
    return out


def run(binary, scene, out, photons):
    cmd = [binary, "run", scene, "-o", out, "--photons", str(photons), "-j", "2"]
    subprocess.run(cmd, check=True, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)


def old_build_reads(binary, scene):
    """False for a scene that uses a feature the old build does not have."""
    r = subprocess.run([binary, "check", scene], stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    return r.returncode == 0


def compare(old_dir, new_dir):
    problems = []
    for name in sorted(os.listdir(old_dir)):
        if not name.endswith(".csv"):
            continue
        new_path = os.path.join(new_dir, name)
        if not os.path.exists(new_path):
            problems.append(f"{name}: missing in the new result")
            continue
        oh, orows = table(os.path.join(old_dir, name))
        nh, nrows = table(new_path)
        mapped = [renamed(h) for h in oh]
        if sorted(mapped) != sorted(nh):
            problems.append(f"{name}: columns differ:\n  old (renamed) {mapped}\n  new           {nh}")
            continue
        if len(orows) != len(nrows):
            problems.append(f"{name}: {len(orows)} rows before, {len(nrows)} after")
            continue
        idx = [nh.index(m) for m in mapped]
        for r, (orow, nrow) in enumerate(zip(orows, nrows)):
            for c, j in enumerate(idx):
                if orow[c] != nrow[j]:
                    problems.append(f"{name}: row {r + 1}, column {mapped[c]}: {orow[c]} before, {nrow[j]} after")
                    break
    return problems


def main():
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("old")
    ap.add_argument("new")
    ap.add_argument("--photons", type=int, default=2000)
    a = ap.parse_args()
    failed = skipped = 0
    with tempfile.TemporaryDirectory(prefix="lumtrap-compare-") as tmp:
        for scene in scenes():
            if not old_build_reads(a.old, scene):
                print(f"new feature (the old build refuses the scene): {os.path.relpath(scene, ROOT)}")
                skipped += 1
                continue
            stem = os.path.splitext(os.path.basename(scene))[0]
            old_dir, new_dir = os.path.join(tmp, stem + "-old"), os.path.join(tmp, stem + "-new")
            run(a.old, scene, old_dir, a.photons)
            run(a.new, scene, new_dir, a.photons)
            problems = compare(old_dir, new_dir)
            print(f"{'same' if not problems else 'DIFFERENT'}: {os.path.relpath(scene, ROOT)}")
            for p in problems:
                print("  " + p)
            failed += bool(problems)
    print(f"{failed} of {len(scenes()) - skipped} scenes differ ({skipped} use features the old build lacks)")
    return 1 if failed else 0


if __name__ == "__main__":
    sys.exit(main())
