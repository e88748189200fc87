// The answers a run reports (summary.json, the table at the end, the profiles) and its live
// progress, on a laminar plane Poiseuille channel whose answers are known in closed form:
// streamwise periodic, height H = 0.3 m, nu = 1.5e-3 m^2/s, driven by dp/dx = -0.2 m/s^2.
// Force balance of the fluid: tau_w = -dp/dx H / 2, so u_tau = sqrt(0.03) m/s and
// Re_tau = u_tau (H/2) / nu = 17.32; the parabola u(y) = (-dp/dx) / (2 nu) y (H - y) has the bulk
// velocity U_b = -dp/dx H^2 / (12 nu) = 1 m/s (White, Viscous Fluid Flow, 3rd ed. 2006, sec. 3-3.2).
#include <gtest/gtest.h>
#include <vtkNew.h>
#include <vtkStructuredGrid.h>
#include <vtkXMLDataElement.h>
#include <vtkXMLDataParser.h>
#include <vtkXMLPStructuredGridReader.h>

#include <cmath>
#include <filesystem>
#include <memory>
#include <nlohmann/json.hpp>
#include <sstream>
#include <string>
#include <vector>

#include "io/csv_writer.hpp"
#include "program_runner.hpp"
#include "run_fixtures.hpp"

using namespace wallrans::test_support;
namespace fs = std::filesystem;

namespace {

constexpr int n_x = 4, n_y = 32;
constexpr double height = 0.3, length = 0.4, nu = 1.5e-3, gradient = -0.2;
constexpr int fields_every = 100, report_every = 10;
const double u_tau = std::sqrt(-gradient * height / 2.0);

std::string channel_case() {
  std::ostringstream text;
  text << "title: answers_channel\n"
       << "flow: {kinematic_viscosity: " << nu << ", reference_velocity: 1.0, reference_length: " << height
       << "}\n"
       << "grid: {generator: channel, cells: [" << n_x << ", " << n_y << "], length: " << length
       << ", height: " << height << "}\n"
       << "periodic: {axis: x, mean_pressure_gradient: " << gradient << "}\n"
       << "boundaries:\n"
       << "  - {side: bottom, kind: wall}\n"
       << "  - {side: top, kind: wall}\n"
       << "iterations: {max: 3000, residual_drop: 1.0e-9, report_every: " << report_every
       << ", petsc_options: \"-momentum_ksp_rtol 1e-12 -pressure_ksp_rtol 1e-12\"}\n"
       << "output: {directory: out, fields_every: " << fields_every << ", profiles_at_x: [0.2, 5.0]}\n";
  return text.str();
}

// Exact velocity of the parabola at distance d from either wall.
double exact_u(double d) { return -gradient / (2.0 * nu) * d * (height - d); }

// One converged 2-rank run of the channel, shared by the tests of this suite.
class ChannelRun : public ::testing::Test {
 protected:
  static void SetUpTestSuite() {
    scratch_ = std::make_unique<ScratchDirectory>("wallrans_answers");
    write_text(scratch_->path() / "channel.yaml", channel_case());
    result_ =
        run_program_mpi(2, scratch_->path(), {"run", "channel.yaml"}, scratch_->path() / "logs", "channel");
  }
  static void TearDownTestSuite() { scratch_.reset(); }
  void SetUp() override { ASSERT_EQ(result_.exit_status, 0) << result_.out << result_.err; }
  static fs::path out() { return scratch_->path() / "out"; }
  static nlohmann::json summary() { return nlohmann::json::parse(read_text(out() / "summary.json")); }

