// StencilMatrix: a direct fill gives the same matrix as MatSetValuesStencil and assembly, entry
// by entry and in products, and solvers set up from the old values see the new ones.
#include <gtest/gtest.h>
#include <petscdmda.h>
#include <petscksp.h>

#include <algorithm>
#include <cstdint>
#include <cstdio>
#include <string>
#include <vector>

#include "core/error.hpp"
#include "grid/grid.hpp"
#include "linear/petsc_handles.hpp"
#include "linear/stencil_matrix.hpp"

using namespace wallrans;

namespace {

struct GridCase {
  int cells_x, cells_y;
  bool periodic_x;
};

// 13 x 9 closed, 12 x 7 periodic in x, and 2 x 6 periodic, where west and east are one cell.
const GridCase closed_case{13, 9, false}, periodic_case{12, 7, true}, two_cell_periodic_case{2, 6, true};

NodeCoordinates uniform_nodes(int cells_x, int cells_y) {
  NodeCoordinates nodes;
  nodes.cells_x = cells_x;
  nodes.cells_y = cells_y;
  for (int j = 0; j <= cells_y; ++j) {
    for (int i = 0; i <= cells_x; ++i) nodes.nodes.push_back({double(i) / cells_x, double(j) / cells_y});
  }
  return nodes;
}

// A number in [0, 1) from a key (splitmix64 finaliser), so values depend on the global cell and
// not on the rank count.
double hashed_unit(std::uint64_t key) {
  key += 0x9e3779b97f4a7c15ULL;
  key = (key ^ (key >> 30)) * 0xbf58476d1ce4e5b9ULL;
  key = (key ^ (key >> 27)) * 0x94d049bb133111ebULL;
  key ^= key >> 31;
  return double(key >> 11) * 0x1.0p-53;
}

bool slot_exists(const Grid& grid, int i, int j, int slot) {
  switch (StencilSlot(slot)) {
    case StencilSlot::centre:
      return true;
    case StencilSlot::west:
      return grid.has_west(i);
    case StencilSlot::east:
      return grid.has_east(i);
    case StencilSlot::south:
      return grid.has_south(j);
    case StencilSlot::north:
      return grid.has_north(j);
  }
  return false;
}

// Row values of round `round`: neighbours -c with c in [0.1, 1.1), the centre their sum plus
// [0.5, 1.5), so the operator is a nonsymmetric M-matrix that every preconditioner here accepts.
void row_values(const Grid& grid, int i, int j, int round, double values[n_stencil_slots]) {
  double sum = 0.0;
  for (int s = 1; s < n_stencil_slots; ++s) {
    const std::uint64_t key = ((std::uint64_t(round) * 4096 + j) * 4096 + i) * 8 + s;
    values[s] = slot_exists(grid, i, j, s) ? -(0.1 + hashed_unit(key)) : 0.0;
    sum -= values[s];
  }
  values[0] = sum + 0.5 + hashed_unit((std::uint64_t(round) * 4096 + j) * 4096 + i);
}

// A partial round writes only some entries; the others must come out zero.
bool is_written(int i, int j, int slot, bool is_partial) {
  return !is_partial || slot == 0 || (i + 2 * j + slot) % 3 != 0;
}

enum class Write { set, add };

void fill_direct(StencilMatrix& matrix, const Grid& grid, int round, bool is_partial, Write write) {
  StencilMatrix::Fill fill = matrix.begin_fill();
  for (int j = grid.y_begin(); j < grid.y_end(); ++j) {
    for (int i = grid.x_begin(); i < grid.x_end(); ++i) {
      const size_t o = grid.owned(i, j);
      double values[n_stencil_slots];
      row_values(grid, i, j, round, values);
      for (int s = 0; s < n_stencil_slots; ++s) {
        if (!slot_exists(grid, i, j, s) || !is_written(i, j, s, is_partial)) continue;
        if (write == Write::set) {
          fill.set(o, StencilSlot(s), values[s]);
        } else {
          fill.add(o, StencilSlot(s), values[s]);
        }
      }
    }
  }
  fill.end();
}

// The assembly the solver does today: zero, one MatSetValuesStencil per row, assemble.
void fill_reference(Mat matrix, const Grid& grid, int round, bool is_partial, Write write) {
  check_petsc(MatZeroEntries(matrix));
  for (int j = grid.y_begin(); j < grid.y_end(); ++j) {
    for (int i = grid.x_begin(); i < grid.x_end(); ++i) {
      double values[n_stencil_slots];
      row_values(grid, i, j, round, values);
      const MatStencil row{0, j, i, 0};
      MatStencil cols[n_stencil_slots];
      PetscScalar vals[n_stencil_slots];
      const int di[n_stencil_slots] = {0, -1, 1, 0, 0}, dj[n_stencil_slots] = {0, 0, 0, -1, 1};
      int n = 0;
      for (int s = 0; s < n_stencil_slots; ++s) {
        if (!slot_exists(grid, i, j, s) || !is_written(i, j, s, is_partial)) continue;
        cols[n] = MatStencil{0, j + dj[s], i + di[s], 0};
        vals[n++] = values[s];
      }
      check_petsc(MatSetValuesStencil(matrix, 1, &row, n, cols, vals,
                                      write == Write::set ? INSERT_VALUES : ADD_VALUES));
    }
  }
  check_petsc(MatAssemblyBegin(matrix, MAT_FINAL_ASSEMBLY));
  check_petsc(MatAssemblyEnd(matrix, MAT_FINAL_ASSEMBLY));
}

void fill_vector(Vec v, std::uint64_t seed) {
  PetscInt begin = 0, end = 0;
  check_petsc(VecGetOwnershipRange(v, &begin, &end));
  PetscScalar* values = nullptr;
  check_petsc(VecGetArray(v, &values));
  for (PetscInt k = begin; k < end; ++k) values[k - begin] = hashed_unit(seed * 1000003 + k) - 0.5;
  check_petsc(VecRestoreArray(v, &values));
}

double relative_difference(Vec a, Vec reference) {
  OwnedVec difference;
  check_petsc(VecDuplicate(reference, difference.out()));
  check_petsc(VecWAXPY(difference.get(), -1.0, a, reference));
  PetscReal norm_difference = 0.0, norm_reference = 0.0;
  check_petsc(VecNorm(difference.get(), NORM_2, &norm_difference));
  check_petsc(VecNorm(reference, NORM_2, &norm_reference));
  return norm_difference / norm_reference;
}

// Equal entry by entry (values compared bitwise), and equal products with a vector.
void expect_same_matrix(Mat direct, Mat reference) {
  PetscBool is_equal = PETSC_FALSE;
  check_petsc(MatEqual(direct, reference, &is_equal));
  EXPECT_TRUE(is_equal);
  OwnedMat difference;
  check_petsc(MatDuplicate(reference, MAT_COPY_VALUES, difference.out()));
  check_petsc(MatAXPY(difference.get(), -1.0, direct, SAME_NONZERO_PATTERN));
  PetscReal norm = -1.0, norm_reference = 0.0;
  check_petsc(MatNorm(difference.get(), NORM_FROBENIUS, &norm));
  check_petsc(MatNorm(reference, NORM_FROBENIUS, &norm_reference));
  EXPECT_EQ(norm, 0.0);
  EXPECT_GT(norm_reference, 0.0);

  OwnedVec x, y_direct, y_reference;
  check_petsc(MatCreateVecs(reference, x.out(), y_reference.out()));
  check_petsc(VecDuplicate(y_reference.get(), y_direct.out()));
  fill_vector(x.get(), 7);
  check_petsc(MatMult(direct, x.get(), y_direct.get()));
  check_petsc(MatMult(reference, x.get(), y_reference.get()));
  EXPECT_EQ(relative_difference(y_direct.get(), y_reference.get()), 0.0);
}

void expect_direct_fill_equals_reference(const GridCase& c, Write write) {
  SCOPED_TRACE(std::to_string(c.cells_x) + " x " + std::to_string(c.cells_y) +
               (c.periodic_x ? " periodic" : " closed") + (write == Write::set ? ", set" : ", add"));
  const Grid grid(MPI_COMM_WORLD, uniform_nodes(c.cells_x, c.cells_y), c.periodic_x);
  StencilMatrix direct(grid.dm());
  OwnedMat reference;
  check_petsc(DMCreateMatrix(grid.dm(), reference.out()));
  for (int round = 1; round <= 3; ++round) {
    const bool is_partial = round == 2;  // after a full round: entries not written must be zero
    fill_direct(direct, grid, round, is_partial, write);
    fill_reference(reference.get(), grid, round, is_partial, write);
    expect_same_matrix(direct.mat(), reference.get());
  }
}

// A solver with one preconditioner. With KSPPREONLY the answer is the preconditioner applied to
// b, so a preconditioner still built from old values gives a different answer.
class Solver {
 public:
  Solver(const char* pc_type, bool is_preonly) {
    check_petsc(KSPCreate(MPI_COMM_WORLD, ksp_.out()));
    check_petsc(KSPSetType(ksp_.get(), is_preonly ? KSPPREONLY : KSPGMRES));
    if (!is_preonly) check_petsc(KSPSetTolerances(ksp_.get(), 1e-12, 1e-50, PETSC_DEFAULT, 1000));
    PC pc = nullptr;
    check_petsc(KSPGetPC(ksp_.get(), &pc));
    check_petsc(PCSetType(pc, pc_type));
    if (std::string(pc_type) == PCHYPRE) check_petsc(PCHYPRESetType(pc, "boomeramg"));
  }
  void solve(Mat a, Vec b, Vec x) {
    check_petsc(KSPSetOperators(ksp_.get(), a, a));
    check_petsc(KSPSolve(ksp_.get(), b, x));
    KSPConvergedReason reason = KSP_CONVERGED_ITERATING;
    check_petsc(KSPGetConvergedReason(ksp_.get(), &reason));
    EXPECT_GT(reason, 0);
  }

