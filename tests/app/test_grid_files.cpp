// Grid files end to end with the real programs: `wallrans write-grid`, the converter
// `wallrans-cgns` and Debian's `cgnscheck`. A generated grid survives HDF5 -> CGNS -> HDF5 bit for
// bit, the CGNS file passes cgnscheck, the VTK view write-grid writes beside the grid file holds
// the same nodes and the solid cells (read back by VTK's reader), a run on the file grid equals the run on
// the generated grid bit for bit (1 and 2 ranks), a left-handed file is repaired with a note, and bad grid or
// CGNS files stop the programs with one line, exit status 2 and nothing written.
#include <cgnslib.h>
#include <gtest/gtest.h>
#include <vtkCellData.h>
#include <vtkDataArray.h>
#include <vtkNew.h>
#include <vtkPoints.h>
#include <vtkStructuredGrid.h>
#include <vtkXMLPStructuredGridReader.h>

#include <algorithm>
#include <array>
#include <cstring>
#include <filesystem>
#include <string>
#include <vector>

#include "../unit/io/grid_file_samples.hpp"
#include "io/grid_file_format.hpp"
#include "program_runner.hpp"

using namespace wallrans;
using namespace wallrans::test_support;
namespace fs = std::filesystem;

namespace {

constexpr int exit_bad_input = 2;
constexpr int exit_iteration_cap = 3;

// A channel with wall clustering (nodes that are not round numbers), inflow, outflow and a bottom
// wall split into a no-slip and a slip part. A few iterations only: the runs are compared, not
// converged.
const std::string generated_case =
    "title: grid_file_channel\n"
    "flow: {kinematic_viscosity: 0.01}\n"
    "grid: {generator: channel, cells: [12, 8], length: 2.0, height: 0.5, first_cell_height: 0.02}\n"
    "boundaries:\n"
    "  - {side: left, kind: inflow, velocity: [1.0, 0.0]}\n"
    "  - {side: right, kind: outflow}\n"
    "  - {side: bottom, kind: wall, to: 1.2}\n"
    "  - {side: bottom, kind: slip, from: 1.2}\n"
    "  - {side: top, kind: wall}\n"
    "iterations: {max: 6, report_every: 0}\n";

// The same case on the grid file `grid`: patches written by write-grid, and one segment by faces.
std::string file_case(const std::string& grid) {
  return "title: grid_file_channel\n"
         "flow: {kinematic_viscosity: 0.01}\n"
         "grid: {file: " +
         grid +
         "}\n"
         "boundaries:\n"
         "  - {patch: left_inflow, kind: inflow, velocity: [1.0, 0.0]}\n"
         "  - {patch: right_outflow, kind: outflow}\n"
         "  - {patch: bottom_wall, kind: wall}\n"
         "  - {side: bottom, faces: [7, 11], kind: slip}\n"
         "  - {patch: top_wall, kind: wall}\n"
         "iterations: {max: 6, report_every: 0}\n";
}

bool has_one_line(const std::string& text) {
  return !text.empty() && text.back() == '\n' && text.find('\n') == text.size() - 1;
}

void expect_same_grid(const GridFileContent& a, const GridFileContent& b) {
  ASSERT_EQ(a.nodes.cells_x, b.nodes.cells_x);
  ASSERT_EQ(a.nodes.cells_y, b.nodes.cells_y);
  ASSERT_EQ(a.nodes.nodes.size(), b.nodes.nodes.size());
  EXPECT_EQ(std::memcmp(a.nodes.nodes.data(), b.nodes.nodes.data(), a.nodes.nodes.size() * sizeof(Vec2)), 0);
  EXPECT_EQ(a.patches, b.patches);
}

ProgramResult convert(const fs::path& directory, const std::vector<std::string>& arguments,
                      const std::string& label) {
  return run_executable(WALLRANS_CGNS_PROGRAM, directory, arguments, directory / "logs", label);
}

// The generated channel written by write-grid, converted to CGNS and back: grid.h5, grid.cgns, back.h5.
void make_grid_files(const fs::path& directory) {
  write_text(directory / "generated.yaml", generated_case);
  const ProgramResult written =
      run_program(directory, {"write-grid", "generated.yaml", "grid.h5"}, directory / "logs", "write_grid");
  ASSERT_EQ(written.exit_status, 0) << written.err;
  EXPECT_NE(written.out.find("5 patches"), std::string::npos) << written.out;
  const ProgramResult to_cgns = convert(directory, {"to-cgns", "grid.h5", "grid.cgns"}, "to_cgns");
  ASSERT_EQ(to_cgns.exit_status, 0) << to_cgns.err;
  const ProgramResult back = convert(directory, {"from-cgns", "grid.cgns", "back.h5"}, "from_cgns");
  ASSERT_EQ(back.exit_status, 0) << back.err;
}

// The files a run leaves that depend on the solution only (not on time or file names).
std::vector<std::string> solution_files(const fs::path& directory) {
  std::vector<std::string> names;
  for (const auto& entry : fs::directory_iterator(directory)) {
    const std::string name = entry.path().filename().string();
    if (name.rfind("fields", 0) == 0 || name == "wall.csv") names.push_back(name);
  }
  std::sort(names.begin(), names.end());
  return names;
}

void expect_same_solution(const fs::path& a, const fs::path& b) {
  const auto names = solution_files(a);
  ASSERT_FALSE(names.empty());
  EXPECT_EQ(solution_files(b), names);
  for (const auto& name : names)
    EXPECT_TRUE(read_text(a / name) == read_text(b / name)) << name << " differs";
}

}  // namespace

