// Spalart-Allmaras one-equation model (Spalart & Allmaras 1994) with the variants standard,
// noft2 and negative (Allmaras, Johnson & Spalart 2012, on the noft2 base); equations in
// models/README.md, sec. 1.
#pragma once

#include <functional>

#include "models/scalar_transport.hpp"
#include "models/wall_bounded_model.hpp"

namespace wallrans {

/// Model constants. c_b1, c_b2, sigma, kappa, c_w2, c_w3, c_v1 and c_w1 = c_b1/kappa^2 + (1 + c_b2)/sigma:
/// Spalart & Allmaras (1994). c_t3 = 1.2, c_t4 = 0.5: the values listed by Allmaras, Johnson &
/// Spalart (2012) and the NASA Langley Turbulence Modeling Resource (the original papers printed
/// c_t3 = 1.1, c_t4 = 2; from memory). c_v2, c_v3 (S-tilde limiter) and c_n1 (negative branch):
/// Allmaras, Johnson & Spalart (2012).
struct SaConstants {
  static constexpr double cb1 = 0.1355, cb2 = 0.622, sigma = 2.0 / 3.0, kappa = 0.41;
  static constexpr double cw2 = 0.3, cw3 = 2.0, cv1 = 7.1, ct3 = 1.2, ct4 = 0.5;
  static constexpr double cv2 = 0.7, cv3 = 0.9, cn1 = 16.0;
  static constexpr double cw1 = cb1 / (kappa * kappa) + (1.0 + cb2) / sigma;
};

/// Source terms of the SA equation at one point, split as production (explicit), destruction
/// coefficient (destruction = coefficient * nu_tilde, implicit when positive) and the cb2
/// gradient term. Local, pure: shared by the 2-D model and its manufactured-solution test.
struct SaSource {
  double production;
  double destruction_coefficient;
  double net_slope;  ///< d(production - destruction)/d nu_tilde on the current branch of the limiters
  double gradient_term;
  double nut;          ///< eddy viscosity nu_tilde f_v1 (0 where nu_tilde < 0)
  double diffusivity;  ///< (nu + nu_tilde f_n) / sigma
};
SaSource sa_source(double nu_tilde, double nu, double d, double vorticity, double grad_nu_tilde_sq,
                   bool with_ft2, bool negative_branch);

class SpalartAllmaras final : public WallBoundedModel {
 public:
  SpalartAllmaras(const CaseSpec& spec, const Grid& grid, const BoundaryMap& boundaries);
  std::string name() const override { return "spalart_allmaras/" + spec_.turbulence.variant; }
  void update(const MeanFlowView& flow) override;
  std::vector<ModelResidual> residuals() const override { return {{"nu_tilde", residual_}}; }
  bool linear_solves_converged() const override { return transport_.linear_solve_converged(); }
  const SolverOptions* solver_options() const override { return &transport_.solver_options(); }
  int linear_iterations() const override { return transport_.linear_iterations(); }
  std::vector<std::pair<std::string, const Field*>> output_fields() const override;
  std::vector<std::pair<std::string, Field*>> restart_state() override {
    return {{"nu_tilde", &nu_tilde_},
            {"eddy_viscosity", &nut_},
            {"nu_tilde"
             "_gradient_x",
             &transport_.gradient().x},
            {"nu_tilde"
             "_gradient_y",
             &transport_.gradient().y}};
  }
  Field& variable() { return nu_tilde_; }
  /// Manufactured-solution hooks: an extra source per unit volume s(x) [m^2/s^2] added to the
  /// right-hand side, and the boundary value of nu_tilde on wall/inflow faces as a function.
  void set_extra_source(std::function<double(Vec2)> source) { extra_source_ = std::move(source); }
  void set_boundary_value(std::function<double(Vec2)> value) { boundary_value_ = std::move(value); }

 private:
  double eddy_viscosity_of(double nu_tilde) const;
  ScalarTransport transport_;
  Field nu_tilde_, gamma_, su_, sp_;
  double residual_ = 0.0;
  bool with_ft2_, negative_;
  std::function<double(Vec2)> extra_source_, boundary_value_;
};

}  // namespace wallrans
