#!/usr/bin/env bash
# lumtrap plot as a user runs it, on a traced result, a planar result, the
# two compared, and a sweep with two numeric parameters and a material:
#  - every chart file exists; each SVG is well-formed, holds its axis labels
#    and the caption ("model estimate"), and exactly the expected number of
#    series (counted independently from spectral.csv / the sweep's values);
#    each PNG decodes and is not blank (chart_checks.py);
#  - drawing again gives byte-identical SVG files (reproducible ids, no date);
#  - the palette keeps ΔE*ab >= 20 between any two colours for normal vision
#    and simulated protanopia, deuteranopia and tritanopia (Machado et al.
#    2009 matrices, from memory), and the sequential map's lightness rises;
#  - `lumtrap exr-channels` reads escape_angles.exr back to the numbers of
#    escape_angles.csv (float32 rounding: relative 1e-6);
#  - errors (not a result folder, incomplete folder, unmerged sweep, no
#    matplotlib, no python) are one line on stderr with what to do, exit 1.
# Env: LUMTRAP_BINARY, LUMTRAP_SOURCE_DIR.
set -uo pipefail
. "${LUMTRAP_SOURCE_DIR:?set LUMTRAP_SOURCE_DIR}/tests/common/shell_fixture.sh" test_plots
CHECK="$PY $SRC/tests/cli/chart_checks.py"
cd "$W" || fail "cannot enter $W"

"$BIN" run "$SRC/scenes/k7_recipe_b_standard.toml" --photons 300 -o b > /dev/null 2>&1 || fail "lumtrap run"
"$BIN" planar "$SRC/scenes/k7_polished_reference.toml" -o polished > /dev/null 2>&1 || fail "lumtrap planar"

cat > sweep.toml <<'TOML'
[scene]
name = "K7 planar test sweep"
[wafer]
thickness = "160 um"
[[front.films]]
material = "sinx_pecvd_n209"
thickness = "75 nm"
[rear]
medium = "al_rakic1995"
[illumination]
wavelengths = ["600 nm", "800 nm", "1000 nm"]
[run]
photons = 400
[sweep.grid]
"wafer.thickness" = ["120 um", "160 um"]
"front.films[0].thickness" = "60 nm .. 80 nm step 10 nm"
"rear.medium" = ["al_rakic1995", "ag_johnson1972"]
TOML
"$BIN" sweep plan sweep.toml --out sw > /dev/null || fail "sweep plan"
"$BIN" sweep local sw > /dev/null 2>&1 || fail "sweep local"

# --- an unmerged sweep is refused with what to do
"$BIN" plot sw > out.txt 2> err.txt && fail "plot of an unmerged sweep succeeded"
[ "$(wc -l < err.txt)" -eq 1 ] && grep -q "lumtrap sweep merge" err.txt || { cat err.txt; fail "unmerged sweep message"; }
ok "unmerged sweep: $(cat err.txt)"
"$BIN" sweep merge sw > /dev/null || fail "sweep merge"

# --- plot everything in one call
"$BIN" plot b polished sw -o cmp > written.txt 2> notes.txt || { cat notes.txt; fail "lumtrap plot"; }
for f in b/plots/{spectra,losses,generation,angles,passes}.{png,svg} b/plots/{escape,rear}_angles.png \
         polished/plots/{spectra,losses}.{png,svg} cmp/{spectra,losses,generation,passes}.{png,svg} \
         sw/plots/sweep_lines.{png,svg} sw/plots/sweep_heatmap.{png,svg}; do
  [ -s "$f" ] || fail "$f was not written"
  grep -qx "$f" written.txt || fail "$f is not in the list lumtrap plot printed"
done
[ -e polished/plots/generation.svg ] && fail "a planar result has no generation profile, yet it was drawn"
grep -q "skipped generation" notes.txt || fail "no note on the skipped generation chart: $(cat notes.txt)"
ok "lumtrap plot wrote $(wc -l < written.txt) files and listed each"

# expected series, counted from the files themselves
nonzero_bins() {  # FOLDER: end-state bins of spectral.csv that are not zero at every wavelength
  "$PY" - "$1/spectral.csv" <<'PY'
import csv, sys
rows = list(csv.DictReader(l for l in open(sys.argv[1]) if not l.startswith("#")))
bins = [h for h in rows[0] if h not in ("wavelength [nm]", "photons") and not h.endswith("_sigma")]
print(sum(1 for b in bins if any(float(r[b]) != 0 for r in rows)))
PY
}
NB=$(nonzero_bins b); NP=$(nonzero_bins polished)
[ "$NB" -ge 4 ] || fail "expected at least 4 non-zero bins in b, got $NB"
$CHECK svg b/plots/spectra.svg --series "$NB" --label "wavelength [nm]" --label "fraction of incident photons" \
  --label "AM1.5G photon flux [10¹⁸ m⁻² s⁻¹ nm⁻¹]" --label "absorbed_silicon" --label "K7 recipe B" || exit 1
