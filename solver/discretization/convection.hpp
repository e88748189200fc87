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

/// Geometry of the interior face between L and R used by every transport equation.
struct InteriorFaceGeometry {
  Vec2 d;      ///< x_R - x_L
  double wl;   ///< linear-interpolation weight of L
  Vec2 skew;   ///< face centre minus its projection on the L-R line
  double k;    ///< |S|^2 / (S . d): implicit diffusion factor (over-relaxed split)
  Vec2 cross;  ///< S - k d: the explicit (non-orthogonal) part of the diffusion
};

inline InteriorFaceGeometry interior_face_geometry(Vec2 xl, Vec2 xr, Vec2 area, Vec2 centre) {
  InteriorFaceGeometry g;
  g.d = xr - xl;
  g.wl = dot(xr - centre, g.d) / dot(g.d, g.d);
  g.skew = centre - (xl + (1.0 - g.wl) * g.d);
  g.k = dot(area, area) / dot(area, g.d);
  g.cross = area - g.k * g.d;
  return g;
}

}  // namespace wallrans
