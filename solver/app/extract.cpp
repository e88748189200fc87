// The `extract` command: the case and a checkpoint in, wall.csv and the profiles out, computed by
// the same code as at the end of a run (app/run_outputs), so the numbers agree with the run's.
#include "app/extract.hpp"

#include <cerrno>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <filesystem>

#include "app/case_identity.hpp"
#include "app/case_setup.hpp"
#include "app/checkpointing.hpp"
#include "app/run_outputs.hpp"
#include "core/error.hpp"
#include "coupling/flow_solver.hpp"
#include "io/profile_writer.hpp"
#include "io/rank_agreement.hpp"
#include "models/model_factory.hpp"

namespace wallrans {

namespace {

namespace fs = std::filesystem;

// Whether two paths name the same existing folder.
bool same_folder(const fs::path& a, const fs::path& b) {
  std::error_code error;
  return fs::equivalent(a, b, error) && !error;
}

// Local (rank 0). Refuses a target that is a run directory, then creates it.
void prepare_target(const fs::path& into, const fs::path& checkpoint, const fs::path& run_directory) {
  const std::string what = "command line: --into '" + into.string() + "': expected a folder other than ";
  if (same_folder(into, run_directory))
    throw InputError(what + "the case's run directory, got that directory");
  const fs::path checkpoint_folder =
      checkpoint.parent_path().empty() ? fs::path(".") : checkpoint.parent_path();
  if (same_folder(into, checkpoint_folder))
    throw InputError(what + "the checkpoint's folder (a run directory), got that folder");
  std::error_code error;
  if (fs::exists(into / "summary.json", error))
    throw InputError(what + "a run directory, got a folder with summary.json");
  fs::create_directories(into, error);
  if (error || !fs::is_directory(into))
    throw InputError("command line: --into '" + into.string() +
                     "': expected a folder that can be created, got " +
                     (error ? error.message() : "a file of that name"));
}

}  // namespace

std::vector<double> parse_station_list(const std::string& text) {
  std::vector<double> stations;
  size_t start = 0;
  while (true) {
    const size_t end = std::min(text.find(',', start), text.size());
    const std::string item = text.substr(start, end - start);
    char* stop = nullptr;
    errno = 0;
    const double x = item.empty() ? 0.0 : std::strtod(item.c_str(), &stop);
    if (item.empty() || *stop != '\0' || errno != 0 || !std::isfinite(x))
      throw InputError(
          "command line: --stations: expected comma-separated x stations in metres (e.g. 0.5,1.0), got '" +
          text + "'");
    stations.push_back(x);
    if (end == text.size()) break;
    start = end + 1;
  }
  return stations;
}

int extract_from_checkpoint(MPI_Comm comm, const ExtractOptions& options) {
  CaseSetup s = build_case(comm, options.case_file, MemoryUse::run);
  CaseSpec& spec = s.spec;
  const Grid& grid = *s.grid;
  if (options.stations) spec.output.profiles_at_x = *options.stations;
  const std::string origin =
      options.stations ? "command line: --stations" : spec.source_file + ": key 'output.profiles_at_x'";
  for (const double x : spec.output.profiles_at_x) {
    if (profile_column(grid, x) < 0) {
      char text[128];
      std::snprintf(text, sizeof text, ": expected stations between x = %.6g and %.6g (the grid), got %.6g",
                    grid.node(0, 0).x, grid.node(grid.cells_x(), 0).x, x);
      throw InputError(origin + text);
    }
  }
  // The checkpoint is judged before anything is created.
  check_restart_file(comm, options.checkpoint, spec, grid);
  int rank = 0;
  check_mpi(MPI_Comm_rank(comm, &rank));
  std::optional<Failure> failure;
  if (rank == 0)
    failure = attempt([&] { prepare_target(options.into, options.checkpoint, spec.output.directory); });
  agree(comm, failure);

  auto model = make_turbulence_model(spec, grid, *s.boundaries);
  FlowSolver solver(spec, grid, *s.boundaries, *model);
  RunCheckpoints checkpoints(spec, grid, solver, *model, case_identity(spec));
  const int iteration = checkpoints.restart_from(options.checkpoint);
  const RunOutputs outputs =
      write_wall_outputs(spec, *s.boundaries, solver, *model, options.into, true, comm);
  if (rank != 0) return 0;
  for (const std::string& warning : outputs.warnings) std::printf("%s\n", warning.c_str());
  for (const std::string& line : answers_table(outputs.answers)) std::printf("%s\n", line.c_str());
  std::printf("wallrans: wall data and %zu profile station(s) of %s (iteration %d) written to %s\n",
              spec.output.profiles_at_x.size(), options.checkpoint.c_str(), iteration, options.into.c_str());
  return 0;
}

}  // namespace wallrans
