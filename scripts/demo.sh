#!/usr/bin/env bash
# Installs what is missing, builds lumtrap, and runs the demo: line K7 (a
# fictional cell line) compares three etch recipes and its polished
# reference, plus the ideal Lambertian limit. Results go to results/demo/.
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/build.sh
BIN=build/lumtrap
OUT=results/demo
mkdir -p "$OUT"
echo "== exact planar solver: polished reference"
"$BIN" planar scenes/k7_polished_reference.toml -o "$OUT/k7_polished_reference-planar" --overwrite
for s in k7_polished_reference k7_recipe_a_coarse k7_recipe_b_standard k7_recipe_c_fine \
         lambertian_limit_180um; do
  echo "== ray tracing: scenes/$s.toml"
  "$BIN" run "scenes/$s.toml" -o "$OUT/$s" --overwrite
done
echo
echo "== line K7, AM1.5G, 300-1200 nm (model estimates, mA/cm2 ± standard error)"
python3 scripts/compare_results.py "$OUT/k7_polished_reference-planar" "$OUT/k7_polished_reference" \
  "$OUT/k7_recipe_a_coarse" "$OUT/k7_recipe_b_standard" "$OUT/k7_recipe_c_fine" "$OUT/lambertian_limit_180um"
echo
echo "Result folders are in $OUT/ (spectral.csv, summary.json, generation.csv, escape_angles.csv, ...)."
