#!/usr/bin/python3
"""Independent 1-D reference solver for fully developed turbulent plane channel flow.

Solves exactly the model equations of models/README.md (the contract with the 2-D solver) in a
half channel 0 <= y <= h = 1: wall at y = 0, symmetry at y = h, u_tau = 1, nu = 1/Re_tau,
-dp/dx = u_tau^2/h = 1. Fully developed flow has no convection, so each model reduces to a
two-point boundary-value problem in y. Mean momentum is used in its exact integral form
(nu + nu_t) dU/dy = 1 - y/h, so at every point Omega = S = dU/dy = (1 - y)/(nu + nu_t) and
u_tau = sqrt(nu dU/dy|_0) = 1 exactly (nu_t = 0 at the wall).

Discretisation (see tools/README-channel1d.md): vertex-centred finite volumes on a tanh-stretched
grid, second order; symmetry by a mirrored ghost node. The nonlinear system is solved by
pseudo-transient continuation / Newton with a tridiagonal Jacobian from coloured finite
differences. Usage: tools/channel1d.py --help
"""
import argparse
import sys

import numpy as np

KAPPA = 0.41  # von Karman constant used by every model (models/README.md)
CMU = 0.09
REF_POINTS = 2000  # the grid mapping puts node 1 at y+ = 0.02 for this many points


class Grid:
    """Nodes y_0 = 0 (wall) ... y_N = 1 (symmetry) on the mapping y = 1 - tanh(g(1-xi))/tanh(g).

    The stretching g depends on Re_tau only (node 1 at y+ = 0.02 for REF_POINTS points), so runs
    with different --points are refinements of one mapping.
    """

    def __init__(self, re_tau, points):
        self.re_tau, self.nu = re_tau, 1.0 / re_tau
        target = 0.02 / re_tau
        first = lambda g: 1.0 - np.tanh(g * (1.0 - 1.0 / (REF_POINTS - 1))) / np.tanh(g)
        lo, hi = 1e-4, 30.0
        if first(lo) > target:  # bisection: first() decreases with the stretching g
            for _ in range(200):
                mid = 0.5 * (lo + hi)
                lo, hi = (mid, hi) if first(mid) > target else (lo, mid)
        xi = np.linspace(0.0, 1.0, points)
        self.y = 1.0 - np.tanh(lo * (1.0 - xi)) / np.tanh(lo)
        self.y[0], self.y[-1] = 0.0, 1.0
        ye = ext(self.y, ghost=2.0 - self.y[-2])  # mirrored ghost node beyond the symmetry plane
        self.h = np.diff(ye)                        # face spacings, faces 1/2 ... N+1/2
        self.vol = 0.5 * (self.h[:-1] + self.h[1:])  # control volumes of nodes 1..N

    def face_grad(self, a):
        """d a/dy at faces 1/2 .. N+1/2 of a node array a (0..N), symmetry-extended."""
        return np.diff(ext(a)) / self.h

    def div(self, gamma, a):
        """(1/V) [Gamma da/dy]_{i-1/2}^{i+1/2} at nodes 1..N; face Gamma = mean of its nodes."""
        ge = ext(gamma)
        flux = 0.5 * (ge[:-1] + ge[1:]) * self.face_grad(a)
        return (flux[1:] - flux[:-1]) / self.vol

    def to_node(self, f):
        """Second-order interpolation of face values f to nodes 1..N."""
        hl, hr = self.h[:-1], self.h[1:]
        return (hr * f[:-1] + hl * f[1:]) / (hl + hr)


def ext(a, ghost=None):
    """Append the ghost value a_{N+1} = a_{N-1} (zero gradient, symmetric about y = h)."""
    return np.append(a, a[-2] if ghost is None else ghost)


def omega(g, nut):
    """Omega = S = |dU/dy| = (1 - y)/(nu + nu_t): the exact integral of the momentum equation."""
    return (1.0 - g.y) / (g.nu + nut)


