// The files a run writes besides its history and checkpoints: the VTK fields (final and
// intermediate, with the .pvd series), wall.csv, the profiles, and the answers for summary.json.
#pragma once

#include <mpi.h>

#include <filesystem>
#include <string>
#include <vector>

#include "app/run_answers.hpp"
#include "core/case_spec.hpp"
#include "coupling/flow_solver.hpp"
#include "grid/boundary.hpp"
#include "models/turbulence_model.hpp"

namespace wallrans {

/// The series of field files of a run directory, listed in this file.
inline constexpr const char* field_series_name = "fields.pvd";

/// Collective. Writes <dir>/<basename>.pvts and its pieces: pressure, eddy viscosity, the solid
/// marker, the model's output fields and the velocity, as cell data and (solid cells left out of
/// the averages) as point data.
void write_fields(const FlowSolver& solver, const TurbulenceModel& model, const std::filesystem::path& dir,
                  const std::string& basename);

/// Local (rank 0). Rewrites <dir>/fields.pvd listing the intermediate fields fields_<N>.pvts in
/// the directory by iteration N, and the final fields.pvts at `final_iteration` (if >= 0 and no
/// fields_<N> has that iteration).
void write_field_series(const std::filesystem::path& dir, int final_iteration);

/// What write_run_outputs produced for the summary and the terminal.
struct RunOutputs {
  RunAnswers answers;                 ///< complete on rank 0
  std::vector<std::string> warnings;  ///< for rank 0 to print
};

/// Collective. Refreshes the solver's wall data (FlowSolver::refresh_wall_data), then computes the
/// answers and writes <dir>/wall.csv (if `with_wall_csv`) and the profiles at
/// spec.output.profiles_at_x. The same numbers at the end of a run and from its final checkpoint.
RunOutputs write_wall_outputs(const CaseSpec& spec, const BoundaryMap& boundaries, FlowSolver& solver,
                              const TurbulenceModel& model, const std::filesystem::path& dir,
                              bool with_wall_csv, MPI_Comm comm);

/// Collective. The final fields, the series file, then write_wall_outputs (wall.csv if
/// output.wall_data).
RunOutputs write_run_outputs(const CaseSpec& spec, const BoundaryMap& boundaries, FlowSolver& solver,
                             const TurbulenceModel& model, const std::filesystem::path& dir, int iteration,
                             MPI_Comm comm);

}  // namespace wallrans
