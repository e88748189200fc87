// Fully developed turbulent channel (streamwise-periodic, imposed mean pressure gradient, so
// Re_tau is exact) for every closure at the three Re_tau of the DNS of Moser, Kim & Mansour
// (1999, Phys. Fluids 11:943; data in tests/data/channel-mkm1999/): code verification against the
// independent 1-D solver tools/channel1d.py (same equations, models/README.md, own
// discretisation with 2000 points) within a two-grid uncertainty estimate, the log-law band, and
// the Spalart-Allmaras bulk velocity against the DNS.
#include <gtest/gtest.h>
#include <unistd.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <numbers>
#include <sstream>
#include <string>
#include <vector>

#include "case_runner.hpp"
#include "io/case_loader.hpp"
#include "log_law_band.hpp"

using namespace wallrans;

namespace {

struct Profile {
  std::vector<double> yplus, uplus;
  double at(double yp) const {  // linear interpolation, yplus ascending
    if (yp <= yplus.front()) return uplus.front() * yp / yplus.front();
    size_t k = 1;
    while (k + 1 < yplus.size() && yplus[k] < yp) ++k;
    const double w = (yp - yplus[k - 1]) / (yplus[k] - yplus[k - 1]);
    return (1.0 - w) * uplus[k - 1] + w * uplus[k];
  }
};

Profile read_columns(const std::string& path, int col_y, int col_u, char separator) {
  std::ifstream in(path);
  EXPECT_TRUE(in.good()) << path;
  Profile p;
  std::string line;
  while (std::getline(in, line)) {
    if (line.empty() || line[0] == '#' || std::isalpha(static_cast<unsigned char>(line[0]))) continue;
    for (char& c : line)
      if (c == separator) c = ' ';
    std::istringstream s(line);
    std::vector<double> v;
    double x = 0;
    while (s >> x) v.push_back(x);
    p.yplus.push_back(v[col_y]);
    p.uplus.push_back(v[col_u]);
  }
  return p;
}

struct Variant {
  const char* model;
  const char* variant;
};

struct Reynolds {
  const char* label;  // DNS case label
  double re_tau;      // actual DNS Re_tau
  double dns_bulk;    // DNS bulk U+ (README of the data: trapezoid over the table)
};

constexpr Reynolds reynolds[3] = {{"180", 178.12, 15.68}, {"395", 392.24, 17.54}, {"590", 587.19, 18.65}};

// Required bounds on |bulk error| [%] of Spalart-Allmaras against the DNS at Re_tau 180 / 395 / 590
// (the project's acceptance criterion for its reference model, not a derived tolerance). The other
// closures carry no bound against the DNS: their deviation is a property of the model as
// specified (the independent 1-D solution of the same equations shows it too), so the tests below
// check that the 2-D code reproduces the model (convergence to the 1-D solution) and that every
// closure keeps the log law.
constexpr double sa_bulk_bound[3] = {7.0, 5.0, 5.0};

// Coles' wake parameter of the channel, Pi = 0.14 (Dean 1978, J. Fluids Eng. 100:215, with
// kappa = 0.41).
constexpr double kappa = 0.41, wake_pi = 0.14;

struct OneD {
  Profile profile;  ///< U+(y+) of the half channel
  double bulk;      ///< bulk U+, trapezoidal rule over the 2000-point profile
};

// The 1-D solution of the same model equations (tools/channel1d.py, independent implementation).
OneD reference_1d(const Variant& v, const Reynolds& r, int rank) {
  const auto csv = std::filesystem::temp_directory_path() /
                   ("wallrans_channel1d_" + std::string(v.model) + v.variant + r.label + "_" +
                    std::to_string(rank) + "_" + std::to_string(::getpid()) + ".csv");
  const std::string command =
      std::string("/usr/bin/python3 ") + WALLRANS_SOURCE_DIR + "/tools/channel1d.py --model " + v.model +
      (v.variant[0] ? std::string(" --variant ") + v.variant : std::string()) + " --re-tau " +
      std::to_string(r.re_tau) + " --out " + csv.string() + " > /dev/null";
  EXPECT_EQ(std::system(command.c_str()), 0) << command;
  OneD ref{read_columns(csv.string(), 0, 1, ','), 0.0};
  std::filesystem::remove(csv);
  const Profile& p = ref.profile;
  for (size_t k = 1; k < p.yplus.size(); ++k)
    ref.bulk += 0.5 * (p.uplus[k] + p.uplus[k - 1]) * (p.yplus[k] - p.yplus[k - 1]);
  ref.bulk /= p.yplus.back();
  return ref;
}

struct Result {
  double bulk, bulk_error_percent;
  double max_rel_1d;   ///< max |U+_2D / U+_1D - 1| over the cells of the lower half
  double max_du_dns;   ///< max |U+ - U+_DNS| for y+ > 30 (lower half; information)
  double band_excess;  ///< largest distance of U+ outside the log-law band (<= 0: inside)
  int n_band;          ///< cells in the log region y+ >= 30, y/h <= 0.3
};

// Refinement ratio of the two-grid study: the shipped grid and one with 3/4 of its cells and a
// first cell 4/3 as high. (Halving the cells puts the first cell at y+ = 1, where Baldwin-Barth at
// Re_tau 590 stalls in an oscillation, measured: u residual 2e-2 after 20000 iterations.)
constexpr double refinement = 4.0 / 3.0;

// Collective over comm. `coarse`: the coarser grid of the two-grid study.
Result run_channel(const Variant& v, const Reynolds& r, MPI_Comm comm, const OneD& one_d, bool coarse) {
  CaseSpec spec =
      load_case_file(std::string(WALLRANS_SOURCE_DIR) + "/configs/channel_sa_re" + r.label + ".yaml");
  spec.turbulence.model = v.model;
  spec.turbulence.variant = v.variant;
  if (std::string(v.model) == "mixing_length") spec.turbulence.outer_length = 1.0;       // half-height
  if (std::string(v.model) == "k_equation") spec.turbulence.freestream_intensity = 0.1;  // initial k
  if (coarse) {
    spec.grid.cells_y = static_cast<int>(std::lround(spec.grid.cells_y / refinement));
    spec.grid.first_cell_height = *spec.grid.first_cell_height * refinement;
  }
  auto run = test_support::run_case_on(comm, spec, [](FlowSolver&) {});
  EXPECT_TRUE(run.converged) << v.model << "/" << v.variant << " Re_tau " << r.re_tau;
  const Grid& g = *run.grid;
  const double nu = spec.flow.kinematic_viscosity;
  double flow = 0, volume = 0;
  for (int j = g.y_begin(); j < g.y_end(); ++j)
    for (int i = g.x_begin(); i < g.x_end(); ++i) {
      flow += run.solver->velocity().x(i, j) * g.volume(i, j);
      volume += g.volume(i, j);
    }
  // u_tau = 1 by construction (wall units); its computed value checks the momentum balance.
  double tau = 0;
  for (double t : run.solver->wall_shear()) tau += t;
  const double u_tau = std::sqrt(tau / run.solver->wall_shear().size());
  EXPECT_NEAR(u_tau, 1.0, 1e-4) << "wall shear must balance the imposed pressure gradient";
  Result res{};
  res.bulk = g.global_sum(flow) / g.global_sum(volume) / u_tau;
  res.bulk_error_percent = 100.0 * (res.bulk / r.dns_bulk - 1.0);

  const Profile dns = read_columns(
      std::string(WALLRANS_TEST_DATA) + "/channel-mkm1999/mkm_retau" + r.label + "_means.dat", 1, 2, ' ');
  double du = 0, rel = 0, excess = -1e300;
  int n_band = 0;
  for (int j = g.y_begin(); j < g.y_end(); ++j) {
    const double y = g.centre(g.x_begin(), j).y;
    if (y > 1.0) continue;  // lower half; the upper half mirrors it
    const double yp = y * u_tau / nu, up = run.solver->velocity().x(g.x_begin(), j) / u_tau;
    if (yp > 30.0) du = std::max(du, std::abs(up - dns.at(yp)));
    rel = std::max(rel, std::abs(up / one_d.profile.at(yp) - 1.0));
    if (yp >= 30.0 && y <= 0.3) {
      // Log-law band: the published laws (log_law_band.hpp), widened by the two outer-layer effects
      // a log law leaves out, each derived at this y/h (h = 1): below, the falling total stress
      // u_tau^2 (1 - y/h) (exact mean momentum balance), which with the wall-layer eddy viscosity
      // kappa u_tau y of every closure here lowers U+ by (y/h)/kappa; above, Coles' wake
      // (2 Pi/kappa) sin^2(pi y/(2h)) with Pi = 0.14 (Dean 1978).
      const double low = test_support::log_law_lowest(yp) - y / kappa;
      const double high = test_support::log_law_highest(yp) +
                          2.0 * wake_pi / kappa * std::pow(std::sin(0.5 * std::numbers::pi * y), 2);
      excess = std::max({excess, low - up, up - high});
      ++n_band;
    }
  }
  res.max_du_dns = g.global_max(du);
  res.max_rel_1d = g.global_max(rel);
  res.band_excess = g.global_max(excess);
  res.n_band = static_cast<int>(g.global_sum(n_band));
  return res;
}

void check_model(const Variant& v) {
  int size = 1;
  MPI_Comm_size(MPI_COMM_WORLD, &size);
  if (size > 1) GTEST_SKIP() << "one-rank test; the 2-rank binary runs ChannelParallel only";
  for (int k = 0; k < 3; ++k) {
    const Reynolds& r = reynolds[k];
    const OneD one_d = reference_1d(v, r, 0);
    const Result fine = run_channel(v, r, MPI_COMM_WORLD, one_d, false);
    const Result coarse = run_channel(v, r, MPI_COMM_WORLD, one_d, true);
    // Code verification: the 2-D result against the 1-D solution of the same equations (whose own
    // error, 8e-7 in U_b+ at 2000 points, is negligible here). The largest relative cell deviation
    // from the 1-D profile, e, must lie within its two-grid uncertainty estimate
    // F_s |e_coarse - e_fine| / (r^p - 1) with F_s = 3 for two grids and the formal order p = 2
    // (Roache 1994, J. Fluids Eng. 116:405); i.e. e converges at an observed order >= 0.8 for
    // r = 4/3. This bounds the bulk deviation too; the bulk's own two-grid estimate (printed) is not
    // asserted: at Re_tau 180 SA's bulk changes by only 0.0023 between the grids while it differs
    // from the 1-D value by 0.011 (not in the asymptotic range).
    const double gci_factor = 3.0 / (refinement * refinement - 1.0);
    const double bulk_gci = gci_factor * std::abs(coarse.bulk - fine.bulk);
    const double profile_gci = gci_factor * std::abs(coarse.max_rel_1d - fine.max_rel_1d);
    std::printf(
        "| %s %s | %s | %.3f | %+.2f %% | %+.2f %% | %.2f | %.3f %% (%.3f %%) | %.4f (%.4f) | %+.2f (%d) |\n",
        v.model, v.variant, r.label, fine.bulk, fine.bulk_error_percent,
        100.0 * (one_d.bulk / r.dns_bulk - 1.0), fine.max_du_dns, 100.0 * fine.max_rel_1d,
        100.0 * profile_gci, std::abs(fine.bulk - one_d.bulk), bulk_gci, fine.band_excess, fine.n_band);
    if (std::string(v.model) == "spalart_allmaras") {
      // DNS: Moser, Kim & Mansour (1999), bulk U+ 15.68 / 17.54 / 18.65.
      EXPECT_LT(std::abs(fine.bulk_error_percent), sa_bulk_bound[k]) << v.variant << " Re " << r.label;
    }
    EXPECT_LE(fine.max_rel_1d, profile_gci) << v.model << " " << v.variant << " Re " << r.label;
    // Log-law band (see run_channel). At Re_tau 180 the region y+ >= 30, y/h <= 0.3 spans only
    // y+ 30-53, no log layer; the band is asserted from Re_tau 395 (y+ 30-118) on.
    if (r.re_tau > 300.0) {
      EXPECT_GT(fine.n_band, 10) << v.model << " Re " << r.label;
      EXPECT_LE(fine.band_excess, 0.0) << v.model << " " << v.variant << " Re " << r.label;
    }
  }
}

}  // namespace

