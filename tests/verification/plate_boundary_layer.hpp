// Test helper: boundary-layer quantities of a plate solution along grid columns, read from the
// solver fields (not from output files), and the zero-pressure-gradient skin-friction
// correlations they are compared with.
#pragma once

#include <mpi.h>

#include <algorithm>
#include <cmath>
#include <cstdlib>
#include <vector>

#include "coupling/flow_solver.hpp"

namespace wallrans::test_support {

/// Coles-Fernholz relation with the constants of Nagib, Chauhan & Monkewitz (2007, Phil. Trans.
/// R. Soc. A 365:755): Cf = 2 [ln(Re_theta) / 0.384 + 4.127]^-2.
inline double coles_fernholz_cf(double re_theta) {
  const double s = std::log(re_theta) / 0.384 + 4.127;
  return 2.0 / (s * s);
}

/// Karman-Schoenherr relation (Schoenherr 1932) in the form of the NASA Turbulence Modeling
/// Resource flat-plate case: Cf = 1 / (17.08 L^2 + 25.11 L + 6.012), L = log10(Re_theta).
/// Tabulated in tests/data/flat-plate-correlations-tmr.
inline double karman_schoenherr_cf(double re_theta) {
  const double l = std::log10(re_theta);
  return 1.0 / (17.08 * l * l + 25.11 * l + 6.012);
}

/// One grid column above the bottom wall: cell j = 0 .. cells_y - 1.
struct ColumnProfile {
  int column = 0;
  double x = 0.0;                    ///< centre of the bottom face of the column [m]
  double shear_stress = 0.0;         ///< tau_w / rho at that face [m^2/s^2]
  double first_cell_distance = 0.0;  ///< wall -> first cell centre [m]
  std::vector<double> y;             ///< normal distance of each cell centre from the wall face [m]
  std::vector<double> u;             ///< velocity along the wall [m/s]
  std::vector<double> nut;           ///< eddy viscosity [m^2/s]
};

/// Integral quantities of one profile; all edge-based (U_e, not the reference velocity).
struct BoundaryLayer {
  double x = 0.0;
  double edge_velocity = 0.0;           ///< U_e: largest u of the column (the boundary-layer edge) [m/s]
  double edge_height = 0.0;             ///< wall distance of that cell [m]
  double delta99 = 0.0;                 ///< where u = 0.99 U_e, linear between cell centres [m]
  double displacement_thickness = 0.0;  ///< delta* = int_0^y_e (1 - u/U_e) dy [m]
  double momentum_thickness = 0.0;      ///< theta = int_0^y_e u/U_e (1 - u/U_e) dy [m]
  double re_theta = 0.0;                ///< U_e theta / nu
  double cf = 0.0;                      ///< 2 tau_w / U_e^2
  double u_tau = 0.0;                   ///< sqrt(|tau_w|) [m/s]
};

/// Centre x of the bottom face of column i (node coordinates are known on every rank).
inline double bottom_face_x(const Grid& grid, int i) {
  return 0.5 * (grid.node(i, 0).x + grid.node(i + 1, 0).x);
}

/// Collective: the profile of bottom-wall column `column`, the same on every rank (each rank
/// contributes its owned cells; the sums are exact since exactly one rank owns each cell).
inline ColumnProfile column_profile(const FlowSolver& solver, int column) {
  const Grid& grid = solver.grid();
  const int ny = grid.cells_y();
  const Vec2 a = grid.node(column, 0), b = grid.node(column + 1, 0);
  const Vec2 face_centre = 0.5 * (a + b);
  const Vec2 normal = (1.0 / norm(b - a)) * Vec2{-(b - a).y, (b - a).x};  // into the domain
  const Vec2 tangent{normal.y, -normal.x};
  // Layout: y[ny], u[ny], nut[ny], tau, first-cell distance.
  std::vector<double> local(3 * static_cast<size_t>(ny) + 2, 0.0), all(local.size(), 0.0);
  if (column >= grid.x_begin() && column < grid.x_end()) {
    for (int j = grid.y_begin(); j < grid.y_end(); ++j) {
      local[j] = dot(grid.centre(column, j) - face_centre, normal);
      local[ny + j] = dot(solver.velocity()(column, j), tangent);
      local[2 * ny + j] = solver.eddy_viscosity()(column, j);
    }
  }
  for (const WallSample& w : solver.wall_samples()) {
    if (w.side == Side::bottom && w.index == column) {
      local[3 * ny] = w.shear_stress;
      local[3 * ny + 1] = w.first_cell_distance;
    }
  }
  MPI_Allreduce(local.data(), all.data(), static_cast<int>(all.size()), MPI_DOUBLE, MPI_SUM, grid.comm());
  ColumnProfile p;
  p.column = column;
  p.x = face_centre.x;
  p.y.assign(all.begin(), all.begin() + ny);
  p.u.assign(all.begin() + ny, all.begin() + 2 * ny);
  p.nut.assign(all.begin() + 2 * ny, all.begin() + 3 * ny);
  p.shear_stress = all[3 * ny];
  p.first_cell_distance = all[3 * ny + 1];
  return p;
}

/// Local. Edge: the cell of largest u (the profile rises monotonically to it; above, the outer
/// potential flow decelerates slightly towards the free boundary and is not boundary layer).
/// Integrals by the trapezoidal rule from the wall (y = 0, u = 0) through the cell centres.
inline BoundaryLayer integrate(const ColumnProfile& p, double nu) {
  BoundaryLayer bl;
  bl.x = p.x;
  const size_t edge = static_cast<size_t>(std::max_element(p.u.begin(), p.u.end()) - p.u.begin());
  const double ue = p.u[edge];
  bl.edge_velocity = ue;
  bl.edge_height = p.y[edge];
  double y0 = 0.0, u0 = 0.0;
  bool found99 = false;
  for (size_t j = 0; j <= edge; ++j) {
    const double y1 = p.y[j], u1 = p.u[j] / ue;
    bl.displacement_thickness += 0.5 * ((1.0 - u0) + (1.0 - u1)) * (y1 - y0);
    bl.momentum_thickness += 0.5 * (u0 * (1.0 - u0) + u1 * (1.0 - u1)) * (y1 - y0);
    if (!found99 && u1 >= 0.99) {
      bl.delta99 = y0 + (0.99 - u0) / (u1 - u0) * (y1 - y0);
      found99 = true;
    }
    y0 = y1;
    u0 = u1;
  }
  bl.re_theta = ue * bl.momentum_thickness / nu;
  bl.cf = 2.0 * p.shear_stress / (ue * ue);
  bl.u_tau = std::sqrt(std::abs(p.shear_stress));
  return bl;
}

/// Collective: the boundary layer at station x, linearly interpolated between the two columns
/// whose bottom-face centres bracket x (every quantity interpolated alike). Requires x between
/// the first and the last face centre.
inline BoundaryLayer boundary_layer_at(const FlowSolver& solver, double x, double nu) {
  const Grid& grid = solver.grid();
  int left = 0;
  while (left + 2 < grid.cells_x() && bottom_face_x(grid, left + 1) <= x) ++left;
  const BoundaryLayer a = integrate(column_profile(solver, left), nu);
  const BoundaryLayer b = integrate(column_profile(solver, left + 1), nu);
  const double w = (x - a.x) / (b.x - a.x);
  auto mix = [w](double pa, double pb) { return (1.0 - w) * pa + w * pb; };
  BoundaryLayer bl;
  bl.x = x;
  bl.edge_velocity = mix(a.edge_velocity, b.edge_velocity);
  bl.edge_height = mix(a.edge_height, b.edge_height);
  bl.delta99 = mix(a.delta99, b.delta99);
  bl.displacement_thickness = mix(a.displacement_thickness, b.displacement_thickness);
  bl.momentum_thickness = mix(a.momentum_thickness, b.momentum_thickness);
  bl.re_theta = mix(a.re_theta, b.re_theta);
  bl.cf = mix(a.cf, b.cf);
  bl.u_tau = mix(a.u_tau, b.u_tau);
  return bl;
}

/// The column whose bottom-face centre is closest to x.
inline int nearest_column(const Grid& grid, double x) {
  int best = 0;
  for (int i = 1; i < grid.cells_x(); ++i)
    if (std::abs(bottom_face_x(grid, i) - x) < std::abs(bottom_face_x(grid, best) - x)) best = i;
  return best;
}

}  // namespace wallrans::test_support
