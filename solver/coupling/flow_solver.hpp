// SIMPLE / SIMPLEC pressure-correction solver for steady incompressible flow on a collocated
// curvilinear grid (Ferziger & Peric 2002, ch. 7-8; Patankar 1980), with Rhie-Chow face fluxes
// made independent of the relaxation factor by the memory term of Majumdar (1988).
#pragma once

#include <functional>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "core/case_spec.hpp"
#include "coupling/iteration_stages.hpp"
#include "discretization/boundary_conditions.hpp"
#include "discretization/least_squares_gradient.hpp"
#include "grid/boundary.hpp"
#include "grid/boundary_faces.hpp"
#include "grid/grid.hpp"
#include "linear/petsc_handles.hpp"
#include "linear/solver_options.hpp"
#include "linear/stencil_matrix.hpp"
#include "models/turbulence_model.hpp"

namespace wallrans {

struct ResidualNorms {
  double u = 0, v = 0, continuity = 0;
};

struct IterationStatus {
  int iteration = 0;
  ResidualNorms absolute;    ///< L1 norms: momentum imbalance [m^3/s^2], mass imbalance [m^2/s]
  ResidualNorms normalised;  ///< momentum: / largest of iterations 1-5; continuity: mean over cells of
                             ///< |imbalance| / (U_ref half perimeter)
  std::vector<ModelResidual> model_absolute;  ///< turbulence-model residuals (L1)
  std::vector<double> model_normalised;       ///< / largest of iterations 1-5
  int momentum_iterations = 0;
  int pressure_iterations = 0;
  bool linear_solves_converged = true;
};

/// Wall data of one no-slip wall face owned by this rank.
struct WallSample {
  Side side;      ///< block side, or for a face next to a solid cell the side of its fluid cell
  int index;      ///< position along the side (i for bottom/top, j for left/right)
  bool on_solid;  ///< the face lies between a fluid and a solid cell
  Vec2 centre;
  double shear_stress;         ///< nu dU_t/dn at the wall, sign along the tangent with t.x >= 0 [m^2/s^2]
  double cf;                   ///< 2 tau / U_ref^2
  double cp;                   ///< (p_w - p_ref) / (U_ref^2 / 2)
  double first_cell_distance;  ///< normal distance wall -> first cell centre [m]
  int segment = -1;            ///< index into BoundaryMap::segments() (the solid wall is the last)
  int cell_i = 0, cell_j = 0;  ///< the fluid cell the face belongs to
  Vec2 normal;                 ///< unit normal out of the fluid (into the wall)
  Vec2 tangent;                ///< unit tangent of shear_stress: (-n.y, n.x), turned so that t.x >= 0
  double length = 0.0;         ///< face length [m] (area per unit span)
  double pressure = 0.0;       ///< kinematic pressure at the face p_w [m^2/s^2]
};

/// The driving of a streamwise-periodic case (periodic.axis x).
struct PeriodicDriving {
  double mean_pressure_gradient = 0.0;  ///< dp/dx now [m/s^2], applied as the body force -dp/dx
  double bulk_velocity = 0.0;           ///< flow rate through the section at x = 0 / section_height [m/s]
  double section_height = 0.0;          ///< sum of the x components of the section's face areas [m]
  std::optional<double> target;         ///< periodic.bulk_velocity (absent: the gradient is fixed)
};

/// Mass balance of the current face fluxes (after the last correction).
struct MassBalance {
  double net_outflow = 0.0;  ///< sum of the boundary fluxes, out of the domain [m^2/s]
  double cells_l1 = 0.0;     ///< sum over fluid cells of |net flux out of the cell| [m^2/s]
  /// Reference flow rate [m^2/s]: through the section at x = 0 of a periodic case, otherwise the
  /// sum of the inflows through the boundary (0 in a closed domain).
  double through_flow = 0.0;
};
/// Local. The tangent of wall quantities at a face with unit normal n: (-n.y, n.x), turned so
/// that t.x > 0, or t.y > 0 on a face normal to x.
Vec2 wall_tangent(Vec2 n);

/// Everything the solver needs to continue bit-identically from a checkpoint, borrowed.
struct SolverRestartState {
  std::vector<std::pair<std::string, Field*>> cells;  ///< cell fields, global (i, j)
  /// Arrays over the owned boundary faces (boundary_faces() order); the face with position k
  /// has global id boundary_ids[k] out of n_boundary_faces.
  std::vector<std::pair<std::string, std::vector<double>*>> boundary;
  std::vector<int> boundary_ids;
  int n_boundary_faces = 0;
  /// Residual references, and the mean pressure gradient when it is adjusted to a flow rate.
  std::vector<std::pair<std::string, double*>> scalars;
  int* iteration;
};

class FlowSolver {
 public:
  /// Collective. The spec, grid, boundary map and model must outlive the solver.
  FlowSolver(const CaseSpec& spec, const Grid& grid, const BoundaryMap& boundaries, TurbulenceModel& model);
  /// The defaults of the momentum and pressure solvers (option name with '-', value), which the
  /// command line and the case file override.
  static const std::vector<std::pair<std::string, std::string>>& default_options();
  FlowSolver(const FlowSolver&) = delete;
  FlowSolver& operator=(const FlowSolver&) = delete;

