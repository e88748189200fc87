// Grid-quality figures: cell areas, aspect and expansion ratios, non-orthogonality, and the
// first-cell heights along each wall segment.
#include "grid/grid_quality.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <numbers>

#include "meshes/cell_orientation.hpp"

namespace wallrans {

namespace {

// Local. Distance between the centres of the two faces of cell (i, j) that cross grid line i
// (along_i) or j; node() wraps i periodically.
double cell_width(const Grid& grid, int i, int j, bool along_i) {
  const auto mid = [&grid](int ia, int ja, int ib, int jb) {
    return 0.5 * (grid.node(ia, ja) + grid.node(ib, jb));
  };
  return along_i ? norm(mid(i + 1, j, i + 1, j + 1) - mid(i, j, i, j + 1))
                 : norm(mid(i, j + 1, i + 1, j + 1) - mid(i, j, i + 1, j));
}

double ratio(double a, double b) { return std::max(a / b, b / a); }

}  // namespace

GridQuality measure_quality(const Grid& grid) {
  double min_volume = 1e300, max_aspect = 0.0, max_angle = 0.0, max_expansion = 1.0;
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
      if (grid.has_east(i)) {
        max_angle =
            std::max(max_angle, angle(grid.east_face(i, j).area, grid.centre(i + 1, j) - grid.centre(i, j)));
        max_expansion =
            std::max(max_expansion, ratio(cell_width(grid, i, j, true), cell_width(grid, i + 1, j, true)));
      }
      if (grid.has_north(j)) {
        max_angle =
            std::max(max_angle, angle(grid.north_face(i, j).area, grid.centre(i, j + 1) - grid.centre(i, j)));
        max_expansion =
            std::max(max_expansion, ratio(cell_width(grid, i, j, false), cell_width(grid, i, j + 1, false)));
      }
    }
  }
  GridQuality quality;
  quality.min_volume = -grid.global_max(-min_volume);
  quality.max_aspect_ratio = grid.global_max(max_aspect);
  quality.max_non_orthogonality = grid.global_max(max_angle);
  quality.max_expansion_ratio = grid.global_max(max_expansion);
  return quality;
}

GridQuality measure_quality(const Grid& grid, const BoundaryMap& boundaries) {
  GridQuality quality = measure_quality(grid);
  // Every rank holds all nodes and all boundary faces, so this part needs no communication.
  std::vector<WallSpacing> by_segment(boundaries.segments().size());
  for (const BoundaryFace& face : boundaries.faces()) {
    if (boundaries.spec(face).kind != BoundaryKind::wall) continue;
    const double height = signed_cell_area(grid.nodes(), face.i, face.j) / norm(face.area);
    WallSpacing& wall = by_segment[face.segment];
    wall.min_height = wall.n_faces == 0 ? height : std::min(wall.min_height, height);
    wall.max_height = wall.n_faces == 0 ? height : std::max(wall.max_height, height);
    ++wall.n_faces;
  }
  for (size_t s = 0; s < by_segment.size(); ++s) {
    if (by_segment[s].n_faces == 0) continue;
    by_segment[s].segment = static_cast<int>(s);
    quality.walls.push_back(by_segment[s]);
  }
  return quality;
}

std::string quality_report(const GridQuality& quality, const BoundaryMap& boundaries) {
  char line[320];
  std::snprintf(
      line, sizeof line,
      "  grid quality: min cell area %.3e m^2, max aspect ratio %.1f, max non-orthogonality %.1f deg, "
      "max expansion ratio %.3f\n",
      quality.min_volume, quality.max_aspect_ratio, quality.max_non_orthogonality,
      quality.max_expansion_ratio);
  std::string text = line;
  for (const WallSpacing& wall : quality.walls) {
    const BoundarySegmentSpec& segment = boundaries.segments()[wall.segment];
    const std::string name = segment.patch.empty() ? "side " + std::string(to_string(segment.side))
                                                   : "patch '" + segment.patch + "'";
    std::snprintf(line, sizeof line,
                  "  first-cell height on wall boundaries[%d] (%s, %d faces): %.3e to %.3e m\n", wall.segment,
                  name.c_str(), wall.n_faces, wall.min_height, wall.max_height);
    text += line;
  }
  return text;
}

}  // namespace wallrans
