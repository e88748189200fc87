#include "models/baldwin_barth.hpp"

#include <algorithm>
#include <cmath>

namespace wallrans {

BbDamping bb_damping(double yplus) {
  using C = BbConstants;
  const double yp = std::max(yplus, 1e-10);
  const double e0 = std::exp(-yp / C::a0), e2 = std::exp(-yp / C::a2);
  const double d1 = -std::expm1(-yp / C::a0), d2 = -std::expm1(-yp / C::a2);
  const double d1d2 = d1 * d2;
  const double root = std::sqrt(d1d2);
  const double ratio = C::ce1 / C::ce2;
  const double f2 = ratio + (1.0 - ratio) * (1.0 / (C::kappa * yp) + d1d2) *
                                (root + (yp / root) * (d2 * e0 / C::a0 + d1 * e2 / C::a2));
  return {d1d2, f2};
}

BaldwinBarth::BaldwinBarth(const CaseSpec& spec, const Grid& grid, const BoundaryMap& boundaries)
    : WallBoundedModel(spec, grid, boundaries),
      transport_(grid, boundaries, spec.turbulence.convection, "turbulence_",
                 {spec.iterations.petsc_options, spec.source_file}),
      r_(grid, spec.turbulence.freestream_viscosity_ratio * spec.flow.kinematic_viscosity),
      gamma_(grid),
      su_(grid),
      sp_(grid),
      grad_nut_(grid) {}

void BaldwinBarth::update(const MeanFlowView& flow) {
  using C = BbConstants;
  update_yplus(flow);
  const VectorField& grad_r = transport_.gradient();  // previous step
  transport_.gradient_of(nut_, 0.0, flow, grad_nut_);
  for (int j = grid_.gy_begin(); j < grid_.gy_end(); ++j) {
    for (int i = grid_.gx_begin(); i < grid_.gx_end(); ++i) {
      gamma_(i, j) = nu_ + nut_(i, j) * C::inv_sigma;
      if (i < grid_.x_begin() || i >= grid_.x_end() || j < grid_.y_begin() || j >= grid_.y_end()) continue;
      const BbDamping damp = bb_damping(yplus_(i, j));
      const double strain = invariants(flow.grad_u(i, j), flow.grad_v(i, j)).strain;
      const double r = std::max(r_(i, j), 0.0);
      // (C_eps2 f2 - C_eps1) sqrt(R P), P = nu_t S^2 = C_mu R D1 D2 S^2: linear in R.
      const double production = (C::ce2 * damp.f2 - C::ce1) * std::sqrt(C::cmu * damp.d1d2) * strain * r;
      // Conservative form: -(2/sigma) grad nu_t . grad R.
      const double cross = -2.0 * C::inv_sigma * dot(grad_nut_(i, j), grad_r(i, j));
      su_(i, j) = std::max(production, 0.0) + cross;
      sp_(i, j) = std::min(production, 0.0) / std::max(r, 1e-300);
    }
  }
  ScalarEquation eq;
  eq.phi = &r_;
  eq.gamma = &gamma_;
  eq.source_u = &su_;
  eq.source_p = &sp_;
  eq.wall_value = 0.0;
  eq.wall_gamma = nu_;
  eq.freestream_value = spec_.turbulence.freestream_viscosity_ratio * nu_;
  eq.relax = spec_.turbulence.relax;
  eq.relax_diffusive_part = spec_.turbulence.relax_diffusive_part;
  residual_ = transport_.solve(flow, eq);
  for (double& v : r_.data()) v = std::max(v, 0.0);
  for (int j = grid_.gy_begin(); j < grid_.gy_end(); ++j)
    for (int i = grid_.gx_begin(); i < grid_.gx_end(); ++i)
      nut_(i, j) = C::cmu * r_(i, j) * bb_damping(yplus_(i, j)).d1d2;
  nut_.exchange();
}

std::vector<std::pair<std::string, const Field*>> BaldwinBarth::output_fields() const {
  auto fields = WallBoundedModel::output_fields();
  fields.push_back({"nu_rt", &r_});
  return fields;
}

}  // namespace wallrans