# ----------------------------------------------------------------------------------------------
# Models. Each transport model has nut(g, phi) -> nu_t at nodes 0..N, rhs(g, phi) -> (F, P) with
# F = dphi/dt at nodes 1..N (zero at steady state) and P >= 0 the production used to normalise
# the residual, initial(g), and clip (phi >= 0 after each update).
# ----------------------------------------------------------------------------------------------
class SpalartAllmaras:
    """models/README.md section 1: Spalart & Allmaras (1994) with the S-tilde limiter and the
    negative branch of Allmaras, Johnson & Spalart (2012)."""
    cb1, cb2, sigma, cv1, cw2, cw3, ct4 = 0.1355, 0.622, 2 / 3, 7.1, 0.3, 2.0, 0.5
    cv2, cv3, cn1 = 0.7, 0.9, 16.0
    cw1 = cb1 / KAPPA**2 + (1.0 + cb2) / sigma

    def __init__(self, variant):
        self.ct3 = 1.2 if variant == "standard" else 0.0  # noft2 and negative: c_t3 = 0
        self.clip = variant != "negative"

    def nut(self, g, phi):
        chi3 = (np.maximum(phi, 0.0) / g.nu) ** 3
        return np.maximum(phi, 0.0) * chi3 / (chi3 + self.cv1**3)  # nu_t = 0 where nu~ < 0

    def rhs(self, g, phi):
        nut = self.nut(g, phi)
        om, y, p = omega(g, nut)[1:], g.y[1:], phi[1:]
        chi = p / g.nu
        fv1 = chi**3 / (chi**3 + self.cv1**3)
        fv2 = 1.0 - chi / (1.0 + chi * fv1)
        sbar = p * fv2 / (KAPPA**2 * y**2)
        with np.errstate(divide="ignore", invalid="ignore"):
            lim = om + om * (self.cv2**2 * om + self.cv3 * sbar) / (
                (self.cv3 - 2 * self.cv2) * om - sbar)
            st = np.where(sbar >= -self.cv2 * om, om + sbar, lim)
            r = np.where(st > 0.0, np.minimum(p / (st * KAPPA**2 * y**2), 10.0), 10.0)
        gg = r + self.cw2 * (r**6 - r)
        fw = gg * ((1.0 + self.cw3**6) / (gg**6 + self.cw3**6)) ** (1.0 / 6.0)
        ft2 = self.ct3 * np.exp(-self.ct4 * chi**2)
        prod_pos = self.cb1 * (1.0 - ft2) * st * p
        src_pos = prod_pos - (self.cw1 * fw - self.cb1 / KAPPA**2 * ft2) * (p / y) ** 2
        src_neg = self.cb1 * om * p + self.cw1 * (p / y) ** 2
        src = np.where(p >= 0.0, src_pos, src_neg)
        chia = phi / g.nu
        fn = np.where(phi < 0.0, (self.cn1 + chia**3) / (self.cn1 - chia**3), 1.0)
        grad2 = g.to_node(g.face_grad(phi) ** 2)
        diff = (g.div(g.nu + phi * fn, phi) + self.cb2 * grad2) / self.sigma
        return src + diff, np.abs(np.where(p >= 0.0, prod_pos, self.cb1 * om * p))

    def initial(self, g):
        return KAPPA * g.y * (1.0 - 0.5 * g.y)


class BaldwinBarth:
    """models/README.md section 2: Baldwin & Barth (1990), conservative form."""
    ce1, ce2, a0, a2 = 1.2, 2.0, 26.0, 10.0
    inv_sigma = (ce2 - ce1) * np.sqrt(CMU) / KAPPA**2
    clip = True

    def damping(self, g):
        yp = g.y * g.re_tau  # y+ = d u_tau/nu with u_tau = 1 (see module docstring)
        return yp, -np.expm1(-yp / self.a0), -np.expm1(-yp / self.a2)

    def nut(self, g, r):
        _, d1, d2 = self.damping(g)
        return CMU * np.maximum(r, 0.0) * d1 * d2

    def rhs(self, g, r):
        yp, d1, d2 = (a[1:] for a in self.damping(g))
        nut = self.nut(g, r)
        s, dd = omega(g, nut)[1:], d1 * d2
        sq = np.sqrt(dd)
        bracket = sq + yp / sq * (d2 * np.exp(-yp / self.a0) / self.a0
                                  + d1 * np.exp(-yp / self.a2) / self.a2)
        f2 = self.ce1 / self.ce2 + (1.0 - self.ce1 / self.ce2) * (1.0 / (KAPPA * yp) + dd) * bracket
        sqrt_rp = r[1:] * s * np.sqrt(CMU * dd)  # sqrt(R P) with P = nu_t S^2
        src = (self.ce2 * f2 - self.ce1) * sqrt_rp
        cross = g.to_node(g.face_grad(nut) * g.face_grad(r))
        diff = g.div(g.nu + nut * self.inv_sigma, r) - 2.0 * self.inv_sigma * cross
        return src + diff, np.abs(src)

    def initial(self, g):
        return KAPPA * g.y * (1.0 - 0.5 * g.y) / CMU