$CHECK svg polished/plots/spectra.svg --series "$NP" --label "wavelength [nm]" || exit 1
$CHECK svg b/plots/losses.svg --series 1 --label "current [mA/cm²]" --label "escaped_front" \
  --label "loss current [mA/cm²]  (error bars: ±1σ statistical)" || exit 1
$CHECK svg b/plots/generation.svg --series 1 --label "depth below the front surface [µm]" \
  --label "generation rate G [cm⁻³ s⁻¹]" || exit 1
$CHECK svg b/plots/angles.svg --series 2 --label "polar angle from the wafer normal [deg]" \
  --label "current per degree [mA cm⁻² deg⁻¹]" || exit 1
$CHECK svg b/plots/passes.svg --series 1 --label "bulk passes before absorption [count]" --label "share of J_G [%]" || exit 1
$CHECK svg cmp/spectra.svg --series 2 --label "wavelength [nm]" --label "absorbed in silicon (J_G)" || exit 1
$CHECK svg cmp/losses.svg --series 2 --label "loss current [mA/cm²]  (error bars: ±1σ statistical)" || exit 1
$CHECK svg cmp/generation.svg --series 1 --label "generation rate G [cm⁻³ s⁻¹]" || exit 1
# sweep: x = the film thickness (3 values); a line per (wafer thickness, rear metal): 4;
# heat map over film x wafer thickness, a panel per rear metal: 2
$CHECK svg sw/plots/sweep_lines.svg --series 4 --label "front.films[0].thickness [nm]" --label "J_G [mA/cm²]" \
  --label "rear.medium = ag_johnson1972" || exit 1
$CHECK svg sw/plots/sweep_heatmap.svg --series 2 --label "front.films[0].thickness [nm]" \
  --label "wafer.thickness [um]" --label "J_G [mA/cm²]" || exit 1
