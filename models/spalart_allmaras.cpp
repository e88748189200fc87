#include "models/spalart_allmaras.hpp"

#include <algorithm>
#include <cmath>

namespace wallrans {

SaSource sa_source(double nu_tilde, double nu, double d, double omega, double grad_sq, bool with_ft2,
                   bool negative_branch) {
  using C = SaConstants;
  const double k2d2 = C::kappa * C::kappa * d * d;
  const double chi = nu_tilde / nu;
  const double chi3 = chi * chi * chi;
  SaSource s{};
  s.gradient_term = C::cb2 / C::sigma * grad_sq;
  if (nu_tilde < 0.0 && negative_branch) {
    // Negative branch (AJS 2012): production c_b1 (1 - c_t3) Omega nu_tilde with c_t3 = 0 for the
    // noft2 base, destruction -c_w1 (nu_tilde/d)^2 (a source), nu_t = 0.
    const double fn = (C::cn1 + chi3) / (C::cn1 - chi3);
    s.production = C::cb1 * omega * nu_tilde + C::cw1 * nu_tilde * nu_tilde / (d * d);
    s.destruction_coefficient = 0.0;
    s.nut = 0.0;
    s.diffusivity = (nu + nu_tilde * fn) / C::sigma;
    return s;
  }
  const double fv1 = chi3 / (chi3 + C::cv1 * C::cv1 * C::cv1);
  const double fv2 = 1.0 - chi / (1.0 + chi * fv1);
  const double ft2 = with_ft2 ? C::ct3 * std::exp(-C::ct4 * chi * chi) : 0.0;
  // S-tilde with the limiter of AJS 2012 (never zero or negative).
  const double s_bar = nu_tilde * fv2 / k2d2;
  const double s_tilde = s_bar >= -C::cv2 * omega
                             ? omega + s_bar
                             : omega + omega * (C::cv2 * C::cv2 * omega + C::cv3 * s_bar) /
                                           ((C::cv3 - 2.0 * C::cv2) * omega - s_bar);
  const double r = s_tilde > 0.0 ? std::min(nu_tilde / (s_tilde * k2d2), 10.0) : 10.0;
  const double g = r + C::cw2 * (std::pow(r, 6) - r);
  const double cw3_6 = std::pow(C::cw3, 6);
  const double fw = g * std::pow((1.0 + cw3_6) / (std::pow(g, 6) + cw3_6), 1.0 / 6.0);
  s.production = C::cb1 * (1.0 - ft2) * s_tilde * nu_tilde;
  s.destruction_coefficient = (C::cw1 * fw - C::cb1 / (C::kappa * C::kappa) * ft2) * nu_tilde / (d * d);
  s.nut = std::max(nu_tilde, 0.0) * fv1;
  s.diffusivity = (nu + nu_tilde) / C::sigma;
  return s;
}

SpalartAllmaras::SpalartAllmaras(const CaseSpec& spec, const Grid& grid, const BoundaryMap& boundaries)
    : WallBoundedModel(spec, grid, boundaries),
      transport_(grid, boundaries, spec.turbulence.convection, "turbulence_"),
      nu_tilde_(grid, spec.turbulence.freestream_viscosity_ratio * spec.flow.kinematic_viscosity),
      gamma_(grid),
      su_(grid),
      sp_(grid),
      with_ft2_(spec.turbulence.variant == "standard"),
      negative_(spec.turbulence.variant == "negative") {
  for (size_t k = 0; k < nut_.data().size(); ++k) {
    const double chi = nu_tilde_.data()[k] / nu_;
    nut_.data()[k] =
        nu_tilde_.data()[k] * chi * chi * chi / (chi * chi * chi + std::pow(SaConstants::cv1, 3));
  }
}

void SpalartAllmaras::update(const MeanFlowView& flow) {
  update_yplus(flow);
  const VectorField& grad = transport_.gradient();  // of nu_tilde, previous step
  for (int j = grid_.gy_begin(); j < grid_.gy_end(); ++j) {
    for (int i = grid_.gx_begin(); i < grid_.gx_end(); ++i) {
      const double nt = nu_tilde_(i, j);
      const FlowInvariants inv = invariants(flow.grad_u(i, j), flow.grad_v(i, j));
      const Vec2 g = grad(i, j);
      const SaSource s = sa_source(nt, nu_, distance(i, j), inv.vorticity, dot(g, g), with_ft2_, negative_);
      gamma_(i, j) = s.diffusivity;
      // Local source Q = production - destruction, linearised as Q* + S_p (nu_tilde - nu_tilde*)
      // with S_p <= 0 the steeper of its slope dQ/dnu_tilde and -destruction/nu_tilde (Patankar
      // 1980, sec. 7.2-3): the slope keeps the outer iteration stable where f_w and S~ make the
      // destruction grow faster than nu_tilde^2 (near walls at chi ~ 1).
      const double net = s.production - s.destruction_coefficient * nt;
      const double step = 1e-6 * std::max(std::abs(nt), nu_);
      const SaSource s_step =
          sa_source(nt + step, nu_, distance(i, j), inv.vorticity, dot(g, g), with_ft2_, negative_);
      const double slope = (s_step.production - s_step.destruction_coefficient * (nt + step) - net) / step;
      sp_(i, j) = std::min({slope, -s.destruction_coefficient, 0.0});
      su_(i, j) = net - sp_(i, j) * nt + s.gradient_term;
      if (extra_source_) su_(i, j) += extra_source_(grid_.centre(i, j));
    }
  }
  ScalarEquation eq;
  eq.phi = &nu_tilde_;
  eq.gamma = &gamma_;
  eq.source_u = &su_;
  eq.source_p = &sp_;
  eq.wall_value = 0.0;
  eq.wall_gamma = nu_ / SaConstants::sigma;
  eq.freestream_value = spec_.turbulence.freestream_viscosity_ratio * nu_;
  eq.relax = spec_.turbulence.relax;
  eq.boundary_value = boundary_value_;
  residual_ = transport_.solve(flow, eq);
  if (!negative_) {
    for (double& v : nu_tilde_.data()) v = std::max(v, 0.0);
  }
  for (int j = grid_.gy_begin(); j < grid_.gy_end(); ++j) {
    for (int i = grid_.gx_begin(); i < grid_.gx_end(); ++i) {
      const double nt = nu_tilde_(i, j);
      const double chi3 = std::pow(nt / nu_, 3);
      nut_(i, j) = nt > 0.0 ? nt * chi3 / (chi3 + std::pow(SaConstants::cv1, 3)) : 0.0;
    }
  }
}

std::vector<std::pair<std::string, const Field*>> SpalartAllmaras::output_fields() const {
  auto fields = WallBoundedModel::output_fields();
  fields.push_back({"nu_tilde", &nu_tilde_});
  return fields;
}

}  // namespace wallrans
