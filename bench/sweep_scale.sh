#!/usr/bin/env bash
# Sweep scale benchmark: plans a 10 000-variant sweep (91 wavelengths,
# 20 000 photons each, as a K7 texture study), measures task start-up,
# fakes every variant done from one real result, merges, and reports the
# times and sizes against the targets of docs/cluster.md ("Scale"):
#   plan of 10 000 variants           <= 5 s
#   task start-up, whatever the size  <= 50 ms
#   merge of 10 000 done variants     <= 10 s
#   plan folder                       <= 1 KB per variant (plus results)
# It reports; it never fails on a time (no benchmark is a test).
#
#   bash bench/sweep_scale.sh [build/lumtrap] [WORK_DIR]
#
# Needs python3 (to fake the results) and about 300 MB in WORK_DIR (default:
# a temporary folder, removed at the end). Runs ~1-2 minutes on 2 cores.
set -euo pipefail

BIN=$(realpath "${1:-build/lumtrap}")
KEEP=${2:-}
WORK=${KEEP:-$(mktemp -d "${TMPDIR:-/tmp}/lumtrap-sweep-scale.XXXXXX")}
mkdir -p "$WORK"
[ -n "$KEEP" ] || trap 'rm -rf "$WORK"' EXIT
cd "$WORK"

now() { date +%s.%N; }
secs() { python3 -c "print(f'{$2 - $1:.2f}')"; }
verdict() { python3 -c "print('met' if $1 <= $2 else 'MISSED')"; }

scene() {  # $1 = grid body
  cat <<EOF
[scene]
name = "K7 scale study"

[wafer]
thickness = "160 um"

[front]
texture = "random_pyramids"

[front.random_pyramids]
distribution = "uniform"
min = "1 um"
max = "5 um"
tile = "40 um"

[[front.films]]
material = "sinx_pecvd_n209"
thickness = "75 nm"

[rear]
medium = "al_rakic1995"

[[rear.films]]
material = "sio2_malitson1965"
thickness = "100 nm"

[illumination]
wavelengths = { from = "300 nm", to = "1200 nm", step = "10 nm" }

[run]
photons = 20000

[sweep.grid]
$1
EOF
}

scene '"wafer.thickness" = "100 um .. 199 um step 1 um"
"front.films[0].thickness" = "60 nm .. 159 nm step 1 nm"' > big.toml      # 100 x 100 = 10 000
scene '"wafer.thickness" = "100 um .. 139 um step 1 um"
"front.films[0].thickness" = "60 nm .. 65 nm step 1 nm"' > small.toml     # 40 x 6 = 240
scene '"wafer.thickness" = ["160 um"]' > one.toml

echo "lumtrap sweep scale benchmark: $BIN"
echo "machine: $(nproc) cores, $(uname -sr), load $(cut -d' ' -f1-3 /proc/loadavg) (other work on the machine stretches wall times; CPU times do not depend on it)"
echo

# --- plan ---------------------------------------------------------------------------------
t0=$(now)
/usr/bin/time -f '%U %S' -o plan_cpu.txt "$BIN" sweep plan big.toml --out BIG --mem 500M --time 01:00:00 > plan_big.txt
t1=$(now)
PLAN_S=$(secs "$t0" "$t1")
PLAN_CPU=$(awk '{ printf "%.2f", $1 + $2 }' plan_cpu.txt)
"$BIN" sweep plan small.toml --out SMALL --mem 500M --time 01:00:00 > /dev/null
TASKS=$(python3 -c "import json; print(json.load(open('BIG/sweep.json'))['tasks'])")
PER_TASK=$(python3 -c "import json; print(json.load(open('BIG/sweep.json'))['per_task'])")
APPARENT=$(du -sb BIG | cut -f1)
ONDISK=$(du -sk BIG | cut -f1)
PER_VARIANT=$(python3 -c "print(f'{$APPARENT / 10000:.0f}')")
PER_VARIANT_DISK=$(python3 -c "print(f'{$ONDISK * 1024 / 10000:.0f}')")
echo "plan of 10 000 variants:      ${PLAN_S} s wall, ${PLAN_CPU} s CPU (target <= 5 s: $(verdict "$PLAN_S" 5)); $TASKS array tasks of $PER_TASK"
echo "plan folder:                  ${PER_VARIANT} B per variant (${PER_VARIANT_DISK} B on disk) (target <= 1024: $(verdict "$PER_VARIANT_DISK" 1024))"

