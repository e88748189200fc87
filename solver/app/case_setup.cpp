// Loads a case and builds its grid and boundary map, after the guards that need neither.
#include "app/case_setup.hpp"

#include "app/petsc_option_checks.hpp"
#include "app/well_posedness.hpp"
#include "core/error.hpp"
#include "grid/solid_cells.hpp"
#include "io/case_loader.hpp"
#include "io/grid_file_case.hpp"
#include "meshes/node_coordinates.hpp"

namespace wallrans {

// Collective. Loads the case and builds its grid and boundary map, after the checks that need
// neither (PETSc options, cell count, memory for `use`). Messages of the generators and the
// boundary map get the case file name.
CaseSetup build_case(MPI_Comm comm, const std::string& case_file, MemoryUse use) {
  CaseSetup s;
  s.spec = load_case_file(case_file);
  check_grid_options(s.spec);
  if (use == MemoryUse::run) s.unused_options = probe_solver_options(comm, s.spec);
  const std::string grid_key = case_location(s.spec, s.spec.grid.line) + ": key 'grid.";
  try {
    if (s.spec.grid.file.empty()) {
      check_cell_count(s.spec, s.spec.grid.cells_x, s.spec.grid.cells_y);
      s.memory =
          check_memory(comm, s.spec, s.spec.grid.cells_x, s.spec.grid.cells_y, use, grid_key + "cells'");
      NodeCoordinates nodes = generate_nodes(s.spec.grid);
      s.grid = std::make_unique<Grid>(comm, std::move(nodes), s.spec.periodic.axis == PeriodicAxis::x);
      s.boundaries = std::make_unique<BoundaryMap>(s.spec, s.grid->nodes());
    } else {
      // Segments on a file grid are resolved against its patches (and its orientation).
      CaseGrid loaded = load_case_grid(comm, s.spec);
      check_cell_count(s.spec, loaded.nodes.cells_x, loaded.nodes.cells_y);
      s.memory =
          check_memory(comm, s.spec, loaded.nodes.cells_x, loaded.nodes.cells_y, use, grid_key + "file'");
      s.grid_note = loaded.note;
      s.grid = std::make_unique<Grid>(comm, std::move(loaded.nodes), s.spec.periodic.axis == PeriodicAxis::x);
      CaseSpec resolved = s.spec;
      resolved.boundaries = loaded.segments;
      s.boundaries = std::make_unique<BoundaryMap>(resolved, s.grid->nodes());
    }
  } catch (const InputError& e) {
    // Messages of the boundary map already name the file and segment line; the generators and
    // the grid metrics name the grid key, and get the grid section's line here.
    const std::string text = e.what();
    if (text.rfind(case_file, 0) == 0) throw;
    throw InputError(case_file + ":" + std::to_string(s.spec.grid.line) + ": " + text);
  }
  if (use == MemoryUse::run) check_flux_balance(s.spec, *s.boundaries);
  return s;
}

}  // namespace wallrans
