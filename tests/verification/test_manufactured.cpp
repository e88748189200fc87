// Method of manufactured solutions for the steady laminar Navier-Stokes equations (Roache,
// Verification and Validation in Computational Science and Engineering, 1998, ch. 3; Roache
// 2002, J. Fluids Eng. 124:4): a chosen smooth divergence-free velocity and pressure, the
// momentum source that makes them exact, and the observed order of the discretisation error on
// four successively refined skewed, curved grids.
#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <vector>

#include "case_runner.hpp"
#include "io/case_loader.hpp"

using namespace wallrans;

namespace {

// u = U0 + sin X cos Y, v = V0 - cos X sin Y with X = k(x + 0.3), Y = k(y + 0.2): divergence
// free; stream function psi = U0 y - V0 x + sin X sin Y / k. p = P0 sin(2x + 0.5) cos(1.5 y).
constexpr double k = 2.0, u0 = 0.6, v0 = 0.3, p0 = 0.4, nu = 0.05;

struct Exact {
  double u, v, p, ux, uy, vx, vy, px, py, lap_u, lap_v;
};

Exact exact(Vec2 r) {
  const double X = k * (r.x + 0.3), Y = k * (r.y + 0.2);
  Exact e{};
  e.u = u0 + std::sin(X) * std::cos(Y);
  e.v = v0 - std::cos(X) * std::sin(Y);
  e.ux = k * std::cos(X) * std::cos(Y);
  e.uy = -k * std::sin(X) * std::sin(Y);
  e.vx = k * std::sin(X) * std::sin(Y);
  e.vy = -k * std::cos(X) * std::cos(Y);
  e.lap_u = -2.0 * k * k * std::sin(X) * std::cos(Y);
  e.lap_v = 2.0 * k * k * std::cos(X) * std::sin(Y);
  e.p = p0 * std::sin(2.0 * r.x + 0.5) * std::cos(1.5 * r.y);
  e.px = 2.0 * p0 * std::cos(2.0 * r.x + 0.5) * std::cos(1.5 * r.y);
  e.py = -1.5 * p0 * std::sin(2.0 * r.x + 0.5) * std::sin(1.5 * r.y);
  return e;
}

double stream_function(Vec2 r) {
  return u0 * r.y - v0 * r.x + std::sin(k * (r.x + 0.3)) * std::sin(k * (r.y + 0.2)) / k;
}

// Momentum source s = (u.grad)u + grad p - nu lap u (steady, constant viscosity).
Vec2 source(Vec2 r) {
  const Exact e = exact(r);
  return {e.u * e.ux + e.v * e.uy + e.px - nu * e.lap_u, e.u * e.vx + e.v * e.vy + e.py - nu * e.lap_v};
}

struct Errors {
  double u, v, p;
};

Errors solve_on(int n, ConvectionScheme scheme) {
  CaseSpec spec = load_case_file(std::string(WALLRANS_TEST_DATA) + "/manufactured/skewed_box_base.yaml");
  EXPECT_EQ(spec.flow.kinematic_viscosity, nu);  // the source below is built for this viscosity
  spec.grid.cells_x = n;
  spec.grid.cells_y = n;
  spec.iterations.convection = scheme;
  auto run = test_support::run_case(spec, [](FlowSolver& solver) {
    solver.set_momentum_source(source);
    solver.set_boundary_velocity([](Vec2 r) {
      const Exact e = exact(r);
      return Vec2{e.u, e.v};
    });
    solver.set_boundary_flux([](Vec2 centre, Vec2 area) {
      // Exact flux through the straight face: psi(end) - psi(start) along the edge whose outward
      // normal is `area` (the faces of a closed domain then sum to zero exactly).
      const Vec2 t{-area.y, area.x};
      return stream_function(centre + 0.5 * t) - stream_function(centre - 0.5 * t);
    });
  });
  EXPECT_TRUE(run.converged) << "n = " << n << " residuals " << run.status.normalised.u << " "
                             << run.status.normalised.continuity;
  const Grid& g = *run.grid;
  const auto& vel = run.solver->velocity();
  const auto& p = run.solver->pressure();
  // The pressure level is arbitrary in a closed domain: compare deviations from the mean.
  double vol = 0, p_mean = 0, pe_mean = 0;
  for (int j = g.y_begin(); j < g.y_end(); ++j)
    for (int i = g.x_begin(); i < g.x_end(); ++i) {
      vol += g.volume(i, j);
      p_mean += g.volume(i, j) * p(i, j);
      pe_mean += g.volume(i, j) * exact(g.centre(i, j)).p;
    }
  vol = g.global_sum(vol);
  p_mean = g.global_sum(p_mean) / vol;
  pe_mean = g.global_sum(pe_mean) / vol;
  double eu = 0, ev = 0, ep = 0;
  for (int j = g.y_begin(); j < g.y_end(); ++j)
    for (int i = g.x_begin(); i < g.x_end(); ++i) {
      const Exact e = exact(g.centre(i, j));
      const double w = g.volume(i, j);
      eu += w * std::pow(vel.x(i, j) - e.u, 2);
      ev += w * std::pow(vel.y(i, j) - e.v, 2);
      ep += w * std::pow((p(i, j) - p_mean) - (e.p - pe_mean), 2);
    }
  return {std::sqrt(g.global_sum(eu) / vol), std::sqrt(g.global_sum(ev) / vol),
          std::sqrt(g.global_sum(ep) / vol)};
}

void check_order(ConvectionScheme scheme, const char* label) {
  const int sizes[4] = {16, 32, 64, 128};
  std::vector<Errors> e;
  for (int n : sizes) e.push_back(solve_on(n, scheme));
  for (size_t m = 0; m < e.size(); ++m) {
    std::printf("%s n=%3d  L2 error u %.3e v %.3e p %.3e", label, sizes[m], e[m].u, e[m].v, e[m].p);
    if (m > 0) {
      std::printf("   order u %.2f v %.2f p %.2f", std::log2(e[m - 1].u / e[m].u),
                  std::log2(e[m - 1].v / e[m].v), std::log2(e[m - 1].p / e[m].p));
    }
    std::printf("\n");
  }
  // Observed order p = ln(e_coarse / e_fine) / ln 2 (refinement ratio 2) on the two finest pairs;
  // a second-order scheme must show >= 1.8 there.
  for (size_t m = 2; m < e.size(); ++m) {
    EXPECT_GE(std::log2(e[m - 1].u / e[m].u), 1.8)
        << label << " u, grids " << sizes[m - 1] << "->" << sizes[m];
    EXPECT_GE(std::log2(e[m - 1].v / e[m].v), 1.8)
        << label << " v, grids " << sizes[m - 1] << "->" << sizes[m];
    EXPECT_GE(std::log2(e[m - 1].p / e[m].p), 1.8)
        << label << " p, grids " << sizes[m - 1] << "->" << sizes[m];
  }
}

}  // namespace

TEST(ManufacturedSolution, SecondOrderOnSkewedCurvedGrids) {
  check_order(ConvectionScheme::bounded_linear_upwind, "bounded_linear_upwind");
}
