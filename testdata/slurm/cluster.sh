#!/usr/bin/env bash
# A private one-node Slurm cluster on this machine, for the job-array test.
#
#   cluster.sh install     apt-get install slurm-wlm and munge if missing
#   cluster.sh start DIR   write DIR/slurm.conf, start munged, slurmctld and
#                          slurmd with all state, logs, pid files and the
#                          munge socket under DIR; wait until the node is idle
#   cluster.sh stop DIR    stop the three daemons by the pids in their pid files
#
# Nothing under /etc is touched: clients find the cluster through
# SLURM_CONF=DIR/slurm.conf (start prints that line for the caller to export).
# Every wait is bounded. Must run as root (slurmd starts jobs as their owner).
# Ports: MGORBIT_SLURM_PORT (slurmctld, default 16817) and the next one (slurmd).
set -euo pipefail

die() { echo "cluster.sh: $*" >&2; exit 1; }

install() {
  if command -v slurmctld >/dev/null && command -v slurmd >/dev/null &&
     command -v sbatch >/dev/null && command -v munged >/dev/null; then
    echo "slurm-wlm and munge already installed: $(slurmctld -V)"
    return
  fi
  export DEBIAN_FRONTEND=noninteractive
  apt-get update -qq
  apt-get install -y -qq slurm-wlm munge >/dev/null
  echo "installed $(slurmctld -V)"
}

# wait_for SECONDS DESCRIPTION COMMAND...: poll COMMAND once a second.
wait_for() {
  local limit=$1 what=$2
  shift 2
  local i
  for ((i = 0; i < limit; i++)); do
    if "$@" >/dev/null 2>&1; then return 0; fi
    sleep 1
  done
  return 1
}

show_logs() {
  local dir=$1 f
  for f in "$dir"/munged.log "$dir"/slurmctld.log "$dir"/slurmd.log; do
    [ -f "$f" ] || continue
    echo "---- $f (last 30 lines)" >&2
    tail -n 30 "$f" >&2
  done
}

start() {
  local dir=$1
  [ "$(id -u)" = 0 ] || die "must run as root (slurmd starts jobs as their owner)"
  for tool in munged slurmctld slurmd sinfo; do
    command -v "$tool" >/dev/null || die "$tool not found: run '$0 install' first"
  done
  mkdir -p "$dir"
  dir=$(cd "$dir" && pwd)
  chmod 700 "$dir"
  mkdir -p "$dir/state" "$dir/spool" "$dir/munge"
  chmod 700 "$dir/munge"
  local host cpus port
  host=$(hostname -s)
  cpus=$(nproc)
  port=${MGORBIT_SLURM_PORT:-16817}

  # munge: a fresh key of 1024 random bytes, owner-only.
  head -c 1024 /dev/urandom >"$dir/munge/munge.key"
  chmod 400 "$dir/munge/munge.key"
  # As root munged refuses to start without --force.
  munged --force --key-file="$dir/munge/munge.key" --socket="$dir/munge/munge.socket" \
    --pid-file="$dir/munged.pid" --log-file="$dir/munged.log" --seed-file="$dir/munge/munge.seed" ||
    { show_logs "$dir"; die "munged did not start"; }
  wait_for 10 "munge socket" test -S "$dir/munge/munge.socket" ||
    { show_logs "$dir"; die "munge socket $dir/munge/munge.socket did not appear within 10 s"; }

  # No cgroup.conf on purpose: on slurm-wlm 22.05 CgroupPlugin=disabled stops
  # slurmd from starting, and with proctrack/linuxproc none is needed.
  cat >"$dir/slurm.conf" <<EOF
ClusterName=mgorbit
SlurmctldHost=$host
SlurmctldPort=$port
SlurmdPort=$((port + 1))
SlurmUser=root
SlurmdUser=root
AuthType=auth/munge
AuthInfo=socket=$dir/munge/munge.socket
CredType=cred/munge
ProctrackType=proctrack/linuxproc
TaskPlugin=task/none
SelectType=select/cons_tres
SelectTypeParameters=CR_CPU
ReturnToService=2
MpiDefault=none
SchedulerType=sched/backfill
JobCompType=jobcomp/none
JobAcctGatherType=jobacct_gather/none
AccountingStorageType=accounting_storage/none
StateSaveLocation=$dir/state
SlurmdSpoolDir=$dir/spool
SlurmctldPidFile=$dir/slurmctld.pid
SlurmdPidFile=$dir/slurmd.pid
SlurmctldLogFile=$dir/slurmctld.log
SlurmdLogFile=$dir/slurmd.log
SlurmctldTimeout=30
SlurmdTimeout=30
NodeName=$host CPUs=$cpus State=UNKNOWN
PartitionName=mgorbit Nodes=$host Default=YES MaxTime=INFINITE State=UP
EOF
  export SLURM_CONF="$dir/slurm.conf"
  # -c: a clean start, ignoring any saved state.
  slurmctld -c -f "$SLURM_CONF" || { show_logs "$dir"; die "slurmctld did not start"; }
  wait_for 20 "slurmctld" scontrol ping ||
    { show_logs "$dir"; die "slurmctld did not answer scontrol ping within 20 s"; }
  slurmd -f "$SLURM_CONF" || { show_logs "$dir"; die "slurmd did not start"; }
  node_idle() { sinfo -h -N -n "$host" -o '%t' | grep -qE '^(idle|mix|alloc)'; }
  if ! wait_for 30 "node idle" node_idle; then
    sinfo -N -l >&2 || true
    show_logs "$dir"
    die "node $host did not become idle within 30 s"
  fi
  echo "SLURM_CONF=$SLURM_CONF"
}

# stop DIR: TERM to the three daemons at once (by the pids in their pid
# files), up to 10 s for them to exit, then KILL what is left.
stop() {
  local dir=$1 f pid i alive
  [ -d "$dir" ] || return 0
  local pids=()
  for f in "$dir/slurmd.pid" "$dir/slurmctld.pid" "$dir/munged.pid"; do
    [ -f "$f" ] || continue
    pid=$(cat "$f")
    if [ -n "$pid" ] && kill -0 "$pid" 2>/dev/null; then
      kill -TERM "$pid" 2>/dev/null || true
      pids+=("$pid")
    fi
  done
  for ((i = 0; i < 50; i++)); do
    alive=0
    for pid in "${pids[@]}"; do
      kill -0 "$pid" 2>/dev/null && alive=1
    done
    [ "$alive" = 0 ] && break
    sleep 0.2
  done
  for pid in "${pids[@]}"; do
    if kill -0 "$pid" 2>/dev/null; then
      echo "cluster.sh: pid $pid still running after 10 s, sending KILL" >&2
      kill -KILL "$pid" 2>/dev/null || true
    fi
  done
  rm -f "$dir/slurmd.pid" "$dir/slurmctld.pid" "$dir/munged.pid"
}

case "${1:-}" in
  install) install ;;
  start) [ $# -eq 2 ] || die "usage: $0 start DIR"; start "$2" ;;
  stop) [ $# -eq 2 ] || die "usage: $0 stop DIR"; stop "$2" ;;
  *) die "usage: $0 install | start DIR | stop DIR" ;;
esac
