#!/usr/bin/env python3
"""Prints J_G and the losses of several lumtrap result folders side by side
(mA/cm2 with standard errors), as a Markdown table.

usage: compare_results.py RESULT_FOLDER [RESULT_FOLDER ...]
"""
import json
import sys
from pathlib import Path


def main(folders):
    runs = []
    for f in folders:
        p = Path(f) / "summary.json"
        if not p.is_file():
            sys.exit(f"compare_results: {p} not found (is {f} a lumtrap result folder?)")
        runs.append((Path(f).name, json.loads(p.read_text())))
    rows = ["J_G"]
    for _, j in runs:
        for k in j["losses"]:
            if k not in rows:
                rows.append(k)
    head = "| mA/cm² | " + " | ".join(name for name, _ in runs) + " |"
    print(head)
    print("|" + "---|" * (len(runs) + 1))

    def cell(j, k):
        if k == "J_G":
            v, s = j["J_G_mA_cm2"], j["J_G_sigma_mA_cm2"]
        elif k in j["losses"]:
            v, s = j["losses"][k]["mA_cm2"], j["losses"][k]["sigma_mA_cm2"]
        else:
            return "—"
        return f"{v:.3f} ± {s:.3f}" if s > 0 else f"{v:.3f}"

    for k in rows:
        print(f"| {k} | " + " | ".join(cell(j, k) for _, j in runs) + " |")
    print("| J_max | " + " | ".join(f"{j['J_max_mA_cm2']:.3f}" for _, j in runs) + " |")


if __name__ == "__main__":
    if len(sys.argv) < 2:
        sys.exit(__doc__)
    main(sys.argv[1:])
