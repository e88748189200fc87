// Least-squares gradients are exact for linear fields on any grid (common practice; the normal
// equations reproduce a linear function exactly), with or without boundary values in the fit.
#include <gtest/gtest.h>

#include "discretization/least_squares_gradient.hpp"
#include "meshes/node_coordinates.hpp"

using namespace wallrans;

namespace {

void check_linear_exact(bool with_boundaries, bool periodic) {
  GridSpec spec;
  spec.generator = periodic ? GridGenerator::channel : GridGenerator::skewed_box;
  spec.cells_x = 14;
  spec.cells_y = 12;
  spec.skew_amplitude = periodic ? 0.0 : 0.08;
  if (periodic) spec.first_cell_height = 0.01;
  Grid grid(MPI_COMM_WORLD, generate_nodes(spec), periodic);
  const auto faces = owned_boundary_faces(grid, domain_boundary_faces(grid.nodes(), periodic));
  LeastSquaresGradient lsq(grid, faces, [&](const BoundaryFace&) { return with_boundaries; });
  // Periodic direction: a linear field cannot be periodic, so use one that varies in y only.
  const double gx = periodic ? 0.0 : 2.5, gy = -3.0;
  auto phi = [&](Vec2 r) { return 1.0 + gx * r.x + gy * r.y; };
  Field f(grid);
  for (int j = grid.gy_begin(); j < grid.gy_end(); ++j)
    for (int i = grid.gx_begin(); i < grid.gx_end(); ++i) f(i, j) = phi(grid.centre(i, j));
  std::vector<double> fb;
  for (const auto& face : faces) fb.push_back(phi(face.centre));
  VectorField grad(grid);
  lsq.compute(f, fb, grad);
  for (int j = grid.y_begin(); j < grid.y_end(); ++j)
    for (int i = grid.x_begin(); i < grid.x_end(); ++i) {
      EXPECT_NEAR(grad.x(i, j), gx, 1e-10) << i << ", " << j;
      EXPECT_NEAR(grad.y(i, j), gy, 1e-10) << i << ", " << j;
    }
}

}  // namespace

TEST(LeastSquaresGradient, LinearFieldExactWithBoundaryValues) { check_linear_exact(true, false); }
TEST(LeastSquaresGradient, LinearFieldExactWithoutBoundaryValues) { check_linear_exact(false, false); }
TEST(LeastSquaresGradient, LinearFieldExactAcrossPeriodicSeam) { check_linear_exact(true, true); }
