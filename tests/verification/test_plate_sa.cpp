// Turbulent flat plate at zero pressure gradient (configs/plate_sa.yaml, Spalart-Allmaras,
// Re_L = 1e7): skin friction within the band of published values (Coles-Fernholz with the
// constants of Nagib, Chauhan & Monkewitz 2007; Karman-Schoenherr in the TMR form,
// tests/data/flat-plate-correlations-tmr; the DNS of Schlatter & Orlu 2010, J. Fluid Mech.
// 659:116, Re_theta = 4061 in tests/data/zpg-tbl-schlatter-orlu2010), the log-law band, and the
// DNS profile for information.
// Profiles are taken along grid columns from the solver fields; the logic is rank-safe.
#include <gtest/gtest.h>
#include <mpi.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include "case_runner.hpp"
#include "io/case_loader.hpp"
#include "log_law_band.hpp"
#include "plate_boundary_layer.hpp"

using namespace wallrans;
using test_support::BoundaryLayer;

namespace {

bool is_root() {
  int rank = 0;
  MPI_Comm_rank(MPI_COMM_WORLD, &rank);
  return rank == 0;
}

class PlateSa : public ::testing::Test {
 protected:
  // The shipped case as it is (176 x 96 cells, about 45 s on one rank).
  static void SetUpTestSuite() {
    spec_ = new CaseSpec(load_case_file(std::string(WALLRANS_SOURCE_DIR) + "/configs/plate_sa.yaml"));
    run_ = new test_support::CaseRun(test_support::run_case(*spec_));
  }
  static void TearDownTestSuite() {
    delete run_;
    delete spec_;
  }
  static double nu() { return spec_->flow.kinematic_viscosity; }
  static CaseSpec* spec_;
  static test_support::CaseRun* run_;
};
CaseSpec* PlateSa::spec_ = nullptr;
test_support::CaseRun* PlateSa::run_ = nullptr;

// Re_theta window of the check: above the low-Re range where the relation is not meant to hold,
// and within the 20000 the correlation table covers.
constexpr double re_theta_min = 3000.0, re_theta_max = 20000.0;

// The DNS station of Schlatter & Orlu (2010), from the header of the data file.
constexpr double dns_re_theta = 4061.378, dns_cf = 0.002970989, dns_h12 = 1.387046;

// Band of published skin-friction values at Re_theta: from below, Coles-Fernholz (Nagib, Chauhan &
// Monkewitz 2007) lowered by the amount the DNS of Schlatter & Orlu (2010) lies below it at its
// station (1.4 %); from above, Karman-Schoenherr (about 4 % above Coles-Fernholz). The spread of
// these published values is the tolerance; the numerical uncertainty of the shipped grid (GCI21
// <= 0.10 % at x = 0.5 and 0.9 m, docs/validation-plate.md) is small against it and not added.
struct CfBand {
  double low, high;
};
CfBand published_cf_band(double re_theta) {
  const double dns_ratio = dns_cf / test_support::coles_fernholz_cf(dns_re_theta);
  return {test_support::coles_fernholz_cf(re_theta) * std::min(1.0, dns_ratio),
          test_support::karman_schoenherr_cf(re_theta)};
}

}  // namespace

TEST(PlateCorrelations, KarmanSchoenherrMatchesTmrTable) {
  // Our transcription of the Karman-Schoenherr relation against the table the NASA Turbulence
  // Modeling Resource evaluated from it (tests/data/flat-plate-correlations-tmr): values printed to
  // 8 decimals, so they are rounded by at most 5e-9; allow twice that. (Coles-Fernholz has no
  // independent table here: it is evaluated from its formula directly.)
  std::ifstream in(std::string(WALLRANS_TEST_DATA) + "/flat-plate-correlations-tmr/cf_karman_schoenherr.dat");
  ASSERT_TRUE(in.good());
  std::string line;
  int n_rows = 0;
  while (std::getline(in, line)) {
    if (line.empty() || line[0] == '#') continue;
    std::istringstream row(line);
    double re_theta = 0, cf = 0;
    row >> re_theta >> cf;
    EXPECT_NEAR(test_support::karman_schoenherr_cf(re_theta), cf, 1e-8) << "Re_theta = " << re_theta;
    ++n_rows;
  }
  EXPECT_EQ(n_rows, 100);
}