TEST(Channel, SpalartAllmarasNegative) { check_model({"spalart_allmaras", "negative"}); }
TEST(Channel, SpalartAllmarasStandard) { check_model({"spalart_allmaras", "standard"}); }
TEST(Channel, SpalartAllmarasNoFt2) { check_model({"spalart_allmaras", "noft2"}); }
TEST(Channel, BaldwinBarth) { check_model({"baldwin_barth", ""}); }
TEST(Channel, KEquationLengthScale) { check_model({"k_equation", "length_scale"}); }
TEST(Channel, KEquationStructure) { check_model({"k_equation", "structure"}); }
TEST(Channel, MixingLength) { check_model({"mixing_length", ""}); }

// Parallel consistency: the same channel on all ranks of MPI_COMM_WORLD and on one rank
// (MPI_COMM_SELF) gives the same bulk velocity to the outer-iteration tolerance (residual drop
// 1e-8 of the shipped case), stated as 1e-6 relative.
TEST(ChannelParallel, WorldMatchesSingleRank) {
  int size = 1;
  MPI_Comm_size(MPI_COMM_WORLD, &size);
  if (size < 2) GTEST_SKIP() << "run with 2 ranks (test_channel_np2)";
  const Variant v{"spalart_allmaras", "negative"};
  int rank = 0;
  MPI_Comm_rank(MPI_COMM_WORLD, &rank);
  const OneD one_d = reference_1d(v, reynolds[1], rank);
  const Result world = run_channel(v, reynolds[1], MPI_COMM_WORLD, one_d, false);
  const Result single = run_channel(v, reynolds[1], MPI_COMM_SELF, one_d, false);
  std::printf("bulk U+ on %d ranks %.9f, on 1 rank %.9f\n", size, world.bulk, single.bulk);
  EXPECT_NEAR(world.bulk, single.bulk, 1e-6 * single.bulk);
}
