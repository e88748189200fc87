#!/usr/bin/env bash
# A private single-node Slurm for the scheduler test (tests/scheduler/README.md): its own munge
# key and socket, slurm.conf, state, spool, logs and ports under <dir>, so it never touches
# /etc/slurm, /etc/munge or a Slurm that already runs on this machine.
#   single_node_slurm.sh start <dir>   exit 0: up (clients need SLURM_CONF=<dir>/slurm.conf);
#                                      exit 77: Slurm cannot start here (the reason on stderr)
#   single_node_slurm.sh stop <dir>    cancels its jobs and stops its daemons (by their pid files)
# Needs root and Debian's slurmd slurmctld slurm-client munge (tools/setup-deps.sh --scheduler).
set -uo pipefail

cannot_start() {
  echo "single_node_slurm: Slurm cannot start here: $*" >&2
  exit 77
}

# A TCP port on 127.0.0.1 that nothing listens on, from a range kept apart from Slurm's defaults.
free_port() {
  local port
  for _ in $(seq 1 200); do
    port=$((20000 + RANDOM % 20000))
    if ! (exec 3<>"/dev/tcp/127.0.0.1/$port") 2>/dev/null; then
      echo "$port"
      return 0
    fi
  done
  return 1
}

start() {
  local dir=$1
  [ "$(id -u)" -eq 0 ] || cannot_start "the daemons need root (slurmd starts jobs as their user)"
  local missing=()
  for program in munged munge slurmctld slurmd sbatch squeue scontrol scancel sinfo; do
    command -v "$program" >/dev/null || missing+=("$program")
  done
  [ ${#missing[@]} -eq 0 ] ||
    cannot_start "${missing[*]} not found (apt-get install slurmd slurmctld slurm-client munge, or tools/setup-deps.sh --scheduler)"
  mkdir -p "$dir"
  dir=$(cd "$dir" && pwd)
  # munged wants its socket directory searchable by all and its key readable by its user only.
  chmod 755 "$dir"
  mkdir -p "$dir/munge" "$dir/state" "$dir/spool"
  chmod 755 "$dir/munge"
  head -c 1024 /dev/urandom >"$dir/munge/munge.key"
  chmod 400 "$dir/munge/munge.key"
  munged --socket="$dir/munge/socket" --key-file="$dir/munge/munge.key" --log-file="$dir/munge/munged.log" \
    --pid-file="$dir/munge/munged.pid" --seed-file="$dir/munge/munged.seed" 2>"$dir/munge/start.err" ||
    cannot_start "munged did not start: $(tail -n 1 "$dir/munge/start.err")"

  local host controller_port node_port
  host=$(hostname -s)
  controller_port=$(free_port) && node_port=$(free_port) || cannot_start "no free TCP port found"
  [ "$controller_port" != "$node_port" ] || node_port=$((controller_port + 1))
  cat >"$dir/slurm.conf" <<CONF
# Written by tests/scheduler/single_node_slurm.sh for one test run.
ClusterName=wallrans_test
SlurmctldHost=$host(127.0.0.1)
SlurmctldPort=$controller_port
SlurmdPort=$node_port
SlurmUser=root
SlurmdUser=root
AuthType=auth/munge
CredType=cred/munge
AuthInfo=socket=$dir/munge/socket
ProctrackType=proctrack/linuxproc
TaskPlugin=task/none
SelectType=select/cons_tres
SelectTypeParameters=CR_CPU
MpiDefault=none
ReturnToService=2
JobAcctGatherType=jobacct_gather/none
AccountingStorageType=accounting_storage/none
StateSaveLocation=$dir/state
SlurmdSpoolDir=$dir/spool
SlurmctldPidFile=$dir/slurmctld.pid
SlurmdPidFile=$dir/slurmd.pid
SlurmctldLogFile=$dir/slurmctld.log
SlurmdLogFile=$dir/slurmd.log
NodeName=$host NodeAddr=127.0.0.1 CPUs=$(nproc) State=UNKNOWN
PartitionName=wallrans_test Nodes=$host Default=YES MaxTime=INFINITE State=UP
CONF
  export SLURM_CONF="$dir/slurm.conf"
  slurmctld -c -f "$SLURM_CONF" 2>"$dir/slurmctld.err" ||
    cannot_start "slurmctld did not start: $(tail -n 1 "$dir/slurmctld.err") (log: $dir/slurmctld.log)"
  slurmd -f "$SLURM_CONF" 2>"$dir/slurmd.err" ||
    cannot_start "slurmd did not start: $(tail -n 1 "$dir/slurmd.err") (log: $dir/slurmd.log)"
  for _ in $(seq 1 150); do
    if [ "$(sinfo -h -o %T 2>/dev/null)" = idle ]; then
      echo "single_node_slurm: node $host idle (SLURM_CONF=$SLURM_CONF)"
      return 0
    fi
    sleep 0.2
  done
  cannot_start "node $host not idle after 30 s (sinfo: $(sinfo -h -o %T 2>&1); logs: $dir/slurmctld.log, $dir/slurmd.log)"
}

# Ends the process of pid file $1: TERM, then KILL after 10 s.
stop_daemon() {
  local pid
  pid=$(cat "$1" 2>/dev/null) || return 0
  kill -TERM "$pid" 2>/dev/null || return 0
  for _ in $(seq 1 50); do
    kill -0 "$pid" 2>/dev/null || return 0
    sleep 0.2
  done
  kill -KILL "$pid" 2>/dev/null
}

stop() {
  local dir=$1
  export SLURM_CONF="$dir/slurm.conf"
  if [ -f "$SLURM_CONF" ]; then
    local jobs
    jobs=$(squeue -h -o %i 2>/dev/null)
    # shellcheck disable=SC2086
    [ -z "$jobs" ] || scancel --full $jobs 2>/dev/null
  fi
  stop_daemon "$dir/slurmd.pid"
  stop_daemon "$dir/slurmctld.pid"
  stop_daemon "$dir/munge/munged.pid"
}

case "${1:-}" in
  start) start "${2:?usage: single_node_slurm.sh start <dir>}" ;;
  stop) stop "${2:?usage: single_node_slurm.sh stop <dir>}" ;;
  *)
    echo "usage: single_node_slurm.sh start|stop <dir>" >&2
    exit 2
    ;;
esac
