#!/usr/bin/python3
"""wallrans-plot on two small real runs (a turbulent plate with a solid block on 1 rank, a
turbulent channel on 2 ranks, both stopped at an iteration cap): every PNG written, of the
expected pixel size and not blank; --help; wrong arguments."""
import unittest

import matplotlib.image
import numpy as np

from tool_testing import TempDirTest, png_size, run_command, run_wallrans, shipped_case

SCRIPT = "wallrans_plot.py"
# FIGURE_INCHES (10 x 6) at the default 120 dpi.
DEFAULT_SIZE = (1200, 720)
MAPS = ("velocity.png", "eddy_viscosity.png")
C0 = np.array([0x1F, 0x77, 0xB4]) / 255.0


def tiny_plate():
    """The shipped SA plate on 48 x 32 cells with a solid block on the plate, 40 iterations."""
    case = shipped_case("plate_sa")
    case["title"] = "tiny_plate_block"
    case["grid"].update(cells=[48, 32], run_up_cells=8, leading_edge_spacing=2e-3)
    case["solid_regions"] = [{"x": [0.5, 0.6], "y": [0.0, 0.004]}]
    case["iterations"].update(max=40, coarse_grids=0, report_every=0)
    case["output"] = {"profiles_at_x": [0.25, 0.8], "wall_data": True}
    return case


def tiny_channel():
    """The shipped SA channel at Re_tau 392 on 4 x 48 cells, 150 iterations."""
    case = shipped_case("channel_sa_re395")
    case["title"] = "tiny_channel"
    case["grid"].update(cells=[4, 48], first_cell_height=0.005)
    case["iterations"].update(max=150, coarse_grids=0, report_every=0)
    return case


class Plot(TempDirTest):
    def check_pngs(self, folder, names, size=DEFAULT_SIZE):
        for name in names:
            path = folder / name
            self.assertTrue(path.is_file(), f"{name} not written")
            self.assertGreater(path.stat().st_size, 10000, name)
            self.assertEqual(png_size(path), size, name)
            pixels = matplotlib.image.imread(path)[:, :, :3]
            if name in MAPS:  # the field fills the axes: a third of the picture or more is not white
                self.assertGreater(np.mean(np.any(pixels < 0.9, axis=-1)), 0.3, name)
            else:  # the first data series is drawn in matplotlib's first colour, C0 (area scales with dpi^2)
                c0_pixels = np.sum(np.all(np.abs(pixels - C0) < 0.1, axis=-1))
                self.assertGreater(c0_pixels, 150 * (size[0] / DEFAULT_SIZE[0]) ** 2, name)

    def test_plate_with_solid_block(self):
        code, run = run_wallrans(tiny_plate(), self.tmp / "plate")
        self.assertEqual(code, 3)  # capped: every output written
        code, out, err = run_command(SCRIPT, run)
        self.assertEqual(code, 0, err)
        # Walls: the plate and the block's left, top and right faces.
        names = ["residuals.png", "profiles.png", "velocity.png", "eddy_viscosity.png"] + [
            f"wall_{k}.png" for k in range(1, 5)
        ]
        self.check_pngs(run / "plots", names)
        self.assertEqual(sorted(p.name for p in (run / "plots").glob("*.png")), sorted(names))
        self.assertEqual(out.count("wrote"), len(names))
        # The solid block is masked: the map shows the mask colour (grey 0.55) where the block is.
        pixels = matplotlib.image.imread(run / "plots" / "velocity.png")[:, :, :3]
        self.assertTrue(np.any(np.all(np.abs(pixels - 0.55) < 0.01, axis=-1)), "no masked (grey) cells")

    def test_channel_on_two_ranks(self):
        code, run = run_wallrans(tiny_channel(), self.tmp / "channel", ranks=2)
        self.assertEqual(code, 3)
        figures = self.tmp / "figures"
        code, out, err = run_command(SCRIPT, run, "--out", figures, "--dpi", 60)
        self.assertEqual(code, 0, err)
        names = [
            "residuals.png",
            "wall_1.png",
            "wall_2.png",
            "profiles.png",
            "velocity.png",
            "eddy_viscosity.png",
        ]
        self.check_pngs(figures, names, size=(600, 360))

    def test_skips_what_a_run_did_not_write(self):
        # A laminar cavity without wall data or profiles: residuals and maps only, the rest named as skipped.
        case = {
            "title": "tiny_cavity",
            "flow": {"kinematic_viscosity": 0.01},
            "grid": {"generator": "cavity", "cells": [16, 16]},
            "boundaries": [
                {"side": "top", "kind": "wall", "velocity": [1.0, 0.0]},
                {"side": "bottom", "kind": "wall"},
                {"side": "left", "kind": "wall"},
                {"side": "right", "kind": "wall"},
            ],
            "iterations": {"max": 20, "report_every": 0},
            "output": {"wall_data": False},
        }
        code, run = run_wallrans(case, self.tmp / "cavity")
        self.assertEqual(code, 3)
        code, out, err = run_command(SCRIPT, run)
        self.assertEqual(code, 0, err)
        self.check_pngs(run / "plots", ["residuals.png", "velocity.png", "eddy_viscosity.png"])
        self.assertIn("skipped wall plots", out)
        self.assertIn("skipped profiles", out)

    def test_help(self):
        self.assert_help(
            SCRIPT, "run_dir", "--dpi", "residuals.png", "profiles.png", "Moser, Kim & Mansour", "exit codes"
        )

    def test_wrong_arguments(self):
        not_a_run = self.tmp / "empty"
        not_a_run.mkdir()
        broken = self.tmp / "broken"
        broken.mkdir()
        (broken / "case.resolved.yaml").write_text("title: [unclosed\n", encoding="utf-8")
        self.assert_bad_input(
            SCRIPT,
            "wallrans-plot",
            (
                ([self.tmp / "missing"], "missing: not a directory"),
                ([not_a_run], "no case.resolved.yaml"),
                ([broken], "case.resolved.yaml: not valid YAML"),
                ([not_a_run, "--dpi", "0"], "positive integer"),
                ([], "run_dir"),
            ),
        )


if __name__ == "__main__":
    unittest.main()
