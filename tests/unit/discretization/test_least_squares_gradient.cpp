// Least-squares gradients are exact for linear fields on any grid (common practice; the normal
// equations reproduce a linear function exactly), with or without boundary values in the fit, and
// next to solid cells (left out of the fit; the faces next to them give boundary values).
#include <gtest/gtest.h>

#include "discretization/least_squares_gradient.hpp"
#include "grid/solid_cells.hpp"
#include "meshes/node_coordinates.hpp"

using namespace wallrans;

namespace {

void check_linear_exact(bool with_boundaries, bool periodic, bool with_solid = false) {
  CaseSpec case_spec;
  GridSpec& spec = case_spec.grid;
  spec.generator = periodic ? GridGenerator::channel : GridGenerator::skewed_box;
  spec.cells_x = 14;
  spec.cells_y = 12;
  spec.skew_amplitude = periodic ? 0.0 : 0.08;
  if (periodic) spec.first_cell_height = 0.01;
  if (with_solid) {
    // A bump on the bottom side and an island, both across rank boundaries on 2 ranks.
    SolidRegionSpec bump, island;
    bump.i = std::array{5, 8};
    bump.j = std::array{0, 4};
    island.i = std::array{2, 3};
    island.j = std::array{6, 8};
    case_spec.solid_regions = {bump, island};
  }
  Grid grid(MPI_COMM_WORLD, generate_nodes(spec), periodic);
  const SolidCells solid(case_spec, grid.nodes());
  const auto faces = owned_boundary_faces(grid, domain_boundary_faces(grid.nodes(), periodic, solid));
  LeastSquaresGradient lsq(
      grid, faces, [&](const BoundaryFace&) { return with_boundaries; }, solid.ghosted_mask(grid));
  // Periodic direction: a linear field cannot be periodic, so use one that varies in y only.
  const double gx = periodic ? 0.0 : 2.5, gy = -3.0;
  auto phi = [&](Vec2 r) { return 1.0 + gx * r.x + gy * r.y; };
  Field f(grid);
  // Values in solid cells are meaningless (here far off the linear field) and must not enter.
  for (int j = grid.gy_begin(); j < grid.gy_end(); ++j)
    for (int i = grid.gx_begin(); i < grid.gx_end(); ++i)
      f(i, j) = solid.is_solid((i + spec.cells_x) % spec.cells_x, j) ? 1e6 : phi(grid.centre(i, j));
  std::vector<double> fb;
  for (const auto& face : faces) fb.push_back(phi(face.centre));
  VectorField grad(grid);
  lsq.compute(f, fb, grad);
  for (int j = grid.y_begin(); j < grid.y_end(); ++j)
    for (int i = grid.x_begin(); i < grid.x_end(); ++i) {
      const bool is_solid = solid.is_solid(i, j);
      EXPECT_NEAR(grad.x(i, j), is_solid ? 0.0 : gx, 1e-10) << i << ", " << j;
      EXPECT_NEAR(grad.y(i, j), is_solid ? 0.0 : gy, 1e-10) << i << ", " << j;
    }
}

}  // namespace

TEST(LeastSquaresGradient, LinearFieldExactWithBoundaryValues) { check_linear_exact(true, false); }
TEST(LeastSquaresGradient, LinearFieldExactWithoutBoundaryValues) { check_linear_exact(false, false); }
TEST(LeastSquaresGradient, LinearFieldExactAcrossPeriodicSeam) { check_linear_exact(true, true); }
TEST(LeastSquaresGradient, LinearFieldExactNextToSolidCells) { check_linear_exact(true, false, true); }