TEST(GridFiles, CgnsPassesCgnscheckAndConvertsBackBitForBit) {
  const ScratchDirectory scratch("wallrans_grid_cgns");
  make_grid_files(scratch.path());
  ASSERT_FALSE(std::string(WALLRANS_CGNSCHECK).empty())
      << "cgnscheck not found (Debian package cgns-convert)";
  const ProgramResult check =
      run_executable(WALLRANS_CGNSCHECK, scratch.path(), {"grid.cgns"}, scratch.path() / "logs", "cgnscheck");
  EXPECT_EQ(check.exit_status, 0) << check.out << check.err;
  EXPECT_NE(check.out.find("checking complete"), std::string::npos) << check.out;
  EXPECT_EQ(check.out.find("WARNING"), std::string::npos) << check.out;
  EXPECT_EQ(check.out.find("ERROR"), std::string::npos) << check.out;

  const GridFileContent written = grid_file_format::read_file((scratch.path() / "grid.h5").string());
  const GridFileContent back = grid_file_format::read_file((scratch.path() / "back.h5").string());
  expect_same_grid(back, written);
  // The patches describe the case's segments: the bottom splits at x = 1.2, between the faces
  // centred at x = 13/12 (face 6) and 15/12 (face 7).
  const std::vector<GridPatch> expected = {{"left_inflow", Side::left, 0, 7, "inflow"},
                                           {"right_outflow", Side::right, 0, 7, "outflow"},
                                           {"bottom_wall", Side::bottom, 0, 6, "wall"},
                                           {"bottom_slip", Side::bottom, 7, 11, "slip"},
                                           {"top_wall", Side::top, 0, 11, "wall"}};
  EXPECT_EQ(back.patches, expected);
}

