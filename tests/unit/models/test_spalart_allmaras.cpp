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

// Spalart & Allmaras (1994) chose f_v2 so that nu_tilde = kappa u_tau y solves the model in the
// whole constant-stress wall layer, viscous sublayer included: with the total stress
// (nu + nu_tilde f_v1) dU/dy = u_tau^2 the modified vorticity is S~ = u_tau/(kappa y) exactly, so
// r = 1, f_w = 1, production c_b1 u_tau^2 = destruction c_w1 kappa^2 u_tau^2 minus the diffusion
// (1 + c_b2) kappa^2 u_tau^2 / sigma (the definition of c_w1), and the f_t2 terms cancel
// (-c_b1 f_t2 S~ nu_tilde + (c_b1/kappa^2) f_t2 (nu_tilde/y)^2 = 0). Along this path S_bar/Omega >=
// -0.61 (evaluated for 0 < chi < 200), so the S~ limiter of Allmaras, Johnson & Spalart (2012,
// c_v2 = 0.7) stays inactive. Constants typed here from the 1994 paper (c_t3, c_t4 as listed by
// Allmaras, Johnson & Spalart 2012); f_v1 too, so a wrong c_v1 in the model breaks the identity.
TEST(SpalartAllmarasWallLayer, KappaUtauYIsAnExactSolution) {
  constexpr double cb1 = 0.1355, cb2 = 0.622, sigma = 2.0 / 3.0, kappa = 0.41, cv1 = 7.1;
  constexpr double ct3 = 1.2, ct4 = 0.5;
  constexpr double cw1 = cb1 / (kappa * kappa) + (1.0 + cb2) / sigma;
  const double nu = 1.5e-5, u_tau = 0.8;
  int checked = 0;
  for (const bool ft2 : {false, true}) {
    for (const double y_plus : {0.05, 0.5, 1.0, 2.0, 5.0, 10.0, 30.0, 100.0, 1e3, 1e4}) {
      const double y = y_plus * nu / u_tau;
      const double nt = kappa * u_tau * y, chi = nt / nu;
      const double fv1 = chi * chi * chi / (chi * chi * chi + cv1 * cv1 * cv1);
      const double omega = u_tau * u_tau / (nu + nt * fv1);  // dU/dy from the constant total stress
      const double grad_sq = kappa * kappa * u_tau * u_tau;  // |d nu_tilde/dy|^2
      for (const bool negative : {false, true}) {
        if (ft2 && negative) continue;  // wallrans' negative variant has no f_t2
        const SaSource s = sa_source(nt, nu, y, omega, grad_sq, ft2, negative);
        const double f_t2 = ft2 ? ct3 * std::exp(-ct4 * chi * chi) : 0.0;
        const double scale = cb1 * u_tau * u_tau;
        // Production c_b1 (1 - f_t2) S~ nu_tilde with S~ = u_tau/(kappa y): c_b1 (1 - f_t2) u_tau^2.
        // Round-off: a few tens of operations, 1e-13 of the scale.
        EXPECT_NEAR(s.production, (1.0 - f_t2) * scale, 1e-13 * scale) << "y+ " << y_plus << " ft2 " << ft2;
        // f_w(r = 1) = 1: destruction [c_w1 - (c_b1/kappa^2) f_t2] kappa^2 u_tau^2.
        const double destruction = s.destruction_coefficient * nt;
        EXPECT_NEAR(destruction, (cw1 - cb1 / (kappa * kappa) * f_t2) * kappa * kappa * u_tau * u_tau,
                    1e-13 * scale)
            << "y+ " << y_plus << " ft2 " << ft2;
        // Balance: d/dy((nu + nu_tilde) d nu_tilde/dy) = kappa^2 u_tau^2 exactly (nu_tilde linear).
        const double balance = s.production - destruction + s.gradient_term + grad_sq / sigma;
        EXPECT_NEAR(balance, 0.0, 1e-13 * scale) << "y+ " << y_plus << " ft2 " << ft2;
        ++checked;
      }
    }
  }
  EXPECT_EQ(checked, 30);
}
