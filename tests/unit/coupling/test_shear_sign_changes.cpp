// Separation and reattachment points from the wall shear: zeros of known linear and periodic
// shear distributions, which linear interpolation between face centres finds exactly (linear) or
// to the interpolation error (sine).
#include <gtest/gtest.h>

#include <cmath>
#include <stdexcept>
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
  EXPECT_NEAR(zeros[0].s, 0.3, 1e-15);
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
      EXPECT_NEAR(z.s, expected, 1e-3) << shift << (z.is_separation ? " separation" : " reattachment");
      EXPECT_GE(z.s, 0.0);
      EXPECT_LT(z.s, length);
    }
    EXPECT_LT(zeros[0].s, zeros[1].s);  // sorted
  }
}

TEST(ShearSignChanges, AttachedFlowHasNone) {
  EXPECT_TRUE(shear_sign_changes({0.0, 1.0, 2.0}, {1.0, 0.5, 2.0}, 3.0).empty());
  EXPECT_TRUE(shear_sign_changes({}, {}, 3.0).empty());
}

TEST(ShearSignChanges, LinearShearGivesItsExactZero) {
  // tau = x - 0.37 sampled at x = 0, 0.1, ..., 1: the straight line through the samples around the
  // zero is the function itself.
  std::vector<double> x, tau;
  for (int k = 0; k <= 10; ++k) {
    x.push_back(0.1 * k);
    tau.push_back(0.1 * k - 0.37);
  }
  const auto zeros = shear_sign_changes(x, tau);
  ASSERT_EQ(zeros.size(), 1u);
  EXPECT_NEAR(zeros[0].s, 0.37, 1e-15);
  EXPECT_FALSE(zeros[0].is_separation);
}

TEST(ShearSignChanges, BubbleBehindAStepWithACornerEddy) {
  // Positive in a corner eddy, negative in the main bubble, positive after reattachment.
  const std::vector<double> x{0.1, 0.5, 1.0, 2.0, 4.0, 6.0, 7.0, 9.0};
  const std::vector<double> tau{0.2, 0.1, -0.1, -0.4, -0.3, -0.1, 0.1, 0.3};
  const auto zeros = shear_sign_changes(x, tau);
  ASSERT_EQ(zeros.size(), 2u);
  EXPECT_NEAR(zeros[0].s, 0.75, 1e-15);
  EXPECT_TRUE(zeros[0].is_separation);
  EXPECT_NEAR(zeros[1].s, 6.5, 1e-15);
  EXPECT_FALSE(zeros[1].is_separation);
}

TEST(ShearSignChanges, ExactZerosCountOnceAndOnlyBetweenOppositeSigns) {
  // A run of exact zeros between opposite signs is one zero at its middle; zeros between equal
  // signs (touching) and at the ends are none.
  const std::vector<double> x{0, 1, 2, 3, 4, 5, 6, 7, 8};
  const std::vector<double> tau{0.0, 1.0, 0.0, 0.0, -1.0, 0.0, -2.0, -1.0, 0.0};
  const auto zeros = shear_sign_changes(x, tau);
  ASSERT_EQ(zeros.size(), 1u);
  EXPECT_EQ(zeros[0].s, 2.5);
  EXPECT_TRUE(zeros[0].is_separation);
  EXPECT_TRUE(shear_sign_changes({}, {}).empty());
  EXPECT_TRUE(shear_sign_changes({1.0}, {-1.0}).empty());
}

TEST(ShearSignChanges, LinearInterpolationBetweenSamples) {
  const std::vector<double> s{0.0, 1.0, 3.0, 4.0, 6.0};
  const std::vector<double> shear{2.0, 1.0, -3.0, -1.0, 1.0};
  const auto points = shear_sign_changes(s, shear);
  ASSERT_EQ(points.size(), 2u);
  // + to - between s = 1 (1.0) and s = 3 (-3.0): 1 + 1/4 * 2 = 1.5; the flow leaves the wall.
  EXPECT_DOUBLE_EQ(points[0].s, 1.5);
  EXPECT_TRUE(points[0].is_separation);
  EXPECT_EQ(points[0].before, 1);
  EXPECT_DOUBLE_EQ(points[0].fraction, 0.25);
  // - to + between s = 4 (-1.0) and s = 6 (1.0): the middle, 5; the flow comes back.
  EXPECT_DOUBLE_EQ(points[1].s, 5.0);
  EXPECT_FALSE(points[1].is_separation);
  EXPECT_EQ(points[1].before, 3);
}

TEST(ShearSignChanges, ExactZerosGiveOnePointAtTheMiddleOfTheirRun) {
  // One zero sample between opposite signs: the point is that sample.
  auto one = shear_sign_changes({0.0, 1.0, 2.0}, {1.0, 0.0, -1.0});
  ASSERT_EQ(one.size(), 1u);
  EXPECT_DOUBLE_EQ(one[0].s, 1.0);
  EXPECT_TRUE(one[0].is_separation);
  // Two zero samples: the middle between them.
  auto two = shear_sign_changes({0.0, 1.0, 2.0, 4.0}, {-1.0, 0.0, 0.0, 2.0});
  ASSERT_EQ(two.size(), 1u);
  EXPECT_DOUBLE_EQ(two[0].s, 1.5);
  EXPECT_FALSE(two[0].is_separation);
  // Zeros between samples of the same sign, or at the ends, change no sign.
  EXPECT_TRUE(shear_sign_changes({0.0, 1.0, 2.0}, {1.0, 0.0, 1.0}).empty());
  EXPECT_TRUE(shear_sign_changes({0.0, 1.0, 2.0}, {0.0, -1.0, 0.0}).empty());
}

TEST(ShearSignChanges, NoSamplesOrOneSignGiveNoPoints) {
  EXPECT_TRUE(shear_sign_changes({}, {}).empty());
  EXPECT_TRUE(shear_sign_changes({0.0}, {-1.0}).empty());
  EXPECT_TRUE(shear_sign_changes({0.0, 1.0, 2.0}, {-1.0, -2.0, -0.5}).empty());
  EXPECT_THROW(shear_sign_changes({0.0, 1.0}, {1.0}), std::invalid_argument);
}