// write-grid on 2 ranks writes, beside the grid file, a VTK view of the same grid: VTK's own reader
// gets every node of grid.h5 and a `solid` array that marks exactly the cells of solid_regions.
TEST(GridFiles, WriteGridAlsoWritesAVtkViewWithTheSolidCells) {
  const ScratchDirectory scratch("wallrans_grid_vtk");
  const fs::path dir = scratch.path();
  write_text(dir / "solid.yaml", generated_case + "solid_regions:\n  - {i: [3, 5], j: [0, 2]}\n");
  fs::create_directories(dir / "view");
  const ProgramResult written =
      run_program_mpi(2, dir, {"write-grid", "solid.yaml", "view/grid.h5"}, dir / "logs", "write_grid");
  ASSERT_EQ(written.exit_status, 0) << written.out << written.err;
  EXPECT_NE(written.out.find("view/grid.pvts"), std::string::npos) << written.out;
  for (const char* piece : {"grid.pvts", "grid_0.vts", "grid_1.vts"})
    EXPECT_TRUE(fs::exists(dir / "view" / piece)) << piece;

  const GridFileContent content = grid_file_format::read_file((dir / "view" / "grid.h5").string());
  vtkNew<vtkXMLPStructuredGridReader> reader;
  reader->SetFileName((dir / "view" / "grid.pvts").c_str());
  reader->Update();
  vtkStructuredGrid* view = reader->GetOutput();
  const int nx = content.nodes.cells_x, ny = content.nodes.cells_y;
  ASSERT_EQ(view->GetNumberOfCells(), nx * ny);
  ASSERT_EQ(view->GetNumberOfPoints(), static_cast<vtkIdType>(content.nodes.nodes.size()));
  int dims[3];
  view->GetDimensions(dims);
  ASSERT_EQ(dims[0], nx + 1);
  // Both index nodes i-fastest; the view's points are float64, so they are the grid file's nodes.
  double worst = 0.0;
  for (vtkIdType n = 0; n < view->GetNumberOfPoints(); ++n) {
    double p[3];
    view->GetPoint(n, p);
    worst = std::max(
        {worst, std::abs(p[0] - content.nodes.nodes[n].x), std::abs(p[1] - content.nodes.nodes[n].y)});
  }
  EXPECT_EQ(worst, 0.0);
  vtkDataArray* solid = view->GetCellData()->GetArray("solid");
  ASSERT_NE(solid, nullptr);
  int solid_cells = 0;
  for (int j = 0; j < ny; ++j)
    for (int i = 0; i < nx; ++i) {
      const bool expected = i >= 3 && i <= 5 && j <= 2;
      const double value = solid->GetComponent(static_cast<vtkIdType>(j) * nx + i, 0);
      EXPECT_EQ(value, expected ? 1.0 : 0.0) << "cell " << i << ", " << j;
      solid_cells += value == 1.0;
    }
  EXPECT_EQ(solid_cells, 9);
  EXPECT_NE(view->GetCellData()->GetArray("cell_volume"), nullptr);
}

class RunOnFileGrid : public ::testing::TestWithParam<int> {};

TEST_P(RunOnFileGrid, GivesTheFieldsOfTheGeneratedGridBitForBit) {
  const int ranks = GetParam();
  const ScratchDirectory scratch("wallrans_grid_run_np" + std::to_string(ranks));
  const fs::path dir = scratch.path();
  make_grid_files(dir);
  write_text(dir / "from_file.yaml", file_case("back.h5"));
  auto run = [&](const std::string& case_file, const std::string& output) {
    return run_program_mpi(ranks, dir, {"run", case_file, "--output-dir", output}, dir / "logs", output);
  };
  const ProgramResult generated = run("generated.yaml", "out_generated");
  const ProgramResult from_file = run("from_file.yaml", "out_file");
  EXPECT_EQ(generated.exit_status, exit_iteration_cap) << generated.err;
  EXPECT_EQ(from_file.exit_status, exit_iteration_cap) << from_file.err;
  // Loading a grid file prints its quality report, with the first-cell height of each wall.
  EXPECT_NE(from_file.out.find("grid quality: min cell area"), std::string::npos) << from_file.out;
  EXPECT_NE(
      from_file.out.find("first-cell height on wall boundaries[2] (patch 'bottom_wall', 7 faces): 2.000e-02"),
      std::string::npos)
      << from_file.out;
  expect_same_solution(dir / "out_generated", dir / "out_file");
}

INSTANTIATE_TEST_SUITE_P(GridFiles, RunOnFileGrid, ::testing::Values(1, 2),
                         [](const auto& info) { return "np" + std::to_string(info.param); });

