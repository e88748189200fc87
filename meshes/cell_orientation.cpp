// Cell orientation from the signed quadrilateral area, and the j reversal that repairs it.
#include "meshes/cell_orientation.hpp"

#include <sstream>

#include "core/error.hpp"

namespace wallrans {

double signed_cell_area(const NodeCoordinates& nodes, int i, int j) {
  return 0.5 * cross(nodes.at(i + 1, j + 1) - nodes.at(i, j), nodes.at(i, j + 1) - nodes.at(i + 1, j));
}

Handedness cell_handedness(const NodeCoordinates& nodes, const std::string& label) {
  const double first = signed_cell_area(nodes, 0, 0);
  for (int j = 0; j < nodes.cells_y; ++j) {
    for (int i = 0; i < nodes.cells_x; ++i) {
      const double a = signed_cell_area(nodes, i, j);
      if (first > 0.0 ? a > 0.0 : first < 0.0 && a < 0.0) continue;
      std::ostringstream got;
      got << "area " << a;
      if (a != 0.0) got << " where cell (0, 0) has " << first << " (a folded grid)";
      throw InputError(label + ": cell (" + std::to_string(i) + ", " + std::to_string(j) +
                       "): expected a non-zero area of the same sign as cell (0, 0), got " + got.str());
    }
  }
  return first > 0.0 ? Handedness::right : Handedness::left;
}

NodeCoordinates reversed_j(const NodeCoordinates& nodes) {
  NodeCoordinates out = nodes;
  for (int j = 0; j <= nodes.cells_y; ++j) {
    for (int i = 0; i <= nodes.cells_x; ++i) out.at(i, j) = nodes.at(i, nodes.cells_y - j);
  }
  return out;
}

}  // namespace wallrans
