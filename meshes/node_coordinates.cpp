// Grid generators with wall clustering (geometric stretching) for the built-in cases.
#include "meshes/node_coordinates.hpp"

#include <cmath>
#include <cstdio>
#include <numbers>
#include <string>
#include <utility>

#include "core/error.hpp"
#include "meshes/step_grid.hpp"
#include "meshes/hill.hpp"

namespace wallrans {

namespace {

// Sum of the geometric series h (1 + r + ... + r^(n-1)).
double series(double h, double r, int n) {
  if (std::abs(r - 1.0) < 1e-14) return h * n;
  return h * (std::pow(r, n) - 1.0) / (r - 1.0);
}

std::vector<double> uniform(int n, double extent) {
  std::vector<double> s(static_cast<size_t>(n) + 1);
  for (int k = 0; k <= n; ++k) s[k] = extent * k / n;
  return s;
}

}  // namespace

std::vector<double> one_sided_spacing(int n, double extent, double first_spacing, const char* what) {
  if (!(first_spacing > 0.0) || first_spacing > extent / n * (1.0 + 1e-12)) {
    char text[160];
    std::snprintf(text, sizeof text, "expected a value in (0, %g] (extent %g m / %d cells), got %g",
                  extent / n, extent, n, first_spacing);
    throw InputError("key '" + std::string(what) + "': " + text);
  }
  // Growth ratio r >= 1 with h (r^n - 1)/(r - 1) = extent, by bisection (monotone in r).
  double lo = 1.0, hi = 2.0;
  while (series(first_spacing, hi, n) < extent) hi *= 2.0;
  for (int it = 0; it < 200; ++it) {
    const double mid = 0.5 * (lo + hi);
    (series(first_spacing, mid, n) < extent ? lo : hi) = mid;
  }
  const double r = 0.5 * (lo + hi);
  std::vector<double> s(static_cast<size_t>(n) + 1, 0.0);
  double h = first_spacing;
  for (int k = 1; k <= n; ++k, h *= r) s[k] = s[k - 1] + h;
  for (int k = 1; k <= n; ++k) s[k] *= extent / s[n];  // remove the bisection round-off
  s[n] = extent;
  return s;
}

std::vector<double> two_sided_spacing(int n, double extent, double first_spacing, const char* what) {
  if (n % 2 != 0) {
    throw InputError(
        "key 'grid.cells': expected an even cell count in the direction clustered at both walls "
        "(with " +
        std::string(what) + "), got " + std::to_string(n));
  }
  if (!(first_spacing > 0.0) || first_spacing > extent / n * (1.0 + 1e-12)) {
    one_sided_spacing(n, extent, first_spacing, what);  // throws with the whole-side figures
  }
  const auto half = one_sided_spacing(n / 2, 0.5 * extent, first_spacing, what);
  std::vector<double> s(static_cast<size_t>(n) + 1);
  for (int k = 0; k <= n / 2; ++k) {
    s[k] = half[k];
    s[n - k] = extent - half[k];
  }
  return s;
}

NodeCoordinates generate_nodes(const GridSpec& spec) {
  const int nx = spec.cells_x, ny = spec.cells_y;
  NodeCoordinates out;
  out.cells_x = nx;
  out.cells_y = ny;
  out.nodes.resize(static_cast<size_t>(nx + 1) * (ny + 1));
  std::vector<double> xs, ys;
  switch (spec.generator) {
    case GridGenerator::channel:
      xs = uniform(nx, spec.length);
      ys = spec.first_cell_height
               ? two_sided_spacing(ny, spec.height, *spec.first_cell_height, "grid.first_cell_height")
               : uniform(ny, spec.height);
      break;
    case GridGenerator::cavity:
      xs = spec.first_cell_height
               ? two_sided_spacing(nx, spec.length, *spec.first_cell_height, "grid.first_cell_height")
               : uniform(nx, spec.length);
      ys = spec.first_cell_height
               ? two_sided_spacing(ny, spec.height, *spec.first_cell_height, "grid.first_cell_height")
               : uniform(ny, spec.height);
      break;
    case GridGenerator::plate: {
      // x: run-up (slip) from -run_up to 0 clustered towards the leading edge, then the plate.
      const int n_run = spec.run_up_cells;
      const int n_plate = nx - n_run;
      if (n_run < 0 || n_plate < 1 || (spec.run_up > 0.0) != (n_run > 0)) {
        throw InputError(
            "key 'grid.run_up_cells': expected 1 <= run_up_cells < cells_x when run_up > 0 "
            "(and 0 when run_up = 0), got " +
            std::to_string(n_run));
      }
      const double le = spec.leading_edge_spacing.value_or(spec.length / n_plate);
      const auto plate = one_sided_spacing(n_plate, spec.length, le, "grid.leading_edge_spacing");
      xs.clear();
      if (n_run > 0) {
        const auto run = one_sided_spacing(n_run, spec.run_up, std::min(le, spec.run_up / n_run),
                                           "grid.leading_edge_spacing");
        for (int k = n_run; k >= 1; --k) xs.push_back(-run[k]);
      }
      for (double x : plate) xs.push_back(x);
      ys = spec.first_cell_height
               ? one_sided_spacing(ny, spec.height, *spec.first_cell_height, "grid.first_cell_height")
               : uniform(ny, spec.height);
      break;
    }
    case GridGenerator::skewed_box:
      xs = uniform(nx, spec.length);
      ys = uniform(ny, spec.height);
      break;
    case GridGenerator::step: {
      GridLines lines = step_grid_lines(spec);
      xs = std::move(lines.x);
      ys = std::move(lines.y);
      break;
    }
    case GridGenerator::hill_channel:
      return hill_channel_nodes(spec);
  }
  for (int j = 0; j <= ny; ++j) {
    for (int i = 0; i <= nx; ++i) out.at(i, j) = {xs[i], ys[j]};
  }
  if (spec.generator == GridGenerator::skewed_box) {
    // Smooth interior displacement that vanishes on the boundary: skews and curves the grid lines
    // (boundary cells are non-orthogonal too, since the displacement's normal derivative is not zero).
    const double pi = std::numbers::pi;
    const double a = spec.skew_amplitude;
    for (int j = 0; j <= ny; ++j) {
      for (int i = 0; i <= nx; ++i) {
        const double xi = static_cast<double>(i) / nx, eta = static_cast<double>(j) / ny;
        Vec2& p = out.at(i, j);
        p.x += a * spec.length * std::sin(pi * xi) * std::sin(2.0 * pi * eta);
        p.y += a * spec.height * std::sin(2.0 * pi * xi) * std::sin(pi * eta) * (1.0 - 0.5 * xi);
      }
    }
  }
  return out;
}

}  // namespace wallrans