TEST_F(PlateSa, Converges) {
  EXPECT_TRUE(run_->converged) << "stopped at iteration " << run_->status.iteration;
  if (is_root())
    std::printf("plate_sa: %s after %d iterations\n", run_->converged ? "converged" : "NOT converged",
                run_->status.iteration);
}

TEST_F(PlateSa, FirstCellBelowUnitYPlus) {
  ASSERT_TRUE(run_->converged);
  // The grid rule of the case file: first-cell y+ < 1 along the plate for x > 0.05 m.
  double worst = 0.0, worst_x = 0.0;
  int n_checked = 0;
  for (const WallSample& w : run_->solver->wall_samples()) {
    if (w.side != Side::bottom || w.centre.x <= 0.05) continue;
    const double y_plus = w.first_cell_distance * std::sqrt(std::abs(w.shear_stress)) / nu();
    if (y_plus > worst) {
      worst = y_plus;
      worst_x = w.centre.x;
    }
    ++n_checked;
  }
  const Grid& g = *run_->grid;
  const double worst_all = g.global_max(worst);
  const double worst_x_all = g.global_max(worst == worst_all ? worst_x : -1.0);
  int n_expected = 0;  // every bottom face beyond x = 0.05 m is a plate (wall) face
  for (int i = 0; i < g.cells_x(); ++i) n_expected += test_support::bottom_face_x(g, i) > 0.05 ? 1 : 0;
  EXPECT_EQ(static_cast<int>(g.global_sum(n_checked)), n_expected);
  EXPECT_LT(worst_all, 1.0) << "at x = " << worst_x_all;
  if (is_root())
    std::printf("plate_sa: largest first-cell y+ for x > 0.05 m: %.3f at x = %.4f m\n", worst_all,
                worst_x_all);
}

