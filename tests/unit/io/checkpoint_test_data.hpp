// Grid and known array values shared by test_checkpoint and its kill-writer tool, so the test can
// check a file against the defining functions instead of against numbers the writer produced.
#pragma once

#include <array>
#include <cmath>
#include <limits>
#include <vector>

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
inline double side_value(int k, int position) { return std::cos(0.7 * position + k) * (1.0 + k) + 0.125 * k; }

inline const std::array<const char*, 3> cell_names = {"u", "v", "nu_t"};
inline const std::array<Side, 4> sides = {Side::bottom, Side::top, Side::left, Side::right};
inline const std::array<const char*, 4> side_names = {"tau_bottom", "tau_top", "q_left", "q_right"};

inline int side_length(Side side) { return side == Side::bottom || side == Side::top ? nx : ny; }

/// Positions along `side` of this rank's boundary faces, [begin, end); empty if none (written
/// here from the definition, independently of the library's own bookkeeping).
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

/// The arrays a checkpoint in these tests holds: three cell fields and one array per side.
struct TestArrays {
  std::array<Field, 3> fields;
  std::array<std::vector<double>, 4> side_values;

  TestArrays(const Grid& grid, double initial)
      : fields{Field(grid, initial), Field(grid, initial), Field(grid, initial)} {
    for (size_t k = 0; k < sides.size(); ++k) side_values[k].assign(side_length(sides[k]), initial);
  }
  std::vector<CellArray> cells() {
    std::vector<CellArray> list;
    for (size_t k = 0; k < fields.size(); ++k) list.push_back({cell_names[k], &fields[k]});
    return list;
  }
  std::vector<SideArray> boundary() {
    std::vector<SideArray> list;
    for (size_t k = 0; k < sides.size(); ++k) list.push_back({side_names[k], sides[k], &side_values[k]});
    return list;
  }
};

/// Collective. Arrays holding the known values on owned cells (ghosts exchanged) and on this
/// rank's own boundary faces; every other side entry is NaN, so a writer that used it would show.
inline TestArrays known_arrays(const Grid& grid) {
  TestArrays arrays(grid, 0.0);
  for (size_t k = 0; k < arrays.fields.size(); ++k) {
    for (int j = grid.y_begin(); j < grid.y_end(); ++j) {
      for (int i = grid.x_begin(); i < grid.x_end(); ++i)
        arrays.fields[k](i, j) = cell_value(static_cast<int>(k), i, j);
    }
    arrays.fields[k].exchange();
  }
  for (size_t k = 0; k < sides.size(); ++k) {
    arrays.side_values[k].assign(side_length(sides[k]), not_set);
    const auto [begin, end] = owned_along(grid, sides[k]);
    for (int p = begin; p < end; ++p) arrays.side_values[k][p] = side_value(static_cast<int>(k), p);
  }
  return arrays;
}

}  // namespace wallrans::checkpoint_test
