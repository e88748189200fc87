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
/// (rank 0) along the fluid cells of the grid column containing it, measured from the column's
/// lowest boundary face (the block's bottom face, or the face on top of solid cells below): x, y,
/// wall_distance (to that face), y_plus, u_tangential, u_plus, nut_over_nu, u, v and the model's
/// transported variable (model_variable_column(); absent for models without one), sorted by y.
/// When that face is a no-slip wall, the first row is the face itself (its velocity, zero model
/// variable: every model here has the wall value 0), so the table reaches the wall. Stations
/// outside the grid or in an all-solid column are skipped with a warning.
void write_profiles(const CaseSpec& spec, const FlowSolver& solver, const TurbulenceModel& model,
                    const std::filesystem::path& directory, MPI_Comm comm);

}  // namespace wallrans