  /// Extra momentum source per unit mass s(x) [m/s^2] (manufactured solutions).
  void set_momentum_source(std::function<Vec2(Vec2)> source) { source_ = std::move(source); }
  /// Replaces the velocity of wall and inflow segments by a function of position.
  void set_boundary_velocity(std::function<Vec2(Vec2)> velocity) {
    boundary_velocity_ = std::move(velocity);
    velocity_gradients_current_ = false;
  }
  /// Replaces the volume flux through wall/inflow faces by f(centre, outward area) [m^2/s], e.g.
  /// the exact integral of a manufactured velocity, so that the boundary fluxes of a closed
  /// domain sum to zero exactly.
  void set_boundary_flux(std::function<double(Vec2, Vec2)> flux) { boundary_flux_fn_ = std::move(flux); }

  /// Collective: one outer iteration (momentum predictor, pressure correction, corrections,
  /// turbulence model update).
  IterationStatus iterate();
  bool converged(const IterationStatus& status) const;

  const VectorField& velocity() const { return vel_; }
  const Field& pressure() const { return p_; }
  const Field& eddy_viscosity() const { return model_.eddy_viscosity(); }
  /// Gradients of the current velocity components (refreshed after each correction).
  const VectorField& grad_u() const { return grad_u_; }
  const VectorField& grad_v() const { return grad_v_; }
  const Grid& grid() const { return grid_; }
  /// Local: the no-slip wall faces owned by this rank.
  std::vector<WallSample> wall_samples() const;
  /// Collective: brings what wall_samples() reads up to the current state: the velocity gradients
  /// (stale right after a restart) and the boundary pressure, extrapolated from the current
  /// (corrected) pressure. An iteration recomputes both before it uses them, so a continuation is
  /// unchanged; the outputs of a run and of its final checkpoint then agree.
  void refresh_wall_data();
  /// The boundary faces of the owned cells (global-id order) and the volume flux through each
  /// [m^2/s], positive out of the domain (same order).
  const std::vector<BoundaryFace>& boundary_faces() const { return bfaces_; }
  const std::vector<double>& boundary_fluxes() const { return bflux_; }
  /// Volume flux [m^2/s] through the east face of each cell (ghosted range, towards +i).
  const Field& flux_east() const { return flux_e_; }
  /// |tau_w| of every no-slip wall face of the domain (boundary-face id order: block sides, then
  /// faces next to solid cells), the same on every rank; refreshed each iteration.
  const std::vector<double>& wall_shear() const { return wall_shear_; }
  /// Collective. The driving of a periodic case (zeros when periodic.axis is none).
  PeriodicDriving periodic_driving() const;
  /// Collective. Mass balance of the current fluxes.
  MassBalance mass_balance() const;
  /// Local. The mean pressure gradient dp/dx applied now [m/s^2], and setting it (e.g. carried
  /// over from a coarser grid).
  double mean_pressure_gradient() const { return mean_pressure_gradient_; }
  void set_mean_pressure_gradient(double gradient) { mean_pressure_gradient_ = gradient; }
  /// 1 in solid cells, 0 in fluid cells (ghosted range), for output.
  const Field& solid() const { return solid_field_; }
  /// The solver's part of a checkpoint (the model's part is TurbulenceModel::restart_state()).
  /// With solid cells it holds the solid marker too, so a restart can check it.
  /// After reading values into it, call restarted().
  SolverRestartState restart_state();
  /// Collective: refreshes ghosts and derived data after a restart read. Throws InputError on
  /// every rank if the checkpoint's solid cells differ from the case's.
  void restarted();
  /// Local: the PETSc options given on the command line or in the case file that neither this
  /// solver's linear solvers nor the model's (nor PETSc itself) have read; meaningful after the
  /// first iteration, when every solver has been set up.
  std::vector<std::string> unused_options() const {
    return options_used_by_none({options_.get(), model_.solver_options()});
  }
  /// Collective: starts from the velocity, pressure and pressure gradient written into the
  /// restart_state() cells (e.g. interpolated from a coarser grid) at iteration 0: face fluxes
  /// from the interpolated velocity; the residual references measured so far (e.g. by one
  /// iteration from the uniform start) are kept and no longer updated.
  void initialised_from_fields();

