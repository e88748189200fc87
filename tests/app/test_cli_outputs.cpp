// The files a real `wallrans run` leaves behind, read with independent readers (VTK's own parallel
// reader, the CSV reader, a JSON parser): a small lid-driven cavity at Re = U_lid L / nu = 100 on 2
// ranks.
// Every assertion follows from the case definition or from the physics of this flow, never
// from numbers the program produced in an earlier run.
#include <gtest/gtest.h>
#include <vtkCellData.h>
#include <vtkDataArray.h>
#include <vtkNew.h>
#include <vtkPointData.h>
#include <vtkStructuredGrid.h>
#include <vtkXMLPStructuredGridReader.h>

#include <algorithm>
#include <array>
#include <cmath>
#include <filesystem>
#include <memory>
#include <nlohmann/json.hpp>
#include <sstream>
#include <stdexcept>
#include <string>
#include <vector>

#include "io/csv_writer.hpp"
#include "program_runner.hpp"

using namespace wallrans::test_support;
namespace fs = std::filesystem;

namespace {

constexpr int n_cells = 24;        // cells per side of the unit square
constexpr double lid_speed = 1.0;  // [m/s]; with nu = 0.01 m^2/s and side 1 m, Re = 100
constexpr double residual_drop = 1e-6;
constexpr double tight_residual_drop = 1e-9;
constexpr int max_iterations = 3000;

std::string cavity_case(double drop) {
  std::ostringstream text;
  text << "title: cli_cavity\n"
       << "flow:\n"
       << "  kinematic_viscosity: 0.01\n"
       << "  reference_velocity: " << lid_speed << "\n"
       << "grid:\n"
       << "  generator: cavity\n"
       << "  cells: [" << n_cells << ", " << n_cells << "]\n"
       << "boundaries:\n"
       << "  - {side: top, kind: wall, velocity: [" << lid_speed << ", 0.0]}\n"
       << "  - {side: bottom, kind: wall}\n"
       << "  - {side: left, kind: wall}\n"
       << "  - {side: right, kind: wall}\n"
       << "iterations:\n"
       << "  max: " << max_iterations << "\n"
       << "  residual_drop: " << drop << "\n"
       << "  report_every: 0\n"
       << "output:\n"
       << "  directory: out_default\n";
  return text.str();
}

// Cell data of a fields.pvts in global cell order (i fastest), read with VTK's own reader.
struct CellFields {
  int cells_x = 0, cells_y = 0;
  std::vector<double> pressure, eddy_viscosity, cell_volume;
  std::vector<std::array<double, 3>> velocity;
  int n_velocity_components = 0;
  std::vector<std::array<int, 2>> cell_index;
  double u(int i, int j) const { return velocity[static_cast<size_t>(i + j * cells_x)][0]; }
  double v(int i, int j) const { return velocity[static_cast<size_t>(i + j * cells_x)][1]; }
};

std::vector<double> scalar_array(vtkCellData* cells, const char* name) {
  vtkDataArray* array = cells->GetArray(name);
  if (array == nullptr || array->GetNumberOfComponents() != 1) {
    throw std::runtime_error(std::string("fields.pvts: no one-component cell array '") + name + "'");
  }
  std::vector<double> values(static_cast<size_t>(array->GetNumberOfTuples()));
  for (vtkIdType k = 0; k < array->GetNumberOfTuples(); ++k)
    values[static_cast<size_t>(k)] = array->GetComponent(k, 0);
  return values;
}

CellFields read_fields(const fs::path& pvts) {
  if (!fs::exists(pvts)) throw std::runtime_error("missing " + pvts.string());
  vtkNew<vtkXMLPStructuredGridReader> reader;
  reader->SetFileName(pvts.string().c_str());
  reader->Update();
  vtkStructuredGrid* grid = reader->GetOutput();
  int dims[3] = {0, 0, 0};
  grid->GetDimensions(dims);
  if (dims[2] != 1 || grid->GetNumberOfCells() != vtkIdType(dims[0] - 1) * (dims[1] - 1)) {
    throw std::runtime_error(pvts.string() + ": not a 2D structured grid");
  }
  CellFields fields;
  fields.cells_x = dims[0] - 1;
  fields.cells_y = dims[1] - 1;
  vtkCellData* cells = grid->GetCellData();
  fields.pressure = scalar_array(cells, "pressure");
  fields.eddy_viscosity = scalar_array(cells, "eddy_viscosity");
  fields.cell_volume = scalar_array(cells, "cell_volume");
  vtkDataArray* velocity = cells->GetArray("velocity");
  vtkDataArray* index = cells->GetArray("cell_index");
  if (velocity == nullptr || index == nullptr || index->GetNumberOfComponents() != 2) {
    throw std::runtime_error(pvts.string() + ": missing velocity or cell_index");
  }
  fields.n_velocity_components = velocity->GetNumberOfComponents();
  for (vtkIdType k = 0; k < velocity->GetNumberOfTuples(); ++k) {
    std::array<double, 3> value{0.0, 0.0, 0.0};
    for (int c = 0; c < std::min(3, fields.n_velocity_components); ++c)
      value[c] = velocity->GetComponent(k, c);
    fields.velocity.push_back(value);
    fields.cell_index.push_back({int(index->GetComponent(k, 0)), int(index->GetComponent(k, 1))});
  }
  return fields;
}

int column_of(const wallrans::CsvTable& table, const std::string& name) {
  const auto found = std::find(table.columns.begin(), table.columns.end(), name);
  if (found == table.columns.end()) throw std::runtime_error("no column " + name);
  return static_cast<int>(found - table.columns.begin());
}

bool contains(const std::string& text, const std::string& part) {
  return text.find(part) != std::string::npos;
}

// One converged 2-rank run shared by the tests of this suite (it takes a few seconds).
class CavityRun : public ::testing::Test {
 protected:
  static void SetUpTestSuite() {
    scratch_ = std::make_unique<ScratchDirectory>("wallrans_cli_outputs");
    write_text(scratch_->path() / "cavity.yaml", cavity_case(residual_drop));
    result_ = run_program_mpi(2, scratch_->path(), {"run", "cavity.yaml", "--output-dir", "np2", "--quiet"},
                              scratch_->path() / "logs", "np2");
  }
  static void TearDownTestSuite() { scratch_.reset(); }

