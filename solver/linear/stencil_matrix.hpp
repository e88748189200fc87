// A DMDA matrix of a 5-point operator whose values are written straight into its CSR storage:
// the position of every stencil entry is found once, so a refill needs no MatSetValuesStencil,
// no assembly and no search of column indices.
#pragma once

#include <petscdm.h>
#include <petscmat.h>

#include <cassert>
#include <cstddef>
#include <vector>

#include "linear/petsc_handles.hpp"

namespace wallrans {

/// The entries of the row of owned cell (i, j): the cell itself and its four face neighbours.
enum class StencilSlot : int { centre = 0, west = 1, east = 2, south = 3, north = 4 };
inline constexpr int n_stencil_slots = 5;

/// Owns the matrix of a 2-D DMDA with one dof (seq AIJ on one rank, MPI AIJ on several) and
/// the map from (owned cell, slot) to the entry's place in the value arrays of the matrix
/// block(s). The nonzero pattern never changes (new locations are an error).
///
/// Rows are addressed by the owned index of the cell, (j - y_begin) * x_width + (i - x_begin)
/// over the DMDA corners, which is `Grid::owned(i, j)`. A neighbour outside a non-periodic side
/// has no entry; across a periodic side it is the cell on the other side. Where two slots meet
/// the same column (periodic with 2 cells: west and east are the same cell) they share one
/// entry, so write those couplings with `add`.
///
///   StencilMatrix a(grid.dm());
///   StencilMatrix::Fill fill = a.begin_fill();      // all values start at zero
///   fill.set(o, StencilSlot::centre, a_p);
///   if (grid.has_west(i)) fill.add(o, StencilSlot::west, -a_w);
///   fill.end();                                     // solvers now see the new values
///   KSPSetOperators(ksp, a.mat(), a.mat());
class StencilMatrix {
 public:
  class Fill;

  /// Collective on dm. Creates the matrix with DMCreateMatrix and locates every stencil entry.
  /// Throws Error if dm is not a 2-D DMDA with one dof and stencil width >= 1, if the matrix is
  /// not plain AIJ (e.g. -dm_mat_type baij), or if an entry cannot be located exactly once.
  explicit StencilMatrix(DM dm);

  /// The matrix (owned by this object); all values are zero until the first fill.
  Mat mat() const { return mat_.get(); }
  std::size_t n_owned() const { return n_owned_; }
  /// Local: true if row `owned` has an entry for `slot`.
  bool has_entry(std::size_t owned, StencilSlot slot) const { return position_[index(owned, slot)] >= 0; }

  /// Local: zeroes all values and opens the value arrays for writing. Every rank must fill
  /// (the solvers compare state counters rank by rank). One fill at a time. Throws Error if
  /// the nonzero pattern was changed by other code since construction.
  Fill begin_fill();

 private:
  static std::size_t index(std::size_t owned, StencilSlot slot) {
    return n_stencil_slots * owned + static_cast<std::size_t>(slot);
  }
  OwnedMat mat_;
  bool is_mpi_ = false;
  std::size_t n_owned_ = 0;
  PetscInt n_values_[2] = {0, 0};  // stored entries of the diagonal and off-diagonal block
  PetscObjectState nonzero_state_ = 0;
  // Per (owned, slot): (offset << 1) | block, block 0 diagonal and 1 off-diagonal; -1: none.
  std::vector<int> position_;
  bool is_filling_ = false;
};

/// Scoped write access to the values of a StencilMatrix, from begin_fill() to end(). Move-only;
/// destroying an open fill (e.g. while an exception unwinds) ends it without checking errors.
class StencilMatrix::Fill {
 public:
  Fill(Fill&& other) noexcept;
  Fill& operator=(Fill&&) = delete;
  Fill(const Fill&) = delete;
  Fill& operator=(const Fill&) = delete;
  ~Fill();

  /// Local. The value of the entry `slot` of row `owned`; the entry must exist (has_entry).
  double& entry(std::size_t owned, StencilSlot slot) {
    const int packed = position_[index(owned, slot)];
    assert(packed >= 0 && "StencilMatrix: no entry for this slot");
    return values_[packed & 1][packed >> 1];
  }
  void set(std::size_t owned, StencilSlot slot, double value) { entry(owned, slot) = value; }
  void add(std::size_t owned, StencilSlot slot, double value) { entry(owned, slot) += value; }

  /// Local: returns the value arrays and marks the matrix changed, so the next KSPSolve (or
  /// PCSetUp) with this matrix rebuilds its preconditioner from the new values.
  void end();

 private:
  friend class StencilMatrix;
  explicit Fill(StencilMatrix& matrix);
  PetscErrorCode release() noexcept;

  StencilMatrix* matrix_;
  const int* position_;
  Mat blocks_[2] = {nullptr, nullptr};
  PetscScalar* values_[2] = {nullptr, nullptr};
};

}  // namespace wallrans
