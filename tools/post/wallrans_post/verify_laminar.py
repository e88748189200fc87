"""Laminar cases of the verification report: plane Poiseuille flow, the lid-driven cavity at
Re = 100 and the Blasius plate. Each mirrors the checks, references and tolerances of its test in
tests/verification/ and reads the same reference files."""
import numpy as np

from . import plots
from . import references as ref
from .convergence import ThreeGridStudy, observed_order_from_errors
from .verify_results import Check, GridStudy, VerificationCase, converged_check
from .verify_runs import Run, coarsened_plate, family, load_config, modified


class Poiseuille(VerificationCase):
    key, config = "poiseuille", "channel_poiseuille"
    test_file = "tests/verification/test_poiseuille.cpp"
    tests = [("test_poiseuille", "Poiseuille.*")]

    def plan(self):
        base = load_config(self.config)
        return [
            Run("poiseuille_uniform", base),
            Run("poiseuille_stretched_32", modified(base, {"grid.first_cell_height": 3.0e-3})),
        ]

    def plan_after(self, runs):
        # The stretched family refined once: every cell split in two (ratio sqrt(q) per half), as the test does.
        fields = runs["poiseuille_stretched_32"].result().fields()
        ys = fields.y[:, 0]
        q = (ys[2] - ys[1]) / (ys[1] - ys[0])
        base = runs["poiseuille_stretched_32"].case
        fine = modified(
            base,
            {
                "grid.cells": [base["grid"]["cells"][0], 2 * base["grid"]["cells"][1]],
                "grid.first_cell_height": float(ys[1] / (1.0 + np.sqrt(q))),
            },
        )
        self._coarse_nodes, self._q = ys, q
        return [Run("poiseuille_stretched_64", fine)]

    @staticmethod
    def _error(run):
        case, fields = run.case, run.result().fields()
        g, nu, h = (
            -case["periodic"]["mean_pressure_gradient"],
            case["flow"]["kinematic_viscosity"],
            case["grid"]["height"],
        )
        u_max = g * h * h / (8.0 * nu)
        _, cy = fields.centres()
        velocity = fields.cells["velocity"]
        exact = g / (2.0 * nu) * cy * (h - cy)
        error = np.maximum(np.abs(velocity[:, :, 0] - exact), np.abs(velocity[:, :, 1])) / u_max
        return float(error.max()), cy[:, 0], (velocity[:, 0, 0] - exact[:, 0]) / u_max

    def evaluate(self, runs, figures):
        names = ("poiseuille_uniform", "poiseuille_stretched_32", "poiseuille_stretched_64")
        result = self.new_result(
            "Plane Poiseuille flow (periodic channel, Re_H = 200)",
            "Laminar fully developed channel driven by an imposed mean pressure gradient, against "
            "the exact parabola u = G/(2 nu) y (H - y).",
            [runs[n] for n in names],
        )
        exact_source = "exact solution (textbook; White, Viscous Fluid Flow, 3rd ed. 2006, sec. 3-3.2)"
        test = "test_poiseuille: Poiseuille.UniformGridReproducesParabola"
        result.checks.append(converged_check(runs[names[0]], test))
        uniform, _, _ = self._error(runs[names[0]])
        result.checks.append(
            Check(
                "max |u - u_exact| / U_max (and |v|), 32 uniform cells",
                "0",
                exact_source,
                f"{uniform:.2e}",
                f"{uniform:.2e}",
                "< 1e-6",
                "A second-order scheme with a second-order wall gradient is exact for a parabola, so only the "
                "iteration error remains (residual drop 1e-9, inner solves to 1e-12); 1e-6 allows a thousandfold "
                "amplification from residual to error (test_poiseuille.cpp).",
                uniform < 1e-6,
                test,
            )
        )
        test = "test_poiseuille: Poiseuille.StretchedGridsConvergeAtSecondOrder"
        coarse, y_c, e_c = self._error(runs[names[1]])
        fine, y_f, e_f = self._error(runs[names[2]])
        fine_nodes = runs[names[2]].result().fields().y[:, 0]
        nested = abs(fine_nodes[2] - self._coarse_nodes[1])
        result.checks.append(
            Check(
                "refined grid contains the nodes of the coarse one (|y_2,fine - y_1,coarse|)",
                "0",
                "construction of the grid pair",
                f"{nested:.1e}",
                f"{nested:.1e}",
                "<= 1e-12",
                "round-off of the node coordinates",
                nested <= 1e-12,
                test,
            )
        )
        order = observed_order_from_errors(coarse, fine, 2.0)
        result.checks.append(
            Check(
                "observed order of max |u - u_exact| / U_max, 32 -> 64 stretched cells",
                "2 (formal order)",
                "second-order scheme; error against the exact solution",
                f"{order:.2f}",
                f"{order - 2.0:+.2f}",
                ">= 1.8",
                f"grid growth ratio q = {self._q:.3f} at 32 cells; the error must fall by about 4 per "
                "refinement (test_poiseuille.cpp: observed order >= 1.8, formal 2)",
                order >= 1.8,
                test,
            )
        )
        result.studies.append(
            GridStudy(
                "max |u - u_exact| / U_max on the stretched family",
                ["4x64", "4x32"],
                [fine, coarse],
                "observed order from the error against the exact solution, r = 2",
                {"order": order},
            )
        )
        fig, (ax,) = plots.figure()
        ax.semilogy(y_c, np.abs(e_c), "o-", label="32 stretched cells")
        ax.semilogy(y_f, np.abs(e_f), "s-", label="64 stretched cells")
        plots.finish_axes(
            ax,
            "y [m]",
            "|u - u_exact| / U_max",
            "Poiseuille flow: error against the exact parabola (stretched grids)",
        )
        result.add_figure(
            fig,
            figures,
            "poiseuille_error.png",
            "Error of u against the exact parabola on the two stretched grids.",
        )
        return result


