// Laminar flat plate against the Blasius similarity solution (Blasius 1908; f''(0) = 0.3320573362
// and the f'(eta) table of Ganapol 2010, arXiv:1006.3888, Table 3b, in tests/data/).
#include <gtest/gtest.h>

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
  double at(double e) const {  // linear interpolation in the 0.2-spaced table
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
  }
  return s;
}

class Blasius : public ::testing::Test {
 protected:
  static void SetUpTestSuite() {
    spec_ = new CaseSpec(load_case_file(std::string(WALLRANS_SOURCE_DIR) + "/configs/blasius_plate.yaml"));
    run_ = new test_support::CaseRun(test_support::run_case(*spec_));
  }
  static void TearDownTestSuite() {
    delete run_;
    delete spec_;
  }
  static CaseSpec* spec_;
  static test_support::CaseRun* run_;
};
CaseSpec* Blasius::spec_ = nullptr;
test_support::CaseRun* Blasius::run_ = nullptr;

}  // namespace

TEST_F(Blasius, SkinFrictionOverMidPlate) {
  ASSERT_TRUE(run_->converged);
  const double nu = spec_->flow.kinematic_viscosity, u_inf = spec_->flow.reference_velocity;
  int checked = 0;
  double worst = 0.0;
  for (const auto& w : run_->solver->wall_samples()) {
    if (w.centre.x < 0.25 || w.centre.x > 0.75) continue;  // middle half of the 1 m plate
    const double value = w.cf * std::sqrt(u_inf * w.centre.x / nu);
    worst = std::max(worst, std::abs(value / 0.664115 - 1.0));
    // Blasius: Cf sqrt(Re_x) = 2 f''(0) = 0.664115; within 2 %.
    EXPECT_NEAR(value, 0.664115, 0.02 * 0.664115) << "x = " << w.centre.x;
    ++checked;
  }
  EXPECT_GT(checked, 20);
  std::printf("Blasius: Cf sqrt(Re_x) within %.2f %% of 0.664115 over 0.25 <= x <= 0.75 m\n", 100.0 * worst);
}

TEST_F(Blasius, VelocityProfileAtMidPlate) {
  ASSERT_TRUE(run_->converged);
  const Similarity table = read_table();
  const Grid& g = *run_->grid;
  const double nu = spec_->flow.kinematic_viscosity, u_inf = spec_->flow.reference_velocity;
  // The cell column whose centre is closest to x = 0.5 m.
  int column = 0;
  for (int i = 0; i < g.cells_x(); ++i) {
    const double xi = 0.5 * (g.node(i, 0).x + g.node(i + 1, 0).x);
    const double xc = 0.5 * (g.node(column, 0).x + g.node(column + 1, 0).x);
    if (std::abs(xi - 0.5) < std::abs(xc - 0.5)) column = i;
  }
  ASSERT_TRUE(column >= g.x_begin() && column < g.x_end()) << "run this test on one rank";
  int checked = 0;
  double worst = 0.0;
  for (int j = 0; j < g.cells_y(); ++j) {
    const Vec2 c = g.centre(column, j);
    const double eta = c.y * std::sqrt(u_inf / (nu * c.x));
    if (eta > 8.0) break;
    const double u = run_->solver->velocity().x(column, j) / u_inf;
    worst = std::max(worst, std::abs(u - table.at(eta)));
    // u/U = f'(eta) within 1 % of U.
    EXPECT_NEAR(u, table.at(eta), 0.01) << "eta = " << eta;
    ++checked;
  }
  EXPECT_GT(checked, 15);
  std::printf("Blasius: u/U within %.4f of f'(eta) at x = 0.5 m (%d cells, eta <= 8)\n", worst, checked);
}
