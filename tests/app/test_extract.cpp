// The `extract` command end to end: wall.csv and the profiles taken from a run's final checkpoint
// equal what the run itself wrote at the end (1 and 2 ranks, column by column), the run
// directory is never touched, and bad input ends with one line and exit status 2, nothing created.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <filesystem>
#include <string>
#include <vector>

#include "io/csv_writer.hpp"
#include "program_runner.hpp"

using namespace wallrans::test_support;
namespace fs = std::filesystem;

namespace {

constexpr int exit_bad_input = 2;

// A coarse Spalart-Allmaras plate, stopped by its cap after 40 iterations (exit 3) with a
// checkpoint, wall.csv and three profiles in run/.
const std::string plate_case =
    "title: extract_plate\n"
    "flow: {kinematic_viscosity: 1.0e-6, reference_velocity: 10.0, initial_velocity: [10.0, 0.0]}\n"
    "grid: {generator: plate, cells: [48, 32], length: 1.0, height: 0.1, first_cell_height: 1.0e-5,\n"
    "       run_up: 0.1, run_up_cells: 8, leading_edge_spacing: 1.0e-3}\n"
    "boundaries:\n"
    "  - {side: left, kind: inflow, velocity: [10.0, 0.0]}\n"
    "  - {side: bottom, to: 0.0, kind: slip}\n"
    "  - {side: bottom, from: 0.0, kind: wall}\n"
    "  - {side: right, kind: outflow}\n"
    "  - {side: top, kind: opening, velocity: [10.0, 0.0]}\n"
    "turbulence: {model: spalart_allmaras}\n"
    "iterations: {max: 40, report_every: 0, coarse_grids: 0}\n"
    "output: {directory: run, profiles_at_x: [0.25, 0.5, 0.9]}\n";

const std::vector<std::string> written = {"wall.csv", "profile_x0.25.csv", "profile_x0.5.csv",
                                          "profile_x0.9.csv"};

// Both tables are computed by the same functions from the same checkpoint, which a restart reads
// back bit for bit on any rank count (test_restart). What may differ between rank layouts is the
// order of a few floating-point sums (least-squares fits of at most 8 neighbours, reductions over
// 2 ranks): reordering a sum of n terms changes it by at most about n machine epsilons (2.2e-16)
// of its largest term, n <= 10 here. 1e-13 of the column's largest magnitude keeps a margin of 40
// over that bound and is still far below any physical difference (Cf is printed to 4 digits).
constexpr double round_off = 1e-13;

void expect_same_table(const fs::path& expected_path, const fs::path& actual_path) {
  const std::vector<std::string> text = {"side"};
  const wallrans::CsvTable expected = wallrans::read_csv(expected_path.string(), text);
  const wallrans::CsvTable actual = wallrans::read_csv(actual_path.string(), text);
  ASSERT_EQ(actual.columns, expected.columns) << actual_path;
  ASSERT_EQ(actual.rows.size(), expected.rows.size()) << actual_path;
  ASSERT_GT(expected.rows.size(), 5u) << expected_path;
  for (size_t c = 0; c < expected.columns.size(); ++c) {
    if (expected.columns[c] == "side") {
      for (size_t r = 0; r < expected.rows.size(); ++r)
        EXPECT_EQ(actual.fields[r][c], expected.fields[r][c]) << actual_path << " row " << r;
      continue;
    }
    double scale = 0.0;
    for (const auto& row : expected.rows)
      if (std::isfinite(row[c])) scale = std::max(scale, std::abs(row[c]));
    for (size_t r = 0; r < expected.rows.size(); ++r) {
      const double a = actual.rows[r][c], e = expected.rows[r][c];
      if (std::isnan(e)) {
        EXPECT_TRUE(std::isnan(a)) << actual_path << " column " << expected.columns[c] << " row " << r;
        continue;
      }
      EXPECT_NEAR(a, e, round_off * scale)
          << actual_path << " column " << expected.columns[c] << " row " << r;
    }
  }
}

class Extract : public ::testing::Test {
 protected:
  static void SetUpTestSuite() {
    scratch_ = new ScratchDirectory("wallrans_extract");
    write_text(dir() / "plate.yaml", plate_case);
    const ProgramResult run = run_program_mpi(2, dir(), {"run", "plate.yaml", "--quiet"}, logs(), "run");
    ASSERT_EQ(run.exit_status, 3) << run.err;  // the cap, with a final checkpoint
    ASSERT_TRUE(fs::exists(dir() / "run" / "checkpoint_40.h5"));
  }
  static void TearDownTestSuite() {
    delete scratch_;
    scratch_ = nullptr;
  }
  static fs::path dir() { return scratch_->path(); }
  static fs::path logs() { return scratch_->path() / "logs"; }

