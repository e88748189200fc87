#!/usr/bin/env bash
# Installs what is missing, builds wallrans into build/ and runs the default test suite
# (unit, coarse verification and program tests: about 7 minutes on 2 cores, plus the build).
# Exits non-zero on failure.
# Usage: tools/test.sh            (from any directory; as root on a fresh Debian 12, or with sudo)
#
# The long validation suite is opt-in (run it after this script has built the tree):
#   ctest --test-dir build -L long --output-on-failure
set -euo pipefail

root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$root"

tools/setup-deps.sh
cmake -S . -B build -DCMAKE_BUILD_TYPE=Release
cmake --build build -j2
ctest --test-dir build -L default --output-on-failure -j2
