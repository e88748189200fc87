"""Observed order of accuracy and the grid convergence index (Roache 1994, J. Fluids Eng.
116:405; the procedure of Celik et al. 2008, J. Fluids Eng. 130:078001, which allows a refinement
ratio that differs between the grid pairs)."""
import math

FS_THREE_GRIDS = 1.25  # safety factor with three or more grids (Roache 1994; Celik et al. 2008)
FS_TWO_GRIDS = 3.0  # safety factor with two grids and an assumed order (Roache 1994)


def observed_order_from_errors(error_coarse, error_fine, ratio):
    """p = ln(e_coarse / e_fine) / ln r, for errors against an exact solution."""
    return math.log(abs(error_coarse) / abs(error_fine)) / math.log(ratio)


class ThreeGridStudy:
    """phi1 (finest), phi2, phi3 on grids with refinement ratios r21 = h2/h1 and r32 = h3/h2.
    Celik et al. (2008), eqs. (3)-(8): the order by fixed-point iteration, the extrapolated value,
    the relative errors and GCI21 with F_s = 1.25."""

    def __init__(self, phi1, phi2, phi3, r21, r32):
        self.phi = (phi1, phi2, phi3)
        self.r21, self.r32 = r21, r32
        e21, e32 = phi2 - phi1, phi3 - phi2
        self.ratio = e21 / e32 if e32 != 0.0 else math.inf  # R: 0 < R < 1 monotone, R < 0 oscillatory
        if e21 == 0.0 or e32 == 0.0:
            self.kind, self.order = "no change between grids", math.nan
        else:
            s = math.copysign(1.0, e32 / e21)
            order = 2.0
            for _ in range(200):
                q = math.log((r21**order - s) / (r32**order - s))
                updated = abs(math.log(abs(e32 / e21)) + q) / math.log(r21)
                if abs(updated - order) < 1e-12:
                    break
                order = updated
            self.order = order
            self.kind = (
                "monotone" if 0.0 < self.ratio < 1.0 else "oscillatory" if self.ratio < 0.0 else "divergent"
            )
        formal = 2.0  # the formal order of the schemes (DEVELOPERS.md): GCI21 with it, as the GCI test prints
        self.gci21_formal = FS_THREE_GRIDS * abs((phi1 - phi2) / phi1) / (r21**formal - 1.0)
        p = self.order
        if math.isfinite(p) and p > 0.0:
            self.extrapolated = (r21**p * phi1 - phi2) / (r21**p - 1.0)
            self.gci21 = FS_THREE_GRIDS * abs((phi1 - phi2) / phi1) / (r21**p - 1.0)
            self.gci32 = FS_THREE_GRIDS * abs((phi2 - phi3) / phi2) / (r32**p - 1.0)
            self.asymptotic = self.gci32 / (r21**p * self.gci21) if self.gci21 > 0 else math.nan
        else:
            self.extrapolated = self.gci21 = self.gci32 = self.asymptotic = math.nan

    def as_dict(self):
        return {
            "phi": list(self.phi),
            "r21": self.r21,
            "r32": self.r32,
            "R": self.ratio,
            "kind": self.kind,
            "order": self.order,
            "extrapolated": self.extrapolated,
            "gci21": self.gci21,
            "gci32": self.gci32,
            "asymptotic_ratio": self.asymptotic,
            "gci21_formal": self.gci21_formal,
        }


def two_grid_gci(phi_fine, phi_coarse, ratio, order):
    """GCI of the fine grid from two grids with an assumed order: F_s = 3 (Roache 1994)."""
    return FS_TWO_GRIDS * abs((phi_fine - phi_coarse) / phi_fine) / (ratio**order - 1.0)
