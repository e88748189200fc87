#!/usr/bin/env bash
# Example batch script for a cluster (generic directives: adapt the #SCHED lines to your
# scheduler). It runs a case on N ranks, resumes from the newest checkpoint if the directory
# already has one, and stops cleanly before the time limit: the scheduler's SIGTERM (or the
# --walltime budget) makes wallrans write a checkpoint and exit with code 5; submit the same
# script again to continue.
#
#SCHED --job-name=wallrans_plate
#SCHED --nodes=1
#SCHED --ntasks=8
#SCHED --time=04:00:00
#SCHED --signal=TERM@300          # ask for SIGTERM 5 minutes before the limit
set -euo pipefail

case_file=${CASE_FILE:-configs/plate_sa.yaml}
run_dir=${RUN_DIR:-out/plate_sa}
ranks=${RANKS:-${SLURM_NTASKS:-8}}
budget=${WALLTIME_SECONDS:-14100}   # a little under the 4 h limit

restart=()
newest=$(ls -1 "$run_dir"/checkpoint_*.h5 2>/dev/null | sed 's/.*checkpoint_\([0-9]*\)\.h5/\1 &/' | sort -n | tail -1 | cut -d' ' -f2 || true)
if [ -n "$newest" ]; then
  restart=(--restart "$newest")
  echo "resuming from $newest"
fi

set +e
mpirun -np "$ranks" build/wallrans run "$case_file" --output-dir "$run_dir" --walltime "$budget" "${restart[@]}"
code=$?
set -e
case $code in
  0) echo "converged" ;;
  5) echo "stopped with a checkpoint: submit again to continue" ;;
  *) echo "wallrans exited with code $code"; exit $code ;;
esac
