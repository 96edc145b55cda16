#!/usr/bin/env bash
# Regenerates the chart images shown in README.md (docs/images/*.png) from
# the demo: runs scripts/demo.sh (installs what is missing, builds, traces
# line K7, runs the small sweep, draws every chart) and copies four charts.
# The images show model estimates of the fictional line K7.
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/demo.sh
mkdir -p docs/images
cp results/demo/k7_recipe_b_standard/plots/spectra.png docs/images/spectra_k7_recipe_b.png
cp results/demo/comparison-plots/losses.png docs/images/losses_k7_line.png
cp results/demo/k7_sinx_rear_sweep/plots/sweep_lines.png docs/images/sweep_k7_sinx_rear.png
cp results/demo/k7_fit_recipe_b-fit/plots/fit.png docs/images/fit_k7_recipe_b.png
echo "make-readme-images: wrote docs/images/spectra_k7_recipe_b.png, losses_k7_line.png, sweep_k7_sinx_rear.png," \
  "fit_k7_recipe_b.png"
