#!/usr/bin/env bash
# A one-node SLURM cluster on this machine, for the sweep tests and for
# trying `lumtrap sweep` job arrays without a real cluster (Debian 12,
# slurm-wlm 22.05; run as root; no systemd needed).
#
#   slurm-ci.sh start          installs slurmctld/slurmd/slurm-client/munge if missing
#                              (apt-get), writes /etc/slurm/slurm.conf, starts the daemons
#                              that are not running, and waits (with a timeout) until the
#                              node is idle. Prints "started: NAMES" on stdout: the daemons
#                              this call started (empty when all were running already).
#                              On failure prints the daemons' log tails and exits 1.
#   slurm-ci.sh stop [NAMES]   stops the named daemons (munged slurmctld slurmd); without
#                              names, those that this script started (recorded in
#                              $SLURM_DIR/started). Only PIDs from the daemons' pid files,
#                              checked to still be that daemon, are signalled.
#   slurm-ci.sh status         what runs, and sinfo.
#
# Env: SLURM_DIR (state, logs, pid files; default /tmp/slurm-lumtrap),
#      SLURM_START_TIMEOUT (s, default 60), SLURM_CI_CPUS (job slots, default nproc).
# Pitfalls this handles (PID 1 is no systemd; cgroups; unresolvable host names;
# zombies; stale pid files) are described in the comments below.
set -euo pipefail

SLURM_DIR=${SLURM_DIR:-/tmp/slurm-lumtrap}
START_TIMEOUT=${SLURM_START_TIMEOUT:-60}
CPUS=${SLURM_CI_CPUS:-$(nproc)}
CONF=/etc/slurm/slurm.conf          # the default path sbatch, squeue, ... read
CONF_MARK="# Minimal single-node SLURM for lumtrap tests (written by slurm-ci.sh)"
MUNGE_PID=/run/munge/munged.pid     # munged's default pid file
STARTED_FILE=$SLURM_DIR/started

log() { echo "slurm-ci: $*" >&2; }
die() {
  log "ERROR: $*"
  local f
  for f in "$SLURM_DIR/slurmctld.log" "$SLURM_DIR/slurmd.log" /var/log/munge/munged.log; do
    [ -f "$f" ] && { echo "----- tail $f" >&2; tail -n 25 "$f" >&2; }
  done
  exit 1
}

# alive PIDFILE NAME: the pid file names a live (not zombie) process called NAME.
# kill -0 is not enough: a killed daemon stays a zombie until PID 1 reaps it,
# and a stale pid file may name a reused PID.
alive() {
  local pid
  pid=$(cat "$1" 2>/dev/null) || return 1
  [ -n "$pid" ] && [ -r "/proc/$pid/stat" ] || return 1
  [ "$(cut -d' ' -f3 "/proc/$pid/stat" 2>/dev/null)" != Z ] &&
    [ "$(cat "/proc/$pid/comm" 2>/dev/null)" = "$2" ]
}

pidfile_of() {
  case "$1" in
    munged) echo "$MUNGE_PID" ;;
    slurmctld) echo "$SLURM_DIR/slurmctld.pid" ;;
    slurmd) echo "$SLURM_DIR/slurmd.pid" ;;
    *) die "unknown daemon '$1' (allowed: munged slurmctld slurmd)" ;;
  esac
}

STARTED_NOW=()
record_started() {
  STARTED_NOW+=("$1")
  mkdir -p "$SLURM_DIR"
  grep -qx "$1" "$STARTED_FILE" 2>/dev/null || echo "$1" >> "$STARTED_FILE"
}

install_pkgs() {
  local b
  for b in munged mungekey slurmctld slurmd sbatch; do
    command -v "$b" >/dev/null && continue
    [ "$(id -u)" -eq 0 ] || die "SLURM packages are missing ($b not found) and installing them needs root: run as root, or: apt-get install --no-install-recommends slurmctld slurmd slurm-client munge"
    log "installing slurmctld slurmd slurm-client munge (apt-get)"
    apt-get update -qq || die "apt-get update failed"
    DEBIAN_FRONTEND=noninteractive apt-get install -y -qq --no-install-recommends \
      slurmctld slurmd slurm-client munge >/dev/null || die "apt-get install failed"
    return 0
  done
}

