// Matrix rows (written into a StencilMatrix) land on the cell and its existing face neighbours: a row of 4 on
// the diagonal and -1 per neighbour, applied to the cells' global indices, gives 4 x_P minus the neighbours'
// indices; across a periodic side the neighbour is the cell on the other side.
#include <gtest/gtest.h>
#include <petscdmda.h>

#include "core/error.hpp"
#include "discretization/matrix_row.hpp"
#include "linear/petsc_handles.hpp"
#include "meshes/node_coordinates.hpp"

using namespace wallrans;

namespace {

void check_row_sums(bool periodic) {
  GridSpec spec;
  spec.generator = GridGenerator::channel;
  spec.cells_x = 5;
  spec.cells_y = 4;
  spec.length = 2.0;
  spec.first_cell_height = 0.05;
  Grid grid(MPI_COMM_WORLD, generate_nodes(spec), periodic);
  StencilMatrix a(grid.dm());
  StencilMatrix::Fill fill = a.begin_fill();
  for (int j = grid.y_begin(); j < grid.y_end(); ++j) {
    for (int i = grid.x_begin(); i < grid.x_end(); ++i) {
      MatrixRow row;
      row.centre = 4.0;
      row.east = row.west = row.north = row.south = -1.0;
      write_row(grid, fill, i, j, row);
    }
  }
  fill.end();
  // x = global index of the cell: (A x)_P = 4 x_P - sum of the neighbours' indices.
  OwnedVec x, y;
  check_petsc(DMCreateGlobalVector(grid.dm(), x.out()));
  check_petsc(DMCreateGlobalVector(grid.dm(), y.out()));
  PetscScalar** xa = nullptr;
  check_petsc(DMDAVecGetArray(grid.dm(), x.get(), &xa));
  for (int j = grid.y_begin(); j < grid.y_end(); ++j)
    for (int i = grid.x_begin(); i < grid.x_end(); ++i) xa[j][i] = j * spec.cells_x + i;
  check_petsc(DMDAVecRestoreArray(grid.dm(), x.get(), &xa));
  check_petsc(MatMult(a.mat(), x.get(), y.get()));
  PetscScalar** ya = nullptr;
  check_petsc(DMDAVecGetArray(grid.dm(), y.get(), &ya));
  const int nx = spec.cells_x;
  for (int j = grid.y_begin(); j < grid.y_end(); ++j) {
    for (int i = grid.x_begin(); i < grid.x_end(); ++i) {
      double expected = 4.0 * (j * nx + i);
      if (i + 1 < nx || periodic) expected -= j * nx + (i + 1) % nx;
      if (i > 0 || periodic) expected -= j * nx + (i + nx - 1) % nx;
      if (j + 1 < spec.cells_y) expected -= (j + 1) * nx + i;
      if (j > 0) expected -= (j - 1) * nx + i;
      EXPECT_DOUBLE_EQ(ya[j][i], expected) << i << ", " << j;
    }
  }
  check_petsc(DMDAVecRestoreArray(grid.dm(), y.get(), &ya));
}

}  // namespace

TEST(MatrixRow, NeighboursOfBoundedGrid) { check_row_sums(false); }
TEST(MatrixRow, NeighboursAcrossPeriodicSide) { check_row_sums(true); }
