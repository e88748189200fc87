// Grid files with parallel HDF5: written and read back bit for bit on any rank count, left-handed
// grids repaired, bad files refused with one line on every rank, and a case on a grid read from a
// file gives the same fields, bit for bit, as on the generated grid it was written from.
#include <gtest/gtest.h>
#include <mpi.h>
#include <unistd.h>

#include <algorithm>
#include <cstring>
#include <filesystem>
#include <string>

#include "core/error.hpp"
#include "coupling/flow_solver.hpp"
#include "grid/boundary.hpp"
#include "grid_file_samples.hpp"
#include "input_error_of.hpp"
#include "io/case_loader.hpp"
#include "io/grid_file.hpp"
#include "io/grid_file_case.hpp"
#include "io/rank_agreement.hpp"
#include "meshes/cell_orientation.hpp"
#include "models/model_factory.hpp"

using namespace wallrans;
using test_support::input_error_of;
namespace fs = std::filesystem;

namespace {

int rank_of(MPI_Comm comm) {
  int rank = 0;
  MPI_Comm_rank(comm, &rank);
  return rank;
}

// A scratch folder with the same name on every rank, made by rank 0 and removed at the end.
class SharedScratch {
 public:
  explicit SharedScratch(const std::string& name) {
    std::string path;
    if (rank_of(MPI_COMM_WORLD) == 0) {
      path = (fs::temp_directory_path() / ("wallrans_grid_file_" + name + "_" + std::to_string(::getpid())))
                 .string();
      fs::remove_all(path);
      fs::create_directories(path);
    }
    broadcast_text(MPI_COMM_WORLD, 0, path);
    path_ = path;
  }
  ~SharedScratch() {
    MPI_Barrier(MPI_COMM_WORLD);
    if (rank_of(MPI_COMM_WORLD) == 0) fs::remove_all(path_);
  }
  std::string file(const std::string& name) const { return (path_ / name).string(); }

 private:
  fs::path path_;
};

void expect_bit_identical(const NodeCoordinates& a, const NodeCoordinates& b) {
  ASSERT_EQ(a.cells_x, b.cells_x);
  ASSERT_EQ(a.cells_y, b.cells_y);
  ASSERT_EQ(a.nodes.size(), b.nodes.size());
  EXPECT_EQ(std::memcmp(a.nodes.data(), b.nodes.data(), a.nodes.size() * sizeof(Vec2)), 0);
}

// A case whose grid is `file`, with the given segments (YAML list entries).
CaseSpec file_case(const std::string& file, const std::string& segments, bool periodic = false) {
  return parse_case_text("flow: {kinematic_viscosity: 0.01}\ngrid: {file: " + file + "}\n" +
                             (periodic ? "periodic: {axis: x}\n" : "") + "boundaries:\n" + segments,
                         "/cases/file_case.yaml");
}

}  // namespace

TEST(GridFile, WrittenAndReadBackBitForBit) {
  const SharedScratch scratch("round_trip");
  const GridFileContent written = test_support::sample_grid();
  write_grid_file(MPI_COMM_WORLD, scratch.file("sample.h5"), written);
  const GridFileContent read = read_grid_file(MPI_COMM_WORLD, scratch.file("sample.h5"));
  expect_bit_identical(read.nodes, written.nodes);
  EXPECT_EQ(read.patches, written.patches);  // names, sides, ranges, kinds and their order
}

TEST(GridFile, GeneratedGridWithManyRowsReadsBackBitForBit) {
  // More node rows than ranks and not divisible by 2, so the bands of rows differ in size.
  GridSpec spec;
  spec.generator = GridGenerator::skewed_box;
  spec.cells_x = 9;
  spec.cells_y = 12;
  spec.skew_amplitude = 0.1;
  GridFileContent written{generate_nodes(spec), {}};
  const SharedScratch scratch("generated");
  write_grid_file(MPI_COMM_WORLD, scratch.file("box.h5"), written);
  const GridFileContent read = read_grid_file(MPI_COMM_WORLD, scratch.file("box.h5"));
  expect_bit_identical(read.nodes, written.nodes);
  EXPECT_TRUE(read.patches.empty());
}

TEST(GridFile, UnwritableLocationIsAnInputErrorOnEveryRank) {
  const std::string path = "/no_such_directory_for_wallrans/grid.h5";
  const std::string message =
      input_error_of([&] { write_grid_file(MPI_COMM_WORLD, path, test_support::sample_grid()); });
  EXPECT_EQ(message.rfind(path + ": expected a location where the grid file can be written, got ", 0), 0u)
      << message;
}

