#include "coupling/shear_sign_changes.hpp"

#include <algorithm>
#include <stdexcept>

namespace wallrans {

std::vector<ShearSignChange> shear_sign_changes(const std::vector<double>& s, const std::vector<double>& shear,
                                                double period) {
  if (s.size() != shear.size())
    throw std::invalid_argument("shear_sign_changes: positions and shear differ in length");
  std::vector<ShearSignChange> points;
  const int n = static_cast<int>(s.size());
  auto has_sign = [&](int k) { return shear[k] != 0.0 && shear[k] == shear[k]; };  // not zero, not NaN
  int first = -1, last = -1;  // the first and the last sample with a sign
  for (int k = 0; k < n; ++k) {
    if (!has_sign(k)) continue;
    if (first < 0) first = k;
    if (last >= 0 && (shear[last] > 0.0) != (shear[k] > 0.0)) {
      ShearSignChange point;
      point.is_separation = shear[last] > 0.0;
      if (k == last + 1) {
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
  if (period > 0.0 && first >= 0 && (shear[last] > 0.0) != (shear[first] > 0.0)) {
    // Across the periodic side: the line through the last sample and the first one moved by a period.
    ShearSignChange point;
    point.is_separation = shear[last] > 0.0;
    point.before = last;
    point.fraction = shear[last] / (shear[last] - shear[first]);
    const double next = s[first] + period;
    point.s = s[last] + point.fraction * (next - s[last]);
    if (point.s >= 0.5 * (s[n - 1] + s[0] + period)) point.s -= period;
    points.push_back(point);
  }
  std::sort(points.begin(), points.end(),
            [](const ShearSignChange& a, const ShearSignChange& b) { return a.s < b.s; });
  return points;
}

}  // namespace wallrans
