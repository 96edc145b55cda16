#!/usr/bin/env bash
# `lumtrap run` finishes on every scene shipped in scenes/ (with few photons,
# so the whole set takes seconds), and `lumtrap planar` on the planar ones;
# every run keeps unresolved photons below 1e-4 of those launched; a fit scene
# ([fit] table) is fitted to its measured curve and its fitted scene run.
set -euo pipefail
. "${LUMTRAP_SOURCE_DIR:?set LUMTRAP_SOURCE_DIR}/tests/common/shell_fixture.sh" test_scenes
n=0
for scene in "$SRC"/scenes/*.toml; do
  name=$(basename "$scene" .toml)
  if grep -q '^\[sweep' "$scene"; then
    # every variant validated (check, not plan: plan asks SLURM, which another test may be restarting)
    "$BIN" check "$scene" > /dev/null 2> "$W/$name.err" || fail "check $name (a sweep): $(cat "$W/$name.err")"
    echo "ok: check $name (every variant of the sweep)"
    continue
  fi
  if grep -q '^\[fit' "$scene"; then
    # a fit scene: fitted to its (synthetic) curve with few photons; the fitted scene runs
    "$BIN" fit "$scene" --measured "${scene%.toml}_measured.csv" --photons 200 -o "$W/$name" > /dev/null \
      2> "$W/$name.err" || fail "fit $name: $(cat "$W/$name.err")"
    for f in parameters.csv correlation.csv curve.csv fit.json fitted_scene.toml; do
      [ -s "$W/$name/$f" ] || fail "fit $name wrote no $f"
    done
    "$BIN" run "$W/$name/fitted_scene.toml" --photons 100 -o "$W/$name-run" > /dev/null 2> "$W/$name.err" \
      || fail "run of the fitted scene of $name: $(cat "$W/$name.err")"
    echo "ok: fit $name, and run of its fitted scene"
    continue
  fi
  "$BIN" run "$scene" --photons 300 -o "$W/$name" > /dev/null 2> "$W/$name.err" \
    || { echo "FAIL: lumtrap run $name: $(cat "$W/$name.err")" >&2; exit 1; }
  python3 - "$W/$name/spectral.csv" <<'PY' || { echo "FAIL: $name has unresolved photons" >&2; exit 1; }
import csv, sys
rows = list(csv.DictReader(l for l in open(sys.argv[1]) if not l.startswith("#")))
bad = [r["wavelength [nm]"] for r in rows if float(r["unresolved"]) >= 1e-4]
sys.exit(1 if bad else 0)
PY
  echo "ok: run $name"
  n=$((n + 1))
done
"$BIN" planar "$SRC/scenes/k7_polished_reference.toml" -o "$W/planar" > /dev/null
echo "PASS: test_scenes ($n scenes traced)"
