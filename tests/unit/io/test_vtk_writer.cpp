// VTK output read back with VTK's own parallel reader (points, cell order, values, volumes, the
// node averages), the .pvd series read with VTK's XML parser, and the CSV writer/reader round trip.
#include <gtest/gtest.h>
#include <mpi.h>
#include <vtkCellData.h>
#include <vtkDataArray.h>
#include <vtkNew.h>
#include <vtkPointData.h>
#include <vtkPoints.h>
#include <vtkStructuredGrid.h>
#include <vtkXMLDataElement.h>
#include <vtkXMLDataParser.h>
#include <vtkXMLPStructuredGridReader.h>

#include <cmath>
#include <filesystem>
#include <fstream>
#include <random>
#include <string>

#include "core/error.hpp"
#include "grid/grid.hpp"
#include "io/csv_writer.hpp"
#include "io/vtk_writer.hpp"
#include "meshes/node_coordinates.hpp"

using namespace wallrans;
namespace fs = std::filesystem;

namespace {

constexpr int nx = 10, ny = 7;
constexpr double length = 2.0, height = 1.5;

GridSpec skewed_spec() {
  GridSpec spec;
  spec.generator = GridGenerator::skewed_box;
  spec.cells_x = nx;
  spec.cells_y = ny;
  spec.length = length;
  spec.height = height;
  spec.skew_amplitude = 0.05;
  return spec;
}

// Smooth, non-symmetric test functions, so a transposed or shifted cell order cannot pass.
double scalar_function(Vec2 p) { return std::sin(3.0 * p.x) + p.x * p.y * p.y; }
Vec2 vector_function(Vec2 p) { return {std::cos(2.0 * p.y) + p.x, p.x - 3.0 * p.y}; }

// Centroid of the quadrilateral a-b-c-d by splitting it into the triangles a-b-c and a-c-d
// (independent of the grid's own shoelace formula).
Vec2 quad_centroid(Vec2 a, Vec2 b, Vec2 c, Vec2 d) {
  const double a1 = 0.5 * cross(b - a, c - a), a2 = 0.5 * cross(c - a, d - a);
  return (1.0 / (3.0 * (a1 + a2))) * (a1 * (a + b + c) + a2 * (a + c + d));
}

// Collective: a fresh directory name chosen by rank 0 and shared, removed at the end of the test.
class ScratchDirectory {
 public:
  ScratchDirectory() {
    int rank = 0;
    MPI_Comm_rank(MPI_COMM_WORLD, &rank);
    std::string name;
    if (rank == 0) {
      std::random_device entropy;
      name = (fs::temp_directory_path() /
              ("wallrans_vtk_test_" + std::to_string(entropy()) + "_" + std::to_string(entropy())))
                 .string();
    }
    int size = static_cast<int>(name.size());
    MPI_Bcast(&size, 1, MPI_INT, 0, MPI_COMM_WORLD);
    name.resize(static_cast<size_t>(size));
    MPI_Bcast(name.data(), size, MPI_CHAR, 0, MPI_COMM_WORLD);
    path_ = name;
  }
  ScratchDirectory(const ScratchDirectory&) = delete;
  ScratchDirectory& operator=(const ScratchDirectory&) = delete;
  ~ScratchDirectory() {
    MPI_Barrier(MPI_COMM_WORLD);
    int rank = 0;
    MPI_Comm_rank(MPI_COMM_WORLD, &rank);
    std::error_code ignored;
    if (rank == 0) fs::remove_all(path_, ignored);
  }
  const fs::path& path() const { return path_; }

 private:
  fs::path path_;
};

int world_rank() {
  int rank = 0;
  MPI_Comm_rank(MPI_COMM_WORLD, &rank);
  return rank;
}

int world_size() {
  int size = 0;
  MPI_Comm_size(MPI_COMM_WORLD, &size);
  return size;
}

}  // namespace

