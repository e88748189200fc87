// Nested start: the coarser grids are made of every other grid line of the case's grid, and the
// interpolation to the finer grid reproduces linear fields exactly (a linear reconstruction from
// the cell centre with the exact gradient is exact, and the limiter leaves values inside the
// range of the neighbours untouched) and adds no new extrema inside the domain.
#include <gtest/gtest.h>

#include <algorithm>

#include "coupling/nested_start.hpp"
#include "meshes/node_coordinates.hpp"

using namespace wallrans;

namespace {

GridSpec plate_spec() {
  GridSpec spec;
  spec.generator = GridGenerator::plate;
  spec.cells_x = 24;
  spec.cells_y = 16;
  spec.length = 1.0;
  spec.height = 0.1;
  spec.first_cell_height = 1e-4;
  spec.run_up = 0.1;
  spec.run_up_cells = 4;
  spec.leading_edge_spacing = 5e-3;
  return spec;
}

GridSpec skewed_spec() {
  GridSpec spec;
  spec.generator = GridGenerator::skewed_box;
  spec.cells_x = 16;
  spec.cells_y = 16;
  spec.skew_amplitude = 0.06;
  return spec;
}

double linear(Vec2 x) { return 1.0 + 2.0 * x.x - 30.0 * x.y; }

}  // namespace

TEST(NestedStart, CoarseningKeepsEveryOtherGridLine) {
  const NodeCoordinates fine = generate_nodes(plate_spec());
  const NodeCoordinates both = coarsen(fine, true, true);
  ASSERT_EQ(both.cells_x, 12);
  ASSERT_EQ(both.cells_y, 8);
  for (int j = 0; j <= 8; ++j)
    for (int i = 0; i <= 12; ++i) {
      EXPECT_EQ(both.at(i, j).x, fine.at(2 * i, 2 * j).x);
      EXPECT_EQ(both.at(i, j).y, fine.at(2 * i, 2 * j).y);
    }
  const NodeCoordinates y_only = coarsen(fine, false, true);
  ASSERT_EQ(y_only.cells_x, 24);
  ASSERT_EQ(y_only.cells_y, 8);
  EXPECT_EQ(y_only.at(5, 3).x, fine.at(5, 6).x);
  EXPECT_EQ(y_only.at(5, 3).y, fine.at(5, 6).y);
}

TEST(NestedStart, LinearFieldIsInterpolatedExactly) {
  for (const GridSpec& spec : {plate_spec(), skewed_spec()}) {
    const NodeCoordinates nodes = generate_nodes(spec);
    const Grid fine(MPI_COMM_WORLD, nodes, false);
    const Grid coarse(MPI_COMM_WORLD, coarsen(nodes, true, true), false);
    Field value(coarse), gx(coarse, 2.0), gy(coarse, -30.0), out(fine);
    for (int j = coarse.gy_begin(); j < coarse.gy_end(); ++j)
      for (int i = coarse.gx_begin(); i < coarse.gx_end(); ++i) value(i, j) = linear(coarse.centre(i, j));
    interpolate_to_finer(coarse, fine, value, &gx, &gy, out);
    for (int j = fine.gy_begin(); j < fine.gy_end(); ++j)
      for (int i = fine.gx_begin(); i < fine.gx_end(); ++i)  // ghosts too: exchanged
        EXPECT_NEAR(out(i, j), linear(fine.centre(i, j)), 1e-12) << "cell " << i << ", " << j;
  }
}

TEST(NestedStart, InterpolationAddsNoExtremaAndCopiesWithoutGradient) {
  const NodeCoordinates nodes = generate_nodes(skewed_spec());
  const Grid fine(MPI_COMM_WORLD, nodes, false);
  const Grid coarse(MPI_COMM_WORLD, coarsen(nodes, true, true), false);
  // A step in the coarse field with a wildly wrong gradient: the limiter keeps every value in the
  // range of the coarse cell and its neighbours.
  Field value(coarse), gx(coarse, 1e3), gy(coarse, -1e3), out(fine), copied(fine);
  for (int j = coarse.gy_begin(); j < coarse.gy_end(); ++j)
    for (int i = coarse.gx_begin(); i < coarse.gx_end(); ++i) value(i, j) = i < 4 ? 1.0 : 3.0;
  interpolate_to_finer(coarse, fine, value, &gx, &gy, out);
  interpolate_to_finer(coarse, fine, value, nullptr, nullptr, copied);
  for (int j = fine.y_begin(); j < fine.y_end(); ++j)
    for (int i = fine.x_begin(); i < fine.x_end(); ++i) {
      const int ic = i / 2;
      EXPECT_EQ(copied(i, j), ic < 4 ? 1.0 : 3.0);
      const bool edge = ic == 0 || ic == 7 || j / 2 == 0 || j / 2 == 7;  // not limited there
      if (edge) continue;
      EXPECT_GE(out(i, j), ic - 1 < 4 ? 1.0 : 3.0);
      EXPECT_LE(out(i, j), ic + 1 < 4 ? 1.0 : 3.0);
    }
}
