// Periodic hill at Re_h = 10 595 (configs/hill_sa.yaml, Spalart-Allmaras): separation and
// reattachment points of the bottom-wall shear on three grids of one family (384 x 192 and the
// grids made from it by dropping every other grid line twice, r = 2), observed order,
// Richardson extrapolation and GCI (Roache 1994; Celik et al. 2008), beside the wall-resolved LES
// values of Breuer, Peller, Rapp & Manhart (2009, Computers & Fluids 38:433) and Froehlich et al.
// (2005, J. Fluid Mech. 526:19): separation x/h ~ 0.19-0.22, reattachment ~ 4.6-4.7 (recalled
// from memory in the shared reference README, not verified against the papers). RANS models
// typically misplace reattachment on this case: the values are reported, not asserted against
// the LES. Writes hill_gci_<nx>x<ny>_bottom_wall.csv (x, floor y, Cf) per grid for
// docs/validation-hill.md. Long: several minutes on 2 ranks.
#include <gtest/gtest.h>
#include <mpi.h>

#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <fstream>
#include <memory>
#include <string>
#include <vector>

#include "coupling/nested_start.hpp"
#include "coupling/shear_sign_changes.hpp"
#include "grid/boundary.hpp"
#include "grid/grid_quality.hpp"
#include "meshes/hill.hpp"
#include "models/model_factory.hpp"
#include "validation/grid_convergence.hpp"
#include "verification/hill_support.hpp"

using namespace wallrans;

namespace {

struct GridResult {
  int cells_x = 0, cells_y = 0, iterations = 0;
  bool converged = false;
  double seconds = 0.0, separation = NAN, reattachment = NAN, gradient = NAN;
  double bulk_error = NAN, mass_imbalance = NAN, non_orthogonality = NAN, max_y_plus = 0.0;
  size_t n_zeros = 0;
};

GridResult solve_on(const CaseSpec& shipped, const NodeCoordinates& nodes) {
  CaseSpec spec = shipped;
  spec.grid.cells_x = nodes.cells_x;
  spec.grid.cells_y = nodes.cells_y;
  spec.iterations.coarse_grids = 0;  // the nested start does not pay off here (docs/validation-hill.md)
  const double h = spec.grid.hill_height, target = *spec.periodic.bulk_velocity;
  const Grid grid(MPI_COMM_WORLD, nodes, true);
  const BoundaryMap boundaries(spec, grid.nodes());
  auto model = make_turbulence_model(spec, grid, boundaries);
  FlowSolver solver(spec, grid, boundaries, *model);
  GridResult g;
  g.cells_x = nodes.cells_x;
  g.cells_y = nodes.cells_y;
  g.non_orthogonality = measure_quality(grid).max_non_orthogonality;
  const auto start = std::chrono::steady_clock::now();
  IterationStatus status;
  do {
    status = solver.iterate();
    g.converged = solver.converged(status);
  } while (!g.converged && status.iteration < spec.iterations.max);
  g.seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
  g.iterations = status.iteration;
  const PeriodicDriving driving = solver.periodic_driving();
  g.gradient = driving.mean_pressure_gradient;
  g.bulk_error = driving.bulk_velocity / target - 1.0;
  const MassBalance balance = solver.mass_balance();
  g.mass_imbalance = balance.cells_l1 / balance.through_flow;
  const auto shear = test_support::bottom_wall_shear(solver, MPI_COMM_WORLD);
  const auto zeros = shear_sign_changes(shear.x, shear.tau, hill_period_in_h * h);
  g.n_zeros = zeros.size();
  // The primary bubble: the first separation and the last reattachment along the floor from the
  // crest. Pairs between them are grazing contacts inside the bubble (on the 384 x 192 grid two,
  // at x/h 0.91-0.95 and 1.78-1.83, where Cf reaches +3e-6 against -6e-4 in the bubble; measured
  // 2026-12-03); they are counted and printed, not taken as the bubble's ends.
  if (!zeros.empty() && zeros.front().is_separation) g.separation = zeros.front().s / h;
  if (!zeros.empty() && !zeros.back().is_separation) g.reattachment = zeros.back().s / h;
  double y_plus = 0.0;
  for (const WallSample& w : solver.wall_samples())
    y_plus = std::max(
        y_plus, w.first_cell_distance * std::sqrt(std::abs(w.shear_stress)) / spec.flow.kinematic_viscosity);
  MPI_Allreduce(&y_plus, &g.max_y_plus, 1, MPI_DOUBLE, MPI_MAX, MPI_COMM_WORLD);
  if (test_support::is_root()) {
    const std::string name =
        "hill_gci_" + std::to_string(g.cells_x) + "x" + std::to_string(g.cells_y) + "_bottom_wall.csv";
    std::ofstream out(name);
    out << "x_over_h,floor_y_over_h,cf\n";
    out.precision(10);
    for (size_t k = 0; k < shear.x.size(); ++k)
      out << shear.x[k] / h << "," << hill_floor(shear.x[k], h) / h << ","
          << 2.0 * shear.tau[k] / (target * target) << "\n";
    std::printf("hill GCI: grid %d x %d: %s after %d iterations (%.0f s), %zu shear zeros\n", g.cells_x,
                g.cells_y, g.converged ? "converged" : "NOT converged", g.iterations, g.seconds, g.n_zeros);
    std::fflush(stdout);
  }
  return g;
}

}  // namespace

