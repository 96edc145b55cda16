#!/usr/bin/env bash
# Sweeps without a scheduler, as a user runs them:
#  - plan + local + merge;
#  - the same sweep run task by task (other units per task, photon split,
#    threads, batch sizes, SLURM_ARRAY_TASK_ID) gives bit-identical tallies
#    and merged table;
#  - a task killed with SIGKILL mid-variant (and one stopped with SIGTERM)
#    resumes from its checkpoint to the identical tallies.json;
#    status finds the killed variant (failed, with its array index) and the
#    trace time of the killed, stopped and resumed attempts is summed;
#  - merge with a missing variant names it and its array index and exits
#    non-zero; status counts it (missing, then failed) and exits 3;
#  - merge refuses a result of another sweep (hash check);
#  - an invalid variant is rejected by plan before anything runs;
#  - --lean result folders: no angle maps, the same tallies;
#  - a re-plan with another --per-task logs into its own folder and refuses
#    the old job script;
#  - the cluster's limits (stub scontrol and sinfo on PATH): --per-task
#    chosen below MaxArraySize, a given one refused with the numbers, --mem
#    refused against the partition before anything is written;
#  - sweep task --check.
# SLURM's commands are replaced by stubs on PATH, so the test does not
# depend on a cluster running on this machine (test_slurm_sweep.sh uses one).
# Env: LUMTRAP_BINARY (the lumtrap executable), LUMTRAP_SOURCE_DIR (unused here).
set -uo pipefail

BIN=${LUMTRAP_BINARY:-lumtrap}
START=$SECONDS
WORK=$(mktemp -d "${TMPDIR:-/tmp}/lumtrap-sweep-local.XXXXXX")
BG_PID=""
cleanup() {
  [ -n "$BG_PID" ] && kill -9 "$BG_PID" 2>/dev/null
  rm -rf "$WORK"
}
trap cleanup EXIT

fail() {
  echo "FAIL: test_sweep_local: $*" >&2
  exit 1
}
ok() { echo "ok: $*"; }

[ -x "$BIN" ] || command -v "$BIN" >/dev/null || fail "lumtrap binary '$BIN' not found (set LUMTRAP_BINARY)"
BIN=$(command -v "$BIN")
cd "$WORK" || fail "cannot enter $WORK"

# No SLURM here: every SLURM command fails, as on a workstation without it.
mkdir -p stub-none stub-limits
for c in scontrol sinfo squeue sacct sbatch; do
  printf '#!/bin/sh\nexit 1\n' > "stub-none/$c"
  chmod +x "stub-none/$c"
done
# A small cluster (used in section 8): MaxArraySize 4, nodes of 400 MB and 8 CPUs, 2 h limit.
printf '#!/bin/sh\necho "MaxArraySize            = 4"\n' > stub-limits/scontrol
printf '#!/bin/sh\necho "batch*|400|8|2:00:00"\n' > stub-limits/sinfo
chmod +x stub-limits/scontrol stub-limits/sinfo
export PATH="$WORK/stub-none:$PATH"

# A tiny planar scene: 3 wavelengths, 4000 photons, 2 x 3 variants.
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
photons = 4000

[sweep.grid]
"wafer.thickness" = ["120 um", "160 um"]
"front.films[0].thickness" = "60 nm .. 80 nm step 10 nm"
EOF
NV=6

compare_variants() {  # DIR_A DIR_B: every variant's tallies.json byte for byte
  local v id
  for v in $(seq 0 $((NV - 1))); do
    id=$(printf 'v%04d' "$v")
    [ -f "$1/variants/$id/result/tallies.json" ] || fail "$1: $id has no result/tallies.json"
    cmp -s "$1/variants/$id/result/tallies.json" "$2/variants/$id/result/tallies.json" ||
      fail "$id: tallies.json of $1 and $2 differ"
  done
}

