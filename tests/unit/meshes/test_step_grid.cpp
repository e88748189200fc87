// The step generator: the two-sided tanh stretching meets both end spacings and grows smoothly;
// the step's grid lines pass through the corner; the case file's step gets its solid corner as a
// coordinate box that holds exactly the cells below and upstream of the corner, also on the
// coarser grids of the nested start (every other grid line).
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <string>

#include "core/error.hpp"
#include "coupling/nested_start.hpp"
#include "grid/boundary.hpp"
#include "grid/solid_cells.hpp"
#include "io/case_loader.hpp"
#include "meshes/node_coordinates.hpp"
#include "meshes/step_grid.hpp"

using namespace wallrans;

namespace {

// A step case as a user writes it (the keys of configs/README.md), small enough for a unit test.
const char* step_case = R"(flow: {kinematic_viscosity: 1.0e-4}
grid:
  generator: step
  cells: [40, 24]
  length: 6.0
  height: 3.0
  step_height: 1.0
  upstream_length: 2.0
  upstream_cells: 8
  step_cells: 8
  first_cell_height: 2.0e-3
  top_cell_height: 0.05
  corner_spacing: 0.01
boundaries:
  - {side: left, from: 1.0, kind: inflow, velocity: [1.0, 0.0]}
  - {side: bottom, kind: wall}
  - {side: right, kind: outflow}
  - {side: top, kind: slip}
)";

// The largest ratio of neighbouring intervals (>= 1).
double max_growth(const std::vector<double>& s) {
  double worst = 1.0;
  for (size_t k = 1; k + 1 < s.size(); ++k) {
    const double r = (s[k + 1] - s[k]) / (s[k] - s[k - 1]);
    worst = std::max({worst, r, 1.0 / r});
  }
  return worst;
}

}  // namespace

TEST(StepGrid, TanhSpacingMeetsBothEndSpacingsAndIncreasesMonotonically) {
  const double extent = 5.0;
  for (const auto& [start, end] : {std::pair{2e-3, 2e-3}, std::pair{2e-3, 5e-2}, std::pair{5e-2, 1e-4}}) {
    SCOPED_TRACE(std::to_string(start) + " " + std::to_string(end));
    const auto s = tanh_spacing(48, extent, start, end, "grid.first_cell_height");
    ASSERT_EQ(s.size(), 49u);
    EXPECT_EQ(s.front(), 0.0);
    EXPECT_EQ(s.back(), extent);
    // Met to the fixed-point tolerance (1e-13) plus the round-off of a difference of positions.
    EXPECT_NEAR(s[1] - s[0], start, 1e-12 * start + 1e-14 * extent);
    EXPECT_NEAR(s[48] - s[47], end, 1e-12 * end + 1e-14 * extent);
    // No kink: the intervals grow to one largest interval and shrink after it.
    size_t k = 1;
    while (k + 1 < s.size() && s[k + 1] - s[k] >= s[k] - s[k - 1]) ++k;
    while (k + 1 < s.size() && s[k + 1] - s[k] <= s[k] - s[k - 1]) ++k;
    EXPECT_EQ(k + 1, s.size());
  }
  // With equal ends, the growth between neighbours stays close to that of the geometric series
  // with the same first interval (two_sided_spacing): tanh's grows a little faster near the ends
  // and slower in the middle, within 5 % here.
  const auto tanh_lines = tanh_spacing(48, 1.0, 2e-3, 2e-3, "grid.first_cell_height");
  const auto geometric = two_sided_spacing(48, 1.0, 2e-3, "grid.first_cell_height");
  EXPECT_LT(max_growth(tanh_lines), 1.05 * max_growth(geometric));
  // Equal spacings that fill the extent are the uniform grid.
  const auto uniform = tanh_spacing(10, 1.0, 0.1, 0.1, "grid.first_cell_height");
  for (int j = 0; j <= 10; ++j) EXPECT_NEAR(uniform[j], 0.1 * j, 1e-14);
}

TEST(StepGrid, TanhSpacingRejectsSpacingsThatCannotFit) {
  for (const double bad : {0.0, -1e-3, 0.2}) {
    try {
      tanh_spacing(10, 1.0, bad, 1e-3, "grid.first_cell_height");
      ADD_FAILURE() << "accepted " << bad;
    } catch (const InputError& e) {
      EXPECT_NE(std::string(e.what()).find("key 'grid.first_cell_height': expected a value in (0, 0.1]"),
                std::string::npos)
          << e.what();
    }
  }
}

