// Enumeration of the boundary faces of the cells a rank owns.
#pragma once

#include <array>
#include <vector>

#include "core/case_spec.hpp"
#include "grid/grid.hpp"

namespace wallrans {

/// One boundary face of an owned cell (i, j). `area` points out of the domain.
struct BoundaryFace {
  Side side;
  int index;   ///< position along the side: i for bottom/top, j for left/right
  int i, j;    ///< the owned cell next to the face
  int i2, j2;  ///< the next cell inwards along the grid line (valid if has_second)
  bool has_second;
  Vec2 area;  ///< outward area vector
  Vec2 centre;
};

/// Local. All boundary faces of owned cells, in a fixed order (left, right, bottom, top).
std::vector<BoundaryFace> owned_boundary_faces(const Grid& grid);

/// Local. For each owned cell (owned order), the positions in `faces` of its boundary faces
/// (at most two on a single block; unused slots are -1).
std::vector<std::array<int, 4>> boundary_faces_by_cell(const Grid& grid,
                                                       const std::vector<BoundaryFace>& faces);

/// A value per boundary face, per side, indexed by the position along the side. Each rank fills
/// the entries of its own faces only.
struct BoundaryValues {
  std::array<std::vector<double>, 4> side;
  BoundaryValues() = default;
  explicit BoundaryValues(const Grid& grid);
  double& at(const BoundaryFace& f) { return side[static_cast<int>(f.side)][f.index]; }
  double at(const BoundaryFace& f) const { return side[static_cast<int>(f.side)][f.index]; }
};

}  // namespace wallrans