TEST(GridFile, LeftHandedGridIsReversedAndItsSegmentsFollow) {
  const SharedScratch scratch("left_handed");
  const GridFileContent right = test_support::sample_grid();
  // The same grid stored with j reversed: its cells are clockwise, "lid" lies on the bottom and
  // "floor_a"/"floor_b" on the top; faces along left and right count from the other end.
  GridFileContent left = right;
  left.nodes = reversed_j(right.nodes);
  for (GridPatch& patch : left.patches) {
    if (patch.side == Side::top) {
      patch.side = Side::bottom;
    } else if (patch.side == Side::bottom) {
      patch.side = Side::top;
    }
  }
  ASSERT_EQ(cell_handedness(left.nodes, "left"), Handedness::left);
  write_grid_file(MPI_COMM_WORLD, scratch.file("left.h5"), left);

  // Segments refer to the file as stored: its top side, and its left side faces 0..0 (the face at
  // stored j = 0, which is j = 3 once reversed).
  const CaseSpec spec = file_case(scratch.file("left.h5"),
                                  "  - {side: top, kind: wall}\n"
                                  "  - {patch: lid, kind: slip}\n"
                                  "  - {side: left, faces: [0, 0], kind: wall}\n"
                                  "  - {side: left, faces: [1, 3], kind: inflow, velocity: [1, 0]}\n"
                                  "  - {patch: outlet, kind: outflow}\n");
  const CaseGrid loaded = load_case_grid(MPI_COMM_WORLD, spec);
  expect_bit_identical(loaded.nodes, right.nodes);
  EXPECT_NE(loaded.note.find("left-handed"), std::string::npos) << loaded.note;
  ASSERT_EQ(loaded.segments.size(), 5u);
  EXPECT_EQ(loaded.segments[0].side, Side::bottom);
  EXPECT_FALSE(loaded.segments[0].faces.has_value());
  EXPECT_EQ(loaded.segments[1].side, Side::top);
  EXPECT_EQ(loaded.segments[1].faces, (std::array<int, 2>{0, 5}));
  EXPECT_EQ(loaded.segments[2].side, Side::left);
  EXPECT_EQ(loaded.segments[2].faces, (std::array<int, 2>{3, 3}));
  EXPECT_EQ(loaded.segments[3].faces, (std::array<int, 2>{0, 2}));
  EXPECT_EQ(loaded.segments[4].side, Side::right);
  EXPECT_EQ(loaded.segments[4].faces, (std::array<int, 2>{0, 3}));
  // The repaired grid and segments make a valid boundary map.
  CaseSpec resolved = spec;
  resolved.boundaries = loaded.segments;
  const BoundaryMap map(resolved, loaded.nodes);
  EXPECT_EQ(map.spec(map.faces()[3]).kind, BoundaryKind::wall);  // left, j = 3
}

TEST(GridFile, SegmentsNameOnlyPatchesOfTheFile) {
  const SharedScratch scratch("unknown_patch");
  write_grid_file(MPI_COMM_WORLD, scratch.file("sample.h5"), test_support::sample_grid());
  const CaseSpec spec =
      file_case(scratch.file("sample.h5"), "  - {side: top, kind: wall}\n  - {patch: inlt, kind: wall}\n");
  const std::string message = input_error_of([&] { load_case_grid(MPI_COMM_WORLD, spec); });
  EXPECT_EQ(message.rfind("/cases/file_case.yaml:5: key 'boundaries[1].patch': expected a patch of ", 0), 0u)
      << message;
  EXPECT_NE(message.find("(inlet, outlet, floor_a, floor_b, lid), got 'inlt'"), std::string::npos) << message;
}

TEST(GridFile, PeriodicFileGridNeedsTranslatedSides) {
  const SharedScratch scratch("periodic");
  GridSpec channel;
  channel.generator = GridGenerator::channel;
  channel.cells_x = 4;
  channel.cells_y = 6;
  GridFileContent content{generate_nodes(channel), {}};
  write_grid_file(MPI_COMM_WORLD, scratch.file("channel.h5"), content);
  const std::string segments = "  - {side: bottom, kind: wall}\n  - {side: top, kind: wall}\n";
  EXPECT_NO_THROW(load_case_grid(MPI_COMM_WORLD, file_case(scratch.file("channel.h5"), segments, true)));
  // The sample grid's right side is sheared against its left one (x grows with j there).
  write_grid_file(MPI_COMM_WORLD, scratch.file("sample.h5"), test_support::sample_grid());
  const std::string message = input_error_of(
      [&] { load_case_grid(MPI_COMM_WORLD, file_case(scratch.file("sample.h5"), segments, true)); });
  EXPECT_EQ(message.rfind(scratch.file("sample.h5") +
                              ": expected the right side to be the left side moved by one translation",
                          0),
            0u)
      << message;
}

class BadGridFile : public ::testing::TestWithParam<test_support::BadGridFile> {};

void PrintTo(const test_support::BadGridFile& bad, std::ostream* out) { *out << bad.name; }