TEST(GridFiles, LeftHandedFileIsReversedWithANoteAndRunsAsTheRightHandedOne) {
  const ScratchDirectory scratch("wallrans_grid_left");
  const fs::path dir = scratch.path();
  const GridFileContent right = sample_grid();
  // The same grid stored with j reversed: clockwise cells, bottom and top patches swapped.
  GridFileContent left = right;
  for (int j = 0; j <= right.nodes.cells_y; ++j) {
    for (int i = 0; i <= right.nodes.cells_x; ++i)
      left.nodes.at(i, j) = right.nodes.at(i, right.nodes.cells_y - j);
  }
  for (GridPatch& patch : left.patches) {
    if (patch.side == Side::bottom || patch.side == Side::top)
      patch.side = patch.side == Side::bottom ? Side::top : Side::bottom;
  }
  grid_file_format::write_file((dir / "right.h5").string(), right);
  grid_file_format::write_file((dir / "left.h5").string(), left);
  auto case_on = [](const std::string& grid) {
    return "flow: {kinematic_viscosity: 0.01}\ngrid: {file: " + grid +
           "}\nboundaries:\n"
           "  - {patch: inlet, kind: inflow, velocity: [1.0, 0.0]}\n"
           "  - {patch: outlet, kind: outflow}\n"
           "  - {patch: floor_a, kind: wall}\n"
           "  - {patch: floor_b, kind: wall}\n"
           "  - {patch: lid, kind: slip}\n"
           "iterations: {max: 4, report_every: 0}\n";
  };
  write_text(dir / "right.yaml", case_on("right.h5"));
  write_text(dir / "left.yaml", case_on("left.h5"));

  const ProgramResult check = run_program(dir, {"check", "left.yaml"}, dir / "logs", "check_left");
  EXPECT_EQ(check.exit_status, 0) << check.err;
  EXPECT_NE(check.out.find("note: "), std::string::npos) << check.out;
  EXPECT_NE(check.out.find("left-handed grid"), std::string::npos) << check.out;
  EXPECT_NE(check.out.find("first-cell height on wall boundaries[2] (patch 'floor_a'"), std::string::npos)
      << check.out;

  const ProgramResult on_right =
      run_program(dir, {"run", "right.yaml", "--output-dir", "out_right"}, dir / "logs", "right");
  const ProgramResult on_left =
      run_program(dir, {"run", "left.yaml", "--output-dir", "out_left"}, dir / "logs", "left");
  EXPECT_EQ(on_right.exit_status, exit_iteration_cap) << on_right.err;
  EXPECT_EQ(on_left.exit_status, exit_iteration_cap) << on_left.err;
  EXPECT_NE(on_left.out.find("wallrans: note: "), std::string::npos) << on_left.out;
  expect_same_solution(dir / "out_right", dir / "out_left");
}

class BadGridFileRun : public ::testing::TestWithParam<BadGridFile> {};

void PrintTo(const BadGridFile& bad, std::ostream* out) { *out << bad.name; }

TEST_P(BadGridFileRun, ExitsTwoWithOneLineAndWritesNothing) {
  const BadGridFile& bad = GetParam();
  const ScratchDirectory scratch("wallrans_grid_bad_" + bad.name);
  const fs::path dir = scratch.path() / "run";
  fs::create_directories(dir);
  bad.write((dir / "grid.h5").string());
  write_text(
      dir / "case.yaml",
      "flow: {kinematic_viscosity: 0.01}\ngrid: {file: grid.h5}\nboundaries:\n  - {side: top, kind: wall}\n");
  const auto before = snapshot(dir);
  const ProgramResult result =
      run_program(dir, {"run", "case.yaml", "--output-dir", "out"}, scratch.path() / "logs", bad.name);
  EXPECT_EQ(result.exit_status, exit_bad_input);
  EXPECT_EQ(result.out, "");
  ASSERT_TRUE(has_one_line(result.err)) << result.err;
  // The case file and the line of its grid section, then the grid file and what was wrong.
  EXPECT_EQ(result.err.rfind("wallrans: error: case.yaml:2: " + (dir / "grid.h5").string() + ": ", 0), 0u)
      << result.err;
  EXPECT_NE(result.err.find("expected"), std::string::npos) << result.err;
  for (const auto& mention : bad.mentions) EXPECT_NE(result.err.find(mention), std::string::npos) << mention;
  EXPECT_EQ(snapshot(dir), before) << "the failed run wrote or changed files";
}

