// The estimate of the time to convergence (a straight line through the recent log residuals) and
// the report rows built from it.
#include <gtest/gtest.h>

#include <cmath>
#include <string>
#include <vector>

#include "app/progress.hpp"

using namespace wallrans;

// Residuals falling by a constant factor q per iteration lie on a straight line in log10 r, so the
// fitted line is exact: from r_n the target t is reached after log(t / r_n) / log(q) iterations.
TEST(ConvergenceEstimate, GeometricDecayIsExtrapolatedExactly) {
  ConvergenceEstimate estimate(1e-6, 20);
  const double q = 0.9, seconds_per_iteration = 0.25;
  for (int n = 1; n <= 30; ++n)
    estimate.add(n, {std::pow(q, n), 0.5 * std::pow(q, n)}, n * seconds_per_iteration);
  // The slower residual (the first) decides: r_30 = q^30, target 1e-6.
  const double expected = std::log(1e-6 / std::pow(q, 30)) / std::log(q);
  ASSERT_TRUE(estimate.iterations_to_target().has_value());
  EXPECT_NEAR(*estimate.iterations_to_target(), expected, 1e-9 * expected);
  ASSERT_TRUE(estimate.seconds_per_iteration().has_value());
  EXPECT_NEAR(*estimate.seconds_per_iteration(), seconds_per_iteration, 1e-12);
  EXPECT_NEAR(*estimate.seconds_to_target(), expected * seconds_per_iteration, 1e-9 * expected);
}

TEST(ConvergenceEstimate, UnknownWhileARemainingResidualDoesNotFall) {
  ConvergenceEstimate estimate(1e-6, 10);
  EXPECT_FALSE(estimate.iterations_to_target().has_value()) << "no data yet";
  for (int n = 1; n <= 10; ++n) estimate.add(n, {std::pow(0.5, n), 1e-3 * (1.0 + 0.01 * n)}, double(n));
  EXPECT_FALSE(estimate.iterations_to_target().has_value()) << "the second residual grows";
  // A residual already below the target does not hold the estimate up, even if it grows.
  ConvergenceEstimate below(1e-6, 10);
  for (int n = 1; n <= 10; ++n) below.add(n, {std::pow(0.5, n), 1e-9 * n}, double(n));
  ASSERT_TRUE(below.iterations_to_target().has_value());
  EXPECT_NEAR(*below.iterations_to_target(), std::log(1e-6 / std::pow(0.5, 10)) / std::log(0.5), 1e-9);
  // All below the target: nothing left to do.
  ConvergenceEstimate done(1e-6, 10);
  for (int n = 1; n <= 6; ++n) done.add(n, {1e-8, 0.0}, double(n));
  EXPECT_EQ(done.iterations_to_target(), 0.0);
}

TEST(ProgressRow, ColumnsOfTheHeaderAndTheEstimate) {
  const std::string header = progress_header({"u", "v", "mass", "nu_tilde"});
  EXPECT_NE(header.find("res_nu_tilde"), std::string::npos) << header;
  EXPECT_NE(header.find("s_per_it"), std::string::npos) << header;
  EXPECT_NE(header.find("eta_s"), std::string::npos) << header;
  ConvergenceEstimate estimate(1e-12, 50);
  estimate.add(1, {1.0}, 0.5);
  const std::string first = progress_row(1, {1.0}, 0.5, estimate, 100, "");
  EXPECT_EQ(first.size(), header.size() - 3 * 13) << "one residual column instead of four:\n"
                                                  << header << "\n"
                                                  << first;
  EXPECT_EQ(first.substr(first.size() - 19), "         -        -") << "no rate and no estimate yet";
  for (int n = 2; n <= 10; ++n) estimate.add(n, {std::pow(0.1, n - 1)}, 0.5 * n);
  // 1e-9 now, a decade per iteration: 3 more iterations to 1e-12 at 0.5 s each (1.5 s, printed
  // rounded), within a cap 100 iterations away.
  const std::string row = progress_row(10, {1e-9}, 5.0, estimate, 100, "note");
  EXPECT_NE(row.find("      0.5        2  note"), std::string::npos) << row;
  EXPECT_NE(progress_row(10, {1e-9}, 5.0, estimate, 2, "").find(">cap"), std::string::npos)
      << "the estimate passes the iteration cap";
}
