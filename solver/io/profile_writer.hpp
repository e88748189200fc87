// Profiles of a converged run along grid columns (profile_<k>.csv). Their columns x, y, u, v and
// the model variable make them valid inflow tables (io/profile_reader.hpp) for another case.
#pragma once

#include <mpi.h>

#include <filesystem>

#include "core/case_spec.hpp"
#include "coupling/flow_solver.hpp"
#include "models/turbulence_model.hpp"

namespace wallrans {

/// Collective. For each station of spec.output.profiles_at_x, writes `directory`/profile_<k>.csv
/// (rank 0) along the grid column containing it: x, y, wall_distance (to the column's bottom
/// face), y_plus, u_tangential, u_plus, nut_over_nu, u, v and the model's transported variable
/// (model_variable_column(); absent for models without one), sorted by y. When the bottom face is
/// a no-slip wall of a segment, the first row is that face (its velocity, zero model variable:
/// every model here has the wall value 0), so the table reaches the wall. Stations outside the
/// grid are skipped with a warning.
void write_profiles(const CaseSpec& spec, const FlowSolver& solver, const TurbulenceModel& model,
                    const std::filesystem::path& directory, MPI_Comm comm);

}  // namespace wallrans
