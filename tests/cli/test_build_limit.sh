#!/usr/bin/env bash
# Bounded setup as a user meets it: textures far too large for the machine
# (1 nm pyramids in a 50 um tile, 1-5 um pyramids in a 10 mm tile) are
# refused by check, run, texture and sweep plan before any work, with the
# key, the numbers and what to change, and nothing is written; check prints
# the estimate; --max-memory changes the limit and a malformed value is
# refused. (No timing here: refusal times are measured by hand, see
# src/trace/build_estimate.cpp.)
set -euo pipefail
BIN=${LUMTRAP_BINARY:?set LUMTRAP_BINARY}
W=$(mktemp -d /tmp/lumtrap-limit.XXXXXX)
trap 'rm -rf "$W"' EXIT
fail() { echo "FAIL: $*" >&2; exit 1; }
cd "$W"

scene() {  # scene NAME BODY-OF-[front.random_pyramids]
  printf '[front]\ntexture = "random_pyramids"\n[front.random_pyramids]\n%s\n[illumination]\nwavelengths = ["1000 nm"]\n[run]\nphotons = 10\n' "$2" > "$1.toml"
}
scene nm 'distribution = "fixed"
size = "1 nm"
min_size = "0.5 nm"
tile = "50 um"'
scene wide 'tile = "10 mm"'
scene small 'tile = "30 um"'

for s in nm wide; do
  for cmd in check run texture; do
    set +e
    out_option=(-o out_$s)
    [ $cmd = check ] && out_option=()
    "$BIN" $cmd $s.toml "${out_option[@]}" > $s.$cmd.out 2> $s.$cmd.err
    code=$?
    set -e
    [ $code -eq 1 ] || fail "$cmd $s.toml: exit $code, expected 1"
    grep -q "key 'front.random_pyramids.tile'" $s.$cmd.err || fail "$cmd $s.toml: no key in: $(cat $s.$cmd.err)"
    grep -q "triangles" $s.$cmd.err || fail "$cmd $s.toml: no triangle count"
    grep -q "larger pyramids" $s.$cmd.err || fail "$cmd $s.toml: no advice"
    [ ! -e out_$s ] || fail "$cmd $s.toml wrote out_$s"
  done
done
grep -q 'value "10 mm"' wide.run.err || fail "the tile value is not named"
grep -q "wide.toml:4:" wide.run.err || fail "the tile's line is not named"
echo "ok: huge tiles refused by check, run and texture, nothing written"

"$BIN" check small.toml > small.out 2> small.err || fail "check small.toml: $(cat small.err)"
grep -q "build estimate: front tile about .* triangles" small.err || fail "check prints no estimate"
grep -q "limit .*--max-memory" small.err || fail "check does not say the limit"
echo "ok: check prints the estimate"

set +e
"$BIN" check small.toml --max-memory 1M > /dev/null 2> tiny.err; code=$?
"$BIN" run small.toml --max-memory lots -o out_bad > /dev/null 2> bad.err; code2=$?
set -e
[ $code -eq 1 ] && grep -q "above the limit of .*--max-memory 1M" tiny.err || fail "--max-memory 1M: $(cat tiny.err)"
[ $code2 -eq 1 ] && grep -q -- '--max-memory: value "lots"' bad.err || fail "--max-memory lots: $(cat bad.err)"
[ ! -e out_bad ] || fail "a malformed --max-memory wrote a result"
"$BIN" run small.toml --max-memory 50% -o out_small > /dev/null 2> small_run.err || fail "run small: $(cat small_run.err)"
echo "ok: --max-memory"

# A sweep: the variant over the limit is named, nothing is planned.
cat > sweep.toml <<'EOT'
[front]
texture = "random_pyramids"
[front.random_pyramids]
tile = "30 um"
[illumination]
wavelengths = ["1000 nm"]
[sweep.grid]
"front.random_pyramids.tile" = ["30 um", "10 mm"]
EOT
set +e
"$BIN" sweep plan sweep.toml -o plan > /dev/null 2> sweep.err; code=$?
"$BIN" check sweep.toml > /dev/null 2> sweep_check.err; code2=$?
set -e
[ $code -eq 1 ] && grep -q "front.random_pyramids.tile" sweep.err && grep -q "triangles" sweep.err \
  || fail "sweep plan: exit $code: $(cat sweep.err)"
[ ! -e plan ] || fail "sweep plan wrote a folder"
[ $code2 -eq 1 ] && grep -q "triangles" sweep_check.err || fail "check of the sweep: $(cat sweep_check.err)"
echo "ok: sweep variants checked"
