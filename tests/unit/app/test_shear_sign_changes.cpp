// Separation and reattachment points from sampled wall shear: positions by linear interpolation,
// the kind by the direction of the sign change, runs of zero samples, and bad input.
#include <gtest/gtest.h>

#include <stdexcept>
#include <vector>

#include "app/shear_sign_changes.hpp"

using namespace wallrans;

// A shear that is linear in s between two samples has its zero where the straight line through
// them crosses zero: s = s0 + tau0 / (tau0 - tau1) (s1 - s0).
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
