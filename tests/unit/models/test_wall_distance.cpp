// Wall distance: analytic distances (plane channel, flat plate, wall ends, circular arc within the
// chord sagitta) and the pruned search equal to an all-pairs minimum, bit for bit.
#include <gtest/gtest.h>

#include <algorithm>
#include <array>
#include <cmath>
#include <limits>
#include <numbers>

#include "grid/boundary.hpp"
#include "grid/grid.hpp"
#include "meshes/node_coordinates.hpp"
#include "models/wall_distance.hpp"

using namespace wallrans;

namespace {

BoundarySegmentSpec segment(Side side, BoundaryKind kind, std::optional<double> from = std::nullopt,
                            std::optional<double> to = std::nullopt) {
  BoundarySegmentSpec spec;
  spec.side = side;
  spec.kind = kind;
  spec.from = from;
  spec.to = to;
  return spec;
}

CaseSpec case_with(std::vector<BoundarySegmentSpec> boundaries, bool periodic_x = false) {
  CaseSpec spec;
  spec.boundaries = std::move(boundaries);
  spec.periodic.axis = periodic_x ? PeriodicAxis::x : PeriodicAxis::none;
  return spec;
}

GridSpec box_spec(int nx, int ny, double length, double height) {
  GridSpec spec;
  spec.generator = GridGenerator::cavity;  // uniform without first_cell_height
  spec.cells_x = nx;
  spec.cells_y = ny;
  spec.length = length;
  spec.height = height;
  return spec;
}

struct Candidate {
  double distance = std::numeric_limits<double>::infinity();
  int id = -1;
};

// All-pairs reference: every face in id order, so ties go to the smallest id.
Candidate brute_force(Vec2 p, const std::vector<WallFace>& walls) {
  Candidate best;
  for (size_t id = 0; id < walls.size(); ++id) {
    const double distance = point_segment_distance(p, walls[id].a, walls[id].b);
    if (distance < best.distance) best = {distance, static_cast<int>(id)};
  }
  return best;
}

// Annular sector R1 <= r <= R2, 0 <= theta <= pi/2. i runs along decreasing theta and j outwards,
// so that cells (i, j), (i+1, j), (i+1, j+1), (i, j+1) are counter-clockwise (positive area).
// `twist` rotates the interior node rows by up to that fraction of a cell (linearly in j, outer
// arc fixed at the ends): interior cell centres then sit at other angles than the inner nodes.
NodeCoordinates annular_sector(int n_theta, int n_r, double r_inner, double r_outer, double twist = 0.0) {
  NodeCoordinates nodes;
  nodes.cells_x = n_theta;
  nodes.cells_y = n_r;
  nodes.nodes.resize(static_cast<size_t>(n_theta + 1) * (n_r + 1));
  for (int j = 0; j <= n_r; ++j) {
    const double r = r_inner + (r_outer - r_inner) * j / n_r;
    for (int i = 0; i <= n_theta; ++i) {
      const bool is_end = i == 0 || i == n_theta || j == n_r;
      const double shift = is_end ? 0.0 : twist * j / n_r;
      const double theta = 0.5 * std::numbers::pi * (1.0 - (i + shift) / n_theta);
      nodes.at(i, j) = {r * std::cos(theta), r * std::sin(theta)};
    }
  }
  return nodes;
}

}  // namespace

TEST(PointSegmentDistance, MatchesHandComputedCases) {
  const Vec2 a{0.0, 0.0}, b{1.0, 0.0};
  EXPECT_DOUBLE_EQ(point_segment_distance({0.5, 2.0}, a, b), 2.0);   // foot inside the segment
  EXPECT_DOUBLE_EQ(point_segment_distance({-3.0, 4.0}, a, b), 5.0);  // beyond a: distance to a
  EXPECT_DOUBLE_EQ(point_segment_distance({4.0, -4.0}, a, b), 5.0);  // beyond b: distance to b
  EXPECT_DOUBLE_EQ(point_segment_distance({0.0, 2.0}, {0.0, 0.0}, {2.0, 2.0}), std::sqrt(2.0));
  EXPECT_DOUBLE_EQ(point_segment_distance({4.0, 5.0}, {1.0, 1.0}, {1.0, 1.0}), 5.0);  // degenerate
}

