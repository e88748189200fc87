// The periodic-hill contour against the checks of its source (the spline fit of the ERCOFTAC
// geometry file, quoted in tests/data/periodic-hill/README.md: value and slope
// continuous at the joints 9, 14, 20, 30, 40 mm, through the fitted points, f(0) = 28 mm and
// f(54 mm) = 0), and the body-fitted grid of the hill_channel generator.
#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>

#include "core/error.hpp"
#include "grid/boundary.hpp"
#include "grid/grid.hpp"
#include "grid/grid_quality.hpp"
#include "meshes/hill.hpp"

using namespace wallrans;

namespace {

// The coefficients carry 13 significant digits, so each is rounded by up to 5e-13 of itself; the
// largest term of a piece at its joint is about 41 mm (1.38 x 30 on the fourth piece), so a
// value evaluated from two rounded pieces may differ by some 4 x 41 x 5e-13 = 8e-11 mm, and a
// slope (terms up to 1.4) by 4 x 1.4 x 5e-13 = 3e-12.
constexpr double value_rounding_mm = 1e-10;
constexpr double slope_rounding = 1e-11;

double piece_value(const HillPiece& p, double x) { return p.c[0] + x * (p.c[1] + x * (p.c[2] + x * p.c[3])); }
double piece_slope(const HillPiece& p, double x) { return p.c[1] + x * (2.0 * p.c[2] + 3.0 * x * p.c[3]); }

CaseSpec hill_case(int cells_x, int cells_y, std::optional<double> first_cell_height) {
  CaseSpec spec;
  spec.grid.generator = GridGenerator::hill_channel;
  spec.grid.cells_x = cells_x;
  spec.grid.cells_y = cells_y;
  spec.grid.hill_height = 0.028;  // the original 28 mm, so the grid is in metres
  spec.grid.first_cell_height = first_cell_height;
  spec.periodic.axis = PeriodicAxis::x;
  BoundarySegmentSpec wall;
  wall.side = Side::bottom;
  spec.boundaries.push_back(wall);
  wall.side = Side::top;
  spec.boundaries.push_back(wall);
  return spec;
}

}  // namespace

TEST(HillContour, PiecesJoinInValueAndSlopeAtTheFittedPoints) {
  const auto& pieces = hill_pieces();
  // The points the spline passes through (x, f) [mm].
  const double joints[5][2] = {{9, 27}, {14, 24}, {20, 19}, {30, 11}, {40, 4}};
  for (size_t k = 0; k + 1 < pieces.size(); ++k) {
    const double x = pieces[k].to_mm;
    SCOPED_TRACE("joint at x = " + std::to_string(x) + " mm");
    EXPECT_EQ(x, pieces[k + 1].from_mm);
    EXPECT_EQ(x, joints[k][0]);
    EXPECT_NEAR(piece_value(pieces[k], x), joints[k][1], value_rounding_mm);
    EXPECT_NEAR(piece_value(pieces[k + 1], x), joints[k][1], value_rounding_mm);
    EXPECT_NEAR(piece_slope(pieces[k], x), piece_slope(pieces[k + 1], x), slope_rounding);
  }
}

TEST(HillContour, CrestAndFootOfTheClippedFit) {
  EXPECT_EQ(hill_contour_mm(0.0), 28.0);
  EXPECT_EQ(hill_contour_slope(0.0), 0.0);  // flat crest: the first cubic lies above 28 mm there
  EXPECT_NEAR(hill_contour_mm(54.0), 0.0, value_rounding_mm);
  EXPECT_NEAR(hill_contour_slope(54.0), 0.0, slope_rounding);  // a double root of the last cubic
  // Monotone descent from crest to foot.
  double previous = 28.0;
  for (double x = 0.5; x <= 54.0; x += 0.5) {
    EXPECT_LE(hill_contour_mm(x), previous + value_rounding_mm) << x;
    previous = hill_contour_mm(x);
  }
}

TEST(HillContour, FloorIsMirroredAndPeriodic) {
  const double h = 0.028, period = 9.0 * h;
  for (double x : {0.0, 0.3 * h, 1.0 * h, 1.9 * h, 4.5 * h}) {
    SCOPED_TRACE(x);
    // The mirrored argument 252 mm - x is rounded by up to half an ulp of 252 mm (2.8e-14 mm),
    // which moves the value by slope x 2.8e-14 mm and the slope by curvature x 2.8e-14 (both
    // below 1e-13 in these units).
    EXPECT_NEAR(hill_floor(x, h), hill_floor(period - x, h), 1e-13 * h);
    EXPECT_NEAR(hill_floor_slope(x, h), -hill_floor_slope(period - x, h), 1e-13);
    EXPECT_NEAR(hill_floor(x + period, h), hill_floor(x, h), 1e-13 * h);
  }
  EXPECT_DOUBLE_EQ(hill_floor(0.0, h), h);
  EXPECT_EQ(hill_floor(4.5 * h, h), 0.0);  // flat floor between the feet at 54 and 198 mm
  EXPECT_NEAR(hill_floor(20.0 / 28.0 * h, h), 19.0 / 28.0 * h, 1e-12);
}

