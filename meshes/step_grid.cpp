// Grid lines of the backward-facing step generator and the two-sided tanh stretching.
#include "meshes/step_grid.hpp"

#include <cmath>
#include <cstdio>
#include <string>

#include "core/error.hpp"
#include "meshes/node_coordinates.hpp"

namespace wallrans {

namespace {

// x / sinh(x) = 1 / b (b > 1) or x / sin(x) = 1 / b (b < 1), for the parameter of the stretching.
double stretching_parameter(double b) {
  const bool hyperbolic = b > 1.0;
  auto f = [&](double x) { return (hyperbolic ? std::sinh(x) : std::sin(x)) / x - b; };
  double lo = 1e-12, hi = hyperbolic ? 1.0 : 3.14159265358979;
  if (hyperbolic)
    while (f(hi) < 0.0) hi *= 2.0;
  for (int it = 0; it < 200; ++it) {
    const double mid = 0.5 * (lo + hi);
    ((f(mid) < 0.0) == hyperbolic ? lo : hi) = mid;
  }
  return 0.5 * (lo + hi);
}

// Vinokur's two-sided function on [0, 1] for the end slopes ds/dxi = n d0 and n d1: with
// A = sqrt(d1/d0) and B = 1/(n sqrt(d0 d1)), u(xi) = (1 + tanh(X (xi - 1/2)) / tanh(X/2)) / 2
// where sinh(X)/X = B (tan and sin when B < 1), and s = u / (A + (1 - A) u).
std::vector<double> vinokur(int n, double d0, double d1) {
  const double a = std::sqrt(d1 / d0), b = 1.0 / (n * std::sqrt(d0 * d1));
  std::vector<double> s(static_cast<size_t>(n) + 1);
  const bool uniform = std::abs(b - 1.0) < 1e-10;
  const double x = uniform ? 0.0 : stretching_parameter(b);
  for (int k = 0; k <= n; ++k) {
    const double xi = static_cast<double>(k) / n;
    double u = xi;
    if (!uniform && b > 1.0) u = 0.5 * (1.0 + std::tanh(x * (xi - 0.5)) / std::tanh(0.5 * x));
    if (!uniform && b < 1.0) u = 0.5 * (1.0 + std::tan(x * (xi - 0.5)) / std::tan(0.5 * x));
    s[k] = u / (a + (1.0 - a) * u);
  }
  s[0] = 0.0;
  s[n] = 1.0;
  return s;
}

void check_spacing(int n, double extent, double spacing, const char* what) {
  if (!(spacing > 0.0) || spacing > extent / n * (1.0 + 1e-12)) {
    char text[160];
    std::snprintf(text, sizeof text, "expected a value in (0, %g] (extent %g m / %d cells), got %g",
                  extent / n, extent, n, spacing);
    throw InputError("key '" + std::string(what) + "': " + text);
  }
}

std::vector<double> uniform_lines(int n, double from, double to) {
  std::vector<double> s(static_cast<size_t>(n) + 1);
  for (int k = 0; k <= n; ++k) s[k] = from + (to - from) * k / n;
  return s;
}

}  // namespace

std::vector<double> tanh_spacing(int n, double extent, double start, double end, const char* what) {
  check_spacing(n, extent, start, what);
  check_spacing(n, extent, end, what);
  if (n == 1) return {0.0, extent};
  // The slopes give the end intervals only to first order; rescale them until the intervals
  // themselves match (a fixed-point iteration that converges in a few dozen steps).
  const double t0 = start / extent, t1 = end / extent;
  double d0 = t0, d1 = t1;
  std::vector<double> s;
  for (int it = 0; it < 500; ++it) {
    s = vinokur(n, d0, d1);
    const double e0 = s[1], e1 = 1.0 - s[n - 1];
    if (std::abs(e0 / t0 - 1.0) < 1e-13 && std::abs(e1 / t1 - 1.0) < 1e-13) break;
    d0 *= t0 / e0;
    d1 *= t1 / e1;
  }
  for (double& v : s) v *= extent;
  s[n] = extent;
  return s;
}

GridLines step_grid_lines(const GridSpec& spec) {
  const int nx = spec.cells_x, ny = spec.cells_y;
  const int n_up = spec.upstream_cells, n_down = nx - n_up;
  const int n_low = spec.step_cells, n_high = ny - n_low;
  if (n_up < 1 || n_down < 1) {
    throw InputError("key 'grid.upstream_cells': expected an integer in [1, cells_x) = [1, " +
                     std::to_string(nx) + "), got " + std::to_string(n_up));
  }
  if (n_low < 1 || n_high < 1) {
    throw InputError("key 'grid.step_cells': expected an integer in [1, cells_y) = [1, " +
                     std::to_string(ny) + "), got " + std::to_string(n_low));
  }
  if (!(spec.step_height > 0.0 && spec.step_height < spec.height)) {
    throw InputError("key 'grid.step_height': expected a number in (0, height = " +
                     std::to_string(spec.height) + "), got " + std::to_string(spec.step_height));
  }
  GridLines lines;
  // x: from the inlet to the corner (growth away from the corner), then to the outlet.
  if (spec.corner_spacing) {
    const auto up =
        one_sided_spacing(n_up, spec.upstream_length, *spec.corner_spacing, "grid.corner_spacing");
    for (int k = n_up; k >= 0; --k) lines.x.push_back(-up[k]);
    const auto down = one_sided_spacing(n_down, spec.length, *spec.corner_spacing, "grid.corner_spacing");
    for (int k = 1; k <= n_down; ++k) lines.x.push_back(down[k]);
  } else {
    lines.x = uniform_lines(n_up, -spec.upstream_length, 0.0);
    const auto down = uniform_lines(n_down, 0.0, spec.length);
    lines.x.insert(lines.x.end(), down.begin() + 1, down.end());
  }
  // y: below the step top, then above it to the top.
  const double h = spec.step_height, inlet = spec.height - h;
  if (spec.first_cell_height) {
    const double wall = *spec.first_cell_height, top = spec.top_cell_height.value_or(wall);
    lines.y = tanh_spacing(n_low, h, wall, wall, "grid.first_cell_height");
    const auto upper = tanh_spacing(n_high, inlet, wall, top,
                                    spec.top_cell_height ? "grid.top_cell_height" : "grid.first_cell_height");
    for (int k = 1; k <= n_high; ++k) lines.y.push_back(h + upper[k]);
  } else {
    lines.y = uniform_lines(n_low, 0.0, h);
    const auto upper = uniform_lines(n_high, h, spec.height);
    lines.y.insert(lines.y.end(), upper.begin() + 1, upper.end());
  }
  lines.y[static_cast<size_t>(n_low)] = h;  // exactly on the step top
  lines.y.back() = spec.height;
  return lines;
}

SolidRegionSpec step_solid_region(const GridSpec& spec) {
  SolidRegionSpec region;
  region.x = std::array<double, 2>{-spec.upstream_length, 0.0};
  region.y = std::array<double, 2>{0.0, spec.step_height};
  region.line = spec.line;
  region.from_generator = true;
  return region;
}

}  // namespace wallrans
