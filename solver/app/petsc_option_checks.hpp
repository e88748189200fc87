// Checks of the PETSc options of a case before anything is built: options that would resize the
// grid are refused, and every solver's options are tried on a small system of equations, so a
// bad value is one line and exit 2 from `check` and `run` alike, before the run writes anything.
#pragma once

#include <mpi.h>

#include <string>
#include <vector>

#include "core/case_spec.hpp"

namespace wallrans {

/// Local. Refuses (InputError) options on the command line or in iterations.petsc_options that
/// would change the grid (-da_grid_x, -da_refine, -da_overlap, -dm_refine, ..., with or without
/// the grid's prefix -grid_, and -grid_dm_mat_type/-grid_dm_vec_type, whose matrices wallrans
/// fills itself), and bare -da_/-dm_ options, which reach nothing (the grid reads -grid_...).
void check_grid_options(const CaseSpec& spec);

/// Collective. Sets up the momentum, pressure and (for a model with a transport equation)
/// turbulence solvers with their defaults and the given options on a small system and solves it
/// once, which reads every option of the solvers and their preconditioners' sub-solvers. Throws
/// InputError for a value PETSc refuses. Returns the names of the given options none of these
/// solvers read (candidates for misspelt options; `run` reports the final list after its first
/// iteration).
std::vector<std::string> probe_solver_options(MPI_Comm comm, const CaseSpec& spec);

/// Local. "PETSc option(s) nobody used: -a, -b (misspelt, or meant for a solver this case does
/// not have)"; "" for an empty list.
std::string unused_options_warning(const std::vector<std::string>& names);

}  // namespace wallrans