  void SetUp() override { ASSERT_EQ(result_.exit_status, 0) << result_.out << result_.err; }

  static fs::path scratch() { return scratch_->path(); }
  static fs::path output() { return scratch_->path() / "np2"; }

  static std::unique_ptr<ScratchDirectory> scratch_;
  static ProgramResult result_;
};

std::unique_ptr<ScratchDirectory> CavityRun::scratch_;
ProgramResult CavityRun::result_;

TEST_F(CavityRun, WritesEveryOutputAndNoTemporaryFile) {
  for (const char* name : {"case.resolved.yaml", "residuals.csv", "fields.pvts", "fields_0.vts",
                           "fields_1.vts", "fields.pvd", "wall.csv", "summary.json", "progress.log"}) {
    EXPECT_TRUE(fs::is_regular_file(output() / name)) << name;
  }
  for (const auto& entry : fs::recursive_directory_iterator(output())) {
    EXPECT_FALSE(contains(entry.path().filename().string(), ".tmp")) << entry.path();
  }
  // The resolved case is itself a valid case file (it reproduces the run).
  const ProgramResult check =
      run_program(output(), {"check", "case.resolved.yaml"}, scratch() / "logs", "check_resolved");
  EXPECT_EQ(check.exit_status, 0) << check.err;
}

TEST_F(CavityRun, FieldsReadBackWithVtkAndObeyThePhysics) {
  const CellFields fields = read_fields(output() / "fields.pvts");
  ASSERT_EQ(fields.cells_x, n_cells);
  ASSERT_EQ(fields.cells_y, n_cells);
  const size_t n = static_cast<size_t>(n_cells) * n_cells;
  ASSERT_EQ(fields.pressure.size(), n);
  ASSERT_EQ(fields.velocity.size(), n);
  EXPECT_EQ(fields.n_velocity_components, 3);

  double area = 0.0;
  for (int j = 0; j < n_cells; ++j) {
    for (int i = 0; i < n_cells; ++i) {
      const size_t k = static_cast<size_t>(i + j * n_cells);
      EXPECT_EQ(fields.cell_index[k], (std::array<int, 2>{i, j})) << "VTK cell order";
      area += fields.cell_volume[k];
      EXPECT_EQ(fields.eddy_viscosity[k], 0.0) << "laminar: no eddy viscosity";
      EXPECT_TRUE(std::isfinite(fields.pressure[k]));
      const auto& u = fields.velocity[k];
      EXPECT_TRUE(std::isfinite(u[0]) && std::isfinite(u[1])) << i << ", " << j;
      EXPECT_EQ(u[2], 0.0);
      // Observed maximum principle: in the steady lid-driven cavity the speed stays below the lid
      // speed (common practice for this flow, e.g. every profile of Ghia et al. 1982); the
      // tolerance allows for the residual level.
      EXPECT_LE(std::hypot(u[0], u[1]), lid_speed + 1e-6) << i << ", " << j;
    }
  }
  EXPECT_NEAR(area, 1.0, 1e-12) << "cell volumes must tile the unit square";

  // The lid drags the fluid just below it along: u > 0 in the whole top row.
  for (int i = 0; i < n_cells; ++i) EXPECT_GT(fields.u(i, n_cells - 1), 0.0) << "top row, i = " << i;
  // The primary (clockwise) vortex returns the flow lower down: u < 0 somewhere on the two cell
  // columns either side of x = 0.5, v > 0 on the left half and v < 0 on the right half of the
  // middle row.
  for (int i : {n_cells / 2 - 1, n_cells / 2}) {
    double min_u = 0.0;
    for (int j = 0; j < n_cells; ++j) min_u = std::min(min_u, fields.u(i, j));
    EXPECT_LT(min_u, 0.0) << "column " << i;
  }
  double max_v_left = 0.0, min_v_right = 0.0;
  for (int i = 0; i < n_cells / 2; ++i) max_v_left = std::max(max_v_left, fields.v(i, n_cells / 2));
  for (int i = n_cells / 2; i < n_cells; ++i) min_v_right = std::min(min_v_right, fields.v(i, n_cells / 2));
  EXPECT_GT(max_v_left, 0.0);
  EXPECT_LT(min_v_right, 0.0);

  // Point data for contour plots: each interior node holds the mean of its four cells.
  vtkNew<vtkXMLPStructuredGridReader> reader;
  reader->SetFileName((output() / "fields.pvts").string().c_str());
  reader->Update();
  vtkPointData* points = reader->GetOutput()->GetPointData();
  vtkDataArray* point_pressure = points->GetArray("pressure");
  vtkDataArray* point_velocity = points->GetArray("velocity");
  ASSERT_NE(point_pressure, nullptr);
  ASSERT_NE(point_velocity, nullptr);
  ASSERT_EQ(point_pressure->GetNumberOfTuples(), (n_cells + 1) * (n_cells + 1));
  EXPECT_EQ(point_velocity->GetNumberOfComponents(), 3);
  for (int j = 1; j < n_cells; ++j) {
    for (int i = 1; i < n_cells; ++i) {
      const auto cell = [&](int a, int b) { return static_cast<size_t>(a + b * n_cells); };
      const double mean = 0.25 * (fields.pressure[cell(i - 1, j - 1)] + fields.pressure[cell(i, j - 1)] +
                                  fields.pressure[cell(i - 1, j)] + fields.pressure[cell(i, j)]);
      EXPECT_NEAR(point_pressure->GetComponent(i + j * (n_cells + 1), 0), mean, 1e-14) << i << ", " << j;
    }
  }
}

TEST_F(CavityRun, HistoryRecordsEveryIterationUntilConvergence) {
  const wallrans::CsvTable history = wallrans::read_csv((output() / "residuals.csv").string());
  ASSERT_GE(history.columns.size(), 4u);
  EXPECT_EQ(std::vector<std::string>(history.columns.begin(), history.columns.begin() + 4),
            (std::vector<std::string>{"iteration", "u_residual", "v_residual", "continuity_residual"}));
  ASSERT_FALSE(history.rows.empty());
  // Counts are written as integers: the iteration and the linear iterations of each equation.
  for (const char* count : {"iteration", "momentum_linear_its", "pressure_linear_its"}) {
    const size_t c = history.column(count);
    for (size_t r = 0; r < history.rows.size(); ++r)
      EXPECT_EQ(history.fields[r][c], std::to_string(static_cast<long>(history.rows[r][c])))
          << count << " row " << r;
  }
  for (size_t r = 0; r < history.rows.size(); ++r) {
    EXPECT_EQ(history.rows[r][0], double(r + 1)) << "row " << r;
    EXPECT_EQ(history.fields[r][0], std::to_string(r + 1)) << "row " << r;
  }
  EXPECT_EQ(std::find(history.columns.begin(), history.columns.end(), "turbulence_linear_its"),
            history.columns.end())
      << "a laminar run has no model equation";
  // The run stops at the first iteration where every normalised residual is below residual_drop.
  auto all_below = [](const std::vector<double>& row) {
    return row[1] < residual_drop && row[2] < residual_drop && row[3] < residual_drop;
  };
  EXPECT_TRUE(all_below(history.rows.back()));
  for (size_t r = 0; r + 1 < history.rows.size(); ++r)
    EXPECT_FALSE(all_below(history.rows[r])) << "row " << r;

  const auto summary = nlohmann::json::parse(read_text(output() / "summary.json"));
  EXPECT_EQ(summary["converged"], true);
  EXPECT_EQ(summary["iterations"], history.rows.size());
  EXPECT_EQ(summary["ranks"], 2);
  // Every equation's final residual is the last row of the history.
  const auto& last = history.rows.back();
  EXPECT_EQ(summary["residuals"]["u"].get<double>(), last[history.column("u_residual")]);
  EXPECT_EQ(summary["residuals"]["v"].get<double>(), last[history.column("v_residual")]);
  EXPECT_EQ(summary["residuals"]["continuity"].get<double>(), last[history.column("continuity_residual")]);
  EXPECT_EQ(summary["grid"]["source"], "generator cavity");
  EXPECT_EQ(summary["turbulence_model"]["name"], "laminar");
}

TEST_F(CavityRun, WallDataCoversAllFourWalls) {
  const wallrans::CsvTable wall = wallrans::read_csv((output() / "wall.csv").string(), {"side"});
  EXPECT_EQ(wall.columns,
            (std::vector<std::string>{"segment", "side", "x", "y", "s", "tangent_x", "tangent_y", "cf", "cp",
                                      "wall_shear_stress", "first_cell_distance", "first_cell_y_plus"}));
  ASSERT_EQ(wall.rows.size(), 4u * n_cells);
  const size_t segment = wall.column("segment"), side = wall.column("side"), x = wall.column("x"),
               y = wall.column("y"), s = wall.column("s"), tx = wall.column("tangent_x"),
               ty = wall.column("tangent_y"), cf = wall.column("cf"),
               distance = wall.column("first_cell_distance");
  // The case's segments: 0 top (the lid), 1 bottom, 2 left, 3 right, n_cells faces each, in order
  // along the wall: s runs from half a cell to 1 - half a cell.
  const char* sides[4] = {"top", "bottom", "left", "right"};
  double max_cf_lid = 0.0, max_cf_bottom = 0.0;
  for (size_t r = 0; r < wall.rows.size(); ++r) {
    const auto& row = wall.rows[r];
    const int k = static_cast<int>(r) / n_cells, along = static_cast<int>(r) % n_cells;
    EXPECT_EQ(wall.fields[r][segment], std::to_string(k)) << "an integer segment index, row " << r;
    EXPECT_EQ(wall.fields[r][side], sides[k]) << r;
    EXPECT_NEAR(row[s], (along + 0.5) / n_cells, 1e-12) << r;
    // Uniform cells: the wall-to-centre distance is half a cell.
    EXPECT_NEAR(row[distance], 0.5 / n_cells, 1e-12);
    const bool horizontal = k < 2;
    EXPECT_NEAR(row[horizontal ? y : x], k == 0 || k == 3 ? 1.0 : 0.0, 1e-12) << r;
    // The tangent of the Cf sign: t.x > 0, or t.y > 0 on walls normal to x.
    EXPECT_EQ(row[tx], horizontal ? 1.0 : 0.0) << r;
    EXPECT_EQ(row[ty], horizontal ? 0.0 : 1.0) << r;
    if (k == 0) {
      // The fluid under the lid is slower than the lid (speed below the lid speed, see above), so
      // relative to the wall it moves along -t: Cf < 0 along the whole lid.
      EXPECT_LT(row[cf], 0.0) << "lid, x = " << row[x];
      max_cf_lid = std::max(max_cf_lid, std::abs(row[cf]));
    }
    if (k == 1) max_cf_bottom = std::max(max_cf_bottom, std::abs(row[cf]));
  }
  // The lid drives the flow; the fluid along the bottom moves far slower than the lid, so the
  // bottom wall's friction is smaller than the lid's.
  EXPECT_GT(max_cf_lid, 0.0);
  EXPECT_LT(max_cf_bottom, max_cf_lid);
}

// The answers in summary.json agree with the wall data they summarise: forces as sums over the
// faces, the Cf extremes, and the separation and reattachment points where the shear changes sign.
TEST_F(CavityRun, SummaryAnswersAgreeWithTheWallData) {
  const auto summary = nlohmann::json::parse(read_text(output() / "summary.json"));
  const wallrans::CsvTable wall = wallrans::read_csv((output() / "wall.csv").string(), {"side"});
  EXPECT_EQ(summary["reference_velocity"]["value"], lid_speed);
  EXPECT_EQ(summary["periodic"], nullptr);
  ASSERT_EQ(summary["walls"].size(), 4u);
  const double face_length = 1.0 / n_cells;
  for (int k = 0; k < 4; ++k) {
    const auto& w = summary["walls"][static_cast<size_t>(k)];
    EXPECT_EQ(w["segment"], k);
    EXPECT_EQ(w["name"], "boundaries[" + std::to_string(k) + "]");
    EXPECT_EQ(w["faces"], n_cells);
    EXPECT_NEAR(w["length"].get<double>(), 1.0, 1e-12);
    double fx = 0.0, fy = 0.0, cf_min = 1e300, cf_max = -1e300;
    std::vector<double> s, shear;
    std::vector<std::array<double, 2>> at;
    for (size_t r = 0; r < wall.rows.size(); ++r) {
      const auto& row = wall.rows[r];
      if (row[wall.column("segment")] != k) continue;
      const double tau = row[wall.column("wall_shear_stress")];
      fx += tau * row[wall.column("tangent_x")] * face_length;
      fy += tau * row[wall.column("tangent_y")] * face_length;
      cf_min = std::min(cf_min, row[wall.column("cf")]);
      cf_max = std::max(cf_max, row[wall.column("cf")]);
      s.push_back(row[wall.column("s")]);
      shear.push_back(tau);
      at.push_back({row[wall.column("x")], row[wall.column("y")]});
    }
    EXPECT_NEAR(w["friction_force"][0].get<double>(), fx, 1e-12) << k;
    EXPECT_NEAR(w["friction_force"][1].get<double>(), fy, 1e-12) << k;
    EXPECT_EQ(w["cf_min"].get<double>(), cf_min) << k;
    EXPECT_EQ(w["cf_max"].get<double>(), cf_max) << k;
    // Sign changes along s (the tangent points along s on these walls): + to - is a separation.
    std::vector<std::pair<double, std::string>> expected;
    for (size_t m = 0; m + 1 < s.size(); ++m) {
      if ((shear[m] > 0.0) == (shear[m + 1] > 0.0) || shear[m] == 0.0 || shear[m + 1] == 0.0) continue;
      expected.emplace_back(s[m] + shear[m] / (shear[m] - shear[m + 1]) * (s[m + 1] - s[m]),
                            shear[m] > 0.0 ? "separation" : "reattachment");
    }
    const auto& points = w["separation_and_reattachment"];
    ASSERT_EQ(points.size(), expected.size()) << "wall " << k;
    for (size_t m = 0; m < expected.size(); ++m) {
      EXPECT_NEAR(points[m]["s"].get<double>(), expected[m].first, 1e-12) << k;
      EXPECT_EQ(points[m]["kind"], expected[m].second) << k;
    }
  }
  // The lid is dragged back by the fluid: friction force along -x.
  EXPECT_LT(summary["walls"][0]["friction_force"][0].get<double>(), 0.0);
}

// --quiet prints the final line only; everything else went to progress.log, which ends with it.
TEST_F(CavityRun, QuietPrintsOnlyTheFinalLineAndTheLogKeepsTheRest) {
  const auto lines = lines_of(result_.out);
  ASSERT_EQ(lines.size(), 1u) << result_.out;
  EXPECT_EQ(lines[0].rfind("wallrans: converged after ", 0), 0u) << lines[0];
  EXPECT_NE(lines[0].find("results in np2"), std::string::npos) << lines[0];
  const auto log = lines_of(read_text(output() / "progress.log"));
  ASSERT_GE(log.size(), 3u);
  EXPECT_EQ(log.back(), lines[0]);
  EXPECT_NE(log.front().find("wallrans: case 'cli_cavity'"), std::string::npos) << log.front();
  EXPECT_GE(line_containing(read_text(output() / "progress.log"), "boundaries[0] top"), 1)
      << "the answers table";
}

TEST_F(CavityRun, BadCaseIntoExistingRunDirectoryChangesNothing) {
  const fs::path previous = scratch() / "previous_run";
  fs::copy(output(), previous, fs::copy_options::recursive);
  const auto before = snapshot(previous);
  ASSERT_TRUE(before.count("summary.json"));
  write_text(scratch() / "bad.yaml", read_text(scratch() / "cavity.yaml") + "bogus_key: 1\n");

  const ProgramResult bad = run_program(scratch(), {"run", "bad.yaml", "--output-dir", "previous_run"},
                                        scratch() / "logs", "bad_rerun");

  EXPECT_EQ(bad.exit_status, 2) << bad.err;
  EXPECT_EQ(snapshot(previous), before) << "a failed run must not touch an earlier run's files";
}

TEST_F(CavityRun, IterationCapGivesExitThreeWithOutputs) {
  constexpr int cap = 5;
  const ProgramResult capped = run_program(
      scratch(),
      {"run", "cavity.yaml", "--output-dir", "capped", "--max-iterations", std::to_string(cap), "--quiet"},
      scratch() / "logs", "capped");
  EXPECT_EQ(capped.exit_status, 3) << capped.err;
  const wallrans::CsvTable history = wallrans::read_csv((scratch() / "capped" / "residuals.csv").string());
  EXPECT_EQ(history.rows.size(), size_t(cap));
  EXPECT_TRUE(contains(read_text(scratch() / "capped" / "summary.json"), "\"converged\": false"));
  EXPECT_TRUE(fs::exists(scratch() / "capped" / "fields.pvts"));
}

// The converged answer must not depend on how the grid is split over ranks. Both runs converge to
// residual_drop 1e-9; what remains is the linear-solver and outer-iteration tolerance, far below
// 1e-6 of the lid speed.
TEST(CavityRanks, OneAndTwoRanksAgree) {
  const ScratchDirectory scratch("wallrans_cli_ranks");
  write_text(scratch.path() / "tight.yaml", cavity_case(tight_residual_drop));
  const ProgramResult one =
      run_program(scratch.path(), {"run", "tight.yaml", "--output-dir", "np1", "--quiet"},
                  scratch.path() / "logs", "np1");
  const ProgramResult two =
      run_program_mpi(2, scratch.path(), {"run", "tight.yaml", "--output-dir", "np2", "--quiet"},
                      scratch.path() / "logs", "np2");
  ASSERT_EQ(one.exit_status, 0) << one.err;
  ASSERT_EQ(two.exit_status, 0) << two.err;
  const CellFields a = read_fields(scratch.path() / "np1" / "fields.pvts");
  const CellFields b = read_fields(scratch.path() / "np2" / "fields.pvts");
  ASSERT_EQ(a.velocity.size(), b.velocity.size());
  ASSERT_EQ(a.velocity.size(), size_t(n_cells) * n_cells);
  // Kinematic pressure in a closed cavity is fixed only up to a constant: compare deviations
  // from the mean, in units of the lid's dynamic pressure U^2.
  double mean_a = 0.0, mean_b = 0.0;
  for (size_t k = 0; k < a.pressure.size(); ++k) {
    mean_a += a.pressure[k] / double(a.pressure.size());
    mean_b += b.pressure[k] / double(b.pressure.size());
  }
  double max_du = 0.0, max_dp = 0.0;
  for (size_t k = 0; k < a.velocity.size(); ++k) {
    max_du = std::max({max_du, std::abs(a.velocity[k][0] - b.velocity[k][0]),
                       std::abs(a.velocity[k][1] - b.velocity[k][1])});
    max_dp = std::max(max_dp, std::abs((a.pressure[k] - mean_a) - (b.pressure[k] - mean_b)));
  }
  EXPECT_LE(max_du, 1e-6 * lid_speed);
  EXPECT_LE(max_dp, 1e-6 * lid_speed * lid_speed);
}

}  // namespace

