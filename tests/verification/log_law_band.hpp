// Test helper: the band spanned by published log laws U+ = ln(y+)/kappa + B, against which
// computed wall-bounded profiles are checked in the log region (y+ >= 30, y/delta <= 0.3).
#pragma once

#include <algorithm>
#include <cmath>

namespace wallrans::test_support {

struct LogLaw {
  double kappa, b;
};

/// kappa = 0.41, B = 5.0 (White 1974, the values the NASA Turbulence Modeling Resource plots);
/// kappa = 0.40, B = 5.5 (Spalding 1961, J. Appl. Mech. 28:455); kappa = 0.384, B = 4.27 (Lee &
/// Moser 2015, J. Fluid Mech. 774:395, channel fit; from memory).
inline constexpr LogLaw published_log_laws[] = {{0.41, 5.0}, {0.40, 5.5}, {0.384, 4.27}};

/// Lowest and highest U+ of the published log laws at y+.
inline double log_law_lowest(double y_plus) {
  double lowest = 1e300;
  for (const LogLaw& law : published_log_laws)
    lowest = std::min(lowest, std::log(y_plus) / law.kappa + law.b);
  return lowest;
}
inline double log_law_highest(double y_plus) {
  double highest = -1e300;
  for (const LogLaw& law : published_log_laws)
    highest = std::max(highest, std::log(y_plus) / law.kappa + law.b);
  return highest;
}

}  // namespace wallrans::test_support
