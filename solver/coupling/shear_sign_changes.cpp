#include "coupling/shear_sign_changes.hpp"

#include <algorithm>
#include <cassert>

namespace wallrans {

std::vector<ShearSignChange> shear_sign_changes(const std::vector<double>& x, const std::vector<double>& tau,
                                                double period) {
  assert(x.size() == tau.size());
  std::vector<ShearSignChange> out;
  const size_t n = x.size();
  auto examine = [&](double x0, double tau0, double x1, double tau1) {
    if ((tau0 > 0.0) == (tau1 > 0.0)) return;
    const double zero = x0 + (x1 - x0) * tau0 / (tau0 - tau1);
    out.push_back({zero, tau0 > 0.0});
  };
  for (size_t k = 0; k + 1 < n; ++k) examine(x[k], tau[k], x[k + 1], tau[k + 1]);
  if (period > 0.0 && n >= 2) {
    const double side = 0.5 * (x[n - 1] + x[0] + period);  // the periodic side between the two faces
    examine(x[n - 1], tau[n - 1], x[0] + period, tau[0]);
    if (!out.empty() && out.back().x >= side) out.back().x -= period;
  }
  std::sort(out.begin(), out.end(),
            [](const ShearSignChange& a, const ShearSignChange& b) { return a.x < b.x; });
  return out;
}

}  // namespace wallrans