TEST(VtkWriter, ParallelReaderReassemblesGridAndCellData) {
  const ScratchDirectory scratch;
  const NodeCoordinates nodes = generate_nodes(skewed_spec());
  Grid grid(MPI_COMM_WORLD, nodes, false);
  Field pressure(grid, -99.0);
  VectorField velocity(grid);
  for (int j = grid.y_begin(); j < grid.y_end(); ++j) {
    for (int i = grid.x_begin(); i < grid.x_end(); ++i) {
      pressure(i, j) = scalar_function(grid.centre(i, j));
      velocity.set(i, j, vector_function(grid.centre(i, j)));
    }
  }
  // A nested directory that does not exist yet: the writer has to create it.
  const std::string directory = (scratch.path() / "fields").string();
  const std::string index =
      write_vtk_fields(grid, {{"pressure", &pressure}}, {{"velocity", &velocity}}, directory, "flow");
  EXPECT_EQ(index, (fs::path(directory) / "flow.pvts").string());
  MPI_Barrier(MPI_COMM_WORLD);
  if (world_rank() != 0) return;

  // Only final names remain: one piece per rank, the index, no temporary files.
  int n_files = 0;
  for (const auto& entry : fs::directory_iterator(directory)) {
    ++n_files;
    EXPECT_EQ(entry.path().string().find(".tmp"), std::string::npos) << entry.path();
  }
  EXPECT_EQ(n_files, world_size() + 1);

  vtkNew<vtkXMLPStructuredGridReader> reader;
  reader->SetFileName(index.c_str());
  reader->Update();
  EXPECT_EQ(reader->GetNumberOfPieces(), world_size());
  vtkStructuredGrid* read = reader->GetOutput();
  ASSERT_NE(read, nullptr);
  int dims[3] = {0, 0, 0};
  read->GetDimensions(dims);
  EXPECT_EQ(dims[0], nx + 1);
  EXPECT_EQ(dims[1], ny + 1);
  EXPECT_EQ(dims[2], 1);
  ASSERT_EQ(read->GetNumberOfPoints(), (nx + 1) * (ny + 1));
  ASSERT_EQ(read->GetNumberOfCells(), nx * ny);

  // Points in VTK order (i fastest) must be the generator's nodes, in the z = 0 plane.
  for (int j = 0; j <= ny; ++j) {
    for (int i = 0; i <= nx; ++i) {
      double p[3];
      read->GetPoint(i + j * (nx + 1), p);
      EXPECT_DOUBLE_EQ(p[0], nodes.at(i, j).x) << "node " << i << ", " << j;
      EXPECT_DOUBLE_EQ(p[1], nodes.at(i, j).y) << "node " << i << ", " << j;
      EXPECT_EQ(p[2], 0.0);
    }
  }

  vtkCellData* cells = read->GetCellData();
  vtkDataArray* p_read = cells->GetArray("pressure");
  vtkDataArray* u_read = cells->GetArray("velocity");
  vtkDataArray* volume_read = cells->GetArray("cell_volume");
  vtkDataArray* index_read = cells->GetArray("cell_index");
  ASSERT_NE(p_read, nullptr);
  ASSERT_NE(u_read, nullptr);
  ASSERT_NE(volume_read, nullptr);
  ASSERT_NE(index_read, nullptr);
  EXPECT_EQ(p_read->GetNumberOfComponents(), 1);
  EXPECT_EQ(u_read->GetNumberOfComponents(), 3);
  EXPECT_EQ(index_read->GetNumberOfComponents(), 2);
  double area = 0.0;
  for (int j = 0; j < ny; ++j) {
    for (int i = 0; i < nx; ++i) {
      const vtkIdType cell = i + j * nx;
      auto point = [&](int a, int b) {
        double p[3];
        read->GetPoint(a + b * (nx + 1), p);
        return Vec2{p[0], p[1]};
      };
      const Vec2 centre = quad_centroid(point(i, j), point(i + 1, j), point(i + 1, j + 1), point(i, j + 1));
      // The grid computes its centroid by a different (shoelace) formula: agreement to rounding.
      EXPECT_NEAR(p_read->GetComponent(cell, 0), scalar_function(centre), 1e-12) << i << ", " << j;
      EXPECT_NEAR(u_read->GetComponent(cell, 0), vector_function(centre).x, 1e-12) << i << ", " << j;
      EXPECT_NEAR(u_read->GetComponent(cell, 1), vector_function(centre).y, 1e-12) << i << ", " << j;
      EXPECT_EQ(u_read->GetComponent(cell, 2), 0.0);
      EXPECT_EQ(index_read->GetComponent(cell, 0), i);
      EXPECT_EQ(index_read->GetComponent(cell, 1), j);
      EXPECT_GT(volume_read->GetComponent(cell, 0), 0.0);
      area += volume_read->GetComponent(cell, 0);
    }
  }
  // The skew displacement vanishes on the boundary, so the domain stays a length x height box.
  EXPECT_NEAR(area, length * height, 1e-12);
}

