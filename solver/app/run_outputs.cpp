#include "app/run_outputs.hpp"

#include <algorithm>
#include <charconv>
#include <optional>
#include <system_error>

#include "core/error.hpp"
#include "io/profile_writer.hpp"
#include "io/vtk_writer.hpp"

namespace wallrans {

namespace fs = std::filesystem;

void write_fields(const FlowSolver& solver, const TurbulenceModel& model, const fs::path& dir,
                  const std::string& basename) {
  std::vector<NamedScalar> scalars{{"pressure", &solver.pressure()},
                                   {"eddy_viscosity", &solver.eddy_viscosity()},
                                   {"solid", &solver.solid()}};
  for (const auto& [name, field] : model.output_fields()) scalars.push_back({name, field});
  write_vtk_fields(solver.grid(), scalars, {{"velocity", &solver.velocity()}}, dir.string(), basename,
                   &solver.solid());
}

void write_field_series(const fs::path& dir, int final_iteration) {
  std::vector<std::pair<long, std::string>> found;
  std::error_code error;
  for (fs::directory_iterator entry(dir, error), end; !error && entry != end; entry.increment(error)) {
    const std::string name = entry->path().filename().string();
    if (!name.starts_with("fields_") || !name.ends_with(".pvts")) continue;
    const std::string digits = name.substr(7, name.size() - 12);
    long iteration = -1;
    const auto [stop, status] = std::from_chars(digits.data(), digits.data() + digits.size(), iteration);
    if (status == std::errc() && stop == digits.data() + digits.size() && iteration >= 0)
      found.emplace_back(iteration, name);
  }
  if (error) throw Error(dir.string() + ": cannot list the run directory: " + error.message());
  std::sort(found.begin(), found.end());
  const bool has_final_iteration =
      std::any_of(found.begin(), found.end(), [&](const auto& f) { return f.first == final_iteration; });
  if (final_iteration >= 0 && !has_final_iteration && fs::exists(dir / "fields.pvts"))
    found.emplace_back(final_iteration, "fields.pvts");
  std::vector<SeriesEntry> entries;
  for (const auto& [iteration, name] : found) entries.push_back({double(iteration), name});
  write_vtk_series((dir / field_series_name).string(), entries);
}

RunOutputs write_wall_outputs(const CaseSpec& spec, const BoundaryMap& boundaries, FlowSolver& solver,
                              const TurbulenceModel& model, const fs::path& dir, bool with_wall_csv,
                              MPI_Comm comm) {
  solver.refresh_wall_data();
  RunOutputs outputs;
  outputs.answers = compute_answers(comm, spec, boundaries, solver,
                                    with_wall_csv ? std::optional(dir / "wall.csv") : std::nullopt);
  outputs.warnings = write_profiles(spec, solver, model, dir, comm);
  return outputs;
}

RunOutputs write_run_outputs(const CaseSpec& spec, const BoundaryMap& boundaries, FlowSolver& solver,
                             const TurbulenceModel& model, const fs::path& dir, int iteration,
                             MPI_Comm comm) {
  int rank = 0;
  check_mpi(MPI_Comm_rank(comm, &rank));
  write_fields(solver, model, dir, "fields");
  if (rank == 0) write_field_series(dir, iteration);
  return write_wall_outputs(spec, boundaries, solver, model, dir, spec.output.wall_data, comm);
}

}  // namespace wallrans
