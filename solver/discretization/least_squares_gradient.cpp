#include "discretization/least_squares_gradient.hpp"

#include <cmath>
#include <utility>

namespace wallrans {

namespace {

// Calls fn(dx) for each interior neighbour of (i, j), as (neighbour i, neighbour j, dx).
template <typename Fn>
void for_each_neighbour(const Grid& grid, int i, int j, Fn&& fn) {
  const Vec2 c = grid.centre(i, j);
  if (grid.has_east(i)) fn(i + 1, j, grid.centre(i + 1, j) - c);
  if (grid.has_west(i)) fn(i - 1, j, grid.centre(i - 1, j) - c);
  if (grid.has_north(j)) fn(i, j + 1, grid.centre(i, j + 1) - c);
  if (grid.has_south(j)) fn(i, j - 1, grid.centre(i, j - 1) - c);
}

}  // namespace

LeastSquaresGradient::LeastSquaresGradient(const Grid& grid, const std::vector<BoundaryFace>& faces,
                                           const std::function<bool(const BoundaryFace&)>& include,
                                           std::vector<unsigned char> solid)
    : grid_(grid),
      faces_(faces),
      fits_(grid.n_owned()),
      boundary_weighted_(faces.size()),
      solid_(std::move(solid)) {
  for (size_t f = 0; f < faces.size(); ++f) {
    if (!include(faces[f])) continue;
    const Vec2 d = faces[f].centre - grid.centre(faces[f].i, faces[f].j);
    boundary_weighted_[f] = (1.0 / dot(d, d)) * d;
    auto& slots = fits_[grid.owned(faces[f].i, faces[f].j)].boundary;
    for (int& s : slots) {
      if (s < 0) {
        s = static_cast<int>(f);
        break;
      }
    }
  }
  for (int j = grid.y_begin(); j < grid.y_end(); ++j) {
    for (int i = grid.x_begin(); i < grid.x_end(); ++i) {
      double mxx = 0, mxy = 0, myy = 0;
      auto add = [&](Vec2 d) {
        const double w = 1.0 / dot(d, d);
        mxx += w * d.x * d.x;
        mxy += w * d.x * d.y;
        myy += w * d.y * d.y;
      };
      CellFit& fit = fits_[grid.owned(i, j)];
      if (is_solid(i, j)) continue;  // gradient zero: the inverse stays zero
      for_each_neighbour(grid, i, j, [&](int ni, int nj, Vec2 d) {
        if (!is_solid(ni, nj)) add(d);
      });
      for (int s : fit.boundary) {
        if (s >= 0) add(faces[s].centre - grid.centre(i, j));
      }
      // A tiny diagonal shift keeps one-cell-wide grids (a direction without data) solvable;
      // the missing gradient component is then zero.
      const double eps = 1e-12 * (mxx + myy);
      mxx += eps;
      myy += eps;
      const double det = mxx * myy - mxy * mxy;
      fit.inv_xx = myy / det;
      fit.inv_xy = -mxy / det;
      fit.inv_yy = mxx / det;
    }
  }
}

void LeastSquaresGradient::compute(const Field& phi, const std::vector<double>& phi_b,
                                   VectorField& grad) const {
  for (int j = grid_.y_begin(); j < grid_.y_end(); ++j) {
    for (int i = grid_.x_begin(); i < grid_.x_end(); ++i) {
      const size_t c = grid_.local(i, j);
      const double p = phi[c];
      double bx = 0, by = 0;
      // w dx dphi per neighbour, with w dx cached: the faces' d_weighted points from the lower-index
      // cell, so it changes sign for the west and south neighbours.
      auto add = [&](Vec2 dw, double dphi) {
        bx += dw.x * dphi;
        by += dw.y * dphi;
      };
      // A solid neighbour's weight is zero: it adds nothing (solid cells have a zero inverse).
      auto fluid = [&](size_t n) { return solid_.empty() || !solid_[n]; };
      const size_t e = grid_.local(i + 1, j), w = grid_.local(i - 1, j);
      const size_t n = grid_.local(i, j + 1), s = grid_.local(i, j - 1);
      if (grid_.has_east(i) && fluid(e)) add(grid_.east_face(i, j).d_weighted, phi[e] - p);
      if (grid_.has_west(i) && fluid(w)) add(-1.0 * grid_.east_face(i - 1, j).d_weighted, phi[w] - p);
      if (grid_.has_north(j) && fluid(n)) add(grid_.north_face(i, j).d_weighted, phi[n] - p);
      if (grid_.has_south(j) && fluid(s)) add(-1.0 * grid_.north_face(i, j - 1).d_weighted, phi[s] - p);
      const CellFit& fit = fits_[grid_.owned(i, j)];
      for (int s : fit.boundary) {
        if (s >= 0) add(boundary_weighted_[s], phi_b[s] - p);
      }
      grad.x[c] = fit.inv_xx * bx + fit.inv_xy * by;
      grad.y[c] = fit.inv_xy * bx + fit.inv_yy * by;
    }
  }
}

}  // namespace wallrans