TEST(WallFaces, AllSidesInGlobalOrder) {
  const auto nodes = generate_nodes(box_spec(3, 2, 3.0, 1.0));
  const BoundaryMap map(
      case_with({segment(Side::left, BoundaryKind::wall), segment(Side::right, BoundaryKind::wall),
                 segment(Side::bottom, BoundaryKind::wall), segment(Side::top, BoundaryKind::wall)}),
      nodes);
  const auto walls = collect_wall_faces(map);
  const Side sides[] = {Side::left,   Side::left,   Side::right, Side::right, Side::bottom,
                        Side::bottom, Side::bottom, Side::top,   Side::top,   Side::top};
  const int index[] = {0, 1, 0, 1, 0, 1, 2, 0, 1, 2};
  ASSERT_EQ(walls.size(), 10u);
  for (size_t id = 0; id < walls.size(); ++id) {
    EXPECT_EQ(walls[id].side, sides[id]) << id;
    EXPECT_EQ(walls[id].index, index[id]) << id;
  }
  // Left face j = 1 runs from (0, 0.5) to (0, 1); top face i = 2 from (2, 1) to (3, 1).
  EXPECT_DOUBLE_EQ(walls[1].a.y, 0.5);
  EXPECT_DOUBLE_EQ(walls[1].b.y, 1.0);
  EXPECT_DOUBLE_EQ(walls[9].a.x, 2.0);
  EXPECT_DOUBLE_EQ(walls[9].b.x, 3.0);
  EXPECT_DOUBLE_EQ(walls[9].b.y, 1.0);
}

TEST(WallDistance, PlaneChannelIsDistanceToNearerWallIncludingPeriodicGhosts) {
  GridSpec spec;
  spec.generator = GridGenerator::channel;
  spec.cells_x = 16;
  spec.cells_y = 12;
  spec.length = 2.0;
  spec.height = 1.0;
  spec.first_cell_height = 0.02;
  Grid grid(MPI_COMM_WORLD, generate_nodes(spec), true);
  const BoundaryMap map(
      case_with({segment(Side::bottom, BoundaryKind::wall), segment(Side::top, BoundaryKind::wall)}, true),
      grid.nodes());
  const auto walls = collect_wall_faces(map);
  ASSERT_EQ(walls.size(), 32u);
  const auto result = compute_wall_distance(grid, walls);
  const double height = spec.height, length = spec.length;
  for (int j = grid.gy_begin(); j < grid.gy_end(); ++j) {
    for (int i = grid.gx_begin(); i < grid.gx_end(); ++i) {
      const Vec2 centre = grid.centre(i, j);
      // Exact: the walls are the lines y = 0 and y = H; periodic ghosts (i = -1, nx) lie beyond x = 0, L.
      EXPECT_NEAR(result.distance(i, j), std::min(centre.y, height - centre.y), 1e-14) << i << ", " << j;
      const int id = result.nearest[grid.local(i, j)];
      ASSERT_GE(id, 0);
      ASSERT_LT(id, 32);
      EXPECT_EQ(walls[id].side, centre.y < 0.5 * height ? Side::bottom : Side::top) << i << ", " << j;
      const double x_in_period = centre.x - length * std::floor(centre.x / length);
      EXPECT_LE(walls[id].a.x, x_in_period) << i << ", " << j;
      EXPECT_GE(walls[id].b.x, x_in_period) << i << ", " << j;
    }
  }
}

