// Structured single-block grid distributed with a PETSc DMDA: cell-centre geometry, face area
// vectors and volumes for the owned cells plus one ghost layer.
#pragma once

#include <mpi.h>

#include <vector>

#include "core/vec2.hpp"
#include "linear/petsc_handles.hpp"
#include "meshes/node_coordinates.hpp"

namespace wallrans {

/// Geometry of one face, computed once with the grid. `area` is the area vector (length = face
/// length, 1 m deep), pointing towards increasing i (east faces) or increasing j (north faces).
/// The rest relates the face to its cells L (lower index) and R; it is zero where one of them lies
/// outside the domain or the ghosted range (such faces are never interior faces of owned cells).
struct FaceGeometry {
  Vec2 area;
  Vec2 centre;
  double length = 0.0;  ///< |area| [m]
  Vec2 d;               ///< x_R - x_L
  Vec2 d_weighted;      ///< d / |d|^2: the face's row in the weighted least-squares gradient
  double wl = 0.0;      ///< linear-interpolation weight of L (face centre projected on L-R)
  Vec2 skew;            ///< face centre minus its projection on the line L-R
  double k = 0.0;       ///< |S|^2 / (S . d): implicit diffusion factor of the over-relaxed split
  Vec2 cross;           ///< S - k d: the explicit (non-orthogonal) part of the diffusion
};

class Grid {
 public:
  /// Collective. Builds the DMDA (one cell per DMDA point) and the metrics. Throws InputError
  /// naming the cell (i, j) if a cell has a non-positive volume.
  Grid(MPI_Comm comm, NodeCoordinates nodes, bool periodic_x);
  Grid(const Grid&) = delete;
  Grid& operator=(const Grid&) = delete;

  MPI_Comm comm() const { return comm_; }
  int rank() const { return rank_; }
  DM dm() const { return dm_.get(); }
  int cells_x() const { return nodes_.cells_x; }
  int cells_y() const { return nodes_.cells_y; }
  bool periodic_x() const { return periodic_x_; }
  const NodeCoordinates& nodes() const { return nodes_; }

  // Owned cells: x_begin <= i < x_end, y_begin <= j < y_end. Ghosted: gx_begin.. etc.
  int x_begin() const { return xs_; }
  int x_end() const { return xs_ + xm_; }
  int y_begin() const { return ys_; }
  int y_end() const { return ys_ + ym_; }
  int gx_begin() const { return gxs_; }
  int gx_end() const { return gxs_ + gxm_; }
  int gy_begin() const { return gys_; }
  int gy_end() const { return gys_ + gym_; }
  size_t n_ghosted() const { return static_cast<size_t>(gxm_) * gym_; }
  size_t n_owned() const { return static_cast<size_t>(xm_) * ym_; }

  /// Index of cell (i, j) of the ghosted range in ghosted arrays (DMDA local-vector order).
  size_t local(int i, int j) const { return static_cast<size_t>(j - gys_) * gxm_ + (i - gxs_); }
  /// Index of owned cell (i, j) in owned arrays (DMDA global-vector order on this rank).
  size_t owned(int i, int j) const { return static_cast<size_t>(j - ys_) * xm_ + (i - xs_); }

  /// True if the neighbour of cell i across its east/west face exists (interior or periodic).
  bool has_east(int i) const { return periodic_x_ || i + 1 < cells_x(); }
  bool has_west(int i) const { return periodic_x_ || i > 0; }
  bool has_north(int j) const { return j + 1 < cells_y(); }
  bool has_south(int j) const { return j > 0; }