  // Runs an extract whose input is bad and checks: exit 2, one program line naming each of
  // `mentions`, the target folder not created and the run directory unchanged.
  static void expect_refused(int ranks, const std::vector<std::string>& arguments, const std::string& into,
                             const std::vector<std::string>& mentions) {
    const auto before = snapshot(dir() / "run");
    std::vector<std::string> full = {"extract", "plate.yaml"};
    full.insert(full.end(), arguments.begin(), arguments.end());
    const ProgramResult result = run_program_mpi(ranks, dir(), full, logs(), "refused");
    std::string label;
    for (const auto& a : full) label += a + " ";
    EXPECT_EQ(result.exit_status, exit_bad_input) << label << result.err;
    const auto lines = program_lines(result.err);
    ASSERT_EQ(lines.size(), 1u) << label << result.err;
    EXPECT_EQ(lines[0].rfind("wallrans: error: ", 0), 0u) << lines[0];
    for (const auto& mention : mentions) EXPECT_NE(lines[0].find(mention), std::string::npos) << lines[0];
    if (!into.empty()) {
      EXPECT_FALSE(fs::exists(dir() / into)) << label;
    }
    EXPECT_EQ(snapshot(dir() / "run"), before) << label;
  }

  static ScratchDirectory* scratch_;
};

ScratchDirectory* Extract::scratch_ = nullptr;

TEST_F(Extract, OutputsEqualTheRunsOwnOnOneAndTwoRanks) {
  const auto before = snapshot(dir() / "run");
  // 2 ranks with the case's stations; 1 rank with the same stations given on the command line.
  const ProgramResult two = run_program_mpi(
      2, dir(), {"extract", "plate.yaml", "--checkpoint", "run/checkpoint_40.h5", "--into", "np2"}, logs(),
      "np2");
  ASSERT_EQ(two.exit_status, 0) << two.err;
  const ProgramResult one = run_program(dir(),
                                        {"extract", "plate.yaml", "--checkpoint", "run/checkpoint_40.h5",
                                         "--into", "np1", "--stations", "0.25,0.5,0.9"},
                                        logs(), "np1");
  ASSERT_EQ(one.exit_status, 0) << one.err;
  for (const ProgramResult* result : {&two, &one}) {
    EXPECT_NE(result->out.find("boundaries[2] bottom"), std::string::npos) << result->out;  // the answers
    EXPECT_NE(result->out.find("(iteration 40)"), std::string::npos) << result->out;
  }
  for (const std::string& name : written) {
    expect_same_table(dir() / "run" / name, dir() / "np2" / name);
    expect_same_table(dir() / "run" / name, dir() / "np1" / name);
  }
  EXPECT_EQ(snapshot(dir() / "run"), before);  // nothing in the run directory written or locked
}

TEST_F(Extract, BadInputIsOneLineAndExitTwo) {
  const std::string checkpoint = "run/checkpoint_40.h5";
  expect_refused(1, {"--checkpoint", "missing.h5", "--into", "e1"}, "e1", {"missing.h5"});
  expect_refused(2, {"--checkpoint", checkpoint, "--into", "e2", "--stations", "0.5,7"}, "e2",
                 {"--stations", "between x = -0.1 and 1", "got 7"});
  expect_refused(1, {"--checkpoint", checkpoint, "--into", "e3", "--stations", "0.5,,1"}, "e3",
                 {"--stations", "'0.5,,1'"});
  expect_refused(1, {"--checkpoint", checkpoint, "--into", "e4", "--stations", "half"}, "e4", {"'half'"});
  expect_refused(1, {"--checkpoint", checkpoint, "--into", "run"}, "", {"--into 'run'", "run directory"});
  expect_refused(1, {"--checkpoint", checkpoint, "--into", "e5", "--at"}, "e5", {"'--at'", "extract --help"});
  expect_refused(1, {"--checkpoint", checkpoint}, "", {"--into"});
  // A checkpoint of another grid: the restart's own check.
  write_text(dir() / "coarser.yaml", plate_case.substr(0, plate_case.find("[48, 32]")) + "[24, 16]" +
                                         plate_case.substr(plate_case.find("[48, 32]") + 8));
  std::vector<std::string> other = {"extract", "coarser.yaml", "--checkpoint", checkpoint, "--into", "e6"};
  const ProgramResult result = run_program(dir(), other, logs(), "other_grid");
  EXPECT_EQ(result.exit_status, exit_bad_input) << result.err;
  EXPECT_NE(result.err.find("grid size"), std::string::npos) << result.err;
  EXPECT_FALSE(fs::exists(dir() / "e6"));
}

TEST_F(Extract, HelpNamesOptionsAndExamples) {
  const ProgramResult help = run_program(dir(), {"extract", "--help"}, logs(), "help");
  EXPECT_EQ(help.exit_status, 0) << help.err;
  EXPECT_EQ(help.err, "");
  for (const char* mention : {"--checkpoint", "--into", "--stations", "Examples:", "wall.csv", "profile_x"})
    EXPECT_NE(help.out.find(mention), std::string::npos) << mention << " not in\n" << help.out;
  const ProgramResult top = run_program(dir(), {"--help"}, logs(), "top_help");
  EXPECT_NE(top.out.find("extract"), std::string::npos) << top.out;
}

}  // namespace
