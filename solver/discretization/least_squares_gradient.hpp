// Weighted least-squares cell gradients (weights 1/|dx|^2), exact for linear fields on any grid.
#pragma once

#include <array>
#include <functional>
#include <vector>

#include "grid/boundary_faces.hpp"
#include "grid/grid.hpp"

namespace wallrans {

class LeastSquaresGradient {
 public:
  /// Local. `include` selects the boundary faces whose value takes part (Dirichlet-like values);
  /// the others are left out of the fit (the value there is extrapolated from the gradient).
  /// `solid` (SolidCells::ghosted_mask, or empty) marks solid cells: they take no part in the fit
  /// of their neighbours, and their own gradient is zero.
  LeastSquaresGradient(const Grid& grid, const std::vector<BoundaryFace>& faces,
                       const std::function<bool(const BoundaryFace&)>& include,
                       std::vector<unsigned char> solid = {});

  /// Local: gradient of `phi` in the owned cells (ghosts of `phi` must be current); `phi_b` holds
  /// one value per face of `faces` (same order). Call grad.exchange() afterwards when ghost
  /// gradients are needed.
  void compute(const Field& phi, const std::vector<double>& phi_b, VectorField& grad) const;

 private:
  struct CellFit {
    double inv_xx = 0, inv_xy = 0, inv_yy = 0;    // inverse of the 2x2 normal matrix
    std::array<int, 4> boundary{-1, -1, -1, -1};  // included boundary faces of this cell
  };
  const Grid& grid_;
  const std::vector<BoundaryFace>& faces_;
  std::vector<CellFit> fits_;            // owned cells, owned order
  std::vector<Vec2> boundary_weighted_;  // d / |d|^2 from the owner centre to each included face
  std::vector<unsigned char> solid_;     // ghosted; empty when there are no solid cells
  bool is_solid(int i, int j) const { return !solid_.empty() && solid_[grid_.local(i, j)]; }
};

}  // namespace wallrans
