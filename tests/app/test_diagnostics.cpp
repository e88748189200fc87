// Diagnostics of the real program (2 ranks where the ranks must agree): a diverging run names the
// equation, cell, place and iteration, suggests what to change and leaves the last good fields
// (read back with VTK's own reader); a closed box with an inflow is refused at set-up; damaged or
// non-finite checkpoints are refused on restart; the first-cell y+ of wall-resolved closures is
// checked after a run and estimated by `check`.
#include <gtest/gtest.h>

#include <nlohmann/json.hpp>
#include <vtkCellData.h>
#include <vtkDataArray.h>
#include <vtkNew.h>
#include <vtkStructuredGrid.h>
#include <vtkXMLPStructuredGridReader.h>

#include <algorithm>
#include <cctype>
#include <cmath>
#include <cstdlib>
#include <filesystem>
#include <regex>
#include <string>
#include <vector>

#include "program_runner.hpp"
#include "run_fixtures.hpp"

namespace fs = std::filesystem;
using namespace wallrans::test_support;

namespace {

ProgramResult run_np2(const fs::path& dir, const std::vector<std::string>& args, const std::string& label) {
  return run_program_mpi(2, dir, args, dir / "logs", label);
}

const std::string cavity_re1000 =
    "title: cavity_re1000\nflow: {kinematic_viscosity: 0.001}\ngrid: {generator: cavity, cells: [24, 24]}\n"
    "boundaries:\n  - {side: top, kind: wall, velocity: [1.0, 0.0]}\n  - {side: bottom, kind: wall}\n"
    "  - {side: left, kind: wall}\n  - {side: right, kind: wall}\n";

// The plate of configs/plate_sa.yaml on 88 x 48 cells (8 in the run-up) with another first cell,
// started on its own grid.
std::string coarse_plate(const std::string& first_cell_height) {
  std::string text = read_text(std::string(WALLRANS_SOURCE_DIR) + "/configs/plate_sa.yaml");
  text = std::regex_replace(text, std::regex(R"(cells: \[176, 96\])"), "cells: [88, 48]");
  text = std::regex_replace(text, std::regex(R"(run_up_cells: 16)"), "run_up_cells: 8");
  text = std::regex_replace(text, std::regex("\niterations:\n"), "\niterations:\n  coarse_grids: 0\n");
  return std::regex_replace(text, std::regex(R"(first_cell_height: 1\.5e-6)"),
                            "first_cell_height: " + first_cell_height);
}

// Number of cells of a .pvts and whether every value of every cell array is finite (VTK's reader).
std::pair<long, bool> cells_and_finite(const fs::path& pvts) {
  vtkNew<vtkXMLPStructuredGridReader> reader;
  reader->SetFileName(pvts.c_str());
  reader->Update();
  vtkCellData* cells = reader->GetOutput()->GetCellData();
  bool finite = cells->GetNumberOfArrays() > 0;
  for (int a = 0; a < cells->GetNumberOfArrays(); ++a) {
    vtkDataArray* array = cells->GetArray(a);
    for (vtkIdType t = 0; t < array->GetNumberOfTuples(); ++t)
      for (int c = 0; c < array->GetNumberOfComponents(); ++c)
        finite = finite && std::isfinite(array->GetComponent(t, c));
  }
  return {static_cast<long>(reader->GetOutput()->GetNumberOfCells()), finite};
}

}  // namespace

