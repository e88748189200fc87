#!/usr/bin/env bash
# AddressSanitizer + UndefinedBehaviorSanitizer run of the unit and fast tests, in one command:
# configures build-sanitize/ (GCC, -fsanitize=address,undefined, any undefined behaviour fatal,
# debug asserts on, -O1), builds the tests listed below (and the programs they launch) and runs
# them with the settings of tools/sanitize_env.sh (leaks of our code fail a test; the libraries'
# own are suppressed in tools/sanitize_lsan.supp, each with its reason). Exits non-zero on any
# finding. Usage: tools/sanitize.sh [extra ctest arguments, e.g. -R test_grid]
# Measured: about 35 min to build and 14 min for the tests on 2 busy cores (DEVELOPERS.md).
set -euo pipefail

root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
build=${SANITIZE_BUILD_DIR:-$root/build-sanitize}

# Unit tests (1 and 2 ranks), the fast verification cases, the fuzz replays and the program tests
# of run directories, faults, launchers and grid files. Left out for time: the long verification
# runs (cavity, channel, manufactured solutions: a minute each without sanitizers) and test_cli.
tests=(
  test_grid test_grid_np2 test_boundary_faces test_boundary_faces_np2 test_solid_cells test_solid_cells_np2
  test_case_loader test_vtk_writer test_vtk_writer_np2 test_least_squares_gradient
  test_least_squares_gradient_np2 test_boundary_conditions test_matrix_row test_matrix_row_np2
  test_wall_distance test_wall_distance_np2 test_model_factory test_log_stage test_stencil_matrix
  test_stencil_matrix_np2 test_spalart_allmaras test_baldwin_barth test_k_equation test_mixing_length
  test_checkpoint test_checkpoint_np2 test_nested_start test_nested_start_np2 test_grid_quality
  test_grid_quality_np2 test_grid_file test_grid_file_np2
  test_poiseuille test_blasius test_relaxation_independence test_solid_equivalence test_solid_equivalence_np2
  test_plate_sa test_channel_np2
  test_fuzz_seeds test_fuzz_replay_case_loader test_fuzz_replay_checkpoint test_fuzz_replay_grid_file
  test_run_directory test_launchers test_grid_files
)
# Build targets: a test's own name, except where one program serves several tests.
targets=()
for t in "${tests[@]}"; do
  case "$t" in
    test_fuzz_seeds) targets+=(fuzz_make_seeds) ;;
    test_fuzz_replay_*) targets+=("fuzz_replay_${t#test_fuzz_replay_}") ;;
    *) targets+=("$t") ;;
  esac
done

cmake -S "$root" -B "$build" -DCMAKE_BUILD_TYPE=Debug -DCMAKE_CXX_FLAGS_DEBUG="-g -O1" -DWALLRANS_SANITIZE=ON
cmake --build "$build" -j2 --target "${targets[@]}"
source "$root/tools/sanitize_env.sh"
regex="^($(IFS='|' && echo "${tests[*]}"))\$"
ctest --test-dir "$build" -R "$regex" -j2 --output-on-failure "$@"