# --- 1. plan + local + merge ------------------------------------------------
"$BIN" sweep plan sweep.toml --out A > plan_a.txt 2>&1 || { cat plan_a.txt; fail "plan A failed"; }
grep -q 'A=$(sbatch --parsable .*/A/submit.sbatch) && sbatch --dependency=afterok:$A --kill-on-invalid-dep=yes .*/A/merge.sbatch' plan_a.txt ||
  { cat plan_a.txt; fail "plan does not print the sbatch line"; }
for f in sweep.json sweep.toml variants.jsonl variants.csv submit.sbatch merge.sbatch; do
  [ -f "A/$f" ] || fail "plan did not write A/$f"
done
grep -q '^#SBATCH --array=0-5$' A/submit.sbatch || fail "submit.sbatch has no --array=0-5"
grep -q "^#SBATCH --output=$WORK/A/logs/per-task-1/task_%a.log$" A/submit.sbatch ||
  fail "submit.sbatch: task logs not in A/logs/per-task-1"
grep -q "^exec '$BIN' sweep task '$WORK/A' --plan-id per-task-1$" A/submit.sbatch ||
  fail "submit.sbatch does not run 'sweep task' by absolute path: $(tail -1 A/submit.sbatch)"
grep -q "^export LUMTRAP_MATERIALS='/.*/share/lumtrap/materials'$" A/submit.sbatch ||
  fail "submit.sbatch does not record the materials folder"
grep -q 'SLURM commands gave no answer\|MaxArraySize 1001 (SLURM.s default' plan_a.txt || { cat plan_a.txt; fail "plan without SLURM"; }
"$BIN" sweep status A > status0.txt
rc=$?
[ $rc -eq 3 ] || { cat status0.txt; fail "status of an unstarted sweep: exit $rc, expected 3"; }
grep -q 'v0000-v0005 (6 variants, array indices 0-5) missing: never started' status0.txt || { cat status0.txt; fail "status list"; }
grep -q "sbatch --parsable --array=0-5 $WORK/A/submit.sbatch" status0.txt || { cat status0.txt; fail "status resubmit line"; }
[ "$(sed -n 1p A/variants.csv)" = "id,wafer.thickness [um],front.films[0].thickness [nm]" ] ||
  fail "variants.csv header: $(sed -n 1p A/variants.csv)"
[ "$(sed -n 6p A/variants.csv)" = "v0004,160,70" ] || fail "variants.csv row v0004: $(sed -n 6p A/variants.csv)"

"$BIN" sweep local A -j 2 > local_a.txt 2>&1 || { cat local_a.txt; fail "local A failed"; }
"$BIN" sweep merge A > merge_a.txt 2>&1 || { cat merge_a.txt; fail "merge A failed"; }
[ "$(wc -l < A/merged.csv)" -eq $((NV + 1)) ] || fail "merged.csv has $(wc -l < A/merged.csv) lines, expected $((NV + 1))"
head -1 A/merged.csv | grep -q '^id,wafer.thickness \[um\],front.films\[0\].thickness \[nm\],J_G \[mA/cm2\],J_G_sigma \[mA/cm2\],J_G_minus_reference \[mA/cm2\],J_G_minus_reference_sigma \[mA/cm2\],reflected_front \[mA/cm2\],' ||
  fail "merged.csv header: $(head -1 A/merged.csv)"
head -1 A/merged.csv | grep -q ',J_max \[mA/cm2\],photons$' || fail "merged.csv header lacks J_max/photons"
# J_G minus the reference (v0000 by default, or --reference): the reference's own row is 0 ± 0,
# the others carry the difference of the J_G columns and an error from the paired groups
python3 - A/merged.csv v0000 <<'PY' || fail "J_G_minus_reference columns (default reference)"
import csv, sys
rows = list(csv.DictReader(open(sys.argv[1])))
ref = next(r for r in rows if r["id"] == sys.argv[2])
for r in rows:
    d = float(r["J_G_minus_reference [mA/cm2]"]); e = r["J_G_minus_reference_sigma [mA/cm2]"]
    assert abs(d - (float(r["J_G [mA/cm2]"]) - float(ref["J_G [mA/cm2]"]))) < 1e-12, r["id"]
    assert (r is ref and float(e) == 0.0) or (r is not ref and float(e) > 0.0), (r["id"], e)