 private:
  /// Momentum terms of one interior face.
  struct FaceTerms {
    double diffusion;   ///< implicit diffusion coefficient nu_f |S|^2 / (S . d)
    double explicit_u;  ///< explicit part of the flux balance of the left cell, u equation
    double explicit_v;
  };
  /// Coefficients A_f of the pressure-correction equation: interior faces (stored at the lower
  /// cell like the fluxes) and fixed-pressure boundary faces (bfaces_ order, zero elsewhere).
  struct PressureCoefficients {
    Field east, north;
    std::vector<double> boundary;
  };
  void update_velocity_boundary_values();
  void predict_boundary_fluxes_from_velocity();
  void update_velocity_gradients();
  void update_pressure_gradient_and_boundary_values();
  void update_pressure_boundary_values();
  void assemble_momentum(ResidualNorms& residual);
  void solve_momentum(IterationStatus& status);
  void predict_fluxes();
  void assemble_and_solve_pressure_correction(IterationStatus& status);
  void correct();
  FaceTerms interior_face_terms(size_t l, size_t r, const FaceGeometry& face, double flux) const;
  void compute_face_terms();
  void pressure_coefficients(const Field& d, PressureCoefficients& out) const;
  void assemble_pressure_matrix(const PressureCoefficients& coefficients, StencilMatrix& a) const;
  double interior_flux(size_t l, size_t r, const FaceGeometry& face, double flux_old) const;
  double normal_derivative(const Field& phi, const VectorField& grad, double phi_b,
                           const BoundaryFace& face) const;
  const BoundaryCondition& condition(const BoundaryFace& face) const { return conditions_.of(face); }
  /// Solid cells (ghosted index); a face with a solid cell on either side carries no flux or
  /// stress (the fluid cell's side of it is a boundary face).
  bool is_solid(size_t local) const { return has_solid_ && solid_[local] != 0; }
  bool is_closed(size_t l, size_t r) const { return has_solid_ && (solid_[l] | solid_[r]) != 0; }
  void set_solid_marker();
  bool is_pressure_boundary(const BoundaryFace& face) const {
    return condition(face).pressure_role() == PressureRole::fixed;
  }
  void solve_linear(KSP ksp, Vec rhs, Field& solution, int& iterations, bool& converged);
  /// Local. Net volume flux out of owned fluid cell (i, j) [m^2/s] (its mass imbalance).
  double cell_net_outflow(int i, int j) const;
  /// Collective. Flow rate through the section at x = 0 (east faces of column cells_x - 1).
  double section_flow_rate() const;
  /// Collective. With periodic.bulk_velocity: adjusts the mean pressure gradient so the section
  /// carries the target flow rate (flow_rate_control.cpp).
  void hold_flow_rate();

