// Momentum predictor: implicit first-order upwind convection and orthogonal diffusion, with
// deferred corrections (explicit) for the second-order convection scheme, the non-orthogonal
// diffusion part and the second-order wall gradient.
#include <petscdmda.h>

#include <algorithm>
#include <cmath>

#include "core/error.hpp"
#include "coupling/flow_solver.hpp"
#include "discretization/convection.hpp"

namespace wallrans {

struct FlowSolver::FaceTerms {
  double diffusion;   ///< implicit diffusion coefficient nu_f |S|^2 / (S . d)
  double explicit_u;  ///< explicit part of the flux balance of the left cell, u equation
  double explicit_v;
};

FlowSolver::FaceTerms FlowSolver::interior_face_terms(int il, int jl, int ir, int jr,
                                                      const FaceGeometry& face, double flux) const {
  const Vec2 xl = grid_.centre(il, jl), xr = grid_.centre(ir, jr);
  const InteriorFaceGeometry g = interior_face_geometry(xl, xr, face.area, face.centre);
  const double wl = g.wl;
  const double nu_f = wl * nu_eff_(il, jl) + (1.0 - wl) * nu_eff_(ir, jr);
  const ConvectionScheme scheme = spec_.iterations.convection;
  // Over-relaxed split of the diffusive flux: implicit along L-R, the rest explicit with the
  // interpolated cell gradient (Jasak 1996, sec. 3.3.1.3).
  auto terms = [&](const Field& phi, const VectorField& grad) {
    const Vec2 gl = grad(il, jl), gr = grad(ir, jr);
    const double phi_f =
        face_value(scheme, flux, phi(il, jl), phi(ir, jr), gl, gr, xl, xr, face.centre, wl, g.skew);
    const double phi_upwind = flux >= 0.0 ? phi(il, jl) : phi(ir, jr);
    const double convection_correction = flux * (phi_f - phi_upwind);
    const double cross_diffusion = nu_f * dot(g.cross, wl * gl + (1.0 - wl) * gr);
    return cross_diffusion - convection_correction;
  };
  FaceTerms t{nu_f * g.k, terms(vel_.x, grad_u_), terms(vel_.y, grad_v_)};
  // Eddy-viscosity part of the transposed stress, nu_t (grad u)^T . S (explicit; it vanishes for
  // constant viscosity by continuity).
  const double nu = spec_.flow.kinematic_viscosity;
  const double nut_f = wl * (nu_eff_(il, jl) - nu) + (1.0 - wl) * (nu_eff_(ir, jr) - nu);
  if (nut_f != 0.0) {
    const Vec2 gu = wl * grad_u_(il, jl) + (1.0 - wl) * grad_u_(ir, jr);
    const Vec2 gv = wl * grad_v_(il, jl) + (1.0 - wl) * grad_v_(ir, jr);
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

void FlowSolver::assemble_momentum(ResidualNorms& residual) {
  Mat a = a_mom_.get();
  check_petsc(MatZeroEntries(a));
  const double alpha = spec_.iterations.relax_velocity;
  const double share = spec_.iterations.relax_diffusive_part;
  const double nu = spec_.flow.kinematic_viscosity;
  Vec2 body = spec_.flow.body_force;
  if (spec_.periodic.axis == PeriodicAxis::x) body.x -= spec_.periodic.mean_pressure_gradient;

  double res_u = 0.0, res_v = 0.0;
  for (int j = grid_.y_begin(); j < grid_.y_end(); ++j) {
    for (int i = grid_.x_begin(); i < grid_.x_end(); ++i) {
      const size_t o = grid_.owned(i, j);
      const double volume = grid_.volume(i, j);
      const Vec2 xp = grid_.centre(i, j);
      MatStencil row{0, j, i, 0};
      MatStencil cols[5];
      double vals[5];
      int n = 1;
      cols[0] = row;
      double diag = 0.0, sum_nb = 0.0, diffusive = 0.0;  // diffusive: the diffusion share of diag
      const Vec2 gp = grad_p_(i, j);
      double bu = volume * (body.x - gp.x), bv = volume * (body.y - gp.y);
      if (source_) {
        const Vec2 s = source_(xp);
        bu += volume * s.x;
        bv += volume * s.y;
      }
      double off_u = 0.0, off_v = 0.0;  // sum a_nb phi_nb for the residual
      auto neighbour = [&](int in, int jn, double coef) {
        cols[n] = MatStencil{0, jn, in, 0};
        vals[n++] = -coef;
        sum_nb += coef;
        off_u += coef * vel_.x(in, jn);
        off_v += coef * vel_.y(in, jn);
      };
      auto as_left = [&](int ir, int jr, const FaceGeometry& face, double flux) {
        const FaceTerms t = interior_face_terms(i, j, ir, jr, face, flux);
        diag += t.diffusion + std::max(flux, 0.0);
        diffusive += t.diffusion;
        neighbour(ir, jr, t.diffusion + std::max(-flux, 0.0));
        bu += t.explicit_u;
        bv += t.explicit_v;
      };
      auto as_right = [&](int il, int jl, const FaceGeometry& face, double flux) {
        const FaceTerms t = interior_face_terms(il, jl, i, j, face, flux);
        diag += t.diffusion + std::max(-flux, 0.0);
        diffusive += t.diffusion;
        neighbour(il, jl, t.diffusion + std::max(flux, 0.0));
        bu -= t.explicit_u;
        bv -= t.explicit_v;
      };
      if (grid_.has_east(i)) as_left(i + 1, j, grid_.east_face(i, j), flux_e_(i, j));
      if (grid_.has_west(i)) as_right(i - 1, j, grid_.east_face(i - 1, j), flux_e_(i - 1, j));
      if (grid_.has_north(j)) as_left(i, j + 1, grid_.north_face(i, j), flux_n_(i, j));
      if (grid_.has_south(j)) as_right(i, j - 1, grid_.north_face(i, j - 1), flux_n_(i, j - 1));

      // Boundary faces: each face's condition adds its convection and diffusion terms.
      for (int slot : cell_faces_[o]) {
        if (slot < 0) continue;
        const BoundaryFace& f = bfaces_[slot];
        const double area = norm(f.area);
        const double ub = u_b_[slot], vb = v_b_[slot];
        const MomentumFaceInput in{
            bflux_[slot],
            {ub, vb},
            vel_(i, j),
            {normal_derivative(vel_.x, grad_u_, ub, f), normal_derivative(vel_.y, grad_v_, vb, f)},
            area,
            dot(f.centre - xp, (1.0 / area) * f.area),
            nu,
            nu_eff_(i, j)};
        MomentumRow row{diag, bu, bv, diffusive};
        condition(f).add_momentum(in, row);
        diag = row.diag;
        bu = row.rhs_u;
        bv = row.rhs_v;
        diffusive = row.diffusive;
      }
      res_u += std::abs(bu + off_u - diag * vel_.x(i, j));
      res_v += std::abs(bv + off_v - diag * vel_.y(i, j));
      // Under-relaxation (Patankar 1980, eq. 4.38) as a local pseudo-time term r (phi - phi_old),
      // r = (1 - alpha)/alpha (a_P - (1 - s) D_P), where D_P is the diffusive part of a_P and s
      // = relax_diffusive_part. With s = 1 this is a_P/alpha; with s < 1 convection keeps the
      // pseudo-time step of alpha while most diffusion stays implicit, so the slow wall-normal
      // diffusion modes are not damped by the relaxation (their count of outer iterations would
      // otherwise grow with the square of the wall-normal cell count).
      const double relaxation = (1.0 - alpha) / alpha * (diag - (1.0 - share) * diffusive);
      const double diag_relaxed = diag + relaxation;
      rhs_u_[o] = bu + relaxation * vel_.x(i, j);
      rhs_v_[o] = bv + relaxation * vel_.y(i, j);
      vals[0] = diag_relaxed;
      diag_[o] = diag_relaxed;
      d_rc_(i, j) = volume / diag;
      memory_(i, j) = relaxation / diag_relaxed;
      // SIMPLEC: d = V / (a_P - sum a_nb) (van Doormaal & Raithby 1984), bounded by V / r where
      // a transient mass imbalance makes sum a_nb exceed the unrelaxed a_P.
      d_corr_(i, j) = spec_.iterations.coupling == Coupling::simplec
                          ? volume / std::max(diag_relaxed - sum_nb, relaxation)
                          : volume / diag_relaxed;
      check_petsc(MatSetValuesStencil(a, 1, &row, n, cols, vals, INSERT_VALUES));
    }
  }
  check_petsc(MatAssemblyBegin(a, MAT_FINAL_ASSEMBLY));
  check_petsc(MatAssemblyEnd(a, MAT_FINAL_ASSEMBLY));
  residual.u = grid_.global_sum(res_u);
  residual.v = grid_.global_sum(res_v);
}

}  // namespace wallrans
