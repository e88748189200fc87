// Profiles of a run along grid columns at the stations output.profiles_at_x: profile_x<x>.csv,
// each cell measured from the nearest wall of its column. Their columns y, u, v and the model
// variable make them valid inflow tables (io/profile_reader.hpp) for another case.
#pragma once

#include <mpi.h>

#include <filesystem>
#include <string>
#include <vector>

#include "core/case_spec.hpp"
#include "coupling/flow_solver.hpp"
#include "grid/grid.hpp"
#include "models/turbulence_model.hpp"

namespace wallrans {

/// Local. The file name of the profile at station x: "profile_x<x>.csv" with x in "%.6g" form
/// (e.g. profile_x0.5.csv, profile_x-0.25.csv, profile_x1e-05.csv).
std::string profile_file_name(double x);

/// Local. The grid column whose bottom nodes bracket station x (node(i, 0).x <= x < node(i + 1, 0).x),
/// or -1 if none does (the station lies outside the grid).
int profile_column(const Grid& grid, double x);

/// Collective. For each station of spec.output.profiles_at_x, writes `directory`/profile_x<x>.csv
/// (rank 0) along the fluid cells of the grid column containing it, sorted by y. Each cell is
/// measured from the nearest wall face of the column that faces it (the block's bottom or top side,
/// or a face next to a solid cell): x, y, wall_distance, y_plus, u_tangential (relative to the
/// wall, along its tangent with t.x >= 0), u_plus, nut_over_nu, wall_x, wall_y (that face's
/// centre), u, v and the model's transported variable (model_variable_column(); absent for models
/// without one). Without a wall in the column the distance is from the column's bottom face and
/// y+, U+ are NaN. When the column's lowest boundary face is a no-slip wall, the first row is that
/// face itself (its velocity, zero model variable: every model here has the wall value 0), so the
/// table reaches the wall. Returns the warnings (stations outside the grid or its fluid, or sharing
/// a file name with an earlier one, are skipped) for rank 0 to print.
std::vector<std::string> write_profiles(const CaseSpec& spec, const FlowSolver& solver,
                                        const TurbulenceModel& model, const std::filesystem::path& directory,
                                        MPI_Comm comm);

}  // namespace wallrans