TEST(StepGrid, GridLinesPassThroughTheCornerWithTheRequestedSpacings) {
  const CaseSpec spec = parse_case_text(step_case, "step.yaml");
  const GridLines lines = step_grid_lines(spec.grid);
  ASSERT_EQ(lines.x.size(), 41u);
  ASSERT_EQ(lines.y.size(), 25u);
  EXPECT_EQ(lines.x.front(), -2.0);
  EXPECT_EQ(lines.x[8], 0.0);  // the step face
  EXPECT_EQ(lines.x.back(), 6.0);
  EXPECT_EQ(lines.y.front(), 0.0);
  EXPECT_EQ(lines.y[8], 1.0);  // the step top
  EXPECT_EQ(lines.y.back(), 3.0);
  // Corner spacing on both sides of x = 0; first_cell_height at the bottom wall and on both sides
  // of y = step_height; top_cell_height at the top.
  EXPECT_NEAR(lines.x[8] - lines.x[7], 0.01, 1e-12);
  EXPECT_NEAR(lines.x[9] - lines.x[8], 0.01, 1e-12);
  EXPECT_NEAR(lines.y[1] - lines.y[0], 2e-3, 1e-12);
  EXPECT_NEAR(lines.y[8] - lines.y[7], 2e-3, 1e-12);
  EXPECT_NEAR(lines.y[9] - lines.y[8], 2e-3, 1e-12);
  EXPECT_NEAR(lines.y[24] - lines.y[23], 0.05, 1e-12);
  const NodeCoordinates nodes = generate_nodes(spec.grid);
  EXPECT_EQ(nodes.at(8, 8).x, 0.0);
  EXPECT_EQ(nodes.at(8, 8).y, 1.0);
}

TEST(StepGrid, SolidCornerIsExactlyTheCellsBelowAndUpstreamOfTheCorner) {
  const CaseSpec spec = parse_case_text(step_case, "step.yaml");
  ASSERT_EQ(spec.solid_regions.size(), 1u);
  EXPECT_TRUE(spec.solid_regions[0].from_generator);
  EXPECT_TRUE(spec.solid_regions[0].x && spec.solid_regions[0].y) << "a coordinate box, not cell indices";
  // On the case's grid and on the two coarser grids of the nested start.
  NodeCoordinates nodes = generate_nodes(spec.grid);
  for (int level = 0; level < 3; ++level) {
    const SolidCells solid(spec, nodes);
    const int up = 8 >> level, low = 8 >> level;
    EXPECT_EQ(solid.count(), up * low) << "level " << level;
    for (int j = 0; j < nodes.cells_y; ++j)
      for (int i = 0; i < nodes.cells_x; ++i)
        EXPECT_EQ(solid.is_solid(i, j), i < up && j < low) << i << " " << j;
    nodes = coarsen(nodes, true, true);
  }
}

TEST(StepGrid, InflowOnTheStepFaceIsRefusedAtTheSegmentsLine) {
  // A common slip: an inflow over the whole left side, step face included.
  std::string text = step_case;
  const std::string segment = "{side: left, from: 1.0, kind: inflow";
  text.replace(text.find(segment), segment.size(), "{side: left, kind: inflow");
  const CaseSpec spec = parse_case_text(text, "step.yaml");
  try {
    BoundaryMap map(spec, generate_nodes(spec.grid));
    ADD_FAILURE() << "accepted an inflow on the step face";
  } catch (const InputError& e) {
    EXPECT_EQ(
        std::string(e.what()).rfind("step.yaml:15: key 'boundaries[0]': expected no face of the step", 0), 0u)
        << e.what();
    EXPECT_NE(std::string(e.what()).find("(give the segment from: 1.000000)"), std::string::npos) << e.what();
  }
}

TEST(StepGrid, ResolvedCaseKeepsTheStepKeysAndNotTheGeneratorsRegion) {
  const CaseSpec spec = parse_case_text(step_case, "step.yaml");
  const std::string resolved = resolved_case_yaml(spec);
  EXPECT_EQ(resolved.find("solid_regions"), std::string::npos) << resolved;
  const CaseSpec again = parse_case_text(resolved, "resolved.yaml");
  ASSERT_EQ(again.solid_regions.size(), 1u);
  EXPECT_EQ(again.grid.step_height, 1.0);
  EXPECT_EQ(again.grid.upstream_length, 2.0);
  EXPECT_EQ(again.grid.upstream_cells, 8);
  EXPECT_EQ(again.grid.step_cells, 8);
  EXPECT_EQ(*again.grid.corner_spacing, 0.01);
  EXPECT_EQ(*again.grid.top_cell_height, 0.05);
  // The same text apart from the header line, which names the file read.
  const std::string again_text = resolved_case_yaml(again);
  EXPECT_EQ(again_text.substr(again_text.find('\n')), resolved.substr(resolved.find('\n')));
}
