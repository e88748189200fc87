// Sign changes of the wall shear stress, by linear interpolation between face centres.
#include "coupling/wall_shear_zeros.hpp"

#include <cassert>

namespace wallrans {

std::vector<WallShearZero> wall_shear_zeros(const std::vector<double>& position,
                                            const std::vector<double>& shear) {
  assert(position.size() == shear.size());
  std::vector<WallShearZero> zeros;
  int last = -1;  // the last sample with a non-zero shear
  for (int k = 0; k < static_cast<int>(shear.size()); ++k) {
    if (shear[k] == 0.0) continue;
    if (last >= 0 && (shear[k] > 0.0) != (shear[last] > 0.0)) {
      double at = 0.0;
      if (k == last + 1) {
        at = position[last] - shear[last] * (position[k] - position[last]) / (shear[k] - shear[last]);
      } else {
        at = 0.5 * (position[last + 1] + position[k - 1]);  // the run of exact zeros between them
      }
      zeros.push_back({at, shear[k] > 0.0});
    }
    last = k;
  }
  return zeros;
}

}  // namespace wallrans
