// Grid-quality figures reported by `wallrans check` and the run summary.
#pragma once

#include "grid/grid.hpp"

namespace wallrans {

struct GridQuality {
  double min_volume = 0;             ///< smallest cell area [m^2]
  double max_aspect_ratio = 0;       ///< largest ratio of a cell's longest to shortest face
  double max_non_orthogonality = 0;  ///< largest angle between face normal and centre-to-centre line [deg]
};

/// Collective.
GridQuality measure_quality(const Grid& grid);

}  // namespace wallrans
