#include "models/k_equation.hpp"

#include <algorithm>
#include <cmath>

namespace wallrans {

KClosure k_closure(double k, double d, double nu, double strain, bool structure) {
  using C = KConstants;
  const double kk = std::max(k, 0.0);
  const double sqrt_k = std::sqrt(kk);
  const double re_d = sqrt_k * d / nu;
  const double l_mu = C::cl * d * -std::expm1(-re_d / C::a_mu);
  double nut = C::cmu * sqrt_k * l_mu;
  // Structure-parameter closure -u'v' = a1 k, limited by the length-scale closure (which then acts
  // near the wall and where S -> 0). Where production and dissipation balance (log layer) the two
  // coincide; a1 k / S is the smaller one where production exceeds dissipation.
  if (structure && strain > 0.0) nut = std::min(C::a1 * kk / strain, nut);
  // sqrt(k)/l_eps with l_eps = c_l d (1 - exp(-Re_d/A_eps)); its limit for k -> 0 is 2 nu / d^2.
  const double x = re_d / C::a_eps;
  const double dissipation =
      x > 1e-8 ? sqrt_k / (C::cl * d * -std::expm1(-x)) : C::a_eps * nu / (C::cl * d * d);
  return {nut, dissipation};
}

KEquation::KEquation(const CaseSpec& spec, const Grid& grid, const BoundaryMap& boundaries)
    : WallBoundedModel(spec, grid, boundaries),
      transport_(grid, boundaries, spec.turbulence.convection, "turbulence_",
                 {spec.iterations.petsc_options, spec.source_file}),
      k_(grid),
      gamma_(grid),
      su_(grid),
      sp_(grid),
      structure_(spec.turbulence.variant == "structure") {
  for (double& v : k_.data()) v = freestream_k();
}

double KEquation::freestream_k() const {
  const double u = spec_.turbulence.freestream_intensity * spec_.flow.reference_velocity;
  return 1.5 * u * u;
}

void KEquation::update(const MeanFlowView& flow) {
  update_yplus(flow);
  for (int j = grid_.gy_begin(); j < grid_.gy_end(); ++j) {
    for (int i = grid_.gx_begin(); i < grid_.gx_end(); ++i) {
      const double strain = invariants(flow.grad_u(i, j), flow.grad_v(i, j)).strain;
      const KClosure c = k_closure(k_(i, j), distance(i, j), nu_, strain, structure_);
      gamma_(i, j) = nu_ + nut_(i, j) / KConstants::sigma_k;
      su_(i, j) = c.nut * strain * strain;
      sp_(i, j) = -c.dissipation_coefficient;
    }
  }
  ScalarEquation eq;
  eq.phi = &k_;
  eq.gamma = &gamma_;
  eq.source_u = &su_;
  eq.source_p = &sp_;
  eq.wall_value = 0.0;
  eq.wall_gamma = nu_;
  eq.freestream_value = freestream_k();
  eq.relax = spec_.turbulence.relax;
  eq.relax_diffusive_part = spec_.turbulence.relax_diffusive_part;
  residual_ = transport_.solve(flow, eq);
  for (double& v : k_.data()) v = std::max(v, 0.0);
  for (int j = grid_.gy_begin(); j < grid_.gy_end(); ++j) {
    for (int i = grid_.gx_begin(); i < grid_.gx_end(); ++i) {
      const double strain = invariants(flow.grad_u(i, j), flow.grad_v(i, j)).strain;
      nut_(i, j) = k_closure(k_(i, j), distance(i, j), nu_, strain, structure_).nut;
    }
  }
}

std::vector<std::pair<std::string, const Field*>> KEquation::output_fields() const {
  auto fields = WallBoundedModel::output_fields();
  fields.push_back({"k", &k_});
  return fields;
}

}  // namespace wallrans
