// Plane Poiseuille flow in a streamwise-periodic channel driven by an imposed mean pressure
// gradient, against the exact solution u = G/(2 nu) y (H - y) (textbook; e.g. White, Viscous
// Fluid Flow, 3rd ed. 2006, sec. 3-3.2).
#include <gtest/gtest.h>

#include <cmath>
#include <iostream>
#include <vector>

#include "coupling/flow_solver.hpp"
#include "io/case_loader.hpp"
#include "meshes/node_coordinates.hpp"

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
  // A second-order FV scheme with a second-order wall gradient is exact for a parabola, so only the
  // iteration error remains: the outer iteration stops at a residual drop of 1e-9 with inner solves
  // to 1e-12 (case file); 1e-6 allows a thousandfold amplification from residual to error.
  EXPECT_LT(max_relative_error(channel_case(std::nullopt)), 1e-6);
}

TEST(Poiseuille, StretchedGridsConvergeAtSecondOrder) {
  // The shipped case clustered at both walls (32 cells, geometric growth from a 3 mm wall cell, ratio
  // about 1.14) and the same geometric family refined once: every cell split in two (64 cells, ratio
  // sqrt(q), wall cell h with h (1 + sqrt(q)) = 3 mm). The scheme is second order, so the error must
  // fall by about 4: observed order p = log2(e_coarse / e_fine) >= 1.8 (formal order 2).
  const CaseSpec coarse = channel_case(3.0e-3);
  const std::vector<double> ys = two_sided_spacing(coarse.grid.cells_y, coarse.grid.height,
                                                   *coarse.grid.first_cell_height, "grid.first_cell_height");
  const double q = (ys[2] - ys[1]) / (ys[1] - ys[0]);
  CaseSpec fine = coarse;
  fine.grid.cells_y *= 2;
  fine.grid.first_cell_height = ys[1] / (1.0 + std::sqrt(q));
  const std::vector<double> fine_ys = two_sided_spacing(
      fine.grid.cells_y, fine.grid.height, *fine.grid.first_cell_height, "grid.first_cell_height");
  EXPECT_NEAR(fine_ys[2], ys[1], 1e-12) << "the refined grid must contain the nodes of the shipped one";
  const double e_coarse = max_relative_error(coarse), e_fine = max_relative_error(fine);
  const double order = std::log2(e_coarse / e_fine);
  std::cout << "stretched grids: growth ratio " << q << ", max error " << e_coarse << " -> " << e_fine
            << ", observed order " << order << "\n";
  EXPECT_GE(order, 1.8);
}
