// Method of manufactured solutions for the Spalart-Allmaras equation alone (Eca, Hoekstra, Hay &
// Pelletier 2007, Int. J. CFD 21:175 and Int. J. Numer. Meth. Fluids 54:119): frozen manufactured
// velocity, d = y, and the observed order of the nu_tilde error on four successively refined
// curvilinear grids, for the variants standard, noft2 and negative (with a region nu_tilde < 0).
// The sources come from sa_mms_generated.hpp, derived with sympy by tools/mms/sa_mms.py from the
// published equations, not from the model's own source function.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <string>
#include <vector>

#include "grid/boundary.hpp"
#include "grid/boundary_faces.hpp"
#include "grid/grid.hpp"
#include "meshes/node_coordinates.hpp"
#include "models/spalart_allmaras.hpp"
#include "models/wall_distance.hpp"
#include "sa_mms_generated.hpp"

using namespace wallrans;

namespace {

constexpr double nu = sa_mms::nu;

struct MmsVariant {
  const char* name;  ///< turbulence.variant
  double nu_max;     ///< scale of the manufactured nu_tilde [m^2/s]
  double (*nu_tilde)(double, double);
  double (*source)(double, double);
  std::array<double, 2> (*closure)(double, double, double, double);  ///< Q and nu_eff
  bool with_ft2, negative_branch;                                    ///< sa_source's switches
};

const MmsVariant standard{"standard",
                          sa_mms::standard_nu_max,
                          sa_mms::standard_nu_tilde,
                          sa_mms::standard_source,
                          sa_mms::standard_closure,
                          true,
                          false};
const MmsVariant noft2{
    "noft2", sa_mms::noft2_nu_max, sa_mms::noft2_nu_tilde, sa_mms::noft2_source, sa_mms::noft2_closure, false,
    false};
const MmsVariant negative{"negative",
                          sa_mms::negative_nu_max,
                          sa_mms::negative_nu_tilde,
                          sa_mms::negative_source,
                          sa_mms::negative_closure,
                          false,
                          true};

// Exact volume flux through a straight face with area vector `area` (length = face length) and
// centre `centre`: psi(end) - psi(start) along the edge, the edge direction being `area` turned
// by +90 degrees.
double face_flux(Vec2 centre, Vec2 area) {
  const Vec2 along{-area.y, area.x};
  const Vec2 end = centre + 0.5 * along, start = centre - 0.5 * along;
  return sa_mms::stream_function(end.x, end.y) - sa_mms::stream_function(start.x, start.y);
}

// The frozen mean flow and the storage the MeanFlowView refers to.
struct FrozenFlow {
  std::vector<BoundaryFace> faces;
  std::vector<double> boundary_flux, wall_shear;
  VectorField velocity, grad_u, grad_v;
  Field flux_east, flux_north;
  double max_cell_imbalance = 0.0;  ///< max |sum of outward face fluxes| over owned cells [m^2/s]
};

// Collective (one reduction): exact velocity and gradients at the centres of the ghosted range,
// exact face fluxes, and their largest continuity imbalance per cell.
void fill_frozen_flow(const Grid& grid, const BoundaryMap& boundaries, FrozenFlow& flow) {
  flow.faces = owned_boundary_faces(grid, boundaries.faces());
  flow.velocity = VectorField(grid);
  flow.grad_u = VectorField(grid);
  flow.grad_v = VectorField(grid);
  flow.flux_east = Field(grid);
  flow.flux_north = Field(grid);
  for (int j = grid.gy_begin(); j < grid.gy_end(); ++j) {
    for (int i = grid.gx_begin(); i < grid.gx_end(); ++i) {
      const Vec2 c = grid.centre(i, j);
      const auto [u, v] = sa_mms::velocity(c.x, c.y);
      const auto [u_x, u_y, v_x, v_y] = sa_mms::velocity_gradient(c.x, c.y);
      flow.velocity.set(i, j, {u, v});
      flow.grad_u.set(i, j, {u_x, u_y});
      flow.grad_v.set(i, j, {v_x, v_y});
      const FaceGeometry& east = grid.east_face(i, j);
      const FaceGeometry& north = grid.north_face(i, j);
      flow.flux_east(i, j) = face_flux(east.centre, east.area);
      flow.flux_north(i, j) = face_flux(north.centre, north.area);
    }
  }
  flow.boundary_flux.clear();
  for (const BoundaryFace& f : flow.faces) flow.boundary_flux.push_back(face_flux(f.centre, f.area));
  // SA does not use the wall shear stress; any values of the right size.
  flow.wall_shear.assign(collect_wall_faces(boundaries).size(), 1.0);

  // Continuity of the discrete fluxes: interior faces plus the boundary faces of each cell.
  std::vector<double> imbalance(grid.n_owned(), 0.0);
  for (int j = grid.y_begin(); j < grid.y_end(); ++j) {
    for (int i = grid.x_begin(); i < grid.x_end(); ++i) {
      double& sum = imbalance[grid.owned(i, j)];
      if (grid.has_east(i)) sum += flow.flux_east(i, j);
      if (grid.has_west(i)) sum -= flow.flux_east(i - 1, j);
      if (grid.has_north(j)) sum += flow.flux_north(i, j);
      if (grid.has_south(j)) sum -= flow.flux_north(i, j - 1);
    }
  }
  for (size_t k = 0; k < flow.faces.size(); ++k)
    imbalance[grid.owned(flow.faces[k].i, flow.faces[k].j)] += flow.boundary_flux[k];
  for (double sum : imbalance) flow.max_cell_imbalance = std::max(flow.max_cell_imbalance, std::abs(sum));
  flow.max_cell_imbalance = grid.global_max(flow.max_cell_imbalance);
}

BoundarySegmentSpec side_of_kind(Side side, BoundaryKind kind) {
  BoundarySegmentSpec segment;
  segment.side = side;
  segment.kind = kind;
  return segment;
}

CaseSpec sa_case(int n, const MmsVariant& variant) {
  CaseSpec spec;
  spec.title = "sa_manufactured";
  spec.flow.kinematic_viscosity = nu;
  spec.grid.generator = GridGenerator::skewed_box;
  spec.grid.cells_x = n;
  spec.grid.cells_y = n;
  spec.grid.length = 0.5;
  spec.grid.height = 0.5;
  spec.grid.skew_amplitude = 0.04;  // curvilinear, non-orthogonal; the sides stay straight
  // Velocity values are irrelevant (frozen flow); the nu_tilde values come from the exact solution.
  spec.boundaries = {
      side_of_kind(Side::bottom, BoundaryKind::wall), side_of_kind(Side::left, BoundaryKind::inflow),
      side_of_kind(Side::right, BoundaryKind::inflow), side_of_kind(Side::top, BoundaryKind::inflow)};
  spec.turbulence.model = "spalart_allmaras";
  spec.turbulence.variant = variant.name;
  spec.turbulence.relax = 0.95;
  spec.turbulence.convection = ConvectionScheme::bounded_linear_upwind;
  return spec;
}

struct GridResult {
  double error_l2;       ///< volume-weighted RMS error of nu_tilde [m^2/s]
  double error_max;      ///< largest cell error [m^2/s]
  double imbalance;      ///< max continuity imbalance of the frozen fluxes [m^2/s]
  double residual_drop;  ///< last model residual / first
  double last_change;    ///< max |change of nu_tilde| in the last update [m^2/s]
  int updates;
  int clipped;         ///< cells held at nu_tilde = 0 by the model's clipping (exact value > 0)
  int negative_cells;  ///< cells whose computed nu_tilde is below zero
  bool converged;      ///< stopped by the residual drop or at a fixed point, not by the cap
};

// Collective: solves the SA equation of `variant` on an n x n grid; the error of nu_tilde.
GridResult solve_on(int n, const MmsVariant& variant) {
  const double nu_max = variant.nu_max;
  const CaseSpec spec = sa_case(n, variant);
  NodeCoordinates nodes = generate_nodes(spec.grid);
  for (Vec2& node : nodes.nodes) node.x += 0.5;  // the box [0, 0.5]^2 moved to 0.5 <= x <= 1
  const Grid grid(MPI_COMM_WORLD, nodes, false);
  const BoundaryMap boundaries(spec, grid.nodes());
  FrozenFlow frozen;
  fill_frozen_flow(grid, boundaries, frozen);
  const BoundaryConditions conditions(spec.boundaries, spec.flow.reference_pressure);
  const MeanFlowView view{grid,
                          boundaries,
                          conditions,
                          frozen.faces,
                          frozen.boundary_flux,
                          frozen.velocity,
                          frozen.grad_u,
                          frozen.grad_v,
                          frozen.flux_east,
                          frozen.flux_north,
                          frozen.wall_shear,
                          nu};

  SpalartAllmaras model(spec, grid, boundaries);
  model.set_extra_source([&variant](Vec2 r) { return variant.source(r.x, r.y); });
  model.set_boundary_value([&variant](Vec2 r) { return variant.nu_tilde(r.x, r.y); });
  // Iterate until the residual has dropped by 1e-10, or until a fixed point: an update that
  // changes nu_tilde by less than 1e-12 nu_max. The residual then stagnates at the imbalance of
  // the cells the model clips at nu_tilde = 0 (standard and noft2, next to the wall, where the
  // discrete solution would be slightly negative).
  constexpr int max_updates = 2000;
  GridResult result{};
  double first = 0.0;
  Field& nt = model.variable();
  while (result.updates < max_updates) {
    const std::vector<double> before = nt.data();
    model.update(view);
    const double residual = model.residuals()[0].value;
    if (result.updates++ == 0) first = residual;
    double change = 0.0;
    for (int j = grid.y_begin(); j < grid.y_end(); ++j)
      for (int i = grid.x_begin(); i < grid.x_end(); ++i)
        change = std::max(change, std::abs(nt(i, j) - before[grid.local(i, j)]));
    result.last_change = grid.global_max(change);
    result.residual_drop = residual / first;
    if (!(result.residual_drop < 1e6)) break;  // diverged (or NaN)
    if (result.residual_drop <= 1e-10 || result.last_change < 1e-12 * nu_max) {
      result.converged = true;
      break;
    }
  }

  double volume = 0.0, squared = 0.0, largest = 0.0;
  int clipped = 0, negative_cells = 0;
  for (int j = grid.y_begin(); j < grid.y_end(); ++j) {
    for (int i = grid.x_begin(); i < grid.x_end(); ++i) {
      const Vec2 c = grid.centre(i, j);
      const double w = grid.volume(i, j), exact = variant.nu_tilde(c.x, c.y);
      volume += w;
      squared += w * std::pow(nt(i, j) - exact, 2);
      largest = std::max(largest, std::abs(nt(i, j) - exact));
      if (nt(i, j) == 0.0 && exact > 0.0) ++clipped;
      if (nt(i, j) < 0.0) ++negative_cells;
    }
  }
  result.error_l2 = std::sqrt(grid.global_sum(squared) / grid.global_sum(volume));
  result.error_max = grid.global_max(largest);
  result.clipped = static_cast<int>(grid.global_sum(clipped));
  result.negative_cells = static_cast<int>(grid.global_sum(negative_cells));
  result.imbalance = frozen.max_cell_imbalance;
  return result;
}

void check_order(const MmsVariant& variant) {
  const double nu_max = variant.nu_max;
  const int sizes[4] = {16, 32, 64, 128};
  std::vector<GridResult> results;
  for (int n : sizes) results.push_back(solve_on(n, variant));
  int rank = 0;
  MPI_Comm_rank(MPI_COMM_WORLD, &rank);
  if (rank == 0) {
    std::printf(
        "%s\n   n  L2 error     /nu_max    order  max error  updates  residual drop  last change  clipped  "
        "nt<0\n",
        variant.name);
  }
  for (size_t m = 0; m < results.size(); ++m) {
    const GridResult& r = results[m];
    if (rank == 0) {
      char order[16] = "    -";
      if (m > 0) std::snprintf(order, sizeof order, "%5.3f", std::log2(results[m - 1].error_l2 / r.error_l2));
      std::printf("%4d  %.4e  %.3e  %s  %.3e  %7d  %13.1e  %11.1e  %7d  %4d\n", sizes[m], r.error_l2,
                  r.error_l2 / nu_max, order, r.error_max, r.updates, r.residual_drop, r.last_change,
                  r.clipped, r.negative_cells);
    }
    // The exact fluxes telescope: eight psi evaluations of size <= 0.5 per cell, each rounded to
    // about 1e-16, so the imbalance is at most about 2e-15.
    EXPECT_LT(r.imbalance, 2e-15) << "n = " << sizes[m];
    EXPECT_TRUE(r.converged) << "n = " << sizes[m] << ": residual drop " << r.residual_drop
                             << ", last change " << r.last_change << " after " << r.updates << " updates";
    // Sanity: the error is a small fraction of the solution's scale nu_max.
    EXPECT_LT(r.error_l2, 0.1 * nu_max) << "n = " << sizes[m];
  }
  // The negative variant must really solve on both branches.
  if (variant.negative_branch) {
    EXPECT_GT(results.back().negative_cells, sizes[3] * sizes[3] / 4);
  }
  // Observed order p = log2(e_coarse / e_fine) (refinement ratio 2) on the two finest pairs; Eca
  // et al. 2007 observe p = 2.0 for MS2 with a second-order scheme, so require p >= 1.8.
  for (size_t m = 2; m < results.size(); ++m) {
    EXPECT_GE(std::log2(results[m - 1].error_l2 / results[m].error_l2), 1.8)
        << variant.name << ": grids " << sizes[m - 1] << " -> " << sizes[m];
  }
}

}  // namespace

