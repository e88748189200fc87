// Boundary faces of the single block with their outward geometry, numbered once for all ranks.
#include "grid/boundary_faces.hpp"

namespace wallrans {

std::vector<BoundaryFace> domain_boundary_faces(const NodeCoordinates& nodes, bool periodic_x) {
  std::vector<BoundaryFace> faces;
  const int nx = nodes.cells_x, ny = nodes.cells_y;
  // Face normals as the grid computes them: (dy, -dx) towards +i along an edge running towards
  // +j, (-dy, dx) towards +j along an edge running towards +i; negated on the left and bottom.
  auto add = [&](Side side, int index, int i, int j, int i2, int j2, bool has_second, Vec2 a, Vec2 b) {
    const Vec2 edge = b - a;
    const bool along_x = side == Side::bottom || side == Side::top;
    const Vec2 towards_increasing = along_x ? Vec2{-edge.y, edge.x} : Vec2{edge.y, -edge.x};
    const bool outward_is_decreasing = side == Side::left || side == Side::bottom;
    BoundaryFace f;
    f.id = static_cast<int>(faces.size());
    f.i = i;
    f.j = j;
    f.i2 = i2;
    f.j2 = j2;
    f.has_second = has_second;
    f.area = outward_is_decreasing ? -1.0 * towards_increasing : towards_increasing;
    f.centre = 0.5 * (a + b);
    f.a = a;
    f.b = b;
    f.side = side;
    f.index = index;
    faces.push_back(f);
  };
  if (!periodic_x) {
    for (int j = 0; j < ny; ++j) add(Side::left, j, 0, j, 1, j, nx > 1, nodes.at(0, j), nodes.at(0, j + 1));
    for (int j = 0; j < ny; ++j)
      add(Side::right, j, nx - 1, j, nx - 2, j, nx > 1, nodes.at(nx, j), nodes.at(nx, j + 1));
  }
  for (int i = 0; i < nx; ++i) add(Side::bottom, i, i, 0, i, 1, ny > 1, nodes.at(i, 0), nodes.at(i + 1, 0));
  for (int i = 0; i < nx; ++i)
    add(Side::top, i, i, ny - 1, i, ny - 2, ny > 1, nodes.at(i, ny), nodes.at(i + 1, ny));
  return faces;
}

std::vector<BoundaryFace> owned_boundary_faces(const Grid& grid, const std::vector<BoundaryFace>& domain) {
  std::vector<BoundaryFace> owned;
  for (const BoundaryFace& f : domain) {
    if (f.i >= grid.x_begin() && f.i < grid.x_end() && f.j >= grid.y_begin() && f.j < grid.y_end())
      owned.push_back(f);
  }
  return owned;
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

}  // namespace wallrans
