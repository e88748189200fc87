#include "models/mixing_length.hpp"

#include <algorithm>
#include <cmath>

namespace wallrans {

void MixingLength::update(const MeanFlowView& flow) {
  update_yplus(flow);
  const double delta = spec_.turbulence.outer_length.value_or(1.0);
  for (int j = grid_.gy_begin(); j < grid_.gy_end(); ++j) {
    for (int i = grid_.gx_begin(); i < grid_.gx_end(); ++i) {
      const double l =
          std::min(kappa * distance(i, j) * -std::expm1(-yplus_(i, j) / a_plus), outer_fraction * delta);
      nut_(i, j) = l * l * invariants(flow.grad_u(i, j), flow.grad_v(i, j)).vorticity;
    }
  }
}

}  // namespace wallrans
