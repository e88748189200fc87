// Linear interpolation in an inflow profile table.
#include "core/inflow_profile.hpp"

#include <algorithm>
#include <cassert>
#include <cmath>

namespace wallrans {

bool InflowProfile::covers(double s) const {
  if (coordinate.size() < 2) return false;
  const double margin = 1e-12 * (back() - front());
  return s >= front() - margin && s <= back() + margin;
}

ProfileValue InflowProfile::at(double s) const {
  assert(covers(s));
  // The interval [c_k, c_k+1] holding s (the first or last one for s within the margin outside).
  const auto upper = std::upper_bound(coordinate.begin(), coordinate.end(), s);
  const size_t k =
      std::clamp<size_t>(static_cast<size_t>(upper - coordinate.begin()), 1, coordinate.size() - 1) - 1;
  const double w = std::clamp((s - coordinate[k]) / (coordinate[k + 1] - coordinate[k]), 0.0, 1.0);
  auto lerp = [&](const std::vector<double>& f) { return (1.0 - w) * f[k] + w * f[k + 1]; };
  return {Vec2{lerp(u), lerp(v)}, model_variable.empty() ? 0.0 : lerp(model_variable)};
}

std::string model_variable_column(const std::string& model) {
  if (model == "spalart_allmaras") return "nu_tilde";
  if (model == "k_equation") return "k";
  if (model == "baldwin_barth") return "nu_rt";
  return "";
}

}  // namespace wallrans