 private:
  OwnedKsp ksp_;
};

void expect_solvers_see_new_values(const GridCase& c, const char* pc_type, bool is_preonly) {
  SCOPED_TRACE(std::string(pc_type) + (is_preonly ? " preonly" : " gmres") +
               (c.periodic_x ? " periodic" : ""));
  const Grid grid(MPI_COMM_WORLD, uniform_nodes(c.cells_x, c.cells_y), c.periodic_x);
  StencilMatrix direct(grid.dm());
  OwnedMat reference;
  check_petsc(DMCreateMatrix(grid.dm(), reference.out()));
  OwnedVec b, x_direct, x_reference, x_old;
  check_petsc(DMCreateGlobalVector(grid.dm(), b.out()));
  check_petsc(VecDuplicate(b.get(), x_direct.out()));
  check_petsc(VecDuplicate(b.get(), x_reference.out()));
  check_petsc(VecDuplicate(b.get(), x_old.out()));
  fill_vector(b.get(), 11);
  Solver solver_direct(pc_type, is_preonly), solver_reference(pc_type, is_preonly);

  fill_direct(direct, grid, 1, false, Write::set);
  fill_reference(reference.get(), grid, 1, false, Write::set);
  solver_direct.solve(direct.mat(), b.get(), x_direct.get());
  solver_reference.solve(reference.get(), b.get(), x_old.get());
  EXPECT_LE(relative_difference(x_direct.get(), x_old.get()), 1e-13);

  fill_direct(direct, grid, 2, false, Write::set);
  fill_reference(reference.get(), grid, 2, false, Write::set);
  solver_direct.solve(direct.mat(), b.get(), x_direct.get());
  solver_reference.solve(reference.get(), b.get(), x_reference.get());
  // Same operator and preconditioner on both sides: equal to rounding.
  EXPECT_LE(relative_difference(x_direct.get(), x_reference.get()), 1e-13);
  // The test can fail: the answer of the old values is far from the new one.
  EXPECT_GE(relative_difference(x_old.get(), x_reference.get()), 1e-2);
}

}  // namespace

