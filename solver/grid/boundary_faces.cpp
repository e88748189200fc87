// Boundary faces of owned cells with their outward geometry.
#include "grid/boundary_faces.hpp"

namespace wallrans {

std::vector<BoundaryFace> owned_boundary_faces(const Grid& grid) {
  std::vector<BoundaryFace> faces;
  const int nx = grid.cells_x(), ny = grid.cells_y();
  if (!grid.periodic_x()) {
    if (grid.x_begin() == 0) {
      for (int j = grid.y_begin(); j < grid.y_end(); ++j) {
        const auto& g = grid.east_face(-1, j);
        faces.push_back({Side::left, j, 0, j, 1, j, nx > 1, -1.0 * g.area, g.centre});
      }
    }
    if (grid.x_end() == nx) {
      for (int j = grid.y_begin(); j < grid.y_end(); ++j) {
        const auto& g = grid.east_face(nx - 1, j);
        faces.push_back({Side::right, j, nx - 1, j, nx - 2, j, nx > 1, g.area, g.centre});
      }
    }
  }
  if (grid.y_begin() == 0) {
    for (int i = grid.x_begin(); i < grid.x_end(); ++i) {
      const auto& g = grid.north_face(i, -1);
      faces.push_back({Side::bottom, i, i, 0, i, 1, ny > 1, -1.0 * g.area, g.centre});
    }
  }
  if (grid.y_end() == ny) {
    for (int i = grid.x_begin(); i < grid.x_end(); ++i) {
      const auto& g = grid.north_face(i, ny - 1);
      faces.push_back({Side::top, i, i, ny - 1, i, ny - 2, ny > 1, g.area, g.centre});
    }
  }
  return faces;
}

std::vector<std::array<int, 4>> boundary_faces_by_cell(const Grid& grid,
                                                       const std::vector<BoundaryFace>& faces) {
  std::vector<std::array<int, 4>> by_cell(grid.n_owned(), {-1, -1, -1, -1});
  for (size_t k = 0; k < faces.size(); ++k) {
    for (int& slot : by_cell[grid.owned(faces[k].i, faces[k].j)]) {
      if (slot < 0) {
        slot = static_cast<int>(k);
        break;
      }
    }
  }
  return by_cell;
}

BoundaryValues::BoundaryValues(const Grid& grid) {
  side[static_cast<int>(Side::left)].assign(grid.cells_y(), 0.0);
  side[static_cast<int>(Side::right)].assign(grid.cells_y(), 0.0);
  side[static_cast<int>(Side::bottom)].assign(grid.cells_x(), 0.0);
  side[static_cast<int>(Side::top)].assign(grid.cells_x(), 0.0);
}

}  // namespace wallrans
