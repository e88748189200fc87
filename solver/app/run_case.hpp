// The `run` and `check` commands: case file -> grid -> solver -> outputs, with monitors.
#pragma once

#include <mpi.h>

#include <optional>
#include <string>

namespace wallrans {

struct RunOptions {
  std::string case_file;
  std::optional<std::string> output_directory;  ///< overrides output.directory
  std::optional<int> max_iterations;            ///< overrides iterations.max
  bool quiet = false;                           ///< no live residual lines
  std::optional<std::string> restart;           ///< overrides checkpoint.restart_from
  std::optional<double> walltime;               ///< overrides checkpoint.walltime [s]
};

/// Exit code of a run stopped early (SIGTERM/SIGINT or wall-clock budget) after writing a
/// checkpoint and flushing every output.
constexpr int exit_stopped_with_checkpoint = 5;

/// Collective. Runs the case to convergence or the iteration cap and writes the outputs.
/// Returns the process exit code (0 converged, 3 not converged within the cap, 4 diverged,
/// 5 stopped early by a signal or the wall-clock budget with a checkpoint written).
/// Throws InputError (identically on all ranks) for bad input before anything is written.
int run_case(MPI_Comm comm, const RunOptions& options);

/// Collective. Loads and validates the case, builds the grid and boundary map, prints a short
/// description with grid-quality figures; writes nothing. Returns 0 or throws InputError.
int check_case(MPI_Comm comm, const std::string& case_file);

/// Collective. Loads and validates the case, builds its grid and boundary map, and writes the
/// grid to `grid_file` in our HDF5 grid layout (docs/grid-file.md) with one patch per boundary
/// segment run. Returns 0 or throws InputError (nothing written).
int write_case_grid(MPI_Comm comm, const std::string& case_file, const std::string& grid_file);

}  // namespace wallrans