// SIMPLE without pressure relaxation and central differences at Re 1000 diverges within a few
// dozen iterations (Patankar 1980, sec. 6.7: SIMPLE needs pressure under-relaxation, about 0.3).
TEST(Divergence, DivergingRunNamesEquationCellAndIterationAndKeepsTheLastGoodFields) {
  ScratchDirectory scratch("wallrans_diverging");
  write_text(scratch.path() / "unstable.yaml",
             cavity_re1000 +
                 "iterations: {coupling: simple, relax_velocity: 0.9, relax_pressure: 1.0, max: 500, "
                 "report_every: 0, convection: central}\ncheckpoint: {every: 5}\n");
  const auto result = run_np2(scratch.path(), {"run", "unstable.yaml", "--output-dir", "run"}, "unstable");
  ASSERT_EQ(result.exit_status, 4) << result.out << result.err;
  EXPECT_TRUE(program_lines(result.err).empty()) << "a divergence is an outcome: " << result.err;
  std::smatch m;
  const std::regex line(
      R"(wallrans: diverged: (u-momentum|v-momentum|continuity \(pressure correction\)) diverged at iteration )"
      R"((\d+): (velocity_x|velocity_y|pressure) = \S+ at cell \((\d+), (\d+)\), x = \S+, y = \S+ \(.*\); )"
      R"(fields of iteration (\d+) in diverged_fields\.pvts; try: lower iterations\.relax_pressure \(now 1; )"
      R"(SIMPLE typically needs 0\.3\); use iterations\.convection: bounded_linear_upwind)");
  ASSERT_TRUE(std::regex_search(result.out, m, line)) << result.out;
  const int iteration = std::stoi(m[2]), good = std::stoi(m[6]);
  EXPECT_EQ(good, iteration - 1);
  EXPECT_LT(std::stoi(m[4]), 24);
  EXPECT_LT(std::stoi(m[5]), 24);
  const fs::path out = scratch.path() / "run";
  EXPECT_EQ(json_field(out / "summary.json", "status"), "diverged");
  EXPECT_EQ(json_field(out / "summary.json", "diagnostic_file"), "diverged_fields.pvts");
  EXPECT_NE(json_field(out / "summary.json", "detail").find("diverged at iteration " + m[2].str()),
            std::string::npos);
  const auto [n_cells, finite] = cells_and_finite(out / "diverged_fields.pvts");
  EXPECT_EQ(n_cells, 24 * 24);
  EXPECT_TRUE(finite) << "the last good fields are finite";
  EXPECT_FALSE(fs::exists(out / "fields.pvts")) << "no fields that look like a result";
  ASSERT_GT(iteration, 5) << "the test needs a checkpoint before the divergence";
  EXPECT_TRUE(fs::exists(out / ("checkpoint_" + std::to_string((iteration - 1) / 5 * 5) + ".h5")))
      << "the last checkpoint is kept";
  EXPECT_EQ(history_rows(out), iteration);

  // Following the advice (pressure relaxation 0.3, bounded convection, velocity relaxation 0.7)
  // the same case no longer diverges.
  write_text(scratch.path() / "advised.yaml",
             cavity_re1000 +
                 "iterations: {coupling: simple, relax_velocity: 0.7, relax_pressure: 0.3, max: 60, "
                 "report_every: 0, convection: bounded_linear_upwind}\n");
  const auto advised = run_np2(scratch.path(), {"run", "advised.yaml", "--output-dir", "advised"}, "advised");
  EXPECT_NE(advised.exit_status, 4) << advised.out;
  EXPECT_NE(advised.exit_status, 1) << advised.err;
}

// Non-finite fields: a momentum solve that overflows (Richardson iteration scaled by 1e200 with no
// convergence test) after a restart; the restart state is the last good one.
TEST(Divergence, NonFiniteFieldsAreCountedAndLocatedAndTheRestartStateIsTheLastGoodOne) {
  ScratchDirectory scratch("wallrans_non_finite");
  write_text(scratch.path() / "cavity.yaml", cavity_case("cavity", 8, 1e-300, 5));
  ASSERT_EQ(run_np2(scratch.path(), {"run", "cavity.yaml", "--output-dir", "run"}, "first").exit_status, 3);
  const auto result = run_np2(
      scratch.path(),
      {"run", "cavity.yaml", "--output-dir", "run", "--restart", "run/checkpoint_5.h5", "-momentum_ksp_type",
       "richardson", "-momentum_pc_type", "none", "-momentum_ksp_richardson_scale", "1e200",
       "-momentum_ksp_norm_type", "none", "-momentum_ksp_max_it", "3"},
      "overflow");
  ASSERT_EQ(result.exit_status, 4) << result.out << result.err;
  std::smatch m;
  ASSERT_TRUE(std::regex_search(
      result.out, m,
      std::regex(
          R"(diverged at iteration 6: (velocity_x|velocity_y|pressure) = (nan|inf|-inf) at cell \(\d+, \d+\), )"
          R"(x = \S+, y = \S+ \(non-finite in (\d+) cell\(s\); this one changed most in the last good )"
          R"(iteration\); fields of iteration 5 in diverged_fields\.pvts)")))
      << result.out;
  EXPECT_GE(std::stoi(m[3]), 1);
  EXPECT_LE(std::stoi(m[3]), 64);
  const fs::path out = scratch.path() / "run";
  const auto [n_cells, finite] = cells_and_finite(out / "diverged_fields.pvts");
  EXPECT_EQ(n_cells, 64);
  EXPECT_TRUE(finite);
  EXPECT_TRUE(fs::exists(out / "checkpoint_5.h5"));
}

