// Mixing-length closure (Prandtl; van Driest 1956 damping, outer cap 0.09 delta) on a real grid
// over a flat wall: the limits of l = kappa y (1 - exp(-y+/A+)): l -> kappa y for y+ >> A+ (so
// nu_t = kappa u_tau y with the log-law shear u_tau/(kappa y)), l -> kappa y y+/A+ for y+ << A+,
// and l = 0.09 delta above the cap.
#include <gtest/gtest.h>

#include <cmath>
#include <vector>

#include "discretization/boundary_conditions.hpp"
#include "grid/boundary.hpp"
#include "grid/boundary_faces.hpp"
#include "grid/grid.hpp"
#include "models/mixing_length.hpp"
#include "models/wall_distance.hpp"

using namespace wallrans;

namespace {

// Van Driest (1956): A+ = 26; kappa = 0.41; outer cap 0.09 delta (Escudier, from memory).
constexpr double kappa = 0.41, a_plus = 26.0, cap = 0.09;

BoundarySegmentSpec side_of_kind(Side side, BoundaryKind kind) {
  BoundarySegmentSpec segment;
  segment.side = side;
  segment.kind = kind;
  return segment;
}

}  // namespace

TEST(MixingLengthClosure, VanDriestLimits) {
  // Two columns over a wall at y = 0, 60 rows from y = 2e-9 growing by 1.4 to y = 1: with nu = 1e-5
  // and u_tau = 1, y+ runs from 1e-4 to 1e5. Log-law shear dU/dy = u_tau/(kappa y) in every cell.
  const double nu = 1e-5, u_tau = 1.0, delta = 0.5;
  NodeCoordinates nodes;
  nodes.cells_x = 2;
  nodes.cells_y = 60;
  std::vector<double> ys{0.0};
  for (int j = 0; j < nodes.cells_y; ++j) ys.push_back(ys.back() + 2e-9 * std::pow(1.4, j));
  for (double& y : ys) y /= ys.back();
  for (int j = 0; j <= nodes.cells_y; ++j)
    for (int i = 0; i <= nodes.cells_x; ++i) nodes.nodes.push_back({0.1 * i, ys[j]});
  CaseSpec spec;
  spec.flow.kinematic_viscosity = nu;
  spec.turbulence.model = "mixing_length";
  spec.turbulence.outer_length = delta;
  spec.boundaries = {
      side_of_kind(Side::bottom, BoundaryKind::wall), side_of_kind(Side::top, BoundaryKind::slip),
      side_of_kind(Side::left, BoundaryKind::slip), side_of_kind(Side::right, BoundaryKind::slip)};
  const Grid grid(MPI_COMM_SELF, nodes, false);
  const BoundaryMap boundaries(spec, grid.nodes());
  const BoundaryConditions conditions(spec.boundaries, 0.0);
  const std::vector<BoundaryFace> faces = owned_boundary_faces(grid, boundaries.faces());
  const std::vector<double> boundary_flux(faces.size(), 0.0);
  const std::vector<double> wall_shear(collect_wall_faces(boundaries).size(), u_tau * u_tau);
  VectorField velocity(grid), grad_u(grid), grad_v(grid);
  const Field flux_east(grid), flux_north(grid);
  for (int j = grid.gy_begin(); j < grid.gy_end(); ++j)
    for (int i = grid.gx_begin(); i < grid.gx_end(); ++i)
      grad_u.set(i, j, {0.0, u_tau / (kappa * grid.centre(i, j).y)});
  const MeanFlowView view{grid,   boundaries, conditions, faces,      boundary_flux, velocity,
                          grad_u, grad_v,     flux_east,  flux_north, wall_shear,    nu};
  MixingLength model(spec, grid, boundaries);
  model.update(view);

  int n_log = 0, n_wall = 0, n_cap = 0;
  for (int j = grid.y_begin(); j < grid.y_end(); ++j) {
    const double y = grid.centre(0, j).y, y_plus = y * u_tau / nu, shear = u_tau / (kappa * y);
    const double nut = model.eddy_viscosity()(0, j);
    if (kappa * y >= cap * delta) {
      // Above the cap: l = 0.09 delta exactly (the damping factor is 1 to round-off there).
      EXPECT_NEAR(nut, std::pow(cap * delta, 2) * shear, 1e-14 * nut) << "y+ " << y_plus;
      ++n_cap;
    } else if (y_plus >= 20.0 * a_plus) {
      // l = kappa y (1 - e), e = exp(-y+/A+) <= exp(-20) = 2e-9: nu_t within 2e of kappa u_tau y.
      EXPECT_NEAR(nut, kappa * u_tau * y, (2.0 * std::exp(-y_plus / a_plus) + 1e-14) * kappa * u_tau * y)
          << "y+ " << y_plus;
      ++n_log;
    } else if (y_plus <= 0.01 * a_plus) {
      // 1 - exp(-z) = z (1 - z/2 + ...), z = y+/A+ <= 0.01: l within z of kappa y z, nu_t within 2z.
      const double z = y_plus / a_plus, limit = std::pow(kappa * y * z, 2) * shear;
      EXPECT_NEAR(nut, limit, 2.0 * z * limit) << "y+ " << y_plus;
      ++n_wall;
    }
  }
  EXPECT_GE(n_log, 5);
  EXPECT_GE(n_wall, 5);
  EXPECT_GE(n_cap, 3);
}
