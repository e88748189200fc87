#!/usr/bin/env bash
# Builds the libFuzzer targets (tests/fuzz/README.md) with Debian's clang into build-fuzz/ and runs
# each for a bounded time (ctest label `fuzz`: the case loader, the checkpoint reader and the
# grid-file reader, two at a time on 2 cores). Any crash, hang, leak or broken contract fails the
# run; its input is copied to tests/data/fuzz-regressions/<target>/, where the default test
# test_fuzz_replay_<target> replays it from then on (commit it with the fix).
# Usage: tools/fuzz.sh [seconds per target, default 60]   (needs tools/setup-deps.sh --fuzz)
set -euo pipefail

root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
seconds=${1:-60}
build=${FUZZ_BUILD_DIR:-$root/build-fuzz}
targets=(case_loader checkpoint grid_file)

for program in clang clang++; do
  command -v "$program" >/dev/null || {
    echo "fuzz: $program not found; install it with tools/setup-deps.sh --fuzz" >&2
    exit 2
  }
done
# Debug build type for the asserts, -O1 for speed; clang 14 gives warnings GCC does not, which are
# reported but do not stop the build (the GCC build keeps warnings as errors).
cmake -S "$root" -B "$build" -DCMAKE_C_COMPILER=clang -DCMAKE_CXX_COMPILER=clang++ -DCMAKE_BUILD_TYPE=Debug \
  -DCMAKE_C_FLAGS_DEBUG="-g -O1" -DCMAKE_CXX_FLAGS_DEBUG="-g -O1" -DWALLRANS_WERROR=OFF -DWALLRANS_FUZZ=ON \
  -DWALLRANS_FUZZ_SECONDS="$seconds"
cmake --build "$build" -j2 --target fuzz_make_seeds "${targets[@]/#/fuzz_}"

status=0
source "$root/tools/sanitize_env.sh"  # for the seed writer, which the runs need first
ctest --test-dir "$build" -L fuzz -j2 --output-on-failure || status=$?
for target in "${targets[@]}"; do
  for input in "$build/fuzz-work/$target/artifacts"/*; do
    [ -f "$input" ] || continue
    mkdir -p "$root/tests/data/fuzz-regressions/$target"
    cp "$input" "$root/tests/data/fuzz-regressions/$target/"
    echo "fuzz: kept $target input tests/data/fuzz-regressions/$target/$(basename "$input")"
  done
done
exit "$status"