// A turbulent run writes the model's fields, first-cell y+ and profiles. Run to the cap on the
// shipped SA channel case (500 iterations: outputs, not convergence, are checked here).
TEST(TurbulentRun, WritesModelFieldsWallYplusAndProfiles) {
  ScratchDirectory scratch("wallrans_cli_turbulent");
  const ProgramResult result =
      run_program_mpi(2, scratch.path(),
                      {"run", std::string(WALLRANS_SOURCE_DIR) + "/configs/channel_sa_re180.yaml",
                       "--output-dir", "out", "--max-iterations", "500", "--quiet"},
                      scratch.path() / "logs", "turbulent");
  ASSERT_EQ(result.exit_status, 3) << result.out << result.err;  // iteration cap
  const fs::path out = scratch.path() / "out";
  vtkNew<vtkXMLPStructuredGridReader> reader;
  reader->SetFileName((out / "fields.pvts").string().c_str());
  reader->Update();
  vtkCellData* cells = reader->GetOutput()->GetCellData();
  const auto nut = scalar_array(cells, "eddy_viscosity");
  const auto nu_tilde = scalar_array(cells, "nu_tilde");
  const auto distance = scalar_array(cells, "wall_distance");
  const auto yplus = scalar_array(cells, "y_plus");
  ASSERT_EQ(nut.size(), 4u * 128u);
  for (size_t k = 0; k < nut.size(); ++k) {
    // Channel walls at y = 0 and y = 2: the wall distance of a cell is at most 1 (the half-height).
    EXPECT_GT(distance[k], 0.0);
    EXPECT_LE(distance[k], 1.0);
    EXPECT_GE(nut[k], 0.0);
    EXPECT_GE(yplus[k], 0.0);
    EXPECT_TRUE(std::isfinite(nu_tilde[k]));
  }
  EXPECT_GT(*std::max_element(nut.begin(), nut.end()), 0.0);  // turbulent somewhere
  const auto history = wallrans::read_csv((out / "residuals.csv").string());
  EXPECT_GE(column_of(history, "nu_tilde_residual"), 0);
  const auto wall = wallrans::read_csv((out / "wall.csv").string(), {"side"});
  const int yp = column_of(wall, "first_cell_y_plus");
  EXPECT_EQ(wall.rows.size(), 8u);  // 4 faces on each of the two walls
  for (const auto& row : wall.rows) EXPECT_GT(row[yp], 0.0);
  EXPECT_GE(column_of(history, "turbulence_linear_its"), 0);
  const auto profile = wallrans::read_csv((out / "profile_x0.25.csv").string());
  EXPECT_EQ(profile.columns, (std::vector<std::string>{"x", "y", "wall_distance", "y_plus", "u_tangential",
                                                        "u_plus", "nut_over_nu", "wall_x", "wall_y", "u", "v",
                                                        "nu_tilde"}));
  // The bottom wall face, then the 128 cells of the column.
  ASSERT_EQ(profile.rows.size(), 129u);
  EXPECT_EQ(profile.rows[0][2], 0.0);   // wall distance of the wall row
  EXPECT_EQ(profile.rows[0][9], 0.0);   // u at the wall at rest
  EXPECT_EQ(profile.rows[0][11], 0.0);  // nu_tilde at the wall (Spalart & Allmaras 1994)
  const auto summary = nlohmann::json::parse(read_text(out / "summary.json"));
  EXPECT_TRUE(summary["residuals"].contains("nu_tilde")) << "the model's final residual";
  EXPECT_EQ(summary["turbulence_model"]["name"], "spalart_allmaras/negative");
}
