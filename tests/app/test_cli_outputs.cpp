// The files a real `wallrans run` leaves behind, read with independent readers (VTK's own parallel
// reader, the CSV reader): a small lid-driven cavity at Re = U_lid L / nu = 100 on 2 ranks.
// Every assertion follows from the case definition or from the physics of this flow, never
// from numbers the program produced in an earlier run.
#include <gtest/gtest.h>
#include <vtkCellData.h>
#include <vtkDataArray.h>
#include <vtkNew.h>
#include <vtkStructuredGrid.h>
#include <vtkXMLPStructuredGridReader.h>

#include <algorithm>
#include <array>
#include <cmath>
#include <filesystem>
#include <memory>
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
  for (const char* name : {"case.resolved.yaml", "residuals.csv", "fields.pvts", "fields_0.vts", "fields_1.vts",
                           "wall.csv", "summary.json"}) {
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
}

TEST_F(CavityRun, HistoryRecordsEveryIterationUntilConvergence) {
  const wallrans::CsvTable history = wallrans::read_csv((output() / "residuals.csv").string());
  ASSERT_GE(history.columns.size(), 4u);
  EXPECT_EQ(std::vector<std::string>(history.columns.begin(), history.columns.begin() + 4),
            (std::vector<std::string>{"iteration", "u_residual", "v_residual", "continuity_residual"}));
  ASSERT_FALSE(history.rows.empty());
  for (size_t r = 0; r < history.rows.size(); ++r)
    EXPECT_EQ(history.rows[r][0], double(r + 1)) << "row " << r;
  // The run stops at the first iteration where every normalised residual is below residual_drop.
  auto all_below = [](const std::vector<double>& row) {
    return row[1] < residual_drop && row[2] < residual_drop && row[3] < residual_drop;
  };
  EXPECT_TRUE(all_below(history.rows.back()));
  for (size_t r = 0; r + 1 < history.rows.size(); ++r)
    EXPECT_FALSE(all_below(history.rows[r])) << "row " << r;

  const std::string summary = read_text(output() / "summary.json");
  EXPECT_TRUE(contains(summary, "\"converged\": true")) << summary;
  EXPECT_TRUE(contains(summary, "\"iterations\": " + std::to_string(history.rows.size()) + ",")) << summary;
  EXPECT_TRUE(contains(summary, "\"ranks\": 2,")) << summary;
}

TEST_F(CavityRun, WallDataCoversAllFourWalls) {
  const wallrans::CsvTable wall = wallrans::read_csv((output() / "wall.csv").string());
  EXPECT_EQ(wall.columns, (std::vector<std::string>{"x", "y", "cf", "cp", "wall_shear_stress",
                                                    "first_cell_distance", "first_cell_y_plus"}));
  ASSERT_EQ(wall.rows.size(), 4u * n_cells);
  const int x = column_of(wall, "x"), y = column_of(wall, "y"), cf = column_of(wall, "cf");
  const int distance = column_of(wall, "first_cell_distance");
  int n_lid = 0, n_bottom = 0;
  double max_cf_lid = 0.0, max_cf_bottom = 0.0;
  for (const auto& row : wall.rows) {
    for (double value : row) EXPECT_TRUE(std::isfinite(value));
    // Uniform cells: the wall-to-centre distance is half a cell.
    EXPECT_NEAR(row[distance], 0.5 / n_cells, 1e-12);
    const bool on_side = std::abs(row[x]) < 1e-12 || std::abs(row[x] - 1.0) < 1e-12;
    if (std::abs(row[y] - 1.0) < 1e-12 && !on_side) {
      ++n_lid;
      max_cf_lid = std::max(max_cf_lid, std::abs(row[cf]));
    } else if (std::abs(row[y]) < 1e-12 && !on_side) {
      ++n_bottom;
      max_cf_bottom = std::max(max_cf_bottom, std::abs(row[cf]));
    } else {
      EXPECT_TRUE(on_side) << "a wall row off the walls: " << row[x] << ", " << row[y];
    }
  }
  EXPECT_EQ(n_lid, n_cells);
  EXPECT_EQ(n_bottom, n_cells);
  // The lid drives the flow; the fluid along the bottom moves far slower than the lid, so the
  // bottom wall's friction is smaller than the lid's.
  EXPECT_GT(max_cf_lid, 0.0);
  EXPECT_LT(max_cf_bottom, max_cf_lid);
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
  const auto wall = wallrans::read_csv((out / "wall.csv").string());
  const int yp = column_of(wall, "first_cell_y_plus");
  EXPECT_EQ(wall.rows.size(), 8u);  // 4 faces on each of the two walls
  for (const auto& row : wall.rows) EXPECT_GT(row[yp], 0.0);
  const auto profile = wallrans::read_csv((out / "profile_0.csv").string());
  EXPECT_EQ(profile.columns, (std::vector<std::string>{"x", "y", "wall_distance", "y_plus", "u_tangential",
                                                       "u_plus", "nut_over_nu", "u", "v", "nu_tilde"}));
  // The bottom wall face, then the 128 cells of the column.
  ASSERT_EQ(profile.rows.size(), 129u);
  EXPECT_EQ(profile.rows[0][2], 0.0);  // wall distance of the wall row
  EXPECT_EQ(profile.rows[0][7], 0.0);  // u at the wall at rest
  EXPECT_EQ(profile.rows[0][9], 0.0);  // nu_tilde at the wall (Spalart & Allmaras 1994)
}