class Cavity(VerificationCase):
    key, config = "cavity", "cavity_re100"
    test_file = "tests/verification/test_cavity.cpp"
    tests = [("test_cavity", "Cavity.Re100MatchesGhia")]
    sizes = (129, 65, 33)  # odd: a cell column lies on x = 0.5 and a cell centre on (0.5, 0.5)

    def plan(self):
        base = load_config(self.config)
        return [Run(f"cavity_{n}", modified(base, {"grid.cells": [n, n]})) for n in self.sizes]

    @staticmethod
    def _centrelines(run):
        fields = run.result().fields()
        cx, cy = fields.centres()
        mid = fields.nx // 2
        velocity = fields.cells["velocity"]
        return (cy[:, mid], velocity[:, mid, 0]), (cx[mid, :], velocity[mid, :, 1]), velocity[mid, mid, 0]

    def evaluate(self, runs, figures):
        names = [f"cavity_{n}" for n in self.sizes]
        result = self.new_result(
            "Lid-driven cavity, Re = 100",
            "Square cavity with a moving lid, centreline velocities against the tables of Ghia, "
            "Ghia & Shin (1982). The test also runs Re = 400 and 1000 (not in this report: "
            "about a minute more).",
            [runs[n] for n in names],
        )
        test = "test_cavity: Cavity.Re100MatchesGhia"
        result.checks.append(converged_check(runs[names[0]], test))
        table_u, table_v = ref.ghia_tables()
        lines = [self._centrelines(runs[n])[:2] for n in names[:2]]  # 129 and 65 cells: (u line, v line)
        compared = []
        for k, (label, table, position, column) in enumerate(
            (
                ("u on x = 0.5 (Table I)", table_u, "y", "u(Re=100)"),
                ("v on y = 0.5 (Table II)", table_v, "x", "v(Re=100)"),
            )
        ):
            points = table[position]
            (fine_pos, fine_val), (coarse_pos, coarse_val) = lines[0][k], lines[1][k]
            # Points between a wall and the first cell centre (of either grid) are the exact wall
            # data: left out, as the test does.
            inside = (points >= coarse_pos[0] - 1e-12) & (points <= coarse_pos[-1] + 1e-12)
            ours = np.interp(points[inside], fine_pos, fine_val)
            coarse = np.interp(points[inside], coarse_pos, coarse_val)
            compared.append((label, points[inside], position, ours, coarse, table[column][inside]))
        # The test's derived tolerance: U_ours + U_Ghia + 5e-5, U_ours = 3 max|fine - coarse| / (r^2 - 1)
        # over both lines (two-grid estimate, Roache 1994), U_Ghia = 0.015 (from memory, see the test).
        ratio = self.sizes[0] / self.sizes[1]
        change = max(float(np.max(np.abs(ours - coarse))) for _, _, _, ours, coarse, _ in compared)
        u_ours = 3.0 * change / (ratio**2 - 1.0)
        tolerance = u_ours + 0.015 + 5e-5
        for label, points, position, ours, _, table_values in compared:
            deviation = np.abs(ours - table_values)
            worst = int(np.argmax(deviation))
            result.checks.append(
                Check(
                    f"{label}: max |ours - Ghia| over {len(points)} points, 129 x 129 cells",
                    "Ghia table values",
                    ref.GHIA_SOURCE,
                    f"{deviation.max():.4f} at {position} = {points[worst]:.4f}",
                    f"{deviation.max():.4f}",
                    f"<= {tolerance:.4f} U_lid",
                    f"test_cavity.cpp: U_ours + U_Ghia + 5e-5; U_ours = 3 max|u_129 - u_65| / (r^2 - 1) = "
                    f"{u_ours:.4f} (two-grid estimate, Roache 1994); U_Ghia = 0.015, the tables' deviation "
                    "from later higher-order solutions (about 0.01, from memory) with a safety factor 1.5",
                    deviation.max() <= tolerance,
                    test,
                )
            )
        centre = [self._centrelines(runs[n])[2] for n in names]
        study = ThreeGridStudy(
            centre[0], centre[1], centre[2], self.sizes[0] / self.sizes[1], self.sizes[1] / self.sizes[2]
        )
        ghia_centre = float(table_u["u(Re=100)"][np.argmin(np.abs(table_u["y"] - 0.5))])
        result.studies.append(
            GridStudy(
                "u at the cavity centre (0.5, 0.5)",
                [f"{n}x{n}" for n in self.sizes],
                centre,
                "three grids, Celik et al. (2008) with r21 = 129/65, r32 = 65/33",
                study.as_dict(),
                f"Ghia, Ghia & Shin (1982) Table I at y = 0.5: {ghia_centre:.5f}",
            )
        )
        fig, (ax_u, ax_v) = plots.figure(rows=2)
        for n in self.sizes:
            (yy, uu), (xx, vv), _ = self._centrelines(runs[f"cavity_{n}"])
            ax_u.plot(yy, uu, label=f"{n} x {n}")
            ax_v.plot(xx, vv, label=f"{n} x {n}")
        ax_u.plot(table_u["y"], table_u["u(Re=100)"], "ko", label=ref.GHIA_SOURCE.split(",")[0] + " (1982)")
        ax_v.plot(table_v["x"], table_v["v(Re=100)"], "ko", label="Ghia, Ghia & Shin (1982)")
        plots.finish_axes(ax_u, "y on x = 0.5 [m]", "u / U_lid", "Cavity Re = 100: centreline velocities")
        plots.finish_axes(ax_v, "x on y = 0.5 [m]", "v / U_lid")
        result.add_figure(
            fig,
            figures,
            "cavity_centrelines.png",
            "u on the vertical and v on the horizontal centreline, three grids, with Ghia's tables.",
        )
        return result


