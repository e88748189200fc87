// Face values for the deferred-correction convection schemes.
#pragma once

#include <algorithm>

#include "core/case_spec.hpp"
#include "core/vec2.hpp"

namespace wallrans {

/// Local. Face value targeted by the deferred correction for the face between cells L and R
/// (centres xl, xr, gradients grad_l, grad_r), face centre xf, linear weight wl of L and skew
/// vector from the L-R line to xf; `flux` > 0 means flow from L to R.
inline double face_value(ConvectionScheme scheme, double flux, double phi_l, double phi_r, Vec2 grad_l,
                         Vec2 grad_r, Vec2 xl, Vec2 xr, Vec2 xf, double wl, Vec2 skew) {
  const bool from_left = flux >= 0.0;
  const double phi_u = from_left ? phi_l : phi_r;
  switch (scheme) {
    case ConvectionScheme::upwind:
      return phi_u;
    case ConvectionScheme::central:
      return wl * phi_l + (1.0 - wl) * phi_r + dot(wl * grad_l + (1.0 - wl) * grad_r, skew);
    case ConvectionScheme::linear_upwind:
    case ConvectionScheme::bounded_linear_upwind: {
      // Linear reconstruction from the upwind cell (second order on any grid) ...
      double value = from_left ? phi_l + dot(grad_l, xf - xl) : phi_r + dot(grad_r, xf - xr);
      // ... clipped to the range of the two cells next to the face, so no new extrema appear.
      if (scheme == ConvectionScheme::bounded_linear_upwind)
        value = std::clamp(value, std::min(phi_l, phi_r), std::max(phi_l, phi_r));
      return value;
    }
  }
  return phi_u;
}

}  // namespace wallrans