TEST(StencilMatrix, EntriesFollowTheGridNeighboursAndStartAtZero) {
  for (const GridCase& c : {closed_case, periodic_case, two_cell_periodic_case}) {
    const Grid grid(MPI_COMM_WORLD, uniform_nodes(c.cells_x, c.cells_y), c.periodic_x);
    const StencilMatrix matrix(grid.dm());
    ASSERT_EQ(matrix.n_owned(), grid.n_owned());
    for (int j = grid.y_begin(); j < grid.y_end(); ++j) {
      for (int i = grid.x_begin(); i < grid.x_end(); ++i) {
        for (int s = 0; s < n_stencil_slots; ++s) {
          EXPECT_EQ(matrix.has_entry(grid.owned(i, j), StencilSlot(s)), slot_exists(grid, i, j, s));
        }
      }
    }
    PetscReal norm = -1.0;
    check_petsc(MatNorm(matrix.mat(), NORM_FROBENIUS, &norm));
    EXPECT_EQ(norm, 0.0);
  }
}

TEST(StencilMatrix, DirectFillEqualsStencilAssembly) {
  expect_direct_fill_equals_reference(closed_case, Write::set);
  expect_direct_fill_equals_reference(closed_case, Write::add);
  expect_direct_fill_equals_reference(periodic_case, Write::set);
  expect_direct_fill_equals_reference(periodic_case, Write::add);
  // West and east share one entry: their couplings add up, as with ADD_VALUES.
  expect_direct_fill_equals_reference(two_cell_periodic_case, Write::add);
}

