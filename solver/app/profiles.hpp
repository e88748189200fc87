// Profiles of the wall-normal structure at the stations output.profiles_at_x: profile_<k>.csv.
#pragma once

#include <mpi.h>

#include <filesystem>

#include "core/case_spec.hpp"
#include "coupling/flow_solver.hpp"

namespace wallrans {

/// Collective. Writes <dir>/profile_<k>.csv (rank 0) for each station of spec.output.profiles_at_x
/// along the grid column containing it, measured from the column's bottom face: x, y, wall
/// distance, y+, tangential velocity, U+ and nu_t/nu. Stations outside the grid are skipped with
/// a warning.
void write_profiles(const CaseSpec& spec, const FlowSolver& solver, const std::filesystem::path& dir,
                    MPI_Comm comm);

}  // namespace wallrans
