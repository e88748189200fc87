// Solid (blanked) cells against the equivalent plain grid: a channel whose lower half is solid
// must give the plain channel of half the height, because the fluid part has the same cells and
// the faces next to the solid cells are the same no-slip walls (the same discrete equations).
// Laminar Poiseuille flow (exact solution: textbook, e.g. White, Viscous Fluid Flow, 3rd ed. 2006,
// sec. 3-3.2; checked for the plain channel in test_poiseuille) converged on both grids, and the
// Spalart-Allmaras channel (configs/channel_sa_re180.yaml) after a fixed number of iterations,
// which also compares the wall distance (the buried bottom wall must not count).
#include <gtest/gtest.h>
#include <petscsys.h>

#include <algorithm>
#include <array>
#include <cmath>
#include <cstdio>
#include <memory>
#include <string>
#include <vector>

#include "case_runner.hpp"
#include "io/case_loader.hpp"

using namespace wallrans;

namespace {

// The fields of a run on the cells of the fluid part, in global (i, j) order with j counted from
// the first fluid row (`j_offset` rows of solid cells below), the same on every rank.
struct FluidPart {
  int nx = 0, ny = 0;
  std::vector<double> u, v, p;
  std::vector<std::vector<double>> model;   // the model's output fields, then the eddy viscosity
  std::vector<double> tau_bottom, tau_top;  // signed wall shear of the lower and upper wall faces, by i
  double bulk = 0.0;                        // volume-weighted mean u over the fluid
  int iterations = 0;
};

FluidPart fluid_part(const test_support::CaseRun& run, int j_offset) {
  const Grid& grid = *run.grid;
  const FlowSolver& solver = *run.solver;
  FluidPart out;
  out.nx = grid.cells_x();
  out.ny = grid.cells_y() - j_offset;
  const size_t n = static_cast<size_t>(out.nx) * out.ny;
  std::vector<const Field*> model_fields;
  for (const auto& [name, field] : run.model->output_fields()) model_fields.push_back(field);
  model_fields.push_back(&run.model->eddy_viscosity());
  out.u.assign(n, 0.0);
  out.v.assign(n, 0.0);
  out.p.assign(n, 0.0);
  out.model.assign(model_fields.size(), std::vector<double>(n, 0.0));
  double flow = 0.0, volume = 0.0;
  for (int j = std::max(grid.y_begin(), j_offset); j < grid.y_end(); ++j) {
    for (int i = grid.x_begin(); i < grid.x_end(); ++i) {
      const size_t k = static_cast<size_t>(j - j_offset) * out.nx + i;
      out.u[k] = solver.velocity().x(i, j);
      out.v[k] = solver.velocity().y(i, j);
      out.p[k] = solver.pressure()(i, j);
      for (size_t m = 0; m < model_fields.size(); ++m) out.model[m][k] = (*model_fields[m])(i, j);
      flow += out.u[k] * grid.volume(i, j);
      volume += grid.volume(i, j);
    }
  }
  out.tau_bottom.assign(static_cast<size_t>(out.nx), 0.0);
  out.tau_top.assign(static_cast<size_t>(out.nx), 0.0);
  for (const WallSample& w : solver.wall_samples()) {
    // The lower wall: the block's bottom side, or (solid case) the faces on the solid below.
    if (w.side == Side::bottom) out.tau_bottom[static_cast<size_t>(w.index)] = w.shear_stress;
    if (w.side == Side::top) out.tau_top[static_cast<size_t>(w.index)] = w.shear_stress;
  }
  auto sum = [&](std::vector<double>& values) {
    MPI_Allreduce(MPI_IN_PLACE, values.data(), static_cast<int>(values.size()), MPI_DOUBLE, MPI_SUM,
                  grid.comm());
  };
  for (auto* values : {&out.u, &out.v, &out.p, &out.tau_bottom, &out.tau_top}) sum(*values);
  for (auto& values : out.model) sum(values);
  out.bulk = grid.global_sum(flow) / grid.global_sum(volume);
  out.iterations = run.status.iteration;
  return out;
}

double max_difference(const std::vector<double>& a, const std::vector<double>& b) {
  EXPECT_EQ(a.size(), b.size());
  double worst = 0.0;
  for (size_t k = 0; k < a.size() && k < b.size(); ++k) worst = std::max(worst, std::abs(a[k] - b[k]));
  return worst;
}

int world_size() {
  int size = 1;
  MPI_Comm_size(MPI_COMM_WORLD, &size);
  return size;
}

int world_rank() {
  int rank = 0;
  MPI_Comm_rank(MPI_COMM_WORLD, &rank);
  return rank;
}

// Pressure differences: p - p(cell 0), so the comparison does not depend on the pressure level.
std::vector<double> pressure_differences(const std::vector<double>& p) {
  std::vector<double> out;
  for (double value : p) out.push_back(value - p.front());
  return out;
}

CaseSpec shipped(const std::string& name) {
  return load_case_file(std::string(WALLRANS_SOURCE_DIR) + "/configs/" + name + ".yaml");
}

// Both Poiseuille cases, iterated to a normalised residual of 1e-13 (inner solves at rtol 1e-12,
// from the case files).
constexpr double tight_residual = 1e-13;

void compare_poiseuille(MPI_Comm comm_plain, MPI_Comm comm_solid) {
  CaseSpec plain = shipped("channel_poiseuille"), solid = shipped("channel_poiseuille_solid");
  plain.iterations.residual_drop = solid.iterations.residual_drop = tight_residual;
  plain.iterations.max = solid.iterations.max = 5000;
  ASSERT_EQ(solid.grid.cells_y, 2 * plain.grid.cells_y);
  ASSERT_EQ(solid.grid.height, 2.0 * plain.grid.height);
  const auto plain_run = test_support::run_case_on(comm_plain, plain, [](FlowSolver&) {});
  const auto solid_run = test_support::run_case_on(comm_solid, solid, [](FlowSolver&) {});
  ASSERT_TRUE(plain_run.converged);
  ASSERT_TRUE(solid_run.converged);
  const FluidPart a = fluid_part(plain_run, 0), b = fluid_part(solid_run, plain.grid.cells_y);
  // Scales: the centreline velocity U_max = G H^2 / (8 nu) = 1.5 m/s, the wall shear
  // G H / 2 = 0.03 m^2/s^2 and the dynamic pressure U_b^2 / 2 = 0.5 m^2/s^2.
  const double g = -plain.periodic.mean_pressure_gradient, h = plain.grid.height,
               nu = plain.flow.kinematic_viscosity;
  const double u_max = g * h * h / (8.0 * nu), tau = 0.5 * g * h, dynamic = 0.5;
  const double du = std::max(max_difference(a.u, b.u), max_difference(a.v, b.v)) / u_max;
  const double dp = max_difference(pressure_differences(a.p), pressure_differences(b.p)) / dynamic;
  const double dtau =
      std::max(max_difference(a.tau_bottom, b.tau_bottom), max_difference(a.tau_top, b.tau_top)) / tau;
  const double dbulk = std::abs(a.bulk - b.bulk) / u_max;
  std::printf(
      "Poiseuille, solid lower half vs plain (%d / %d iterations): |du|/U_max %.2e, |dp|/(U_b^2/2) %.2e, "
      "|dtau|/tau_w %.2e, |dU_b|/U_max %.2e\n",
      b.iterations, a.iterations, du, dp, dtau, dbulk);
  // Tolerance 1e-10: the two runs solve the same discrete equations (the fluid cells coincide up
  // to round-off in the node coordinates, about 1e-16 relative), so they differ only by their
  // iteration errors and round-off. Each stops with normalised residuals below 1e-13; the outer
  // iteration contracts by about 0.96 per iteration at the end (a residual drop of 1e-4 takes
  // about 235 iterations on this case), so the remaining iteration error is about
  // 1e-13 / (1 - 0.96) = 2.5e-12 of the velocity scale per run, 5e-12 for the difference; inner
  // solves at rtol 1e-12 and round-off (1e-16 times a condition number of order ny^2 = 1e3) add
  // less. 1e-10 keeps a factor 20 above that estimate and lies six orders below the
  // discretisation error of any grid we run.
  EXPECT_LT(du, 1e-10);
  EXPECT_LT(dp, 1e-10);
  EXPECT_LT(dtau, 1e-10);
  EXPECT_LT(dbulk, 1e-10);
  // The solid cells stay at rest and carry no pressure, so a viewer's threshold on `solid` drops them.
  const Grid& grid = *solid_run.grid;
  double at_rest = 0.0;
  for (int j = grid.y_begin(); j < std::min(grid.y_end(), plain.grid.cells_y); ++j) {
    for (int i = grid.x_begin(); i < grid.x_end(); ++i) {
      EXPECT_EQ(solid_run.solver->solid()(i, j), 1.0);
      at_rest = std::max({at_rest, std::abs(solid_run.solver->velocity().x(i, j)),
                          std::abs(solid_run.solver->velocity().y(i, j)),
                          std::abs(solid_run.solver->pressure()(i, j))});
    }
  }
  EXPECT_EQ(grid.global_max(at_rest), 0.0);
}

// The SA channel's nodes with `n_solid` rows of cells below y = 0 (uniform, down to y = -1): the
// fluid part's nodes are the plain channel's, bit for bit.
NodeCoordinates with_solid_rows_below(const NodeCoordinates& plain, int n_solid) {
  NodeCoordinates nodes;
  nodes.cells_x = plain.cells_x;
  nodes.cells_y = plain.cells_y + n_solid;
  nodes.nodes.resize(static_cast<size_t>(nodes.cells_x + 1) * (nodes.cells_y + 1));
  for (int j = 0; j <= nodes.cells_y; ++j) {
    for (int i = 0; i <= nodes.cells_x; ++i) {
      nodes.at(i, j) = j >= n_solid ? plain.at(i, j - n_solid)
                                    : Vec2{plain.at(i, 0).x, -static_cast<double>(n_solid - j) / n_solid};
    }
  }
  return nodes;
}

test_support::CaseRun run_iterations(MPI_Comm comm, const CaseSpec& spec, const NodeCoordinates& nodes,
                                     int iterations) {
  test_support::CaseRun run;
  run.grid = std::make_unique<Grid>(comm, nodes, spec.periodic.axis == PeriodicAxis::x);
  run.boundaries = std::make_unique<BoundaryMap>(spec, run.grid->nodes());
  run.model = make_turbulence_model(spec, *run.grid, *run.boundaries);
  run.solver = std::make_unique<FlowSolver>(spec, *run.grid, *run.boundaries, *run.model);
  for (int k = 0; k < iterations; ++k) run.status = run.solver->iterate();
  return run;
}

void compare_sa_channel(MPI_Comm comm) {
  // Tight inner solves for every equation, set before any solver reads its options.
  const char* options = "-momentum_ksp_rtol 1e-13 -pressure_ksp_rtol 1e-13 -turbulence_ksp_rtol 1e-13";
  ASSERT_EQ(PetscOptionsInsertString(nullptr, options), 0);
  CaseSpec plain = shipped("channel_sa_re180");
  plain.iterations.petsc_options.clear();
  const NodeCoordinates plain_nodes = generate_nodes(plain.grid);
  constexpr int n_solid = 32, n_iterations = 40;
  CaseSpec solid = plain;
  SolidRegionSpec below;
  below.y = std::array{-2.0, 0.0};  // every cell of the added rows (centres at y < 0)
  solid.solid_regions = {below};
  const NodeCoordinates solid_nodes = with_solid_rows_below(plain_nodes, n_solid);
  const auto plain_run = run_iterations(comm, plain, plain_nodes, n_iterations);
  const auto solid_run = run_iterations(comm, solid, solid_nodes, n_iterations);
  for (const char* name : {"-momentum_ksp_rtol", "-pressure_ksp_rtol", "-turbulence_ksp_rtol"})
    ASSERT_EQ(PetscOptionsClearValue(nullptr, name), 0);
  ASSERT_EQ(solid_run.boundaries->solid().count(), n_solid * plain.grid.cells_x);
  const FluidPart a = fluid_part(plain_run, 0), b = fluid_part(solid_run, n_solid);
  // Scales: u_tau = 1 (wall units, so the wall shear is about 1), the bulk velocity U_ref = 18,
  // and nu_t, nu_tilde up to about 0.1 h u_tau here; wall distance and y+ relative to h = 1 and
  // Re_tau.
  const double u_ref = plain.flow.reference_velocity;
  const double du = std::max(max_difference(a.u, b.u), max_difference(a.v, b.v)) / u_ref;
  const double dtau =
      std::max(max_difference(a.tau_bottom, b.tau_bottom), max_difference(a.tau_top, b.tau_top));
  const char* model_names[] = {"wall_distance", "y_plus", "nu_tilde", "eddy_viscosity"};
  const double model_scale[] = {1.0, 1.0 / plain.flow.kinematic_viscosity, 0.1, 0.1};
  ASSERT_EQ(a.model.size(), 4u);
  const bool report = world_rank() == 0;
  if (report)
    std::printf("SA channel, solid rows below vs plain, after %d iterations: |du|/U_ref %.2e, |dtau| %.2e",
                n_iterations, du, dtau);
  for (size_t m = 0; m < a.model.size(); ++m) {
    const double d = max_difference(a.model[m], b.model[m]) / model_scale[m];
    if (report) std::printf(", %s %.2e", model_names[m], d);
    // Wall distance: the same point-segment distances on the same nodes, to round-off. The other
    // fields: as the velocity below.
    EXPECT_LT(d, 1e-10) << model_names[m];
  }
  if (report) std::printf("\n");
  // Tolerance 1e-10: identical discrete equations on bit-identical fluid cells, so after the same
  // number of outer iterations the runs differ only by their inner solves (rtol 1e-13 of each
  // solve's initial residual, itself at most the change of one iteration, below the velocity
  // scale) and round-off: at most 1e-13 per iteration, 40 iterations 4e-12 if nothing contracts;
  // 1e-10 keeps a factor 25.
  EXPECT_LT(du, 1e-10);
  EXPECT_LT(dtau, 1e-10);
}

}  // namespace

TEST(SolidEquivalence, PoiseuilleWithSolidLowerHalfEqualsHalfHeightChannel) {
  if (world_size() > 1) GTEST_SKIP() << "one-rank test; the 2-rank binary runs the parallel variants";
  compare_poiseuille(MPI_COMM_WORLD, MPI_COMM_WORLD);
}

TEST(SolidEquivalence, PoiseuilleOnAllRanksEqualsHalfHeightChannelOnOneRank) {
  if (world_size() < 2) GTEST_SKIP() << "run with 2 ranks (test_solid_equivalence_np2)";
  compare_poiseuille(MPI_COMM_SELF, MPI_COMM_WORLD);
}

TEST(SolidEquivalence, SpalartAllmarasChannelWithSolidRowsBelowEqualsPlainChannel) {
  compare_sa_channel(MPI_COMM_WORLD);
}