TEST(IllPosed, ClosedBoxWithAnInflowIsRefusedAtSetUpAndABalancedOneIsNot) {
  ScratchDirectory scratch("wallrans_closed_box");
  const std::string box =
      "title: box\nflow: {kinematic_viscosity: 0.01}\ngrid: {generator: cavity, cells: [16, "
      "16]}\nboundaries:\n"
      "  - {side: top, kind: wall}\n  - {side: bottom, kind: wall}\n"
      "  - {side: left, kind: inflow, velocity: [1.0, 0.0]}\n";
  write_text(scratch.path() / "box.yaml", box + "  - {side: right, kind: wall}\niterations: {max: 5}\n");
  // Inflow through the left side (1 m wide, 1 m/s), no outflow or opening: 1 m^2/s cannot leave.
  const auto before = snapshot(scratch.path());
  for (const char* command : {"check", "run"}) {
    const auto result = run_np2(scratch.path(), {command, "box.yaml", "--output-dir", "run"}, command);
    EXPECT_EQ(result.exit_status, 2) << result.err;
    const auto lines = program_lines(result.err);
    ASSERT_EQ(lines.size(), 1u) << result.err;
    EXPECT_EQ(
        lines[0],
        "wallrans: error: box.yaml:7: key 'boundaries': expected the prescribed volume fluxes of a domain "
        "without an outflow or opening boundary to balance, got a net inflow of 1 m^2/s (in 1, out 0 through "
        "prescribed faces); add an outflow or opening boundary where the flow may leave");
  }
  auto after = snapshot(scratch.path());
  std::erase_if(after, [](const auto& entry) { return entry.first.rfind("logs", 0) == 0; });
  EXPECT_EQ(after, before);
  // The same flux leaving through the right side balances.
  write_text(scratch.path() / "through.yaml",
             box + "  - {side: right, kind: inflow, velocity: [1.0, 0.0]}\niterations: {max: 5}\n");
  const auto balanced = run_np2(scratch.path(), {"check", "through.yaml", "--output-dir", "run"}, "balanced");
  EXPECT_EQ(balanced.exit_status, 0) << balanced.err;
}

// A checkpoint whose data bytes were overwritten after writing, and one holding a NaN with a
// matching checksum (as a tool that rewrote the data would leave it), are refused by `run`
// (2 ranks) and `check` with one line each; the run directory is left as it was.
TEST(Checkpoints, OverwrittenBytesAndNonFiniteValuesAreRefusedOnRestart) {
  const std::string python = WALLRANS_H5PY_PYTHON;
  if (python.empty()) GTEST_SKIP() << "needs a Python with h5py to damage the files";
  ScratchDirectory scratch("wallrans_damaged_checkpoint");
  write_text(scratch.path() / "cavity.yaml", cavity_case("cavity", 8, 1e-300, 5));
  ASSERT_EQ(run_np2(scratch.path(), {"run", "cavity.yaml", "--output-dir", "run"}, "first").exit_status, 3);
  fs::copy_file(scratch.path() / "run" / "checkpoint_5.h5", scratch.path() / "damaged.h5");
  fs::copy_file(scratch.path() / "run" / "checkpoint_5.h5", scratch.path() / "nan.h5");
  write_text(scratch.path() / "damage.py",
             "import h5py, struct, zlib, numpy as np\n"
             "with h5py.File('damaged.h5', 'r') as f:\n"
             "    offset = f['fields/pressure'].id.get_offset()\n"
             "with open('damaged.h5', 'r+b') as raw:\n"
             "    raw.seek(offset + 8 * 10)\n"
             "    raw.write(struct.pack('<d', 0.123456))\n"
             "with h5py.File('nan.h5', 'r+') as f:\n"
             "    d = f['fields/velocity_y']\n"
             "    a = d[()]\n"
             "    a[3, 5] = np.nan\n"
             "    d[...] = a\n"
             "    d.attrs.modify('crc32', np.uint32(zlib.crc32(a.astype('<f8').tobytes())))\n");
  ASSERT_EQ(std::system(("cd '" + scratch.path().string() + "' && " + python + " damage.py").c_str()), 0);
  const auto before = snapshot(scratch.path() / "run");
  struct Case {
    std::string file, message;
  };
  for (const Case& c :
       {Case{"damaged.h5",
             "damaged.h5: dataset '/fields/pressure': expected the data its checksum was written for (crc32 "
             "0x"},
        Case{"nan.h5",
             "nan.h5: dataset '/fields/velocity_y': expected finite values, got a non-finite value at "
             "cell (5, 3)"}}) {
    for (const char* command : {"run", "check"}) {
      const auto result =
          run_np2(scratch.path(), {command, "cavity.yaml", "--output-dir", "run", "--restart", c.file},
                  std::string(command) + "_" + c.file);
      EXPECT_EQ(result.exit_status, 2) << result.out << result.err;
      const auto lines = program_lines(result.err);
      ASSERT_EQ(lines.size(), 1u) << result.err;
      EXPECT_EQ(lines[0].rfind("wallrans: error: " + c.message, 0), 0u) << lines[0];
    }
  }
  EXPECT_EQ(snapshot(scratch.path() / "run"), before);
}

