// Laminar flat plate against the Blasius similarity solution (Blasius 1908; f''(0) = 0.3320573362
// and the f'(eta) table of Ganapol 2010, arXiv:1006.3888, Table 3b, in tests/data/).
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include "case_runner.hpp"
#include "io/case_loader.hpp"

using namespace wallrans;

namespace {

struct Similarity {
  std::vector<double> eta, fprime;
  double max_third_derivative = 0.0;  ///< max of |f'''| = |f f''| / 2 over the table (Blasius equation)
  double at(double e) const {         // linear interpolation in the 0.2-spaced table
    if (e >= eta.back()) return fprime.back();
    size_t k = 0;
    while (eta[k + 1] < e) ++k;
    const double w = (e - eta[k]) / (eta[k + 1] - eta[k]);
    return (1.0 - w) * fprime[k] + w * fprime[k + 1];
  }
};

Similarity read_table() {
  std::ifstream in(std::string(WALLRANS_TEST_DATA) + "/blasius-ganapol2010/blasius_ganapol2010.dat");
  EXPECT_TRUE(in.good());
  Similarity s;
  std::string line;
  while (std::getline(in, line)) {
    if (line.empty() || line[0] == '#') continue;
    std::istringstream row(line);
    double eta = 0, f = 0, fp = 0, fpp = 0;
    row >> eta >> f >> fp >> fpp;
    s.eta.push_back(eta);
    s.fprime.push_back(fp);
    s.max_third_derivative = std::max(s.max_third_derivative, std::abs(f * fpp) / 2.0);
  }
  return s;
}

// The same grid family with half the cells per direction (spacings doubled): the coarse grid of
// the two-grid error estimates below.
CaseSpec coarsened(const CaseSpec& spec) {
  CaseSpec half = spec;
  half.grid.cells_x /= 2;
  half.grid.cells_y /= 2;
  half.grid.run_up_cells /= 2;
  half.grid.first_cell_height = *spec.grid.first_cell_height * 2.0;
  half.grid.leading_edge_spacing = *spec.grid.leading_edge_spacing * 2.0;
  return half;
}

// Two-grid uncertainty of the fine solution, F_s |fine - coarse| / (r^p - 1) with F_s = 3, p = 2
// (formal order) and r = 2 (Roache 1994, J. Fluids Eng. 116:405).
double two_grid_uncertainty(double change) { return 3.0 * change / (2.0 * 2.0 - 1.0); }

// Departure of the elliptic (Navier-Stokes) solution from boundary-layer theory, relative: the
// size of the next term of the plate-drag expansion, C_D sqrt(Re) = 1.328 + 2.326 / sqrt(Re)
// (Imai 1957, from memory), i.e. 2.326 / (1.328 sqrt(Re_x)) at Re_x, taken as the bound of the
// higher-order effects (displacement, leading edge) at x.
double boundary_layer_theory_uncertainty(double re_x) { return 2.326 / (1.328 * std::sqrt(re_x)); }

class Blasius : public ::testing::Test {
 protected:
  static void SetUpTestSuite() {
    spec_ = new CaseSpec(load_case_file(std::string(WALLRANS_SOURCE_DIR) + "/configs/blasius_plate.yaml"));
    run_ = new test_support::CaseRun(test_support::run_case(*spec_));
    coarse_spec_ = new CaseSpec(coarsened(*spec_));  // the solver keeps a reference to its spec
    coarse_ = new test_support::CaseRun(test_support::run_case(*coarse_spec_));
  }
  static void TearDownTestSuite() {
    delete coarse_;
    delete coarse_spec_;
    delete run_;
    delete spec_;
  }
  static CaseSpec* spec_;
  static test_support::CaseRun* run_;
  static CaseSpec* coarse_spec_;
  static test_support::CaseRun* coarse_;
};
CaseSpec* Blasius::spec_ = nullptr;
test_support::CaseRun* Blasius::run_ = nullptr;
CaseSpec* Blasius::coarse_spec_ = nullptr;
test_support::CaseRun* Blasius::coarse_ = nullptr;

// Cf sqrt(Re_x) along the plate (x > 0), sorted by x.
std::vector<std::pair<double, double>> scaled_friction(const test_support::CaseRun& run, double nu,
                                                       double u_inf) {
  std::vector<std::pair<double, double>> out;
  for (const auto& w : run.solver->wall_samples())
    if (w.centre.x > 0.0) out.emplace_back(w.centre.x, w.cf * std::sqrt(u_inf * w.centre.x / nu));
  std::sort(out.begin(), out.end());
  return out;
}

double interpolate(const std::vector<std::pair<double, double>>& curve, double x) {
  size_t k = 0;
  while (k + 2 < curve.size() && curve[k + 1].first < x) ++k;
  const double w = (x - curve[k].first) / (curve[k + 1].first - curve[k].first);
  return (1.0 - w) * curve[k].second + w * curve[k + 1].second;
}

}  // namespace

