// The `run` and `check` commands: case file -> grid -> run directory -> solver -> outputs.
#pragma once

#include <mpi.h>

#include <optional>
#include <string>

namespace wallrans {

struct RunOptions {
  std::string case_file;
  std::optional<std::string> output_directory;  ///< overrides output.directory
  /// Overrides iterations.max. Both count the iterations of this run, also after a restart.
  std::optional<int> max_iterations;
  bool quiet = false;                  ///< no live residual lines
  std::optional<std::string> restart;  ///< overrides checkpoint.restart_from
  bool resume = false;                 ///< continue from this case's newest checkpoint in the run directory
  bool replace_results = false;        ///< delete another case's results in the run directory first
  std::optional<double> walltime;      ///< overrides checkpoint.walltime [s]
};

/// Collective. Runs the case to convergence or the iteration cap and writes the outputs; every
/// ending leaves summary.json saying how the run ended. Returns the process exit code (0
/// converged, 3 not converged within the cap, 4 diverged, 5 stopped early by a signal or the
/// wall-clock budget with a checkpoint written). Throws InputError (identically on all ranks) for
/// bad input, before anything is written; Error for other failures (summary status "failed").
int run_case(MPI_Comm comm, const RunOptions& options);

/// Collective. Runs every check `run` makes before it builds the solver (case, grid, boundary
/// map, model, run directory, restart checkpoint) and prints a short description with
/// grid-quality figures; writes nothing. Returns 0 or throws InputError.
int check_case(MPI_Comm comm, const RunOptions& options);

/// Collective. Loads and validates the case, builds its grid and boundary map, and writes the
/// grid to `grid_file` in our HDF5 grid layout (docs/grid-file.md) with one patch per boundary
/// segment run, and beside it the same grid for a viewer (<stem>.pvts and one <stem>_<rank>.vts
/// per rank, cell data "solid"). Returns 0 or throws InputError (nothing written).
int write_case_grid(MPI_Comm comm, const std::string& case_file, const std::string& grid_file);

}  // namespace wallrans