  static std::unique_ptr<ScratchDirectory> scratch_;
  static ProgramResult result_;
};

std::unique_ptr<ScratchDirectory> ChannelRun::scratch_;
ProgramResult ChannelRun::result_;

// Tolerances. The run stops at a normalised residual of 1e-9 with linear solves to 1e-12. The
// discrete x-momentum balance summed over all cells says wall shear x wall length = driving force
// x area up to that residual (the wall shear is the same one-sided derivative the momentum
// equation uses at the wall); 1e-7 relative leaves a hundredfold margin. The scheme reproduces the
// parabola at the cell centres (tests/verification/test_poiseuille.cpp: 1e-6 relative), so values
// built from the centre velocities carry 1e-6 of the largest velocity, 1.5 U_b.
constexpr double balance_tolerance = 1e-7;
constexpr double parabola_tolerance = 1.5e-6;

TEST_F(ChannelRun, PeriodicAnswersFollowFromTheImposedGradient) {
  const auto p = summary()["periodic"];
  ASSERT_TRUE(p.is_object()) << summary().dump(2);
  EXPECT_EQ(p["mean_pressure_gradient"].get<double>(), gradient);
  EXPECT_EQ(p["driving_force_per_unit_mass"].get<double>(), -gradient);
  // delta = fluid area / wall length = (H L) / (2 L) = H / 2, to rounding of the cell areas.
  EXPECT_NEAR(p["half_height"].get<double>(), height / 2.0, 1e-14);
  EXPECT_NEAR(p["u_tau"].get<double>(), u_tau, 1e-14);
  EXPECT_NEAR(p["re_tau"].get<double>(), u_tau * height / 2.0 / nu, 1e-11);
  EXPECT_NEAR(p["u_tau_from_wall_shear"].get<double>() / u_tau, 1.0, balance_tolerance);
  // The bulk velocity is the mean of the centre values: for a parabola sampled at the centres of
  // N equal cells that mean is U_b (1 + 1 / (2 N^2)) (sum of ((k + 1/2) / N)^2 over k), U_b = 1.
  const double expected_bulk = 1.0 + 1.0 / (2.0 * n_y * n_y);
  EXPECT_NEAR(p["bulk_velocity"].get<double>(), expected_bulk, parabola_tolerance);
  EXPECT_NEAR(p["re_bulk"].get<double>(), expected_bulk * height / nu, parabola_tolerance * height / nu);
  EXPECT_NEAR(p["cf_bulk"].get<double>(), 2.0 * u_tau * u_tau / (expected_bulk * expected_bulk),
              4.0 * u_tau * u_tau * parabola_tolerance);
}

TEST_F(ChannelRun, WallAnswersAreTheForceBalance) {
  const auto s = summary();
  EXPECT_EQ(s["reference_velocity"]["from"], "flow.reference_velocity");
  ASSERT_EQ(s["walls"].size(), 2u);
  for (size_t k = 0; k < 2; ++k) {
    const auto& w = s["walls"][k];
    EXPECT_EQ(w["side"], k == 0 ? "bottom" : "top");
    EXPECT_EQ(w["faces"], n_x);
    EXPECT_NEAR(w["length"].get<double>(), length, 1e-14);
    // Each wall carries half the driving force: tau_w L = u_tau^2 L along +x (the flow's direction).
    const double friction = u_tau * u_tau * length;
    EXPECT_NEAR(w["friction_force"][0].get<double>() / friction, 1.0, balance_tolerance) << k;
    EXPECT_EQ(w["friction_force"][1].get<double>(), 0.0) << "flat walls: the tangent is exactly x";
    // The pressure is uniform (the gradient is the body force) with zero mean: no pressure force
    // beyond the residual level (1e-9 of the driving force's scale, here 1e-9 x 0.024).
    EXPECT_LT(std::abs(w["pressure_force"][1].get<double>()), 1e-9 * friction) << k;
    // Cf = 2 tau_w / U_ref^2 with U_ref = 1, the same on every face.
    for (const char* cf : {"cf_mean", "cf_min", "cf_max"})
      EXPECT_NEAR(w[cf].get<double>() / (2.0 * u_tau * u_tau), 1.0, balance_tolerance) << cf;
    // First-cell y+ = (H / (2 N)) u_tau / nu on the uniform grid.
    EXPECT_NEAR(w["first_cell_y_plus_max"].get<double>() / (height / (2.0 * n_y) * u_tau / nu), 1.0,
                balance_tolerance);
    EXPECT_TRUE(w["separation_and_reattachment"].empty()) << "the shear keeps its sign";
  }
}

// The table at the end of the run says the same to its printed digits.
TEST_F(ChannelRun, TheRunPrintsTheAnswersAsATable) {
  EXPECT_NE(result_.out.find("Re_tau = 17.32"), std::string::npos) << result_.out;
  EXPECT_NE(result_.out.find("U_ref = 1 m/s (flow.reference_velocity)"), std::string::npos) << result_.out;
  EXPECT_NE(result_.out.find("boundaries[1] top"), std::string::npos) << result_.out;
  EXPECT_EQ(result_.out.find('\r'), std::string::npos) << "no live display without a terminal";
}

// Each fluid cell is measured from the nearest wall: the upper half from the top wall.
TEST_F(ChannelRun, ProfilesAreNamedByStationAndMeasuredFromTheNearestWall) {
  EXPECT_FALSE(fs::exists(out() / "profile_x5.csv")) << "x = 5 lies outside the grid";
  EXPECT_NE(result_.out.find("profile station x = 5"), std::string::npos) << result_.out;
  const wallrans::CsvTable profile = wallrans::read_csv((out() / "profile_x0.2.csv").string());
  // The bottom wall face (the column's lowest face, a wall), then the n_y cells.
  ASSERT_EQ(profile.rows.size(), static_cast<size_t>(n_y) + 1);
  const size_t y = profile.column("y"), d = profile.column("wall_distance"),
               wall_y = profile.column("wall_y"), yplus = profile.column("y_plus"),
               uplus = profile.column("u_plus"), u = profile.column("u");
  EXPECT_EQ(profile.rows[0][y], 0.0);
  EXPECT_EQ(profile.rows[0][d], 0.0);
  EXPECT_EQ(profile.rows[0][u], 0.0);  // the wall at rest
  for (int j = 0; j < n_y; ++j) {
    const auto& row = profile.rows[static_cast<size_t>(j) + 1];
    const bool upper = row[y] > height / 2.0;
    EXPECT_EQ(row[wall_y], upper ? height : 0.0) << j;
    EXPECT_NEAR(row[d], upper ? height - row[y] : row[y], 1e-14) << j;
    EXPECT_NEAR(row[yplus], row[d] * u_tau / nu, balance_tolerance * row[d] * u_tau / nu) << j;
    // U+ carries the velocity's error and u_tau's (relative, times the largest U+ = 1.5 U_b / u_tau).
    EXPECT_NEAR(row[uplus], exact_u(row[d]) / u_tau, (parabola_tolerance + 1.5 * balance_tolerance) / u_tau)
        << j;
  }
}

TEST_F(ChannelRun, IntermediateFieldsFormASeries) {
  const int iterations = summary()["iterations"];
  vtkNew<vtkXMLDataParser> parser;
  parser->SetFileName((out() / "fields.pvd").string().c_str());
  ASSERT_EQ(parser->Parse(), 1);
  vtkXMLDataElement* collection = parser->GetRootElement()->FindNestedElementWithName("Collection");
  ASSERT_NE(collection, nullptr);
  const int n_intermediate = iterations / fields_every;
  ASSERT_GE(n_intermediate, 1) << "the case must run past fields_every";
  const bool last_is_intermediate = iterations % fields_every == 0;
  ASSERT_EQ(collection->GetNumberOfNestedElements(), n_intermediate + (last_is_intermediate ? 0 : 1));
  for (int k = 0; k < collection->GetNumberOfNestedElements(); ++k) {
    vtkXMLDataElement* entry = collection->GetNestedElement(k);
    const int time = std::stoi(entry->GetAttribute("timestep"));
    const std::string file = entry->GetAttribute("file");
    if (k < n_intermediate) {
      EXPECT_EQ(time, (k + 1) * fields_every);
      EXPECT_EQ(file, "fields_" + std::to_string(time) + ".pvts");
    } else {
      EXPECT_EQ(time, iterations);
      EXPECT_EQ(file, "fields.pvts");
    }
    vtkNew<vtkXMLPStructuredGridReader> reader;
    reader->SetFileName((out() / file).string().c_str());
    reader->Update();
    EXPECT_EQ(reader->GetOutput()->GetNumberOfCells(), n_x * n_y) << file;
  }
}

// Report rows every report_every iterations (and the first and last), on the terminal and in
// progress.log, with seconds per iteration and the estimated seconds to the target.
TEST_F(ChannelRun, ProgressRowsCarryTheRateAndTheEstimate) {
  const auto log = lines_of(read_text(out() / "progress.log"));
  const int header = line_containing(read_text(out() / "progress.log"), "s_per_it");
  ASSERT_GT(header, 0);
  EXPECT_NE(log[static_cast<size_t>(header - 1)].find("eta_s"), std::string::npos);
  const int iterations = summary()["iterations"];
  std::vector<int> reported;
  int with_estimate = 0;
  for (size_t k = static_cast<size_t>(header); k < log.size(); ++k) {
    std::istringstream row(log[k]);
    int iteration = 0;
    double r[3], elapsed = 0.0;
    std::string per_iteration, eta;
    if (!(row >> iteration >> r[0] >> r[1] >> r[2] >> elapsed >> per_iteration >> eta)) break;
    reported.push_back(iteration);
    if (iteration > 1) {
      EXPECT_GT(std::stod(per_iteration), 0.0) << log[k];
    }
    if (eta != "-") {
      EXPECT_GE(std::stod(eta), 0.0) << log[k];
      ++with_estimate;
    }
    // The terminal got the same row.
    EXPECT_NE(result_.out.find(log[k]), std::string::npos) << log[k];
  }
  std::vector<int> expected{1};
  for (int n = report_every; n < iterations; n += report_every) expected.push_back(n);
  expected.push_back(iterations);
  EXPECT_EQ(reported, expected);
  EXPECT_GT(with_estimate, 0) << "a steadily converging run gets an estimate";
}

// On a terminal the current row is kept up to date in place (carriage return, erase to the end
// of the line); --quiet leaves only the final line. `script` gives the run a pseudo-terminal.
TEST(LiveProgress, OneLineDisplayOnATerminalOnly) {
  if (std::system("command -v script > /dev/null 2>&1") != 0) GTEST_SKIP() << "no `script` (util-linux)";
  const ScratchDirectory scratch("wallrans_live");
  write_text(scratch.path() / "cavity.yaml", cavity_case("live", 16, 1e-8, 400));
  for (const bool quiet : {false, true}) {
    const std::string command = std::string(WALLRANS_PROGRAM) + " run cavity.yaml --output-dir " +
                                (quiet ? "quiet" : "live") + (quiet ? " --quiet" : "");
    const ProgramResult result =
        run_executable("/usr/bin/script", scratch.path(), {"-qefc", command, "/dev/null"},
                       scratch.path() / "logs", quiet ? "quiet" : "live");
    ASSERT_EQ(result.exit_status, 0) << result.out << result.err;
    if (quiet) {
      // The terminal turns "\n" into "\r\n"; the one line is the final one.
      EXPECT_EQ(result.out.find("\033[K"), std::string::npos) << result.out;
      const auto lines = lines_of(result.out);
      ASSERT_EQ(lines.size(), 1u) << result.out;
      EXPECT_EQ(lines[0].rfind("wallrans: converged after", 0), 0u) << lines[0];
    } else {
      EXPECT_NE(result.out.find("\033[K"), std::string::npos) << "no in-place line:\n" << result.out;
      EXPECT_NE(result.out.find("wallrans: converged after"), std::string::npos) << result.out;
      // The log file has the rows, without the terminal's control characters.
      const std::string log = read_text(scratch.path() / "live" / "progress.log");
      EXPECT_EQ(log.find('\033'), std::string::npos);
      EXPECT_EQ(log.find('\r'), std::string::npos);
    }
  }
}

// Without flow.reference_velocity the run says which U_ref its Cf and Cp use.
TEST(ReferenceVelocity, TheDefaultIsNamedInTheSummaryAndOnTheTerminal) {
  const ScratchDirectory scratch("wallrans_reference");
  write_text(scratch.path() / "cavity.yaml", cavity_case("default_reference", 8, 1e-6, 400));
  const ProgramResult result = run_program(scratch.path(), {"run", "cavity.yaml", "--output-dir", "run"},
                                           scratch.path() / "logs", "reference");
  ASSERT_EQ(result.exit_status, 0) << result.err;
  EXPECT_NE(result.out.find("U_ref = 1 m/s (default: flow.reference_velocity not set)"), std::string::npos)
      << result.out;
  const auto s = nlohmann::json::parse(read_text(scratch.path() / "run" / "summary.json"));
  EXPECT_EQ(s["reference_velocity"]["value"], 1.0);
  EXPECT_EQ(s["reference_velocity"]["from"], "default (flow.reference_velocity not set)");
}

}  // namespace
