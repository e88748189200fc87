#!/usr/bin/env bash
# One bounded libFuzzer run of a wallrans fuzz target (registered as ctest `fuzz_run_<target>`,
# label `fuzz`; tools/fuzz.sh builds and runs them all).
# Usage: tools/fuzz_run.sh <fuzz program> <seconds> <work dir> <input dir>...
# New corpus entries go to <work dir>/corpus, crash inputs to <work dir>/artifacts/; the input
# directories (kept regressions, seeds) are read, never written. Exits non-zero on a finding.
set -euo pipefail
if [ $# -lt 4 ]; then
  echo "usage: tools/fuzz_run.sh <fuzz program> <seconds> <work dir> <input dir>..." >&2
  exit 2
fi
fuzzer=$1
seconds=$2
work=$3
shift 3
tools="$(cd "$(dirname "${BASH_SOURCE[0]}")" && pwd)"
mkdir -p "$work/corpus" "$work/artifacts"
rm -f "$work/artifacts"/crash-* "$work/artifacts"/leak-* "$work/artifacts"/timeout-* "$work/artifacts"/oom-*
source "$tools/sanitize_env.sh"
# The case loader starts no MPI, and the whole-stack unwinder on every malloc makes it 10 times
# slower (40 against 460 inputs per second, measured), so it records short stacks. The HDF5
# readers keep whole stacks (143 against 125 inputs per second): their leak checks must follow
# Open MPI's and HDF5's stacks into the suppressions.
if [ "$(basename "$fuzzer")" = fuzz_case_loader ]; then
  export ASAN_OPTIONS="$ASAN_OPTIONS:fast_unwind_on_malloc=1"
fi
# -timeout: an input that takes 10 s is a hang (a normal one takes milliseconds).
# -rss_limit_mb: an input that makes a reader use 2 GiB of memory is a finding, not a slow run.
# -malloc_limit_mb: HDF5 allocates the size that a damaged object header claims (a 32-bit length,
# so below 4 GiB) before its read fails, and that memory is never touched (measured: a 3.8 GB
# request while opening a damaged file); larger single requests are findings.
"$fuzzer" -max_total_time="$seconds" -timeout=10 -rss_limit_mb=2048 -malloc_limit_mb=4097 -max_len=65536 -print_final_stats=1 \
  -artifact_prefix="$work/artifacts/" "$work/corpus" "$@"
