// The backward-facing step generator: one block from x = -upstream_length to length and y = 0 to
// height, with grid lines through the step corner (x = 0, y = step_height); the cells below and
// upstream of the corner are the solid step. Clustered at every wall and at the corner.
#pragma once

#include <vector>

#include "core/case_spec.hpp"

namespace wallrans {

/// Positions 0 = s_0 < ... < s_n = extent whose first interval is `start` and last is `end`
/// (two-sided tanh stretching, Vinokur 1983, J. Comput. Phys. 50:215, eqs. for the two-sided
/// function; both ends met exactly by rescaling the end slopes). Local. Throws InputError naming
/// `what` if a spacing is not in (0, extent/n] or n < 1.
std::vector<double> tanh_spacing(int n, double extent, double start, double end, const char* what);

struct GridLines {
  std::vector<double> x, y;  ///< node coordinates along each direction, increasing
};

/// Local. The grid lines of the step: in x, geometric growth away from x = 0 on both sides
/// (corner_spacing, or uniform per part); in y, two-sided tanh stretching below the step
/// (first_cell_height at y = 0 and y = step_height) and above it (first_cell_height at y =
/// step_height, top_cell_height at y = height), or uniform per part. Throws InputError for
/// inconsistent keys.
GridLines step_grid_lines(const GridSpec& spec);

/// The solid corner of the step as a coordinate box on the cell centres: x in
/// [-upstream_length, 0], y in [0, step_height] (grid lines pass through x = 0 and y =
/// step_height, so it holds exactly the cells below and upstream of the corner).
SolidRegionSpec step_solid_region(const GridSpec& spec);

}  // namespace wallrans
