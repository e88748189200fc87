// The converged answer must not depend on the under-relaxation factors or on the choice of
// SIMPLE/SIMPLEC: Rhie-Chow face fluxes carry the memory term of Majumdar (1988, Numer. Heat
// Transfer 13:125) for exactly this reason. Without it the face-flux dissipation scales with
// alpha_u and the fields differ at the level of the pressure-smoothing term. The relaxation may
// also act on only a share of the diffusive coefficients (iterations.relax_diffusive_part), which
// makes the relaxation vary from cell to cell; the generalised memory term keeps the answer the
// same.
#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>

#include "case_runner.hpp"

using namespace wallrans;

namespace {

struct Variant {
  Coupling coupling;
  double relax_u, relax_p, diffusive_share;
};

CaseSpec developing_channel() {
  // Inflow -> outflow through a short channel: exercises interior and outflow-boundary fluxes.
  CaseSpec spec;
  spec.flow.kinematic_viscosity = 0.01;
  spec.grid.generator = GridGenerator::channel;
  spec.grid.cells_x = 40;
  spec.grid.cells_y = 16;
  spec.grid.length = 2.0;
  spec.grid.height = 0.5;
  spec.grid.first_cell_height = 0.01;
  spec.boundaries = {{Side::left, {}, {}, BoundaryKind::inflow, {1.0, 0.0}, {}, 1, {}, {}, {}},
                     {Side::right, {}, {}, BoundaryKind::outflow, {}, {}, 2, {}, {}, {}},
                     {Side::bottom, {}, {}, BoundaryKind::wall, {}, {}, 3, {}, {}, {}},
                     {Side::top, {}, {}, BoundaryKind::wall, {}, {}, 4, {}, {}, {}}};
  return spec;
}

CaseSpec small_cavity() {
  CaseSpec spec;
  spec.flow.kinematic_viscosity = 0.01;
  spec.grid.generator = GridGenerator::skewed_box;  // non-orthogonal grid on purpose
  spec.grid.skew_amplitude = 0.05;
  spec.grid.cells_x = 24;
  spec.grid.cells_y = 24;
  spec.boundaries = {{Side::top, {}, {}, BoundaryKind::wall, {1.0, 0.0}, {}, 1, {}, {}, {}},
                     {Side::bottom, {}, {}, BoundaryKind::wall, {}, {}, 2, {}, {}, {}},
                     {Side::left, {}, {}, BoundaryKind::wall, {}, {}, 3, {}, {}, {}},
                     {Side::right, {}, {}, BoundaryKind::wall, {}, {}, 4, {}, {}, {}}};
  return spec;
}

void expect_same_answer(CaseSpec base, const char* label) {
  // Plain SIMPLE relaxes all of a_P (its pressure relaxation of about 1 - alpha_u assumes it).
  const Variant variants[4] = {{Coupling::simplec, 0.9, 1.0, 0.1},
                               {Coupling::simplec, 0.5, 1.0, 0.1},
                               {Coupling::simplec, 0.9, 1.0, 1.0},
                               {Coupling::simple, 0.7, 0.3, 1.0}};
  base.iterations.max = 20000;
  base.iterations.residual_drop = 1e-11;
  base.iterations.petsc_options = "-momentum_ksp_rtol 1e-3 -pressure_ksp_rtol 1e-3";
  std::vector<test_support::CaseRun> runs;
  for (const Variant& v : variants) {
    CaseSpec spec = base;
    spec.iterations.coupling = v.coupling;
    spec.iterations.relax_velocity = v.relax_u;
    spec.iterations.relax_pressure = v.relax_p;
    spec.iterations.relax_diffusive_part = v.diffusive_share;
    runs.push_back(test_support::run_case(spec));
    ASSERT_TRUE(runs.back().converged) << label << " variant " << runs.size();
  }
  const Grid& g = *runs[0].grid;
  for (size_t k = 1; k < runs.size(); ++k) {
    double du = 0, dp = 0;
    for (int j = g.y_begin(); j < g.y_end(); ++j)
      for (int i = g.x_begin(); i < g.x_end(); ++i) {
        du = std::max(du, std::abs(runs[k].solver->velocity().x(i, j) - runs[0].solver->velocity().x(i, j)));
        du = std::max(du, std::abs(runs[k].solver->velocity().y(i, j) - runs[0].solver->velocity().y(i, j)));
        dp = std::max(dp, std::abs(runs[k].solver->pressure()(i, j) - runs[0].solver->pressure()(i, j)));
      }
    du = g.global_max(du);
    dp = g.global_max(dp);
    std::printf(
        "%s: variant %zu vs SIMPLEC 0.9 (share 0.1): max |du| %.2e, max |dp| %.2e (%d vs %d iterations)\n",
        label, k, du, dp, runs[k].status.iteration, runs[0].status.iteration);
    // Velocity scale 1 m/s, pressure scale 1 m^2/s^2: agreement to the iteration tolerance.
    EXPECT_LT(du, 1e-7) << label << " variant " << k;
    EXPECT_LT(dp, 1e-7) << label << " variant " << k;
  }
}

}  // namespace

TEST(RelaxationIndependence, DevelopingChannel) { expect_same_answer(developing_channel(), "channel"); }
TEST(RelaxationIndependence, SkewedCavity) { expect_same_answer(small_cavity(), "skewed cavity"); }
