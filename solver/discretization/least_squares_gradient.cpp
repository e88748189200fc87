#include "discretization/least_squares_gradient.hpp"

#include <cmath>

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
                                           const std::function<bool(const BoundaryFace&)>& include)
    : grid_(grid), faces_(faces), fits_(grid.n_owned()), boundary_weighted_(faces.size()) {
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
      for_each_neighbour(grid, i, j, [&](int, int, Vec2 d) { add(d); });
      CellFit& fit = fits_[grid.owned(i, j)];
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
      if (grid_.has_east(i)) add(grid_.east_face(i, j).d_weighted, phi[grid_.local(i + 1, j)] - p);
      if (grid_.has_west(i)) add(-1.0 * grid_.east_face(i - 1, j).d_weighted, phi[grid_.local(i - 1, j)] - p);
      if (grid_.has_north(j)) add(grid_.north_face(i, j).d_weighted, phi[grid_.local(i, j + 1)] - p);
      if (grid_.has_south(j))
        add(-1.0 * grid_.north_face(i, j - 1).d_weighted, phi[grid_.local(i, j - 1)] - p);
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
