// The one place where the finite-volume equations write their matrices: the row of one owned cell
// of a 5-point operator on the grid's DMDA.
#pragma once

#include <petscdmda.h>

#include "core/error.hpp"
#include "grid/grid.hpp"

namespace wallrans {

/// The row of one owned cell: the diagonal and the signed off-diagonal entries of its face
/// neighbours (entries of neighbours that do not exist are ignored).
struct MatrixRow {
  double centre = 0.0;
  double east = 0.0, west = 0.0, north = 0.0, south = 0.0;
};

/// Local: writes `row` as row (i, j) of the DMDA matrix `a` (INSERT_VALUES or ADD_VALUES); a
/// neighbour across a non-periodic domain side is left out.
inline void write_row(const Grid& grid, Mat a, int i, int j, const MatrixRow& row, InsertMode mode) {
  MatStencil cols[5];
  double vals[5];
  cols[0] = MatStencil{0, j, i, 0};
  vals[0] = row.centre;
  int n = 1;
  auto neighbour = [&](int in, int jn, double value) {
    cols[n] = MatStencil{0, jn, in, 0};
    vals[n++] = value;
  };
  if (grid.has_east(i)) neighbour(i + 1, j, row.east);
  if (grid.has_west(i)) neighbour(i - 1, j, row.west);
  if (grid.has_north(j)) neighbour(i, j + 1, row.north);
  if (grid.has_south(j)) neighbour(i, j - 1, row.south);
  check_petsc(MatSetValuesStencil(a, 1, &cols[0], n, cols, vals, mode));
}

}  // namespace wallrans