TEST_F(Blasius, SkinFrictionOverMidPlate) {
  ASSERT_TRUE(run_->converged);
  ASSERT_TRUE(coarse_->converged);
  const double nu = spec_->flow.kinematic_viscosity, u_inf = spec_->flow.reference_velocity;
  const auto fine = scaled_friction(*run_, nu, u_inf), coarse = scaled_friction(*coarse_, nu, u_inf);
  // Blasius: Cf sqrt(Re_x) = 2 f''(0) = 0.664115. Tolerance (relative), derived: our two-grid
  // uncertainty (largest change of Cf sqrt(Re_x) over the middle half, 88 x 36 -> 176 x 72 cells)
  // plus the departure from boundary-layer theory at x (boundary_layer_theory_uncertainty).
  double change = 0.0;
  for (const auto& [x, value] : fine)
    if (x >= 0.25 && x <= 0.75)
      change = std::max(change, std::abs(value - interpolate(coarse, x)) / 0.664115);
  const double u_ours = two_grid_uncertainty(change);
  int checked = 0;
  double worst = 0.0, worst_margin = 1.0;
  for (const auto& [x, value] : fine) {
    if (x < 0.25 || x > 0.75) continue;  // middle half of the 1 m plate
    const double error = std::abs(value / 0.664115 - 1.0);
    const double tolerance = u_ours + boundary_layer_theory_uncertainty(u_inf * x / nu);
    worst = std::max(worst, error);
    worst_margin = std::min(worst_margin, tolerance - error);
    EXPECT_LE(error, tolerance) << "x = " << x;
    ++checked;
  }
  EXPECT_GT(checked, 20);
  std::printf(
      "Blasius: Cf sqrt(Re_x) within %.2f %% of 0.664115 over 0.25 <= x <= 0.75 m; U_ours %.2f %%, "
      "boundary-layer theory %.2f-%.2f %%, smallest margin %.2f %%\n",
      100.0 * worst, 100.0 * u_ours, 100.0 * boundary_layer_theory_uncertainty(u_inf * 0.75 / nu),
      100.0 * boundary_layer_theory_uncertainty(u_inf * 0.25 / nu), 100.0 * worst_margin);
}

// The cell column of `run` whose centre is closest to x = 0.5 m, as (eta, u/U) pairs up to eta = 8.
std::vector<std::pair<double, double>> mid_plate_profile(const test_support::CaseRun& run, double nu,
                                                         double u_inf) {
  const Grid& g = *run.grid;
  int column = 0;
  for (int i = 0; i < g.cells_x(); ++i) {
    const double xi = 0.5 * (g.node(i, 0).x + g.node(i + 1, 0).x);
    const double xc = 0.5 * (g.node(column, 0).x + g.node(column + 1, 0).x);
    if (std::abs(xi - 0.5) < std::abs(xc - 0.5)) column = i;
  }
  std::vector<std::pair<double, double>> profile;
  if (column < g.x_begin() || column >= g.x_end()) return profile;  // not this rank's column
  for (int j = 0; j < g.cells_y(); ++j) {
    const Vec2 c = g.centre(column, j);
    const double eta = c.y * std::sqrt(u_inf / (nu * c.x));
    if (eta > 8.0) break;
    profile.emplace_back(eta, run.solver->velocity().x(column, j) / u_inf);
  }
  return profile;
}

TEST_F(Blasius, VelocityProfileAtMidPlate) {
  ASSERT_TRUE(run_->converged);
  ASSERT_TRUE(coarse_->converged);
  const Similarity table = read_table();
  const double nu = spec_->flow.kinematic_viscosity, u_inf = spec_->flow.reference_velocity;
  const auto fine = mid_plate_profile(*run_, nu, u_inf), coarse = mid_plate_profile(*coarse_, nu, u_inf);
  ASSERT_FALSE(fine.empty() || coarse.empty()) << "run this test on one rank";
  // u/U = f'(eta). Tolerance [U], derived: our two-grid uncertainty (largest change of u/U at the
  // same eta, 88 x 36 -> 176 x 72 cells, inside the coarse profile), the departure from
  // boundary-layer theory at x = 0.5 m (boundary_layer_theory_uncertainty, as a fraction of U),
  // and the error of interpolating the 0.2-spaced table linearly, h^2/8 max|f'''|.
  double change = 0.0;
  for (const auto& [eta, u] : fine)
    if (eta >= coarse.front().first && eta <= coarse.back().first)
      change = std::max(change, std::abs(u - interpolate(coarse, eta)));
  const double h = table.eta[1] - table.eta[0];
  const double tolerance = two_grid_uncertainty(change) +
                           boundary_layer_theory_uncertainty(u_inf * 0.5 / nu) +
                           h * h / 8.0 * table.max_third_derivative;
  int checked = 0;
  double worst = 0.0;
  for (const auto& [eta, u] : fine) {
    worst = std::max(worst, std::abs(u - table.at(eta)));
    EXPECT_NEAR(u, table.at(eta), tolerance) << "eta = " << eta;
    ++checked;
  }
  EXPECT_GT(checked, 15);
  std::printf(
      "Blasius: u/U within %.4f of f'(eta) at x = 0.5 m (%d cells, eta <= 8); tolerance %.4f (U_ours %.4f)\n",
      worst, checked, tolerance, two_grid_uncertainty(change));
}
