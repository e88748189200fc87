#include "app/shear_sign_changes.hpp"

#include <stdexcept>

namespace wallrans {

std::vector<ShearSignChange> shear_sign_changes(const std::vector<double>& s,
                                                const std::vector<double>& shear) {
  if (s.size() != shear.size())
    throw std::invalid_argument("shear_sign_changes: positions and shear differ in length");
  std::vector<ShearSignChange> points;
  const int n = static_cast<int>(s.size());
  int last = -1;  // the last sample with a sign
  for (int k = 0; k < n; ++k) {
    if (shear[k] == 0.0 || shear[k] != shear[k]) continue;  // zero or NaN: no sign
    if (last >= 0 && (shear[last] > 0.0) != (shear[k] > 0.0)) {
      ShearSignChange point;
      point.is_separation = shear[last] > 0.0;
      if (k == last + 1) {
        // Linear interpolation of the shear between the two sample positions.
        point.fraction = shear[last] / (shear[last] - shear[k]);
        point.before = last;
        point.s = s[last] + point.fraction * (s[k] - s[last]);
      } else {
        // Zero samples last+1 .. k-1: the middle of their run.
        point.s = 0.5 * (s[last + 1] + s[k - 1]);
        const int middle = (last + 1 + k - 1) / 2;
        point.before = middle;
        point.fraction = (last + 1 + k - 1) % 2 == 0 ? 0.0 : 0.5;
      }
      points.push_back(point);
    }
    last = k;
  }
  return points;
}

}  // namespace wallrans
