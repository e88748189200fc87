// Pressure correction of the outer iteration: Rhie-Chow face fluxes, the p' equation with its
// face coefficients, and the corrections of fluxes, velocity and pressure.
#include <petscdmda.h>

#include <algorithm>
#include <cmath>

#include "core/error.hpp"
#include "coupling/flow_solver.hpp"
#include "discretization/matrix_row.hpp"

namespace wallrans {

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
      // No flow through a face of a solid cell.
      if (grid_.has_east(i)) {
        const size_t r = grid_.local(i + 1, j);
        flux_e_[c] = is_closed(c, r) ? 0.0 : interior_flux(c, r, grid_.east_face(i, j), flux_e_old_[c]);
      }
      if (grid_.has_north(j)) {
        const size_t r = grid_.local(i, j + 1);
        flux_n_[c] = is_closed(c, r) ? 0.0 : interior_flux(c, r, grid_.north_face(i, j), flux_n_old_[c]);
      }
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
  // fixed-pressure face the difference is taken to the face centre, where p' = 0. Zero at a face
  // of a solid cell (no flux there).
  auto coefficient = [&](size_t l, size_t r, const FaceGeometry& face) {
    return is_closed(l, r) ? 0.0 : (face.wl * d[l] + (1.0 - face.wl) * d[r]) * face.k;
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

void FlowSolver::assemble_pressure_matrix(const PressureCoefficients& c, StencilMatrix& a) const {
  StencilMatrix::Fill fill = a.begin_fill();
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
      if (is_solid(grid_.local(i, j))) row.centre = 1.0;  // identity row (every face coefficient is 0)
      write_row(grid_, fill, i, j, row);
    }
  }
  fill.end();
}

double FlowSolver::cell_net_outflow(int i, int j) const {
  double net_out = 0.0;
  if (grid_.has_east(i)) net_out += flux_e_(i, j);
  if (grid_.has_north(j)) net_out += flux_n_(i, j);
  if (grid_.has_west(i)) net_out -= flux_e_(i - 1, j);
  if (grid_.has_south(j)) net_out -= flux_n_(i, j - 1);
  for (int slot : cell_faces_[grid_.owned(i, j)]) {
    if (slot >= 0) net_out += bflux_[slot];  // stored outward: out of the domain and this cell
  }
  return net_out;
}

void FlowSolver::assemble_and_solve_pressure_correction(IterationStatus& status) {
  PetscScalar** b = nullptr;
  check_petsc(DMDAVecGetArray(grid_.dm(), b_vec_.get(), &b));
  double imbalance = 0.0, imbalance_per_cell = 0.0;
  for (int j = grid_.y_begin(); j < grid_.y_end(); ++j) {
    for (int i = grid_.x_begin(); i < grid_.x_end(); ++i) {
      if (is_solid(grid_.local(i, j))) {
        b[j][i] = 0.0;  // p' = 0 in solid cells
        continue;
      }
      const double net_out = cell_net_outflow(i, j);
      b[j][i] = -net_out;
      imbalance += std::abs(net_out);
      imbalance_per_cell += std::abs(net_out) * continuity_scale_[grid_.owned(i, j)];
    }
  }
  check_petsc(DMDAVecRestoreArray(grid_.dm(), b_vec_.get(), &b));
  pressure_coefficients(d_corr_, coefficients_);
  assemble_pressure_matrix(coefficients_, a_pc_);
  status.absolute.continuity = grid_.global_sum(imbalance);
  continuity_per_cell_ = grid_.global_sum(imbalance_per_cell) / n_fluid_;
  if (null_space_) check_petsc(MatNullSpaceRemove(null_space_.get(), b_vec_.get()));
  const ScopedLogStage solve_stage(stages_.pressure_solve);
  // The preconditioner (algebraic multigrid, the costliest set-up of an iteration) is rebuilt
  // every pressure_setup_every iterations from that iteration's matrix and reused in between.
  // The cadence is keyed to the iteration number and the coefficients it was built from are part
  // of the restart state, so a restarted run rebuilds the very same preconditioner.
  const bool on_cadence = (iteration_ - 1) % spec_.iterations.pressure_setup_every == 0;
  if (on_cadence) {
    d_setup_ = d_corr_;
    check_petsc(MatCopy(a_pc_.mat(), a_pc_setup_.mat(), SAME_NONZERO_PATTERN));
  } else if (!preconditioner_ready_) {
    pressure_coefficients(d_setup_, setup_coefficients_);
    assemble_pressure_matrix(setup_coefficients_, a_pc_setup_);
  }
  const bool set_up = on_cadence || !preconditioner_ready_;
  check_petsc(KSPSetReusePreconditioner(ksp_pc_.get(), set_up ? PETSC_FALSE : PETSC_TRUE));
  check_petsc(KSPSetOperators(ksp_pc_.get(), a_pc_.mat(), a_pc_setup_.mat()));
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
      if (is_solid(grid_.local(i, j))) continue;  // velocity and pressure stay zero there
      const Vec2 g = grad_pc_(i, j);
      vel_.x(i, j) -= d_corr_(i, j) * g.x;
      vel_.y(i, j) -= d_corr_(i, j) * g.y;
      p_(i, j) += alpha_p * pc_(i, j);
      p_sum += p_(i, j) * grid_.volume(i, j);
      volume += grid_.volume(i, j);
    }
  }
  if (!has_pressure_boundary_) {
    // Pressure level of a closed/periodic domain: zero volume-weighted mean over the fluid.
    const double mean = grid_.global_sum(p_sum) / grid_.global_sum(volume);
    for (int j = grid_.y_begin(); j < grid_.y_end(); ++j)
      for (int i = grid_.x_begin(); i < grid_.x_end(); ++i)
        if (!is_solid(grid_.local(i, j))) p_(i, j) -= mean;
  }
  vel_.exchange();
  p_.exchange();
  flux_e_.exchange();
  flux_n_.exchange();
}

}  // namespace wallrans
