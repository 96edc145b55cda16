#!/usr/bin/env bash
# Checking builds, run by .ci/run after the tests (scripts/test.sh):
#  1. the unit tests (GoogleTest, every area) built with clang under
#     AddressSanitizer and UndefinedBehaviorSanitizer in build-check/, any
#     report fails the run;
#  2. each libFuzzer target in tests/fuzz/ for FUZZ_SECONDS (default 60)
#     from seed corpora of the shipped scenes, the catalogue's scenes
#     (tests/cli/catalogue/cases.tsv), materials and formula files
#     (plus the inputs in tests/fuzz/corpus/ when present); a crash, a leak,
#     a sanitizer report or an input taking over 10 s fails the run, and the
#     input is kept in build-check/fuzz-findings/.
# Prints the executions each fuzzer reached. A longer search:
#   FUZZ_SECONDS=3600 bash scripts/sanitize-and-fuzz.sh --fuzz-only
set -euo pipefail
cd "$(dirname "$0")/.."
FUZZ_SECONDS=${FUZZ_SECONDS:-60}
B=build-check
only=${1:-}

bash scripts/install-deps.sh
cmake -S . -B "$B" -DCMAKE_BUILD_TYPE=RelWithDebInfo -DCMAKE_CXX_COMPILER=clang++ \
      -DLUMTRAP_SANITIZE=ON -DLUMTRAP_FUZZ=ON >/dev/null
if [ "$only" = "--fuzz-only" ]; then
  cmake --build "$B" -j"$(nproc)" --target $(cd tests/fuzz && ls fuzz_*.cpp | sed 's/\.cpp$//')
else
  cmake --build "$B" -j"$(nproc)"
fi

export ASAN_OPTIONS=detect_leaks=1:abort_on_error=1:strict_string_checks=1
export UBSAN_OPTIONS=print_stacktrace=1:halt_on_error=1

if [ "$only" != "--fuzz-only" ]; then
  echo "== unit tests under AddressSanitizer and UndefinedBehaviorSanitizer" >&2
  ctest --test-dir "$B" --output-on-failure -j"$(nproc)" --timeout 1800 -L 'geometry|optics|io|sweep|trace'
fi

echo "== fuzzing, ${FUZZ_SECONDS} s per target" >&2
corpus_of() {  # target -> seed files
  case "$1" in
    fuzz_scene_reader) ls scenes/*.toml tests/regression/scenes/*.toml 2>/dev/null ;;
    fuzz_sweep_expand) ls scenes/*sweep*.toml 2>/dev/null ;;
    fuzz_table_files)  ls materials/*.csv materials/formulas/*.toml 2>/dev/null ;;
  esac
}
mkdir -p "$B/fuzz-findings"
status=0
for exe in "$B"/fuzz_*; do
  [ -x "$exe" ] || continue
  name=$(basename "$exe")
  corpus="$B/fuzz-corpus/$name"
  mkdir -p "$corpus"
  for f in $(corpus_of "$name"); do
    if [ "$name" = fuzz_table_files ]; then   # the first byte picks the reader (see the target)
      case "$f" in
        *formulas*) sel='\x02' ;;
        *astm*)     sel='\x01' ;;
        *)          sel='\x00' ;;
      esac
      { printf "$sel"; cat "$f"; } > "$corpus/seed-$(basename "$f")"
    else
      cp "$f" "$corpus/seed-$(basename "$f")"
    fi
  done
  if [ "$name" = fuzz_scene_reader ]; then   # the scenes of the catalogue of bad inputs
    n=0
    while IFS=$'\t' read -r id _ _ setup _; do
      case "$id$setup" in \#*) continue ;; esac
      case "$setup" in "scene '"*) ;; *) continue ;; esac
      body=${setup#scene \'}; body=${body%%\'*}
      printf '%b' "$body" > "$corpus/catalogue-$id.toml"; n=$((n + 1))
    done < tests/cli/catalogue/cases.tsv
    echo "fuzz $name: seeds from scenes/, tests/regression/scenes/ and $n catalogue scenes" >&2
  fi
  [ -d "tests/fuzz/corpus/$name" ] && cp tests/fuzz/corpus/"$name"/* "$corpus/" 2>/dev/null || true
  log="$B/fuzz-findings/$name.log"
  if "$exe" -max_total_time="$FUZZ_SECONDS" -timeout=10 -rss_limit_mb=4096 -print_final_stats=1 \
        -artifact_prefix="$B/fuzz-findings/$name-" "$corpus" > "$log" 2>&1; then
    execs=$(grep -m1 'stat::number_of_executed_units' "$log" | awk '{print $2}')
    echo "fuzz $name: ${execs:-?} executions in ${FUZZ_SECONDS} s, nothing found" >&2
  else
    echo "FAIL: fuzz $name found a problem; the input is in $B/fuzz-findings/; log:" >&2
    tail -40 "$log" >&2
    status=1
  fi
done
exit $status
