// Node coordinates of a single structured block, and the generators that make them.
#pragma once

#include <vector>

#include "core/case_spec.hpp"
#include "core/vec2.hpp"

namespace wallrans {

/// Nodes (i, j), 0 <= i <= cells_x, 0 <= j <= cells_y, stored j-major. Cell (i, j) has corners
/// (i, j), (i+1, j), (i+1, j+1), (i, j+1), counter-clockwise for a right-handed grid.
struct NodeCoordinates {
  int cells_x = 0;
  int cells_y = 0;
  std::vector<Vec2> nodes;

  Vec2 at(int i, int j) const { return nodes[static_cast<size_t>(j) * (cells_x + 1) + i]; }
  Vec2& at(int i, int j) { return nodes[static_cast<size_t>(j) * (cells_x + 1) + i]; }
};

/// Positions 0 = s_0 < ... < s_n = extent with geometric growth from first_spacing at s = 0.
/// Throws InputError (naming `what`) if first_spacing is not in (0, extent/n].
std::vector<double> one_sided_spacing(int n, double extent, double first_spacing, const char* what);

/// Positions clustered symmetrically at both ends (geometric growth to the middle); n even.
std::vector<double> two_sided_spacing(int n, double extent, double first_spacing, const char* what);

/// Builds the nodes the GridSpec describes (channel, cavity, plate, skewed_box, step, hill_channel
/// in meshes/hill.hpp). Local; the
/// same on every rank. Throws InputError for inconsistent sizes.
NodeCoordinates generate_nodes(const GridSpec& spec);

}  // namespace wallrans
