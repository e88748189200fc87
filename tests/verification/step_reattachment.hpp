// Test helper: the recirculation behind a backward-facing step from the wall shear stress along
// the bottom wall downstream of the step face (x > 0, y = 0).
#pragma once

#include <algorithm>
#include <array>
#include <cmath>
#include <limits>
#include <vector>

#include "coupling/shear_sign_changes.hpp"

namespace wallrans::test_support {

struct Recirculation {
  std::vector<ShearSignChange> zeros;  ///< every sign change along the bottom wall, downstream first
  /// The main bubble's reattachment: the last zero where the shear turns positive (NaN if none).
  double reattachment = std::numeric_limits<double>::quiet_NaN();
  bool has_reverse_flow = false;  ///< some bottom-wall face has negative shear
};

/// Local. `faces` holds (x, y, signed wall shear) of wall faces in any order (e.g. every row of
/// wall.csv); those on the bottom wall downstream of the step (x > 0, |y| <= 1e-9 m) are
/// used.
inline Recirculation bottom_wall_recirculation(std::vector<std::array<double, 3>> faces) {
  std::erase_if(faces, [](const auto& f) { return !(f[0] > 0.0 && std::abs(f[1]) <= 1e-9); });
  std::sort(faces.begin(), faces.end(), [](const auto& a, const auto& b) { return a[0] < b[0]; });
  std::vector<double> x, tau;
  Recirculation out;
  for (const auto& f : faces) {
    x.push_back(f[0]);
    tau.push_back(f[2]);
    out.has_reverse_flow = out.has_reverse_flow || f[2] < 0.0;
  }
  out.zeros = shear_sign_changes(x, tau);
  for (const ShearSignChange& z : out.zeros)
    if (!z.is_separation) out.reattachment = z.s;
  return out;
}

}  // namespace wallrans::test_support
