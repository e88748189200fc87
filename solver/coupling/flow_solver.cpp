// Outer iteration of the pressure-correction solver: set-up, gradients, linear solves, restart
// state and wall data. Momentum assembly is in momentum_assembly.cpp, the pressure correction
// (fluxes, p' equation, corrections) in pressure_correction.cpp.
#include "coupling/flow_solver.hpp"

#include <petscdmda.h>

#include <algorithm>
#include <cmath>
#include <optional>

#include "core/error.hpp"

namespace wallrans {

namespace {

// Defaults of the momentum and pressure solvers; options with the prefixes -momentum_ and
// -pressure_ on the command line or in the case file override them. Measured on the 352 x 192
// plate, each as the median of 5 paired runs against the previous default:
// - Momentum: GMRES with block Jacobi/ILU(0), one preconditioner application per iteration against
//   BiCGStab's two: run time ratio 0.93, 6 MiB more at the peak.
// - Pressure: CG with algebraic multigrid (BoomerAMG), one V(1,1) cycle per iteration with hybrid
//   Gauss-Seidel/Jacobi forward on the way down and backward on the way up. That keeps the
//   preconditioner symmetric (so CG applies) at half the smoothing work of a symmetric sweep on
//   both legs: 11 % more CG iterations, run time ratio 0.92. BoomerAMG rebuilds its hierarchy from
//   each new matrix with no state carried over, which keeps restarted runs bit-identical to
//   uninterrupted ones (GAMG reuses its interpolation between set-ups by default, so a restarted
//   run would differ in the last bits).
// - Pressure rtol 5e-2 rather than 1e-2: the outer iteration corrects what the inner solve leaves;
//   the same outer iteration count within 1 % on the plate, the channel and the cavity at Re 100
//   and 1000, run time ratio 0.88.
const std::vector<std::pair<std::string, std::string>> solver_defaults{
    {"-momentum_ksp_type", "gmres"},
    {"-momentum_pc_type", "bjacobi"},
    {"-momentum_ksp_rtol", "1e-2"},
    {"-momentum_ksp_max_it", "200"},
    {"-pressure_ksp_type", "cg"},
    {"-pressure_pc_type", "hypre"},
    {"-pressure_pc_hypre_type", "boomeramg"},
    {"-pressure_pc_hypre_boomeramg_relax_type_down", "SOR/Jacobi"},
    {"-pressure_pc_hypre_boomeramg_relax_type_up", "backward-SOR/Jacobi"},
    {"-pressure_pc_hypre_boomeramg_relax_type_coarse", "Gaussian-elimination"},
    {"-pressure_ksp_rtol", "5e-2"},
    {"-pressure_ksp_max_it", "500"}};

}  // namespace

const std::vector<std::pair<std::string, std::string>>& FlowSolver::default_options() {
  return solver_defaults;
}

FlowSolver::FlowSolver(const CaseSpec& spec, const Grid& grid, const BoundaryMap& boundaries,
                       TurbulenceModel& model)
    : spec_(spec),
      grid_(grid),
      boundaries_(boundaries),
      conditions_(boundaries.segments(), spec.flow.reference_pressure),
      model_(model),
      bfaces_(owned_boundary_faces(grid, boundaries.faces())),
      cell_faces_(boundary_faces_by_cell(grid, bfaces_)),
      vel_(grid),
      vel_old_(grid),
      grad_u_(grid),
      grad_v_(grid),
      grad_p_(grid),
      grad_pc_(grid),
      p_(grid),
      pc_(grid),
      nu_eff_(grid, spec.flow.kinematic_viscosity),
      d_rc_(grid),
      d_corr_(grid),
      memory_(grid),
      flux_e_(grid),
      flux_n_(grid),
      flux_e_old_(grid),
      flux_n_old_(grid),
      u_b_(bfaces_.size(), 0.0),
      v_b_(bfaces_.size(), 0.0),
      p_b_(bfaces_.size(), 0.0),
      zero_b_(bfaces_.size(), 0.0),
      a_mom_(grid.dm()),
      a_pc_(grid.dm()),
      a_pc_setup_(grid.dm()),
      d_setup_(grid) {
  has_pressure_boundary_ = conditions_.has_fixed_pressure();
  mean_pressure_gradient_ = spec.periodic.mean_pressure_gradient;
  solid_ = boundaries.solid().ghosted_mask(grid);
  has_solid_ = boundaries.solid().any();
  n_fluid_ = static_cast<double>(grid.cells_x()) * grid.cells_y() - boundaries.solid().count();
  solid_field_ = Field(grid);
  set_solid_marker();
  // Global numbering of the wall faces: the wall faces in boundary-face id order.
  std::vector<int> wall_of_face(boundaries_.faces().size(), -1);
  int n_walls = 0;
  for (const BoundaryFace& f : boundaries_.faces()) {
    if (condition(f).is_wall()) wall_of_face[f.id] = n_walls++;
  }
  wall_shear_.assign(static_cast<size_t>(n_walls), 0.0);
  wall_shear_local_.assign(static_cast<size_t>(n_walls), 0.0);
  for (const auto& f : bfaces_) wall_id_.push_back(wall_of_face[f.id]);
  bflux_.assign(bfaces_.size(), 0.0);
  if (grid.periodic_x()) {
    double height = 0.0;  // the section at x = 0: east faces of the last column (open ones)
    if (grid.x_end() == grid.cells_x()) {
      const int i = grid.cells_x() - 1;
      for (int j = grid.y_begin(); j < grid.y_end(); ++j)
        if (!is_closed(grid.local(i, j), grid.local(i + 1, j))) height += grid.east_face(i, j).area.x;
    }
    section_height_ = grid.global_sum(height);
  }
  lsq_all_ = std::make_unique<LeastSquaresGradient>(
      grid, bfaces_, [](const BoundaryFace&) { return true; }, solid_);
  lsq_pressure_ = std::make_unique<LeastSquaresGradient>(
      grid, bfaces_, [this](const BoundaryFace& f) { return is_pressure_boundary(f); }, solid_);

  // Initial field: uniform velocity (zero in solid cells), zero pressure, fluxes from the velocity
  // (zero through faces of solid cells).
  for (int j = grid.gy_begin(); j < grid.gy_end(); ++j) {
    for (int i = grid.gx_begin(); i < grid.gx_end(); ++i)
      vel_.set(i, j, is_solid(grid.local(i, j)) ? Vec2{0.0, 0.0} : spec.flow.initial_velocity);
  }
  for (int j = grid.gy_begin(); j < grid.gy_end(); ++j) {
    for (int i = grid.gx_begin(); i < grid.gx_end(); ++i) {
      const size_t c = grid.local(i, j);
      if (grid.has_east(i) && i + 1 < grid.gx_end() && !is_closed(c, grid.local(i + 1, j)))
        flux_e_(i, j) = dot(spec.flow.initial_velocity, grid.east_face(i, j).area);
      if (grid.has_north(j) && j + 1 < grid.gy_end() && !is_closed(c, grid.local(i, j + 1)))
        flux_n_(i, j) = dot(spec.flow.initial_velocity, grid.north_face(i, j).area);
    }
  }
  predict_boundary_fluxes_from_velocity();
  flux_e_.exchange();
  flux_n_.exchange();
  flux_e_old_ = flux_e_;
  flux_n_old_ = flux_n_;
  bflux_old_ = bflux_;
  vel_old_ = vel_;

  // Linear solvers, configured from a database of their own (defaults, command line, then the
  // case file), so a second solver in the process does not see this case's options.
  options_ = std::make_unique<SolverOptions>(CaseOptionsText{spec.iterations.petsc_options, spec.source_file},
                                             solver_defaults);
  check_petsc(DMCreateGlobalVector(grid.dm(), b_vec_.out()));
  check_petsc(DMCreateGlobalVector(grid.dm(), x_vec_.out()));
  check_petsc(KSPCreate(grid.comm(), ksp_mom_.out()));
  check_petsc(KSPSetOptionsPrefix(ksp_mom_.get(), "momentum_"));
  check_petsc(KSPSetInitialGuessNonzero(ksp_mom_.get(), PETSC_TRUE));
  // Relative tolerance measured against the initial residual, not the right-hand side: the
  // relaxation term makes |b| large, and an rtol on |b| would accept a stale initial guess.
  check_petsc(KSPConvergedDefaultSetUIRNorm(ksp_mom_.get()));
  options_->use("momentum solver", [this] { return KSPSetFromOptions(ksp_mom_.get()); });
  check_petsc(KSPCreate(grid.comm(), ksp_pc_.out()));
  check_petsc(KSPSetOptionsPrefix(ksp_pc_.get(), "pressure_"));
  options_->use("pressure solver", [this] { return KSPSetFromOptions(ksp_pc_.get()); });
  if (!has_pressure_boundary_) {
    // Closed or periodic domain: p' is defined up to a constant in the fluid (NUMERICS: constant
    // null space). Solid cells have identity rows, so with them the null vector is the
    // normalised indicator of the fluid cells.
    if (has_solid_) {
      check_petsc(DMCreateGlobalVector(grid.dm(), fluid_indicator_.out()));
      PetscScalar** x = nullptr;
      check_petsc(DMDAVecGetArray(grid.dm(), fluid_indicator_.get(), &x));
      for (int j = grid.y_begin(); j < grid.y_end(); ++j)
        for (int i = grid.x_begin(); i < grid.x_end(); ++i) x[j][i] = is_solid(grid.local(i, j)) ? 0.0 : 1.0;
      check_petsc(DMDAVecRestoreArray(grid.dm(), fluid_indicator_.get(), &x));
      check_petsc(VecNormalize(fluid_indicator_.get(), nullptr));
      Vec indicator = fluid_indicator_.get();
      check_petsc(MatNullSpaceCreate(grid.comm(), PETSC_FALSE, 1, &indicator, null_space_.out()));
    } else {
      check_petsc(MatNullSpaceCreate(grid.comm(), PETSC_TRUE, 0, nullptr, null_space_.out()));
    }
    check_petsc(MatSetNullSpace(a_pc_.mat(), null_space_.get()));
    check_petsc(MatSetNullSpace(a_pc_setup_.mat(), null_space_.get()));
  }
  rhs_u_.assign(grid.n_owned(), 0.0);
  // Continuity residual per cell: the imbalance relative to the flux U_ref carries through half
  // the cell's faces.
  for (int j = grid.y_begin(); j < grid.y_end(); ++j) {
    for (int i = grid.x_begin(); i < grid.x_end(); ++i) {
      const double half_perimeter = 0.5 * (grid.east_face(i, j).length + grid.east_face(i - 1, j).length +
                                           grid.north_face(i, j).length + grid.north_face(i, j - 1).length);
      continuity_scale_.push_back(1.0 / (spec.flow.reference_velocity * half_perimeter));
    }
  }
  rhs_v_.assign(grid.n_owned(), 0.0);
  terms_e_.assign(grid.n_ghosted(), FaceTerms{});
  terms_n_.assign(grid.n_ghosted(), FaceTerms{});
  for (PressureCoefficients* c : {&coefficients_, &setup_coefficients_}) {
    c->east = Field(grid);
    c->north = Field(grid);
    c->boundary.assign(bfaces_.size(), 0.0);
  }
}

void FlowSolver::predict_boundary_fluxes_from_velocity() {
  update_velocity_boundary_values();
  for (size_t k = 0; k < bfaces_.size(); ++k) {
    const BoundaryFace& f = bfaces_[k];
    switch (condition(f).flux_prediction()) {
      case FluxPrediction::zero:
        bflux_[k] = 0.0;
        break;
      case FluxPrediction::prescribed:
        bflux_[k] = u_b_[k] * f.area.x + v_b_[k] * f.area.y;
        break;
      case FluxPrediction::rhie_chow:
        bflux_[k] = dot(vel_(f.i, f.j), f.area);  // no pressure field yet
        break;
    }
  }
}

void FlowSolver::initialised_from_fields() {
  vel_.exchange();
  p_.exchange();
  grad_p_.exchange();
  // Face fluxes from the linearly interpolated velocity; the Rhie-Chow memory term starts at zero.
  std::fill(memory_.data().begin(), memory_.data().end(), 0.0);
  for (size_t c = 0; c < vel_.x.data().size(); ++c)
    if (is_solid(c)) vel_.x[c] = vel_.y[c] = p_[c] = 0.0;
  for_each_interior_face(
      grid_,
      [&](int i, int j) {
        const FaceGeometry& f = grid_.east_face(i, j);
        flux_e_(i, j) = is_closed(grid_.local(i, j), grid_.local(i + 1, j))
                            ? 0.0
                            : dot(f.wl * vel_(i, j) + (1.0 - f.wl) * vel_(i + 1, j), f.area);
      },
      [&](int i, int j) {
        const FaceGeometry& f = grid_.north_face(i, j);
        flux_n_(i, j) = is_closed(grid_.local(i, j), grid_.local(i, j + 1))
                            ? 0.0
                            : dot(f.wl * vel_(i, j) + (1.0 - f.wl) * vel_(i, j + 1), f.area);
      });
  flux_e_.exchange();
  flux_n_.exchange();
  predict_boundary_fluxes_from_velocity();
  flux_e_old_ = flux_e_;
  flux_n_old_ = flux_n_;
  bflux_old_ = bflux_;
  vel_old_ = vel_;
  iteration_ = 0;
  references_until_ = 0.0;
  preconditioner_ready_ = false;
  velocity_gradients_current_ = false;
}

void FlowSolver::update_velocity_boundary_values() {
  for (size_t k = 0; k < bfaces_.size(); ++k) {
    const BoundaryFace& f = bfaces_[k];
    const BoundaryCondition& bc = condition(f);
    Vec2 value = bc.face_velocity(f, vel_(f.i, f.j), bflux_[k]);
    if (boundary_velocity_ && bc.is_prescribed()) value = boundary_velocity_(f.centre);
    u_b_[k] = value.x;
    v_b_[k] = value.y;
  }
}

void FlowSolver::update_velocity_gradients() {
  update_velocity_boundary_values();
  lsq_all_->compute(vel_.x, u_b_, grad_u_);
  lsq_all_->compute(vel_.y, v_b_, grad_v_);
  grad_u_.exchange();
  grad_v_.exchange();
  velocity_gradients_current_ = true;
}

void FlowSolver::update_pressure_gradient_and_boundary_values() {
  update_pressure_boundary_values();
  lsq_all_->compute(p_, p_b_, grad_p_);
  grad_p_.exchange();
}

void FlowSolver::refresh_wall_data() {
  if (!velocity_gradients_current_) update_velocity_gradients();
  update_pressure_boundary_values();
  refresh_wall_shear();
}

void FlowSolver::update_pressure_boundary_values() {
  // Where the pressure is not imposed, the boundary value is extrapolated linearly along the face
  // normal from the two nearest cells (cell values moved onto the normal with the previous
  // gradient), which is second-order accurate; the value then enters the least-squares fit like
  // an imposed one, so boundary cells get a two-sided gradient.
  for (size_t k = 0; k < bfaces_.size(); ++k) {
    const BoundaryFace& f = bfaces_[k];
    if (is_pressure_boundary(f)) {
      p_b_[k] = condition(f).pressure();
      continue;
    }
    const Vec2 n = (1.0 / norm(f.area)) * f.area;
    auto along_normal = [&](int i, int j, double& s, double& value) {
      const Vec2 r = grid_.centre(i, j) - f.centre;
      s = -dot(r, n);
      value = p_(i, j) - dot(grad_p_(i, j), r + s * n);
    };
    double s1 = 0, v1 = 0;
    along_normal(f.i, f.j, s1, v1);
    p_b_[k] = v1;
    if (f.has_second) {
      double s2 = 0, v2 = 0;
      along_normal(f.i2, f.j2, s2, v2);
      if (s2 > 1.05 * s1) p_b_[k] = v1 - s1 * (v2 - v1) / (s2 - s1);
    }
  }
}

IterationStatus FlowSolver::iterate() {
  IterationStatus status;
  status.iteration = ++iteration_;
  std::optional<ScopedLogStage> phase;  // emplace() pops the previous phase's stage
  phase.emplace(stages_.momentum_assembly);
  vel_old_ = vel_;
  flux_e_old_ = flux_e_;
  flux_n_old_ = flux_n_;
  bflux_old_ = bflux_;

  const Field& nut = model_.eddy_viscosity();
  for (size_t k = 0; k < nu_eff_.data().size(); ++k)
    nu_eff_.data()[k] = spec_.flow.kinematic_viscosity + nut.data()[k];

  phase.emplace(stages_.correction_gradients);
  // The velocity gradients were refreshed after the last correction; only the first iteration
  // (also after a restart or a new boundary function) computes them here.
  if (!velocity_gradients_current_) update_velocity_gradients();
  update_pressure_gradient_and_boundary_values();

  phase.emplace(stages_.momentum_assembly);
  assemble_momentum(status.absolute);
  phase.emplace(stages_.momentum_solve);
  solve_momentum(status);
  phase.emplace(stages_.pressure_assembly);
  predict_fluxes();
  assemble_and_solve_pressure_correction(status);
  phase.emplace(stages_.correction_gradients);
  correct();
  hold_flow_rate();
  // The wall shear and the model see the gradients of the corrected velocity, and the next
  // momentum assembly uses them as they are.
  update_velocity_gradients();

  phase.emplace(stages_.monitors);
  refresh_wall_shear();
  phase.emplace(stages_.turbulence);
  model_.update(view());
  phase.emplace(stages_.monitors);

  // Momentum: normalised by the largest momentum residual (u or v) of the first five iterations
  // (common practice). Continuity: the mean over cells of each cell's mass imbalance relative to
  // U_ref times its half perimeter, so the standard does not tighten as the grid is refined (an
  // L1 sum over cells divided by one U_ref L_ref would); the initial imbalance can be zero.
  const bool measure_references = iteration_ <= references_until_;
  if (measure_references) reference_.u = std::max({reference_.u, status.absolute.u, status.absolute.v});
  const double momentum_ref = reference_.u > 0.0 ? reference_.u : 1.0;
  status.normalised = {status.absolute.u / momentum_ref, status.absolute.v / momentum_ref,
                       continuity_per_cell_};
  status.model_absolute = model_.residuals();
  model_reference_.resize(status.model_absolute.size(), 0.0);
  for (size_t k = 0; k < status.model_absolute.size(); ++k) {
    if (measure_references)
      model_reference_[k] = std::max(model_reference_[k], status.model_absolute[k].value);
    status.model_normalised.push_back(model_reference_[k] > 0.0
                                          ? status.model_absolute[k].value / model_reference_[k]
                                          : status.model_absolute[k].value);
  }
  return status;
}

void FlowSolver::set_solid_marker() {
  for (size_t c = 0; c < solid_field_.data().size(); ++c) solid_field_[c] = is_solid(c) ? 1.0 : 0.0;
}

SolverRestartState FlowSolver::restart_state() {
  SolverRestartState state;
  state.cells = {{"velocity_x", &vel_.x},
                 {"velocity_y", &vel_.y},
                 {"pressure", &p_},
                 {"pressure_gradient_x", &grad_p_.x},
                 {"pressure_gradient_y", &grad_p_.y},
                 {"flux_east", &flux_e_},
                 {"flux_north", &flux_n_},
                 {"pressure_setup_coefficient", &d_setup_}};
  if (has_solid_) state.cells.push_back({"solid", &solid_field_});
  state.boundary = {{"boundary_flux", &bflux_}};
  for (const BoundaryFace& f : bfaces_) state.boundary_ids.push_back(f.id);
  state.n_boundary_faces = static_cast<int>(boundaries_.faces().size());
  state.scalars = {{"momentum_residual_reference", &reference_.u},
                   {"residual_references_until", &references_until_}};
  model_reference_.resize(model_.residuals().size(), 0.0);
  for (size_t k = 0; k < model_reference_.size(); ++k)
    state.scalars.push_back({"model_residual_reference_" + std::to_string(k), &model_reference_[k]});
  if (spec_.periodic.bulk_velocity)
    state.scalars.push_back({"mean_pressure_gradient", &mean_pressure_gradient_});
  state.iteration = &iteration_;
  return state;
}

void FlowSolver::restarted() {
  if (has_solid_) {
    // The boundary arrays are per boundary-face id, and the ids of the faces next to solid cells
    // follow the solid cells: a checkpoint of other solid regions would put values on the wrong
    // faces.
    double differing = 0.0;
    for (int j = grid_.y_begin(); j < grid_.y_end(); ++j)
      for (int i = grid_.x_begin(); i < grid_.x_end(); ++i)
        differing += solid_field_(i, j) != (is_solid(grid_.local(i, j)) ? 1.0 : 0.0) ? 1.0 : 0.0;
    differing = grid_.global_sum(differing);
    set_solid_marker();
    if (differing > 0.0) {
      throw InputError(case_location(spec_, spec_.solid_regions.front().line) +
                       ": key 'solid_regions': expected the solid cells of the checkpoint, got " +
                       std::to_string(static_cast<long long>(differing)) + " cells that differ");
    }
  }
  d_setup_.exchange();
  preconditioner_ready_ = false;
  velocity_gradients_current_ = false;  // recomputed from the restored velocity and boundary fluxes
  vel_.exchange();
  p_.exchange();
  grad_p_.exchange();
  flux_e_.exchange();
  flux_n_.exchange();
}

MeanFlowView FlowSolver::view() const {
  return MeanFlowView{grid_,   boundaries_, conditions_, bfaces_,
                      bflux_,  vel_,        grad_u_,     grad_v_,
                      flux_e_, flux_n_,     wall_shear_, spec_.flow.kinematic_viscosity};
}

void FlowSolver::refresh_wall_shear() {
  // Each rank fills its own wall faces; the sum over ranks assembles the whole list.
  std::vector<double>& local = wall_shear_local_;
  std::fill(local.begin(), local.end(), 0.0);
  for (size_t k = 0; k < bfaces_.size(); ++k) {
    if (wall_id_[k] >= 0) local[wall_id_[k]] = std::abs(wall_shear_stress(k));
  }
  if (!local.empty()) {
    check_mpi(MPI_Allreduce(local.data(), wall_shear_.data(), static_cast<int>(local.size()), MPI_DOUBLE,
                            MPI_SUM, grid_.comm()));
  }
}

bool FlowSolver::converged(const IterationStatus& s) const {
  const double tol = spec_.iterations.residual_drop;
  bool model_converged = true;
  for (double r : s.model_normalised) model_converged = model_converged && r < tol;
  return s.iteration > 5 && s.normalised.u < tol && s.normalised.v < tol && s.normalised.continuity < tol &&
         model_converged;
}

void FlowSolver::solve_linear(KSP ksp, Vec rhs, Field& solution, int& iterations, bool& converged) {
  PetscScalar** x = nullptr;
  check_petsc(DMDAVecGetArray(grid_.dm(), x_vec_.get(), &x));
  for (int j = grid_.y_begin(); j < grid_.y_end(); ++j)
    for (int i = grid_.x_begin(); i < grid_.x_end(); ++i) x[j][i] = solution(i, j);
  check_petsc(DMDAVecRestoreArray(grid_.dm(), x_vec_.get(), &x));
  // The preconditioner's first set-up reads the options of its sub-solvers.
  options_->use(ksp == ksp_mom_.get() ? "momentum solver" : "pressure solver",
                [&] { return KSPSolve(ksp, rhs, x_vec_.get()); });
  KSPConvergedReason reason;
  check_petsc(KSPGetConvergedReason(ksp, &reason));
  PetscInt its = 0;
  check_petsc(KSPGetIterationNumber(ksp, &its));
  iterations += static_cast<int>(its);
  // Hitting the iteration cap is tolerated inside the outer loop; a breakdown is not.
  if (reason < 0 && reason != KSP_DIVERGED_ITS) converged = false;
  check_petsc(DMDAVecGetArray(grid_.dm(), x_vec_.get(), &x));
  for (int j = grid_.y_begin(); j < grid_.y_end(); ++j)
    for (int i = grid_.x_begin(); i < grid_.x_end(); ++i) solution(i, j) = x[j][i];
  check_petsc(DMDAVecRestoreArray(grid_.dm(), x_vec_.get(), &x));
}

void FlowSolver::solve_momentum(IterationStatus& status) {
  check_petsc(KSPSetOperators(ksp_mom_.get(), a_mom_.mat(), a_mom_.mat()));
  for (int component = 0; component < 2; ++component) {
    const auto& rhs = component == 0 ? rhs_u_ : rhs_v_;
    PetscScalar** b = nullptr;
    check_petsc(DMDAVecGetArray(grid_.dm(), b_vec_.get(), &b));
    for (int j = grid_.y_begin(); j < grid_.y_end(); ++j)
      for (int i = grid_.x_begin(); i < grid_.x_end(); ++i) b[j][i] = rhs[grid_.owned(i, j)];
    check_petsc(DMDAVecRestoreArray(grid_.dm(), b_vec_.get(), &b));
    Field& target = component == 0 ? vel_.x : vel_.y;
    solve_linear(ksp_mom_.get(), b_vec_.get(), target, status.momentum_iterations,
                 status.linear_solves_converged);
  }
  vel_.exchange();
  d_rc_.exchange();
  d_corr_.exchange();
  memory_.exchange();
}

}  // namespace wallrans