TEST(WallResolution, FirstCellYPlusAboveOneIsAWarningWithTheWorstPlace) {
  ScratchDirectory scratch("wallrans_wall_resolution");
  // A first cell of 3e-5 m puts the first centre at y+ of order 10 at the leading edge.
  write_text(scratch.path() / "coarse_wall.yaml", coarse_plate("3.0e-5"));
  const auto coarse = run_np2(
      scratch.path(),
      {"run", "coarse_wall.yaml", "--output-dir", "coarse", "--max-iterations", "40", "--quiet"}, "coarse");
  ASSERT_EQ(coarse.exit_status, 3) << coarse.err;
  std::smatch m;
  ASSERT_TRUE(std::regex_search(
      coarse.out, m,
      std::regex(
          R"(wallrans: warning: first-cell y\+ reaches (\S+) on the wall at x = \S+, y = \S+ \(bottom side, )"
          R"(face \d+\); model spalart_allmaras integrates to the wall and needs y\+ <= 1 there: a first-cell )"
          R"(centre distance of about \S+ m \(now 1\.5e-05 m\))")))
      << coarse.out;
  const double worst = std::stod(m[1]);
  EXPECT_GT(worst, 1.0);
  // The worst value is the largest first-cell y+ of wall.csv (its own column, written apart).
  double largest = 0.0;
  for (const auto& row : lines_of(read_text(scratch.path() / "coarse" / "wall.csv"))) {
    const auto comma = row.rfind(',');
    if (comma != std::string::npos && std::isdigit(static_cast<unsigned char>(row[comma + 1])))
      largest = std::max(largest, std::atof(row.c_str() + comma + 1));
  }
  EXPECT_NEAR(worst, largest, 5e-3 * largest) << "printed with 3 significant digits";
  const auto summary = nlohmann::json::parse(read_text(scratch.path() / "coarse" / "summary.json"));
  ASSERT_EQ(summary["warnings"].size(), 1u) << summary.dump(2);
  EXPECT_EQ(summary["warnings"][0].get<std::string>().rfind("first-cell y+ reaches", 0), 0u) << summary.dump(2);
  EXPECT_NEAR(summary["wall_resolution"]["max_first_cell_y_plus"].get<double>(), worst, 5e-3 * worst);

  // A first cell of 5e-7 m (a third of the shipped plate's) stays below y+ = 1: no warning.
  write_text(scratch.path() / "fine_wall.yaml", coarse_plate("5.0e-7"));
  const auto fine =
      run_np2(scratch.path(),
              {"run", "fine_wall.yaml", "--output-dir", "fine", "--max-iterations", "40", "--quiet"}, "fine");
  ASSERT_EQ(fine.exit_status, 3) << fine.err;
  EXPECT_EQ(fine.out.find("warning"), std::string::npos) << fine.out;
  EXPECT_TRUE(nlohmann::json::parse(read_text(scratch.path() / "fine" / "summary.json"))["warnings"].empty());
}

// `check` estimates the first-cell y+ of the shipped plate from the flat-plate correlation
// C_f = 0.0592 Re_x^(-1/5) and prints the distance for y+ = 1, nu / u_tau with
// u_tau = U sqrt(C_f / 2), recomputed here from the Re_x it prints.
TEST(WallResolution, CheckEstimatesTheFirstCellFromAFlatPlateCorrelation) {
  ScratchDirectory scratch("wallrans_wall_estimate");
  const auto result = run_program(
      scratch.path(),
      {"check", std::string(WALLRANS_SOURCE_DIR) + "/configs/plate_sa.yaml", "--output-dir", "run"},
      scratch.path() / "logs", "check");
  ASSERT_EQ(result.exit_status, 0) << result.err;
  std::smatch m;
  ASSERT_TRUE(std::regex_search(
      result.out, m,
      std::regex(
          R"(wall resolution \(estimate, turbulent flat plate C_f = 0\.0592 Re_x\^-1/5 .*\): first-cell y\+ )"
          R"(up to (\S+) at x = \S+, y = \S+ \(Re_x = (\S+)\); y\+ = 1 there needs a first-cell centre )"
          R"(distance of (\S+) m \(first cell height about \S+ m; now (\S+) m\))")))
      << result.out;
  const double re_x = std::stod(m[2]), needed = std::stod(m[3]), now = std::stod(m[4]);
  const double u = 10.0, nu = 1.0e-6;  // configs/plate_sa.yaml
  const double u_tau = u * std::sqrt(0.5 * 0.0592 * std::pow(re_x, -0.2));
  // 1%: Re_x printed with 3 digits changes nu/u_tau by 0.01%, the printed distance by 0.25%.
  EXPECT_NEAR(needed, nu / u_tau, 0.01 * needed);
  EXPECT_NEAR(now, 0.75e-6, 0.01 * now) << "half the first cell height 1.5e-6 m of the shipped plate";
  EXPECT_NEAR(std::stod(m[1]), now / needed, 0.01 * now / needed);
}