class KEquation:
    """models/README.md section 3: Wolfshtein (1969) k equation, Chen & Patel (1988) constants;
    closure 'length_scale' or 'structure' (Bradshaw, Ferriss & Atwell 1967, a1 = 0.3)."""
    a_mu, a1, sigma_k = 70.0, 0.3, 1.0
    cl = KAPPA * CMU**-0.75
    a_eps = 2.0 * cl
    clip = True

    def __init__(self, variant):
        self.structure = variant == "structure"

    def nut(self, g, k):
        sk = np.sqrt(np.maximum(k, 0.0))
        nut_ls = CMU * sk * self.cl * g.y * -np.expm1(-sk * g.y / g.nu / self.a_mu)
        if not self.structure:
            return nut_ls
        # nu_t = min(a1 k/S, nu_t_ls) with S = (1-y)/(nu+nu_t): the fixed point of this
        # monotone map is min(a1 k nu/(1 - y - a1 k), nu_t_ls) if 1 - y > a1 k, else nu_t_ls.
        a1k = self.a1 * np.maximum(k, 0.0)
        den = 1.0 - g.y - a1k
        nut_s = np.where(den > 0.0, a1k * g.nu / np.maximum(den, 1e-300), np.inf)
        return np.minimum(nut_s, nut_ls)

    def rhs(self, g, k):
        nut = self.nut(g, k)
        s, y, kk = omega(g, nut)[1:], g.y[1:], np.maximum(k[1:], 0.0)
        x = np.sqrt(kk) * y / (g.nu * self.a_eps)  # Re_d / A_eps
        with np.errstate(divide="ignore", invalid="ignore"):
            ratio = np.where(x > 0.0, x / -np.expm1(-x), 1.0)
        sqrtk_over_leps = g.nu * self.a_eps / (self.cl * y**2) * ratio  # sqrt(k)/l_eps, exact
        prod = nut[1:] * s**2
        src = prod - k[1:] * sqrtk_over_leps
        return src + g.div(g.nu + nut / self.sigma_k, k), prod

    def initial(self, g):
        return (1.0 - 0.5 * g.y) / np.sqrt(CMU) * (-np.expm1(-g.y * g.re_tau / 10.0)) ** 2


def mixing_length_nut(g):
    """models/README.md section 4: nu_t = l^2 Omega, l = min(kappa d (1 - exp(-y+/26)), 0.09 delta),
    delta = h = 1; with Omega = (1-y)/(nu+nu_t) this is the positive root of a quadratic."""
    ell = np.minimum(KAPPA * g.y * -np.expm1(-g.y * g.re_tau / 26.0), 0.09)
    return 0.5 * (-g.nu + np.sqrt(g.nu**2 + 4.0 * ell**2 * (1.0 - g.y)))


# ----------------------------------------------------------------------------------------------
def thomas(a, b, c, d):
    """Solve the tridiagonal system a_i x_{i-1} + b_i x_i + c_i x_{i+1} = d_i."""
    n = len(d)
    cp, dp = np.empty(n), np.empty(n)
    cp[0], dp[0] = c[0] / b[0], d[0] / b[0]
    for i in range(1, n):
        m = b[i] - a[i] * cp[i - 1]
        cp[i], dp[i] = c[i] / m, (d[i] - a[i] * dp[i - 1]) / m
    x = np.empty(n)
    x[-1] = dp[-1]
    for i in range(n - 2, -1, -1):
        x[i] = dp[i] - cp[i] * x[i + 1]
    return x


