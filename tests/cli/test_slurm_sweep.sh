#!/usr/bin/env bash
# A sweep on a real one-node SLURM cluster: scripts/slurm-ci.sh starts
# munged, slurmctld and slurmd (installing the Debian packages when missing,
# which needs root); `lumtrap sweep plan` writes the job scripts; the exact
# submit line that plan prints submits an 8-task job array and a merge job
# that depends on it (afterok, --kill-on-invalid-dep=yes). The test waits
# with a deadline, checks that every job COMPLETED, and compares the merged
# table and every variant's tallies with a local run, byte for byte. Only
# the daemons this test started are stopped at the end.
# Env: LUMTRAP_BINARY, LUMTRAP_SOURCE_DIR; SLURM_TEST_DEADLINE (s, default 300).
set -uo pipefail

BIN=${LUMTRAP_BINARY:-lumtrap}
SRC=${LUMTRAP_SOURCE_DIR:-$(cd "$(dirname "$0")/../.." && pwd)}
DEADLINE_S=${SLURM_TEST_DEADLINE:-300}
SLURM_CI="$SRC/scripts/slurm-ci.sh"
START=$SECONDS
STARTED=""
WORK=""

fail() {
  echo "FAIL: test_slurm_sweep: $*" >&2
  exit 1
}
cleanup() {
  if [ -n "$STARTED" ]; then
    # shellcheck disable=SC2086
    bash "$SLURM_CI" stop $STARTED || echo "test_slurm_sweep: stopping $STARTED failed" >&2
  fi
  [ -n "$WORK" ] && rm -rf "$WORK"
}
trap cleanup EXIT

BIN=$(command -v "$BIN") || fail "lumtrap binary not found (set LUMTRAP_BINARY)"
[ -f "$SLURM_CI" ] || fail "$SLURM_CI not found (set LUMTRAP_SOURCE_DIR)"
if [ "$(id -u)" -ne 0 ] && ! command -v sbatch >/dev/null; then
  fail "SLURM is not installed and this test is not running as root, so it cannot install it: run it as root (CI does) or install slurm-wlm (apt-get install --no-install-recommends slurmctld slurmd slurm-client munge)"
fi

# --- the cluster --------------------------------------------------------------
T0=$SECONDS
START_OUT=$(bash "$SLURM_CI" start) || fail "scripts/slurm-ci.sh start failed (log tails above)"
STARTED=$(sed -n 's/^started: *//p' <<< "$START_OUT")
CLUSTER_S=$((SECONDS - T0))
echo "cluster up in ${CLUSTER_S} s (started by this test: ${STARTED:-nothing, it was running})"

# The jobs run as the submitting user: the folder must be theirs to write.
WORK=$(mktemp -d "${TMPDIR:-/tmp}/lumtrap-slurm-sweep.XXXXXX")
chmod 0755 "$WORK"
cd "$WORK" || fail "cannot enter $WORK"

# 8 tiny variants: 2 wafer thicknesses x 4 film thicknesses, 3 wavelengths.
cat > sweep.toml <<'EOF'
[wafer]
thickness = "160 um"

[[front.films]]
material = "sinx_pecvd_n209"
thickness = "75 nm"

[rear]
medium = "al_rakic1995"

[illumination]
wavelengths = ["800 nm", "1000 nm", "1100 nm"]

[run]
photons = 3000

[sweep.grid]
"wafer.thickness" = ["120 um", "160 um"]
"front.films[0].thickness" = "60 nm .. 90 nm step 10 nm"
EOF

# --- submit exactly what plan prints ---------------------------------------------
# (the test node has RealMemory=1000 MB, so ask for little memory)
"$BIN" sweep plan sweep.toml --out S --cpus-per-task 1 --time 00:10:00 --mem 100M > plan.txt 2>&1 ||
  { cat plan.txt; fail "plan failed"; }