PY
"$BIN" sweep merge A --reference v0003 > merge_ref.txt 2>&1 || { cat merge_ref.txt; fail "merge --reference v0003 failed"; }
python3 - A/merged.csv v0003 <<'PY' || fail "J_G_minus_reference columns (--reference v0003)"
import csv, sys
rows = list(csv.DictReader(open(sys.argv[1])))
ref = next(r for r in rows if r["id"] == sys.argv[2])
assert float(ref["J_G_minus_reference [mA/cm2]"]) == 0.0
PY
cp A/merged.csv merged_before_bad_reference.csv
"$BIN" sweep merge A --reference v9999 > merge_bad.txt 2>&1 && fail "merge --reference v9999 was accepted"
grep -q "reference variant 'v9999'" merge_bad.txt || { cat merge_bad.txt; fail "unclear message for an unknown reference"; }
cmp -s A/merged.csv merged_before_bad_reference.csv || fail "a refused merge changed merged.csv"
"$BIN" sweep merge A > merge_a.txt 2>&1 || { cat merge_a.txt; fail "merge A (again) failed"; }
ok "merged.csv: J_G_minus_reference and its error against v0000 and --reference v0003; unknown reference refused"
grep -q '"complete": true' A/merged.json || fail "merged.json does not say complete"
for f in spectral.csv summary.json scene.toml generation.csv tallies.json; do
  [ -f "A/variants/v0003/result/$f" ] || fail "result folder lacks $f"
done
"$BIN" sweep status A > status1.txt || { cat status1.txt; fail "status of a finished sweep exits non-zero"; }
grep -q 'done     6' status1.txt || fail "status of a finished sweep: $(cat status1.txt)"
ok "plan + local + merge: $NV variants; status exit 3 before, 0 after"

# Re-running finished work does nothing.
"$BIN" sweep local A > local_a2.txt 2>&1 || fail "second local run failed"
grep -q "local: 0 finished, 6 already done" local_a2.txt || { cat local_a2.txt; fail "finished variants were not skipped"; }

# --- 2. the same sweep as array tasks: split, units per task, threads --------
"$BIN" sweep plan sweep.toml --out B --per-task 2 --split-photons 3 > /dev/null 2>&1 || fail "plan B failed"
grep -q '^#SBATCH --array=0-8$' B/submit.sbatch || fail "plan B: expected 9 array tasks (18 units / 2)"
for t in $(seq 0 8); do
  if [ $((t % 2)) -eq 0 ]; then
    SLURM_ARRAY_TASK_ID=$t SLURM_CPUS_PER_TASK=1 "$BIN" sweep task B >> tasks_b.txt 2>&1 || fail "task $t of B failed"
  else
    "$BIN" sweep task B --index "$t" -j 2 --batch 700 >> tasks_b.txt 2>&1 || fail "task $t of B failed"
  fi
done
grep -q 'thread, 2 work units' tasks_b.txt || fail "SLURM_CPUS_PER_TASK=1 was not used"
"$BIN" sweep merge B > /dev/null 2>&1 || fail "merge B failed"
compare_variants A B
cmp -s A/merged.csv B/merged.csv || fail "merged.csv: local run and 9 split array tasks differ"
ok "9 array tasks, 3 photon ranges per variant, 1 or 2 threads: tallies.json and merged.csv bit-identical to local"

"$BIN" sweep plan sweep.toml --out C --per-task 4 > /dev/null 2>&1 || fail "plan C failed"
for t in 0 1; do "$BIN" sweep task C --index $t -j 1 --batch 333 > /dev/null 2>&1 || fail "task $t of C failed"; done
"$BIN" sweep merge C > /dev/null 2>&1 || fail "merge C failed"
compare_variants A C
cmp -s A/merged.csv C/merged.csv || fail "merged.csv: local run and 2 array tasks differ"
ok "2 array tasks of 4 variants, 1 thread, batches of 333: bit-identical"

