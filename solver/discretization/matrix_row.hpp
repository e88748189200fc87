// The one place where the finite-volume equations write their matrices: the row of one owned cell
// of a 5-point operator on the grid's DMDA.
#pragma once

#include "grid/grid.hpp"
#include "linear/stencil_matrix.hpp"

namespace wallrans {

/// The row of one owned cell: the diagonal and the signed off-diagonal entries of its face
/// neighbours (entries of neighbours that do not exist are ignored).
struct MatrixRow {
  double centre = 0.0;
  double east = 0.0, west = 0.0, north = 0.0, south = 0.0;
};

/// Local: adds `row` to row (i, j) of a fill of a StencilMatrix (a fill starts from zeros, so
/// a row written once is set); a neighbour across a non-periodic domain side is left out. Adding
/// also covers a periodic direction of 2 cells, where the east and west neighbour are one cell.
inline void write_row(const Grid& grid, StencilMatrix::Fill& fill, int i, int j, const MatrixRow& row) {
  const size_t o = grid.owned(i, j);
  fill.add(o, StencilSlot::centre, row.centre);
  if (grid.has_east(i)) fill.add(o, StencilSlot::east, row.east);
  if (grid.has_west(i)) fill.add(o, StencilSlot::west, row.west);
  if (grid.has_north(j)) fill.add(o, StencilSlot::north, row.north);
  if (grid.has_south(j)) fill.add(o, StencilSlot::south, row.south);
}

}  // namespace wallrans
