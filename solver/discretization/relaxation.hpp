// The under-relaxation term shared by the momentum and model equations.
#pragma once

namespace wallrans {

/// Local. Under-relaxation (Patankar 1980, eq. 4.38) as a local pseudo-time term r (phi -
/// phi_old) with r = (1 - alpha)/alpha (a_P - (1 - s) D_P), D_P the diffusive part of a_P and s
/// the relaxed share of it. With s = 1 this is a_P/alpha; with s < 1 convection keeps the
/// pseudo-time step of alpha while most diffusion stays implicit, so the slow wall-normal
/// diffusion modes are not damped by the relaxation (their outer-iteration count would otherwise
/// grow with the square of the wall-normal cell count; DEVELOPERS.md, Outer iteration).
inline double relaxation_term(double diag, double diffusive, double alpha, double share) {
  return (1.0 - alpha) / alpha * (diag - (1.0 - share) * diffusive);
}

}  // namespace wallrans
