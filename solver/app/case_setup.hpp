// A case made ready for a solver: the case file loaded and checked, its grid and boundary map
// built, after the guards that need neither. `run`, `check`, `write-grid` and `extract` start here.
#pragma once

#include <mpi.h>

#include <memory>
#include <string>
#include <vector>

#include "app/resource_guard.hpp"
#include "core/case_spec.hpp"
#include "grid/boundary.hpp"
#include "grid/grid.hpp"

namespace wallrans {

struct CaseSetup {
  CaseSpec spec;
  std::unique_ptr<Grid> grid;
  std::unique_ptr<BoundaryMap> boundaries;
  std::string grid_note;                    ///< what loading a grid file repaired ("" if nothing)
  MemoryVerdict memory;                     ///< the memory estimate and the tightest host
  std::vector<std::string> unused_options;  ///< PETSc options the solvers' trial set-up did not read
};

/// Collective. Loads the case and builds its grid and boundary map, after the checks that need
/// neither (PETSc options, cell count, memory for `use`); for MemoryUse::run also the solvers'
/// trial set-up and the flux balance. Messages of the generators and the boundary map get the
/// case file name. Throws InputError (the same on every rank).
CaseSetup build_case(MPI_Comm comm, const std::string& case_file, MemoryUse use);

}  // namespace wallrans
