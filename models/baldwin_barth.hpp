// Baldwin-Barth one-equation model (Baldwin & Barth 1990, NASA TM-102847); models/README.md sec. 2.
#pragma once

#include "models/scalar_transport.hpp"
#include "models/wall_bounded_model.hpp"

namespace wallrans {

struct BbConstants {
  static constexpr double ce1 = 1.2, ce2 = 2.0, cmu = 0.09, a0 = 26.0, a2 = 10.0, kappa = 0.41;
  /// 1/sigma_eps = (C_eps2 - C_eps1) sqrt(C_mu) / kappa^2
  static constexpr double inv_sigma = (ce2 - ce1) * 0.3 / (kappa * kappa);
};

/// Damping functions D1 D2 and f2 at a given y+ (local, pure).
struct BbDamping {
  double d1d2, f2;
};
BbDamping bb_damping(double yplus);

class BaldwinBarth final : public WallBoundedModel {
 public:
  BaldwinBarth(const CaseSpec& spec, const Grid& grid, const BoundaryMap& boundaries);
  std::string name() const override { return "baldwin_barth"; }
  void update(const MeanFlowView& flow) override;
  std::vector<ModelResidual> residuals() const override { return {{"nu_rt", residual_}}; }
  bool linear_solves_converged() const override { return transport_.linear_solve_converged(); }
  const SolverOptions* solver_options() const override { return &transport_.solver_options(); }
  int linear_iterations() const override { return transport_.linear_iterations(); }
  std::vector<std::pair<std::string, const Field*>> output_fields() const override;
  std::vector<std::pair<std::string, Field*>> restart_state() override {
    return {{"nu_rt", &r_},
            {"eddy_viscosity", &nut_},
            {"nu_rt"
             "_gradient_x",
             &transport_.gradient().x},
            {"nu_rt"
             "_gradient_y",
             &transport_.gradient().y}};
  }

 private:
  ScalarTransport transport_;
  Field r_, gamma_, su_, sp_;
  VectorField grad_nut_;
  double residual_ = 0.0;
};

}  // namespace wallrans
