// Grid-quality figures reported by `wallrans check` and when a grid is loaded from a file.
#pragma once

#include <string>
#include <vector>

#include "grid/boundary.hpp"
#include "grid/grid.hpp"

namespace wallrans {

/// First-cell heights along one wall segment.
struct WallSpacing {
  int segment = -1;  ///< index into BoundaryMap::segments()
  int n_faces = 0;
  double min_height = 0, max_height = 0;  ///< cell area / wall face length [m]
};

struct GridQuality {
  double min_volume = 0;             ///< smallest cell area [m^2]
  double max_aspect_ratio = 0;       ///< largest ratio of a cell's longest to shortest face
  double max_non_orthogonality = 0;  ///< largest angle between face normal and centre-to-centre line [deg]
  /// Largest ratio of the widths of two neighbouring cells along a grid line (>= 1); a cell's
  /// width along i is the distance between the centres of its west and east faces.
  double max_expansion_ratio = 0;
  std::vector<WallSpacing> walls;  ///< one per wall segment, in segment order
};

/// Collective. The figures over all cells; `walls` stays empty.
GridQuality measure_quality(const Grid& grid);

/// Collective. As above, with `walls` from the wall faces of `boundaries`.
GridQuality measure_quality(const Grid& grid, const BoundaryMap& boundaries);

/// Local. The figures as indented lines for the terminal (each ends with '\n'): one line of cell
/// figures, then one line per wall segment naming it (its patch, or side and case-file line).
std::string quality_report(const GridQuality& quality, const BoundaryMap& boundaries);

}  // namespace wallrans
