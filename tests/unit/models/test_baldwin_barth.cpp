// Baldwin-Barth closure (Baldwin & Barth 1990, NASA TM-102847) against identities of the paper:
// f2 -> 1 far from the wall, the log-layer balance that defines sigma_eps, and the wall-layer
// solution nu_t+ = kappa y+ D1 D2 that the f2 function is built to satisfy.
#include <gtest/gtest.h>

#include <cmath>

#include "models/baldwin_barth.hpp"

using namespace wallrans;

namespace {

// Constants typed from the paper (C_eps1, C_eps2, C_mu, A0+, A2+, kappa).
constexpr double ce1 = 1.2, ce2 = 2.0, cmu = 0.09, a0 = 26.0, a2 = 10.0, kappa = 0.41;

}  // namespace

TEST(BaldwinBarthClosure, F2TendsToOneFarFromTheWall) {
  // For y+ >> A0+ the damping terms vanish and f2 = 1 + (1 - C_eps1/C_eps2)/(kappa y+) + R, where
  // R collects the terms with exp(-y+/A0+) (the slower of the two exponentials):
  // |R| <= 2 (1 - C_eps1/C_eps2) (y+/A0+ + 1) exp(-y+/A0+), plus 1e-14 for round-off.
  for (const double y_plus : {520.0, 1e3, 1e4, 1e5}) {
    const BbDamping damp = bb_damping(y_plus);
    const double leading = (1.0 - ce1 / ce2) / (kappa * y_plus);
    const double remainder = 2.0 * (1.0 - ce1 / ce2) * (y_plus / a0 + 1.0) * std::exp(-y_plus / a0);
    EXPECT_NEAR(damp.f2, 1.0 + leading, remainder + 1e-14) << "y+ " << y_plus;
    EXPECT_NEAR(damp.d1d2, 1.0, 2.0 * std::exp(-y_plus / a0) + 1e-15) << "y+ " << y_plus;
  }
  EXPECT_LT(std::abs(bb_damping(1e5).f2 - 1.0), 1e-4);
}

TEST(BaldwinBarthClosure, SigmaFromTheLogLayerBalance) {
  // Log layer (D1 = D2 = f2 = 1, nu_t = kappa u_tau y, R = nu_t / C_mu, S = u_tau/(kappa y)):
  // (C_eps2 - C_eps1) sqrt(R P) = (1/sigma_eps) grad nu_t . grad R gives
  // 1/sigma_eps = (C_eps2 - C_eps1) sqrt(C_mu) / kappa^2 (Baldwin & Barth 1990).
  EXPECT_NEAR(BbConstants::inv_sigma, (ce2 - ce1) * std::sqrt(cmu) / (kappa * kappa), 1e-15);
}

TEST(BaldwinBarthClosure, WallLayerSolutionSatisfiesTheModel) {
  // In wall units (u_tau = nu = 1) take nu_t = kappa y D1 D2, so R = nu_t / (C_mu D1 D2) = kappa y /
  // C_mu is linear in y, and the constant total stress gives S = 1 / (1 + nu_t). The model equation
  // (C_eps2 f2 - C_eps1) sqrt(R P) + (nu + nu_t/sigma) R'' - (1/sigma) nu_t' R' = 0, with R'' = 0,
  // sqrt(R P) = R S sqrt(C_mu D1 D2) and nu_t' = kappa (D1 D2 + y (D1 D2)'), holds for every y+
  // exactly when f2 is the function of the paper: the f2 of bb_damping must make the balance zero
  // to round-off (1e-12 of the diffusion term's size, which is about 0.8).
  for (const double y : {0.2, 1.0, 3.0, 10.0, 26.0, 60.0, 200.0, 1000.0}) {
    const double e0 = std::exp(-y / a0), e2 = std::exp(-y / a2);
    const double d1 = 1.0 - e0, d2 = 1.0 - e2;
    const double d1d2_slope = d2 * e0 / a0 + d1 * e2 / a2;
    const BbDamping damp = bb_damping(y);
    EXPECT_NEAR(damp.d1d2, d1 * d2, 1e-15) << "y+ " << y;
    const double nut = kappa * y * d1 * d2, r = kappa * y / cmu, strain = 1.0 / (1.0 + nut);
    const double inv_sigma = (ce2 - ce1) * std::sqrt(cmu) / (kappa * kappa);
    const double production = (ce2 * damp.f2 - ce1) * r * strain * std::sqrt(cmu * d1 * d2);
    const double cross = inv_sigma * kappa * (d1 * d2 + y * d1d2_slope) * (kappa / cmu);
    EXPECT_NEAR(production - cross, 0.0, 1e-12) << "y+ " << y;
  }
}
