// Solid regions: which cells index ranges and coordinate boxes take, the checks on bad regions
// (one-line messages naming the case file and line), and the ghosted mask on periodic grids.
#include <gtest/gtest.h>
#include <mpi.h>

#include <string>

#include "core/error.hpp"
#include "grid/grid.hpp"
#include "grid/solid_cells.hpp"
#include "meshes/node_coordinates.hpp"

using namespace wallrans;

namespace {

constexpr int nx = 10, ny = 6;

// A uniform 10 x 6 grid on [0, 2] x [0, 1.2]: cell (i, j) has its centre at (0.2 i + 0.1, 0.2 j + 0.1).
CaseSpec channel_spec() {
  CaseSpec spec;
  spec.source_file = "solid.yaml";
  spec.grid.generator = GridGenerator::channel;
  spec.grid.cells_x = nx;
  spec.grid.cells_y = ny;
  spec.grid.length = 2.0;
  spec.grid.height = 1.2;
  return spec;
}

SolidRegionSpec indices(std::optional<std::array<int, 2>> i, std::optional<std::array<int, 2>> j, int line) {
  SolidRegionSpec region;
  region.i = i;
  region.j = j;
  region.line = line;
  return region;
}

SolidRegionSpec box(std::optional<std::array<double, 2>> x, std::optional<std::array<double, 2>> y,
                    int line) {
  SolidRegionSpec region;
  region.x = x;
  region.y = y;
  region.line = line;
  return region;
}

// The InputError message of building the solid cells of `spec`, or "" if there is none.
std::string error_of(const CaseSpec& spec) {
  try {
    SolidCells solid(spec, generate_nodes(spec.grid));
  } catch (const InputError& e) {
    return e.what();
  }
  return "";
}

}  // namespace

TEST(SolidCells, NoRegionsMeansNoSolidCell) {
  const CaseSpec spec = channel_spec();
  const SolidCells solid(spec, generate_nodes(spec.grid));
  EXPECT_FALSE(solid.any());
  EXPECT_EQ(solid.count(), 0);
  EXPECT_FALSE(solid.is_solid(0, 0));
}

TEST(SolidCells, IndexRangesAreInclusiveAndAnAbsentRangeSpansTheGrid) {
  CaseSpec spec = channel_spec();
  spec.solid_regions = {indices(std::array{2, 4}, std::array{0, 1}, 3),
                        indices(std::nullopt, std::array{5, 5}, 4)};
  const SolidCells solid(spec, generate_nodes(spec.grid));
  int count = 0;
  for (int j = 0; j < ny; ++j) {
    for (int i = 0; i < nx; ++i) {
      const bool in_first = i >= 2 && i <= 4 && j <= 1, in_second = j == 5;
      EXPECT_EQ(solid.is_solid(i, j), in_first || in_second) << i << ", " << j;
      EXPECT_EQ(solid.region(i, j), in_first ? 0 : in_second ? 1 : -1) << i << ", " << j;
      count += in_first || in_second;
    }
  }
  EXPECT_EQ(solid.count(), count);
  EXPECT_EQ(count, 3 * 2 + nx);
}

TEST(SolidCells, BoxesTakeTheCellsWhoseCentreLiesInside) {
  CaseSpec spec = channel_spec();
  // Centres x = 0.1, 0.3, ...: [0.25, 0.75] holds i = 1, 2, 3; y in [0, 0.35] holds j = 0, 1.
  // The second region overlaps the first: its cells keep the first region.
  spec.solid_regions = {box(std::array{0.25, 0.75}, std::array{0.0, 0.35}, 5),
                        box(std::array{0.6, 1.0}, std::array{0.0, 0.15}, 6)};
  const SolidCells solid(spec, generate_nodes(spec.grid));
  for (int j = 0; j < ny; ++j) {
    for (int i = 0; i < nx; ++i) {
      const int expected = (i >= 1 && i <= 3 && j <= 1) ? 0 : (i >= 3 && i <= 4 && j == 0) ? 1 : -1;
      EXPECT_EQ(solid.region(i, j), expected) << i << ", " << j;
    }
  }
  EXPECT_EQ(solid.count(), 7);
}

