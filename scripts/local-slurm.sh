#!/usr/bin/env bash
# A single-node Slurm on this machine, for the end-to-end tests of `meltsweep submit`.
#
#   scripts/local-slurm.sh up     start munged, slurmctld and slurmd (as root) and wait until the node is idle
#   scripts/local-slurm.sh down   cancel every job, stop the daemons by the process ids `up` recorded
#   scripts/local-slurm.sh status say whether it is up
#
# Needs root and the Debian packages slurm-wlm and munge. Everything lives in one folder,
# $MELTSWEEP_SLURM_DIR (default /tmp/meltsweep-slurm): a munge key made for it, slurm.conf, state,
# spool, logs and the process ids. Clients find the cluster with SLURM_CONF=$DIR/slurm.conf (the
# tests read it from $DIR/env). When `up` fails, the reason is left in $DIR/unavailable so the tests
# can say why they are skipped. Nothing outside the folder is touched; no process is stopped by name.
set -euo pipefail

DIR="${MELTSWEEP_SLURM_DIR:-/tmp/meltsweep-slurm}"
CONF="$DIR/slurm.conf"

say() { printf 'local-slurm: %s\n' "$*" >&2; }

# record why the cluster is not available (read by the tests), then stop with an error
unavailable() {
  mkdir -p "$DIR"
  printf '%s\n' "$*" >"$DIR/unavailable"
  say "cannot start: $*"
  stop_started
  exit 1
}

# is this port free on every address? (bash's /dev/tcp: a refused connection means free)
port_free() { ! (exec 3<>"/dev/tcp/127.0.0.1/$1") 2>/dev/null; }

# first pair of free consecutive ports from $1 upwards
free_port_pair() {
  local p=$1
  while ((p < $1 + 200)); do
    if port_free "$p" && port_free $((p + 1)); then echo "$p"; return 0; fi
    p=$((p + 2))
  done
  return 1
}

# start a daemon in the foreground flavour, in the background, and record its pid
start_daemon() {
  local name=$1
  shift
  nohup "$@" >"$DIR/log/$name.out" 2>&1 </dev/null &
  echo $! >"$DIR/pids/$name"
}

alive() { [[ -f "$DIR/pids/$1" ]] && kill -0 "$(cat "$DIR/pids/$1")" 2>/dev/null; }

# stop the daemons this script started (by their recorded ids), newest first
stop_started() {
  local name pid i
  for name in slurmd slurmctld munged; do
    [[ -f "$DIR/pids/$name" ]] || continue
    pid=$(cat "$DIR/pids/$name")
    if kill -0 "$pid" 2>/dev/null; then
      kill -TERM "$pid" 2>/dev/null || true
      for i in $(seq 50); do kill -0 "$pid" 2>/dev/null || break; sleep 0.1; done
      kill -0 "$pid" 2>/dev/null && kill -KILL "$pid" 2>/dev/null || true
    fi
    rm -f "$DIR/pids/$name"
  done
}

# the script's own slurmstepd processes (job steps outlive slurmd): found by the spool folder they use
stop_job_steps() {
  local pid
  for pid in $(pgrep -x slurmstepd 2>/dev/null || true); do
    if tr '\0' ' ' <"/proc/$pid/environ" 2>/dev/null | grep -q "SLURM_CONF=$CONF"; then kill -KILL "$pid" 2>/dev/null || true; fi
  done
}