$CHECK png b/plots/*.png polished/plots/*.png cmp/*.png sw/plots/*.png || exit 1
# the best variant (highest J_G in merged.csv) is named on both sweep charts
BEST=$("$PY" -c "
import csv; rows = list(csv.DictReader(open('sw/merged.csv')))
print(max(rows, key=lambda r: float(r['J_G [mA/cm2]']))['id'])")
grep -q "best: $BEST" sw/plots/sweep_lines.svg && grep -q "$BEST (" sw/plots/sweep_heatmap.svg \
  || fail "best variant $BEST is not marked"
ok "best variant $BEST marked"

# --- a fit folder: measured vs fitted with residuals (chart and report)
# the "measured" curve is lumtrap's own planar reflectance at 78 nm (synthetic, no measurement)
cat > fitscene.toml <<'TOML'
[scene]
name = "K7 planar fit for the chart test"
[wafer]
thickness = "160 um"
[[front.films]]
material = "sinx_pecvd_n209"
thickness = "78 nm"
[rear]
medium = "al_rakic1995"
[illumination]
wavelengths = { from = "400 nm", to = "1000 nm", step = "50 nm" }
TOML
"$BIN" planar fitscene.toml -o truth > /dev/null 2>&1 || fail "planar run of the fit truth"
"$PY" - <<'PY' || fail "measured curve from the planar result"
import csv
rows = list(csv.DictReader(l for l in open("truth/spectral.csv") if not l.startswith("#")))
with open("measured.csv", "w") as f:
    f.write("wavelength_nm,reflectance,uncertainty\n")
    for r in rows:
        f.write(f"{r['wavelength [nm]']},{float(r['reflected_front']) + float(r['escaped_front']):.6f},0.002\n")
PY
sed -i 's/thickness = "78 nm"/thickness = "70 nm"/' fitscene.toml
printf '[fit.parameters]\n"front.films[0].thickness" = { start = "70 nm", min = "50 nm", max = "100 nm" }\n' >> fitscene.toml
"$BIN" fit fitscene.toml --measured measured.csv -o fitted > /dev/null 2>&1 || fail "lumtrap fit"
"$BIN" plot fitted > written_fit.txt 2> notes_fit.txt || { cat notes_fit.txt; fail "lumtrap plot of a fit folder"; }
for f in fitted/plots/fit.png fitted/plots/fit.svg; do
  grep -qx "$f" written_fit.txt || fail "$f is not in the list lumtrap plot printed"
done
$CHECK svg fitted/plots/fit.svg --series 3 --label "wavelength [nm]" --label "total reflectance" \
  --label "residual / σ" --label "measured ±1σ" --label "front.films[0].thickness" || exit 1
$CHECK png fitted/plots/fit.png || exit 1
"$BIN" report fitted > /dev/null 2>&1 || fail "lumtrap report of a fit folder"
grep -q 'id="table-parameters"' fitted/report.html && grep -q 'id="chart-fit"' fitted/report.html \
  || fail "fit report lacks the parameter table or the chart"
ok "fit folder: chart with measured, fitted and residual series; report with the parameter table"

# --- reproducible: drawing again gives the same SVG bytes
# (generation and passes are plain line charts like the spectra: left out of the copy to keep the test short)
mkdir again && cp -r b again/ && rm -rf again/b/plots again/b/generation.csv again/b/passes.csv
"$BIN" plot again/b > /dev/null 2>&1 || fail "second plot"
for c in spectra losses angles; do $CHECK same b/plots/$c.svg again/b/plots/$c.svg || exit 1; done

# --- palette: colour-blind safe by construction, checked again here
PYTHONPATH="$SRC/scripts" "$PY" - <<'PY' || fail "palette check"
from lumtrap_plots import palette as p
d = p.palette_min_difference()
L = [p.lab_of(c)[0] for c in p.SEQUENTIAL_STOPS]
assert d >= 20, f"palette: smallest difference {d:.1f} < 20"
assert all(a < b for a, b in zip(L, L[1:])), f"sequential map lightness not rising: {L}"
print(f"ok: palette smallest ΔE*ab over four visions {d:.1f}; sequential L* {[round(x) for x in L]}")
PY

# --- the EXR angle map read back through lumtrap exr-channels equals the CSV
"$BIN" exr-channels b/escape_angles.exr > exr.csv || fail "exr-channels"
"$PY" - <<'PY' || fail "exr-channels does not reproduce escape_angles.csv"
import csv
rows = list(csv.reader(l for l in open("b/escape_angles.csv") if not l.startswith("#")))[1:]
exr = [l.split(",") for l in open("exr.csv").read().splitlines()]
assert exr[0][0] == "# width 36 height 90" or exr[0] == ["# width 36 height 90"], exr[0]
assert exr[1] == ["y", "x", "Y"], exr[1]
pix = {(int(r[0]), int(r[1])): float(r[2]) for r in exr[2:]}
assert len(pix) == len(rows) == 90 * 36
for r in rows:
    y, x, v = int(float(r[0])), int(float(r[2]) / 10), float(r[4])
    assert abs(pix[(y, x)] - v) <= 1e-6 * abs(v) + 1e-30, (y, x, pix[(y, x)], v)
print("ok: exr-channels: 3240 pixels of escape_angles.exr equal escape_angles.csv")
PY

# --- errors: one line, what is wrong and what to do
one_line_error() {  # EXPECTED_TEXT COMMAND...
  local want=$1; shift
  "$@" > out.txt 2> err.txt && fail "'$*' succeeded"
  [ "$(wc -l < err.txt)" -eq 1 ] || { cat err.txt; fail "'$*': not one line"; }
  grep -qF -- "$want" err.txt || { cat err.txt; fail "'$*': message lacks '$want'"; }
  ok "error: $(cat err.txt)"
}
mkdir empty
one_line_error "not a result folder (no summary.json), a sweep folder (no sweep.json) nor a fit folder" "$BIN" plot empty
one_line_error "no such folder" "$BIN" plot does-not-exist
cp -r polished broken && rm broken/spectral.csv
one_line_error "spectral.csv is missing" "$BIN" plot broken
printf '#!/bin/sh\nexec %s -S "$@"\n' "$PY" > nompl && chmod +x nompl   # -S: no site-packages, no matplotlib
one_line_error "install python3-matplotlib" env LUMTRAP_PYTHON="$W/nompl" "$BIN" plot b
one_line_error "cannot run the Python interpreter" env LUMTRAP_PYTHON="$W/no-such-python" "$BIN" plot b
one_line_error "give two or more result folders" "$BIN" plot b -o x
echo "PASS: test_plots"