TEST(StencilMatrix, SolversSetUpFromOldValuesSeeTheNewValues) {
  for (const GridCase& c : {closed_case, periodic_case}) {
    for (const char* pc_type : {PCJACOBI, PCSOR, PCBJACOBI, PCHYPRE})
      expect_solvers_see_new_values(c, pc_type, true);
    expect_solvers_see_new_values(c, PCBJACOBI, false);
  }
}

TEST(StencilMatrix, FindsItsEntriesWhenTheDmOnlyPreallocates) {
  // Such a DM inserts no pattern, and every assembly squeezes out the unused preallocation.
  for (const GridCase& c : {closed_case, two_cell_periodic_case}) {
    const Grid grid(MPI_COMM_WORLD, uniform_nodes(c.cells_x, c.cells_y), c.periodic_x);
    check_petsc(DMSetMatrixPreallocateOnly(grid.dm(), PETSC_TRUE));
    StencilMatrix direct(grid.dm());
    OwnedMat reference;
    check_petsc(DMCreateMatrix(grid.dm(), reference.out()));
    fill_direct(direct, grid, 1, false, Write::add);
    fill_reference(reference.get(), grid, 1, false, Write::add);
    expect_same_matrix(direct.mat(), reference.get());
  }
}

TEST(StencilMatrix, RejectsADmdaWithTwoUnknownsPerCell) {
  OwnedDm dm;
  check_petsc(DMDACreate2d(MPI_COMM_WORLD, DM_BOUNDARY_NONE, DM_BOUNDARY_NONE, DMDA_STENCIL_STAR, 6, 6,
                           PETSC_DECIDE, PETSC_DECIDE, 2, 1, nullptr, nullptr, dm.out()));
  check_petsc(DMSetUp(dm.get()));
  EXPECT_THROW(StencilMatrix matrix(dm.get()), Error);
}

