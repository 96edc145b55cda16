#!/usr/bin/env bash
# The lumtrap command as a user meets it: result folders, refusal to
# overwrite, clear errors without half-written results, interruption and
# resume with identical numbers, the planar solver, check and materials.
set -euo pipefail
. "${LUMTRAP_SOURCE_DIR:?set LUMTRAP_SOURCE_DIR}/tests/common/shell_fixture.sh" test_cli_run
cd "$W"

cat > small.toml <<'TOML'
[wafer]
thickness = "160 um"
[front]
texture = "random_pyramids"
[front.random_pyramids]
distribution = "uniform"
min = "2 um"
max = "5 um"
tile = "25 um"
[[front.films]]
material = "sinx_pecvd_n209"
thickness = "75 nm"
[rear]
medium = "al_rakic1995"
[illumination]
wavelengths = { from = "400 nm", to = "1200 nm", step = "100 nm" }
[run]
photons = 2000
TOML

# 1. a run writes the whole folder, and the currents add up
"$BIN" run small.toml -o out1 > run1.log
for f in spectral.csv summary.json scene.toml generation.csv escape_angles.csv rear_angles.csv passes.csv; do
  [ -s "out1/$f" ] || fail "out1/$f missing"
done
python3 - <<'PY' || fail "J_G + losses != J_max"
import json
j = json.load(open("out1/summary.json"))
s = j["J_G_mA_cm2"] + sum(v["mA_cm2"] for v in j["losses"].values())
assert abs(s - j["J_max_mA_cm2"]) < 1e-9, (s, j["J_max_mA_cm2"])
assert abs(j["closure_mA_cm2"]) < 1e-9
assert j["photons"] == 9 * 2000
PY
ok "run writes the result folder; J_G + losses = J_max"

# 2. an existing folder is not overwritten without --overwrite
before=$(md5sum out1/spectral.csv)
if "$BIN" run small.toml -o out1 2> err.txt; then fail "second run into out1 succeeded"; fi
grep -q -- "--overwrite" err.txt || fail "no hint at --overwrite: $(cat err.txt)"
[ "$(md5sum out1/spectral.csv)" = "$before" ] || fail "out1 changed"
"$BIN" run small.toml -o out1 --overwrite > /dev/null || fail "--overwrite refused"
ok "existing results are kept unless --overwrite"

# 3. bad input: a clear error naming file, line and key; no folder written
sed 's/thickness = "75 nm"/thickness = "75 um2"/' small.toml > bad.toml
if "$BIN" run bad.toml -o out_bad 2> err.txt; then fail "bad scene accepted"; fi
grep -q "bad.toml:12:" err.txt || fail "error does not name bad.toml:12: $(cat err.txt)"
grep -q "front.films\[0\].thickness" err.txt || fail "error does not name the key: $(cat err.txt)"
[ ! -e out_bad ] || fail "a result folder was written for a bad scene"
printf '[wafer]\nthicknes = "160 um"\n' > typo.toml
if "$BIN" run typo.toml -o out_typo 2> err.txt; then fail "unknown key accepted"; fi
grep -q "typo.toml:2:" err.txt && grep -q "thicknes" err.txt || fail "unknown key error unclear: $(cat err.txt)"
printf '[wafer]\nmaterial = "unobtainium"\n' > mat.toml
if "$BIN" run mat.toml -o out_mat 2> err.txt; then fail "unknown material accepted"; fi
grep -q "mat.toml:2:" err.txt && grep -q "si_green2008" err.txt || fail "material error unclear: $(cat err.txt)"
ok "bad input gives file:line:key errors and no results"

# 4. interruption (SIGINT) keeps finished work; the resumed run gives the same numbers
sed 's/photons = 2000/photons = 300000/' small.toml > long.toml
"$BIN" run long.toml -o ref -j 2 > /dev/null
"$BIN" run long.toml -o resumed -j 2 > /dev/null 2> int.log &
pid=$!
sleep 2
kill -INT "$pid"
set +e; wait "$pid"; code=$?; set -e
if [ "$code" -eq 130 ]; then
  [ -s .resumed.checkpoint.json ] || fail "no checkpoint after interruption"
  [ ! -e resumed ] || fail "half a result folder after interruption"
  grep -q "resume" int.log || fail "no resume hint: $(cat int.log)"
  "$BIN" run long.toml -o resumed -j 1 > /dev/null
  ok "interrupted run kept its work (exit 130) and resumed"
else
  [ "$code" -eq 0 ] || fail "interrupted run exited $code"
  echo "note: the run finished before the interrupt arrived"
fi
cmp ref/spectral.csv resumed/spectral.csv || fail "resumed run differs from the uninterrupted one"
[ ! -e .resumed.checkpoint.json ] || fail "checkpoint left behind after completion"
ok "resumed result is identical to the uninterrupted one (with 1 thread instead of 2)"

# 5. planar solver, check, materials
"$BIN" planar "$SRC/scenes/k7_polished_reference.toml" -o planar > planar.log
grep -q "J_G" planar.log || fail "planar printed no J_G"
[ -s planar/spectral.csv ] && [ -s planar/summary.json ] || fail "planar result folder incomplete"
if "$BIN" planar small.toml -o p2 2> err.txt; then fail "planar accepted a textured scene"; fi
grep -q "planar" err.txt || fail "planar error unclear"
"$BIN" check small.toml | grep -q 'thickness_convention = "mean"' || fail "check does not print the resolved scene"
"$BIN" materials | grep -q "sinx_pecvd_n209" || fail "materials does not list sinx_pecvd_n209"
"$BIN" materials | grep -q "^ito_1e20 " || fail "materials does not list the formula ito_1e20"
ok "planar, check and materials"
echo "PASS: test_cli_run"
