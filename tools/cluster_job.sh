#!/bin/bash
# Batch script for a wallrans run under Slurm: `sbatch tools/cluster_job.sh` from the repository
# root (settings below, or as environment variables: CASE_FILE=... RUN_DIR=... sbatch ...).
#
# The run continues from this case's newest checkpoint in RUN_DIR, if there is one (`--resume`:
# wallrans picks it and never another case's file). Before the time limit Slurm sends USR1 to this
# shell (--signal=B:USR1@300); the shell passes USR1 to mpirun, which forwards it to every rank:
# wallrans writes a checkpoint, every output and summary.json, and mpirun exits 5. TERM and INT
# (scancel --signal=TERM, Ctrl-C) are trapped and handled the same way. The shell then waits for
# the run to end and decides from the "status" in summary.json, not from mpirun's exit code (Open
# MPI's mpirun turns a TERM it receives itself into exit code 1; see README, Signals and launchers).
# With RESUBMIT=1 a run stopped by the time limit submits this script again.
#
# Other schedulers: put the same settings into their directives (PBS/Torque: #PBS -l nodes=1:ppn=2,
# -l walltime=04:00:00, and ask for a warning signal or pass --walltime; LSF: #BSUB -n 2, -W 4:00,
# -wa USR1 -wt 5), keep the trap/forward/wait/decide part as it is, and replace `sbatch` in the
# resubmission by the scheduler's submit command.
#
#SBATCH --job-name=wallrans
#SBATCH --nodes=1
#SBATCH --ntasks=2
#SBATCH --time=04:00:00
#SBATCH --signal=B:USR1@300
#SBATCH --output=wallrans-%j.log
#SBATCH --open-mode=append

set -u

case_file=${CASE_FILE:-configs/plate_sa.yaml}
run_dir=${RUN_DIR:-out/plate_sa}
ranks=${RANKS:-${SLURM_NTASKS:-2}}
program=${WALLRANS:-build/wallrans}
launcher=${MPIRUN:-mpirun}
extra=()
if [ -n "${WALLTIME_SECONDS:-}" ]; then extra+=(--walltime "$WALLTIME_SECONDS"); fi
# Open MPI's mpirun answers a TERM of its own with CONT to the ranks, TERM after this many seconds
# and KILL after as many again (default 1 s: too short for a checkpoint of a large case).
export OMPI_MCA_odls_base_sigkill_timeout=${STOP_GRACE_SECONDS:-60}

say() { echo "cluster_job: $*"; }

solver=""
stop_signal=""
forward() {
  stop_signal=$1
  say "$1 received; asking wallrans to stop with a checkpoint"
  if [ -n "$solver" ]; then kill -USR1 "$solver" 2>/dev/null; fi
}
trap 'forward USR1' USR1
trap 'forward TERM' TERM
trap 'forward INT' INT

if [ -n "$stop_signal" ]; then
  say "$stop_signal arrived before the run started; nothing was run"
  exit 5
fi
# A run that starts rewrites summary.json (status "running"); one that did not start leaves it as it was.
summary_before=$(cksum < "$run_dir/summary.json" 2>/dev/null)
"$launcher" -np "$ranks" "$program" run "$case_file" --output-dir "$run_dir" --resume "${extra[@]}" &
solver=$!
# `wait` returns early when a trapped signal arrives: wait until the launcher has really ended
# (a finished but unreaped child still answers kill -0).
while :; do
  wait "$solver"
  code=$?
  kill -0 "$solver" 2>/dev/null || break
done

status=""
checkpoint=""
if [ -f "$run_dir/summary.json" ] && [ "$(cksum < "$run_dir/summary.json")" != "$summary_before" ]; then
  status=$(sed -n 's/^ *"status": "\([a-z]*\)".*/\1/p' "$run_dir/summary.json" | head -n 1)
  checkpoint=$(sed -n 's/^ *"checkpoint": "\(.*\)".*/\1/p' "$run_dir/summary.json" | head -n 1)
fi
case "$status" in
  converged)
    say "converged; results in $run_dir"
    exit 0
    ;;
  capped)
    say "iteration cap reached (checkpoint $checkpoint); submit again for more iterations"
    exit 3
    ;;
  diverged)
    say "diverged; see $run_dir/summary.json and residuals.csv"
    exit 4
    ;;
  stopped)
    say "stopped with checkpoint $run_dir/$checkpoint; submitting again continues from it"
    if [ "${RESUBMIT:-0}" = 1 ] && [ "$stop_signal" = USR1 ] && command -v sbatch >/dev/null; then
      sbatch "$0" && say "resubmitted"
    fi
    exit 5
    ;;
  failed)
    say "failed; see $run_dir/summary.json (detail) and this job's log"
    exit 1
    ;;
  running)
    say "the run ended without recording how (killed?); submitting again continues from this case's newest checkpoint"
    exit 1
    ;;
  *)
    # No new summary: the run did not start (bad input or the directory in use: wallrans's
    # one-line message is in this job's log).
    say "wallrans did not start a run (launcher exit code $code)"
    exit "$code"
    ;;
esac
