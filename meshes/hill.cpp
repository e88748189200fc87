// Periodic-hill geometry and its body-fitted grid.
#include "meshes/hill.hpp"

#include <algorithm>
#include <cmath>
#include <string>
#include <vector>

#include "core/error.hpp"

namespace wallrans {

namespace {

// Hill of Almeida, Durao & Heitor (1993), as modified for simulation by Mellen, Froehlich & Rodi
// (2000): the spline fit published with the geometry file of the ERCOFTAC periodic-hill test case
// (classic database case 81, "geom.dat"; also quoted by Breuer, Peller, Rapp & Manhart 2009,
// Computers & Fluids 38:433). x and f in mm; the fit passes through (0, 28), (9, 27), (14, 24),
// (20, 19), (30, 11), (40, 4), (54, 0). One public copy drops the '+' before the x^2 term of the
// last piece; f(54) = 0 needs it (tests/unit/meshes/test_hill.cpp).
constexpr std::array<HillPiece, 6> pieces{{
    {0.0, 9.0, {2.800000000000e+01, 0.000000000000e+00, 6.775070969851e-03, -2.124527775800e-03}},
    {9.0, 14.0, {2.507355893131e+01, 9.754803562315e-01, -1.016116352781e-01, 1.889794677828e-03}},
    {14.0, 20.0, {2.579601052357e+01, 8.206693007457e-01, -9.055370274339e-02, 1.626510569859e-03}},
    {20.0, 30.0, {4.046435022819e+01, -1.379581654948e+00, 1.945884504128e-02, -2.070318932190e-04}},
    {30.0, 40.0, {1.792461334664e+01, 8.743920332081e-01, -5.567361123058e-02, 6.277731764683e-04}},
    {40.0, 54.0, {5.639011190988e+01, -2.010520359035e+00, 1.644919857549e-02, 2.674976141766e-05}},
}};
constexpr double hill_height_mm = 28.0;
constexpr double foot_mm = 54.0;
constexpr double period_mm = hill_period_in_h * hill_height_mm;  // 252 mm

const HillPiece& piece_at(double x_mm) {
  for (const HillPiece& p : pieces)
    if (x_mm <= p.to_mm) return p;
  return pieces.back();
}

double cubic(const HillPiece& p, double x) { return p.c[0] + x * (p.c[1] + x * (p.c[2] + x * p.c[3])); }
double cubic_slope(const HillPiece& p, double x) { return p.c[1] + x * (2.0 * p.c[2] + 3.0 * x * p.c[3]); }

// x in [0, period) [mm].
double wrapped_mm(double x, double h) {
  const double x_mm = x / h * hill_height_mm;
  const double w = std::fmod(x_mm, period_mm);
  return w < 0.0 ? w + period_mm : w;
}

// Positions 0..n along a polyline of sample points, at the given arc lengths (increasing).
std::vector<Vec2> at_arc_lengths(const std::vector<Vec2>& samples, const std::vector<double>& targets) {
  std::vector<double> arc(samples.size(), 0.0);
  for (size_t k = 1; k < samples.size(); ++k) arc[k] = arc[k - 1] + norm(samples[k] - samples[k - 1]);
  std::vector<Vec2> out;
  out.reserve(targets.size());
  size_t k = 1;
  for (double s : targets) {
    while (k + 1 < arc.size() && arc[k] < s) ++k;
    const double w = std::clamp((s - arc[k - 1]) / (arc[k] - arc[k - 1]), 0.0, 1.0);
    out.push_back(samples[k - 1] + w * (samples[k] - samples[k - 1]));
  }
  return out;
}

double polyline_length(const std::vector<Vec2>& samples) {
  double length = 0.0;
  for (size_t k = 1; k < samples.size(); ++k) length += norm(samples[k] - samples[k - 1]);
  return length;
}

}  // namespace

const std::array<HillPiece, 6>& hill_pieces() { return pieces; }

double hill_contour_mm(double x_mm) {
  const HillPiece& p = piece_at(x_mm);
  const double f = cubic(p, x_mm);
  // The clips of the published fit: the first cubic rises above the crest for x < 3.19 mm, the
  // last dips (by 1e-11 mm) below the floor at its double root near 54 mm.
  if (&p == &pieces.front()) return std::min(hill_height_mm, f);
  if (&p == &pieces.back()) return std::max(0.0, f);
  return f;
}

double hill_contour_slope(double x_mm) {
  const HillPiece& p = piece_at(x_mm);
  const double f = cubic(p, x_mm);
  if ((&p == &pieces.front() && f > hill_height_mm) || (&p == &pieces.back() && f < 0.0)) return 0.0;
  return cubic_slope(p, x_mm);
}

double hill_floor(double x, double h) {
  const double w = wrapped_mm(x, h);
  double f = 0.0;
  if (w <= foot_mm) f = hill_contour_mm(w);
  if (w >= period_mm - foot_mm) f = hill_contour_mm(period_mm - w);
  return h * f / hill_height_mm;
}

double hill_floor_slope(double x, double h) {
  const double w = wrapped_mm(x, h);
  if (w <= foot_mm) return hill_contour_slope(w);
  if (w >= period_mm - foot_mm) return -hill_contour_slope(period_mm - w);
  return 0.0;
}

NodeCoordinates hill_channel_nodes(const GridSpec& spec) {
  const int nx = spec.cells_x, ny = spec.cells_y;
  const double h = spec.hill_height;
  const double length = hill_period_in_h * h, top = hill_channel_height_in_h * h;
  NodeCoordinates out;
  out.cells_x = nx;
  out.cells_y = ny;
  out.nodes.resize(static_cast<size_t>(nx + 1) * (ny + 1));

  // Bottom nodes equally spaced in arc length along the floor (finer in x on the slopes).
  const int n_floor = 400 * std::max(nx, 64);
  std::vector<Vec2> floor(static_cast<size_t>(n_floor) + 1);
  for (int k = 0; k <= n_floor; ++k) {
    const double x = length * k / n_floor;
    floor[k] = {x, hill_floor(x, h)};
  }
  const double floor_length = polyline_length(floor);
  std::vector<double> floor_targets(static_cast<size_t>(nx) + 1);
  for (int i = 0; i <= nx; ++i) floor_targets[i] = floor_length * i / nx;
  std::vector<Vec2> bottom = at_arc_lengths(floor, floor_targets);

  // Each column: a grid line that leaves the floor point B along the floor normal n and turns
  // vertical with the distance s from the floor, direction (w n + (1 - w) e_y) / |...| with
  // w = exp(-s / (0.2 h)), marched (midpoint rule) up to the top wall. Near the floor the grid is
  // orthogonal; the blend length 0.2 h trades that against the crowding of the lines that leave a
  // concave stretch of floor (measured on 384 x 192: lines within 3 degrees of the wall normal for
  // j < 20, largest expansion ratio 1.25; with 0.4 h, 1.4 degrees and 1.66).
  const double bend = 0.2 * h, step = 1e-3 * h;
  std::vector<Vec2> curve;
  for (int i = 0; i < nx; ++i) {
    const double xb = i == 0 ? 0.0 : bottom[i].x;
    const double slope = hill_floor_slope(xb, h);
    const Vec2 normal = (1.0 / std::hypot(slope, 1.0)) * Vec2{-slope, 1.0};
    auto direction = [&](double s) {
      const double w = std::exp(-s / bend);
      const Vec2 d = w * normal + Vec2{0.0, 1.0 - w};
      return (1.0 / norm(d)) * d;
    };
    curve.assign(1, Vec2{xb, hill_floor(xb, h)});
    for (double s = 0.0; curve.back().y < top; s += step)
      curve.push_back(curve.back() + step * direction(s + 0.5 * step));
    const Vec2 below = curve[curve.size() - 2], above = curve.back();
    curve.back() = below + ((top - below.y) / (above.y - below.y)) * (above - below);
    const double extent = polyline_length(curve);
    std::vector<double> along;
    if (spec.first_cell_height) {
      along = two_sided_spacing(ny, extent, *spec.first_cell_height, "grid.first_cell_height");
    } else {
      for (int j = 0; j <= ny; ++j) along.push_back(extent * j / ny);
    }
    const std::vector<Vec2> column = at_arc_lengths(curve, along);
    for (int j = 0; j <= ny; ++j) out.at(i, j) = column[j];
    out.at(i, 0) = curve.front();
    out.at(i, ny) = curve.back();
  }
  for (int j = 0; j <= ny; ++j) out.at(nx, j) = out.at(0, j) + Vec2{length, 0.0};
  return out;
}

}  // namespace wallrans
