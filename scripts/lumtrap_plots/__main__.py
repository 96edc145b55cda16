"""Command line of the package, run by `lumtrap plot` and `lumtrap report`:

  python3 -m lumtrap_plots plot   [--out DIR] [common] FOLDER...
  python3 -m lumtrap_plots report [--out FILE] [common] FOLDER...
  common: --version V --materials-dir DIR --lumtrap-exe PATH

plot: every result folder gets FOLDER/plots/ (PNG + SVG per chart); several
result folders also get comparison charts in --out (default
<parent of the first>/comparison-plots); a sweep folder gets FOLDER/plots/
with the sweep charts. report: FOLDER/report.html per folder (--out only
with one folder). Prints every file written, one per line, on stdout.
Exit 0, or 1 with one line `lumtrap plot: error: ...` on stderr.
"""
from __future__ import annotations

import argparse
import os
import sys


def _fail(cmd: str, msg: str) -> None:
    print(f"lumtrap {cmd}: error: {msg}", file=sys.stderr)
    sys.exit(1)


def main(argv: list[str]) -> None:
    ap = argparse.ArgumentParser(prog="lumtrap_plots")
    ap.add_argument("command", choices=["plot", "report"])
    ap.add_argument("folders", nargs="+")
    ap.add_argument("--out", default="")
    ap.add_argument("--version", default="?")
    ap.add_argument("--materials-dir", default="")
    ap.add_argument("--lumtrap-exe", default="")
    a = ap.parse_args(argv)
    cmd = a.command
    try:
        import matplotlib  # noqa: F401
        import numpy  # noqa: F401
    except ImportError as e:
        _fail(cmd, f"{sys.executable} cannot import {e.name}: install python3-matplotlib "
                   "(apt-get install python3-matplotlib, or bash scripts/install-deps.sh)")

    from .errors import PlotError
    try:
        if cmd == "plot":
            from .plot_files import plot_folders
            written, notes = plot_folders(a.folders, a.out, a.version, a.materials_dir, a.lumtrap_exe)
        else:
            from .report_html import report_folders
            written, notes = report_folders(a.folders, a.out, a.version, a.materials_dir, a.lumtrap_exe)
    except PlotError as e:
        _fail(cmd, str(e))
    except OSError as e:
        _fail(cmd, f"{e.filename or ''}: {e.strerror or e}: check the folder exists and is writable")
    except Exception as e:  # noqa: BLE001 - a bug or an unforeseen file: one line, traceback on request
        if os.environ.get("LUMTRAP_DEBUG"):
            raise
        _fail(cmd, f"unexpected {type(e).__name__} ({e}) while reading or drawing {' '.join(a.folders)}: "
                   "check that the folders were written by this lumtrap version; set LUMTRAP_DEBUG=1 for details")
    for n in notes:
        print(f"lumtrap {cmd}: note: {n}", file=sys.stderr)
    for w in written:
        print(w)


if __name__ == "__main__":
    main(sys.argv[1:])