def jacobian(model, g, phi):
    """Tridiagonal dF/dphi (unknowns = nodes 1..N) by central differences in 3 colours."""
    n = len(phi) - 1
    a, b, c = np.zeros(n), np.zeros(n), np.zeros(n)
    eps = 1e-5 * np.maximum(np.abs(phi[1:]), 1e-6 * np.max(np.abs(phi)) + 1e-300)
    for colour in range(3):
        cols = np.arange(colour, n, 3)
        plus, minus = phi.copy(), phi.copy()
        plus[cols + 1] += eps[cols]
        minus[cols + 1] -= eps[cols]
        df = (model.rhs(g, plus)[0] - model.rhs(g, minus)[0]) / 2.0
        b[cols] = df[cols] / eps[cols]
        lo, hi = cols[cols + 1 < n], cols[cols >= 1]
        a[lo + 1] = df[lo + 1] / eps[lo]  # row j+1, column j
        c[hi - 1] = df[hi - 1] / eps[hi]  # row j-1, column j
    return a, b, c


def solve_model(model, g, tol=1e-12, max_iter=500):
    """Pseudo-transient continuation with switched evolution relaxation: (I/dtau - J) dphi = F,
    dtau grows as the residual falls; pure Newton (1/dtau = 0) once the residual int|F|dy / int P dy
    is below 1e-6. Converged when a Newton step changes phi by less than tol max|phi| and the
    residual is below 1e-9 (N/2000)^2: its round-off floor, ~2e-11 at N = 2000 points, grows
    like N^2."""
    phi = model.initial(g)
    dtau0 = dtau = 0.05
    f, prod = model.rhs(g, phi)
    res0 = res = np.sum(np.abs(f) * g.vol) / max(np.sum(prod * g.vol), 1e-300)
    for it in range(1, max_iter + 1):
        a, b, c = jacobian(model, g, phi)
        newton = res <= 1e-6
        step = thomas(-a, (0.0 if newton else 1.0 / dtau) - b, -c, f)
        trial = phi.copy()
        trial[1:] += step
        if model.clip:
            trial = np.maximum(trial, 0.0)
        ft, pt = model.rhs(g, trial)
        rt = np.sum(np.abs(ft) * g.vol) / max(np.sum(pt * g.vol), 1e-300)
        if not np.isfinite(rt) or (rt > 10.0 * res and dtau > dtau0):
            dtau = max(0.1 * dtau, dtau0)  # reject the step, go back towards pseudo-time
            continue
        newton_step = np.max(np.abs(step)) / np.max(np.abs(trial))
        phi, f, res = trial, ft, rt
        floor = max(1.0, (len(phi) / REF_POINTS) ** 2)
        if newton and newton_step < tol and res < 1e-9 * floor:
            return phi, it, newton_step, res
        dtau = min(dtau0 * (res0 / max(res, 1e-300)) ** 1.5, 1e30)
    raise RuntimeError(f"no convergence after {max_iter} iterations (residual {res:.2e})")


def solve(model_name, variant, re_tau, points):
    """Return (grid, U, nu_t, (iterations, last Newton step, residual), model variable)."""
    g = Grid(re_tau, points)
    it, res, ires, phi = 0, 0.0, 0.0, None
    if model_name == "laminar":
        nut = np.zeros_like(g.y)
    elif model_name == "mixing_length":
        nut = mixing_length_nut(g)
    else:
        model = {"spalart_allmaras": lambda: SpalartAllmaras(variant),
                 "baldwin_barth": BaldwinBarth,
                 "k_equation": lambda: KEquation(variant)}[model_name]()
        phi, it, res, ires = solve_model(model, g)
        nut = model.nut(g, phi)
    dudy = omega(g, nut)
    u = np.concatenate(([0.0], np.cumsum(0.5 * (dudy[1:] + dudy[:-1]) * np.diff(g.y))))
    return g, u, nut, (it, res, ires), phi


def bulk(g, u):
    """U_b = (1/h) int_0^h U dy, trapezoidal rule."""
    return float(np.sum(0.5 * (u[1:] + u[:-1]) * np.diff(g.y)))


VARIANTS = {"spalart_allmaras": ("negative", ["standard", "noft2", "negative"]),
            "k_equation": ("length_scale", ["length_scale", "structure"]),
            "baldwin_barth": ("standard", ["standard"]),
            "mixing_length": ("standard", ["standard"]),
            "laminar": ("standard", ["standard"])}


