// Plane Poiseuille flow in a streamwise-periodic channel driven by an imposed mean pressure
// gradient, against the exact solution u = G/(2 nu) y (H - y) (textbook; e.g. White, Viscous
// Fluid Flow, 3rd ed. 2006, sec. 3-3.2).
#include <gtest/gtest.h>

#include <cmath>
#include <iostream>

#include "coupling/flow_solver.hpp"
#include "io/case_loader.hpp"

using namespace wallrans;

namespace {

// The shipped case, optionally with wall clustering.
CaseSpec channel_case(std::optional<double> first_cell) {
  CaseSpec spec = load_case_file(std::string(WALLRANS_SOURCE_DIR) + "/configs/channel_poiseuille.yaml");
  spec.grid.first_cell_height = first_cell;
  return spec;
}

// Max |u - u_exact| / U_max over the owned cells, after convergence.
double max_relative_error(const CaseSpec& spec) {
  Grid grid(MPI_COMM_WORLD, generate_nodes(spec.grid), true);
  BoundaryMap boundaries(spec, grid.nodes());
  LaminarModel laminar(grid);
  FlowSolver solver(spec, grid, boundaries, laminar);
  IterationStatus status;
  do {
    status = solver.iterate();
  } while (!solver.converged(status) && status.iteration < spec.iterations.max);
  EXPECT_TRUE(solver.converged(status)) << "u residual " << status.normalised.u;
  const double g = -spec.periodic.mean_pressure_gradient, nu = spec.flow.kinematic_viscosity,
               h = spec.grid.height;
  const double u_max = g * h * h / (8.0 * nu);
  double err = 0.0;
  for (int j = grid.y_begin(); j < grid.y_end(); ++j) {
    for (int i = grid.x_begin(); i < grid.x_end(); ++i) {
      const double y = grid.centre(i, j).y;
      err = std::max(err, std::abs(solver.velocity().x(i, j) - g / (2.0 * nu) * y * (h - y)) / u_max);
      err = std::max(err, std::abs(solver.velocity().y(i, j)) / u_max);
    }
  }
  const double max_err = grid.global_max(err);
  std::cout << "max relative error " << max_err << " after " << status.iteration << " iterations\n";
  return max_err;
}

}  // namespace

TEST(Poiseuille, UniformGridReproducesParabola) {
  // A second-order FV scheme with a second-order wall gradient is exact for a parabola.
  EXPECT_LT(max_relative_error(channel_case(std::nullopt)), 1e-6);
}

TEST(Poiseuille, StretchedGridWithinHalfPercent) {
  // 16 cells per half-channel with geometric growth ratio 1.14 from a 3 mm wall cell.
  EXPECT_LT(max_relative_error(channel_case(3.0e-3)), 5e-3);
}