TEST(VtkWriter, RewriteReplacesFilesInPlace) {
  const ScratchDirectory scratch;
  Grid grid(MPI_COMM_WORLD, generate_nodes(skewed_spec()), false);
  Field value(grid, 1.0);
  const std::string directory = scratch.path().string();
  write_vtk_fields(grid, {{"value", &value}}, {}, directory, "state");
  for (int j = grid.y_begin(); j < grid.y_end(); ++j)
    for (int i = grid.x_begin(); i < grid.x_end(); ++i) value(i, j) = 2.0;
  const std::string index = write_vtk_fields(grid, {{"value", &value}}, {}, directory, "state");
  MPI_Barrier(MPI_COMM_WORLD);
  if (world_rank() != 0) return;
  vtkNew<vtkXMLPStructuredGridReader> reader;
  reader->SetFileName(index.c_str());
  reader->Update();
  vtkDataArray* read = reader->GetOutput()->GetCellData()->GetArray("value");
  ASSERT_NE(read, nullptr);
  ASSERT_EQ(read->GetNumberOfTuples(), nx * ny);
  for (vtkIdType cell = 0; cell < nx * ny; ++cell) EXPECT_EQ(read->GetComponent(cell, 0), 2.0);
}

TEST(VtkWriter, FailuresThrowOnEveryRank) {
  const ScratchDirectory scratch;
  Grid grid(MPI_COMM_WORLD, generate_nodes(skewed_spec()), false);
  Field value(grid, 1.0);
  // The output "directory" is an existing regular file: rank 0 fails to create it, and every rank
  // must throw instead of waiting for the others.
  const fs::path blocker = scratch.path() / "not_a_directory";
  if (world_rank() == 0) {
    fs::create_directories(scratch.path());
    std::ofstream(blocker) << "x\n";
  }
  MPI_Barrier(MPI_COMM_WORLD);
  EXPECT_THROW(write_vtk_fields(grid, {{"value", &value}}, {}, blocker.string(), "state"), Error);
  // Reserved and duplicate names would make the file ambiguous.
  EXPECT_THROW(write_vtk_fields(grid, {{"cell_volume", &value}}, {}, scratch.path().string(), "s"), Error);
  EXPECT_THROW(write_vtk_fields(grid, {{"v", &value}, {"v", &value}}, {}, scratch.path().string(), "s"),
               Error);
  EXPECT_THROW(write_vtk_fields(grid, {{"a<b", &value}}, {}, scratch.path().string(), "s"), Error);
}

TEST(Csv, RoundTripIsExact) {
  const ScratchDirectory scratch;
  if (world_rank() != 0) return;  // rank-0 output by design
  fs::create_directories(scratch.path());
  const std::string path = (scratch.path() / "residuals.csv").string();
  const std::vector<std::vector<double>> rows = {
      {1.0, 0.1, -2.5e-300}, {2.0, 1.0 / 3.0, 6.02214076e23}, {3.0, -0.0, std::nextafter(1.0, 2.0)}};
  {
    CsvWriter writer(path, {"iteration", "residual", "value"});
    for (const auto& row : rows) writer.row(row);
    EXPECT_THROW(writer.row({1.0, 2.0}), Error);
  }
  const CsvTable table = read_csv(path);
  EXPECT_EQ(table.columns, (std::vector<std::string>{"iteration", "residual", "value"}));
  ASSERT_EQ(table.rows.size(), rows.size());
  for (size_t r = 0; r < rows.size(); ++r)
    for (size_t c = 0; c < rows[r].size(); ++c) EXPECT_EQ(table.rows[r][c], rows[r][c]) << r << ", " << c;
}

TEST(Csv, MalformedRowNamesFileAndLine) {
  const ScratchDirectory scratch;
  if (world_rank() != 0) return;
  fs::create_directories(scratch.path());
  const std::string path = (scratch.path() / "bad.csv").string();
  std::ofstream(path) << "x,y\n1.0,2.0\n\n3.0,abc\n";
  try {
    read_csv(path);
    FAIL() << "expected InputError";
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find(path + ":4:"), std::string::npos) << e.what();
    EXPECT_NE(std::string(e.what()).find("'abc'"), std::string::npos) << e.what();
  }
  std::ofstream(path) << "x,y\n1.0,2.0,3.0\n";
  try {
    read_csv(path);
    FAIL() << "expected InputError";
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find(path + ":2: expected 2 fields, got 3"), std::string::npos)
        << e.what();
  }
  EXPECT_THROW(read_csv((scratch.path() / "missing.csv").string()), InputError);
  EXPECT_THROW(CsvWriter((scratch.path() / "no_dir" / "x.csv").string(), {"a"}), Error);
}