// Not a pass/fail check: prints the time of one fill of a 1000 x 1000 grid both ways (the
// slowest rank's time, best of five).
TEST(StencilMatrix, FillTimeOn1000By1000Grid) {
  const Grid grid(MPI_COMM_WORLD, uniform_nodes(1000, 1000), false);
  check_mpi(MPI_Barrier(grid.comm()));
  double start = MPI_Wtime();
  StencilMatrix direct(grid.dm());
  const double construction = grid.global_max(MPI_Wtime() - start);
  OwnedMat reference;
  check_mpi(MPI_Barrier(grid.comm()));
  start = MPI_Wtime();
  check_petsc(DMCreateMatrix(grid.dm(), reference.out()));
  const double creation = grid.global_max(MPI_Wtime() - start);

  std::vector<double> values(n_stencil_slots * grid.n_owned());
  for (int j = grid.y_begin(); j < grid.y_end(); ++j) {
    for (int i = grid.x_begin(); i < grid.x_end(); ++i) {
      row_values(grid, i, j, 1, &values[n_stencil_slots * grid.owned(i, j)]);
    }
  }
  const int di[n_stencil_slots] = {0, -1, 1, 0, 0}, dj[n_stencil_slots] = {0, 0, 0, -1, 1};
  double best_reference = 1e30, best_direct = 1e30;
  for (int repeat = 0; repeat < 5; ++repeat) {
    check_mpi(MPI_Barrier(grid.comm()));
    start = MPI_Wtime();
    check_petsc(MatZeroEntries(reference.get()));
    for (int j = grid.y_begin(); j < grid.y_end(); ++j) {
      for (int i = grid.x_begin(); i < grid.x_end(); ++i) {
        const double* cell_values = &values[n_stencil_slots * grid.owned(i, j)];
        const MatStencil row{0, j, i, 0};
        MatStencil cols[n_stencil_slots];
        PetscScalar vals[n_stencil_slots];
        int n = 0;
        for (int s = 0; s < n_stencil_slots; ++s) {
          if (!slot_exists(grid, i, j, s)) continue;
          cols[n] = MatStencil{0, j + dj[s], i + di[s], 0};
          vals[n++] = cell_values[s];
        }
        check_petsc(MatSetValuesStencil(reference.get(), 1, &row, n, cols, vals, INSERT_VALUES));
      }
    }
    check_petsc(MatAssemblyBegin(reference.get(), MAT_FINAL_ASSEMBLY));
    check_petsc(MatAssemblyEnd(reference.get(), MAT_FINAL_ASSEMBLY));
    best_reference = std::min(best_reference, grid.global_max(MPI_Wtime() - start));

    check_mpi(MPI_Barrier(grid.comm()));
    start = MPI_Wtime();
    {
      StencilMatrix::Fill fill = direct.begin_fill();
      for (int j = grid.y_begin(); j < grid.y_end(); ++j) {
        for (int i = grid.x_begin(); i < grid.x_end(); ++i) {
          const size_t o = grid.owned(i, j);
          const double* cell_values = &values[n_stencil_slots * o];
          for (int s = 0; s < n_stencil_slots; ++s) {
            if (slot_exists(grid, i, j, s)) fill.set(o, StencilSlot(s), cell_values[s]);
          }
        }
      }
      fill.end();
    }
    best_direct = std::min(best_direct, grid.global_max(MPI_Wtime() - start));
  }
  expect_same_matrix(direct.mat(), reference.get());
  int n_ranks = 1;
  check_mpi(MPI_Comm_size(grid.comm(), &n_ranks));
  if (grid.rank() == 0) {
    std::printf(
        "StencilMatrix 1000 x 1000 on %d rank(s): construction %.1f ms (DMCreateMatrix alone %.1f ms); one "
        "fill: MatSetValuesStencil + assembly %.2f ms, direct %.2f ms (%.1fx)\n",
        n_ranks, 1e3 * construction, 1e3 * creation, 1e3 * best_reference, 1e3 * best_direct,
        best_reference / best_direct);
  }
}
