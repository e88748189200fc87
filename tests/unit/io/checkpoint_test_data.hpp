// Grid and known array values shared by test_checkpoint and its kill-writer tool, so the test can
// check a file against the defining functions instead of against numbers the writer produced.
#pragma once

#include <array>
#include <cmath>
#include <limits>
#include <utility>
#include <vector>

#include "core/case_spec.hpp"
#include "grid/grid.hpp"
#include "io/checkpoint.hpp"
#include "meshes/node_coordinates.hpp"

namespace wallrans::checkpoint_test {

constexpr int nx = 10, ny = 7;
constexpr double not_set = std::numeric_limits<double>::quiet_NaN();

inline NodeCoordinates test_nodes(int cells_x = nx, int cells_y = ny) {
  GridSpec spec;
  spec.generator = GridGenerator::skewed_box;
  spec.cells_x = cells_x;
  spec.cells_y = cells_y;
  spec.length = 2.0;
  spec.height = 1.5;
  spec.skew_amplitude = 0.05;
  return generate_nodes(spec);
}

// Distinct, non-symmetric doubles with full mantissas per (array k, i, j): a transposed or shifted
// order, or a float32 round trip, cannot pass.
inline double cell_value(int k, int i, int j) {
  return std::sin(0.37 * i + 1.11 * j + 0.5 * k) + 1e-3 * i * j + k;
}
inline double face_value(int k, int id) { return std::cos(0.7 * id + k) * (1.0 + k) + 0.125 * k; }

inline const std::array<const char*, 3> cell_names = {"u", "v", "nu_t"};
inline const std::array<const char*, 2> boundary_names = {"tau_wall", "q_face"};

// The tests' own numbering of the boundary faces, written here from the definition independently
// of the solver's: ids run along bottom, top, left, right, each by increasing position.
constexpr int n_faces = 2 * (nx + ny);  // of the default test grid
inline const std::array<Side, 4> sides_by_id = {Side::bottom, Side::top, Side::left, Side::right};

inline int side_length(const Grid& grid, Side side) {
  return side == Side::bottom || side == Side::top ? grid.cells_x() : grid.cells_y();
}

inline int face_id(const Grid& grid, Side side, int position) {
  int first = 0;
  for (const Side s : sides_by_id) {
    if (s == side) break;
    first += side_length(grid, s);
  }
  return first + position;
}

/// Positions along `side` of this rank's boundary faces, [begin, end); empty if none.
inline std::pair<int, int> owned_along(const Grid& grid, Side side) {
  switch (side) {
    case Side::bottom:
      return grid.y_begin() == 0 ? std::pair{grid.x_begin(), grid.x_end()} : std::pair{0, 0};
    case Side::top:
      return grid.y_end() == grid.cells_y() ? std::pair{grid.x_begin(), grid.x_end()} : std::pair{0, 0};
    case Side::left:
      return grid.x_begin() == 0 ? std::pair{grid.y_begin(), grid.y_end()} : std::pair{0, 0};
    case Side::right:
      return grid.x_end() == grid.cells_x() ? std::pair{grid.y_begin(), grid.y_end()} : std::pair{0, 0};
  }
  return {0, 0};
}

/// This rank's boundary faces, listed right, top, left, bottom with decreasing position within a
/// side, so the ids are not sorted and the library must order them itself.
inline BoundaryLayout face_layout(const Grid& grid) {
  BoundaryLayout layout;
  layout.n_faces = 2 * (grid.cells_x() + grid.cells_y());
  for (const Side side : {Side::right, Side::top, Side::left, Side::bottom}) {
    const auto [begin, end] = owned_along(grid, side);
    for (int p = end - 1; p >= begin; --p) layout.ids.push_back(face_id(grid, side, p));
  }
  return layout;
}

/// The arrays a checkpoint in these tests holds: three cell fields and two boundary arrays.
struct TestArrays {
  std::array<Field, 3> fields;
  BoundaryLayout layout;
  std::array<std::vector<double>, 2> face_values;

  TestArrays(const Grid& grid, double initial)
      : fields{Field(grid, initial), Field(grid, initial), Field(grid, initial)}, layout(face_layout(grid)) {
    for (auto& values : face_values) values.assign(layout.ids.size(), initial);
  }
  std::vector<CellArray> cells() {
    std::vector<CellArray> list;
    for (size_t k = 0; k < fields.size(); ++k) list.push_back({cell_names[k], &fields[k]});
    return list;
  }
  std::vector<BoundaryArray> boundary() {
    std::vector<BoundaryArray> list;
    for (size_t k = 0; k < face_values.size(); ++k) list.push_back({boundary_names[k], &face_values[k]});
    return list;
  }
};

/// Collective. Arrays holding the known values on owned cells (ghosts exchanged) and on this
/// rank's own boundary faces.
inline TestArrays known_arrays(const Grid& grid) {
  TestArrays arrays(grid, 0.0);
  for (size_t k = 0; k < arrays.fields.size(); ++k) {
    for (int j = grid.y_begin(); j < grid.y_end(); ++j) {
      for (int i = grid.x_begin(); i < grid.x_end(); ++i)
        arrays.fields[k](i, j) = cell_value(static_cast<int>(k), i, j);
    }
    arrays.fields[k].exchange();
  }
  for (size_t k = 0; k < arrays.face_values.size(); ++k) {
    for (size_t n = 0; n < arrays.layout.ids.size(); ++n)
      arrays.face_values[k][n] = face_value(static_cast<int>(k), arrays.layout.ids[n]);
  }
  return arrays;
}

}  // namespace wallrans::checkpoint_test