TEST(SaManufacturedSolution, StreamFunctionGivesTheVelocity) {
  // u = d psi/dy, v = -d psi/dx by central differences (h = 1e-6: truncation h^2 psi'''/6 ~ 1e-11,
  // rounding 1e-16 / h = 1e-10), at points near the wall, in the layer and near the top.
  const double h = 1e-6;
  for (const auto& [x, y] : {std::pair{0.55, 0.004}, {0.6, 0.06}, {0.75, 0.04}, {0.9, 0.2}, {0.98, 0.45}}) {
    const auto [u, v] = sa_mms::velocity(x, y);
    EXPECT_NEAR((sa_mms::stream_function(x, y + h) - sa_mms::stream_function(x, y - h)) / (2 * h), u, 1e-9);
    EXPECT_NEAR(-(sa_mms::stream_function(x + h, y) - sa_mms::stream_function(x - h, y)) / (2 * h), v, 1e-9);
    const auto [u_x, u_y, v_x, v_y] = sa_mms::velocity_gradient(x, y);
    EXPECT_NEAR(u_x + v_y, 0.0, 1e-13);
    EXPECT_NEAR(u_y, (sa_mms::velocity(x, y + h)[0] - sa_mms::velocity(x, y - h)[0]) / (2 * h), 1e-7);
    EXPECT_NEAR(v_x, (sa_mms::velocity(x + h, y)[1] - sa_mms::velocity(x - h, y)[1]) / (2 * h), 1e-7);
  }
}

