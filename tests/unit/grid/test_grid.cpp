// Grid metrics: closed cells, exact volumes, positive-volume check, ghost exchange.
#include <gtest/gtest.h>

#include <cmath>

#include "core/error.hpp"
#include "grid/grid.hpp"
#include "meshes/node_coordinates.hpp"

using namespace wallrans;

namespace {
GridSpec skewed_spec(int n) {
  GridSpec spec;
  spec.generator = GridGenerator::skewed_box;
  spec.cells_x = n;
  spec.cells_y = n;
  spec.skew_amplitude = 0.06;
  return spec;
}
}  // namespace

TEST(Grid, CellsAreClosedAndVolumesSumToDomainArea) {
  Grid grid(MPI_COMM_WORLD, generate_nodes(skewed_spec(12)), false);
  double area = 0.0;
  for (int j = grid.y_begin(); j < grid.y_end(); ++j) {
    for (int i = grid.x_begin(); i < grid.x_end(); ++i) {
      // Sum of outward area vectors of a closed polygon is zero (divergence theorem, common practice).
      const Vec2 s = grid.east_face(i, j).area - grid.east_face(i - 1, j).area + grid.north_face(i, j).area -
                     grid.north_face(i, j - 1).area;
      EXPECT_NEAR(s.x, 0.0, 1e-14);
      EXPECT_NEAR(s.y, 0.0, 1e-14);
      EXPECT_GT(grid.volume(i, j), 0.0);
      area += grid.volume(i, j);
    }
  }
  // The displacement vanishes on the boundary, so the domain stays the unit square.
  EXPECT_NEAR(grid.global_sum(area), 1.0, 1e-13);
}

TEST(Grid, CentroidSatisfiesFirstMomentOfLinearField) {
  // Divergence theorem: integral of x over a cell = sum over faces of (x^2/2) S_x, exact with
  // the midpoint rule on straight faces only for linear integrands, so check against the centroid
  // computed independently by triangulation.
  Grid grid(MPI_COMM_WORLD, generate_nodes(skewed_spec(8)), false);
  for (int j = grid.y_begin(); j < grid.y_end(); ++j) {
    for (int i = grid.x_begin(); i < grid.x_end(); ++i) {
      const Vec2 a = grid.node(i, j), b = grid.node(i + 1, j), c = grid.node(i + 1, j + 1),
                 d = grid.node(i, j + 1);
      const double a1 = 0.5 * cross(b - a, c - a), a2 = 0.5 * cross(c - a, d - a);
      const Vec2 g = (1.0 / (3.0 * (a1 + a2))) * (a1 * (a + b + c) + a2 * (a + c + d));
      EXPECT_NEAR(grid.centre(i, j).x, g.x, 1e-14);
      EXPECT_NEAR(grid.centre(i, j).y, g.y, 1e-14);
      EXPECT_NEAR(grid.volume(i, j), a1 + a2, 1e-15);
    }
  }
}

TEST(Grid, FoldedCellIsRejectedWithItsIndex) {
  auto nodes = generate_nodes(skewed_spec(6));
  nodes.at(3, 2).x +=
      0.5;  // pushes a node across its neighbours; (3, 1) is the first folded cell in j-major order
  try {
    Grid grid(MPI_COMM_WORLD, nodes, false);
    FAIL() << "expected InputError";
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("non-positive volume"), std::string::npos) << e.what();
    EXPECT_NE(std::string(e.what()).find("cell (3, 1)"), std::string::npos) << e.what();
  }
}

TEST(Grid, PeriodicGhostsAreTranslatedAndExchanged) {
  GridSpec spec;
  spec.generator = GridGenerator::channel;
  spec.cells_x = 6;
  spec.cells_y = 4;
  spec.length = 3.0;
  Grid grid(MPI_COMM_WORLD, generate_nodes(spec), true);
  Field f(grid, -1.0);
  for (int j = grid.y_begin(); j < grid.y_end(); ++j)
    for (int i = grid.x_begin(); i < grid.x_end(); ++i) f(i, j) = 100.0 * j + i;
  f.exchange();
  for (int j = grid.gy_begin(); j < grid.gy_end(); ++j) {
    for (int i = grid.gx_begin(); i < grid.gx_end(); ++i) {
      const bool corner =
          (i < grid.x_begin() || i >= grid.x_end()) && (j < grid.y_begin() || j >= grid.y_end());
      if (corner) continue;  // star stencil: corner ghosts are not exchanged
      const int iw = (i + 6) % 6;
      EXPECT_EQ(f(i, j), 100.0 * j + iw);
      // Centres of periodic ghosts are continued beyond the period: spacing stays 0.5.
      EXPECT_NEAR(grid.centre(i, j).x, 0.25 + 0.5 * i, 1e-14);
    }
  }
}

TEST(Spacing, OneSidedHitsFirstSpacingAndExtent) {
  const auto s = one_sided_spacing(40, 2.0, 1e-4, "test");
  EXPECT_NEAR(s[1] - s[0], 1e-4, 1e-10);
  EXPECT_DOUBLE_EQ(s.back(), 2.0);
  for (size_t k = 1; k + 1 < s.size(); ++k) EXPECT_GT(s[k + 1] - s[k], s[k] - s[k - 1]);
  EXPECT_THROW(one_sided_spacing(10, 1.0, 0.2, "test"), InputError);
}
