#!/usr/bin/env bash
# Sweeps without a scheduler, as a user runs them:
#  - plan + local + merge;
#  - the same sweep run task by task (other units per task, photon split,
#    threads, batch sizes, SLURM_ARRAY_TASK_ID) gives bit-identical tallies
#    and merged table;
#  - a task killed with SIGKILL mid-variant (and one stopped with SIGTERM)
#    resumes from its checkpoint to the identical tallies.json;
#  - merge with a missing variant names it and its log and exits non-zero;
#    status counts it (missing, then failed);
#  - merge refuses a result of another sweep (hash check);
#  - an invalid variant is rejected by plan before anything runs.
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
cd "$WORK" || fail "cannot enter $WORK"

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
for f in sweep.json variants.csv submit.sbatch merge.sbatch variants/v0005/scene.toml; do
  [ -f "A/$f" ] || fail "plan did not write A/$f"
done
grep -q '^#SBATCH --array=0-5$' A/submit.sbatch || fail "submit.sbatch has no --array=0-5"
grep -q "^#SBATCH --output=$WORK/A/logs/task_%a.log$" A/submit.sbatch || fail "submit.sbatch: task logs not in A/logs"
grep -q "^exec '/.*' sweep task '$WORK/A'$" A/submit.sbatch || fail "submit.sbatch does not run 'sweep task' by absolute path"
[ "$(sed -n 1p A/variants.csv)" = "id,wafer.thickness [um],front.films[0].thickness [nm]" ] ||
  fail "variants.csv header: $(sed -n 1p A/variants.csv)"
[ "$(sed -n 6p A/variants.csv)" = "v0004,160,70" ] || fail "variants.csv row v0004: $(sed -n 6p A/variants.csv)"

"$BIN" sweep local A -j 2 > local_a.txt 2>&1 || { cat local_a.txt; fail "local A failed"; }
"$BIN" sweep merge A > merge_a.txt 2>&1 || { cat merge_a.txt; fail "merge A failed"; }
[ "$(wc -l < A/merged.csv)" -eq $((NV + 1)) ] || fail "merged.csv has $(wc -l < A/merged.csv) lines, expected $((NV + 1))"
head -1 A/merged.csv | grep -q '^id,wafer.thickness \[um\],front.films\[0\].thickness \[nm\],J_G \[mA/cm2\],J_G_sigma \[mA/cm2\],reflected_front \[mA/cm2\],' ||
  fail "merged.csv header: $(head -1 A/merged.csv)"
head -1 A/merged.csv | grep -q ',J_max \[mA/cm2\],photons$' || fail "merged.csv header lacks J_max/photons"
grep -q '"complete": true' A/merged.json || fail "merged.json does not say complete"
for f in spectral.csv summary.json scene.toml generation.csv tallies.json; do
  [ -f "A/variants/v0003/result/$f" ] || fail "result folder lacks $f"
done
"$BIN" sweep status A | grep -q 'done     6' || fail "status of a finished sweep: $("$BIN" sweep status A)"
ok "plan + local + merge: $NV variants"

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
photons = 1000000

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
"$BIN" sweep status K | grep -q 'running  1' || fail "status does not show the variant as running: $("$BIN" sweep status K)"
kill -9 "$BG_PID"
wait "$BG_PID" 2>/dev/null
BG_PID=""
[ -d K/variants/v0000/result ] && fail "the variant finished before SIGKILL; use more photons"
[ -f "$CK" ] || fail "checkpoint gone after SIGKILL"
KILLED_AT=$(grep -o '"photons":[0-9]*' "$CK" | head -1)
ok "SIGKILL mid-variant, checkpoint kept ($KILLED_AT of 1000000 at the first wavelength)"

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
  ok "SIGTERM: stopped after a batch, exit 130, checkpoint kept"
fi

"$BIN" sweep task K --index 0 -j 1 > resume.txt 2>&1 || { cat resume.txt; fail "resumed task failed"; }
[ -d K/variants/v0000/result ] || fail "no result after resuming"
grep -q 'v0000: done (resumed)\|already done' resume.txt || { cat resume.txt; fail "the task did not resume"; }
[ -f "$CK" ] && fail "checkpoint not removed after the variant finished"
cmp -s R/variants/v0000/result/tallies.json K/variants/v0000/result/tallies.json ||
  fail "tallies.json after SIGKILL + SIGTERM + resume differs from the uninterrupted run"
ok "killed, stopped and resumed: tallies.json identical to the uninterrupted run (${LONG_S} s run)"

# --- 4. merge with a missing variant; status -----------------------------------
mv A/variants/v0002/result A/v0002-result
"$BIN" sweep merge A > merge_missing.txt 2>&1
rc=$?
[ $rc -ne 0 ] || { cat merge_missing.txt; fail "merge with a missing variant exited 0"; }
grep -q "v0002 missing .*log: $WORK/A/logs/task_2.log" merge_missing.txt ||
  { cat merge_missing.txt; fail "merge does not name the missing variant and its task log"; }
grep -q '"complete": false' A/merged.json || fail "merged.json of an incomplete sweep does not say so"
"$BIN" sweep status A > status.txt || fail "status failed"
grep -q 'done     5' status.txt && grep -q 'missing  1' status.txt || { cat status.txt; fail "status counts"; }
echo "slurmstepd: error: *** JOB 41 ON node1 CANCELLED AT 2026-01-01T03:00:00 DUE TO TIME LIMIT ***" > A/logs/task_2.log
"$BIN" sweep status A > status2.txt || fail "status failed"
grep -q 'failed   1' status2.txt && grep -q "v0002 failed  log: $WORK/A/logs/task_2.log" status2.txt ||
  { cat status2.txt; fail "status does not show the failed variant with its log"; }
"$BIN" sweep merge A > merge_failed.txt 2>&1 && fail "merge with a failed variant exited 0"
grep -q "v0002 failed .*DUE TO TIME LIMIT" merge_failed.txt || { cat merge_failed.txt; fail "merge does not show why v0002 failed"; }
ok "merge with a missing variant: exit $rc, names v0002 and logs/task_2.log; status: 5 done, 1 missing, then 1 failed"

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

echo "PASS: test_sweep_local ($((SECONDS - START)) s)"
