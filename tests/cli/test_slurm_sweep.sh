#!/usr/bin/env bash
# Sweeps on a real one-node SLURM cluster, as a cluster user runs them:
#  1. lumtrap is installed with `cmake --install` into a prefix, which is then
#     moved; the installed binary holds no path of the source tree, and a
#     local reference run of the sweep is made with the source tree hidden
#     (an empty tmpfs over it, in a private mount namespace);
#  2. scripts/slurm-ci.sh starts munged, slurmctld and slurmd (installing the
#     Debian packages when missing, which needs root); `sweep plan` (the
#     installed binary) writes the job scripts; the exact line plan prints
#     submits an 8-task job array and a merge job (afterok);
#  3. one array task is SIGKILLed while it traces and another is cancelled
#     with scancel; the merge job is then removed by SLURM
#     (--kill-on-invalid-dep); `sweep status` finds both with their array
#     indices and SLURM states, exits 3, and prints a resubmit line;
#  4. that line, run as printed, finishes the sweep: the merge job runs and
#     merged.csv and every tallies.json are byte-identical to the local run;
#  5. a plan of 1200 variants (above MaxArraySize 1001 with --per-task 1) is
#     grouped by plan so that its array fits, and SLURM accepts it (submitted
#     held, then cancelled); --per-task 1 is refused with the numbers.
# Only the daemons this test started are stopped at the end.
# Env: LUMTRAP_BINARY (build-tree binary; its folder is the build tree),
#      LUMTRAP_SOURCE_DIR; SLURM_TEST_DEADLINE (s per wait, default 300).
set -uo pipefail

BIN=${LUMTRAP_BINARY:-lumtrap}
SRC=${LUMTRAP_SOURCE_DIR:-$(cd "$(dirname "$0")/../.." && pwd)}
DEADLINE_S=${SLURM_TEST_DEADLINE:-300}
SLURM_CI="$SRC/scripts/slurm-ci.sh"
START=$SECONDS
STARTED=""
WORK=""
JOBS=""

fail() {
  echo "FAIL: test_slurm_sweep: $*" >&2
  exit 1
}
cleanup() {
  # shellcheck disable=SC2086
  [ -n "$JOBS" ] && scancel $JOBS 2>/dev/null
  if [ -n "$STARTED" ]; then
    # shellcheck disable=SC2086
    bash "$SLURM_CI" stop $STARTED || echo "test_slurm_sweep: stopping $STARTED failed" >&2
  fi
  [ -n "$WORK" ] && rm -rf "$WORK"
}
trap cleanup EXIT

BIN=$(command -v "$BIN") || fail "lumtrap binary not found (set LUMTRAP_BINARY)"
BUILD=$(dirname "$BIN")
[ -f "$BUILD/cmake_install.cmake" ] || fail "$BUILD is not a CMake build tree (set LUMTRAP_BINARY to build/lumtrap)"
[ -f "$SLURM_CI" ] || fail "$SLURM_CI not found (set LUMTRAP_SOURCE_DIR)"
if [ "$(id -u)" -ne 0 ] && ! command -v sbatch >/dev/null; then
  fail "SLURM is not installed and this test is not running as root, so it cannot install it: run it as root (CI does) or install slurm-wlm (apt-get install --no-install-recommends slurmctld slurmd slurm-client munge)"
fi

# wait_jobs IDS...: until none of the jobs is queued or running (deadline).
wait_jobs() {
  local ids deadline
  ids=$(echo "$*" | tr ' ' ',')
  deadline=$((SECONDS + DEADLINE_S))
  while [ -n "$(squeue -h -j "$ids" 2>/dev/null)" ]; do
    if [ $SECONDS -ge $deadline ]; then
      squeue >&2
      fail "jobs $ids not finished after $DEADLINE_S s"
    fi
    sleep 0.5
  done
}
# submit LINE: runs a printed submit line; sets A (array job) and M (merge job).
submit() {
  A=""
  M=""
  eval "$1" > submit.txt 2>&1 || { cat submit.txt; fail "submission failed: $1"; }
  M=$(sed -n 's/^Submitted batch job \([0-9]*\).*/\1/p' submit.txt)
  A=${A%%;*}
  [ -n "$A" ] && [ -n "$M" ] || { cat submit.txt; fail "no job ids (array '$A', merge '$M')"; }
  JOBS="$JOBS $A $M"
}
# wait_file FILE: until it exists (deadline).
wait_file() {
  local deadline=$((SECONDS + DEADLINE_S))
  until [ -f "$1" ]; do
    [ $SECONDS -lt $deadline ] || { squeue >&2; fail "$1 did not appear in $DEADLINE_S s"; }
    sleep 0.1
  done
}

