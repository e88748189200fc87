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

namespace {

// The cached relation of a face to its cells L and R against its definitions: d joins the centres,
// wl and skew place the face centre at x_L + (1 - wl) d + skew with skew normal to d, and the
// over-relaxed split S = k d + cross has cross normal to S (Jasak 1996, sec. 3.3.1.3).
void expect_face_related_to_cells(const FaceGeometry& f, Vec2 xl, Vec2 xr) {
  const Vec2 d = xr - xl;
  EXPECT_EQ(f.d.x, d.x);
  EXPECT_EQ(f.d.y, d.y);
  EXPECT_DOUBLE_EQ(f.length, norm(f.area));
  const Vec2 dw = dot(d, d) * f.d_weighted;
  EXPECT_NEAR(dw.x, d.x, 1e-15 * norm(d));
  EXPECT_NEAR(dw.y, d.y, 1e-15 * norm(d));
  const Vec2 centre = xl + (1.0 - f.wl) * d + f.skew;
  EXPECT_NEAR(centre.x, f.centre.x, 1e-14);
  EXPECT_NEAR(centre.y, f.centre.y, 1e-14);
  EXPECT_NEAR(dot(f.skew, d), 0.0, 1e-15);
  const Vec2 split = f.k * d + f.cross;
  EXPECT_NEAR(split.x, f.area.x, 1e-15);
  EXPECT_NEAR(split.y, f.area.y, 1e-15);
  EXPECT_NEAR(dot(f.cross, f.area), 0.0, 1e-15);
  EXPECT_GT(f.k, 0.0);
}

// Every interior face of the owned cells, the faces shared with ghost cells included.
void check_face_cache(const Grid& grid) {
  int n_east = 0, n_north = 0;
  for_each_interior_face(
      grid,
      [&](int i, int j) {
        expect_face_related_to_cells(grid.east_face(i, j), grid.centre(i, j), grid.centre(i + 1, j));
        ++n_east;
      },
      [&](int i, int j) {
        expect_face_related_to_cells(grid.north_face(i, j), grid.centre(i, j), grid.centre(i, j + 1));
        ++n_north;
      });
  // Each face once: the faces between owned cells and those to the ghost cells on either side.
  const int nx = grid.x_end() - grid.x_begin(), ny = grid.y_end() - grid.y_begin();
  const int east_per_row =
      nx - 1 + (grid.has_west(grid.x_begin()) ? 1 : 0) + (grid.has_east(grid.x_end() - 1) ? 1 : 0);
  EXPECT_EQ(n_east, ny * east_per_row);
  const int north_rows =
      ny - 1 + (grid.has_south(grid.y_begin()) ? 1 : 0) + (grid.has_north(grid.y_end() - 1) ? 1 : 0);
  EXPECT_EQ(n_north, nx * north_rows);
}

}  // namespace

TEST(Grid, FaceCacheMatchesItsDefinitionsOnSkewedGrid) {
  Grid grid(MPI_COMM_WORLD, generate_nodes(skewed_spec(10)), false);
  check_face_cache(grid);
}

TEST(Grid, FaceCacheMatchesItsDefinitionsAcrossPeriodicSeam) {
  GridSpec spec;
  spec.generator = GridGenerator::channel;
  spec.cells_x = 6;
  spec.cells_y = 8;
  spec.length = 3.0;
  spec.first_cell_height = 0.01;
  Grid grid(MPI_COMM_WORLD, generate_nodes(spec), true);
  check_face_cache(grid);
}

TEST(Spacing, OneSidedHitsFirstSpacingAndExtent) {
  const auto s = one_sided_spacing(40, 2.0, 1e-4, "test");
  EXPECT_NEAR(s[1] - s[0], 1e-4, 1e-10);
  EXPECT_DOUBLE_EQ(s.back(), 2.0);
  for (size_t k = 1; k + 1 < s.size(); ++k) EXPECT_GT(s[k + 1] - s[k], s[k] - s[k - 1]);
  EXPECT_THROW(one_sided_spacing(10, 1.0, 0.2, "test"), InputError);
}