  const CaseSpec& spec_;
  const Grid& grid_;
  const BoundaryMap& boundaries_;
  BoundaryConditions conditions_;  // one per segment
  TurbulenceModel& model_;
  std::vector<BoundaryFace> bfaces_;
  std::vector<std::array<int, 4>> cell_faces_;  // boundary faces of each owned cell
  std::vector<unsigned char> solid_;            // 1 for solid cells (ghosted range)
  bool has_solid_ = false;                      // the case has solid cells
  double n_fluid_ = 0.0;                        // fluid cells of the whole grid
  std::function<Vec2(Vec2)> source_, boundary_velocity_;
  std::function<double(Vec2, Vec2)> boundary_flux_fn_;
  void refresh_wall_shear();
  /// Local: nu dU_t/dn at owned boundary face k (a wall), sign as in WallSample.
  double wall_shear_stress(size_t k) const;
  MeanFlowView view() const;
  bool has_pressure_boundary_ = false;
  std::vector<double> bflux_, bflux_old_;  // outward flux of each owned boundary face (bfaces_ order)
  std::vector<int> wall_id_;              // global wall-face id of each owned boundary face, -1 if not a wall
  std::vector<double> wall_shear_;        // |tau_w| per global wall face
  std::vector<double> wall_shear_local_;  // this rank's part of wall_shear_ before the sum
  int iteration_ = 0;
  double mean_pressure_gradient_ = 0.0;      // dp/dx applied now (periodic cases) [m/s^2]
  double section_height_ = 0.0;              // sum of S_x over the section at x = 0 [m]
  bool velocity_gradients_current_ = false;  // grad_u_, grad_v_ belong to vel_ and u_b_, v_b_
  std::vector<double> continuity_scale_;     // 1 / (U_ref half perimeter) per owned cell, owned order
  double continuity_per_cell_ = 0.0;         // mean relative mass imbalance of the last iteration
  // Residual references are measured up to this iteration (0 after initialised_from_fields());
  // a double because it is a checkpoint scalar.
  double references_until_ = 5.0;

  VectorField vel_, vel_old_, grad_u_, grad_v_, grad_p_, grad_pc_;
  // Interior-face fluxes: flux_e_(i, j) through the face between (i, j) and (i + 1, j),
  // flux_n_(i, j) between (i, j) and (i, j + 1); boundary faces are in bflux_.
  Field p_, pc_, nu_eff_, d_rc_, d_corr_, memory_, flux_e_, flux_n_, flux_e_old_, flux_n_old_;
  Field solid_field_;                             // 1 in solid cells (output, and checked on restart)
  std::vector<double> u_b_, v_b_, p_b_, zero_b_;  // boundary values (bfaces_ order)
  std::unique_ptr<LeastSquaresGradient> lsq_all_, lsq_pressure_;
  std::vector<double> rhs_u_, rhs_v_;  // owned order
  // Momentum terms of every interior face of an owned cell, indexed like the fluxes.
  std::vector<FaceTerms> terms_e_, terms_n_;
  PressureCoefficients coefficients_, setup_coefficients_;

  StencilMatrix a_mom_, a_pc_,
      a_pc_setup_;  // a_pc_setup_: the matrix the pressure preconditioner was built from
  Field d_setup_;   // SIMPLEC d of the last preconditioner set-up (restart state)
  bool preconditioner_ready_ = false;
  OwnedVec b_vec_, x_vec_;
  std::unique_ptr<SolverOptions> options_;  // declared before the solvers that read it
  OwnedKsp ksp_mom_, ksp_pc_;
  OwnedNullSpace null_space_;
  OwnedVec fluid_indicator_;  // null vector of p' in a closed domain with solid cells
  IterationStages stages_;
  ResidualNorms reference_;
  std::vector<double> model_reference_;
};

}  // namespace wallrans
