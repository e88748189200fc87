// The wallrans command-line program.
#include <mpi.h>

#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <exception>
#include <string>
#include <vector>

#include "app/run_case.hpp"
#include "core/error.hpp"
#include "linear/petsc_session.hpp"

namespace {

constexpr const char* usage =
    "usage: wallrans <command> [arguments]\n"
    "  run CASE.yaml [--output-dir DIR] [--max-iterations N] [--quiet] [--walltime S]\n"
    "                [--restart FILE.h5 | --resume] [--replace-results]\n"
    "                  solve the case; writes fields (VTK), residuals.csv, wall.csv, checkpoints and\n"
    "                  summary.json (whose \"status\" says how the run ended) into the run directory\n"
    "  check CASE.yaml [same options as run]\n"
    "                  make every check run makes before it starts iterating; writes nothing\n"
    "  write-grid CASE.yaml GRID.h5\n"
    "                  write the case's grid with its boundary patches (docs/grid-file.md)\n"
    "  version         print the version\n"
    "  --max-iterations N   iterations of this run (also after a restart), overrides iterations.max;\n"
    "                       0 writes the starting state (e.g. a restart checkpoint) again\n"
    "  --restart FILE.h5    continue from this checkpoint\n"
    "  --resume             continue from this case's newest checkpoint in the run directory, if any\n"
    "  --replace-results    delete another case's results from the run directory before running\n"
    "  --walltime S         write a checkpoint and stop before S seconds of wall-clock time\n"
    "PETSc options for the linear solvers go last, e.g. -pressure_ksp_rtol 1e-3\n"
    "(prefixes: -momentum_, -pressure_, -turbulence_).\n"
    "exit codes: 0 converged/valid, 2 bad input or run directory in use, 3 iteration cap reached,\n"
    "            4 diverged, 5 stopped by SIGTERM/SIGINT/SIGUSR1 or the wall-clock budget (checkpoint\n"
    "            written), 1 other failure\n";

struct Arguments {
  std::string command;
  wallrans::RunOptions run;
  std::string grid_file;  ///< write-grid: the file to write
};

int parse_int(const std::string& flag, const char* text, int minimum = 1) {
  char* end = nullptr;
  const long value = std::strtol(text, &end, 10);
  if (*text == '\0' || *end != '\0' || value < minimum || value > 1000000000) {
    throw wallrans::InputError("command line: " + flag + ": expected an integer >= " + std::to_string(minimum) +
                               ", got '" + text + "'");
  }
  return static_cast<int>(value);
}

// Our own arguments come first: the command, its case file and "--" options. The first
// single-dash word starts the PETSc options, which PETSc has already read in PetscInitialize;
// everything from there on is left to PETSc.
Arguments parse(int argc, char** argv) {
  Arguments a;
  std::vector<std::string> positional;
  for (int k = 1; k < argc; ++k) {
    const std::string arg = argv[k];
    if (arg == "--help" || arg == "-h") {
      a.command = "help";
      return a;
    }
    if (arg.rfind("--", 0) == 0) {
      auto value = [&]() -> const char* {
        if (k + 1 >= argc) throw wallrans::InputError("command line: " + arg + ": expected a value after it");
        return argv[++k];
      };
      if (arg == "--output-dir")
        a.run.output_directory = value();
      else if (arg == "--max-iterations")
        a.run.max_iterations = parse_int(arg, value(), 0);  // 0: write the starting state again
      else if (arg == "--quiet")
        a.run.quiet = true;
      else if (arg == "--restart")
        a.run.restart = value();
      else if (arg == "--walltime")
        a.run.walltime = parse_int(arg, value());
      else if (arg == "--resume")
        a.run.resume = true;
      else if (arg == "--replace-results")
        a.run.replace_results = true;
      else
        throw wallrans::InputError("command line: unknown option '" + arg +
                                   "'; expected --output-dir, --max-iterations, --quiet, --restart, "
                                   "--resume, --replace-results or --walltime");
      continue;
    }
    if (arg.size() > 1 && arg[0] == '-') {
      if (positional.empty()) {
        throw wallrans::InputError("command line: PETSc option '" + arg +
                                   "': expected it after the command and case file");
      }
      break;
    }
    positional.push_back(arg);
  }
  if (positional.empty())
    throw wallrans::InputError("command line: expected a command (run, check, write-grid, version)");
  a.command = positional[0];
  if (a.command == "version") return a;
  if (a.command == "write-grid") {
    if (positional.size() != 3) {
      throw wallrans::InputError("command line: write-grid: expected a case file and a grid file, got " +
                                 std::to_string(positional.size() - 1) + " argument(s)");
    }
    a.run.case_file = positional[1];
    a.grid_file = positional[2];
    return a;
  }
  if (a.command != "run" && a.command != "check") {
    throw wallrans::InputError("command line: unknown command '" + a.command +
                               "'; expected run, check, write-grid or version");
  }
  if (positional.size() != 2) {
    throw wallrans::InputError("command line: " + a.command + ": expected exactly one case file, got " +
                               std::to_string(positional.size() - 1));
  }
  a.run.case_file = positional[1];
  if (a.run.resume && a.run.restart) {
    throw wallrans::InputError(
        "command line: --resume: expected either --resume or --restart FILE, got both");
  }
  return a;
}

}  // namespace

int main(int argc, char** argv) {
  wallrans::PetscSession session(&argc, &argv);
  int rank = 0;
  MPI_Comm_rank(MPI_COMM_WORLD, &rank);
  // Every normal outcome (0, 2, 3, 4, 5) is reached by all ranks together with the same code and
  // leaves through the session's MPI_Finalize; only a failure that may be one rank's alone aborts.
  int code = 0;
  try {
    const Arguments a = parse(argc, argv);
    if (a.command == "help") {
      if (rank == 0) std::fputs(usage, stdout);
    } else if (a.command == "version") {
      if (rank == 0) std::printf("wallrans %s\n", WALLRANS_VERSION);
    } else if (a.command == "check") {
      code = wallrans::check_case(MPI_COMM_WORLD, a.run);
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