# --- 3. SIGKILL mid-variant, SIGTERM, resume ---------------------------------
# One variant with enough photons to run for a few seconds.
cat > long.toml <<'EOF'
[wafer]
thickness = "160 um"

[front]
texture = "upright_pyramids"

[[front.films]]
material = "sinx_pecvd_n209"
thickness = "75 nm"

[rear]
medium = "al_rakic1995"

[illumination]
wavelengths = ["900 nm", "1000 nm", "1100 nm"]

[run]
photons = 400000

[sweep.grid]
"front.pyramids.base" = ["5 um"]
EOF
"$BIN" sweep plan long.toml --out R > /dev/null 2>&1 || fail "plan R failed"
"$BIN" sweep plan long.toml --out K > /dev/null 2>&1 || fail "plan K failed"
T0=$SECONDS
"$BIN" sweep local R -j 2 > /dev/null 2>&1 || fail "uninterrupted run of the long variant failed"
LONG_S=$((SECONDS - T0))

CK=K/variants/v0000/checkpoint.json
"$BIN" sweep task K --index 0 -j 2 --checkpoint-every 0.2 --batch 20000 > kill1.txt 2>&1 &
BG_PID=$!
deadline=$((SECONDS + 60))
until [ -f "$CK" ]; do
  [ $SECONDS -lt $deadline ] || fail "no checkpoint after 60 s"
  kill -0 "$BG_PID" 2>/dev/null || { cat kill1.txt; fail "the task ended before its first checkpoint (too fast?)"; }
  sleep 0.05
done
"$BIN" sweep status K > status_run.txt
rc=$?
[ $rc -eq 2 ] && grep -q 'running  1' status_run.txt || { cat status_run.txt; fail "status does not show the variant as running (exit $rc, expected 2)"; }
kill -9 "$BG_PID"
wait "$BG_PID" 2>/dev/null
BG_PID=""
[ -d K/variants/v0000/result ] && fail "the variant finished before SIGKILL; use more photons"
[ -f "$CK" ] || fail "checkpoint gone after SIGKILL"
KILLED_AT=$(grep -o '"photons":[0-9]*' "$CK" | head -1)
"$BIN" sweep status K > status_k.txt
rc=$?
[ $rc -eq 3 ] || { cat status_k.txt; fail "status after SIGKILL: exit $rc, expected 3"; }
grep -q 'v0000 (array index 0) failed: process [0-9]* on .* ended while tracing it (checkpoint kept)' status_k.txt ||
  { cat status_k.txt; fail "status does not find the SIGKILLed variant"; }
grep -q -- '--array=0 ' status_k.txt || { cat status_k.txt; fail "status does not resubmit the killed task"; }
ok "SIGKILL mid-variant, checkpoint kept ($KILLED_AT of 400000 at the first wavelength); status: failed, array index 0"

# SIGTERM (what SLURM sends at the time limit): stops after the batch, keeps the checkpoint, exit 130.
"$BIN" sweep task K --index 0 -j 2 --checkpoint-every 0.2 --batch 20000 > term.txt 2>&1 &
BG_PID=$!
sleep 0.7
kill -TERM "$BG_PID"
wait "$BG_PID"
rc=$?
BG_PID=""
if [ -d K/variants/v0000/result ]; then
  echo "note: the variant finished before SIGTERM arrived (rc $rc); SIGTERM path not exercised"
else
  [ $rc -eq 130 ] || { cat term.txt; fail "SIGTERM: exit code $rc, expected 130"; }
  grep -q 'interrupted' term.txt || { cat term.txt; fail "SIGTERM: no 'interrupted' line"; }
  [ -f "$CK" ] || fail "checkpoint gone after SIGTERM"
  EARLIER=$(sed -n 's/.*"trace_seconds":\([0-9.e+-]*\).*/\1/p' K/variants/v0000/trace_time.json)
  [ -n "$EARLIER" ] || fail "no trace_time.json after SIGTERM"
  ok "SIGTERM: stopped after a batch, exit 130, checkpoint kept, ${EARLIER} s traced so far"
