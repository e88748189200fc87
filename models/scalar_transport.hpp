// Implicit finite-volume solver for one scalar transport equation of a turbulence model:
//   div(F phi) - div(Gamma grad phi) = S_u + S_p phi   (S_p <= 0),
// with the same convection schemes and non-orthogonal diffusion split as the momentum equations.
#pragma once

#include <functional>
#include <memory>
#include <string>

#include "discretization/least_squares_gradient.hpp"
#include "linear/petsc_handles.hpp"
#include "linear/stencil_matrix.hpp"
#include "models/turbulence_model.hpp"

namespace wallrans {

struct ScalarEquation {
  Field* phi = nullptr;             ///< unknown (ghosted); updated in place, ghosts refreshed
  const Field* gamma = nullptr;     ///< diffusion coefficient [m^2/s] (ghosts current)
  const Field* source_u = nullptr;  ///< explicit source per unit volume (owned cells)
  const Field* source_p = nullptr;  ///< implicit source coefficient per unit volume, <= 0 (owned cells)
  double wall_value = 0.0;          ///< value at no-slip walls
  double wall_gamma = -1.0;         ///< diffusion coefficient at walls (< 0: use the cell value)
  double freestream_value = 0.0;    ///< value carried in through inflows and openings
  double relax = 0.8;
  double relax_diffusive_part = 1.0;  ///< share of the diffusive coefficients that `relax` acts on
  /// Optional: value at wall/inflow faces as a function of the face centre (manufactured
  /// solutions); replaces wall_value and freestream_value there.
  std::function<double(Vec2)> boundary_value;
};

class ScalarTransport {
 public:
  /// Collective. `prefix` is the PETSc options prefix of the linear solver (e.g. "turbulence_");
  /// its options come from a database of its own: the command line, then `options` (the case
  /// file's), which win.
  ScalarTransport(const Grid& grid, const BoundaryMap& boundaries, ConvectionScheme scheme,
                  const std::string& prefix, const CaseOptionsText& options);

  /// The defaults of the linear solver with options prefix `prefix` (BiCGStab, relative tolerance
  /// 1e-3, at most 200 iterations), which the command line and the case file override.
  static std::vector<std::pair<std::string, std::string>> default_options(const std::string& prefix);

  /// Collective: one implicit relaxed step. Returns the L1 norm of the unrelaxed residual before
  /// the step (in the equation's units times volume) over the fluid cells. Solid cells get phi = 0
  /// (identity rows with zero right-hand side).
  double solve(const MeanFlowView& flow, ScalarEquation& equation);

  /// Whether the linear solve of the last step converged (KSP converged reason checked; hitting
  /// the iteration cap is tolerated, a breakdown is not).
  bool linear_solve_converged() const { return linear_solve_converged_; }
  /// Krylov iterations of the linear solve of the last step.
  int linear_iterations() const { return linear_iterations_; }

  /// The PETSc options database of the linear solver.
  const SolverOptions& solver_options() const { return *options_; }

  /// Least-squares gradient of the last solved phi (owned and ghost cells, before the step).
  const VectorField& gradient() const { return grad_; }
  VectorField& gradient() { return grad_; }  // restart state
  /// Local: gradient of any field with the given wall value (zero gradient elsewhere); owned
  /// cells, ghosts refreshed. Used for model terms such as grad nu_t.
  void gradient_of(const Field& phi, double wall_value, const MeanFlowView& flow, VectorField& out);

 private:
  /// Convection and diffusion through one interior face: the diffusion coefficient and the
  /// explicit part of the balance of the face's left cell.
  struct FaceTerms {
    double diffusion, explicit_left;
  };
  void boundary_values(const MeanFlowView& flow, const Field& phi, const ScalarBoundaryValues& values);
  void compute_face_terms(const MeanFlowView& flow, const ScalarEquation& equation);
  const Grid& grid_;
  ConvectionScheme scheme_;
  std::vector<BoundaryFace> faces_;
  std::vector<std::array<int, 4>> cell_faces_;
  std::vector<unsigned char> solid_;  // 1 for solid cells (ghosted range)
  bool has_solid_ = false;
  bool is_closed(size_t l, size_t r) const { return has_solid_ && (solid_[l] | solid_[r]) != 0; }
  std::unique_ptr<LeastSquaresGradient> lsq_;
  std::vector<double> phi_b_;  // boundary values (faces_ order)
  std::function<double(Vec2)> boundary_function_;
  VectorField grad_;
  std::vector<FaceTerms> terms_e_, terms_n_;  // every interior face of an owned cell, like the fluxes
  StencilMatrix matrix_;
  OwnedVec rhs_, solution_;
  std::unique_ptr<SolverOptions> options_;  // declared before the solver that reads it
  OwnedKsp ksp_;
  bool linear_solve_converged_ = true;
  int linear_iterations_ = 0;
};

}  // namespace wallrans