WORK=$(mktemp -d "${TMPDIR:-/tmp}/lumtrap-slurm-sweep.XXXXXX")
chmod 0755 "$WORK"   # the jobs run as the submitting user: the folder must be theirs to write
cd "$WORK" || fail "cannot enter $WORK"

# --- 1. install, move the prefix, no source path inside -----------------------------------
cmake --install "$BUILD" --prefix "$WORK/staging" > install.txt 2>&1 || { cat install.txt; fail "cmake --install failed"; }
mv "$WORK/staging" "$WORK/opt-lumtrap"
PREFIX=$WORK/opt-lumtrap
IBIN=$PREFIX/bin/lumtrap
[ -x "$IBIN" ] && [ -f "$PREFIX/share/lumtrap/materials/si_green2008.csv" ] || fail "install layout: $(find "$PREFIX" -maxdepth 3 | head)"
grep -qaF "$SRC" "$IBIN" && fail "the installed binary contains the source path $SRC"
"$IBIN" sweep task --check > check.txt 2>&1 || { cat check.txt; fail "installed sweep task --check failed"; }
grep -q "^ok   materials $PREFIX/share/lumtrap/materials (installed beside the binary)" check.txt ||
  { cat check.txt; fail "the installed binary does not use the installed materials"; }
echo "installed into a prefix and moved it: $IBIN (no source path inside; task --check passed)"

# 8 variants: 2 wafer thicknesses x 2 photon counts x 2 film thicknesses;
# v0002, v0003, v0006, v0007 trace 500 000 photons per wavelength (seconds), the others 2000.
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
photons = 2000

[sweep.grid]
"wafer.thickness" = ["120 um", "160 um"]
"run.photons" = [2000, 500000]
"front.films[0].thickness" = ["70 nm", "80 nm"]
EOF

# The local reference, installed binary, source tree hidden (root only: mount namespace).
"$IBIN" sweep plan sweep.toml --out L --mem 200M > plan_l.txt 2>&1 || { cat plan_l.txt; fail "plan L failed"; }
case "$WORK/" in
  "$SRC"/*) HIDE="" ;;
  *) HIDE=yes ;;
esac
if [ "$(id -u)" -eq 0 ] && [ -n "$HIDE" ] && command -v unshare > /dev/null; then
  # shellcheck disable=SC2016
  unshare --mount --propagation private bash -c 'mount -t tmpfs lumtrap-hidden "$1" && shift && test ! -e "$0" && exec "$@"' \
    "$SRC/CMakeLists.txt" "$SRC" "$IBIN" sweep local L -j 2 > local.txt 2>&1 || { cat local.txt; fail "local run with the source tree hidden failed"; }
  echo "local reference run by the installed binary with $SRC hidden"
else
  "$IBIN" sweep local L -j 2 > local.txt 2>&1 || { cat local.txt; fail "local run failed"; }
  echo "note: not root (or no unshare): local reference run without hiding the source tree"
fi
"$IBIN" sweep merge L > /dev/null 2>&1 || fail "merge L failed"

# --- 2. the cluster; submit exactly what plan prints ------------------------------------
T0=$SECONDS
START_OUT=$(bash "$SLURM_CI" start) || fail "scripts/slurm-ci.sh start failed (log tails above)"
STARTED=$(sed -n 's/^started: *//p' <<< "$START_OUT")
CLUSTER_S=$((SECONDS - T0))
echo "cluster up in ${CLUSTER_S} s (started by this test: ${STARTED:-nothing, it was running})"