namespace {

// A linear field: the average of its cell values is its value at the average of the cell centres.
double linear_function(Vec2 p) { return 2.0 + 3.0 * p.x - 0.7 * p.y; }

// Collective. Writes `value` (the linear function at the cell centres) with the cells i < 3 and
// j < 2 excluded, reads the point data back on rank 0 and compares each node with the mean of the
// linear function over the centroids of the cells around it (computed here from the nodes read
// back): over the kept cells, or all cells where every neighbour is excluded.
void check_node_averages(bool periodic) {
  const ScratchDirectory scratch;
  const NodeCoordinates nodes = generate_nodes(skewed_spec());
  Grid grid(MPI_COMM_WORLD, nodes, periodic);
  Field value(grid, -99.0), excluded(grid, -99.0);
  VectorField velocity(grid);
  auto is_excluded = [](int i, int j) { return i < 3 && j < 2; };
  for (int j = grid.y_begin(); j < grid.y_end(); ++j) {
    for (int i = grid.x_begin(); i < grid.x_end(); ++i) {
      value(i, j) = linear_function(grid.centre(i, j));
      velocity.set(i, j, {value(i, j), -value(i, j)});
      excluded(i, j) = is_excluded(i, j) ? 1.0 : 0.0;
    }
  }
  const std::string index = write_vtk_fields(grid, {{"value", &value}}, {{"velocity", &velocity}},
                                             scratch.path().string(), "nodes", &excluded);
  MPI_Barrier(MPI_COMM_WORLD);
  if (world_rank() != 0) return;
  vtkNew<vtkXMLPStructuredGridReader> reader;
  reader->SetFileName(index.c_str());
  reader->Update();
  vtkStructuredGrid* read = reader->GetOutput();
  vtkDataArray* point_value = read->GetPointData()->GetArray("value");
  vtkDataArray* point_velocity = read->GetPointData()->GetArray("velocity");
  ASSERT_NE(point_value, nullptr);
  ASSERT_NE(point_velocity, nullptr);
  ASSERT_EQ(point_value->GetNumberOfTuples(), (nx + 1) * (ny + 1));
  EXPECT_EQ(point_velocity->GetNumberOfComponents(), 3);
  EXPECT_EQ(read->GetPointData()->GetArray("cell_volume"), nullptr) << "grid quantities are cell data only";
  auto centre = [&](int i, int j) {
    const int ii = (i + nx) % nx;  // a periodic neighbour is the cell at the other end
    auto node = [&](int a, int b) { return nodes.at(a, b); };
    return quad_centroid(node(ii, j), node(ii + 1, j), node(ii + 1, j + 1), node(ii, j + 1));
  };
  for (int j = 0; j <= ny; ++j) {
    for (int i = 0; i <= nx; ++i) {
      double kept = 0.0, all = 0.0;
      int n_kept = 0, n_all = 0;
      for (int cj = j - 1; cj <= j; ++cj) {
        for (int ci = i - 1; ci <= i; ++ci) {
          if (cj < 0 || cj >= ny || (!periodic && (ci < 0 || ci >= nx))) continue;
          const double f = linear_function(centre(ci, cj));
          all += f;
          ++n_all;
          if (!is_excluded((ci + nx) % nx, cj)) {
            kept += f;
            ++n_kept;
          }
        }
      }
      const double expected = n_kept > 0 ? kept / n_kept : all / n_all;
      const vtkIdType point = i + j * (nx + 1);
      // Centroids by two formulas (see above): agreement to rounding.
      EXPECT_NEAR(point_value->GetComponent(point, 0), expected, 1e-12) << "node " << i << ", " << j;
      EXPECT_NEAR(point_velocity->GetComponent(point, 0), expected, 1e-12) << "node " << i << ", " << j;
      EXPECT_NEAR(point_velocity->GetComponent(point, 1), -expected, 1e-12) << "node " << i << ", " << j;
      EXPECT_EQ(point_velocity->GetComponent(point, 2), 0.0);
    }
  }
}

}  // namespace

