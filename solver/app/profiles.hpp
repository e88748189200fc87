// Profiles of the wall-normal structure at the stations output.profiles_at_x:
// profile_x<station>.csv, each measured from the nearest wall of its grid column.
#pragma once

#include <mpi.h>

#include <filesystem>
#include <string>
#include <vector>

#include "core/case_spec.hpp"
#include "coupling/flow_solver.hpp"

namespace wallrans {

/// Local. The file name of the profile at station x: "profile_x<x>.csv" with x in "%.6g" form
/// (e.g. profile_x0.5.csv, profile_x-0.25.csv, profile_x1e-05.csv).
std::string profile_file_name(double x);

/// Collective. Writes <dir>/profile_x<x>.csv (rank 0) for each station of
/// spec.output.profiles_at_x along the grid column containing it. Each fluid cell of the column is
/// measured from the nearest wall face of the column that faces it (the block's bottom or top
/// side, or a face next to a solid cell): x, y, wall distance, y+, the velocity relative to the
/// wall along the wall tangent (t.x >= 0), U+, nu_t/nu and the wall face centre used. Without a
/// wall in the column the distance is from the column's bottom face and y+, U+ are NaN. Returns
/// the warnings (stations outside the grid or sharing a file name are skipped) for rank 0 to print.
std::vector<std::string> write_profiles(const CaseSpec& spec, const FlowSolver& solver,
                                        const std::filesystem::path& dir, MPI_Comm comm);

}  // namespace wallrans