TEST_F(PlateSa, SkinFrictionWithinPublishedBand) {
  ASSERT_TRUE(run_->converged);
  const Grid& g = *run_->grid;
  // Every plate column with Re_theta in the window, and a printed table every 0.05 m.
  double worst = 0.0, worst_x = 0.0, worst_re = 0.0, margin = 1.0;
  int n_checked = 0;
  for (int i = 0; i < g.cells_x(); ++i) {
    if (test_support::bottom_face_x(g, i) <= 0.0) continue;
    const BoundaryLayer bl = test_support::integrate(test_support::column_profile(*run_->solver, i), nu());
    if (bl.re_theta <= re_theta_min || bl.re_theta >= re_theta_max) continue;
    const double error = bl.cf / test_support::coles_fernholz_cf(bl.re_theta) - 1.0;
    if (std::abs(error) > std::abs(worst)) {
      worst = error;
      worst_x = bl.x;
      worst_re = bl.re_theta;
    }
    // Within the band of published values (published_cf_band).
    const CfBand band = published_cf_band(bl.re_theta);
    EXPECT_GE(bl.cf, band.low) << "x = " << bl.x << ", Re_theta = " << bl.re_theta;
    EXPECT_LE(bl.cf, band.high) << "x = " << bl.x << ", Re_theta = " << bl.re_theta;
    margin = std::min({margin, bl.cf / band.low - 1.0, 1.0 - bl.cf / band.high});
    ++n_checked;
  }
  EXPECT_GT(n_checked, 20);  // the window starts near x = 0.16 m on this grid
  if (is_root()) {
    std::printf("plate_sa: Cf = 2 tau_w/U_e^2 against Coles-Fernholz (NCM 2007) and Karman-Schoenherr\n");
    std::printf("%7s %9s %11s %11s %8s %11s %8s %8s\n", "x [m]", "Re_theta", "Cf", "Cf_CF", "err_CF", "Cf_KS",
                "err_KS", "H12");
  }
  double worst_ks = 0.0;
  for (int k = 2; k <= 19; ++k) {
    const double x = 0.05 * k;
    const BoundaryLayer bl = test_support::boundary_layer_at(*run_->solver, x, nu());
    if (bl.re_theta <= re_theta_min || bl.re_theta >= re_theta_max) continue;
    const double cf_cf = test_support::coles_fernholz_cf(bl.re_theta);
    const double cf_ks = test_support::karman_schoenherr_cf(bl.re_theta);
    const double error_ks = bl.cf / cf_ks - 1.0;
    worst_ks = std::max(worst_ks, std::abs(error_ks));
    if (is_root()) {
      std::printf("%7.3f %9.0f %11.5e %11.5e %7.2f%% %11.5e %7.2f%% %8.4f\n", x, bl.re_theta, bl.cf, cf_cf,
                  100.0 * (bl.cf / cf_cf - 1.0), cf_ks, 100.0 * error_ks,
                  bl.displacement_thickness / bl.momentum_thickness);
    }
  }
  if (is_root()) {
    std::printf(
        "plate_sa: %d columns with %.0f < Re_theta < %.0f; largest |Cf/Cf_CF - 1| = %.2f %% (x = %.3f m, "
        "Re_theta = %.0f); largest |Cf/Cf_KS - 1| at the stations = %.2f %%; smallest margin inside the "
        "published band %.2f %%\n",
        n_checked, re_theta_min, re_theta_max, 100.0 * std::abs(worst), worst_x, worst_re, 100.0 * worst_ks,
        100.0 * margin);
  }
}

TEST_F(PlateSa, LogLawAtProfileStations) {
  ASSERT_TRUE(run_->converged);
  const Grid& g = *run_->grid;
  // Log region: y+ >= 30 and y <= 0.15 delta99 (delta99 where u = 0.99 U_e on the column).
  // U+ = ln(y+)/0.41 + 5.0 (kappa = 0.41, B = 5.0, the common values; White 1974).
  for (double x : spec_->output.profiles_at_x) {
    const auto profile = test_support::column_profile(*run_->solver, test_support::nearest_column(g, x));
    const BoundaryLayer bl = test_support::integrate(profile, nu());
    double worst = -1e300;
    int n_points = 0;
    double y_plus_first = 0.0, y_plus_last = 0.0;
    for (size_t j = 0; j < profile.y.size(); ++j) {
      const double y_plus = profile.y[j] * bl.u_tau / nu();
      if (y_plus < 30.0 || profile.y[j] > 0.15 * bl.delta99) continue;
      const double u_plus = profile.u[j] / bl.u_tau;
      // Within the band of the published log laws (log_law_band.hpp); the region ends at 0.15
      // delta99, where the wake of a zero-pressure-gradient layer is still small.
      const double low = test_support::log_law_lowest(y_plus), high = test_support::log_law_highest(y_plus);
      EXPECT_GE(u_plus, low) << "x = " << profile.x << ", y+ = " << y_plus;
      EXPECT_LE(u_plus, high) << "x = " << profile.x << ", y+ = " << y_plus;
      worst = std::max({worst, low - u_plus, u_plus - high});
      if (n_points == 0) y_plus_first = y_plus;
      y_plus_last = y_plus;
      ++n_points;
    }
    EXPECT_GE(n_points, 5) << "too few cells in the log region at x = " << profile.x;
    if (is_root()) {
      std::printf(
          "plate_sa: log law at x = %.3f m (Re_theta %.0f, delta99 = %.3e m): %d cells, y+ %.0f to %.0f, "
          "largest distance outside the log-law band %+.3f (negative: inside)\n",
          profile.x, bl.re_theta, bl.delta99, n_points, y_plus_first, y_plus_last, worst);
    }
  }
}

