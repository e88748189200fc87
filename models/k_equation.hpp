// One-equation k model with algebraic length scales (Wolfshtein 1969; two-layer constants of Chen
// & Patel 1988), closed either by nu_t = C_mu sqrt(k) l_mu or by the structure parameter
// -u'v' = a1 k (Bradshaw, Ferriss & Atwell 1967); models/README.md sec. 3.
#pragma once

#include "models/scalar_transport.hpp"
#include "models/wall_bounded_model.hpp"

namespace wallrans {

struct KConstants {
  static constexpr double cmu = 0.09, kappa = 0.41, a_mu = 70.0, a1 = 0.3, sigma_k = 1.0;
  static constexpr double cl = 2.4951805397457565;  ///< kappa C_mu^(-3/4) = 0.41 / 0.09^0.75
  static constexpr double a_eps = 2.0 * cl;
};

/// Eddy viscosity and dissipation coefficient sqrt(k)/l_eps at one point (local, pure).
struct KClosure {
  double nut, dissipation_coefficient;
};
KClosure k_closure(double k, double d, double nu, double strain, bool structure);

class KEquation final : public WallBoundedModel {
 public:
  KEquation(const CaseSpec& spec, const Grid& grid, const BoundaryMap& boundaries);
  std::string name() const override { return "k_equation/" + spec_.turbulence.variant; }
  void update(const MeanFlowView& flow) override;
  std::vector<ModelResidual> residuals() const override { return {{"k", residual_}}; }
  bool linear_solves_converged() const override { return transport_.linear_solve_converged(); }
  const SolverOptions* solver_options() const override { return &transport_.solver_options(); }
  int linear_iterations() const override { return transport_.linear_iterations(); }
  std::vector<std::pair<std::string, const Field*>> output_fields() const override;
  std::vector<std::pair<std::string, Field*>> restart_state() override {
    return {{"k", &k_},
            {"eddy_viscosity", &nut_},
            {"k"
             "_gradient_x",
             &transport_.gradient().x},
            {"k"
             "_gradient_y",
             &transport_.gradient().y}};
  }

 private:
  double freestream_k() const;
  ScalarTransport transport_;
  Field k_, gamma_, su_, sp_;
  double residual_ = 0.0;
  bool structure_;
};

}  // namespace wallrans