# (the test node has RealMemory=1000 MB, so ask for little memory)
"$IBIN" sweep plan sweep.toml --out S --cpus-per-task 1 --time 00:10:00 --mem 200M > plan.txt 2>&1 ||
  { cat plan.txt; fail "plan failed"; }
grep -q "array indices 0-7: below MaxArraySize 1001 (scontrol show config)" plan.txt || { cat plan.txt; fail "plan did not read MaxArraySize"; }
grep -q -- "--mem, --cpus-per-task and --time fit the partition (sinfo)" plan.txt || { cat plan.txt; fail "plan did not check the partition"; }
grep -q "^exec '$IBIN' sweep task '$WORK/S' --plan-id per-task-1$" S/submit.sbatch && \
  grep -q "^export LUMTRAP_MATERIALS='$PREFIX/share/lumtrap/materials'$" S/submit.sbatch ||
  { cat S/submit.sbatch; fail "the job script does not record the installed binary and materials"; }
LINE=$(grep -E '^  A=\$\(sbatch --parsable ' plan.txt | sed 's/^  //')
[ -n "$LINE" ] || { cat plan.txt; fail "plan printed no submit line"; }
echo "submitting: $LINE"
T1=$SECONDS
submit "$LINE"
A1=$A
M1=$M
echo "array job $A1, merge job $M1"

# --- 3. SIGKILL task 2 while it traces; scancel task 3 while it traces ----------------------
wait_file S/variants/v0002/started
wait_file S/variants/v0003/started
PID2=$(sed -n 's/.*"pid": *\([0-9]*\).*/\1/p' S/variants/v0002/started)
[ -n "$PID2" ] || fail "no pid in the start mark of v0002: $(cat S/variants/v0002/started)"
kill -9 "$PID2" || fail "could not SIGKILL task 2 (pid $PID2)"
scancel "${A1}_3" || fail "scancel ${A1}_3 failed"
echo "SIGKILLed task 2 (pid $PID2), cancelled task 3 (scancel ${A1}_3)"
wait_jobs "$A1" "$M1"
scontrol show job "$M1" 2>/dev/null | grep -q 'JobState=COMPLETED' && fail "the merge job ran although tasks failed"

"$IBIN" sweep status S > status.txt
rc=$?
cat status.txt
[ $rc -eq 3 ] || fail "status after the faults: exit $rc, expected 3"
grep -q 'done     6' status.txt && grep -q 'failed   2' status.txt || fail "status counts after the faults"
grep -q "v0002 (array index 2) failed: process $PID2 on .* (SLURM job ${A1}_2) ended while tracing it: SLURM FAILED (killed by signal 9)" status.txt ||
  fail "status does not find the SIGKILLed task 2 with its SLURM state"
grep -q "v0003 (array index 3) failed: .*SLURM job ${A1}_3.*CANCELLED" status.txt ||
  fail "status does not find the cancelled task 3"
RESUBMIT=$(grep -E '^  A=\$\(sbatch --parsable --array=2-3 ' status.txt | sed 's/^  //')
[ -n "$RESUBMIT" ] || fail "status printed no resubmit line for --array=2-3"
"$IBIN" sweep merge S > merge_partial.txt 2>&1 && fail "merge of an incomplete sweep exited 0"
grep -q 'v0002 (array index 2) failed' merge_partial.txt && grep -q 'v0003 (array index 3) failed' merge_partial.txt ||
  { cat merge_partial.txt; fail "merge's list of missing variants"; }

# --- 4. resubmit with status's own line ------------------------------------------------------
echo "resubmitting: $RESUBMIT"
submit "$RESUBMIT"
wait_jobs "$A" "$M"
JOBS_S=$((SECONDS - T1))
scontrol show job "$A" > array_state.txt 2>&1 || true
scontrol show job "$M" > merge_state.txt 2>&1 || true
n_done=$(grep -c 'JobState=COMPLETED' array_state.txt)
[ "$n_done" -eq 2 ] || { grep -E 'JobId=|JobState=' array_state.txt >&2; tail -n 5 S/logs/per-task-1/task_*.log >&2; fail "$n_done of 2 resubmitted tasks COMPLETED"; }
grep -q 'JobState=COMPLETED' merge_state.txt || { cat merge_state.txt >&2; cat S/logs/per-task-1/merge.log >&2; fail "merge job did not complete"; }
grep -q 'v0003: done (resumed)' S/logs/per-task-1/task_3.log || { cat S/logs/per-task-1/task_3.log; fail "task 3 did not resume from its checkpoint"; }