TEST(HillGridConvergence, SeparationAndReattachmentGci) {
  const CaseSpec shipped = test_support::hill_case(384, 192);  // first cell 5e-4 h
  std::vector<NodeCoordinates> family{generate_nodes(shipped.grid)};
  for (int level = 1; level < 3; ++level) family.push_back(coarsen(family.back(), true, true));
  std::vector<GridResult> grids;  // fine, medium, coarse
  for (const NodeCoordinates& nodes : family) grids.push_back(solve_on(shipped, nodes));

  const double foot = 54.0 / 28.0;  // x/h of the foot of the descending hill
  for (const GridResult& g : grids) {
    SCOPED_TRACE(std::to_string(g.cells_x) + " x " + std::to_string(g.cells_y));
    ASSERT_TRUE(g.converged);
    // Held to 1e-6 and balanced to 1e-10 of the through-flow at convergence (issue 8).
    EXPECT_LT(std::abs(g.bulk_error), 1e-6);
    EXPECT_LT(g.mass_imbalance, 1e-10);
    // One primary bubble: separation on the lee slope of the hill, reattachment downstream of
    // its foot and before the next crest (zeros come in pairs on a periodic wall).
    ASSERT_GE(g.n_zeros, 2u);
    EXPECT_EQ(g.n_zeros % 2, 0u);
    ASSERT_TRUE(std::isfinite(g.separation) && std::isfinite(g.reattachment));
    EXPECT_GT(g.separation, 0.0);
    EXPECT_LT(g.separation, foot);
    EXPECT_GT(g.reattachment, foot);
    EXPECT_LT(g.reattachment, hill_period_in_h);
  }
  const double r = 2.0;
  const auto sep =
      test_support::grid_convergence(grids[0].separation, grids[1].separation, grids[2].separation, r);
  const auto rea =
      test_support::grid_convergence(grids[0].reattachment, grids[1].reattachment, grids[2].reattachment, r);
  // Computed: finite numbers (an oscillatory or stalled sequence is reported as such, not hidden).
  for (const auto* c : {&sep, &rea}) {
    EXPECT_TRUE(std::isfinite(c->order));
    EXPECT_TRUE(std::isfinite(c->gci_fine));
    EXPECT_TRUE(std::isfinite(c->extrapolated));
  }
  if (test_support::is_root()) {
    std::printf(
        "\nhill GCI: r = 2, F_s = 1.25 (Roache 1998; Celik et al. 2008); x/h of the bottom-wall shear "
        "zeros\n\n");
    std::printf(
        "| grid | iterations | time [s] | dp/dx | max first-cell y+ | max non-orth. [deg] | separation x/h | "
        "reattachment x/h |\n");
    std::printf("|---|---|---|---|---|---|---|---|\n");
    for (const GridResult& g : grids) {
      std::printf("| %d x %d | %d | %.0f | %.6e | %.2f | %.1f | %.4f | %.4f |\n", g.cells_x, g.cells_y,
                  g.iterations, g.seconds, g.gradient, g.max_y_plus, g.non_orthogonality, g.separation,
                  g.reattachment);
    }
    std::printf(
        "\n| point | R | p | extrapolated x/h | GCI21 | GCI32 | GCI21 (p = 2) | LES x/h (memory) |\n");
    std::printf("|---|---|---|---|---|---|---|---|\n");
    std::printf("| separation | %.3f | %.2f | %.4f | %.3f %% | %.3f %% | %.3f %% | 0.19-0.22 |\n",
                sep.ratio_r, sep.order, sep.extrapolated, 100 * sep.gci_fine, 100 * sep.gci_medium,
                100 * sep.gci_fine_formal);
    std::printf("| reattachment | %.3f | %.2f | %.4f | %.3f %% | %.3f %% | %.3f %% | 4.6-4.7 |\n",
                rea.ratio_r, rea.order, rea.extrapolated, 100 * rea.gci_fine, 100 * rea.gci_medium,
                100 * rea.gci_fine_formal);
    std::printf(
        "\nbulk velocity error (fine, medium, coarse): %.1e %.1e %.1e; mass imbalance: %.1e %.1e %.1e\n",
        grids[0].bulk_error, grids[1].bulk_error, grids[2].bulk_error, grids[0].mass_imbalance,
        grids[1].mass_imbalance, grids[2].mass_imbalance);
  }
}
