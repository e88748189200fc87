// Shared part of the closures that need the wall: wall distance, friction velocity of the
// nearest wall face, y+, and the eddy-viscosity field.
#pragma once

#include <cmath>
#include <string>
#include <vector>

#include "core/case_spec.hpp"
#include "models/turbulence_model.hpp"
#include "models/wall_distance.hpp"

namespace wallrans {

/// Velocity-gradient invariants of a cell.
struct FlowInvariants {
  double vorticity;  ///< |dv/dx - du/dy| [1/s]
  double strain;     ///< sqrt(2 S_ij S_ij) [1/s]
};

inline FlowInvariants invariants(Vec2 grad_u, Vec2 grad_v) {
  const double shear = grad_u.y + grad_v.x;
  return {std::abs(grad_v.x - grad_u.y),
          std::sqrt(2.0 * grad_u.x * grad_u.x + 2.0 * grad_v.y * grad_v.y + shear * shear)};
}

/// Local. Throws InputError naming the case file and key 'turbulence.model' if the grid has no
/// no-slip wall (every closure of this kind needs one).
void require_wall(const CaseSpec& spec, const BoundaryMap& boundaries);

class WallBoundedModel : public TurbulenceModel {
 public:
  /// Collective. Throws InputError naming the case file if the grid has no no-slip wall.
  WallBoundedModel(const CaseSpec& spec, const Grid& grid, const BoundaryMap& boundaries);
  const Field& eddy_viscosity() const override { return nut_; }
  std::vector<std::pair<std::string, const Field*>> output_fields() const override;

 protected:
  /// Local: refreshes y+ = d u_tau / nu in the owned cells from the nearest wall's shear stress.
  void update_yplus(const MeanFlowView& flow);
  double distance(int i, int j) const { return walls_.distance(i, j); }

  const CaseSpec& spec_;
  const Grid& grid_;
  const BoundaryMap& boundaries_;
  double nu_;
  WallDistance walls_;
  Field yplus_, nut_;
};

}  // namespace wallrans
