// Orientation of the cells of a structured block read from a file: all counter-clockwise
// (right-handed), all clockwise (left-handed, repaired by reversing j), or folded/degenerate.
#pragma once

#include <string>

#include "meshes/node_coordinates.hpp"

namespace wallrans {

enum class Handedness { right, left };

/// Local. Signed area of cell (i, j): positive if its corners (i, j), (i+1, j), (i+1, j+1),
/// (i, j+1) run counter-clockwise. Half the cross product of the diagonals (exact for any
/// quadrilateral).
double signed_cell_area(const NodeCoordinates& nodes, int i, int j);

/// Local. The handedness of `nodes` when every cell has the same non-zero orientation. Throws
/// InputError "<label>: cell (i, j): expected a non-zero area of the same sign as cell (0, 0),
/// got ..." naming the first cell (j-major) with zero area or the other sign (a folded grid).
Handedness cell_handedness(const NodeCoordinates& nodes, const std::string& label);

/// Local. The same nodes with the j direction reversed (node (i, j) becomes (i, cells_y - j)):
/// turns a left-handed block into a right-handed one, swapping its bottom and top sides.
NodeCoordinates reversed_j(const NodeCoordinates& nodes);

}  // namespace wallrans