TEST(WallDistance, CurvedWallEqualsAllPairsAndCircleWithinSagitta) {
  const int n_theta = 60, n_r = 20;
  const double r_inner = 1.0, r_outer = 1.5;
  Grid grid(MPI_COMM_WORLD, annular_sector(n_theta, n_r, r_inner, r_outer), false);
  const BoundaryMap map(
      case_with({segment(Side::bottom, BoundaryKind::wall), segment(Side::top, BoundaryKind::slip),
                 segment(Side::left, BoundaryKind::slip), segment(Side::right, BoundaryKind::slip)}),
      grid.nodes());
  const auto walls = collect_wall_faces(map);
  ASSERT_EQ(walls.size(), static_cast<size_t>(n_theta));
  const auto result = compute_wall_distance(grid, walls);
  // The chords of the inner arc lie between radius R1 cos(dtheta/2) and R1, so for a point at
  // radius r whose ray from the origin meets the arc, r - R1 <= d <= r - R1 + R1 (1 - cos(dtheta/2))
  // (sagitta of a chord, common geometry). Every cell centre has 0 < theta < pi/2, so its ray meets
  // the arc's interior.
  const double sagitta = r_inner * (1.0 - std::cos(0.25 * std::numbers::pi / n_theta));
  for (int j = grid.gy_begin(); j < grid.gy_end(); ++j) {
    for (int i = grid.gx_begin(); i < grid.gx_end(); ++i) {
      const Vec2 centre = grid.centre(i, j);
      const Candidate expected = brute_force(centre, walls);
      EXPECT_EQ(result.distance(i, j), expected.distance) << i << ", " << j;
      EXPECT_EQ(result.nearest[grid.local(i, j)], expected.id) << i << ", " << j;
      const double to_circle = norm(centre) - r_inner;
      EXPECT_GE(result.distance(i, j), to_circle - 1e-14) << i << ", " << j;
      EXPECT_LE(result.distance(i, j), to_circle + sagitta + 1e-14) << i << ", " << j;
    }
  }
}

TEST(WallDistance, TiesAtSharedWallNodesGoToTheSmallestIdLikeAllPairs) {
  // Seen from outside, the inner arc's chords form a convex polyline: points in the wedge between
  // the normals of two neighbouring chords are nearest to their shared node, at exactly the same
  // distance from both faces. Twisting the grid by half a cell puts cell centres in such wedges.
  const int n_theta = 30, n_r = 12;
  Grid grid(MPI_COMM_WORLD, annular_sector(n_theta, n_r, 1.0, 1.5, 0.5), false);
  const BoundaryMap map(
      case_with({segment(Side::bottom, BoundaryKind::wall), segment(Side::top, BoundaryKind::slip),
                 segment(Side::left, BoundaryKind::slip), segment(Side::right, BoundaryKind::slip)}),
      grid.nodes());
  const auto walls = collect_wall_faces(map);
  const auto result = compute_wall_distance(grid, walls);
  int n_ties = 0;
  for (int j = grid.gy_begin(); j < grid.gy_end(); ++j) {
    for (int i = grid.gx_begin(); i < grid.gx_end(); ++i) {
      const Vec2 centre = grid.centre(i, j);
      const Candidate expected = brute_force(centre, walls);
      EXPECT_EQ(result.distance(i, j), expected.distance) << i << ", " << j;
      EXPECT_EQ(result.nearest[grid.local(i, j)], expected.id) << i << ", " << j;
      const size_t next = static_cast<size_t>(expected.id) + 1;
      if (next < walls.size() &&
          point_segment_distance(centre, walls[next].a, walls[next].b) == expected.distance)
        ++n_ties;
    }
  }
  EXPECT_GT(grid.global_sum(n_ties), 0.0);  // the configuration really has exact ties
}

