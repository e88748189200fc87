// Boundary faces of the single block with their outward geometry, numbered once for all ranks.
#include "grid/boundary_faces.hpp"

namespace wallrans {

std::vector<BoundaryFace> domain_boundary_faces(const NodeCoordinates& nodes, bool periodic_x,
                                                const SolidCells& solid) {
  std::vector<BoundaryFace> faces;
  const int nx = nodes.cells_x, ny = nodes.cells_y;
  auto is_fluid = [&](int i, int j) {
    if (periodic_x) i = (i + nx) % nx;
    return i >= 0 && i < nx && j >= 0 && j < ny && !solid.is_solid(i, j);
  };
  // The face of owner cell (i, j) on `side`, whose end nodes a, b run in increasing grid index.
  // Face normals as the grid computes them: (dy, -dx) towards +i along an edge running towards
  // +j, (-dy, dx) towards +j along an edge running towards +i; negated on the left and bottom.
  // The second cell is the next one inwards, opposite the face.
  auto add = [&](Side side, int index, int i, int j, Vec2 a, Vec2 b, bool on_solid) {
    const Vec2 edge = b - a;
    const bool along_x = side == Side::bottom || side == Side::top;
    const Vec2 towards_increasing = along_x ? Vec2{-edge.y, edge.x} : Vec2{edge.y, -edge.x};
    const bool outward_is_decreasing = side == Side::left || side == Side::bottom;
    const int inward = outward_is_decreasing ? 1 : -1;
    BoundaryFace f;
    f.id = static_cast<int>(faces.size());
    f.i = i;
    f.j = j;
    f.i2 = along_x ? i : i + inward;
    f.j2 = along_x ? j + inward : j;
    f.has_second = is_fluid(f.i2, f.j2);
    f.area = outward_is_decreasing ? -1.0 * towards_increasing : towards_increasing;
    f.centre = 0.5 * (a + b);
    f.a = a;
    f.b = b;
    f.side = side;
    f.index = index;
    f.on_solid = on_solid;
    faces.push_back(f);
  };
  auto left = [&](int i, int j, bool on_solid) {
    add(Side::left, j, i, j, nodes.at(i, j), nodes.at(i, j + 1), on_solid);
  };
  auto right = [&](int i, int j, bool on_solid) {
    add(Side::right, j, i, j, nodes.at(i + 1, j), nodes.at(i + 1, j + 1), on_solid);
  };
  auto bottom = [&](int i, int j, bool on_solid) {
    add(Side::bottom, i, i, j, nodes.at(i, j), nodes.at(i + 1, j), on_solid);
  };
  auto top = [&](int i, int j, bool on_solid) {
    add(Side::top, i, i, j, nodes.at(i, j + 1), nodes.at(i + 1, j + 1), on_solid);
  };
  if (!periodic_x) {
    for (int j = 0; j < ny; ++j)
      if (is_fluid(0, j)) left(0, j, false);
    for (int j = 0; j < ny; ++j)
      if (is_fluid(nx - 1, j)) right(nx - 1, j, false);
  }
  for (int i = 0; i < nx; ++i)
    if (is_fluid(i, 0)) bottom(i, 0, false);
  for (int i = 0; i < nx; ++i)
    if (is_fluid(i, ny - 1)) top(i, ny - 1, false);
  if (!solid.any()) return faces;
  // A neighbour that exists and is solid makes the shared face a wall of the fluid cell.
  auto is_solid_neighbour = [&](int i, int j) {
    if (periodic_x) i = (i + nx) % nx;
    return i >= 0 && i < nx && j >= 0 && j < ny && solid.is_solid(i, j);
  };
  for (int j = 0; j < ny; ++j) {
    for (int i = 0; i < nx; ++i) {
      if (solid.is_solid(i, j)) continue;
      if (is_solid_neighbour(i - 1, j)) left(i, j, true);
      if (is_solid_neighbour(i + 1, j)) right(i, j, true);
      if (is_solid_neighbour(i, j - 1)) bottom(i, j, true);
      if (is_solid_neighbour(i, j + 1)) top(i, j, true);
    }
  }
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
