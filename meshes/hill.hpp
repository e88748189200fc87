// The periodic-hill channel: the hill contour (piecewise cubics of the published geometry file)
// and a body-fitted grid between the hill floor and the flat top wall, periodic in x.
#pragma once

#include <array>

#include "core/case_spec.hpp"
#include "meshes/node_coordinates.hpp"

namespace wallrans {

/// One cubic piece of the hill contour: f(x) = c0 + c1 x + c2 x^2 + c3 x^3 on [from, to], x and
/// f in millimetres (hill height 28 mm).
struct HillPiece {
  double from_mm, to_mm;
  std::array<double, 4> c;
};

/// The six pieces, crest (x = 0) to foot (x = 54 mm); see hill.cpp for the source.
const std::array<HillPiece, 6>& hill_pieces();

/// Local. Height of the hill contour f(x) [mm] for 0 <= x_mm <= 54, with the clips of the
/// published fit (f <= 28 on the first piece, f >= 0 on the last), and its slope df/dx.
double hill_contour_mm(double x_mm);
double hill_contour_slope(double x_mm);

/// Proportions of the channel in hill heights h: crest to crest 9 h, top wall at y = 3.035 h.
inline constexpr double hill_period_in_h = 9.0;
inline constexpr double hill_channel_height_in_h = 3.035;

/// Local. The floor y_w(x) [m] and its slope for a hill of height h [m]: the descending hill
/// from the crest at x = 0 to its foot at 54/28 h, flat floor, and the mirror image rising to
/// the next crest at 9 h; periodic with period 9 h outside [0, 9 h].
double hill_floor(double x, double h);
double hill_floor_slope(double x, double h);

/// Local; the same on every rank. Nodes of the `hill_channel` generator: bottom nodes equally
/// spaced in arc length along the floor from x = 0 to 9 h; from each, a grid line leaves the floor
/// along its normal and turns vertical within about 0.2 h, up to the top wall; nodes along it are
/// clustered at both walls with spec.first_cell_height (arc length) or uniform.
/// Column cells_x is column 0 moved by exactly 9 h (the periodic copy). Throws InputError (naming
/// the key) for an odd cells_y with clustering or a first cell too large for the channel.
NodeCoordinates hill_channel_nodes(const GridSpec& spec);

}  // namespace wallrans