# --- one real variant: the result folder, full and lean ----------------------------------
"$BIN" sweep plan one.toml --out ONE --mem 500M > /dev/null
"$BIN" sweep plan one.toml --out ONE_LEAN --mem 500M --lean > /dev/null
t0=$(now)
"$BIN" sweep local ONE -j "$(nproc)" > /dev/null
t1=$(now)
"$BIN" sweep local ONE_LEAN -j "$(nproc)" > /dev/null
FULL_KB=$(du -sk ONE/variants/v0000/result | cut -f1)
LEAN_KB=$(du -sk ONE_LEAN/variants/v0000/result | cut -f1)
echo "result folder (91 wl):        ${FULL_KB} KB full, ${LEAN_KB} KB --lean ($(python3 -c "print(f'{$FULL_KB*10000/1024/1024:.1f} GB vs {$LEAN_KB*10000/1024/1024:.1f} GB')") for 10 000 variants); one variant traced in $(secs "$t0" "$t1") s"
ls -l ONE/variants/v0000/result | awk 'NR > 1 { printf "    %-26s %8d B\n", $9, $5 }'

# --- task start-up --------------------------------------------------------------------------
startup() {  # DIR INDEX: "inputs read in X ms" of a task whose variants are all done
  "$BIN" sweep task "$1" --index "$2" -j 1 | sed -n 's/.*inputs read in \([0-9.]*\) ms.*/\1/p'
}
process_ms() {  # DIR INDEX: wall time of the whole process (done variants: start, read, skip, end)
  local a b
  a=$(now)
  "$BIN" sweep task "$1" --index "$2" -j 1 > /dev/null
  b=$(now)
  python3 -c "print(f'{($b - $a) * 1000:.0f}')"
}

# --- fake every variant done from the real result --------------------------------------------
python3 - "$WORK" <<'PY'
import json, os, sys
work = sys.argv[1]
tmpl = os.path.join(work, "ONE", "variants", "v0000", "result")
summary = json.load(open(os.path.join(tmpl, "summary.json")))
for name in ("BIG", "SMALL"):
    d = os.path.join(work, name)
    head = json.load(open(os.path.join(d, "sweep.json")))
    with open(os.path.join(d, "variants.jsonl")) as f:
        for line in f:
            v = json.loads(line)
            r = os.path.join(d, "variants", v["id"], "result")
            os.makedirs(r, exist_ok=True)
            s = dict(summary)
            s.update(sweep_hash=head["sweep_hash"], variant=v["id"], variant_index=v["index"],
                     scene_hash=v["scene_hash"], parameters=dict(zip(head["keys"], v["json"])))
            with open(os.path.join(r, "summary.json"), "w") as out:
                json.dump(s, out, indent=2)
            t = os.path.join(r, "tallies.json")
            if not os.path.exists(t):
                os.link(os.path.join(tmpl, "tallies.json"), t)
PY

S_SMALL=$(startup SMALL 120); S_BIG0=$(startup BIG 0); S_BIG=$(startup BIG $((TASKS / 2))); S_BIGL=$(startup BIG $((TASKS - 1)))
P_SMALL=$(process_ms SMALL 120); P_BIG=$(process_ms BIG $((TASKS / 2)))
echo "task start-up (inputs read):  ${S_SMALL} ms at 240 variants; ${S_BIG0} / ${S_BIG} / ${S_BIGL} ms (first / middle / last task) at 10 000 (target <= 50 ms: $(verdict "$S_BIG" 50))"
echo "task process, variants done:  ${P_SMALL} ms at 240 variants, ${P_BIG} ms at 10 000 (start, read, skip, exit)"

# --- merge and status -------------------------------------------------------------------------
sync
t0=$(now)
/usr/bin/time -f '%U %S' -o merge_cpu.txt "$BIN" sweep merge BIG > merge.txt
t1=$(now)
MERGE_S=$(secs "$t0" "$t1")
MERGE_CPU=$(awk '{ printf "%.2f", $1 + $2 }' merge_cpu.txt)
echo "merge of 10 000 done variants: ${MERGE_S} s wall, ${MERGE_CPU} s CPU (target <= 10 s: $(verdict "$MERGE_S" 10)); $(cat merge.txt)"
t0=$(now)
"$BIN" sweep status BIG --no-slurm > status.txt
t1=$(now)
echo "status, 10 000 done:          $(secs "$t0" "$t1") s"
for v in $(seq 20 9999); do printf 'BIG/variants/v%04d/result\n' "$v"; done | xargs rm -rf
t0=$(now)
"$BIN" sweep status BIG --no-slurm > status_missing.txt || true
t1=$(now)
echo "status, 9 980 missing:        $(secs "$t0" "$t1") s, $(wc -l < status_missing.txt) lines of output"
sed 's/^/    /' status_missing.txt | head -12