  /// Cell centroid and volume (area), for cells of the ghosted range; periodic ghost cells are
  /// translated by the period so that neighbour vectors are geometric.
  Vec2 centre(int i, int j) const { return centre_[local(i, j)]; }
  double volume(int i, int j) const { return volume_[local(i, j)]; }
  /// The same by ghosted index local(i, j), for inner loops that address several fields.
  Vec2 centre(size_t local_index) const { return centre_[local_index]; }
  double volume(size_t local_index) const { return volume_[local_index]; }
  /// Face between (i, j) and (i+1, j), for gx_begin-1 <= i < gx_end; the L-R data are set for
  /// gx_begin <= i < gx_end-1 where the domain continues.
  const FaceGeometry& east_face(int i, int j) const {
    return east_[static_cast<size_t>(j - gys_) * (gxm_ + 1) + (i - gxs_ + 1)];
  }
  /// Face between (i, j) and (i, j+1), for gy_begin-1 <= j < gy_end; the L-R data are set for
  /// gy_begin <= j < gy_end-1.
  const FaceGeometry& north_face(int i, int j) const {
    return north_[static_cast<size_t>(j - gys_ + 1) * gxm_ + (i - gxs_)];
  }
  /// Node (i, j) for -1 <= i <= cells_x + 1 (periodic wrap with translation); j in 0..cells_y.
  Vec2 node(int i, int j) const;

  /// Collective: fills the ghost entries of a ghosted array from the owning ranks.
  void exchange(std::vector<double>& ghosted) const;

  /// Collective reductions.
  double global_sum(double local_value) const;
  double global_max(double local_value) const;

 private:
  MPI_Comm comm_;
  int rank_ = 0;
  NodeCoordinates nodes_;
  bool periodic_x_;
  OwnedDm dm_;
  OwnedVec scratch_local_;  // wraps a ghosted array during exchange()
  int xs_ = 0, ys_ = 0, xm_ = 0, ym_ = 0, gxs_ = 0, gys_ = 0, gxm_ = 0, gym_ = 0;
  std::vector<Vec2> centre_;
  std::vector<double> volume_;
  std::vector<FaceGeometry> east_, north_;
};

/// Local: calls east(i, j) for the face between (i, j) and (i+1, j) and north(i, j) for the face
/// between (i, j) and (i, j+1), once for every interior face of the owned cells, the faces shared
/// with ghost cells included (their cells are both in the ghosted range).
template <typename East, typename North>
void for_each_interior_face(const Grid& grid, East&& east, North&& north) {
  const int i_first = grid.has_west(grid.x_begin()) ? grid.x_begin() - 1 : grid.x_begin();
  for (int j = grid.y_begin(); j < grid.y_end(); ++j) {
    for (int i = i_first; i < grid.x_end(); ++i) {
      if (grid.has_east(i)) east(i, j);
    }
  }
  const int j_first = grid.has_south(grid.y_begin()) ? grid.y_begin() - 1 : grid.y_begin();
  for (int j = j_first; j < grid.y_end(); ++j) {
    if (!grid.has_north(j)) continue;
    for (int i = grid.x_begin(); i < grid.x_end(); ++i) north(i, j);
  }
}

/// A cell-centred scalar over the ghosted range of a grid.
class Field {
 public:
  Field() = default;
  explicit Field(const Grid& grid, double value = 0.0) : grid_(&grid), data_(grid.n_ghosted(), value) {}
  double& operator()(int i, int j) { return data_[grid_->local(i, j)]; }
  double operator()(int i, int j) const { return data_[grid_->local(i, j)]; }
  /// By ghosted index Grid::local(i, j), for inner loops that address several fields.
  double& operator[](size_t local_index) { return data_[local_index]; }
  double operator[](size_t local_index) const { return data_[local_index]; }
  std::vector<double>& data() { return data_; }
  const std::vector<double>& data() const { return data_; }
  /// Collective: refresh ghost values.
  void exchange() { grid_->exchange(data_); }

 private:
  const Grid* grid_ = nullptr;
  std::vector<double> data_;
};

/// A cell-centred 2-vector (velocity, gradient) as two fields.
struct VectorField {
  Field x, y;
  VectorField() = default;
  explicit VectorField(const Grid& grid) : x(grid), y(grid) {}
  Vec2 operator()(int i, int j) const { return {x(i, j), y(i, j)}; }
  Vec2 operator[](size_t local_index) const { return {x[local_index], y[local_index]}; }
  void set(int i, int j, Vec2 value) {
    x(i, j) = value.x;
    y(i, j) = value.y;
  }
  void exchange() {
    x.exchange();
    y.exchange();
  }
};

}  // namespace wallrans
