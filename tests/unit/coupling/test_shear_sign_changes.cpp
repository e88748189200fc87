// Separation and reattachment points from the wall shear: zeros of known linear and periodic
// shear distributions, which linear interpolation between face centres finds exactly (linear) or
// to the interpolation error (sine).
#include <gtest/gtest.h>

#include <cmath>
#include <numbers>

#include "coupling/shear_sign_changes.hpp"

using namespace wallrans;

TEST(ShearSignChanges, LinearShearHasItsExactZero) {
  // tau = 0.3 - x on faces at 0, 0.25, ..., 1: one separation at x = 0.3 (between 0.25 and 0.5).
  std::vector<double> x, tau;
  for (int k = 0; k <= 4; ++k) {
    x.push_back(0.25 * k);
    tau.push_back(0.3 - 0.25 * k);
  }
  const auto zeros = shear_sign_changes(x, tau);
  ASSERT_EQ(zeros.size(), 1u);
  EXPECT_NEAR(zeros[0].x, 0.3, 1e-15);
  EXPECT_TRUE(zeros[0].is_separation);
}

TEST(ShearSignChanges, PeriodicBubbleAcrossTheSeam) {
  // tau = cos(2 pi x / L) on a periodic wall of length L = 9 with faces at (k + 1/2) L / n:
  // reattachment at 3L/4 and separation at L/4; shifted by 0.2 L, the separation moves to
  // 0.45 L and the reattachment to 0.95 L, and with 0.3 L the reattachment crosses the seam to
  // 0.05 L (found between the last face and the first face moved by one period).
  const double length = 9.0;
  const int n = 90;
  for (double shift : {0.0, 0.2, 0.3}) {
    std::vector<double> x, tau;
    for (int k = 0; k < n; ++k) {
      x.push_back((k + 0.5) * length / n);
      tau.push_back(std::cos(2.0 * std::numbers::pi * (x.back() / length - shift)));
    }
    const auto zeros = shear_sign_changes(x, tau, length);
    ASSERT_EQ(zeros.size(), 2u) << shift;
    double separation = std::fmod(0.25 + shift, 1.0) * length;
    double reattachment = std::fmod(0.75 + shift, 1.0) * length;
    // Linear interpolation of a sine near its zero: error (ds^2 / 8) |tau''| / |tau'| = ds^2 / 8
    // (2 pi / L) x |sin| <= 3e-4 at the zero (tan of the phase error), with ds = 0.1.
    for (const auto& z : zeros) {
      const double expected = z.is_separation ? separation : reattachment;
      EXPECT_NEAR(z.x, expected, 1e-3) << shift << (z.is_separation ? " separation" : " reattachment");
      EXPECT_GE(z.x, 0.0);
      EXPECT_LT(z.x, length);
    }
    EXPECT_LT(zeros[0].x, zeros[1].x);  // sorted
  }
}

TEST(ShearSignChanges, AttachedFlowHasNone) {
  EXPECT_TRUE(shear_sign_changes({0.0, 1.0, 2.0}, {1.0, 0.5, 2.0}, 3.0).empty());
  EXPECT_TRUE(shear_sign_changes({}, {}, 3.0).empty());
}
