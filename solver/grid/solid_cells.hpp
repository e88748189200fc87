// Solid (blanked) cells of the single block: which cells the case's solid regions take out of the
// flow, checked once on every rank from the case and the node coordinates.
#pragma once

#include <string>
#include <vector>

#include "core/case_spec.hpp"
#include "grid/grid.hpp"
#include "meshes/node_coordinates.hpp"

namespace wallrans {

/// "<case file>:<line>" for messages about a case-file entry ("case" when built in code, no line
/// when 0).
std::string case_location(const CaseSpec& spec, int line);

class SolidCells {
 public:
  /// No solid cells.
  SolidCells() = default;
  /// Local (same on every rank). Marks the cells of spec.solid_regions (see SolidRegionSpec).
  /// Throws InputError naming the case file and the region's line when a region holds no cell,
  /// when no fluid cell is left, or when the fluid cells fall apart into regions that do not
  /// touch through a face (periodic sides joined), whose pressure level would be undetermined.
  SolidCells(const CaseSpec& spec, const NodeCoordinates& nodes);

  bool any() const { return n_solid_ > 0; }
  int count() const { return n_solid_; }
  /// Local. The first region (index into spec.solid_regions) holding cell (i, j), or -1 for a
  /// fluid cell; 0 <= i < cells_x, 0 <= j < cells_y.
  int region(int i, int j) const {
    return region_.empty() ? -1 : region_[static_cast<size_t>(j) * cells_x_ + i];
  }
  bool is_solid(int i, int j) const { return region(i, j) >= 0; }
  /// Local. 1 for each solid cell of the grid's ghosted range, else 0, indexed by grid.local(i, j)
  /// (periodic ghosts take the cell they wrap to); empty when there are no solid cells.
  std::vector<unsigned char> ghosted_mask(const Grid& grid) const;

 private:
  int cells_x_ = 0, cells_y_ = 0, n_solid_ = 0;
  std::vector<int> region_;  // per cell, j-major; empty when there are no solid regions
};

}  // namespace wallrans