fi

"$BIN" sweep task K --index 0 -j 1 > resume.txt 2>&1 || { cat resume.txt; fail "resumed task failed"; }
[ -d K/variants/v0000/result ] || fail "no result after resuming"
grep -q 'v0000: done (resumed)\|already done' resume.txt || { cat resume.txt; fail "the task did not resume"; }
[ -f "$CK" ] && fail "checkpoint not removed after the variant finished"
cmp -s R/variants/v0000/result/tallies.json K/variants/v0000/result/tallies.json ||
  fail "tallies.json after SIGKILL + SIGTERM + resume differs from the uninterrupted run"
[ -f K/variants/v0000/trace_time.json ] && fail "trace_time.json not removed after the variant finished"
if [ -n "${EARLIER:-}" ]; then
  TOTAL=$(sed -n 's/.*"trace_seconds": *\([0-9.e+-]*\).*/\1/p' K/variants/v0000/result/summary.json)
  python3 -c "import sys; sys.exit(0 if float('$TOTAL') >= float('$EARLIER') else 1)" ||
    fail "summary trace_seconds $TOTAL is less than the $EARLIER s of the earlier attempts"
fi
ok "killed, stopped and resumed: tallies.json identical to the uninterrupted run (${LONG_S} s run)"

# --- 4. merge with a missing variant; status -----------------------------------
mv A/variants/v0002/result A/v0002-result
"$BIN" sweep merge A > merge_missing.txt 2>&1
rc=$?
[ $rc -ne 0 ] || { cat merge_missing.txt; fail "merge with a missing variant exited 0"; }
grep -q "v0002 (array index 2) missing: never started" merge_missing.txt &&
  grep -q "logs: $WORK/A/logs/per-task-1/task_<array index>.log" merge_missing.txt ||
  { cat merge_missing.txt; fail "merge does not name the missing variant, its array index and the logs"; }
grep -q '"complete": false' A/merged.json || fail "merged.json of an incomplete sweep does not say so"
"$BIN" sweep status A > status.txt
[ $? -eq 3 ] || fail "status with a missing variant does not exit 3"
grep -q 'done     5' status.txt && grep -q 'missing  1' status.txt || { cat status.txt; fail "status counts"; }
echo "slurmstepd: error: *** JOB 41 ON node1 CANCELLED AT 2026-01-01T03:00:00 DUE TO TIME LIMIT ***" > A/logs/per-task-1/task_2.log
"$BIN" sweep status A > status2.txt
[ $? -eq 3 ] || fail "status with a failed variant does not exit 3"
grep -q 'failed   1' status2.txt && grep -q 'v0002 (array index 2) failed: log: "slurmstepd: error: .*DUE TO TIME LIMIT' status2.txt ||
  { cat status2.txt; fail "status does not show the failed variant with its log line"; }
"$BIN" sweep status A --json > status2.json
python3 - status2.json <<'PY' || fail "status --json"
import json, sys
j = json.load(open(sys.argv[1]))
assert j["counts"]["failed"] == 1 and j["counts"]["done"] == 5, j["counts"]
nd = j["not_done"]
assert len(nd) == 1 and nd[0]["id"] == "v0002" and nd[0]["array_index"] == 2 and nd[0]["state"] == "failed", nd
assert j["resubmit_array"] == "2" and "--array=2 " in j["resubmit_line"], j
PY
"$BIN" sweep merge A > merge_failed.txt 2>&1 && fail "merge with a failed variant exited 0"
grep -q "v0002 (array index 2) failed: .*DUE TO TIME LIMIT" merge_failed.txt || { cat merge_failed.txt; fail "merge does not show why v0002 failed"; }
ok "merge with a missing variant: exit $rc, names v0002 and its array index; status: 5 done, 1 missing, then 1 failed (exit 3, --json)"

