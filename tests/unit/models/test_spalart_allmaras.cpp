// The analytic source slope dQ/dnu_tilde of the Spalart-Allmaras model (used to linearise the
// source implicitly) against central finite differences of the source itself, on both branches of
// the S-tilde limiter, the r cap and the negative branch, for every variant.
#include <gtest/gtest.h>

#include <cmath>

#include "models/spalart_allmaras.hpp"

using namespace wallrans;

namespace {

double net_source(double nt, double nu, double d, double omega, bool ft2, bool negative) {
  const SaSource s = sa_source(nt, nu, d, omega, 0.0, ft2, negative);
  return s.production - s.destruction_coefficient * nt;
}

}  // namespace

TEST(SpalartAllmarasSource, SlopeMatchesFiniteDifferences) {
  const double nu = 1.0e-5;
  int compared = 0, limiter_branch = 0, negative_branch = 0;
  for (const bool ft2 : {false, true}) {
    for (const bool negative : {false, true}) {
      for (const double chi : {-20.0, -0.5, 0.05, 0.7, 2.0, 8.0, 40.0, 300.0}) {
        if (chi < 0.0 && !negative) continue;
        for (const double d : {1e-5, 1e-3, 1e-1}) {
          for (const double omega : {1e-2, 1.0, 1e3, 1e5}) {
            const double nt = chi * nu;
            const double h = 1e-6 * std::abs(nt);
            const double qp = net_source(nt + h, nu, d, omega, ft2, negative);
            const double qm = net_source(nt - h, nu, d, omega, ft2, negative);
            const double q0 = net_source(nt, nu, d, omega, ft2, negative);
            const double central = (qp - qm) / (2.0 * h);
            // A kink (r reaching its cap of 10, the S-tilde limiter switching) between the three
            // points shows as one-sided slopes that differ: such points are not differentiable.
            const double right = (qp - q0) / h, left = (q0 - qm) / h;
            const double scale = std::abs(central) + std::abs(q0 / nt);
            if (std::abs(right - left) > 1e-4 * scale) continue;
            const SaSource s = sa_source(nt, nu, d, omega, 0.0, ft2, negative);
            // Central differences: truncation h^2 Q'''/6 ~ 1e-12 relative; round-off eps Q/h ~
            // 1e-10 relative; 1e-6 of the slope's scale bounds both with margin.
            EXPECT_NEAR(s.net_slope, central, 1e-6 * scale)
                << "chi " << chi << " d " << d << " omega " << omega << " ft2 " << ft2;
            ++compared;
            const double k2d2 = SaConstants::kappa * SaConstants::kappa * d * d;
            const double chi3 = chi * chi * chi;
            const double fv1 = chi3 / (chi3 + std::pow(SaConstants::cv1, 3));
            const double s_bar = nt * (1.0 - chi / (1.0 + chi * fv1)) / k2d2;
            if (nt > 0.0 && s_bar < -SaConstants::cv2 * omega) ++limiter_branch;
            if (nt < 0.0) ++negative_branch;
          }
        }
      }
    }
  }
  EXPECT_GT(compared, 150);
  EXPECT_GT(limiter_branch, 0);
  EXPECT_GT(negative_branch, 0);
}
