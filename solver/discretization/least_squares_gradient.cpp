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
    : grid_(grid), faces_(faces), fits_(grid.n_owned()) {
  for (size_t f = 0; f < faces.size(); ++f) {
    if (!include(faces[f])) continue;
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
      const double p = phi(i, j);
      double bx = 0, by = 0;
      auto add = [&](Vec2 d, double dphi) {
        const double w = 1.0 / dot(d, d);
        bx += w * d.x * dphi;
        by += w * d.y * dphi;
      };
      for_each_neighbour(grid_, i, j, [&](int in, int jn, Vec2 d) { add(d, phi(in, jn) - p); });
      const CellFit& fit = fits_[grid_.owned(i, j)];
      for (int s : fit.boundary) {
        if (s >= 0) add(faces_[s].centre - grid_.centre(i, j), phi_b[s] - p);
      }
      grad.set(i, j, {fit.inv_xx * bx + fit.inv_xy * by, fit.inv_xy * bx + fit.inv_yy * by});
    }
  }
}

}  // namespace wallrans
