// DMDA creation and finite-volume metrics from node coordinates.
#include "grid/grid.hpp"

#include <petscdmda.h>

#include <algorithm>
#include <string>

#include "core/error.hpp"

namespace wallrans {

namespace {

// Polygon area and centroid of the quadrilateral a-b-c-d (shoelace formula).
void quad_metrics(Vec2 a, Vec2 b, Vec2 c, Vec2 d, double& area, Vec2& centroid) {
  const Vec2 p[4] = {a, b, c, d};
  double twice_area = 0.0;
  Vec2 moment{0.0, 0.0};
  for (int k = 0; k < 4; ++k) {
    const Vec2 u = p[k], v = p[(k + 1) % 4];
    const double w = cross(u, v);
    twice_area += w;
    moment = moment + w * (u + v);
  }
  area = 0.5 * twice_area;
  centroid = (std::abs(twice_area) > 0.0) ? (1.0 / (3.0 * twice_area)) * moment : 0.25 * (a + b + c + d);
}

// The face's relation to its cells with centres xl and xr: interpolation weight, skewness and the
// over-relaxed split of the diffusive flux S = k d + cross (Jasak 1996, sec. 3.3.1.3).
void relate_to_cells(Vec2 xl, Vec2 xr, FaceGeometry& face) {
  face.d = xr - xl;
  const double d2 = dot(face.d, face.d);
  face.d_weighted = (1.0 / d2) * face.d;
  face.wl = dot(xr - face.centre, face.d) / d2;
  face.skew = face.centre - (xl + (1.0 - face.wl) * face.d);
  face.k = dot(face.area, face.area) / dot(face.area, face.d);
  face.cross = face.area - face.k * face.d;
}

}  // namespace

Vec2 Grid::node(int i, int j) const {
  const int nx = nodes_.cells_x;
  if (i >= 0 && i <= nx) return nodes_.at(i, j);
  // Periodic wrap: the period vector is node(nx, j) - node(0, j).
  const Vec2 period = nodes_.at(nx, j) - nodes_.at(0, j);
  if (i < 0) return nodes_.at(i + nx, j) - period;
  return nodes_.at(i - nx, j) + period;
}

Grid::Grid(MPI_Comm comm, NodeCoordinates nodes, bool periodic_x)
    : comm_(comm), nodes_(std::move(nodes)), periodic_x_(periodic_x) {
  check_mpi(MPI_Comm_rank(comm_, &rank_));
  const int nx = nodes_.cells_x, ny = nodes_.cells_y;
  // Reject folded cells before any parallel work, identically on all ranks.
  for (int j = 0; j < ny; ++j) {
    for (int i = 0; i < nx; ++i) {
      double area = 0.0;
      Vec2 c;
      quad_metrics(nodes_.at(i, j), nodes_.at(i + 1, j), nodes_.at(i + 1, j + 1), nodes_.at(i, j + 1), area,
                   c);
      if (!(area > 0.0)) {
        throw InputError(
            "key 'grid': expected counter-clockwise cells with positive volume, got non-positive "
            "volume " +
            std::to_string(area) + " at cell (" + std::to_string(i) + ", " + std::to_string(j) + ")");
      }
    }
  }
  check_petsc(DMDACreate2d(comm_, periodic_x_ ? DM_BOUNDARY_PERIODIC : DM_BOUNDARY_NONE, DM_BOUNDARY_NONE,
                           DMDA_STENCIL_STAR, nx, ny, PETSC_DECIDE, PETSC_DECIDE, 1, 1, nullptr, nullptr,
                           dm_.out()));
  // The grid's own options prefix: only options meant for it (-grid_da_processors_x, ...) reach
  // it; options that would resize it are refused before a grid is built (app/petsc_option_checks).
  check_petsc(DMSetOptionsPrefix(dm_.get(), "grid_"));
  check_petsc(DMSetFromOptions(dm_.get()));
  check_petsc(DMSetUp(dm_.get()));
  PetscInt m = 0, n = 0, dof = 0, width = 0;
  check_petsc(DMDAGetInfo(dm_.get(), nullptr, &m, &n, nullptr, nullptr, nullptr, nullptr, &dof, &width,
                          nullptr, nullptr, nullptr, nullptr));
  if (m != nx || n != ny || dof != 1 || width != 1) {
    // The node coordinates and metrics are for nx x ny cells; a resized DMDA would index past them.
    throw InputError("PETSc options of the grid (prefix -grid_): expected none that change the grid of " +
                     std::to_string(nx) + " x " + std::to_string(ny) + " cells, got a grid of " +
                     std::to_string(m) + " x " + std::to_string(n) + " cells, " + std::to_string(dof) +
                     " value(s) and stencil width " + std::to_string(width));
  }
  check_petsc(DMDAGetCorners(dm_.get(), &xs_, &ys_, nullptr, &xm_, &ym_, nullptr));
  check_petsc(DMDAGetGhostCorners(dm_.get(), &gxs_, &gys_, nullptr, &gxm_, &gym_, nullptr));
  check_petsc(DMCreateLocalVector(dm_.get(), scratch_local_.out()));

  centre_.resize(n_ghosted());
  volume_.resize(n_ghosted());
  for (int j = gys_; j < gys_ + gym_; ++j) {
    for (int i = gxs_; i < gxs_ + gxm_; ++i) {
      quad_metrics(node(i, j), node(i + 1, j), node(i + 1, j + 1), node(i, j + 1), volume_[local(i, j)],
                   centre_[local(i, j)]);
    }
  }
  east_.resize(static_cast<size_t>(gxm_ + 1) * gym_);
  for (int j = gys_; j < gys_ + gym_; ++j) {
    for (int i = gxs_ - 1; i < gxs_ + gxm_; ++i) {
      const Vec2 a = node(i + 1, j), b = node(i + 1, j + 1);
      const Vec2 edge = b - a;  // runs towards +j; the normal (dy, -dx) points towards +i
      FaceGeometry& face = east_[static_cast<size_t>(j - gys_) * (gxm_ + 1) + (i - gxs_ + 1)];
      face.area = {edge.y, -edge.x};
      face.centre = 0.5 * (a + b);
      face.length = norm(face.area);
      if (i >= gxs_ && i + 1 < gxs_ + gxm_ && has_east(i))
        relate_to_cells(centre(i, j), centre(i + 1, j), face);
    }
  }
  north_.resize(static_cast<size_t>(gxm_) * (gym_ + 1));
  for (int j = gys_ - 1; j < gys_ + gym_; ++j) {
    for (int i = gxs_; i < gxs_ + gxm_; ++i) {
      const Vec2 a = node(i, j + 1), b = node(i + 1, j + 1);
      const Vec2 edge = b - a;  // runs towards +i; the normal (-dy, dx) points towards +j
      FaceGeometry& face = north_[static_cast<size_t>(j - gys_ + 1) * gxm_ + (i - gxs_)];
      face.area = {-edge.y, edge.x};
      face.centre = 0.5 * (a + b);
      face.length = norm(face.area);
      if (j >= gys_ && j + 1 < gys_ + gym_ && has_north(j))
        relate_to_cells(centre(i, j), centre(i, j + 1), face);
    }
  }
}

void Grid::exchange(std::vector<double>& ghosted) const {
  // In place: the DMDA's local-to-local scatter copies every owned value onto itself and fills
  // each ghost from its owner, so only the ghosted array is read and written.
  check_petsc(VecPlaceArray(scratch_local_.get(), ghosted.data()));
  const PetscErrorCode begin =
      DMLocalToLocalBegin(dm_.get(), scratch_local_.get(), INSERT_VALUES, scratch_local_.get());
  const PetscErrorCode end =
      begin ? begin : DMLocalToLocalEnd(dm_.get(), scratch_local_.get(), INSERT_VALUES, scratch_local_.get());
  check_petsc(VecResetArray(scratch_local_.get()));  // before any throw: the Vec must not keep the array
  check_petsc(end);
}

double Grid::global_sum(double local_value) const {
  double out = 0.0;
  check_mpi(MPI_Allreduce(&local_value, &out, 1, MPI_DOUBLE, MPI_SUM, comm_));
  return out;
}

double Grid::global_max(double local_value) const {
  double out = 0.0;
  check_mpi(MPI_Allreduce(&local_value, &out, 1, MPI_DOUBLE, MPI_MAX, comm_));
  return out;
}

}  // namespace wallrans
