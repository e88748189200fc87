// Locating the stencil entries of a DMDA matrix in its CSR value arrays, and direct fills.
#include "linear/stencil_matrix.hpp"

#include <petscdmda.h>
// PetscObjectStateIncrease: PETSc documents it for code that changed an object's data through
// direct access, and declares it only in this developer header.
#include <petsc/private/petscimpl.h>

#include <algorithm>
#include <cmath>
#include <string>
#include <utility>

#include "core/error.hpp"

namespace wallrans {

namespace {

constexpr const char* slot_names[n_stencil_slots] = {"centre", "west", "east", "south", "north"};
constexpr int slot_di[n_stencil_slots] = {0, -1, 1, 0, 0};
constexpr int slot_dj[n_stencil_slots] = {0, 0, 0, -1, 1};
// Offsets are stored shifted left by one bit (the block in bit 0) in a non-negative int.
constexpr PetscInt max_block_values = PetscInt{1} << 30;

// Local: the seq AIJ block(s) holding this rank's rows: the matrix itself on one rank, the
// diagonal and off-diagonal blocks of an MPI AIJ matrix.
int seq_blocks(Mat mat, bool is_mpi, Mat blocks[2]) {
  blocks[0] = mat;
  blocks[1] = nullptr;
  if (is_mpi) check_petsc(MatMPIAIJGetSeqAIJ(mat, &blocks[0], &blocks[1], nullptr));
  return is_mpi ? 2 : 1;
}

// Scoped MatGetRowIJ of a seq AIJ block: its own row-start array, not a copy.
class RowStarts {
 public:
  explicit RowStarts(Mat block) : block_(block) {
    PetscBool done = PETSC_FALSE;
    check_petsc(MatGetRowIJ(block_, 0, PETSC_FALSE, PETSC_FALSE, &n_rows_, &starts_, &columns_, &done));
    if (!done)
      throw Error("StencilMatrix: expected the CSR rows of a matrix block, got none from MatGetRowIJ");
  }
  RowStarts(const RowStarts&) = delete;
  RowStarts& operator=(const RowStarts&) = delete;
  ~RowStarts() {
    PetscBool done = PETSC_FALSE;
    (void)MatRestoreRowIJ(block_, 0, PETSC_FALSE, PETSC_FALSE, &n_rows_, &starts_, &columns_, &done);
  }
  PetscInt n_rows() const { return n_rows_; }
  PetscInt begin(PetscInt row) const { return starts_[row]; }
  PetscInt end(PetscInt row) const { return starts_[row + 1]; }

 private:
  Mat block_;
  PetscInt n_rows_ = 0;
  const PetscInt* starts_ = nullptr;
  const PetscInt* columns_ = nullptr;
};

// Scoped read access to the values of a seq AIJ block.
class BlockValues {
 public:
  explicit BlockValues(Mat block) : block_(block) { check_petsc(MatSeqAIJGetArrayRead(block_, &values_)); }
  BlockValues(const BlockValues&) = delete;
  BlockValues& operator=(const BlockValues&) = delete;
  ~BlockValues() { (void)MatSeqAIJRestoreArrayRead(block_, &values_); }
  PetscScalar operator[](PetscInt k) const { return values_[k]; }

 private:
  Mat block_;
  const PetscScalar* values_ = nullptr;
};

void assemble(Mat mat) {
  check_petsc(MatAssemblyBegin(mat, MAT_FINAL_ASSEMBLY));
  check_petsc(MatAssemblyEnd(mat, MAT_FINAL_ASSEMBLY));
}

// The owned cells of a rank and which of their slots have a matrix entry.
struct RankCells {
  PetscInt xs = 0, ys = 0, xm = 0, ym = 0;
  std::vector<bool> present;  // per (owned, slot), in the order of StencilMatrix positions

