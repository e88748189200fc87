// Momentum predictor: implicit first-order upwind convection and orthogonal diffusion, with
// deferred corrections (explicit) for the second-order convection scheme, the non-orthogonal
// diffusion part and the second-order wall gradient. Assembled by faces: each interior face is
// evaluated once, then every owned row gathers its faces.
#include <petscdmda.h>

#include <algorithm>
#include <cmath>

#include "core/error.hpp"
#include "coupling/flow_solver.hpp"
#include "discretization/convection.hpp"
#include "discretization/matrix_row.hpp"
#include "discretization/relaxation.hpp"

namespace wallrans {

FlowSolver::FaceTerms FlowSolver::interior_face_terms(size_t l, size_t r, const FaceGeometry& face,
                                                      double flux) const {
  const Vec2 xl = grid_.centre(l), xr = grid_.centre(r);
  const double wl = face.wl, wr = 1.0 - wl;
  const double nu_f = wl * nu_eff_[l] + wr * nu_eff_[r];
  const ConvectionScheme scheme = spec_.iterations.convection;
  const Vec2 gu = wl * grad_u_[l] + wr * grad_u_[r];  // face gradients
  const Vec2 gv = wl * grad_v_[l] + wr * grad_v_[r];
  // Over-relaxed split of the diffusive flux: implicit along L-R, the rest explicit with the
  // interpolated cell gradient (Jasak 1996, sec. 3.3.1.3).
  auto terms = [&](const Field& phi, const VectorField& grad, Vec2 grad_face) {
    const double phi_f =
        face_value(scheme, flux, phi[l], phi[r], grad[l], grad[r], xl, xr, face.centre, wl, face.skew);
    const double phi_upwind = flux >= 0.0 ? phi[l] : phi[r];
    const double convection_correction = flux * (phi_f - phi_upwind);
    const double cross_diffusion = nu_f * dot(face.cross, grad_face);
    return cross_diffusion - convection_correction;
  };
  FaceTerms t{nu_f * face.k, terms(vel_.x, grad_u_, gu), terms(vel_.y, grad_v_, gv)};
  // Eddy-viscosity part of the transposed stress, nu_t (grad u)^T . S (explicit; it vanishes for
  // constant viscosity by continuity).
  const double nu = spec_.flow.kinematic_viscosity;
  const double nut_f = wl * (nu_eff_[l] - nu) + wr * (nu_eff_[r] - nu);
  if (nut_f != 0.0) {
    t.explicit_u += nut_f * (gu.x * face.area.x + gv.x * face.area.y);
    t.explicit_v += nut_f * (gu.y * face.area.x + gv.y * face.area.y);
  }
  return t;
}

double FlowSolver::normal_derivative(const Field& phi, const VectorField& grad, double phi_b,
                                     const BoundaryFace& f) const {
  // Derivative along the outward normal at the boundary face from the quadratic through the
  // boundary value and the two nearest cells, with the cell values moved onto the face normal
  // by their gradients (exact for quadratic profiles; common practice for low-Re wall shear).
  const Vec2 n = (1.0 / norm(f.area)) * f.area;
  auto along_normal = [&](int i, int j, double& s, double& value) {
    const Vec2 r = grid_.centre(i, j) - f.centre;
    s = -dot(r, n);  // inward distance
    const Vec2 tangential = r + s * n;
    value = phi(i, j) - dot(grad(i, j), tangential);
  };
  double s1 = 0, v1 = 0;
  along_normal(f.i, f.j, s1, v1);
  if (f.has_second) {
    double s2 = 0, v2 = 0;
    along_normal(f.i2, f.j2, s2, v2);
    if (s2 > 1.05 * s1) {
      const double inward = ((v1 - phi_b) * s2 * s2 - (v2 - phi_b) * s1 * s1) / (s1 * s2 * (s2 - s1));
      return -inward;
    }
  }
  return (phi_b - v1) / s1;
}

void FlowSolver::compute_face_terms() {
  // A face of a solid cell has no terms (its flux is zero too), so the rows below leave it out.
  for_each_interior_face(
      grid_,
      [&](int i, int j) {
        const size_t l = grid_.local(i, j), r = grid_.local(i + 1, j);
        terms_e_[l] =
            is_closed(l, r) ? FaceTerms{} : interior_face_terms(l, r, grid_.east_face(i, j), flux_e_[l]);
      },
      [&](int i, int j) {
        const size_t l = grid_.local(i, j), r = grid_.local(i, j + 1);
        terms_n_[l] =
            is_closed(l, r) ? FaceTerms{} : interior_face_terms(l, r, grid_.north_face(i, j), flux_n_[l]);
      });
}

void FlowSolver::assemble_momentum(ResidualNorms& residual) {
  StencilMatrix::Fill fill = a_mom_.begin_fill();
  const double alpha = spec_.iterations.relax_velocity;
  const double share = spec_.iterations.relax_diffusive_part;
  const double nu = spec_.flow.kinematic_viscosity;
  Vec2 body = spec_.flow.body_force;
  if (spec_.periodic.axis == PeriodicAxis::x) body.x -= mean_pressure_gradient_;
  const bool is_simplec = spec_.iterations.coupling == Coupling::simplec;
  compute_face_terms();

  double res_u = 0.0, res_v = 0.0;
  for (int j = grid_.y_begin(); j < grid_.y_end(); ++j) {
    for (int i = grid_.x_begin(); i < grid_.x_end(); ++i) {
      const size_t o = grid_.owned(i, j), c = grid_.local(i, j);
      const double volume = grid_.volume(c);
      const Vec2 xp = grid_.centre(c);
      MatrixRow row;
      if (is_solid(c)) {
        // Identity row, zero right-hand side: the velocity stays zero, and no face couples to it.
        row.centre = 1.0;
        rhs_u_[o] = rhs_v_[o] = 0.0;
        d_rc_[c] = d_corr_[c] = memory_[c] = 0.0;
        write_row(grid_, fill, i, j, row);
        continue;
      }
      double diag = 0.0, sum_nb = 0.0, diffusive = 0.0;  // diffusive: the diffusion share of diag
      const Vec2 gp = grad_p_[c];
      double bu = volume * (body.x - gp.x), bv = volume * (body.y - gp.y);
      if (source_) {
        const Vec2 s = source_(xp);
        bu += volume * s.x;
        bv += volume * s.y;
      }
      double off_u = 0.0, off_v = 0.0;  // sum a_nb phi_nb for the residual
      // The neighbour's coefficient a_nb enters the row as -a_nb.
      auto neighbour = [&](size_t n, double coef, double& entry) {
        entry = -coef;
        sum_nb += coef;
        off_u += coef * vel_.x[n];
        off_v += coef * vel_.y[n];
      };
      // This cell is the left (lower-index) cell of a face, stored at index c like its flux, or the
      // right cell of the face stored at its neighbour n.
      auto as_left = [&](size_t n, const std::vector<FaceTerms>& terms, const Field& flux, double& entry) {
        const FaceTerms& t = terms[c];
        diag += t.diffusion + std::max(flux[c], 0.0);
        diffusive += t.diffusion;
        neighbour(n, t.diffusion + std::max(-flux[c], 0.0), entry);
        bu += t.explicit_u;
        bv += t.explicit_v;
      };
      auto as_right = [&](size_t n, const std::vector<FaceTerms>& terms, const Field& flux, double& entry) {
        const FaceTerms& t = terms[n];
        diag += t.diffusion + std::max(-flux[n], 0.0);
        diffusive += t.diffusion;
        neighbour(n, t.diffusion + std::max(flux[n], 0.0), entry);
        bu -= t.explicit_u;
        bv -= t.explicit_v;
      };
      if (grid_.has_east(i)) as_left(grid_.local(i + 1, j), terms_e_, flux_e_, row.east);
      if (grid_.has_west(i)) as_right(grid_.local(i - 1, j), terms_e_, flux_e_, row.west);
      if (grid_.has_north(j)) as_left(grid_.local(i, j + 1), terms_n_, flux_n_, row.north);
      if (grid_.has_south(j)) as_right(grid_.local(i, j - 1), terms_n_, flux_n_, row.south);

      // Boundary faces: each face's condition adds its convection and diffusion terms.
      for (int slot : cell_faces_[o]) {
        if (slot < 0) continue;
        const BoundaryFace& f = bfaces_[slot];
        const double area = norm(f.area);
        const double ub = u_b_[slot], vb = v_b_[slot];
        const MomentumFaceInput in{
            bflux_[slot],
            {ub, vb},
            vel_[c],
            {normal_derivative(vel_.x, grad_u_, ub, f), normal_derivative(vel_.y, grad_v_, vb, f)},
            area,
            dot(f.centre - xp, (1.0 / area) * f.area),
            nu,
            nu_eff_[c]};
        MomentumRow terms{diag, bu, bv, diffusive};
        condition(f).add_momentum(in, terms);
        diag = terms.diag;
        bu = terms.rhs_u;
        bv = terms.rhs_v;
        diffusive = terms.diffusive;
      }
      res_u += std::abs(bu + off_u - diag * vel_.x[c]);
      res_v += std::abs(bv + off_v - diag * vel_.y[c]);
      const double relaxation = relaxation_term(diag, diffusive, alpha, share);
      const double diag_relaxed = diag + relaxation;
      rhs_u_[o] = bu + relaxation * vel_.x[c];
      rhs_v_[o] = bv + relaxation * vel_.y[c];
      row.centre = diag_relaxed;
      d_rc_[c] = volume / diag;
      memory_[c] = relaxation / diag_relaxed;
      // SIMPLEC: d = V / (a_P - sum a_nb) (van Doormaal & Raithby 1984), bounded by V / r where
      // a transient mass imbalance makes sum a_nb exceed the unrelaxed a_P.
      d_corr_[c] = is_simplec ? volume / std::max(diag_relaxed - sum_nb, relaxation) : volume / diag_relaxed;
      write_row(grid_, fill, i, j, row);
    }
  }
  fill.end();
  residual.u = grid_.global_sum(res_u);
  residual.v = grid_.global_sum(res_v);
}

}  // namespace wallrans
