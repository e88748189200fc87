// Outer iteration of the pressure-correction solver: set-up, flux prediction, pressure
// correction and corrections. Momentum assembly is in momentum_assembly.cpp.
#include "coupling/flow_solver.hpp"

#include <petscdmda.h>

#include <algorithm>
#include <cmath>
#include <optional>

#include "core/error.hpp"
#include "discretization/matrix_row.hpp"

namespace wallrans {

namespace {

void set_default_option(const char* name, const char* value) {
  PetscBool set = PETSC_FALSE;
  check_petsc(PetscOptionsHasName(nullptr, nullptr, name, &set));
  if (!set) check_petsc(PetscOptionsSetValue(nullptr, name, value));
}

}  // namespace

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
      d_setup_(grid) {
  has_pressure_boundary_ = conditions_.has_fixed_pressure();
  // Global numbering of the wall faces: the wall faces in boundary-face id order.
  std::vector<int> wall_of_face(boundaries_.faces().size(), -1);
  int n_walls = 0;
  for (const BoundaryFace& f : boundaries_.faces()) {
    if (condition(f).is_wall()) wall_of_face[f.id] = n_walls++;
  }
  wall_shear_.assign(static_cast<size_t>(n_walls), 0.0);
  for (const auto& f : bfaces_) wall_id_.push_back(wall_of_face[f.id]);
  bflux_.assign(bfaces_.size(), 0.0);
  lsq_all_ = std::make_unique<LeastSquaresGradient>(grid, bfaces_, [](const BoundaryFace&) { return true; });
  lsq_pressure_ = std::make_unique<LeastSquaresGradient>(
      grid, bfaces_, [this](const BoundaryFace& f) { return is_pressure_boundary(f); });

  // Initial field: uniform velocity, zero pressure, fluxes from the velocity.
  for (int j = grid.gy_begin(); j < grid.gy_end(); ++j) {
    for (int i = grid.gx_begin(); i < grid.gx_end(); ++i) vel_.set(i, j, spec.flow.initial_velocity);
  }
  for (int j = grid.gy_begin(); j < grid.gy_end(); ++j) {
    for (int i = grid.gx_begin(); i < grid.gx_end(); ++i) {
      if (grid.has_east(i)) flux_e_(i, j) = dot(spec.flow.initial_velocity, grid.east_face(i, j).area);
      if (grid.has_north(j)) flux_n_(i, j) = dot(spec.flow.initial_velocity, grid.north_face(i, j).area);
    }
  }
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
  flux_e_.exchange();
  flux_n_.exchange();
  flux_e_old_ = flux_e_;
  flux_n_old_ = flux_n_;
  bflux_old_ = bflux_;
  vel_old_ = vel_;

  // Linear solvers; defaults can be overridden by PETSc options with the equation's prefix.
  if (!spec.iterations.petsc_options.empty()) {
    check_petsc(PetscOptionsInsertString(nullptr, spec.iterations.petsc_options.c_str()));
  }
  set_default_option("-momentum_ksp_type", "bcgs");
  set_default_option("-momentum_pc_type", "bjacobi");
  set_default_option("-momentum_ksp_rtol", "1e-2");
  set_default_option("-momentum_ksp_max_it", "200");
  set_default_option("-pressure_ksp_type", "cg");
  // Algebraic multigrid (BoomerAMG) with a symmetric smoother, so CG applies. It rebuilds its
  // hierarchy from each new matrix with no state carried over, which keeps restarted runs
  // bit-identical to uninterrupted ones (GAMG reuses its interpolation between set-ups by
  // default, so a restarted run would differ in the last bits); it is also as fast here.
  set_default_option("-pressure_pc_type", "hypre");
  set_default_option("-pressure_pc_hypre_type", "boomeramg");
  set_default_option("-pressure_pc_hypre_boomeramg_relax_type_all", "symmetric-SOR/Jacobi");
  set_default_option("-pressure_ksp_rtol", "1e-2");
  set_default_option("-pressure_ksp_max_it", "500");
  check_petsc(DMCreateMatrix(grid.dm(), a_mom_.out()));
  check_petsc(DMCreateMatrix(grid.dm(), a_pc_.out()));
  check_petsc(DMCreateMatrix(grid.dm(), a_pc_setup_.out()));
  check_petsc(DMCreateGlobalVector(grid.dm(), b_vec_.out()));
  check_petsc(DMCreateGlobalVector(grid.dm(), x_vec_.out()));
  check_petsc(KSPCreate(grid.comm(), ksp_mom_.out()));
  check_petsc(KSPSetOptionsPrefix(ksp_mom_.get(), "momentum_"));
  check_petsc(KSPSetInitialGuessNonzero(ksp_mom_.get(), PETSC_TRUE));
  // Relative tolerance measured against the initial residual, not the right-hand side: the
  // relaxation term makes |b| large, and an rtol on |b| would accept a stale initial guess.
  check_petsc(KSPConvergedDefaultSetUIRNorm(ksp_mom_.get()));
  check_petsc(KSPSetFromOptions(ksp_mom_.get()));
  check_petsc(KSPCreate(grid.comm(), ksp_pc_.out()));
  check_petsc(KSPSetOptionsPrefix(ksp_pc_.get(), "pressure_"));
  check_petsc(KSPSetFromOptions(ksp_pc_.get()));
  if (!has_pressure_boundary_) {
    // Closed or periodic domain: p' is defined up to a constant (NUMERICS: constant null space).
    check_petsc(MatNullSpaceCreate(grid.comm(), PETSC_TRUE, 0, nullptr, null_space_.out()));
    check_petsc(MatSetNullSpace(a_pc_.get(), null_space_.get()));
    check_petsc(MatSetNullSpace(a_pc_setup_.get(), null_space_.get()));
  }
  rhs_u_.assign(grid.n_owned(), 0.0);
  rhs_v_.assign(grid.n_owned(), 0.0);
  terms_e_.assign(grid.n_ghosted(), FaceTerms{});
  terms_n_.assign(grid.n_ghosted(), FaceTerms{});
  for (PressureCoefficients* c : {&coefficients_, &setup_coefficients_}) {
    c->east = Field(grid);
    c->north = Field(grid);
    c->boundary.assign(bfaces_.size(), 0.0);
  }
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
  lsq_all_->compute(p_, p_b_, grad_p_);
  grad_p_.exchange();
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
  if (iteration_ <= 5) reference_.u = std::max({reference_.u, status.absolute.u, status.absolute.v});
  const double momentum_ref = reference_.u > 0.0 ? reference_.u : 1.0;
  status.normalised = {status.absolute.u / momentum_ref, status.absolute.v / momentum_ref,
                       continuity_per_cell_};
  status.model_absolute = model_.residuals();
  model_reference_.resize(status.model_absolute.size(), 0.0);
  for (size_t k = 0; k < status.model_absolute.size(); ++k) {
    if (iteration_ <= 5) model_reference_[k] = std::max(model_reference_[k], status.model_absolute[k].value);
    status.model_normalised.push_back(model_reference_[k] > 0.0
                                          ? status.model_absolute[k].value / model_reference_[k]
                                          : status.model_absolute[k].value);
  }
  return status;
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
  state.boundary = {{"boundary_flux", &bflux_}};
  for (const BoundaryFace& f : bfaces_) state.boundary_ids.push_back(f.id);
  state.n_boundary_faces = static_cast<int>(boundaries_.faces().size());
  state.scalars = {{"momentum_residual_reference", &reference_.u}};
  model_reference_.resize(model_.residuals().size(), 0.0);
  for (size_t k = 0; k < model_reference_.size(); ++k)
    state.scalars.push_back({"model_residual_reference_" + std::to_string(k), &model_reference_[k]});
  state.iteration = &iteration_;
  return state;
}

void FlowSolver::restarted() {
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
  std::vector<double> local(wall_shear_.size(), 0.0);
  const auto samples = wall_samples();
  size_t s = 0;
  for (size_t k = 0; k < bfaces_.size(); ++k) {
    if (wall_id_[k] < 0) continue;
    local[wall_id_[k]] = std::abs(samples[s++].shear_stress);
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
  check_petsc(KSPSolve(ksp, rhs, x_vec_.get()));
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
  check_petsc(KSPSetOperators(ksp_mom_.get(), a_mom_.get(), a_mom_.get()));
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

double FlowSolver::interior_flux(size_t l, size_t r, const FaceGeometry& face, double flux_old) const {
  const double wl = face.wl, wr = 1.0 - wl;
  // Velocity interpolated to the face centre, with the skewness correction along face.skew.
  const Vec2 gu = wl * grad_u_[l] + wr * grad_u_[r];
  const Vec2 gv = wl * grad_v_[l] + wr * grad_v_[r];
  const Vec2 skew_correction{dot(gu, face.skew), dot(gv, face.skew)};
  auto interp = [&](const VectorField& vel) {
    const Vec2 mean = wl * vel[l] + wr * vel[r];
    return Vec2{mean.x + skew_correction.x, mean.y + skew_correction.y};
  };
  // Relaxation-consistent Rhie-Chow (Majumdar 1988), generalised to a relaxation share m = r / (a_P
  // + r) that varies from cell to cell: F = S.u_bar + (1 - m_f) (V/a_P)_f k (grad p_bar . d - dp)
  // + m_f (F_old - S.u_bar_old). At convergence (F = F_old) the m_f terms cancel exactly, so
  // the answer does not depend on the relaxation.
  const double m_face = wl * memory_[l] + wr * memory_[r];
  const double d_face = (1.0 - m_face) * (wl * d_rc_[l] + wr * d_rc_[r]);
  const Vec2 gp = wl * grad_p_[l] + wr * grad_p_[r];
  const double memory = m_face * (flux_old - dot(interp(vel_old_), face.area));
  return dot(interp(vel_), face.area) + d_face * face.k * (dot(gp, face.d) - (p_[r] - p_[l])) + memory;
}

void FlowSolver::predict_fluxes() {
  for (int j = grid_.y_begin(); j < grid_.y_end(); ++j) {
    for (int i = grid_.x_begin(); i < grid_.x_end(); ++i) {
      const size_t c = grid_.local(i, j);
      if (grid_.has_east(i))
        flux_e_[c] = interior_flux(c, grid_.local(i + 1, j), grid_.east_face(i, j), flux_e_old_[c]);
      if (grid_.has_north(j))
        flux_n_[c] = interior_flux(c, grid_.local(i, j + 1), grid_.north_face(i, j), flux_n_old_[c]);
    }
  }
  for (size_t k = 0; k < bfaces_.size(); ++k) {
    const BoundaryFace& f = bfaces_[k];
    double& flux = bflux_[k];
    switch (condition(f).flux_prediction()) {
      case FluxPrediction::zero:
        flux = 0.0;
        break;
      case FluxPrediction::prescribed:
        flux =
            boundary_flux_fn_ ? boundary_flux_fn_(f.centre, f.area) : u_b_[k] * f.area.x + v_b_[k] * f.area.y;
        break;
      case FluxPrediction::rhie_chow: {
        // Rhie-Chow between the owner cell and the face, with the boundary pressure p_b.
        const Vec2 xp = grid_.centre(f.i, f.j);
        const Vec2 d = f.centre - xp;
        const double kf = dot(f.area, f.area) / dot(f.area, d);
        const double m = memory_(f.i, f.j);
        const double memory = m * (bflux_old_[k] - dot(vel_old_(f.i, f.j), f.area));
        flux = dot(vel_(f.i, f.j), f.area) +
               (1.0 - m) * d_rc_(f.i, f.j) * kf * (dot(grad_p_(f.i, f.j), d) - (p_b_[k] - p_(f.i, f.j))) +
               memory;
        break;
      }
    }
  }
  flux_e_.exchange();
  flux_n_.exchange();
}

void FlowSolver::pressure_coefficients(const Field& d, PressureCoefficients& out) const {
  // A_f = d_f |S|^2 / (S . d): the face-flux response to the p' difference across the face; at a
  // fixed-pressure face the difference is taken to the face centre, where p' = 0.
  auto coefficient = [&](size_t l, size_t r, const FaceGeometry& face) {
    const double dc = face.wl * d[l] + (1.0 - face.wl) * d[r];
    return dc * dot(face.area, face.area) / dot(face.area, face.d);
  };
  for_each_interior_face(
      grid_,
      [&](int i, int j) {
        const size_t l = grid_.local(i, j);
        out.east[l] = coefficient(l, grid_.local(i + 1, j), grid_.east_face(i, j));
      },
      [&](int i, int j) {
        const size_t l = grid_.local(i, j);
        out.north[l] = coefficient(l, grid_.local(i, j + 1), grid_.north_face(i, j));
      });
  for (size_t k = 0; k < bfaces_.size(); ++k) {
    const BoundaryFace& f = bfaces_[k];
    if (!is_pressure_boundary(f)) continue;
    const Vec2 r = f.centre - grid_.centre(f.i, f.j);
    out.boundary[k] = d(f.i, f.j) * dot(f.area, f.area) / dot(f.area, r);
  }
}

void FlowSolver::assemble_pressure_matrix(const PressureCoefficients& c, Mat a) const {
  check_petsc(MatZeroEntries(a));
  for (int j = grid_.y_begin(); j < grid_.y_end(); ++j) {
    for (int i = grid_.x_begin(); i < grid_.x_end(); ++i) {
      MatrixRow row;
      auto add = [&](double coef, double& entry) {
        row.centre += coef;
        entry = -coef;
      };
      if (grid_.has_east(i)) add(c.east(i, j), row.east);
      if (grid_.has_west(i)) add(c.east(i - 1, j), row.west);
      if (grid_.has_north(j)) add(c.north(i, j), row.north);
      if (grid_.has_south(j)) add(c.north(i, j - 1), row.south);
      for (int slot : cell_faces_[grid_.owned(i, j)]) {
        if (slot >= 0) row.centre += c.boundary[slot];  // zero unless the pressure is fixed there
      }
      write_row(grid_, a, i, j, row, ADD_VALUES);
    }
  }
  check_petsc(MatAssemblyBegin(a, MAT_FINAL_ASSEMBLY));
  check_petsc(MatAssemblyEnd(a, MAT_FINAL_ASSEMBLY));
}

void FlowSolver::assemble_and_solve_pressure_correction(IterationStatus& status) {
  PetscScalar** b = nullptr;
  check_petsc(DMDAVecGetArray(grid_.dm(), b_vec_.get(), &b));
  double imbalance = 0.0, imbalance_per_cell = 0.0;
  const double u_ref = spec_.flow.reference_velocity;
  for (int j = grid_.y_begin(); j < grid_.y_end(); ++j) {
    for (int i = grid_.x_begin(); i < grid_.x_end(); ++i) {
      double net_out = 0.0;
      if (grid_.has_east(i)) net_out += flux_e_(i, j);
      if (grid_.has_north(j)) net_out += flux_n_(i, j);
      if (grid_.has_west(i)) net_out -= flux_e_(i - 1, j);
      if (grid_.has_south(j)) net_out -= flux_n_(i, j - 1);
      for (int slot : cell_faces_[grid_.owned(i, j)]) {
        if (slot >= 0) net_out += bflux_[slot];  // stored outward: out of the domain and this cell
      }
      b[j][i] = -net_out;
      imbalance += std::abs(net_out);
      // The cell's imbalance relative to the flux U_ref carries through half its faces.
      const double half_perimeter = 0.5 * (grid_.east_face(i, j).length + grid_.east_face(i - 1, j).length +
                                           grid_.north_face(i, j).length + grid_.north_face(i, j - 1).length);
      imbalance_per_cell += std::abs(net_out) / (u_ref * half_perimeter);
    }
  }
  check_petsc(DMDAVecRestoreArray(grid_.dm(), b_vec_.get(), &b));
  pressure_coefficients(d_corr_, coefficients_);
  assemble_pressure_matrix(coefficients_, a_pc_.get());
  status.absolute.continuity = grid_.global_sum(imbalance);
  continuity_per_cell_ =
      grid_.global_sum(imbalance_per_cell) / (static_cast<double>(grid_.cells_x()) * grid_.cells_y());
  if (null_space_) check_petsc(MatNullSpaceRemove(null_space_.get(), b_vec_.get()));
  const ScopedLogStage solve_stage(stages_.pressure_solve);
  // The preconditioner (algebraic multigrid, the costliest set-up of an iteration) is rebuilt
  // every pressure_setup_every iterations from that iteration's matrix and reused in between.
  // The cadence is keyed to the iteration number and the coefficients it was built from are part
  // of the restart state, so a restarted run rebuilds the very same preconditioner.
  const bool on_cadence = (iteration_ - 1) % spec_.iterations.pressure_setup_every == 0;
  if (on_cadence) {
    d_setup_ = d_corr_;
    check_petsc(MatCopy(a_pc_.get(), a_pc_setup_.get(), SAME_NONZERO_PATTERN));
  } else if (!preconditioner_ready_) {
    pressure_coefficients(d_setup_, setup_coefficients_);
    assemble_pressure_matrix(setup_coefficients_, a_pc_setup_.get());
  }
  const bool set_up = on_cadence || !preconditioner_ready_;
  check_petsc(KSPSetReusePreconditioner(ksp_pc_.get(), set_up ? PETSC_FALSE : PETSC_TRUE));
  check_petsc(KSPSetOperators(ksp_pc_.get(), a_pc_.get(), a_pc_setup_.get()));
  preconditioner_ready_ = true;
  std::fill(pc_.data().begin(), pc_.data().end(), 0.0);
  solve_linear(ksp_pc_.get(), b_vec_.get(), pc_, status.pressure_iterations, status.linear_solves_converged);
  pc_.exchange();
}

void FlowSolver::correct() {
  // Flux corrections F' = -A_f (p'_R - p'_L), with the coefficients of the p' matrix, keep every
  // cell's mass balance to solver tolerance.
  const PressureCoefficients& c = coefficients_;
  for (int j = grid_.y_begin(); j < grid_.y_end(); ++j) {
    for (int i = grid_.x_begin(); i < grid_.x_end(); ++i) {
      if (grid_.has_east(i)) flux_e_(i, j) -= c.east(i, j) * (pc_(i + 1, j) - pc_(i, j));
      if (grid_.has_north(j)) flux_n_(i, j) -= c.north(i, j) * (pc_(i, j + 1) - pc_(i, j));
    }
  }
  for (size_t k = 0; k < bfaces_.size(); ++k) {
    const BoundaryFace& f = bfaces_[k];
    if (is_pressure_boundary(f)) bflux_[k] += c.boundary[k] * pc_(f.i, f.j);
  }
  lsq_pressure_->compute(pc_, zero_b_, grad_pc_);
  const double alpha_p = spec_.iterations.relax_pressure;
  double p_sum = 0.0, volume = 0.0;
  for (int j = grid_.y_begin(); j < grid_.y_end(); ++j) {
    for (int i = grid_.x_begin(); i < grid_.x_end(); ++i) {
      const Vec2 g = grad_pc_(i, j);
      vel_.x(i, j) -= d_corr_(i, j) * g.x;
      vel_.y(i, j) -= d_corr_(i, j) * g.y;
      p_(i, j) += alpha_p * pc_(i, j);
      p_sum += p_(i, j) * grid_.volume(i, j);
      volume += grid_.volume(i, j);
    }
  }
  if (!has_pressure_boundary_) {
    // Pressure level of a closed/periodic domain: zero volume-weighted mean.
    const double mean = grid_.global_sum(p_sum) / grid_.global_sum(volume);
    for (int j = grid_.y_begin(); j < grid_.y_end(); ++j)
      for (int i = grid_.x_begin(); i < grid_.x_end(); ++i) p_(i, j) -= mean;
  }
  vel_.exchange();
  p_.exchange();
  flux_e_.exchange();
  flux_n_.exchange();
}

}  // namespace wallrans

namespace wallrans {

std::vector<WallSample> FlowSolver::wall_samples() const {
  std::vector<WallSample> out;
  const double dynamic = 0.5 * spec_.flow.reference_velocity * spec_.flow.reference_velocity;
  for (size_t k = 0; k < bfaces_.size(); ++k) {
    const BoundaryFace& f = bfaces_[k];
    if (!condition(f).is_wall()) continue;
    const Vec2 n = (1.0 / norm(f.area)) * f.area;
    Vec2 t{-n.y, n.x};
    if (t.x < 0.0 || (t.x == 0.0 && t.y < 0.0)) t = -1.0 * t;
    // Velocity derivative into the fluid, second order (see normal_derivative).
    const double du = -normal_derivative(vel_.x, grad_u_, u_b_[k], f);
    const double dv = -normal_derivative(vel_.y, grad_v_, v_b_[k], f);
    const double tau = spec_.flow.kinematic_viscosity * (du * t.x + dv * t.y);
    const double s1 = dot(f.centre - grid_.centre(f.i, f.j), n);
    out.push_back({f.side, f.index, f.centre, tau, tau / dynamic,
                   (p_b_[k] - spec_.flow.reference_pressure) / dynamic, s1});
  }
  return out;
}

}  // namespace wallrans