namespace wallrans {

Vec2 wall_tangent(Vec2 n) {
  const Vec2 t{-n.y, n.x};
  return t.x < 0.0 || (t.x == 0.0 && t.y < 0.0) ? -1.0 * t : t;
}

double FlowSolver::wall_shear_stress(size_t k) const {
  const BoundaryFace& f = bfaces_[k];
  const Vec2 t = wall_tangent((1.0 / norm(f.area)) * f.area);
  // Velocity derivative into the fluid, second order (see normal_derivative).
  const double du = -normal_derivative(vel_.x, grad_u_, u_b_[k], f);
  const double dv = -normal_derivative(vel_.y, grad_v_, v_b_[k], f);
  return spec_.flow.kinematic_viscosity * (du * t.x + dv * t.y);
}

std::vector<WallSample> FlowSolver::wall_samples() const {
  std::vector<WallSample> out;
  const double dynamic = 0.5 * spec_.flow.reference_velocity * spec_.flow.reference_velocity;
  for (size_t k = 0; k < bfaces_.size(); ++k) {
    const BoundaryFace& f = bfaces_[k];
    if (!condition(f).is_wall()) continue;
    const Vec2 n = (1.0 / norm(f.area)) * f.area;
    const double tau = wall_shear_stress(k);
    const double s1 = dot(f.centre - grid_.centre(f.i, f.j), n);
    out.push_back({f.side, f.index, f.on_solid, f.centre, tau, tau / dynamic,
                   (p_b_[k] - spec_.flow.reference_pressure) / dynamic, s1, f.segment, f.i, f.j, n,
                   wall_tangent(n), norm(f.area), p_b_[k]});
  }
  return out;
}

}  // namespace wallrans