TEST(WallDistance, CellsAboveSlipGapSeeTheWallEnds) {
  // Bottom: wall for x < 0.3, slip 0.3 < x < 0.7, wall for x > 0.7; other sides slip.
  Grid grid(MPI_COMM_WORLD, generate_nodes(box_spec(20, 10, 1.0, 0.5)), false);
  const BoundaryMap map(
      case_with({segment(Side::bottom, BoundaryKind::wall, std::nullopt, 0.3),
                 segment(Side::bottom, BoundaryKind::slip, 0.3, 0.7),
                 segment(Side::bottom, BoundaryKind::wall, 0.7, std::nullopt),
                 segment(Side::left, BoundaryKind::slip), segment(Side::right, BoundaryKind::slip),
                 segment(Side::top, BoundaryKind::slip)}),
      grid.nodes());
  const auto walls = collect_wall_faces(map);
  ASSERT_EQ(walls.size(), 12u);  // bottom faces 0..5 (ids 0..5) and 14..19 (ids 6..11)
  EXPECT_EQ(walls[5].index, 5);
  EXPECT_EQ(walls[6].index, 14);
  const auto result = compute_wall_distance(grid, walls);
  for (int j = grid.gy_begin(); j < grid.gy_end(); ++j) {
    for (int i = grid.gx_begin(); i < grid.gx_end(); ++i) {
      const Vec2 centre = grid.centre(i, j);
      const int id = result.nearest[grid.local(i, j)];
      if (centre.x < 0.3 || centre.x > 0.7) {
        EXPECT_NEAR(result.distance(i, j), centre.y, 1e-14) << i << ", " << j;
        EXPECT_EQ(id, centre.x < 0.3 ? i : i - 8) << i << ", " << j;
      } else {
        // Corner distance to the nearer wall end, (0.3, 0) (end of face 5) or (0.7, 0) (start of face 14).
        const double to_left = std::hypot(centre.x - 0.3, centre.y),
                     to_right = std::hypot(centre.x - 0.7, centre.y);
        EXPECT_NEAR(result.distance(i, j), std::min(to_left, to_right), 1e-14) << i << ", " << j;
        EXPECT_EQ(id, to_left < to_right ? 5 : 6) << i << ", " << j;
      }
    }
  }
}

TEST(WallDistance, LargePlateGridRunsAndMatchesAllPairsOnASample) {
  GridSpec spec;
  spec.generator = GridGenerator::plate;
  spec.cells_x = 400;
  spec.cells_y = 400;
  spec.length = 1.0;
  spec.height = 0.5;
  spec.run_up = 0.1;
  spec.run_up_cells = 40;
  spec.first_cell_height = 1e-4;
  Grid grid(MPI_COMM_WORLD, generate_nodes(spec), false);
  auto inflow = segment(Side::left, BoundaryKind::inflow);
  inflow.velocity = {1.0, 0.0};
  const BoundaryMap map(
      case_with({segment(Side::bottom, BoundaryKind::slip, std::nullopt, 0.0),
                 segment(Side::bottom, BoundaryKind::wall, 0.0, std::nullopt), inflow,
                 segment(Side::right, BoundaryKind::outflow), segment(Side::top, BoundaryKind::slip)}),
      grid.nodes());
  const auto walls = collect_wall_faces(map);
  ASSERT_EQ(walls.size(), 360u);
  const auto result = compute_wall_distance(grid, walls);
  // Analytic for every cell: the plate is the line y = 0 from its leading edge (0, 0) on, so ahead
  // of it the distance is the one to the leading edge.
  int n_wrong = 0;
  for (int j = grid.gy_begin(); j < grid.gy_end(); ++j) {
    for (int i = grid.gx_begin(); i < grid.gx_end(); ++i) {
      const Vec2 centre = grid.centre(i, j);
      const double exact = centre.x < 0.0 ? std::hypot(centre.x, centre.y) : centre.y;
      if (!(std::abs(result.distance(i, j) - exact) <= 1e-14)) ++n_wrong;
    }
  }
  EXPECT_EQ(n_wrong, 0);
  // A deterministic spread-out sample of 1000 ghosted cells against the all-pairs search.
  const int width = grid.gx_end() - grid.gx_begin();
  for (size_t sample = 0; sample < 1000; ++sample) {
    const size_t cell = (sample * 104729) % grid.n_ghosted();
    const int i = grid.gx_begin() + static_cast<int>(cell % width),
              j = grid.gy_begin() + static_cast<int>(cell / width);
    const Candidate expected = brute_force(grid.centre(i, j), walls);
    EXPECT_EQ(result.distance(i, j), expected.distance) << i << ", " << j;
    EXPECT_EQ(result.nearest[grid.local(i, j)], expected.id) << i << ", " << j;
  }
}