// On 4 ranks the pieces meet at an interior corner, whose node needs the diagonal neighbour cell.
TEST(VtkWriter, PointDataAreNodeAveragesOfTheCellValues) { check_node_averages(false); }

TEST(VtkWriter, PointDataWrapAroundAPeriodicDirection) { check_node_averages(true); }

TEST(VtkWriter, SeriesListsEachFileWithItsTime) {
  const ScratchDirectory scratch;
  Grid grid(MPI_COMM_WORLD, generate_nodes(skewed_spec()), false);
  Field value(grid, 1.0);
  const std::string directory = scratch.path().string();
  write_vtk_fields(grid, {{"value", &value}}, {}, directory, "fields_10");
  write_vtk_fields(grid, {{"value", &value}}, {}, directory, "fields_20");
  MPI_Barrier(MPI_COMM_WORLD);
  if (world_rank() != 0) return;
  const std::string series = (scratch.path() / "fields.pvd").string();
  write_vtk_series(series, {{10.0, "fields_10.pvts"}, {20.0, "fields_20.pvts"}});
  vtkNew<vtkXMLDataParser> parser;
  parser->SetFileName(series.c_str());
  ASSERT_EQ(parser->Parse(), 1) << "not well-formed XML";
  vtkXMLDataElement* root = parser->GetRootElement();
  ASSERT_NE(root, nullptr);
  EXPECT_STREQ(root->GetName(), "VTKFile");
  EXPECT_STREQ(root->GetAttribute("type"), "Collection");
  vtkXMLDataElement* collection = root->FindNestedElementWithName("Collection");
  ASSERT_NE(collection, nullptr);
  ASSERT_EQ(collection->GetNumberOfNestedElements(), 2);
  for (int k = 0; k < 2; ++k) {
    vtkXMLDataElement* entry = collection->GetNestedElement(k);
    EXPECT_STREQ(entry->GetName(), "DataSet");
    EXPECT_EQ(std::stod(entry->GetAttribute("timestep")), 10.0 * (k + 1));
    // Every listed file opens with VTK's reader.
    vtkNew<vtkXMLPStructuredGridReader> reader;
    reader->SetFileName((scratch.path() / entry->GetAttribute("file")).string().c_str());
    reader->Update();
    EXPECT_EQ(reader->GetOutput()->GetNumberOfCells(), nx * ny);
  }
  EXPECT_THROW(write_vtk_series(series, {{1.0, "a<b.pvts"}}), Error);
}

TEST(Csv, IntegerAndTextColumns) {
  const ScratchDirectory scratch;
  if (world_rank() != 0) return;
  fs::create_directories(scratch.path());
  const std::string path = (scratch.path() / "typed.csv").string();
  {
    CsvWriter writer(path, {{"iteration", CsvType::integer}, {"side", CsvType::text}, {"value"}});
    writer.mixed_row({3.0, std::string("bottom"), 0.25});
    writer.mixed_row({-12.0, std::string("top"), -1.5});
    EXPECT_THROW(writer.mixed_row({2.5, std::string("top"), 1.0}), Error) << "not a whole number";
    EXPECT_THROW(writer.mixed_row({2.0, std::string("a,b"), 1.0}), Error) << "a comma in a text";
    EXPECT_THROW(writer.mixed_row({2.0, 1.0, 1.0}), Error) << "a number in a text column";
    EXPECT_THROW(writer.row({2.0, 1.0, 1.0}), Error) << "numbers only for a table with a text column";
  }
  std::ifstream in(path);
  std::string header, first, second;
  std::getline(in, header);
  std::getline(in, first);
  std::getline(in, second);
  EXPECT_EQ(header, "iteration,side,value");
  EXPECT_EQ(first, "3,bottom,2.5000000000000000e-01");
  EXPECT_EQ(second, "-12,top,-1.5000000000000000e+00");
  EXPECT_THROW(read_csv(path), InputError) << "a text where a number is expected";
  const CsvTable table = read_csv(path, {"side"});
  ASSERT_EQ(table.rows.size(), 2u);
  EXPECT_EQ(table.rows[1][table.column("iteration")], -12.0);
  EXPECT_TRUE(std::isnan(table.rows[1][table.column("side")]));
  EXPECT_EQ(table.fields[1][table.column("side")], "top");
  EXPECT_THROW(table.column("missing"), InputError);
}
