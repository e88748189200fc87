// Nested start (grid sequencing, "nested iteration"): the case is first solved on coarser grids
// made from its own grid by dropping every other grid line, coarsest first, and each finer grid
// starts from the solution interpolated from the one below (Ferziger & Peric 2002, sec. 12.4;
// Briggs, Henson & McCormick 2000, ch. 3). The long-wave part of the start-up transient - the
// boundary layers and the eddy viscosity growing from a uniform field - then costs coarse-grid
// iterations, and the iteration count on the case's grid stays nearly the same under refinement.
#pragma once

#include <functional>
#include <string>
#include <vector>

#include "core/case_spec.hpp"
#include "coupling/flow_solver.hpp"
#include "grid/grid.hpp"
#include "models/turbulence_model.hpp"

namespace wallrans {

struct CoarseGridRun {
  int cells_x = 0, cells_y = 0;
  int iterations = 0;
  int reference_iterations = 0;  ///< iterations from the uniform start that measured the residual references
  bool converged = false;  ///< reached iterations.coarse_residual_drop within iterations.coarse_max
  bool diverged = false;   ///< non-finite or runaway residuals: the finer grids start afresh
  double seconds = 0.0;
};

/// The grid made from `nodes` by dropping every other grid line in x (if coarsen_x) and y.
NodeCoordinates coarsen(const NodeCoordinates& nodes, bool coarsen_x, bool coarsen_y);

/// Collective: `to` on `fine` (made from `coarse` by coarsen()) interpolated from `from` on
/// `coarse`. With a gradient (grad_x, grad_y on `coarse`), the value is reconstructed linearly from
/// the centre of the coarse cell and, away from the domain edge, limited to the range of the
/// coarse values around it; without one, copied from the coarse cell. Exact for linear fields.
void interpolate_to_finer(const Grid& coarse, const Grid& fine, const Field& from, const Field* grad_x,
                          const Field* grad_y, Field& to);

/// Collective. Solves the case on up to spec.iterations.coarse_grids coarser grids (fewer where
/// a direction cannot be halved again: odd cell counts, or fewer than 8 cells left in both
/// directions, or a boundary segment that no longer encloses a face; none on grids from files or
/// with solid regions given by cell indices, which refer to the case's grid), then writes the
/// interpolated solution, its residual references and the model state into `solver` and `model`,
/// which must be fresh (iteration 0). `note` receives one line per coarse grid (rank 0 prints).
/// Returns the coarse runs, coarsest first; empty if no coarser grid could be made.
std::vector<CoarseGridRun> start_from_coarser_grids(const CaseSpec& spec, const Grid& grid, FlowSolver& solver,
                                                    TurbulenceModel& model,
                                                    const std::function<void(const CoarseGridRun&)>& note);

}  // namespace wallrans
