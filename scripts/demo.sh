#!/usr/bin/env bash
# Installs what is missing, builds lumtrap, and runs the demo: line K7 (a
# fictional cell line) compares three etch recipes and its polished
# reference, plus the ideal Lambertian limit, and a small sweep (front SiNx
# thickness x rear metal) and an etch study (three recipes that differ in tip
# rounding, facet angle and flat fraction) and a fit of two film thicknesses
# to a synthetic reflectance curve, and four cells as built (front grid,
# passivated rear with 2, 5, 10 % line contacts or dot contacts); then draws every result with `lumtrap plot` and
# writes a self-contained HTML report of each (`lumtrap report`). Results go
# to results/demo/.
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
ETCH=(k7_etch_1_sharp k7_etch_2_aged_bath k7_etch_3_short_etch)
for s in "${ETCH[@]}"; do
  echo "== etch study: scenes/$s.toml (texture statistics, then ray tracing)"
  "$BIN" texture "scenes/$s.toml" -o "$OUT/$s-texture" --overwrite > /dev/null
  "$BIN" run "scenes/$s.toml" -o "$OUT/$s" --overwrite
done
CELLS=(k7_cell_line_contacts_02pct k7_cell_line_contacts_05pct k7_cell_line_contacts_10pct k7_cell_dot_contacts)
for s in "${CELLS[@]}"; do
  echo "== cell as built: scenes/$s.toml (front grid, passivated rear with contacts; few photons)"
  "$BIN" run "scenes/$s.toml" -o "$OUT/$s" --overwrite --photons 1500
done
SWEEP="$OUT/k7_sinx_rear_sweep"
echo "== sweep: scenes/k7_sinx_rear_sweep.toml (front SiNx 65-85 nm x Al/Ag rear, few photons)"
"$BIN" sweep plan scenes/k7_sinx_rear_sweep.toml --out "$SWEEP" > /dev/null
"$BIN" sweep local "$SWEEP"
"$BIN" sweep merge "$SWEEP"
echo "== fit: scenes/k7_fit_recipe_b.toml to its synthetic measured curve (2 film thicknesses, a few seconds)"
"$BIN" fit scenes/k7_fit_recipe_b.toml --measured scenes/k7_fit_recipe_b_measured.csv \
  -o "$OUT/k7_fit_recipe_b-fit" --overwrite 2> /dev/null
FOLDERS=("$OUT/k7_polished_reference-planar" "$OUT/k7_polished_reference" "$OUT/k7_recipe_a_coarse"
         "$OUT/k7_recipe_b_standard" "$OUT/k7_recipe_c_fine" "$OUT/lambertian_limit_180um")
echo "== plots (PNG + SVG) and reports (HTML) of every result and of the sweep"
FIT="$OUT/k7_fit_recipe_b-fit"
"$BIN" plot "${FOLDERS[@]}" "$SWEEP" "$FIT" -o "$OUT/comparison-plots" > "$OUT/plots-written.txt"
echo "$(wc -l < "$OUT/plots-written.txt") chart files, listed in $OUT/plots-written.txt"
"$BIN" report "${FOLDERS[@]}" "$SWEEP" "$FIT"
echo
echo "== line K7, AM1.5G, 300-1200 nm (model estimates, mA/cm2 ± standard error)"
python3 scripts/compare_results.py "$OUT/k7_polished_reference-planar" "$OUT/k7_polished_reference" \
  "$OUT/k7_recipe_a_coarse" "$OUT/k7_recipe_b_standard" "$OUT/k7_recipe_c_fine" "$OUT/lambertian_limit_180um"
echo
echo "== line K7 etch study: shape of the pyramids (model estimates, mA/cm2 ± standard error)"
python3 scripts/compare_results.py "${ETCH[@]/#/$OUT/}"
echo
echo "== line K7 cells as built: grid shading and rear contacts 2 / 5 / 10 % lines, dots (model estimates, mA/cm2 ± standard error)"
python3 scripts/compare_results.py "${CELLS[@]/#/$OUT/}"
echo
echo "Result folders are in $OUT/ (spectral.csv, summary.json, generation.csv, escape_angles.csv, ...),"
echo "each with its charts in plots/ and a report.html to open in a browser; comparison charts in"
echo "$OUT/comparison-plots/; the sweep's merged table, charts and report in $SWEEP/; the etch study's"
echo "texture statistics and relief pictures in $OUT/k7_etch_*-texture/."
