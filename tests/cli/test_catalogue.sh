#!/usr/bin/env bash
# The catalogue of bad and odd inputs (tests/cli/catalogue/cases.tsv): every
# case runs lumtrap in a fresh folder and checks its exit code, a fragment of
# its message, that a refused case wrote no file at all, and that an accepted
# case wrote no NaN, Inf or null into its result files.
#
# cases.tsv: one case per line, tab-separated columns
#   id        unique name
#   exit      expected exit code, or "nz" for any non-zero code
#   fragment  text expected in stdout or stderr ("-" for none)
#   setup     bash code run in the case folder first (helpers below)
#   command   the arguments of lumtrap (bash words)
# Helpers for setup:
#   scene 'TEXT' [tail]   writes scene.toml (printf %b: \n, \t, \" work); with
#                         "tail", appends one wavelength and 20 photons
#   file NAME 'TEXT'      writes a file (printf %b)
#   result DIR            a result folder written by lumtrap (planar, 1 wavelength)
#   nonroot               skips the case when running as root (permissions)
set -uo pipefail
BIN=${LUMTRAP_BINARY:?set LUMTRAP_BINARY}
SRC=${LUMTRAP_SOURCE_DIR:?set LUMTRAP_SOURCE_DIR}
CASES=${1:-$SRC/tests/cli/catalogue/cases.tsv}
W=$(mktemp -d /tmp/lumtrap-catalogue.XXXXXX)
trap 'rm -rf "$W"' EXIT
TAIL='[illumination]\nwavelengths = ["600 nm"]\n[run]\nphotons = 20\n'

scene() { printf '%b' "$1" > scene.toml; if [ "${2:-}" = tail ]; then printf '%b' "$TAIL" >> scene.toml; fi; }
file() { mkdir -p "$(dirname "$1")"; printf '%b' "$2" > "$1"; }
result() {
  printf '%b' "$TAIL" > "$W/result-scene.toml"
  "$BIN" planar "$W/result-scene.toml" -o "$1" > /dev/null 2>&1 || { echo "cannot write result $1" >&2; exit 3; }
}
nonroot() { if [ "$(id -u)" = 0 ]; then exit 77; fi; }
export -f scene file result nonroot
export BIN W TAIL

total=0 passed=0 skipped=0 failed=0
declare -A by_exit
n=0
while IFS=$'\t' read -r id expect fragment setup command; do
  n=$((n + 1))
  [ -z "$id" ] && continue
  case "$id" in \#*) continue ;; esac
  total=$((total + 1))
  d="$W/case/$id"
  mkdir -p "$d"
  (
    cd "$d" || exit 3
    eval "$setup" || exit 3
    find . -mindepth 1 -printf '%p %s %y\n' | sort > "$W/before"
    eval "\"\$BIN\" $command" > "$W/out" 2>&1 < /dev/null
    code=$?
    find . -mindepth 1 -printf '%p %s %y\n' | sort > "$W/after"
    echo "$code" > "$W/code"
    exit 0
  )
  status=$?
  if [ "$status" = 77 ]; then
    skipped=$((skipped + 1)); echo "skip: $id (needs a user other than root)"; continue
  fi
  if [ "$status" != 0 ]; then
    failed=$((failed + 1)); echo "FAIL: $id (line $n): setup failed"; continue
  fi
  code=$(cat "$W/code")
  why=""
  if [ "$expect" = nz ]; then
    [ "$code" != 0 ] || why="exit 0, expected non-zero"
  elif [ "$code" != "$expect" ]; then
    why="exit $code, expected $expect"
  fi
  if [ -z "$why" ] && [ "$fragment" != "-" ] && ! grep -qF -- "$fragment" "$W/out"; then
    why="message lacks: $fragment"
  fi
  if [ -z "$why" ] && [ "$code" != 0 ] && ! cmp -s "$W/before" "$W/after"; then
    why="files were written: $(diff "$W/before" "$W/after" | grep '^>' | head -3 | tr '\n' ' ')"
  fi
  if [ -z "$why" ] && [ "$code" = 0 ]; then
    bad=$(cd "$d" && grep -rlwiE -- 'nan|inf|null' --include='*.csv' --include='summary.json' . 2>/dev/null | head -1)
    [ -z "$bad" ] || why="non-finite number or null in $bad"
  fi
  if [ -n "$why" ]; then
    failed=$((failed + 1))
    echo "FAIL: $id (line $n): $why"
    sed 's/^/    | /' "$W/out" | head -c 2000
  else
    passed=$((passed + 1))
    by_exit[$code]=$(( ${by_exit[$code]:-0} + 1 ))
  fi
  rm -rf "$d"
done < "$CASES"

summary=""
for c in $(printf '%s\n' "${!by_exit[@]}" | sort -n); do summary+=" exit $c: ${by_exit[$c]};"; done
echo "catalogue: $total cases, $passed passed ($summary ), $skipped skipped, $failed failed"
[ "$failed" = 0 ] || exit 1
[ "$total" -ge 200 ] || { echo "FAIL: the catalogue needs at least 200 cases"; exit 1; }
echo "PASS: test_catalogue"