LINE=$(grep -E '^  A=\$\(sbatch --parsable ' plan.txt | sed 's/^  //')
[ -n "$LINE" ] || { cat plan.txt; fail "plan printed no submit line"; }
echo "submitting: $LINE"
T1=$SECONDS
A=""
eval "$LINE" > submit.txt 2>&1 || { cat submit.txt; fail "submission failed"; }
M=$(sed -n 's/^Submitted batch job \([0-9]*\).*/\1/p' submit.txt)
A=${A%%;*}
[ -n "$A" ] && [ -n "$M" ] || { cat submit.txt; fail "no job ids (array '$A', merge '$M')"; }
echo "array job $A, merge job $M"

# Local run of the same sweep meanwhile (the reference).
"$BIN" sweep plan sweep.toml --out L > /dev/null 2>&1 || fail "plan L failed"
"$BIN" sweep local L -j 1 > local.txt 2>&1 || { cat local.txt; fail "local run failed"; }
"$BIN" sweep merge L > /dev/null 2>&1 || fail "merge L failed"

# --- wait (squeue loop with a deadline; sbatch --wait reports 0 for a cancelled job) ----
deadline=$((SECONDS + DEADLINE_S))
while [ -n "$(squeue -h -j "$A,$M" 2>/dev/null)" ]; do
  if [ $SECONDS -ge $deadline ]; then
    squeue >&2
    scontrol cancel "$A" "$M" 2>/dev/null || scancel "$A" "$M" 2>/dev/null
    fail "jobs not finished after $DEADLINE_S s"
  fi
  sleep 0.5
done
JOBS_S=$((SECONDS - T1))
scontrol show job "$A" > array_state.txt 2>&1 || true
scontrol show job "$M" > merge_state.txt 2>&1 || true
n_done=$(grep -c 'JobState=COMPLETED' array_state.txt)
if [ "$n_done" -ne 8 ]; then
  grep -E 'JobId=|JobState=' array_state.txt >&2
  tail -n 5 S/logs/task_*.log >&2 2>/dev/null
  fail "$n_done of 8 array tasks COMPLETED"
fi
grep -q 'JobState=COMPLETED' merge_state.txt || { cat merge_state.txt >&2; cat S/logs/merge.log >&2; fail "merge job did not complete"; }
# afterok: the merge started only after the last array task had ended (ISO times compare as text).
last_end=$(grep -o 'EndTime=[0-9T:-]*' array_state.txt | cut -d= -f2 | sort | tail -1)
merge_start=$(grep -o 'StartTime=[0-9T:-]*' merge_state.txt | head -1 | cut -d= -f2)
[ -n "$last_end" ] && [ -n "$merge_start" ] && [[ ! "$merge_start" < "$last_end" ]] ||
  fail "merge job started at '$merge_start', before the last array task ended ('$last_end')"
echo "last array task ended $last_end, merge job started $merge_start"

# --- the results ------------------------------------------------------------------
for t in 0 1 2 3 4 5 6 7; do
  grep -q "sweep task $t of 8 .* 1 thread, 1 work unit" "S/logs/task_$t.log" ||
    { cat "S/logs/task_$t.log"; fail "task $t log: no task header with 1 thread (SLURM_CPUS_PER_TASK)"; }
done
grep -q 'merged 8 of 8 variants' S/logs/merge.log || { cat S/logs/merge.log; fail "merge log"; }
cmp -s S/merged.csv L/merged.csv || { diff S/merged.csv L/merged.csv | head; fail "merged.csv of the SLURM run differs from the local run"; }
for v in 0 1 2 3 4 5 6 7; do
  id=$(printf 'v%04d' "$v")
  cmp -s "S/variants/$id/result/tallies.json" "L/variants/$id/result/tallies.json" ||
    fail "$id: tallies.json of the SLURM run differs from the local run"
done
"$BIN" sweep status S | grep -q 'done     8' || fail "status after the SLURM run: $("$BIN" sweep status S)"

echo "8-task job array + afterok merge: all COMPLETED in ${JOBS_S} s; merged.csv and 8 tallies.json identical to the local run"
echo "PASS: test_slurm_sweep (wall time $((SECONDS - START)) s: cluster start ${CLUSTER_S} s, jobs ${JOBS_S} s)"