TEST(SolidCells, IndexAndCoordinateRangesCombine) {
  CaseSpec spec = channel_spec();
  SolidRegionSpec region = indices(std::array{0, 4}, std::nullopt, 2);
  region.y = std::array{0.0, 0.5};  // j = 0, 1, 2
  spec.solid_regions = {region};
  const SolidCells solid(spec, generate_nodes(spec.grid));
  EXPECT_EQ(solid.count(), 5 * 3);
  EXPECT_TRUE(solid.is_solid(4, 2));
  EXPECT_FALSE(solid.is_solid(5, 2));
  EXPECT_FALSE(solid.is_solid(4, 3));
}

TEST(SolidCells, ABoxHoldingNoCellCentreIsAnErrorAtItsLine) {
  CaseSpec spec = channel_spec();
  spec.solid_regions = {indices(std::array{0, 1}, std::array{0, 1}, 7),
                        box(std::array{3.0, 4.0}, std::nullopt, 9)};  // beyond the grid's x = 2
  const std::string message = error_of(spec);
  EXPECT_EQ(message.rfind("solid.yaml:9: key 'solid_regions[1]': expected a region holding at least one", 0),
            0u)
      << message;
  EXPECT_NE(message.find("x 0 to 2"), std::string::npos) << message;
  EXPECT_EQ(message.find('\n'), std::string::npos);
}

TEST(SolidCells, NoFluidLeftIsAnError) {
  CaseSpec spec = channel_spec();
  spec.solid_regions = {indices(std::nullopt, std::array{0, 2}, 4),
                        indices(std::nullopt, std::array{3, 5}, 5)};
  const std::string message = error_of(spec);
  EXPECT_EQ(message.rfind("solid.yaml:4: key 'solid_regions': expected at least one fluid cell", 0), 0u)
      << message;
}

TEST(SolidCells, FluidCutIntoTwoIsAnErrorUnlessThePeriodicSidesJoinIt) {
  CaseSpec spec = channel_spec();
  spec.solid_regions = {indices(std::array{4, 5}, std::nullopt, 6)};  // a full-height wall of cells
  const std::string message = error_of(spec);
  EXPECT_EQ(
      message.rfind("solid.yaml:6: key 'solid_regions': expected the fluid cells to form one region", 0), 0u)
      << message;
  EXPECT_NE(message.find("fluid cell (6, 0) cut off from cell (0, 0)"), std::string::npos) << message;
  spec.periodic.axis = PeriodicAxis::x;
  EXPECT_EQ(error_of(spec), "");
  // A pocket enclosed by solid cells is cut off on any grid.
  spec.solid_regions = {indices(std::array{1, 3}, std::array{1, 3}, 6)};
  spec.solid_regions.push_back(indices(std::array{1, 3}, std::array{1, 1}, 7));
  EXPECT_EQ(error_of(spec), "");
  spec.solid_regions = {
      indices(std::array{1, 3}, std::array{1, 1}, 6), indices(std::array{1, 3}, std::array{3, 3}, 7),
      indices(std::array{1, 1}, std::array{2, 2}, 8), indices(std::array{3, 3}, std::array{2, 2}, 9)};
  EXPECT_NE(error_of(spec).find("fluid cell (2, 2) cut off"), std::string::npos) << error_of(spec);
}

TEST(SolidCells, GhostedMaskWrapsAroundPeriodicSides) {
  CaseSpec spec = channel_spec();
  spec.periodic.axis = PeriodicAxis::x;
  spec.solid_regions = {indices(std::array{nx - 1, nx - 1}, std::array{0, 2}, 3),
                        indices(std::array{0, 0}, std::array{4, 5}, 4)};
  const NodeCoordinates nodes = generate_nodes(spec.grid);
  const SolidCells solid(spec, nodes);
  const Grid grid(MPI_COMM_WORLD, nodes, true);
  const auto mask = solid.ghosted_mask(grid);
  ASSERT_EQ(mask.size(), grid.n_ghosted());
  for (int j = grid.gy_begin(); j < grid.gy_end(); ++j) {
    for (int i = grid.gx_begin(); i < grid.gx_end(); ++i) {
      const int wrapped = (i + nx) % nx;
      EXPECT_EQ(mask[grid.local(i, j)] != 0, solid.is_solid(wrapped, j)) << i << ", " << j;
    }
  }
}