# --- 5. merge refuses a variant of another sweep ---------------------------------
sed 's/"120 um", "160 um"/"130 um", "160 um"/' sweep.toml > other.toml
"$BIN" sweep plan other.toml --out F > /dev/null 2>&1 || fail "plan F failed"
"$BIN" sweep task F --index 2 > /dev/null 2>&1 || fail "task F failed"
cp -r F/variants/v0002/result A/variants/v0002/result
"$BIN" sweep merge A > merge_foreign.txt 2>&1 && fail "merge accepted a result of another sweep"
grep -q "refusing to merge" merge_foreign.txt && grep -q "another sweep" merge_foreign.txt &&
  grep -q "$WORK/A/variants/v0002/result" merge_foreign.txt || { cat merge_foreign.txt; fail "merge refusal message"; }
rm -rf A/variants/v0002/result
mv A/v0002-result A/variants/v0002/result
"$BIN" sweep merge A > /dev/null 2>&1 || fail "merge after restoring v0002 failed"
cmp -s A/merged.csv B/merged.csv || fail "merged.csv changed after restoring v0002"
ok "merge refuses a foreign result (hash check)"

# --- 6. an invalid variant is rejected before anything runs -----------------------
sed 's/"60 nm .. 80 nm step 10 nm"/["60 nm", "-5 nm"]/' sweep.toml > bad.toml
"$BIN" sweep plan bad.toml --out BAD > plan_bad.txt 2>&1 && fail "plan accepted a negative film thickness"
grep -q 'variant v0001 (wafer.thickness = "120 um", front.films\[0\].thickness = "-5 nm")' plan_bad.txt ||
  { cat plan_bad.txt; fail "plan error does not name the invalid variant"; }
[ -e BAD ] && fail "plan of an invalid sweep wrote a folder"
"$BIN" sweep plan sweep.toml --out A --split-photons 2 > replan.txt 2>&1 || { cat replan.txt; fail "re-plan of the same sweep refused"; }
"$BIN" sweep plan other.toml --out A > replan2.txt 2>&1 && fail "plan of another sweep into A accepted"
grep -q 'holds another sweep' replan2.txt || { cat replan2.txt; fail "re-plan refusal message"; }
sed 's/^photons = 4000$/photons = 4000\ntarget_jg_error = "0.5 mA\/cm2"/' sweep.toml > precision.toml
grep -q target_jg_error precision.toml || fail "could not write precision.toml"
"$BIN" sweep plan precision.toml --out P --split-photons 2 > plan_p.txt 2>&1 && fail "plan split a precision-mode sweep"
grep -q 'variant v0000 sets run.target_jg_error' plan_p.txt || { cat plan_p.txt; fail "split refusal message"; }
ok "invalid variant rejected by plan, naming it; foreign re-plan refused; precision mode not split"

# --- 7. lean result folders; re-plan with another mapping ----------------------------
"$BIN" sweep plan sweep.toml --out LEAN --lean > /dev/null 2>&1 || fail "plan --lean failed"
"$BIN" sweep local LEAN -j 2 > /dev/null 2>&1 || fail "local LEAN failed"
ls LEAN/variants/v0001/result/ | grep -q 'angles' && fail "a lean result folder holds angle maps: $(ls LEAN/variants/v0001/result)"
[ -f LEAN/variants/v0001/result/spectral.csv ] && [ -f LEAN/variants/v0001/result/generation.csv ] || fail "lean result lacks spectral/generation"
compare_variants A LEAN
"$BIN" sweep merge LEAN > /dev/null 2>&1 || fail "merge LEAN failed"
cmp -s A/merged.csv LEAN/merged.csv || fail "merged.csv of a lean sweep differs"
ok "--lean: no angle maps ($(du -sk LEAN/variants/v0001/result | cut -f1) KB against $(du -sk A/variants/v0001/result | cut -f1) KB), identical tallies and merged.csv"