  std::size_t n_owned() const { return static_cast<std::size_t>(xm) * ym; }
  bool has(std::size_t owned, int slot) const { return present[n_stencil_slots * owned + slot]; }
  std::string text(std::size_t owned) const {
    return "owned row " + std::to_string(owned) + " (cell " + std::to_string(xs + owned % xm) + ", " +
           std::to_string(ys + owned / xm) + ")";
  }
};

// Groups of slots in which no two slots reach the same column. Two slots share a column when
// their offsets agree modulo the size of a periodic direction (a periodic direction of 1 or 2
// cells); usually all five form one group.
std::vector<std::vector<int>> column_disjoint_groups(PetscInt size_x, PetscInt size_y, bool is_periodic_x,
                                                     bool is_periodic_y) {
  const auto same = [](int a, int b, PetscInt size, bool is_periodic) {
    return is_periodic ? ((a - b) % size + size) % size == 0 : a == b;
  };
  std::vector<std::vector<int>> groups;
  for (int s = 0; s < n_stencil_slots; ++s) {
    const auto fits = [&](const std::vector<int>& group) {
      return std::none_of(group.begin(), group.end(), [&](int t) {
        return same(slot_di[s], slot_di[t], size_x, is_periodic_x) &&
               same(slot_dj[s], slot_dj[t], size_y, is_periodic_y);
      });
    };
    const auto group = std::find_if(groups.begin(), groups.end(), fits);
    if (group == groups.end()) {
      groups.push_back({s});
    } else {
      group->push_back(s);
    }
  }
  return groups;
}

// Collective: inserts `value(owned, slot)` at every present entry of the slots `group` and
// assembles.
template <typename Value>
void insert_group(Mat mat, const RankCells& cells, const std::vector<int>& group, Value value) {
  for (PetscInt j = cells.ys; j < cells.ys + cells.ym; ++j) {
    for (PetscInt i = cells.xs; i < cells.xs + cells.xm; ++i) {
      const std::size_t o = static_cast<std::size_t>(j - cells.ys) * cells.xm + (i - cells.xs);
      const MatStencil row{0, j, i, 0};
      MatStencil cols[n_stencil_slots];
      PetscScalar values[n_stencil_slots];
      PetscInt n = 0;
      for (const int s : group) {
        if (!cells.has(o, s)) continue;
        cols[n] = MatStencil{0, j + slot_dj[s], i + slot_di[s], 0};
        values[n++] = value(o, s);
      }
      check_petsc(MatSetValuesStencil(mat, 1, &row, n, cols, values, INSERT_VALUES));
    }
  }
  assemble(mat);
}

// Local: finds the codes 1 + 5 owned + slot of the slots `group` in the CSR values of `block`
// and records their offsets. Each code must sit in its own row, once, at a present entry.
void record_codes(Mat block, int block_id, const RankCells& cells, const std::vector<int>& group,
                  std::vector<int>& position) {
  const RowStarts rows(block);
  const BlockValues values(block);
  if (rows.n_rows() != static_cast<PetscInt>(cells.n_owned())) {
    throw Error("StencilMatrix: expected " + std::to_string(cells.n_owned()) +
                " rows in each matrix block, got " + std::to_string(rows.n_rows()));
  }
  const PetscInt n_values = rows.n_rows() > 0 ? rows.end(rows.n_rows() - 1) : 0;
  if (n_values >= max_block_values) {
    throw Error("StencilMatrix: expected fewer than 2^30 entries per matrix block on a rank, got " +
                std::to_string(n_values));
  }
  const double n_codes = static_cast<double>(n_stencil_slots * cells.n_owned());
  for (PetscInt r = 0; r < rows.n_rows(); ++r) {
    for (PetscInt k = rows.begin(r); k < rows.end(r); ++k) {
      const double value = PetscRealPart(values[k]);
      if (value == 0.0) continue;
      const double code = value - 1.0;
      const bool is_code = code >= 0.0 && code < n_codes && code == std::floor(code);
      const std::size_t owned = is_code ? static_cast<std::size_t>(code) / n_stencil_slots : 0;
      const int slot = is_code ? static_cast<int>(static_cast<std::size_t>(code) % n_stencil_slots) : 0;
      const std::size_t at = n_stencil_slots * owned + slot;
      if (!is_code || owned != static_cast<std::size_t>(r) || !cells.present[at] ||
          std::find(group.begin(), group.end(), slot) == group.end() || position[at] != -1) {
        throw Error("StencilMatrix: expected each stencil entry once in its own row, got value " +
                    std::to_string(value) + " at " + cells.text(static_cast<std::size_t>(r)) +
                    (is_code ? std::string(" for the ") + slot_names[slot] + " entry of " + cells.text(owned)
                             : std::string()));
      }
      position[at] = static_cast<int>(k << 1) | block_id;
    }
  }
}

}  // namespace

StencilMatrix::StencilMatrix(DM dm) {
  PetscBool is_da = PETSC_FALSE;
  check_petsc(PetscObjectTypeCompare(reinterpret_cast<PetscObject>(dm), DMDA, &is_da));
  if (!is_da) throw Error("StencilMatrix: expected a DMDA, got another kind of DM");
  PetscInt dim = 0, size_x = 0, size_y = 0, dof = 0, width = 0;
  DMBoundaryType boundary_x = DM_BOUNDARY_NONE, boundary_y = DM_BOUNDARY_NONE;
  check_petsc(DMDAGetInfo(dm, &dim, &size_x, &size_y, nullptr, nullptr, nullptr, nullptr, &dof, &width,
                          &boundary_x, &boundary_y, nullptr, nullptr));
  if (dim != 2 || dof != 1 || width < 1) {
    throw Error("StencilMatrix: expected a 2-D DMDA with 1 dof and stencil width >= 1, got dimension " +
                std::to_string(dim) + ", " + std::to_string(dof) + " dof, width " + std::to_string(width));
  }
  RankCells cells;
  check_petsc(DMDAGetCorners(dm, &cells.xs, &cells.ys, nullptr, &cells.xm, &cells.ym, nullptr));
  n_owned_ = cells.n_owned();

  check_petsc(DMCreateMatrix(dm, mat_.out()));
  Mat mat = mat_.get();
  PetscBool is_seq = PETSC_FALSE, is_mpi = PETSC_FALSE;
  check_petsc(PetscObjectTypeCompare(reinterpret_cast<PetscObject>(mat), MATSEQAIJ, &is_seq));
  check_petsc(PetscObjectTypeCompare(reinterpret_cast<PetscObject>(mat), MATMPIAIJ, &is_mpi));
  if (!is_seq && !is_mpi) {
    MatType type = nullptr;
    check_petsc(MatGetType(mat, &type));
    throw Error(
        std::string("StencilMatrix: expected matrix type seqaij or mpiaij from DMCreateMatrix, got ") + type);
  }
  is_mpi_ = is_mpi;

  // A neighbour across a non-periodic side has no entry.
  const bool is_periodic_x = boundary_x == DM_BOUNDARY_PERIODIC,
             is_periodic_y = boundary_y == DM_BOUNDARY_PERIODIC;
  cells.present.resize(n_stencil_slots * n_owned_);
  for (PetscInt j = cells.ys; j < cells.ys + cells.ym; ++j) {
    for (PetscInt i = cells.xs; i < cells.xs + cells.xm; ++i) {
      const std::size_t o = static_cast<std::size_t>(j - cells.ys) * cells.xm + (i - cells.xs);
      for (int s = 0; s < n_stencil_slots; ++s) {
        const PetscInt in = i + slot_di[s], jn = j + slot_dj[s];
        cells.present[n_stencil_slots * o + s] =
            (is_periodic_x || (in >= 0 && in < size_x)) && (is_periodic_y || (jn >= 0 && jn < size_y));
      }
    }
  }

  // Each entry gets a unique code, 1 + 5 owned + slot, and is found again by scanning the CSR
  // values, so no column ordering of either block is assumed. Slots that share a column go to
  // separate passes. Before several passes, the whole pattern is inserted once: a DM that only
  // preallocates would otherwise lose the unused space of later slots in the first assembly.
  const std::vector<std::vector<int>> groups =
      column_disjoint_groups(size_x, size_y, is_periodic_x, is_periodic_y);
  if (groups.size() > 1) {
    insert_group(mat, cells, {0, 1, 2, 3, 4}, [](std::size_t, int) { return 1.0; });
  }
  position_.assign(n_stencil_slots * n_owned_, -1);
  for (const std::vector<int>& group : groups) {
    check_petsc(MatZeroEntries(mat));
    insert_group(mat, cells, group,
                 [](std::size_t o, int s) { return 1.0 + static_cast<double>(n_stencil_slots * o + s); });
    check_petsc(MatSetOption(mat, MAT_NEW_NONZERO_LOCATION_ERR, PETSC_TRUE));
    Mat blocks[2];
    const int n_blocks = seq_blocks(mat, is_mpi_, blocks);
    for (int b = 0; b < n_blocks; ++b) record_codes(blocks[b], b, cells, group, position_);
  }
  for (std::size_t o = 0; o < n_owned_; ++o) {
    for (int s = 0; s < n_stencil_slots; ++s) {
      if (cells.has(o, s) && position_[n_stencil_slots * o + s] == -1) {
        throw Error(std::string("StencilMatrix: expected the ") + slot_names[s] + " entry of " +
                    cells.text(o) + " in the matrix pattern, got none");
      }
    }
  }
  check_petsc(MatZeroEntries(mat));

  Mat blocks[2];
  const int n_blocks = seq_blocks(mat, is_mpi_, blocks);
  for (int b = 0; b < n_blocks; ++b) {
    const RowStarts rows(blocks[b]);
    n_values_[b] = rows.n_rows() > 0 ? rows.end(rows.n_rows() - 1) : 0;
  }
  check_petsc(MatGetNonzeroState(mat, &nonzero_state_));
}

StencilMatrix::Fill StencilMatrix::begin_fill() {
  assert(!is_filling_ && "StencilMatrix: one fill at a time");
  PetscObjectState state = 0;
  check_petsc(MatGetNonzeroState(mat_.get(), &state));
  if (state != nonzero_state_) {
    throw Error("StencilMatrix: expected the nonzero pattern of construction, got a changed pattern");
  }
  return Fill(*this);
}

StencilMatrix::Fill::Fill(StencilMatrix& matrix) : matrix_(&matrix), position_(matrix.position_.data()) {
  matrix.is_filling_ = true;
  try {
    const int n_blocks = seq_blocks(matrix.mat(), matrix.is_mpi_, blocks_);
    for (int b = 0; b < n_blocks; ++b) {
      // Write access without read: every value is overwritten here, so a matrix type that
      // mirrors its values elsewhere need not copy the old ones back first.
      check_petsc(MatSeqAIJGetArrayWrite(blocks_[b], &values_[b]));
      std::fill_n(values_[b], matrix.n_values_[b], PetscScalar{0.0});
    }
  } catch (...) {
    (void)release();
    throw;
  }
}

StencilMatrix::Fill::Fill(Fill&& other) noexcept
    : matrix_(std::exchange(other.matrix_, nullptr)),
      position_(other.position_),
      blocks_{other.blocks_[0], other.blocks_[1]},
      values_{std::exchange(other.values_[0], nullptr), std::exchange(other.values_[1], nullptr)} {}

StencilMatrix::Fill::~Fill() { (void)release(); }

void StencilMatrix::Fill::end() {
  assert(matrix_ && "StencilMatrix::Fill::end called twice");
  check_petsc(release());
}

PetscErrorCode StencilMatrix::Fill::release() noexcept {
  if (!matrix_) return 0;
  PetscErrorCode first_error = 0;
  for (int b = 0; b < 2; ++b) {
    if (!values_[b]) continue;
    const PetscErrorCode code = MatSeqAIJRestoreArrayWrite(blocks_[b], &values_[b]);
    if (!first_error) first_error = code;
    values_[b] = nullptr;
  }
  // The restore moves the state of the seq AIJ block only. KSP and PC compare the state of the
  // matrix they were given, which for MPI AIJ is the parent: without this, PCSetUp keeps the
  // preconditioner of the old values (Jacobi and BoomerAMG on 2 ranks in test_stencil_matrix).
  const PetscErrorCode bumped = PetscObjectStateIncrease(reinterpret_cast<PetscObject>(matrix_->mat()));
  if (!first_error) first_error = bumped;
  matrix_->is_filling_ = false;
  matrix_ = nullptr;
  return first_error;
}

}  // namespace wallrans
