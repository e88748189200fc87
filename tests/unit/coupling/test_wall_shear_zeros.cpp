// Sign changes of the wall shear stress: interpolated zeros between face centres, separation and
// reattachment told apart, exact zeros and end values handled.
#include <gtest/gtest.h>

#include "coupling/wall_shear_zeros.hpp"

using namespace wallrans;

TEST(WallShearZeros, LinearShearGivesItsExactZero) {
  // tau = x - 0.37 sampled at x = 0, 0.1, ..., 1: the straight line through the samples around the
  // zero is the function itself.
  std::vector<double> x, tau;
  for (int k = 0; k <= 10; ++k) {
    x.push_back(0.1 * k);
    tau.push_back(0.1 * k - 0.37);
  }
  const auto zeros = wall_shear_zeros(x, tau);
  ASSERT_EQ(zeros.size(), 1u);
  EXPECT_NEAR(zeros[0].position, 0.37, 1e-15);
  EXPECT_TRUE(zeros[0].is_reattachment);
}

TEST(WallShearZeros, BubbleBehindAStepWithACornerEddy) {
  // Positive in a corner eddy, negative in the main bubble, positive after reattachment.
  const std::vector<double> x{0.1, 0.5, 1.0, 2.0, 4.0, 6.0, 7.0, 9.0};
  const std::vector<double> tau{0.2, 0.1, -0.1, -0.4, -0.3, -0.1, 0.1, 0.3};
  const auto zeros = wall_shear_zeros(x, tau);
  ASSERT_EQ(zeros.size(), 2u);
  EXPECT_NEAR(zeros[0].position, 0.75, 1e-15);
  EXPECT_FALSE(zeros[0].is_reattachment);
  EXPECT_NEAR(zeros[1].position, 6.5, 1e-15);
  EXPECT_TRUE(zeros[1].is_reattachment);
}

TEST(WallShearZeros, ExactZerosCountOnceAndOnlyBetweenOppositeSigns) {
  // A run of exact zeros between opposite signs is one zero at its middle; zeros between equal
  // signs (touching) and at the ends are none.
  const std::vector<double> x{0, 1, 2, 3, 4, 5, 6, 7, 8};
  const std::vector<double> tau{0.0, 1.0, 0.0, 0.0, -1.0, 0.0, -2.0, -1.0, 0.0};
  const auto zeros = wall_shear_zeros(x, tau);
  ASSERT_EQ(zeros.size(), 1u);
  EXPECT_EQ(zeros[0].position, 2.5);
  EXPECT_FALSE(zeros[0].is_reattachment);
  EXPECT_TRUE(wall_shear_zeros({}, {}).empty());
  EXPECT_TRUE(wall_shear_zeros({1.0}, {-1.0}).empty());
}
