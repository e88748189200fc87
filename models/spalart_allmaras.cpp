#include "models/spalart_allmaras.hpp"

#include <algorithm>
#include <cmath>

namespace wallrans {

SaSource sa_source(double nu_tilde, double nu, double d, double omega, double grad_sq, bool with_ft2,
                   bool negative_branch) {
  using C = SaConstants;
  constexpr double cv1_3 = C::cv1 * C::cv1 * C::cv1;
  constexpr double cw3_2 = C::cw3 * C::cw3;
  constexpr double cw3_6 = cw3_2 * cw3_2 * cw3_2;
  constexpr double inv_kappa2 = 1.0 / (C::kappa * C::kappa);
  const double inv_d2 = 1.0 / (d * d);
  const double k2d2 = C::kappa * C::kappa * d * d;
  const double chi = nu_tilde / nu;
  const double chi3 = chi * chi * chi;
  SaSource s{};
  s.gradient_term = C::cb2 / C::sigma * grad_sq;
  if (nu_tilde < 0.0 && negative_branch) {
    // Negative branch (AJS 2012): production c_b1 (1 - c_t3) Omega nu_tilde with c_t3 = 0 for the
    // noft2 base, destruction -c_w1 (nu_tilde/d)^2 (a source), nu_t = 0.
    const double fn = (C::cn1 + chi3) / (C::cn1 - chi3);
    s.production = C::cb1 * omega * nu_tilde + C::cw1 * nu_tilde * nu_tilde * inv_d2;
    s.destruction_coefficient = 0.0;
    s.net_slope = C::cb1 * omega + 2.0 * C::cw1 * nu_tilde * inv_d2;
    s.nut = 0.0;
    s.diffusivity = (nu + nu_tilde * fn) / C::sigma;
    return s;
  }
  // Each quantity with its derivative with respect to nu_tilde (suffix _n), for the implicit
  // source slope dQ/dnu_tilde of the linearisation.
  const double fv1 = chi3 / (chi3 + cv1_3);
  const double fv1_chi = 3.0 * chi * chi * cv1_3 / ((chi3 + cv1_3) * (chi3 + cv1_3));
  const double den = 1.0 + chi * fv1;
  const double fv2 = 1.0 - chi / den;
  const double fv2_chi = -(1.0 - chi * chi * fv1_chi) / (den * den);
  const double ft2 = with_ft2 ? C::ct3 * std::exp(-C::ct4 * chi * chi) : 0.0;
  const double ft2_n = -2.0 * C::ct4 * chi * ft2 / nu;
  // S-tilde with the limiter of AJS 2012 (never zero or negative).
  const double s_bar = nu_tilde * fv2 / k2d2;
  const double s_bar_n = (fv2 + chi * fv2_chi) / k2d2;
  double s_tilde = 0.0, s_tilde_n = 0.0;
  if (s_bar >= -C::cv2 * omega) {
    s_tilde = omega + s_bar;
    s_tilde_n = s_bar_n;
  } else {
    const double num = C::cv2 * C::cv2 * omega + C::cv3 * s_bar;
    const double dnm = (C::cv3 - 2.0 * C::cv2) * omega - s_bar;
    s_tilde = omega + omega * num / dnm;
    s_tilde_n = omega * (C::cv3 * dnm + num) / (dnm * dnm) * s_bar_n;
  }
  double r = 10.0, r_n = 0.0;
  if (s_tilde > 0.0 && nu_tilde < 10.0 * s_tilde * k2d2) {
    r = nu_tilde / (s_tilde * k2d2);
    r_n = (1.0 - r * k2d2 * s_tilde_n) / (s_tilde * k2d2);
  }
  const double r2 = r * r;
  const double r5 = r2 * r2 * r;
  const double g = r + C::cw2 * (r5 * r - r);
  const double g_n = (1.0 + C::cw2 * (6.0 * r5 - 1.0)) * r_n;
  const double g2 = g * g;
  const double g6 = g2 * g2 * g2;
  // f_w = g ((1 + c_w3^6) / (g^6 + c_w3^6))^(1/6); the sixth root as cbrt(sqrt()).
  const double fw = g * std::cbrt(std::sqrt((1.0 + cw3_6) / (g6 + cw3_6)));
  const double fw_n = g > 0.0 ? fw * cw3_6 / (g * (g6 + cw3_6)) * g_n : 0.0;
  s.production = C::cb1 * (1.0 - ft2) * s_tilde * nu_tilde;
  const double wall_term = C::cw1 * fw - C::cb1 * inv_kappa2 * ft2;
  s.destruction_coefficient = wall_term * nu_tilde * inv_d2;
  const double production_n =
      C::cb1 * (-ft2_n * s_tilde * nu_tilde + (1.0 - ft2) * (s_tilde_n * nu_tilde + s_tilde));
  const double destruction_n = (C::cw1 * fw_n - C::cb1 * inv_kappa2 * ft2_n) * nu_tilde * nu_tilde * inv_d2 +
                               2.0 * wall_term * nu_tilde * inv_d2;
  s.net_slope = production_n - destruction_n;
  s.nut = std::max(nu_tilde, 0.0) * fv1;
  s.diffusivity = (nu + nu_tilde) / C::sigma;
  return s;
}

SpalartAllmaras::SpalartAllmaras(const CaseSpec& spec, const Grid& grid, const BoundaryMap& boundaries)
    : WallBoundedModel(spec, grid, boundaries),
      transport_(grid, boundaries, spec.turbulence.convection, "turbulence_",
                 {spec.iterations.petsc_options, spec.source_file}),
      nu_tilde_(grid, spec.turbulence.freestream_viscosity_ratio * spec.flow.kinematic_viscosity),
      gamma_(grid),
      su_(grid),
      sp_(grid),
      with_ft2_(spec.turbulence.variant == "standard"),
      negative_(spec.turbulence.variant == "negative") {
  for (size_t k = 0; k < nut_.data().size(); ++k) {
    nut_.data()[k] = eddy_viscosity_of(nu_tilde_.data()[k]);
  }
}

double SpalartAllmaras::eddy_viscosity_of(double nu_tilde) const {
  // nu_t = nu_tilde f_v1, f_v1 = chi^3 / (chi^3 + c_v1^3) (Spalart & Allmaras 1994).
  constexpr double cv1_3 = SaConstants::cv1 * SaConstants::cv1 * SaConstants::cv1;
  const double chi = nu_tilde / nu_;
  const double chi3 = chi * chi * chi;
  return nu_tilde > 0.0 ? nu_tilde * chi3 / (chi3 + cv1_3) : 0.0;
}

void SpalartAllmaras::update(const MeanFlowView& flow) {
  update_yplus(flow);
  const VectorField& grad = transport_.gradient();  // of nu_tilde, previous step
  // Diffusivity (nu + nu_tilde f_n)/sigma on the ghosted range (faces need both sides); the
  // sources on owned cells only.
  for (int j = grid_.gy_begin(); j < grid_.gy_end(); ++j) {
    for (int i = grid_.gx_begin(); i < grid_.gx_end(); ++i) {
      const double nt = nu_tilde_(i, j);
      double fn = 1.0;
      if (nt < 0.0 && negative_) {
        const double chi3 = (nt / nu_) * (nt / nu_) * (nt / nu_);
        fn = (SaConstants::cn1 + chi3) / (SaConstants::cn1 - chi3);
      }
      gamma_(i, j) = (nu_ + nt * fn) / SaConstants::sigma;
    }
  }
  for (int j = grid_.y_begin(); j < grid_.y_end(); ++j) {
    for (int i = grid_.x_begin(); i < grid_.x_end(); ++i) {
      const double nt = nu_tilde_(i, j);
      const FlowInvariants inv = invariants(flow.grad_u(i, j), flow.grad_v(i, j));
      const Vec2 g = grad(i, j);
      const SaSource s = sa_source(nt, nu_, distance(i, j), inv.vorticity, dot(g, g), with_ft2_, negative_);
      // Local source Q = production - destruction, linearised as Q* + S_p (nu_tilde - nu_tilde*)
      // with S_p <= 0 the steeper of its slope dQ/dnu_tilde and -destruction/nu_tilde (Patankar
      // 1980, sec. 7.2-3): the slope keeps the outer iteration stable where f_w and S~ make the
      // destruction grow faster than nu_tilde^2 (near walls at chi ~ 1).
      const double net = s.production - s.destruction_coefficient * nt;
      sp_(i, j) = std::min({s.net_slope, -s.destruction_coefficient, 0.0});
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
  eq.relax_diffusive_part = spec_.turbulence.relax_diffusive_part;
  eq.boundary_value = boundary_value_;
  residual_ = transport_.solve(flow, eq);
  if (!negative_) {
    for (double& v : nu_tilde_.data()) v = std::max(v, 0.0);
  }
  for (size_t k = 0; k < nut_.data().size(); ++k) nut_.data()[k] = eddy_viscosity_of(nu_tilde_.data()[k]);
}

std::vector<std::pair<std::string, const Field*>> SpalartAllmaras::output_fields() const {
  auto fields = WallBoundedModel::output_fields();
  fields.push_back({"nu_tilde", &nu_tilde_});
  return fields;
}

}  // namespace wallrans