class Blasius(VerificationCase):
    key, config = "blasius", "blasius_plate"
    test_file = "tests/verification/test_blasius.cpp"
    tests = [("test_blasius", "Blasius.*")]
    levels = (1, 2, 4)  # coarsening factors of the shipped grid (cells / k, spacings * k)

    def plan(self):
        base = load_config(self.config)
        cells = base["grid"]["cells"][0]
        return [Run(f"blasius_{cells // k}", coarsened_plate(base, 1, k)) for k in self.levels]

    def evaluate(self, runs, figures):
        names = family(runs, "blasius_")
        result = self.new_result(
            "Laminar flat plate (Blasius), Re_L = 1e5",
            "Elliptic solution of a plate boundary layer against the Blasius similarity solution.",
            [runs[n] for n in names],
        )
        fine = runs[names[0]]
        nu, u_inf = fine.case["flow"]["kinematic_viscosity"], fine.case["flow"]["reference_velocity"]
        target = 2.0 * ref.blasius_wall_curvature()
        test = "test_blasius: Blasius.SkinFrictionOverMidPlate"
        result.checks.append(converged_check(fine, test))
        coarse = runs[names[1]]  # half the cells per direction: the test's two-grid estimate

        def scaled_friction(run):
            w = run.result().wall()
            on = w["x"] > 0
            order = np.argsort(w["x"][on])
            return w["x"][on][order], (w["cf"][on] * np.sqrt(u_inf * w["x"][on] / nu))[order]

        def bl_theory(re_x):
            # The test's departure from boundary-layer theory: 2.326 / (1.328 sqrt(Re_x)) (Imai 1957, from memory).
            return 2.326 / (1.328 * np.sqrt(re_x))

        x_f, s_f = scaled_friction(fine)
        x_c, s_c = scaled_friction(coarse)
        mid = (x_f >= 0.25) & (x_f <= 0.75)
        scaled = s_f[mid]
        error = np.abs(scaled / target - 1.0)
        u_cf = 3.0 * float(np.max(np.abs(scaled - np.interp(x_f[mid], x_c, s_c)) / target)) / (2.0**2 - 1.0)
        allowed = u_cf + bl_theory(u_inf * x_f[mid] / nu)
        worst = float(np.max(error))
        margin = float(np.min(allowed - error))
        result.checks.append(
            Check(
                f"Cf sqrt(Re_x) over 0.25 <= x <= 0.75 m ({int(mid.sum())} wall faces; the test needs > 20)",
                f"2 f''(0) = {target:.6f}",
                ref.BLASIUS_SOURCE,
                f"worst {scaled[np.argmax(error)]:.5f}",
                f"{100 * worst:.2f} %",
                f"within {100 * allowed.min():.2f}-{100 * allowed.max():.2f} % (smallest margin {100 * margin:.2f} %)",
                f"test_blasius.cpp, per face: U_ours + U_BL(x); U_ours = 3 max|fine - coarse| / (2^2 - 1) = "
                f"{100 * u_cf:.2f} % (two-grid estimate, Roache 1994), U_BL = 2.326 / (1.328 sqrt(Re_x)), the next "
                "term of the plate-drag expansion (Imai 1957, from memory) as the bound of the departure from "
                "boundary-layer theory",
                margin >= 0.0 and mid.sum() > 20,
                test,
            )
        )
        test = "test_blasius: Blasius.VelocityProfileAtMidPlate"
        # The cell column whose centre is closest to x = 0.5 m, cell centres up to eta = 8 (as the test).
        fields = fine.result().fields()
        cx, cy = fields.centres()
        column = int(np.argmin(np.abs(0.5 * (fields.x[0, :-1] + fields.x[0, 1:]) - 0.5)))
        eta = cy[:, column] * np.sqrt(u_inf / (nu * cx[:, column]))
        keep = eta <= 8.0
        u_mid = fields.cells["velocity"][:, column, 0]
        table = ref.blasius_table()
        expected = np.interp(eta[keep], table["eta"], table["f'"])
        deviation = np.abs(u_mid[keep] / u_inf - expected)
        # The coarse grid's column closest to x = 0.5 m, compared at the same eta (inside its range).
        c_fields = coarse.result().fields()
        c_cx, c_cy = c_fields.centres()
        c_column = int(np.argmin(np.abs(0.5 * (c_fields.x[0, :-1] + c_fields.x[0, 1:]) - 0.5)))
        c_eta = c_cy[:, c_column] * np.sqrt(u_inf / (nu * c_cx[:, c_column]))
        c_keep = c_eta <= 8.0
        c_u = c_fields.cells["velocity"][:, c_column, 0][c_keep] / u_inf
        inside = (eta[keep] >= c_eta[c_keep][0]) & (eta[keep] <= c_eta[c_keep][-1])
        change = float(np.max(np.abs(u_mid[keep][inside] / u_inf - np.interp(eta[keep][inside], c_eta[c_keep], c_u))))
        change *= 3.0 / (2.0**2 - 1.0)  # two-grid estimate: F_s = 3, p = 2, r = 2
        h = float(table["eta"][1] - table["eta"][0])
        interpolation = h * h / 8.0 * float(np.max(np.abs(table["f"] * table["f''"]) / 2.0))
        tolerance = change + bl_theory(u_inf * 0.5 / nu) + interpolation
        result.checks.append(
            Check(
                f"u/U against f'(eta) at x = 0.5 m, eta <= 8 ({int(keep.sum())} cells; the test needs > 15)",
                "f'(eta), linear in the table",
                ref.BLASIUS_SOURCE,
                f"max deviation {deviation.max():.4f}",
                f"{deviation.max():.4f}",
                f"<= {tolerance:.4f} U",
                f"test_blasius.cpp: U_ours + U_BL(0.5 m) + h^2/8 max|f'''|; U_ours = {change:.4f} (two-grid "
                f"estimate, r = 2), U_BL = {bl_theory(u_inf * 0.5 / nu):.4f}, table interpolation {interpolation:.1e}",
                deviation.max() <= tolerance and keep.sum() > 15,
                test,
            )
        )
        values = []
        for n in names:
            w = runs[n].result().wall()
            order = np.argsort(w["x"])
            values.append(float(np.interp(0.5, w["x"][order], w["cf"][order]) * np.sqrt(u_inf * 0.5 / nu)))
        study = ThreeGridStudy(values[0], values[1], values[2], 2.0, 2.0)
        result.studies.append(
            GridStudy(
                "Cf sqrt(Re_x) at x = 0.5 m (linear between wall faces)",
                [n.split("_")[1] + " cells along x" for n in names],
                values,
                "three grids, r = 2 (cells halved, first-cell height and leading-edge spacing doubled)",
                study.as_dict(),
                f"Blasius: {target:.6f}",
            )
        )
        fig, (ax_cf, ax_u) = plots.figure(rows=2)
        for n in names:
            w = runs[n].result().wall()
            on = w["x"] > 0
            ax_cf.plot(
                w["x"][on],
                w["cf"][on] * np.sqrt(u_inf * w["x"][on] / nu),
                label=n.replace("blasius_", "") + " cells",
            )
        ax_cf.axhline(target, color="k", label=f"Blasius 2 f''(0) = {target:.4f}")
        ax_cf.fill_between(
            x_f[mid], target * (1 - allowed), target * (1 + allowed), color="0.85", label="test tolerance"
        )
        ax_cf.axvspan(0.25, 0.75, color="C2", alpha=0.08)
        ax_cf.set_ylim(0.5, 0.8)
        ax_u.plot(table["eta"], table["f'"], "k-", label="f'(eta), Ganapol (2010)")
        ax_u.plot(eta[keep], u_mid[keep] / u_inf, "o", markersize=3, label="wallrans, x = 0.5 m")
        plots.finish_axes(
            ax_cf,
            "x [m]",
            "Cf sqrt(Re_x)",
            "Blasius plate: skin friction (three grids) and the mid-plate profile",
        )
        plots.finish_axes(ax_u, "eta = y sqrt(U / (nu x))", "u / U")
        fig.subplots_adjust(hspace=0.35)
        result.add_figure(
            fig,
            figures,
            "blasius.png",
            "Cf sqrt(Re_x) along the plate on three grids (checked range shaded) and u/U at x = 0.5 m.",
        )
        return result
