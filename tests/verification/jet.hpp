// Test helper: forward-mode automatic differentiation to second order in two variables, so
// manufactured-solution sources are exact derivatives of the chosen fields (no hand algebra).
#pragma once

#include <cmath>
#include <numbers>

namespace wallrans::test_support {

/// A function of (x, y) at one point: value and its first and second partial derivatives.
struct Jet {
  double value = 0.0;
  double dx = 0.0, dy = 0.0;
  double dxx = 0.0, dxy = 0.0, dyy = 0.0;

  static Jet constant(double c) { return {c}; }
  static Jet x(double x0) { return {x0, 1.0, 0.0}; }
  static Jet y(double y0) { return {y0, 0.0, 1.0}; }
  double laplacian() const { return dxx + dyy; }
};

/// f(a) for a scalar function with derivatives f1 = f'(a), f2 = f''(a) (chain rule to second order).
inline Jet compose(const Jet& a, double f, double f1, double f2) {
  return {f,
          f1 * a.dx,
          f1 * a.dy,
          f2 * a.dx * a.dx + f1 * a.dxx,
          f2 * a.dx * a.dy + f1 * a.dxy,
          f2 * a.dy * a.dy + f1 * a.dyy};
}

inline Jet operator+(const Jet& a, const Jet& b) {
  return {a.value + b.value, a.dx + b.dx, a.dy + b.dy, a.dxx + b.dxx, a.dxy + b.dxy, a.dyy + b.dyy};
}
inline Jet operator-(const Jet& a) { return {-a.value, -a.dx, -a.dy, -a.dxx, -a.dxy, -a.dyy}; }
inline Jet operator-(const Jet& a, const Jet& b) { return a + (-b); }
inline Jet operator*(const Jet& a, const Jet& b) {
  return {a.value * b.value,
          a.dx * b.value + a.value * b.dx,
          a.dy * b.value + a.value * b.dy,
          a.dxx * b.value + 2.0 * a.dx * b.dx + a.value * b.dxx,
          a.dxy * b.value + a.dx * b.dy + a.dy * b.dx + a.value * b.dxy,
          a.dyy * b.value + 2.0 * a.dy * b.dy + a.value * b.dyy};
}
inline Jet operator/(const Jet& a, const Jet& b) {
  const double inv = 1.0 / b.value;
  return a * compose(b, inv, -inv * inv, 2.0 * inv * inv * inv);
}
inline Jet operator+(double c, const Jet& a) { return Jet::constant(c) + a; }
inline Jet operator+(const Jet& a, double c) { return a + Jet::constant(c); }
inline Jet operator-(double c, const Jet& a) { return Jet::constant(c) - a; }
inline Jet operator-(const Jet& a, double c) { return a - Jet::constant(c); }
inline Jet operator*(double c, const Jet& a) {
  return {c * a.value, c * a.dx, c * a.dy, c * a.dxx, c * a.dxy, c * a.dyy};
}
inline Jet operator*(const Jet& a, double c) { return c * a; }
inline Jet operator/(const Jet& a, double c) { return (1.0 / c) * a; }
inline Jet operator/(double c, const Jet& a) { return Jet::constant(c) / a; }

inline Jet exp(const Jet& a) {
  const double e = std::exp(a.value);
  return compose(a, e, e, e);
}
/// d erf(z)/dz = (2/sqrt(pi)) exp(-z^2), d^2 erf/dz^2 = -2 z d erf/dz.
inline Jet erf(const Jet& a) {
  const double d1 = 2.0 / std::sqrt(std::numbers::pi) * std::exp(-a.value * a.value);
  return compose(a, std::erf(a.value), d1, -2.0 * a.value * d1);
}
inline Jet sqrt(const Jet& a) {
  const double s = std::sqrt(a.value);
  return compose(a, s, 0.5 / s, -0.25 / (s * a.value));
}
inline Jet pow(const Jet& a, double p) {
  return compose(a, std::pow(a.value, p), p * std::pow(a.value, p - 1.0),
                 p * (p - 1.0) * std::pow(a.value, p - 2.0));
}

}  // namespace wallrans::test_support