TEST_P(BadGridFile, IsOneLineInputErrorOnEveryRank) {
  const test_support::BadGridFile& bad = GetParam();
  const SharedScratch scratch(bad.name);
  const std::string path = scratch.file(bad.name + ".h5");
  if (rank_of(MPI_COMM_WORLD) == 0) bad.write(path);
  MPI_Barrier(MPI_COMM_WORLD);
  const CaseSpec spec = file_case(path, "  - {side: top, kind: wall}\n");
  const std::string message = input_error_of([&] { load_case_grid(MPI_COMM_WORLD, spec); });
  SCOPED_TRACE(message);
  EXPECT_EQ(message.rfind(path + ": ", 0), 0u);
  EXPECT_NE(message.find("expected "), std::string::npos);
  EXPECT_NE(message.find(", got "), std::string::npos);
  EXPECT_EQ(message.find('\n'), std::string::npos);
  for (const std::string& mention : bad.mentions)
    EXPECT_NE(message.find(mention), std::string::npos) << mention;
  // Every rank got the same message.
  std::string on_root = message;
  broadcast_text(MPI_COMM_WORLD, 0, on_root);
  EXPECT_EQ(message, on_root);
}

INSTANTIATE_TEST_SUITE_P(GridFile, BadGridFile, ::testing::ValuesIn(test_support::bad_grid_files()),
                         [](const auto& info) { return info.param.name; });

TEST(GridFile, CasePatchesDescribeTheSegmentRuns) {
  const CaseSpec spec = parse_case_text(
      "flow: {kinematic_viscosity: 0.01}\n"
      "grid: {generator: channel, cells: [8, 4], length: 2.0}\n"
      "boundaries:\n"
      "  - {side: left, kind: inflow, velocity: [1, 0]}\n"
      "  - {side: right, kind: outflow}\n"
      "  - {side: bottom, kind: wall, to: 0.5}\n"
      "  - {side: bottom, kind: slip, from: 0.5, to: 1.5}\n"
      "  - {side: bottom, faces: [6, 7], kind: wall}\n"
      "  - {side: top, kind: wall}\n",
      "patches.yaml");
  const NodeCoordinates nodes = generate_nodes(spec.grid);
  const BoundaryMap map(spec, nodes);
  const std::vector<GridPatch> expected = {
      {"left_inflow", Side::left, 0, 3, "inflow"},   {"right_outflow", Side::right, 0, 3, "outflow"},
      {"bottom_wall", Side::bottom, 0, 1, "wall"},   {"bottom_slip", Side::bottom, 2, 5, "slip"},
      {"bottom_wall_2", Side::bottom, 6, 7, "wall"}, {"top_wall", Side::top, 0, 7, "wall"}};
  EXPECT_EQ(case_patches(map), expected);
}

// The Poiseuille channel (configs/channel_poiseuille.yaml, with wall clustering so the nodes are
// not round numbers), a few iterations on the generated grid and on the same grid written to a
// file and read back: the fields must agree bit for bit, since the solver sees the same nodes.
TEST(GridFile, CaseOnGridFromFileGivesBitIdenticalFields) {
  const SharedScratch scratch("poiseuille");
  CaseSpec generated = load_case_file(std::string(WALLRANS_SOURCE_DIR) + "/configs/channel_poiseuille.yaml");
  generated.grid.first_cell_height = 3.0e-3;
  generated.iterations.max = 8;
  const NodeCoordinates nodes = generate_nodes(generated.grid);
  {
    const Grid grid(MPI_COMM_WORLD, nodes, true);
    const BoundaryMap map(generated, grid.nodes());
    write_grid_file(MPI_COMM_WORLD, scratch.file("channel.h5"), {nodes, case_patches(map)});
  }
  CaseSpec from_file = generated;
  from_file.grid = GridSpec{};
  from_file.grid.file = scratch.file("channel.h5");
  from_file.boundaries[0].patch = "bottom_wall";
  from_file.boundaries[1].patch = "top_wall";

  auto run = [](const CaseSpec& spec, NodeCoordinates grid_nodes,
                const std::vector<BoundarySegmentSpec>& segments) {
    const Grid grid(MPI_COMM_WORLD, std::move(grid_nodes), true);
    CaseSpec resolved = spec;
    resolved.boundaries = segments;
    const BoundaryMap map(resolved, grid.nodes());
    auto model = make_turbulence_model(spec, grid, map);
    FlowSolver solver(spec, grid, map, *model);
    for (int k = 0; k < spec.iterations.max; ++k) solver.iterate();
    std::vector<double> values;
    for (int j = grid.y_begin(); j < grid.y_end(); ++j) {
      for (int i = grid.x_begin(); i < grid.x_end(); ++i) {
        values.insert(values.end(),
                      {solver.velocity().x(i, j), solver.velocity().y(i, j), solver.pressure()(i, j)});
      }
    }
    return values;
  };
  const std::vector<double> expected = run(generated, nodes, generated.boundaries);
  const CaseGrid loaded = load_case_grid(MPI_COMM_WORLD, from_file);
  const std::vector<double> found = run(from_file, loaded.nodes, loaded.segments);
  ASSERT_EQ(found.size(), expected.size());
  EXPECT_EQ(std::memcmp(found.data(), expected.data(), found.size() * sizeof(double)), 0);
  // The run moved away from the initial rest state, so the comparison is not of zeros.
  EXPECT_GT(*std::max_element(expected.begin(), expected.end()), 0.01);
}