TEST(HillChannelGrid, BodyFittedPeriodicAndClusteredAtBothWalls) {
  const double h = 0.028, first = 2e-5;
  const CaseSpec spec = hill_case(64, 32, first);
  const NodeCoordinates nodes = generate_nodes(spec.grid);
  ASSERT_EQ(nodes.cells_x, 64);
  for (int i = 0; i <= 64; ++i) {
    const Vec2 bottom = nodes.at(i, 0), top = nodes.at(i, 32);
    EXPECT_NEAR(bottom.y, hill_floor(bottom.x, h), 1e-12) << i;  // nodes on the contour
    EXPECT_EQ(top.y, 3.035 * h) << i;
    // A line leans off the vertical by the blend exp(-s / 0.2 h) of the floor normal n: its top
    // end lies within 0.2 h |n_x| / cos(41 deg / 2) of the floor point (the blended direction is
    // at least that long before normalisation; 41 degrees is the steepest floor).
    const double slope = hill_floor_slope(bottom.x, h);
    EXPECT_LE(std::abs(top.x - bottom.x), 0.2 * h * std::abs(slope) / std::hypot(slope, 1.0) / 0.936) << i;
  }
  for (int j = 0; j <= 32; ++j) {
    EXPECT_EQ(nodes.at(64, j).x, nodes.at(0, j).x + 9.0 * h);
    EXPECT_EQ(nodes.at(64, j).y, nodes.at(0, j).y);
  }
  // Bottom nodes equally spaced in arc length along the floor: the chords agree to the relative
  // difference of chord and arc, (kappa ds)^2 / 24 = 5.1e-3 with the largest curvature of the
  // contour, kappa = 2.28 / h (at x = 9 mm), and ds = 9.8 h / 64.
  double shortest = HUGE_VAL, longest = 0;
  for (int i = 0; i < 64; ++i) {
    const double chord = norm(nodes.at(i + 1, 0) - nodes.at(i, 0));
    shortest = std::min(shortest, chord);
    longest = std::max(longest, chord);
  }
  EXPECT_LT(longest / shortest - 1.0, 6e-3);
  const Grid grid(MPI_COMM_WORLD, nodes, true);  // throws on a non-positive volume
  const BoundaryMap map(spec, grid.nodes());
  const GridQuality q = measure_quality(grid, map);
  EXPECT_GT(q.min_volume, 0.0);
  ASSERT_EQ(q.walls.size(), 2u);
  for (const WallSpacing& wall : q.walls) {
    // First-cell height (cell area / wall face length) against the arc length of the first step
    // along lines that leave the floor along the normal at their node: the face chord turns by
    // up to kappa ds / 2 from those normals, so the height is first x cos(kappa ds / 2), short by
    // up to 1.5 % (kappa = 2.28 / h, ds = 0.153 h); the top wall is flat.
    EXPECT_NEAR(wall.min_height, first, 0.02 * first);
    EXPECT_NEAR(wall.max_height, first, 0.02 * first);
  }
  // The grid lines leave the floor along its normal and the top wall vertically: the
  // non-orthogonality lives in the middle of the channel (32.6 degrees measured on 384 x 192; the
  // bound is the pressure-correction limit of DEVELOPERS.md, 47 degrees converged with care).
  EXPECT_LT(q.max_non_orthogonality, 40.0);
  std::printf("hill_channel 64 x 32: max non-orthogonality %.1f deg, max expansion ratio %.3f\n",
              q.max_non_orthogonality, q.max_expansion_ratio);
  for (int i = 0; i < 64; ++i) {
    // The first grid line leaves the floor along its normal: it turns towards the vertical by the
    // blend 1 - exp(-s / 0.2 h) of the floor's angle (at most 41 degrees), over the first cell
    // s = 2e-5 m = 3.6e-3 of 0.2 h: 0.15 degrees at most.
    const Vec2 up = nodes.at(i, 1) - nodes.at(i, 0);
    const double slope = hill_floor_slope(nodes.at(i, 0).x, h);
    const Vec2 normal = (1.0 / std::hypot(slope, 1.0)) * Vec2{-slope, 1.0};
    EXPECT_LT(std::acos(std::min(1.0, dot(up, normal) / norm(up))) * 180.0 / M_PI, 0.2) << i;
  }
}

TEST(HillChannelGrid, UniformWithoutFirstCellHeightAndOddRowsRejectedWithClustering) {
  const NodeCoordinates uniform = generate_nodes(hill_case(16, 5, std::nullopt).grid);
  EXPECT_EQ(uniform.cells_y, 5);
  try {
    generate_nodes(hill_case(16, 5, 1e-4).grid);
    FAIL() << "odd cells_y with two-sided clustering";
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("grid.cells"), std::string::npos) << e.what();
  }
  try {
    generate_nodes(hill_case(16, 8, 0.02).grid);  // larger than a column / 8
    FAIL() << "first cell too large";
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("grid.first_cell_height"), std::string::npos) << e.what();
  }
}