write_conf() {
  local host
  host=$(hostname -s)
  # (also accept a configuration written by an earlier copy of this script)
  if [ -f "$CONF" ] && ! head -1 "$CONF" | grep -q '(written by slurm-ci.sh)$'; then
    die "$CONF exists and was not written by this script; not touching a real SLURM configuration"
  fi
  mkdir -p /etc/slurm "$SLURM_DIR/state" "$SLURM_DIR/slurmd"
  # proctrack/linuxproc + task/none: no cgroups needed (with proctrack/cgroup and
  # no cgroup.conf the first job fails in slurmstepd and the node drains).
  # SlurmctldHost=<host>(127.0.0.1) and NodeAddr: nothing depends on name resolution.
  # batch_sched_delay=0: one scheduling wave per second instead of per 3 s.
  # config_overrides: CPUs may exceed the cores (SLURM_CI_CPUS).
  cat > "$CONF.tmp" <<EOF
$CONF_MARK
ClusterName=lumtrap-ci
SlurmctldHost=${host}(127.0.0.1)
SlurmUser=root
SlurmdUser=root
SlurmdParameters=config_overrides
AuthType=auth/munge
CredType=cred/munge
MpiDefault=none
MailProg=/bin/true
ProctrackType=proctrack/linuxproc
TaskPlugin=task/none
JobAcctGatherType=jobacct_gather/none
AccountingStorageType=accounting_storage/none
JobCompType=jobcomp/none
SchedulerType=sched/backfill
SchedulerParameters=batch_sched_delay=0
SelectType=select/cons_tres
SelectTypeParameters=CR_Core
ReturnToService=2
StateSaveLocation=${SLURM_DIR}/state
SlurmdSpoolDir=${SLURM_DIR}/slurmd
SlurmctldPidFile=${SLURM_DIR}/slurmctld.pid
SlurmdPidFile=${SLURM_DIR}/slurmd.pid
SlurmctldLogFile=${SLURM_DIR}/slurmctld.log
SlurmdLogFile=${SLURM_DIR}/slurmd.log
NodeName=${host} NodeAddr=127.0.0.1 CPUs=${CPUS} RealMemory=1000 State=UNKNOWN
PartitionName=ci Nodes=ALL Default=YES MaxTime=INFINITE State=UP
EOF
  mv "$CONF.tmp" "$CONF"
}

start_munge() {
  local deadline
  if [ ! -s /etc/munge/munge.key ]; then
    log "creating munge key"
    mkdir -p /etc/munge
    mungekey --create --keyfile=/etc/munge/munge.key
  fi
  chown munge:munge /etc/munge /etc/munge/munge.key
  chmod 0700 /etc/munge && chmod 0400 /etc/munge/munge.key
  install -d -o munge -g munge -m 0755 /run/munge     # systemd would create it
  if ! alive "$MUNGE_PID" munged; then
    # as root munged refuses a munge-owned key ("Keyfile is insecure"): run it as munge
    setpriv --reuid=munge --regid=munge --init-groups /usr/sbin/munged || die "munged failed to start"
    record_started munged
  fi
  deadline=$((SECONDS + 15))   # a failing 'munge' call retries by itself for ~2.5 s: use a deadline
  until munge -n </dev/null 2>/dev/null | unmunge >/dev/null 2>&1; do
    [ "$SECONDS" -ge "$deadline" ] && die "munge credential round-trip fails"
    sleep 0.2
  done
}

