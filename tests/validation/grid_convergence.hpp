// Observed order, Richardson extrapolation and the grid convergence index from three grids of one
// refinement ratio (Roache 1994, J. Fluids Eng. 116:405, and 1998; Celik et al. 2008, J. Fluids
// Eng. 130:078001; formulas in /work/shared/VERIFICATION-VALUES.md section 6).
#pragma once

#include <cmath>

namespace wallrans::test_support {

struct Convergence {
  double ratio_r = 0.0;  ///< R = (f2 - f1) / (f3 - f2); monotone if 0 < R < 1
  double order = 0.0;    ///< p = ln|(f3 - f2)/(f2 - f1)| / ln r
  double extrapolated = 0.0;
  double gci_fine = 0.0, gci_medium = 0.0;  ///< GCI21, GCI32 (fractions)
  double asymptotic = 0.0;                  ///< GCI32 / (r^p GCI21), about 1 in the asymptotic range
  double gci_fine_formal = 0.0;             ///< GCI21 with the formal order p = 2 instead
};

/// f1 the finest grid, f3 the coarsest, r the refinement ratio; F_s = 1.25 (three grids).
inline Convergence grid_convergence(double f1, double f2, double f3, double r) {
  Convergence c;
  c.ratio_r = (f2 - f1) / (f3 - f2);
  c.order = std::log(std::abs((f3 - f2) / (f2 - f1))) / std::log(r);
  const double rp = std::pow(r, c.order);
  c.extrapolated = f1 + (f1 - f2) / (rp - 1.0);
  c.gci_fine = 1.25 * std::abs((f1 - f2) / f1) / (rp - 1.0);
  c.gci_medium = 1.25 * std::abs((f2 - f3) / f2) / (rp - 1.0);
  // With p observed on these same three grids, r^p = |f3 - f2| / |f2 - f1|, so this ratio is
  // f1/f2 identically: it cannot fail here. p against the formal order says more.
  c.asymptotic = c.gci_medium / (rp * c.gci_fine);
  c.gci_fine_formal = 1.25 * std::abs((f1 - f2) / f1) / (r * r - 1.0);
  return c;
}

}  // namespace wallrans::test_support
