// Exact distance from every cell centre to the nearest no-slip wall face, for the turbulence
// models that need d (see models/README.md). Walls are the straight boundary faces of kind wall.
#pragma once

#include <vector>

#include "core/case_spec.hpp"
#include "core/vec2.hpp"
#include "grid/boundary.hpp"
#include "grid/grid.hpp"
#include "meshes/node_coordinates.hpp"

namespace wallrans {

/// A straight no-slip wall face (segment a-b) of the whole domain, with a global id.
struct WallFace {
  Vec2 a, b;
  Side side;
  int index;  ///< position along the side: i for bottom/top, j for left/right
};

/// Euclidean distance [m] from point p to the closed segment a-b: p is projected onto the line
/// through a and b; if the foot a + t (b - a) has 0 < t < 1 the distance to the foot is returned,
/// otherwise the distance to the nearer end point (standard construction, e.g. Schneider & Eberly
/// 2003, Geometric Tools for Computer Graphics, ch. 6). The end points are used as given, not
/// recomputed from t, so two faces sharing a node give bit-identical distances where that node is
/// nearest (ties are then decided by face id). A degenerate segment (a = b) gives |p - a|.
inline double point_segment_distance(Vec2 p, Vec2 a, Vec2 b) {
  const Vec2 edge = b - a;
  const double length_squared = dot(edge, edge);
  const double along = dot(p - a, edge);  // t |b - a|^2
  if (along <= 0.0 || !(length_squared > 0.0)) return norm(p - a);
  if (along >= length_squared) return norm(p - b);
  return norm(p - (a + (along / length_squared) * edge));
}

/// Local (same result on every rank). Every boundary face of kind wall, in global boundary-face id
/// order (sides left, right, bottom, top; along each side by increasing index).
std::vector<WallFace> collect_wall_faces(const BoundaryMap& boundaries);

/// Wall distance of each cell of the ghosted range, stored in the ghosted layout (grid.local(i, j)).
struct WallDistance {
  Field distance;            ///< distance [m] to the nearest wall face; +infinity if there is none
  std::vector<int> nearest;  ///< position in `walls` of that face; -1 if there is none
};

/// Local (no communication): each rank works on its own ghosted range with the full wall list.
/// Exact distance from each ghosted cell centre to the nearest face of `walls` (point-to-segment
/// distance), and the id of that face; ties go to the smallest id. On an x-periodic grid the
/// walls are also taken shifted by plus and minus one period, so the distance is periodic and
/// correct for the translated periodic ghost cells. The search is pruned with a uniform grid of
/// buckets (about one per segment) and a ring-by-ring spiral search (Bentley, Weide & Yao 1980,
/// ACM TOMS 6:563-580); the result equals the all-pairs minimum. Without walls every cell gets
/// +infinity and id -1 (callers must reject models that need a wall).
WallDistance compute_wall_distance(const Grid& grid, const std::vector<WallFace>& walls);

}  // namespace wallrans
