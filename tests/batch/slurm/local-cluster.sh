#!/usr/bin/env bash
# Single-node Slurm cluster on loopback, for bitspan's sbatch end-to-end test.
#
#   local-cluster.sh up    STATE_DIR   install if needed, start, wait for idle;
#                                      last stdout line: SLURM_CONF=<path>
#   local-cluster.sh smoke STATE_DIR   run a 4-task array job and check output
#   local-cluster.sh down  STATE_DIR   stop what `up` started (idempotent)
#
# Exit 3 means "cannot run here" (no root/apt, daemons unavailable); callers
# skip their test on it. Any other non-zero exit is a real failure.
set -euo pipefail

# Fixed, unusual ports so a system Slurm on 6817/6818 is never disturbed.
CTLD_PORT=16817
SLURMD_PORT=16818
IDLE_TIMEOUT=60
JOB_TIMEOUT=120
STOP_TIMEOUT=20

usage() {
  echo "usage: $0 up|down|smoke STATE_DIR" >&2
  exit 2
}

# Callers parse stderr as one reason line, so failures print exactly one.
die() {
  local code=$1
  shift
  echo "local-cluster: $*" >&2
  exit "$code"
}

[[ $# -eq 2 ]] || usage
CMD=$1
[[ -n $2 ]] || usage
# Nothing can be running for a STATE_DIR that does not exist.
if [[ $CMD == down && ! -d $2 ]]; then exit 0; fi
mkdir -p -- "$2"
STATE=$(cd -- "$2" && pwd -P)
CONF=$STATE/slurm.conf
PIDS=$STATE/pids
LOG=$STATE/up.log

log() { printf '%s %s\n' "$(date +%T)" "$*" >>"$LOG"; }

# True if PID is alive and really is the named program (guards PID reuse).
is_ours() {
  local pid=$1 name=$2 comm
  [[ $pid =~ ^[0-9]+$ ]] || return 1
  comm=$(cat "/proc/$pid/comm" 2>/dev/null) || return 1
  [[ $comm == "$name" ]] || return 1
  # A zombie has exited; init may take a while to reap it.
  local stat
  stat=$(cat "/proc/$pid/stat" 2>/dev/null) || return 1
  stat=${stat##*) }
  [[ ${stat:0:1} != Z ]]
}

# setsid/setpriv exec into the daemon, so its comm changes shortly after
# fork; wait for that before comm-based checks, else a fresh start looks dead.
await_exec() {
  local pid=$1 name=$2 i
  for ((i = 0; i < 100; i++)); do
    is_ours "$pid" "$name" && return 0
    kill -0 "$pid" 2>/dev/null || return 1
    sleep 0.05
  done
  return 1
}

stop_pid() {
  local name=$1 pid=$2 grace=${3:-$STOP_TIMEOUT} i
  is_ours "$pid" "$name" || return 0
  kill -TERM "$pid" 2>/dev/null || return 0
  for ((i = 0; i < grace * 10; i++)); do
    is_ours "$pid" "$name" || return 0
    sleep 0.1
  done
  kill -KILL "$pid" 2>/dev/null || true
  for ((i = 0; i < 50; i++)); do
    is_ours "$pid" "$name" || return 0
    sleep 0.1
  done
}

cmd_down() {
  [[ -f $PIDS ]] || return 0
  local name n pid ctld=""
  while read -r n pid; do
    if [[ $n == slurmctld ]] && is_ours "$pid" slurmctld; then ctld=$pid; fi
  done <"$PIDS"
  # Cancel jobs first so their steps end cleanly; only a live controller
  # answers, and asking a dead one would block for its message timeout.
  if [[ -n $ctld && -f $CONF ]]; then
    local ids i
    ids=$(SLURM_CONF=$CONF timeout 10 squeue -h -o %A 2>/dev/null) || true
    if [[ -n $ids ]]; then
      # shellcheck disable=SC2086
      SLURM_CONF=$CONF timeout 10 scancel --quiet $ids >/dev/null 2>&1 || true
      for ((i = 0; i < 20; i++)); do
        ids=$(SLURM_CONF=$CONF timeout 5 squeue -h -o %A 2>/dev/null) || break
        [[ -z $ids ]] && break
        sleep 0.5
      done
    fi
  fi
  # Reverse dependency order: compute node, controller, then auth.
  # Without a controller slurmd sits in connect retries and ignores TERM for
  # ~10 s; it has nothing to save then, so give it a short grace.
  local grace=$STOP_TIMEOUT
  [[ -n $ctld ]] || grace=2
  for name in slurmd slurmctld munged; do
    while read -r n pid; do
      if [[ $n == "$name" ]]; then
        if [[ $n == slurmd ]]; then stop_pid "$n" "$pid" "$grace"; else stop_pid "$n" "$pid"; fi
      fi
    done <"$PIDS"
  done
  # If scancel could not run, step daemons and job scripts outlive slurmd.
  # Each step runs in its own session, so kill the sessions of our steps.
  local f p sids=" " line rest sid
  for f in $(grep -lx slurmstepd /proc/[0-9]*/comm 2>/dev/null || true); do
    p=${f%/comm}
    if tr '\0' '\n' 2>/dev/null <"$p/environ" | grep -qx "SLURM_CONF=$CONF"; then
      read -r line 2>/dev/null <"$p/stat" || continue
      rest=${line##*) }
      read -r _ _ _ sid _ <<<"$rest"
      sids+="$sid "
    fi
  done
  if [[ $sids != " " ]]; then
    for f in /proc/[0-9]*/stat; do
      read -r line 2>/dev/null <"$f" || continue
      rest=${line##*) }
      read -r _ _ _ sid _ <<<"$rest"
      [[ $sids == *" $sid "* ]] && kill -KILL "${f//[!0-9]/}" 2>/dev/null || true
    done
  fi
  rm -f -- "$PIDS"
}

need_install() {
  local c
  for c in sbatch squeue sinfo scancel slurmctld slurmd munged munge unmunge; do
    command -v "$c" >/dev/null 2>&1 || return 0
  done
  return 1
}

install_packages() {
  command -v apt-get >/dev/null 2>&1 || die 3 "slurm/munge missing and apt-get not available"
  log "apt-get install slurm-wlm munge"
  # Keep package scripts from starting system-wide daemons we would not own.
  local made_policy=0
  if [[ ! -e /usr/sbin/policy-rc.d ]]; then
    printf '#!/bin/sh\nexit 101\n' >/usr/sbin/policy-rc.d
    chmod 755 /usr/sbin/policy-rc.d
    made_policy=1
  fi
  local rc=0
  {
    DEBIAN_FRONTEND=noninteractive apt-get -o DPkg::Lock::Timeout=300 -q update &&
      DEBIAN_FRONTEND=noninteractive apt-get -o DPkg::Lock::Timeout=300 -q -y \
        -o Dpkg::Options::=--force-confdef -o Dpkg::Options::=--force-confold \
        install --no-install-recommends slurm-wlm munge
  } </dev/null >>"$LOG" 2>&1 || rc=$?
  if [[ $made_policy -eq 1 ]]; then rm -f /usr/sbin/policy-rc.d; fi
  [[ $rc -eq 0 ]] || die 3 "apt-get install slurm-wlm munge failed (rc=$rc, see $LOG)"
  hash -r
  need_install && die 3 "slurm/munge commands still missing after apt-get install"
  return 0
}

munge_works() {
  munge -n </dev/null 2>/dev/null | unmunge >/dev/null 2>&1
}

start_munge() {
  if munge_works; then
    log "using the munged that is already running"
    return 0
  fi
  getent passwd munge >/dev/null || die 3 "user 'munge' does not exist"
  install -d -m 0700 -o munge -g munge /etc/munge /var/lib/munge /var/log/munge
  install -d -m 0755 -o munge -g munge /run/munge
  if [[ ! -s /etc/munge/munge.key ]]; then
    log "writing /etc/munge/munge.key"
    (umask 077 && dd if=/dev/urandom of=/etc/munge/munge.key bs=1024 count=1 status=none)
  fi
  chown munge:munge /etc/munge/munge.key
  chmod 0400 /etc/munge/munge.key
  # A stale socket from a killed munged blocks startup; --force replaces it.
  setsid setpriv --reuid=munge --regid=munge --init-groups \
    "$(command -v munged)" -F --force </dev/null >>"$STATE/log/munged.out" 2>&1 &
  local pid=$!
  disown "$pid"
  echo "munged $pid" >>"$PIDS"
  local i
  await_exec "$pid" munged || true
  for ((i = 0; i < 100; i++)); do
    munge_works && return 0
    is_ours "$pid" munged || break
    sleep 0.1
  done
  local why
  why=$(grep -m1 -E 'Error|Fatal' "$STATE/log/munged.out" 2>/dev/null || tail -n 1 "$STATE/log/munged.out")
  cmd_down
  die 3 "munged did not start: $why"
}

# Memory slurmd will find, capped by /proc and any cgroup limit, in MiB.
mem_limit_mb() {
  local mb lim f
  mb=$(awk '/^MemTotal:/ {print int($2 / 1024)}' /proc/meminfo)
  for f in /sys/fs/cgroup/memory.max /sys/fs/cgroup/memory/memory.limit_in_bytes; do
    lim=$(cat "$f" 2>/dev/null) || continue
    [[ $lim =~ ^[0-9]+$ ]] || continue
    lim=$((lim / 1024 / 1024))
    ((lim < mb)) && mb=$lim
  done
  echo "$mb"
}

node_line() {
  local line mem cap
  line=$(slurmd -C 2>/dev/null | grep -m1 '^NodeName=') || true
  if [[ -z $line ]]; then
    line="NodeName=$(uname -n | cut -d. -f1) CPUs=$(nproc) RealMemory=0"
  fi
  mem=$(sed -n 's/.*RealMemory=\([0-9]*\).*/\1/p' <<<"$line")
  cap=$(mem_limit_mb)
  [[ -n $mem && $mem -gt 0 && $mem -lt $cap ]] || mem=$cap
  # 5% headroom: the node drains if configured memory exceeds what it sees.
  mem=$((mem * 95 / 100))
  ((mem >= 1)) || mem=1
  line=$(sed "s/RealMemory=[0-9]*/RealMemory=$mem/" <<<"$line")
  grep -q RealMemory= <<<"$line" || line="$line RealMemory=$mem"
  echo "$line"
}

write_conf() {
  local slurm_user=$1 node=$2 nodename=$3
  cat >"$CONF" <<EOF
# Generated by local-cluster.sh; wiped and rewritten on every "up".
ClusterName=bitspan
SlurmctldHost=$nodename(127.0.0.1)
SlurmctldPort=$CTLD_PORT
SlurmdPort=$SLURMD_PORT
SlurmUser=$slurm_user
SlurmdUser=root
AuthType=auth/munge
CredType=cred/munge
MpiDefault=none
MailProg=/bin/true
ProctrackType=proctrack/linuxproc
TaskPlugin=task/none
JobAcctGatherType=jobacct_gather/none
AccountingStorageType=accounting_storage/none
SelectType=select/cons_tres
SelectTypeParameters=CR_Core
SchedulerType=sched/backfill
SchedulerParameters=batch_sched_delay=0
ReturnToService=2
StateSaveLocation=$STATE/ctld
SlurmdSpoolDir=$STATE/spool
SlurmctldPidFile=$STATE/run/slurmctld.pid
SlurmdPidFile=$STATE/run/slurmd.pid
SlurmctldLogFile=$STATE/log/slurmctld.log
SlurmdLogFile=$STATE/log/slurmd.log
SlurmctldDebug=info
SlurmdDebug=info
SlurmctldTimeout=60
SlurmdTimeout=60
InactiveLimit=0
KillWait=5
MinJobAge=300
$node NodeAddr=127.0.0.1 State=UNKNOWN
PartitionName=debug Nodes=ALL Default=YES MaxTime=INFINITE State=UP
EOF
  chmod 0644 "$CONF"
}

start_daemon() {
  local name=$1
  shift
  setsid "$@" </dev/null >>"$STATE/log/$name.out" 2>&1 &
  local pid=$!
  # Detach from job control so a kill in the failure path stays silent.
  disown "$pid"
  echo "$name $pid" >>"$PIDS"
  await_exec "$pid" "$name" || true
  log "started $name pid $pid"
}

daemon_reason() {
  local name=$1 f
  # The fatal line names the cause; plain errors are often harmless noise.
  for f in "$STATE/log/$name.log" "$STATE/log/$name.out"; do
    if [[ -s $f ]]; then
      grep -m1 'fatal:' "$f" || grep 'error:' "$f" | tail -n 1 | grep . || tail -n 1 "$f"
      return
    fi
  done
  echo "no log"
}

cmd_up() {
  [[ $(id -u) -eq 0 ]] || die 3 "must run as root to start slurm daemons"
  cmd_down
  # Wipe only what this script manages; STATE_DIR may hold the caller's files.
  rm -rf -- "$STATE/ctld" "$STATE/spool" "$STATE/log" "$STATE/run" "$CONF" "$LOG"
  rm -f -- "$STATE"/out.* "$STATE"/slurm-*.out
  mkdir -p "$STATE/log"
  : >"$PIDS"
  log "up $STATE"

  if need_install; then install_packages; fi
  start_munge

  # The controller drops to SlurmUser; fall back to root when that user is
  # absent or cannot reach STATE_DIR (e.g. it lives under a 0700 home).
  local slurm_user=root
  if getent passwd slurm >/dev/null &&
    runuser -u slurm -- test -x "$STATE" 2>/dev/null; then
    slurm_user=slurm
  fi
  install -d -m 0755 -o "$slurm_user" "$STATE/ctld" "$STATE/run"
  install -d -m 0755 -o "$slurm_user" "$STATE/log"
  install -d -m 0755 "$STATE/spool"

  local node nodename
  node=$(node_line)
  nodename=$(sed -n 's/^NodeName=\([^ ]*\).*/\1/p' <<<"$node")
  write_conf "$slurm_user" "$node" "$nodename"
  log "node: $node (SlurmUser=$slurm_user)"

  export SLURM_CONF=$CONF
  start_daemon slurmctld "$(command -v slurmctld)" -D -f "$CONF"
  start_daemon slurmd "$(command -v slurmd)" -D -f "$CONF" -N "$nodename"

  local i state="" name pid
  for ((i = 0; i < IDLE_TIMEOUT * 2; i++)); do
    while read -r name pid; do
      [[ $name == slurmctld || $name == slurmd ]] || continue
      if ! is_ours "$pid" "$name"; then
        local why
        why=$(daemon_reason "$name")
        cmd_down
        die 3 "$name exited at startup: $why"
      fi
    done <"$PIDS"
    state=$(timeout 3 sinfo -h -o %T 2>/dev/null | head -n1) || true
    [[ $state == idle ]] && break
    sleep 0.5
  done
  if [[ $state != idle ]]; then
    cmd_down
    die 1 "node not idle after ${IDLE_TIMEOUT}s (state '${state:-none}', logs in $STATE/log)"
  fi
  log "idle after ~$((i / 2))s"
  echo "SLURM_CONF=$CONF"
}

cmd_smoke() {
  [[ -f $CONF ]] || die 1 "no $CONF; run '$0 up $STATE' first"
  export SLURM_CONF=$CONF
  rm -f -- "$STATE"/out.* "$STATE"/slurm-*.out
  local id
  # Single quotes: the task id must expand on the node, not here.
  # shellcheck disable=SC2016
  # stderr kept apart: sbatch may warn on success, and stdout must be the id.
  id=$(sbatch --parsable --array=0-3 --output="$STATE/slurm-%A_%a.out" \
    --wrap 'echo $SLURM_ARRAY_TASK_ID > '"$STATE"'/out.$SLURM_ARRAY_TASK_ID' \
    2>"$STATE/sbatch.err") || die 1 "sbatch failed: $(tail -n 1 "$STATE/sbatch.err")"
  id=${id%%;*}
  [[ $id =~ ^[0-9]+$ ]] || die 1 "sbatch gave no job id: $id"

  local i out rc
  for ((i = 0; i < JOB_TIMEOUT * 2; i++)); do
    rc=0
    out=$(squeue -h -j "$id" 2>&1) || rc=$?
    if [[ $rc -eq 0 && -z $out ]]; then break; fi
    # Jobs purged from the controller count as finished.
    if [[ $rc -ne 0 && $out == *"Invalid job id"* ]]; then break; fi
    sleep 0.5
  done
  ((i < JOB_TIMEOUT * 2)) || die 1 "array job $id still queued after ${JOB_TIMEOUT}s"

  local t got
  for t in 0 1 2 3; do
    got=$(cat "$STATE/out.$t" 2>/dev/null) || die 1 "array job $id: task $t wrote no $STATE/out.$t"
    [[ $got == "$t" ]] || die 1 "array job $id: out.$t holds '$got', expected '$t'"
  done
  echo "smoke ok: array job $id, 4 tasks"
}

case $CMD in
  up) cmd_up ;;
  down) cmd_down ;;
  smoke) cmd_smoke ;;
  *) usage ;;
esac