cp C/submit.sbatch C/submit-per-task-4.sbatch
"$BIN" sweep plan sweep.toml --out C --per-task 3 > /dev/null 2>&1 || fail "re-plan of C with --per-task 3 failed"
grep -q "logs/per-task-3/task_%a.log" C/submit.sbatch || fail "re-plan: logs not in logs/per-task-3"
[ -d C/logs/per-task-4 ] && [ -d C/logs/per-task-3 ] || fail "re-plan: log folders per plan missing"
OLD_LINE=$(tail -1 C/submit-per-task-4.sbatch | sed "s/^exec //; s/'//g")
SLURM_ARRAY_TASK_ID=0 $OLD_LINE > old_script.txt 2>&1 && fail "an old job script ran against a re-planned folder"
grep -q 'written for plan per-task-4, but .* was planned again as per-task-3' old_script.txt || { cat old_script.txt; fail "old script refusal"; }
ok "re-plan with --per-task 3: logs/per-task-3, the old per-task-4 script is refused"

# --- 8. the cluster's limits (stub scontrol / sinfo: MaxArraySize 4, 400 MB nodes, 2 h) -----
LIMITS_PATH="$WORK/stub-limits:$PATH"
PATH=$LIMITS_PATH "$BIN" sweep plan sweep.toml --out M1 > m1.txt 2>&1 && fail "plan with the default --mem on 400 MB nodes was accepted"
grep -q -- '--mem 1G: 1024 MB per task, but the largest node of partition batch (the default) has 400 MB (sinfo); allowed: --mem 400M or less' m1.txt ||
  { cat m1.txt; fail "--mem refusal message"; }
[ -e M1 ] && fail "a refused plan wrote a folder"
PATH=$LIMITS_PATH "$BIN" sweep plan sweep.toml --out M1 --mem 300M --time 03:00:00 > m1b.txt 2>&1 && fail "--time above the partition's limit accepted"
grep -q -- '--time 03:00:00: 180 minutes, but partition batch (the default) allows at most 120 minutes' m1b.txt || { cat m1b.txt; fail "--time refusal"; }
PATH=$LIMITS_PATH "$BIN" sweep plan sweep.toml --out M1 --mem 300M --per-task 1 > m1c.txt 2>&1 && fail "an array above MaxArraySize accepted"
grep -q -- '--per-task 1: 6 work units make 6 array tasks (indices 0-5), but this cluster.s MaxArraySize (scontrol show config) is 4 (indices 0-3); allowed: --per-task 2 or more (then 3 tasks)' m1c.txt ||
  { cat m1c.txt; fail "--per-task refusal"; }
PATH=$LIMITS_PATH "$BIN" sweep plan sweep.toml --out M1 --mem 300M --time 01:00:00 --throttle 2 > m1d.txt 2>&1 || { cat m1d.txt; fail "plan within the limits failed"; }
grep -q '^#SBATCH --array=0-2%2$' M1/submit.sbatch || { cat M1/submit.sbatch; fail "auto --per-task 2 with throttle: expected --array=0-2%2"; }
grep -q 'array indices 0-2: below MaxArraySize 4 (scontrol show config)' m1d.txt || { cat m1d.txt; fail "plan output on MaxArraySize"; }
ok "cluster limits: --mem, --time and --per-task refused with the numbers before writing; --per-task 2 chosen for MaxArraySize 4; throttle %2"

# --- 9. task --check ---------------------------------------------------------------------
"$BIN" sweep task --check A > check.txt 2>&1 || { cat check.txt; fail "sweep task --check failed"; }
for w in binary libraries materials trace sweep; do
  grep -q "^ok   $w" check.txt || { cat check.txt; fail "task --check: no ok line for $w"; }
done
LUMTRAP_MATERIALS=/nonexistent "$BIN" sweep task --check > check_bad.txt 2>&1 && fail "task --check passed without materials"
grep -q '^FAIL materials' check_bad.txt || { cat check_bad.txt; fail "task --check: missing materials not reported"; }
ok "task --check: binary, libraries, materials, trace, sweep folder; fails without materials"

echo "PASS: test_sweep_local ($((SECONDS - START)) s)"