INSTANTIATE_TEST_SUITE_P(GridFiles, BadGridFileRun, ::testing::ValuesIn(bad_grid_files()),
                         [](const auto& info) { return info.param.name; });

// Bad CGNS input to the converter. Each file is made here with the CGNS library itself.
struct BadCgns {
  std::string name;
  int cell_dimension = 2;
  int zones = 1;
  bool unstructured = false;
  std::vector<const char*> coordinates = {"CoordinateX", "CoordinateY"};
  bool point_list = false;
  std::array<cgsize_t, 4> bc_range = {1, 1, 4, 1};  // bottom, vertices 1..4
  std::vector<std::string> mentions;
};

void PrintTo(const BadCgns& bad, std::ostream* out) { *out << bad.name; }

// A 4 x 3 vertex zone (or a 4 x 3 x 2 one for cell dimension 3) with the given defects.
void write_cgns(const std::string& path, const BadCgns& bad) {
  int file = 0, base = 0, zone = 0, coordinate = 0, bc = 0;
  ASSERT_EQ(cg_open(path.c_str(), CG_MODE_WRITE, &file), CG_OK) << cg_get_error();
  ASSERT_EQ(cg_base_write(file, "b", bad.cell_dimension, 3, &base), CG_OK) << cg_get_error();
  const int n = bad.cell_dimension == 3 ? 24 : 12;
  std::vector<double> values(n);
  for (int k = 0; k < n; ++k) values[k] = 0.1 * k + 0.01 * k * k;
  for (int z = 1; z <= bad.zones; ++z) {
    const std::string name = "zone" + std::to_string(z);
    if (bad.unstructured) {
      const cgsize_t size[3] = {12, 6, 0};
      ASSERT_EQ(cg_zone_write(file, base, name.c_str(), size, CGNS_ENUMV(Unstructured), &zone), CG_OK);
    } else if (bad.cell_dimension == 3) {
      const cgsize_t size[9] = {4, 3, 2, 3, 2, 1, 0, 0, 0};
      ASSERT_EQ(cg_zone_write(file, base, name.c_str(), size, CGNS_ENUMV(Structured), &zone), CG_OK);
    } else {
      const cgsize_t size[6] = {4, 3, 3, 2, 0, 0};
      ASSERT_EQ(cg_zone_write(file, base, name.c_str(), size, CGNS_ENUMV(Structured), &zone), CG_OK);
    }
    for (const char* coordinate_name : bad.coordinates) {
      ASSERT_EQ(cg_coord_write(file, base, zone, CGNS_ENUMV(RealDouble), coordinate_name, values.data(),
                               &coordinate),
                CG_OK);
    }
    if (bad.cell_dimension == 2 && !bad.unstructured) {
      if (bad.point_list) {
        const cgsize_t points[4] = {1, 1, 2, 1};
        ASSERT_EQ(cg_boco_write(file, base, zone, "floor", CGNS_ENUMV(BCWall), CGNS_ENUMV(PointList), 2,
                                points, &bc),
                  CG_OK);
      } else {
        ASSERT_EQ(cg_boco_write(file, base, zone, "floor", CGNS_ENUMV(BCWall), CGNS_ENUMV(PointRange), 2,
                                bad.bc_range.data(), &bc),
                  CG_OK);
      }
    }
  }
  ASSERT_EQ(cg_close(file), CG_OK);
}

class BadCgnsInput : public ::testing::TestWithParam<BadCgns> {};