for t in 0 1 4 5 6 7; do
  grep -q "sweep task $t of 8 .* 1 thread, 1 work unit (SLURM job ${A1}_$t); inputs read in .* ms; materials $PREFIX/share/lumtrap/materials" "S/logs/per-task-1/task_$t.log" ||
    { cat "S/logs/per-task-1/task_$t.log"; fail "task $t log: no task header with 1 thread, its SLURM job and the installed materials"; }
done
grep -q 'merged 8 of 8 variants' S/logs/per-task-1/merge.log || { cat S/logs/per-task-1/merge.log; fail "merge log"; }
cmp -s S/merged.csv L/merged.csv || { diff S/merged.csv L/merged.csv | head; fail "merged.csv of the SLURM run differs from the local run"; }
for v in 0 1 2 3 4 5 6 7; do
  id=$(printf 'v%04d' "$v")
  cmp -s "S/variants/$id/result/tallies.json" "L/variants/$id/result/tallies.json" ||
    fail "$id: tallies.json of the SLURM run differs from the local run"
done
"$IBIN" sweep status S > status_end.txt || { cat status_end.txt; fail "status after the resubmission exits non-zero"; }
grep -q 'done     8' status_end.txt || fail "status after the resubmission: $(cat status_end.txt)"
echo "SIGKILL + scancel found by status (array indices 2, 3), resubmitted with its line: merged.csv and 8 tallies.json identical to the local run"

# --- 5. above MaxArraySize -----------------------------------------------------------------
cat > big.toml <<'EOF'
[wafer]
thickness = "160 um"

[[front.films]]
material = "sinx_pecvd_n209"
thickness = "75 nm"

[rear]
medium = "al_rakic1995"

[illumination]
wavelengths = ["1000 nm"]

[run]
photons = 10

[sweep.grid]
"wafer.thickness" = "100 um .. 129 um step 1 um"
"front.films[0].thickness" = "60 nm .. 99 nm step 1 nm"
EOF
"$IBIN" sweep plan big.toml --out BIG1 --per-task 1 --mem 200M --time 00:10:00 > big1.txt 2>&1 && fail "1200 tasks accepted with --per-task 1"
grep -q -- "--per-task 1: 1200 work units make 1200 array tasks (indices 0-1199), but this cluster's MaxArraySize (scontrol show config) is 1001" big1.txt ||
  { cat big1.txt; fail "refusal of --per-task 1 above MaxArraySize"; }
"$IBIN" sweep plan big.toml --out BIG --mem 200M --time 00:10:00 > big.txt 2>&1 || { cat big.txt; fail "plan of 1200 variants failed"; }
grep -q '600 array tasks (2 work units each)' big.txt || { cat big.txt; fail "plan of 1200 variants did not choose --per-task 2"; }
LINE=$(grep -E '^  A=\$\(sbatch --parsable ' big.txt | sed 's/^  //; s/sbatch --parsable /sbatch --hold --parsable /; s/ && sbatch / \&\& sbatch --hold /')
submit "$LINE"
scontrol show job -o "$A" | grep -q "ArrayTaskId=0-599 " || { scontrol show job -o "$A" | cut -c1-300; fail "the held array is not 0-599"; }
scancel "$A" "$M"
echo "1200 variants: --per-task 1 refused (MaxArraySize 1001), plan chose 600 tasks of 2, SLURM accepted the array (held, then cancelled)"

echo "PASS: test_slurm_sweep (wall time $((SECONDS - START)) s: cluster start ${CLUSTER_S} s, jobs ${JOBS_S} s)"
