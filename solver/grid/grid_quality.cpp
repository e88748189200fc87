#include "grid/grid_quality.hpp"

#include <algorithm>
#include <cmath>
#include <numbers>

namespace wallrans {

GridQuality measure_quality(const Grid& grid) {
  double min_volume = 1e300, max_aspect = 0.0, max_angle = 0.0;
  auto angle = [&](Vec2 s, Vec2 d) {
    const double c = std::clamp(dot(s, d) / (norm(s) * norm(d)), -1.0, 1.0);
    return std::acos(c) * 180.0 / std::numbers::pi;
  };
  for (int j = grid.y_begin(); j < grid.y_end(); ++j) {
    for (int i = grid.x_begin(); i < grid.x_end(); ++i) {
      min_volume = std::min(min_volume, grid.volume(i, j));
      const double faces[4] = {norm(grid.east_face(i, j).area), norm(grid.east_face(i - 1, j).area),
                               norm(grid.north_face(i, j).area), norm(grid.north_face(i, j - 1).area)};
      max_aspect =
          std::max(max_aspect, *std::max_element(faces, faces + 4) / *std::min_element(faces, faces + 4));
      if (grid.has_east(i))
        max_angle =
            std::max(max_angle, angle(grid.east_face(i, j).area, grid.centre(i + 1, j) - grid.centre(i, j)));
      if (grid.has_north(j))
        max_angle =
            std::max(max_angle, angle(grid.north_face(i, j).area, grid.centre(i, j + 1) - grid.centre(i, j)));
    }
  }
  return {-grid.global_max(-min_volume), grid.global_max(max_aspect), grid.global_max(max_angle)};
}

}  // namespace wallrans
