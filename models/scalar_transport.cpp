// Assembly and solution of a turbulence-model transport equation, by faces: each interior face is
// evaluated once, then every owned row gathers its faces.
#include "models/scalar_transport.hpp"

#include <petscdmda.h>

#include <array>
#include <cmath>

#include "core/error.hpp"
#include "discretization/convection.hpp"
#include "discretization/matrix_row.hpp"
#include "discretization/relaxation.hpp"

namespace wallrans {

std::vector<std::pair<std::string, std::string>> ScalarTransport::default_options(const std::string& prefix) {
  return {{"-" + prefix + "ksp_type", "bcgs"},
          {"-" + prefix + "ksp_rtol", "1e-3"},
          {"-" + prefix + "ksp_max_it", "200"}};
}

ScalarTransport::ScalarTransport(const Grid& grid, const BoundaryMap& boundaries, ConvectionScheme scheme,
                                 const std::string& prefix, const CaseOptionsText& options)
    : grid_(grid),
      scheme_(scheme),
      faces_(owned_boundary_faces(grid, boundaries.faces())),
      cell_faces_(boundary_faces_by_cell(grid, faces_)),
      solid_(boundaries.solid().ghosted_mask(grid)),
      has_solid_(boundaries.solid().any()),
      phi_b_(faces_.size(), 0.0),
      grad_(grid),
      terms_e_(grid.n_ghosted()),
      terms_n_(grid.n_ghosted()),
      matrix_(grid.dm()) {
  lsq_ = std::make_unique<LeastSquaresGradient>(
      grid, faces_, [](const BoundaryFace&) { return true; }, solid_);
  check_petsc(DMCreateGlobalVector(grid.dm(), rhs_.out()));
  check_petsc(DMCreateGlobalVector(grid.dm(), solution_.out()));
  options_ = std::make_unique<SolverOptions>(options, default_options(prefix));
  check_petsc(KSPCreate(grid.comm(), ksp_.out()));
  check_petsc(KSPSetOptionsPrefix(ksp_.get(), prefix.c_str()));
  check_petsc(KSPSetInitialGuessNonzero(ksp_.get(), PETSC_TRUE));
  check_petsc(KSPConvergedDefaultSetUIRNorm(ksp_.get()));
  options_->use("turbulence-model solver", [this] { return KSPSetFromOptions(ksp_.get()); });
}

void ScalarTransport::boundary_values(const MeanFlowView& flow, const Field& phi,
                                      const ScalarBoundaryValues& values) {
  for (size_t k = 0; k < flow.boundary_faces.size(); ++k) {
    const BoundaryFace& f = flow.boundary_faces[k];
    const BoundaryCondition& bc = flow.conditions.of(f);
    double value = bc.scalar_value(f, phi(f.i, f.j), flow.boundary_flux[k], values);
    if (boundary_function_ && bc.is_prescribed()) value = boundary_function_(f.centre);
    phi_b_[k] = value;
  }
}

void ScalarTransport::gradient_of(const Field& phi, double wall_value, const MeanFlowView& flow,
                                  VectorField& out) {
  boundary_function_ = nullptr;
  boundary_values(flow, phi, {wall_value, 0.0, false});
  lsq_->compute(phi, phi_b_, out);
  out.exchange();
}

void ScalarTransport::compute_face_terms(const MeanFlowView& flow, const ScalarEquation& eq) {
  const Field& phi = *eq.phi;
  const Field& gamma = *eq.gamma;
  auto face_terms = [&](size_t l, size_t r, const FaceGeometry& face, double flux) {
    const Vec2 xl = grid_.centre(l), xr = grid_.centre(r);
    const double gamma_f = face.wl * gamma[l] + (1.0 - face.wl) * gamma[r];
    const Vec2 gl = grad_[l], gr = grad_[r];
    const double phi_f =
        face_value(scheme_, flux, phi[l], phi[r], gl, gr, xl, xr, face.centre, face.wl, face.skew);
    const double phi_upwind = flux >= 0.0 ? phi[l] : phi[r];
    return FaceTerms{gamma_f * face.k, gamma_f * dot(face.cross, face.wl * gl + (1.0 - face.wl) * gr) -
                                           flux * (phi_f - phi_upwind)};
  };
  // A face of a solid cell has no terms (and no flux), so the rows leave it out.
  for_each_interior_face(
      grid_,
      [&](int i, int j) {
        const size_t l = grid_.local(i, j), r = grid_.local(i + 1, j);
        terms_e_[l] =
            is_closed(l, r) ? FaceTerms{} : face_terms(l, r, grid_.east_face(i, j), flow.flux_east[l]);
      },
      [&](int i, int j) {
        const size_t l = grid_.local(i, j), r = grid_.local(i, j + 1);
        terms_n_[l] =
            is_closed(l, r) ? FaceTerms{} : face_terms(l, r, grid_.north_face(i, j), flow.flux_north[l]);
      });
}

double ScalarTransport::solve(const MeanFlowView& flow, ScalarEquation& eq) {
  Field& phi = *eq.phi;
  const Field& gamma = *eq.gamma;
  boundary_function_ = eq.boundary_value;
  boundary_values(flow, phi, {eq.wall_value, eq.freestream_value});
  lsq_->compute(phi, phi_b_, grad_);
  grad_.exchange();

  // flow.boundary_faces is owned_boundary_faces(grid) too, so faces_'s slots index it.

  StencilMatrix::Fill fill = matrix_.begin_fill();
  PetscScalar** b = nullptr;
  check_petsc(DMDAVecGetArray(grid_.dm(), rhs_.get(), &b));
  double residual = 0.0;
  compute_face_terms(flow, eq);
  for (int j = grid_.y_begin(); j < grid_.y_end(); ++j) {
    for (int i = grid_.x_begin(); i < grid_.x_end(); ++i) {
      const size_t c = grid_.local(i, j);
      const double volume = grid_.volume(c);
      MatrixRow row;
      if (has_solid_ && solid_[c]) {
        row.centre = 1.0;  // identity row, zero right-hand side: phi = 0 in solid cells
        b[j][i] = 0.0;
        write_row(grid_, fill, i, j, row);
        continue;
      }
      double diag = -(*eq.source_p)[c] * volume;
      double diffusive = 0.0;  // the diffusion share of diag
      double rhs = (*eq.source_u)[c] * volume;
      double off = 0.0;
      // Upwind convection and the implicit diffusion: a_P gains the outflow, a_nb the inflow. This
      // cell is the left cell of the face stored at c, or the right cell of the one stored at n.
      auto as_left = [&](size_t n, const std::vector<FaceTerms>& terms, const Field& flux, double& entry) {
        const FaceTerms& t = terms[c];
        diag += t.diffusion + std::max(flux[c], 0.0);
        diffusive += t.diffusion;
        const double coef = t.diffusion + std::max(-flux[c], 0.0);
        entry = -coef;
        off += coef * phi[n];
        rhs += t.explicit_left;
      };
      auto as_right = [&](size_t n, const std::vector<FaceTerms>& terms, const Field& flux, double& entry) {
        const FaceTerms& t = terms[n];
        diag += t.diffusion + std::max(-flux[n], 0.0);
        diffusive += t.diffusion;
        const double coef = t.diffusion + std::max(flux[n], 0.0);
        entry = -coef;
        off += coef * phi[n];
        rhs -= t.explicit_left;
      };
      if (grid_.has_east(i)) as_left(grid_.local(i + 1, j), terms_e_, flow.flux_east, row.east);
      if (grid_.has_west(i)) as_right(grid_.local(i - 1, j), terms_e_, flow.flux_east, row.west);
      if (grid_.has_north(j)) as_left(grid_.local(i, j + 1), terms_n_, flow.flux_north, row.north);
      if (grid_.has_south(j)) as_right(grid_.local(i, j - 1), terms_n_, flow.flux_north, row.south);
      for (int slot : cell_faces_[grid_.owned(i, j)]) {
        if (slot < 0) continue;
        const BoundaryFace& f = flow.boundary_faces[slot];
        const double flux = flow.boundary_flux[slot];
        const BoundaryCondition& bc = flow.conditions.of(f);
        const bool is_prescribed = bc.scalar_is_prescribed(flux);
        const double value = phi_b_[slot];
        // Entering flow carries the boundary value. Leaving flow is upwind (this cell) in the
        // matrix; through a prescribed-value face the scheme's face value, reconstructed from the
        // cell towards the prescribed value, is added as a deferred correction (second order). An
        // implicit prescribed outflow value would take the outflow off the diagonal, and at high
        // cell Peclet numbers the outer iterations then diverge.
        if (flux >= 0.0) {
          diag += flux;
          if (is_prescribed) {
            const Vec2 xp = grid_.centre(i, j);
            const double phi_f = face_value(scheme_, flux, phi(i, j), value, grad_(i, j), grad_(i, j), xp,
                                            f.centre, f.centre, 0.0, Vec2{});
            rhs -= flux * (phi_f - phi(i, j));
          }
        } else {
          rhs -= flux * value;
        }
        if (is_prescribed) {
          const double area = norm(f.area);
          const double s1 = dot(f.centre - grid_.centre(i, j), (1.0 / area) * f.area);
          const double c = (bc.is_wall() && eq.wall_gamma >= 0.0 ? eq.wall_gamma : gamma(i, j)) * area / s1;
          diag += c;
          diffusive += c;
          rhs += c * value;
          // Non-orthogonal correction (deferred): the cell value moved onto the face normal by its
          // gradient, as for the momentum equations; without it the boundary flux misses the
          // tangential offset times the tangential derivative, an O(1) error on skewed grids.
          const Vec2 n = (1.0 / area) * f.area;
          const Vec2 r = grid_.centre(i, j) - f.centre;
          const Vec2 tangential = r - dot(r, n) * n;
          rhs += c * dot(grad_(i, j), tangential);
        }
      }
      residual += std::abs(rhs + off - diag * phi(i, j));
      // Relaxed as the momentum equations (discretization/relaxation.hpp).
      const double relaxation = relaxation_term(diag, diffusive, eq.relax, eq.relax_diffusive_part);
      row.centre = diag + relaxation;
      b[j][i] = rhs + relaxation * phi(i, j);
      write_row(grid_, fill, i, j, row);
    }
  }
  check_petsc(DMDAVecRestoreArray(grid_.dm(), rhs_.get(), &b));
  fill.end();

  PetscScalar** x = nullptr;
  check_petsc(DMDAVecGetArray(grid_.dm(), solution_.get(), &x));
  for (int j = grid_.y_begin(); j < grid_.y_end(); ++j)
    for (int i = grid_.x_begin(); i < grid_.x_end(); ++i) x[j][i] = phi(i, j);
  check_petsc(DMDAVecRestoreArray(grid_.dm(), solution_.get(), &x));
  check_petsc(KSPSetOperators(ksp_.get(), matrix_.mat(), matrix_.mat()));
  options_->use("turbulence-model solver",
                [this] { return KSPSolve(ksp_.get(), rhs_.get(), solution_.get()); });
  KSPConvergedReason reason;
  check_petsc(KSPGetConvergedReason(ksp_.get(), &reason));
  linear_solve_converged_ = reason >= 0 || reason == KSP_DIVERGED_ITS;
  PetscInt its = 0;
  check_petsc(KSPGetIterationNumber(ksp_.get(), &its));
  linear_iterations_ = static_cast<int>(its);
  check_petsc(DMDAVecGetArray(grid_.dm(), solution_.get(), &x));
  for (int j = grid_.y_begin(); j < grid_.y_end(); ++j)
    for (int i = grid_.x_begin(); i < grid_.x_end(); ++i) phi(i, j) = x[j][i];
  check_petsc(DMDAVecRestoreArray(grid_.dm(), solution_.get(), &x));
  phi.exchange();
  return grid_.global_sum(residual);
}

}  // namespace wallrans
