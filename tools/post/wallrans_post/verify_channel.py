"""The turbulent channel of the verification report (Spalart-Allmaras, Re_tau = 392): mirrors the
checks, references and tolerances of tests/verification/test_channel.cpp and reads the same data
files; the profile is compared with the independent 1-D solver tools/channel1d.py."""
import subprocess
import sys
import tempfile
from pathlib import Path

import numpy as np

from . import plots
from . import references as ref
from .convergence import ThreeGridStudy, two_grid_gci
from .tables import read_table
from .verify_results import Check, GridStudy, VerificationCase, converged_check
from .verify_runs import Run, family, load_config, modified, resource

REFINEMENT = 4.0 / 3.0  # the ratio of the channel's two-grid study and of the plate's grid family


class Channel(VerificationCase):
    key, config = "channel", "channel_sa_re395"
    test_file = "tests/verification/test_channel.cpp"
    tests = [("test_channel", "Channel.SpalartAllmarasNegative")]
    dns_label, re_tau = "395", 392.24
    levels = (0, 1, 2)  # coarsenings by 4/3 in the wall-normal direction: 128, 96, 72 cells

    def plan(self):
        base = load_config(self.config)
        runs = []
        for level in self.levels:
            cells = [base["grid"]["cells"][0], round(base["grid"]["cells"][1] / REFINEMENT**level)]
            runs.append(
                Run(
                    f"channel_{cells[1]}",
                    modified(
                        base,
                        {
                            "grid.cells": cells,
                            "grid.first_cell_height": base["grid"]["first_cell_height"] * REFINEMENT**level,
                        },
                    ),
                )
            )
        return runs

    def _one_d(self):
        """The independent 1-D solution of the same model equations (tools/channel1d.py, 2000 points)."""
        with tempfile.TemporaryDirectory() as folder:
            csv = Path(folder) / "channel1d.csv"
            subprocess.run(
                [
                    sys.executable,
                    str(resource("channel1d")),
                    "--model",
                    "spalart_allmaras",
                    "--variant",
                    "negative",
                    "--re-tau",
                    f"{self.re_tau:f}",
                    "--out",
                    str(csv),
                ],
                check=True,
                stdout=subprocess.DEVNULL,
            )
            table = read_table(csv)
        y_plus, u_plus = table["y_plus"], table["u_plus"]
        return y_plus, u_plus, float(np.trapz(u_plus, y_plus) / y_plus[-1])

    def _measure(self, run, one_d):
        """Bulk U+, the profile of the lower half and its deviations, as run_channel of the test."""
        case, fields, wall = run.case, run.result().fields(), run.result().wall()
        nu, h = case["flow"]["kinematic_viscosity"], 0.5 * case["grid"]["height"]
        u_tau = float(np.sqrt(np.mean(np.abs(wall["wall_shear_stress"]))))  # as the test: mean |tau_w|
        volume, u = fields.scalar("cell_volume"), fields.cells["velocity"][:, :, 0]
        bulk = float(np.sum(u * volume) / np.sum(volume)) / u_tau
        _, cy = fields.centres()
        lower = cy[:, 0] <= h
        y = cy[lower, 0]
        y_plus, u_plus = y * u_tau / nu, u[lower, 0] / u_tau
        rel = float(np.max(np.abs(u_plus / np.interp(y_plus, one_d[0], one_d[1]) - 1.0)))
        band = (y_plus >= 30.0) & (y / h <= 0.3)
        low, high = ref.log_law_band(y_plus[band])
        # Widened by the two outer-layer effects a log law leaves out (test_channel.cpp): the falling
        # total stress lowers U+ by (y/h)/kappa; Coles' wake adds (2 Pi/kappa) sin^2(pi y/(2h)), Pi = 0.14.
        kappa = ref.LOG_LAW["kappa"]
        low = low - y[band] / h / kappa
        high = high + 2.0 * ref.CHANNEL_WAKE_PI / kappa * np.sin(0.5 * np.pi * y[band] / h) ** 2
        excess = (
            float(np.max(np.concatenate([low - u_plus[band], u_plus[band] - high]))) if band.any() else np.inf
        )
        return {
            "u_tau": u_tau,
            "bulk": bulk,
            "rel_1d": rel,
            "band_excess": excess,
            "n_band": int(band.sum()),
            "y_plus": y_plus,
            "u_plus": u_plus,
            "band": (y_plus[band], low, high),
        }

    def evaluate(self, runs, figures):
        names = family(runs, "channel_")
        result = self.new_result(
            "Turbulent channel, Spalart-Allmaras (negative), Re_tau = 392",
            "Streamwise-periodic channel at the Re_tau of the DNS of Moser, Kim & Mansour (1999). "
            "The test also runs Re_tau 180 and 590 and the other closures.",
            [runs[n] for n in names],
        )
        one_d = self._one_d()
        fine, coarse, coarsest = (self._measure(runs[n], one_d) for n in names)
        test = "test_channel: Channel.SpalartAllmarasNegative"
        result.checks.append(converged_check(runs[names[0]], test))
        result.checks.append(
            Check(
                "u_tau from the mean wall shear (wall units: imposed -dp/dx = 1)",
                "1",
                "momentum balance of the case",
                f"{fine['u_tau']:.6f}",
                f"{fine['u_tau'] - 1:+.1e}",
                "within 1e-4",
                "the wall shear must balance the imposed pressure gradient (test_channel.cpp)",
                abs(fine["u_tau"] - 1.0) <= 1e-4,
                test,
            )
        )
        dns = ref.ChannelDns(self.dns_label, self.re_tau)
        dns_bulk = dns.bulk_u_plus()
        error = 100.0 * (fine["bulk"] / dns_bulk - 1.0)
        result.checks.append(
            Check(
                "bulk U+ = U_b / u_tau",
                f"{dns_bulk:.3f} (trapezoid over the table)",
                ref.MKM_SOURCE,
                f"{fine['bulk']:.3f}",
                f"{error:+.2f} %",
                "within 5 %",
                "test_channel.cpp: the project's acceptance criterion for its reference model at Re_tau 395, stated "
                "there as not a derived tolerance (the deviation is a property of the model as specified)",
                abs(error) < 5.0,
                test,
            )
        )
        gci = two_grid_gci(fine["rel_1d"], coarse["rel_1d"], REFINEMENT, 2.0) * fine["rel_1d"]
        result.checks.append(
            Check(
                "max |U+_2D / U+_1D - 1| over the cells of the lower half",
                "0 (same model equations)",
                "independent 1-D solver tools/channel1d.py, 2000 points",
                f"{100 * fine['rel_1d']:.3f} %",
                f"{100 * fine['rel_1d']:.3f} %",
                f"<= {100 * gci:.3f} % (two-grid estimate)",
                "F_s |e_coarse - e_fine| / (r^p - 1), F_s = 3 for two grids, formal order p = 2, r = 4/3 "
                "(Roache 1994): the deviation converges at an observed order >= 0.8 (test_channel.cpp)",
                fine["rel_1d"] <= gci,
                test,
            )
        )
        result.checks.append(
            Check(
                f"U+ in the log-law band, y+ >= 30 and y/h <= 0.3 ({fine['n_band']} cells; the test needs > 10)",
                "published log laws, widened by the outer-layer effects",
                ref.LOG_LAW_BAND_SOURCE + "; wake Pi = 0.14 " "(Dean 1978)",
                f"largest distance outside {fine['band_excess']:+.3f}",
                f"{fine['band_excess']:+.3f}",
                "<= 0 (inside)",
                "lower edge minus (y/h)/kappa (falling total stress), upper edge plus Coles' wake "
                "(2 Pi/kappa) sin^2(pi y/2h), each derived at the cell's y/h (test_channel.cpp)",
                fine["band_excess"] <= 0.0 and fine["n_band"] > 10,
                test,
            )
        )
        bulks = [fine["bulk"], coarse["bulk"], coarsest["bulk"]]
        study = ThreeGridStudy(*bulks, REFINEMENT, REFINEMENT)
        result.studies.append(
            GridStudy(
                "bulk U+",
                [f"4x{n.split('_')[1]}" for n in names],
                bulks,
                "three grids, r = 4/3 in the wall-normal direction (first-cell height scaled alike)",
                study.as_dict(),
                f"1-D solution: {one_d[2]:.4f}; DNS: {dns_bulk:.3f}",
            )
        )
        result.studies.append(
            GridStudy(
                "max |U+_2D / U+_1D - 1|",
                [f"4x{n.split('_')[1]}" for n in names[:2]],
                [fine["rel_1d"], coarse["rel_1d"]],
                "two grids, F_s = 3, p = 2 (Roache 1994)",
                {"gci_estimate": gci},
            )
        )
        fig, (ax,) = plots.figure()
        for n, m in zip(names, (fine, coarse, coarsest)):
            ax.semilogx(
                m["y_plus"], m["u_plus"], "o", markersize=3, label=f"wallrans {n.replace('channel_', '4 x ')}"
            )
        ax.semilogx(
            one_d[0][1:], one_d[1][1:], "-", color="C3", label="1-D solution, same model (tools/channel1d.py)"
        )
        ax.semilogx(dns.y_plus[1:], dns.u_plus[1:], "k-", label=dns.legend())
        band_y, low, high = fine["band"]
        ax.fill_between(band_y, low, high, color="0.8", label="log-law band of the test")
        plots.finish_axes(ax, "y+", "U+", "SA channel, Re_tau = 392: mean velocity (lower half)")
        result.add_figure(
            fig,
            figures,
            "channel_profile.png",
            "U+ against y+ on three grids with the 1-D solution, the DNS and the log-law band.",
        )
        return result