TEST(SaManufacturedSolution, GeneratedSourceMatchesFiniteDifferences) {
  // The generated source against its definition evaluated here with central differences of the
  // generated nu_tilde and the generated closure: s = u.grad nt - Q - (1/sigma)[div(nu_eff grad nt)
  // + c_b2 |grad nt|^2]. Checks the code printing of the script, not the model. h = 1e-5 against
  // the scale x/sigma_nu >= 0.05 of nu_tilde: truncation (h/0.05)^2 ~ 4e-8, rounding ~ 1e-16 (0.05/h)^2
  // ~ 3e-9; compare against 1e-6 of the size of the transport terms.
  constexpr double sa_sigma = 2.0 / 3.0, sa_cb2 = 0.622;  // Spalart & Allmaras 1994
  const double h = 1e-5;
  for (const MmsVariant* v : {&standard, &noft2, &negative}) {
    for (const auto& [x, y] : {std::pair{0.55, 0.004}, {0.6, 0.06}, {0.75, 0.04}, {0.9, 0.2}, {0.98, 0.45}}) {
      auto nt = [v](double px, double py) { return v->nu_tilde(px, py); };
      auto nu_eff = [&](double px, double py) { return v->closure(nt(px, py), nu, py, 0.0)[1]; };
      const double n0 = nt(x, y);
      const double n_x = (nt(x + h, y) - nt(x - h, y)) / (2 * h),
                   n_y = (nt(x, y + h) - nt(x, y - h)) / (2 * h);
      // div(nu_eff grad nt) as differences of face fluxes at +-h/2.
      auto flux_x = [&](double px) { return nu_eff(px, y) * (nt(px + h / 2, y) - nt(px - h / 2, y)) / h; };
      auto flux_y = [&](double py) { return nu_eff(x, py) * (nt(x, py + h / 2) - nt(x, py - h / 2)) / h; };
      const double div =
          (flux_x(x + h / 2) - flux_x(x - h / 2)) / h + (flux_y(y + h / 2) - flux_y(y - h / 2)) / h;
      const auto [u, vel_v] = sa_mms::velocity(x, y);
      const auto grad = sa_mms::velocity_gradient(x, y);
      const double omega = std::abs(grad[2] - grad[1]);
      const double q = v->closure(n0, nu, y, omega)[0];
      const double expected = u * n_x + vel_v * n_y - q - (div + sa_cb2 * (n_x * n_x + n_y * n_y)) / sa_sigma;
      const double scale = std::abs(u * n_x) + std::abs(vel_v * n_y) + std::abs(div / sa_sigma) + std::abs(q);
      EXPECT_NEAR(v->source(x, y), expected, 1e-6 * scale) << v->name << " at (" << x << ", " << y << ")";
    }
  }
}