// For information only: the mean profile in inner units at the column whose Re_theta is closest
// to that of the DNS station. Nothing is asserted beyond finding such a column.
TEST_F(PlateSa, ProfileBesideDnsInformational) {
  ASSERT_TRUE(run_->converged);
  std::ifstream in(std::string(WALLRANS_TEST_DATA) +
                   "/zpg-tbl-schlatter-orlu2010/schlatter_orlu_retheta4060.dat");
  ASSERT_TRUE(in.good());
  std::vector<double> dns_y_plus, dns_u_plus;
  std::string line;
  while (std::getline(in, line)) {
    if (line.empty() || line[0] == '#') continue;
    std::istringstream row(line);
    double y_delta = 0, y_plus = 0, u_plus = 0;
    row >> y_delta >> y_plus >> u_plus;
    dns_y_plus.push_back(y_plus);
    dns_u_plus.push_back(u_plus);
  }
  ASSERT_GT(dns_y_plus.size(), 500u);

  const Grid& g = *run_->grid;
  int best = -1;
  BoundaryLayer best_bl;
  for (int i = 0; i < g.cells_x(); ++i) {
    if (test_support::bottom_face_x(g, i) <= 0.0) continue;
    const BoundaryLayer bl = test_support::integrate(test_support::column_profile(*run_->solver, i), nu());
    if (best < 0 || std::abs(bl.re_theta - dns_re_theta) < std::abs(best_bl.re_theta - dns_re_theta)) {
      best = i;
      best_bl = bl;
    }
  }
  ASSERT_LT(std::abs(best_bl.re_theta / dns_re_theta - 1.0), 0.05) << "no column near Re_theta 4061";
  const auto profile = test_support::column_profile(*run_->solver, best);
  // Model U+ at a DNS y+ by linear interpolation in y, from the wall (y = 0, u = 0).
  std::vector<double> ys{0.0}, us{0.0};
  ys.insert(ys.end(), profile.y.begin(), profile.y.end());
  us.insert(us.end(), profile.u.begin(), profile.u.end());
  auto model_u_plus = [&](double y_plus) {
    const double y = y_plus * nu() / best_bl.u_tau;
    size_t j = 0;
    while (j + 2 < ys.size() && ys[j + 1] < y) ++j;
    return (us[j] + (y - ys[j]) / (ys[j + 1] - ys[j]) * (us[j + 1] - us[j])) / best_bl.u_tau;
  };
  if (is_root()) {
    std::printf(
        "plate_sa vs DNS (Schlatter & Orlu 2010): x = %.3f m, Re_theta %.0f (DNS %.0f), Cf %.5e (DNS %.5e, "
        "%+.2f %%), H12 %.3f (DNS %.3f)\n",
        best_bl.x, best_bl.re_theta, dns_re_theta, best_bl.cf, dns_cf, 100.0 * (best_bl.cf / dns_cf - 1.0),
        best_bl.displacement_thickness / best_bl.momentum_thickness, dns_h12);
    std::printf("%8s %9s %9s %8s\n", "y+", "U+ DNS", "U+ SA", "diff");
    // The last two are y = 0.5 and 1.0 delta99 of the DNS (Re_tau = 1271.5).
    for (double target : {1.0, 5.0, 10.0, 15.0, 30.0, 100.0, 300.0, 635.8, 1271.5}) {
      size_t k = 0;
      while (k + 1 < dns_y_plus.size() && dns_y_plus[k] < target) ++k;
      const double sa = model_u_plus(dns_y_plus[k]);
      std::printf("%8.1f %9.3f %9.3f %+8.3f\n", dns_y_plus[k], dns_u_plus[k], sa, sa - dns_u_plus[k]);
    }
  }
}