TEST(WallDistance, NoWallGivesInfinityAndNoId) {
  Grid grid(MPI_COMM_WORLD, generate_nodes(box_spec(8, 6, 1.0, 1.0)), false);
  const BoundaryMap map(
      case_with({segment(Side::left, BoundaryKind::slip), segment(Side::right, BoundaryKind::slip),
                 segment(Side::bottom, BoundaryKind::slip), segment(Side::top, BoundaryKind::slip)}),
      grid.nodes());
  const auto walls = collect_wall_faces(map);
  EXPECT_TRUE(walls.empty());
  const auto result = compute_wall_distance(grid, walls);
  ASSERT_EQ(result.nearest.size(), grid.n_ghosted());
  for (int j = grid.gy_begin(); j < grid.gy_end(); ++j) {
    for (int i = grid.gx_begin(); i < grid.gx_end(); ++i) {
      EXPECT_TRUE(std::isinf(result.distance(i, j)) && result.distance(i, j) > 0.0) << i << ", " << j;
      EXPECT_EQ(result.nearest[grid.local(i, j)], -1) << i << ", " << j;
    }
  }
}

TEST(WallDistance, BlankedStepSeesTheStepFacesAndNotTheBuriedWalls) {
  // A step of solid cells x < 1, y < 0.5 in a 3 x 1 box of 30 x 10 cells. The walls of the fluid
  // are the top, the bottom beyond the step, and the step's top and downstream faces; the left
  // and bottom walls under the step are buried in the solid.
  Grid grid(MPI_COMM_WORLD, generate_nodes(box_spec(30, 10, 3.0, 1.0)), false);
  auto inflow = segment(Side::left, BoundaryKind::inflow, 0.5);
  inflow.velocity = {1.0, 0.0};
  CaseSpec spec =
      case_with({inflow, segment(Side::left, BoundaryKind::wall, std::nullopt, 0.5),
                 segment(Side::right, BoundaryKind::outflow), segment(Side::bottom, BoundaryKind::wall),
                 segment(Side::top, BoundaryKind::wall)});
  SolidRegionSpec step;
  step.x = std::array{-1.0, 1.0};
  step.y = std::array{-1.0, 0.5};
  spec.solid_regions = {step};
  const BoundaryMap map(spec, grid.nodes());
  const auto walls = collect_wall_faces(map);
  ASSERT_EQ(walls.size(), 30u + 20u + 10u + 5u);  // top, bottom beyond the step, step top, step face
  // The fluid's wall as three long segments (the step outline) and the top line, independent of
  // the face list.
  const Vec2 corner_top{0.0, 0.5}, corner{1.0, 0.5}, foot{1.0, 0.0}, end{3.0, 0.0};
  for (const WallFace& w : walls) {
    const Vec2 mid = 0.5 * (w.a + w.b);
    const double off_outline =
        std::min({point_segment_distance(mid, corner_top, corner), point_segment_distance(mid, corner, foot),
                  point_segment_distance(mid, foot, end), std::abs(1.0 - mid.y)});
    EXPECT_LT(off_outline, 1e-15) << "wall face off the fluid's walls at " << mid.x << ", " << mid.y;
  }
  const auto result = compute_wall_distance(grid, walls);
  for (int j = grid.gy_begin(); j < grid.gy_end(); ++j) {
    for (int i = grid.gx_begin(); i < grid.gx_end(); ++i) {
      const Vec2 c = grid.centre(i, j);
      if (c.x < 1.0 && c.y < 0.5) continue;  // solid
      const double exact =
          std::min({point_segment_distance(c, corner_top, corner), point_segment_distance(c, corner, foot),
                    point_segment_distance(c, foot, end), 1.0 - c.y});
      EXPECT_NEAR(result.distance(i, j), exact, 1e-14) << i << ", " << j;
    }
  }
  // Cell (10, 5), centred at (1.05, 0.55), is nearest to the step corner (1, 0.5) itself.
  if (10 >= grid.gx_begin() && 10 < grid.gx_end() && 5 >= grid.gy_begin() && 5 < grid.gy_end()) {
    EXPECT_NEAR(result.distance(10, 5), 0.05 * std::sqrt(2.0), 1e-15);
  }
}