TEST_P(BadCgnsInput, ConverterExitsTwoWithOneLineAndWritesNothing) {
  const BadCgns& bad = GetParam();
  const ScratchDirectory scratch("wallrans_cgns_bad_" + bad.name);
  const fs::path dir = scratch.path() / "work";
  fs::create_directories(dir);
  if (bad.name == "not_cgns") {
    write_text(dir / "in.cgns", "this is not a CGNS file\n");
  } else if (bad.name != "missing_file") {
    write_cgns((dir / "in.cgns").string(), bad);
  }
  const auto before = snapshot(dir);
  const ProgramResult result = run_executable(WALLRANS_CGNS_PROGRAM, dir, {"from-cgns", "in.cgns", "out.h5"},
                                              scratch.path() / "logs", bad.name);
  EXPECT_EQ(result.exit_status, exit_bad_input);
  EXPECT_EQ(result.out, "");
  ASSERT_TRUE(has_one_line(result.err)) << result.err;
  EXPECT_EQ(result.err.rfind("wallrans-cgns: error: in.cgns: ", 0), 0u) << result.err;
  EXPECT_NE(result.err.find("expected"), std::string::npos) << result.err;
  for (const auto& mention : bad.mentions) EXPECT_NE(result.err.find(mention), std::string::npos) << mention;
  EXPECT_EQ(snapshot(dir), before) << "the converter wrote or changed files";
}

BadCgns bad_cgns(const std::string& name, std::vector<std::string> mentions) {
  BadCgns bad;
  bad.name = name;
  bad.mentions = std::move(mentions);
  return bad;
}

std::vector<BadCgns> bad_cgns_files() {
  std::vector<BadCgns> cases;
  cases.push_back(bad_cgns("missing_file", {"readable CGNS file", "no such file"}));
  cases.push_back(bad_cgns("not_cgns", {"readable CGNS file", "cannot open"}));
  BadCgns three_d = bad_cgns("three_dimensional", {"2-D structured zone", "cell dimension 3"});
  three_d.cell_dimension = 3;
  three_d.coordinates = {"CoordinateX", "CoordinateY", "CoordinateZ"};
  cases.push_back(three_d);
  BadCgns unstructured =
      bad_cgns("unstructured_zone", {"zone 'zone1'", "2-D structured zone", "Unstructured"});
  unstructured.unstructured = true;
  cases.push_back(unstructured);
  BadCgns two = bad_cgns("two_zones", {"a single zone, got 2"});
  two.zones = 2;
  cases.push_back(two);
  BadCgns no_y = bad_cgns("missing_coordinate_y", {"CoordinateX and CoordinateY, got CoordinateX"});
  no_y.coordinates = {"CoordinateX"};
  cases.push_back(no_y);
  BadCgns curved = bad_cgns("non_planar", {"CoordinateZ constant"});
  curved.coordinates = {"CoordinateX", "CoordinateY", "CoordinateZ"};
  cases.push_back(curved);
  BadCgns list = bad_cgns("point_list_bc", {"BC 'floor'", "PointRange", "PointList"});
  list.point_list = true;
  cases.push_back(list);
  BadCgns interior = bad_cgns("bc_off_the_sides", {"BC 'floor'", "along one side", "(2, 2) to (3, 2)"});
  interior.bc_range = {2, 2, 3, 2};
  cases.push_back(interior);
  return cases;
}

INSTANTIATE_TEST_SUITE_P(GridFiles, BadCgnsInput, ::testing::ValuesIn(bad_cgns_files()),
                         [](const auto& info) { return info.param.name; });

TEST(GridFiles, ConverterRefusesABadGridFileAndWritesNoCgns) {
  const ScratchDirectory scratch("wallrans_cgns_bad_h5");
  const fs::path dir = scratch.path() / "work";
  fs::create_directories(dir);
  write_text(dir / "grid.h5", "not HDF5\n");
  const auto before = snapshot(dir);
  const ProgramResult result = run_executable(WALLRANS_CGNS_PROGRAM, dir, {"to-cgns", "grid.h5", "grid.cgns"},
                                              scratch.path() / "logs", "to_cgns_bad");
  EXPECT_EQ(result.exit_status, exit_bad_input);
  ASSERT_TRUE(has_one_line(result.err)) << result.err;
  EXPECT_EQ(result.err.rfind("wallrans-cgns: error: grid.h5: expected a wallrans grid file", 0), 0u)
      << result.err;
  EXPECT_EQ(snapshot(dir), before);
}