up() {
  [[ $(id -u) == 0 ]] || { mkdir -p "$DIR" 2>/dev/null && echo "not root (slurmd must run as root)" >"$DIR/unavailable"; say "needs root"; exit 1; }
  if alive slurmctld; then say "already up ($CONF)"; return 0; fi
  rm -rf "$DIR"
  mkdir -p "$DIR"/{state,spool,log,pids,munge}
  chmod 0755 "$DIR" "$DIR/munge"
  for cmd in munged mungekey slurmctld slurmd sinfo sbatch; do
    command -v "$cmd" >/dev/null || unavailable "$cmd is not installed (apt-get install slurm-wlm munge)"
  done

  local host cpus mem ports
  host=$(hostname -s)
  [[ -n "$host" ]] || unavailable "hostname -s is empty"
  cpus=$(nproc)
  # slurmd refuses a node that claims more memory than it has: declare a little less
  mem=$(awk '/MemTotal/ { printf "%d", $2 / 1024 * 0.9 }' /proc/meminfo)
  ports=$(free_port_pair 6817) || unavailable "no two free ports from 6817 to 7017"

  # munge: a fresh key for this cluster only, and a socket inside the folder
  mungekey --create --keyfile="$DIR/munge/munge.key" >/dev/null 2>&1 ||
    dd if=/dev/urandom of="$DIR/munge/munge.key" bs=1024 count=1 status=none
  chmod 0400 "$DIR/munge/munge.key"
  start_daemon munged munged --foreground --force \
    --key-file="$DIR/munge/munge.key" --socket="$DIR/munge/munge.socket" \
    --pid-file="$DIR/munge/munged.pid" --seed-file="$DIR/munge/munged.seed" --log-file="$DIR/log/munged.log"
  for _ in $(seq 50); do [[ -S "$DIR/munge/munge.socket" ]] && break; sleep 0.1; done
  [[ -S "$DIR/munge/munge.socket" ]] || unavailable "munged did not start: $(tail -n 3 "$DIR/log/munged.out" "$DIR/log/munged.log" 2>/dev/null | tr '\n' ' ')"

  cat >"$CONF" <<EOF
# single-node Slurm written by scripts/local-slurm.sh for meltsweep's tests
ClusterName=meltsweep-local
SlurmctldHost=$host(127.0.0.1)
SlurmctldPort=$ports
SlurmdPort=$((ports + 1))
SlurmUser=root
SlurmdUser=root
AuthType=auth/munge
CredType=cred/munge
AuthInfo=socket=$DIR/munge/munge.socket
StateSaveLocation=$DIR/state
SlurmdSpoolDir=$DIR/spool
SlurmctldPidFile=$DIR/state/slurmctld.pid
SlurmdPidFile=$DIR/spool/slurmd.pid
SlurmctldLogFile=$DIR/log/slurmctld.log
SlurmdLogFile=$DIR/log/slurmd.log
SlurmctldDebug=info
SlurmdDebug=info
ProctrackType=proctrack/linuxproc
TaskPlugin=task/none
JobAcctGatherType=jobacct_gather/none
AccountingStorageType=accounting_storage/none
JobCompType=jobcomp/none
MpiDefault=none
SelectType=select/cons_tres
SelectTypeParameters=CR_CPU
SchedulerType=sched/backfill
ReturnToService=2
KillWait=5
MinJobAge=600
NodeName=$host NodeAddr=127.0.0.1 CPUs=$cpus RealMemory=$mem State=UNKNOWN
PartitionName=local Nodes=$host Default=YES MaxTime=INFINITE State=UP
EOF
  printf 'export SLURM_CONF=%s\n' "$CONF" >"$DIR/env"

  start_daemon slurmctld slurmctld -D -i -f "$CONF"
  start_daemon slurmd slurmd -D -f "$CONF"

  # wait until the node takes jobs
  local state=""
  for _ in $(seq 150); do
    alive slurmctld || unavailable "slurmctld exited: $(tail -n 5 "$DIR/log/slurmctld.out" "$DIR/log/slurmctld.log" 2>/dev/null | tr '\n' ' ')"
    alive slurmd || unavailable "slurmd exited: $(tail -n 5 "$DIR/log/slurmd.out" "$DIR/log/slurmd.log" 2>/dev/null | tr '\n' ' ')"
    state=$(SLURM_CONF="$CONF" sinfo -h -n "$host" -o %T 2>/dev/null || true)
    [[ "$state" == idle* ]] && break
    sleep 0.2
  done
  [[ "$state" == idle* ]] || unavailable "node $host is not idle after 30 s (state: ${state:-unknown}); see $DIR/log"
  rm -f "$DIR/unavailable"
  say "up: node $host, $cpus CPUs, ports $ports-$((ports + 1)); export SLURM_CONF=$CONF"
}

down() {
  if [[ -f "$CONF" ]] && alive slurmctld; then
    # cancel whatever is still queued or running, then give the steps a moment to end
    SLURM_CONF="$CONF" scancel --quiet --user="$(id -un)" 2>/dev/null || true
    sleep 1
  fi
  stop_started
  stop_job_steps
  say "down"
}

case "${1:-}" in
  up) up ;;
  down) down ;;
  status)
    if alive slurmctld && alive slurmd; then echo "up: SLURM_CONF=$CONF"; else echo "down"; exit 1; fi
    ;;
  *) echo "usage: $0 up|down|status" >&2; exit 2 ;;
esac
