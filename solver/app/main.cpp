// The wallrans command-line program.
#include <mpi.h>

#include <cstdio>
#include <exception>

#include "app/command_line.hpp"
#include "app/run_case.hpp"
#include "core/error.hpp"
#include "linear/petsc_session.hpp"

int main(int argc, char** argv) {
  wallrans::PetscSession session(&argc, &argv);
  int rank = 0;
  MPI_Comm_rank(MPI_COMM_WORLD, &rank);
  // Every normal outcome (0, 2, 3, 4, 5) is reached by all ranks together with the same code and
  // leaves through the session's MPI_Finalize; only a failure that may be one rank's alone aborts.
  int code = 0;
  try {
    const wallrans::CommandLine a = wallrans::parse_command_line(argc, argv);
    if (a.command == "help") {
      if (rank == 0) std::fputs(a.help.c_str(), stdout);
    } else if (a.command == "version") {
      if (rank == 0) std::printf("wallrans %s\n", WALLRANS_VERSION);
    } else if (a.command == "check") {
      code = wallrans::check_case(MPI_COMM_WORLD, a.run);
    } else if (a.command == "extract") {
      code = wallrans::extract_from_checkpoint(MPI_COMM_WORLD, a.extract);
    } else if (a.command == "write-grid") {
      code = wallrans::write_case_grid(MPI_COMM_WORLD, a.run.case_file, a.grid_file);
    } else {
      code = wallrans::run_case(MPI_COMM_WORLD, a.run);
    }
  } catch (const wallrans::InputError& e) {
    // Input is validated identically on every rank, so every rank lands here together.
    if (rank == 0) std::fprintf(stderr, "wallrans: error: %s\n", e.what());
    code = 2;
  } catch (const std::exception& e) {
    std::fprintf(stderr, "wallrans: rank %d: fatal: %s\n", rank, e.what());
    MPI_Abort(MPI_COMM_WORLD, 1);
  }
  return code;
}
