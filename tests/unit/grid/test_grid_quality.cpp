// Grid-quality figures against their definitions on grids whose figures are known in closed form:
// a uniform channel and a channel clustered geometrically at both walls.
#include <gtest/gtest.h>

#include <cmath>
#include <string>

#include "grid/grid_quality.hpp"

using namespace wallrans;

namespace {

CaseSpec channel_case(int cells_x, int cells_y, double length, std::optional<double> first_cell_height) {
  CaseSpec spec;
  spec.grid.generator = GridGenerator::channel;
  spec.grid.cells_x = cells_x;
  spec.grid.cells_y = cells_y;
  spec.grid.length = length;
  spec.grid.height = 1.0;
  spec.grid.first_cell_height = first_cell_height;
  BoundarySegmentSpec segment;
  for (Side side : {Side::left, Side::right, Side::bottom, Side::top}) {
    segment.side = side;
    segment.kind = side == Side::left    ? BoundaryKind::inflow
                   : side == Side::right ? BoundaryKind::outflow
                                         : BoundaryKind::wall;
    spec.boundaries.push_back(segment);
  }
  return spec;
}

// Rounding of a handful of operations on numbers of order one (double precision).
constexpr double rounding = 1e-12;

}  // namespace

TEST(GridQuality, UniformChannelHasItsExactFigures) {
  const CaseSpec spec = channel_case(8, 4, 4.0, std::nullopt);
  const Grid grid(MPI_COMM_WORLD, generate_nodes(spec.grid), false);
  const BoundaryMap map(spec, grid.nodes());
  const GridQuality q = measure_quality(grid, map);
  // Cells 0.5 m x 0.25 m: area 0.125 m^2, aspect ratio 2, orthogonal, no expansion.
  EXPECT_NEAR(q.min_volume, 0.125, rounding);
  EXPECT_NEAR(q.max_aspect_ratio, 2.0, rounding);
  EXPECT_NEAR(q.max_non_orthogonality, 0.0, 1e-6);  // acos near 1 loses half the digits: sqrt(1e-12)
  EXPECT_NEAR(q.max_expansion_ratio, 1.0, rounding);
  ASSERT_EQ(q.walls.size(), 2u);  // bottom and top, not the inflow and outflow
  for (const WallSpacing& wall : q.walls) {
    EXPECT_EQ(wall.n_faces, 8);
    EXPECT_NEAR(wall.min_height, 0.25, rounding);
    EXPECT_NEAR(wall.max_height, 0.25, rounding);
  }
  EXPECT_EQ(q.walls[0].segment, 2);
  EXPECT_EQ(q.walls[1].segment, 3);
}

TEST(GridQuality, ClusteredChannelReportsFirstCellHeightAndGrowthRatio) {
  const double h = 0.01;
  const int n = 16;  // cells across the channel, 8 per half
  const CaseSpec spec = channel_case(4, n, 1.0, h);
  const Grid grid(MPI_COMM_WORLD, generate_nodes(spec.grid), false);
  const BoundaryMap map(spec, grid.nodes());
  const GridQuality q = measure_quality(grid, map);
  ASSERT_EQ(q.walls.size(), 2u);
  for (const WallSpacing& wall : q.walls) {
    EXPECT_NEAR(wall.min_height, h, rounding);
    EXPECT_NEAR(wall.max_height, h, rounding);
  }
  // Each half is a geometric series from h with ratio r: h (r^8 - 1) / (r - 1) = H / 2. The
  // largest expansion ratio must be that r. Widths carry rounding of about 1e-16 H, so the ratio
  // is good to about 1e-16 / h = 1e-14; the series changes by about 8 H / 2 per unit of r, so its
  // residual stays below 1e-12 H.
  const double r = q.max_expansion_ratio;
  EXPECT_GT(r, 1.0);
  EXPECT_NEAR(h * (std::pow(r, n / 2) - 1.0) / (r - 1.0), 0.5, 1e-12);
  const std::string report = quality_report(q, map);
  EXPECT_NE(
      report.find("first-cell height on wall boundaries[2] (side bottom, 4 faces): 1.000e-02 to 1.000e-02 m"),
      std::string::npos)
      << report;
  EXPECT_NE(report.find("max expansion ratio"), std::string::npos) << report;
}