def self_test():
    """Laminar Poiseuille against the exact profile; SA grid convergence 2000 vs 4000 points."""
    ok = True
    for re_tau in (10.0, 395.0):
        g, u, *_ = solve("laminar", "standard", re_tau, 2000)
        exact = (g.y - 0.5 * g.y**2) * re_tau
        err = np.max(np.abs(u - exact)) / np.max(exact)
        berr = abs(bulk(g, u) - re_tau / 3.0) / (re_tau / 3.0)
        good = err < 1e-8 and berr < 1e-6
        ok &= good
        print(f"laminar Re_tau={re_tau:g}: max rel error U {err:.1e}, bulk {berr:.1e} "
              f"{'ok' if good else 'FAIL'}")
    for variant in ("standard", "negative"):
        ub = [bulk(*solve("spalart_allmaras", variant, 395.0, n)[:2]) for n in (2000, 4000)]
        diff = abs(ub[0] - ub[1]) / ub[1]
        good = diff < 5e-4
        ok &= good
        print(f"SA {variant} Re_tau=395 bulk U+: 2000 pts {ub[0]:.6f}, 4000 pts {ub[1]:.6f}, "
              f"rel diff {diff:.1e} {'ok' if good else 'FAIL'}")
    print("self-test passed" if ok else "self-test FAILED")
    return 0 if ok else 1


class OneLineParser(argparse.ArgumentParser):
    def error(self, message):
        sys.exit(f"channel1d: error: {message}")


def main(argv):
    ap = OneLineParser(description="1-D fully developed turbulent channel (models/README.md).")
    ap.add_argument("--model", choices=list(VARIANTS))
    ap.add_argument("--variant",
                    choices=["standard", "noft2", "negative", "length_scale", "structure"])
    ap.add_argument("--re-tau", type=float, default=395.0)
    ap.add_argument("--points", type=int, default=2000, help="grid nodes from wall to centre")
    ap.add_argument("--out", help="CSV file with columns y_plus,u_plus,nut_over_nu")
    ap.add_argument("--verbose", action="store_true", help="diagnostics on stderr")
    ap.add_argument("--self-test", action="store_true")
    args = ap.parse_args(argv)
    if args.self_test:
        return self_test()
    if args.model is None:
        ap.error("--model is required")
    default, allowed = VARIANTS[args.model]
    variant = args.variant or default
    if variant not in allowed:
        ap.error(f"--variant {variant} is not valid for --model {args.model} "
                 f"(expected {'|'.join(allowed)})")
    if not (np.isfinite(args.re_tau) and args.re_tau > 0.0):
        ap.error(f"--re-tau must be a positive number, got {args.re_tau}")
    if args.points < 50:
        ap.error(f"--points must be >= 50, got {args.points}")
    try:
        g, u, nut, (it, res, ires), phi = solve(args.model, variant, args.re_tau, args.points)
    except (RuntimeError, FloatingPointError) as exc:
        sys.exit(f"channel1d: error: {exc}")
    if args.out:
        try:
            np.savetxt(args.out, np.column_stack((g.y * g.re_tau, u, nut / g.nu)), delimiter=",",
                       header="y_plus,u_plus,nut_over_nu", comments="", fmt="%.12e")
        except OSError as exc:
            sys.exit(f"channel1d: error: cannot write {args.out}: {exc.strerror}")
    if args.verbose:
        # one-sided second-order dU/dy at the wall, as a check of u_tau = 1
        h1, h2 = g.y[1], g.y[2]
        dudy0 = (u[1] * h2**2 - u[2] * h1**2) / (h1 * h2 * (h2 - h1))
        minphi = float(np.min(phi)) if phi is not None else 0.0
        print(f"iterations={it} newton_step={res:.1e} integral_residual={ires:.1e} "
              f"first_y_plus={g.y[1] * g.re_tau:.4f} "
              f"u_tau_discrete={np.sqrt(g.nu * dudy0):.8f} min_model_variable={minphi:.3e} "
              f"centre_nut_over_nu={nut[-1] / g.nu:.4f}", file=sys.stderr)
    print(f"bulk_u_plus={bulk(g, u):.6f} centre_u_plus={u[-1]:.6f}")
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