TEST(SaManufacturedSolution, ModelClosureMatchesPublishedEquations) {
  // The model's sa_source against the closure generated from the publications, point by point
  // over chi from -50 to 1000 (both branches), wall distances and vorticities that put the S-tilde
  // limiter, the r cap and f_t2 on either side. Both are closed-form: agreement to round-off, 1e-11
  // of the larger of production and destruction (a few hundred operations, cancellation between
  // the two terms of at most a factor 10 in this sample).
  int compared = 0, limited = 0, capped = 0;
  for (const MmsVariant* v : {&standard, &noft2, &negative}) {
    for (const double chi : {-50.0, -3.0, -0.3, 0.01, 0.5, 1.0, 2.0, 4.0, 10.0, 40.0, 200.0, 1000.0}) {
      if (chi < 0.0 && !v->negative_branch) continue;
      for (const double d : {1e-5, 1e-3, 1e-1}) {
        for (const double omega : {1e-3, 1.0, 1e2, 1e4, 1e6}) {
          const double nt = chi * nu;
          const SaSource s = sa_source(nt, nu, d, omega, 0.0, v->with_ft2, v->negative_branch);
          const double destruction = s.destruction_coefficient * nt;
          const auto [q, nu_eff] = v->closure(nt, nu, d, omega);
          const double scale = std::max(std::abs(s.production), std::abs(destruction));
          EXPECT_NEAR(s.production - destruction, q, 1e-11 * scale)
              << v->name << " chi " << chi << " d " << d << " omega " << omega;
          const double fn_scale = nu + std::abs(nt);
          EXPECT_NEAR(s.diffusivity * (2.0 / 3.0), nu_eff, 1e-13 * fn_scale) << v->name << " chi " << chi;
          ++compared;
          // Which parts of the closure the sample reaches (S-bar and r as in the publications).
          const double chi3 = chi * chi * chi, k2d2 = 0.41 * 0.41 * d * d;
          const double s_bar = nt * (1.0 - chi / (1.0 + chi * chi3 / (chi3 + 7.1 * 7.1 * 7.1))) / k2d2;
          if (nt > 0.0 && s_bar < -0.7 * omega) ++limited;
          if (nt > 0.0 && s_bar >= -0.7 * omega && nt / ((omega + s_bar) * k2d2) > 10.0) ++capped;
        }
      }
    }
  }
  EXPECT_EQ(compared, 2 * 9 * 15 + 12 * 15);
  EXPECT_GT(limited, 10);  // S-tilde limiter of Allmaras, Johnson & Spalart (2012)
  EXPECT_GT(capped, 10);   // r = 10
}

TEST(SaManufacturedSolution, SecondOrderStandard) { check_order(standard); }
TEST(SaManufacturedSolution, SecondOrderNoFt2) { check_order(noft2); }
TEST(SaManufacturedSolution, SecondOrderNegative) { check_order(negative); }
