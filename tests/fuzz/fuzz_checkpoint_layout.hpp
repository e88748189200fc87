// The grid and arrays the checkpoint fuzz target reads, shared with the seed writer, so seed
// checkpoints match what the target asks for.
#pragma once

#include <string>
#include <vector>

#include "meshes/node_coordinates.hpp"

namespace wallrans::fuzz {

inline constexpr int checkpoint_cells_x = 4;
inline constexpr int checkpoint_cells_y = 3;
/// Boundary faces of the block: two sides of each direction.
inline constexpr int checkpoint_faces = 2 * (checkpoint_cells_x + checkpoint_cells_y);

inline const std::vector<std::string> checkpoint_cell_arrays{"u", "v", "p"};
inline const std::vector<std::string> checkpoint_boundary_arrays{"flux"};

/// Local. Nodes of a unit square with slightly stretched rows (a non-uniform fingerprint).
inline NodeCoordinates checkpoint_nodes() {
  NodeCoordinates nodes;
  nodes.cells_x = checkpoint_cells_x;
  nodes.cells_y = checkpoint_cells_y;
  for (int j = 0; j <= checkpoint_cells_y; ++j) {
    for (int i = 0; i <= checkpoint_cells_x; ++i) {
      const double eta = static_cast<double>(j) / checkpoint_cells_y;
      nodes.nodes.push_back({static_cast<double>(i) / checkpoint_cells_x, eta * eta});
    }
  }
  return nodes;
}

}  // namespace wallrans::fuzz