wait_idle() {
  local host state deadline grace
  host=$(hostname -s)
  deadline=$((SECONDS + START_TIMEOUT))
  grace=$((SECONDS + 3))
  while :; do
    state=$(sinfo -h -N -n "$host" -o '%T' 2>/dev/null || true)
    case "$state" in
      idle | mixed | allocated) log "node $host is $state"; return 0 ;;
      down* | drain*) scontrol update NodeName="$host" State=RESUME >/dev/null 2>&1 || true ;;
    esac
    [ "$SECONDS" -ge "$deadline" ] && die "node $host not idle after ${START_TIMEOUT} s (state '$state')"
    if [ "$SECONDS" -ge "$grace" ]; then   # the daemons fork before their setup can still fail
      alive "$SLURM_DIR/slurmctld.pid" slurmctld || die "slurmctld died"
      alive "$SLURM_DIR/slurmd.pid" slurmd || die "slurmd died"
    fi
    sleep 0.5
  done
}

start() {
  if [ "$(id -u)" -ne 0 ]; then
    # Not root: use a cluster that already runs, or say what is needed.
    if command -v sinfo >/dev/null && sinfo -h -o '%T' 2>/dev/null | grep -Eq 'idle|mixed|allocated'; then
      log "not root: using the SLURM cluster that is already running"
      echo "started:"
      return 0
    fi
    die "starting the SLURM daemons needs root (and no usable cluster is running); run this as root"
  fi
  install_pkgs
  write_conf
  start_munge
  if alive "$SLURM_DIR/slurmctld.pid" slurmctld; then
    scontrol reconfigure >/dev/null 2>&1 || true        # pick up the rewritten conf
  else
    # -c: forget the job and node state of an earlier run, so the node reads
    # "unknown" (not a stale "idle") until slurmd has really registered
    slurmctld -c || die "slurmctld failed to start"
    record_started slurmctld
  fi
  if ! alive "$SLURM_DIR/slurmd.pid" slurmd; then
    slurmd || die "slurmd failed to start"
    record_started slurmd
  fi
  wait_idle
  alive "$SLURM_DIR/slurmctld.pid" slurmctld || die "slurmctld is not running"
  alive "$SLURM_DIR/slurmd.pid" slurmd || die "slurmd is not running"
  log "up: munged $(cat "$MUNGE_PID"), slurmctld $(cat "$SLURM_DIR/slurmctld.pid"), slurmd $(cat "$SLURM_DIR/slurmd.pid")"
  echo "started: ${STARTED_NOW[*]:-}"
}

stop_daemon() {   # NAME
  local file pid i
  file=$(pidfile_of "$1")
  if alive "$file" "$1"; then
    pid=$(cat "$file")
    kill "$pid"
    for i in $(seq 1 100); do alive "$file" "$1" || break; sleep 0.1; done
    if alive "$file" "$1"; then log "$1 ($pid) ignored SIGTERM, sending SIGKILL"; kill -9 "$pid"; fi
    log "stopped $1 ($pid)"
  fi
  if [ -f "$STARTED_FILE" ]; then
    grep -vx "$1" "$STARTED_FILE" > "$STARTED_FILE.tmp" || true
    mv "$STARTED_FILE.tmp" "$STARTED_FILE"
  fi
}

stop() {
  local names=("$@") n
  if [ ${#names[@]} -eq 0 ]; then
    [ -f "$STARTED_FILE" ] && mapfile -t names < "$STARTED_FILE"
  fi
  # slurmd before slurmctld before munged (each needs the next to shut down cleanly)
  for n in slurmd slurmctld munged; do
    if printf '%s\n' "${names[@]:-}" | grep -qx "$n"; then stop_daemon "$n"; fi
  done
  return 0
}

status() {
  local n
  for n in munged slurmctld slurmd; do
    if alive "$(pidfile_of "$n")" "$n"; then echo "$n: running ($(cat "$(pidfile_of "$n")"))"; else echo "$n: not running"; fi
  done
  sinfo 2>/dev/null || true
}

cmd=${1:-}
shift || true
case "$cmd" in
  start) start ;;
  stop) stop "$@" ;;
  status) status ;;
  *) echo "usage: $0 start | stop [munged|slurmctld|slurmd ...] | status" >&2; exit 2 ;;
esac
