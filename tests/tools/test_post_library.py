#!/usr/bin/python3
"""The shared post-processing code (tools/post/wallrans_post): observed order and GCI on sequences
whose answer is known, the reference tables read by column name, and the grouping of wall rows."""
import math
import unittest

import numpy as np

from tool_testing import SOURCE_DIR, TempDirTest
from wallrans_post import references as ref
from wallrans_post.cli import InputError
from wallrans_post.convergence import ThreeGridStudy, observed_order_from_errors, two_grid_gci
from wallrans_post.run_dir import wall_groups
from wallrans_post.tables import Table, read_table


def sequence(phi_exact, c, p, spacings):
    return [phi_exact + c * h**p for h in spacings]


class Convergence(unittest.TestCase):
    def test_constant_ratio_recovers_order_and_limit(self):
        # phi = 1 + 0.3 h^2 on h = 1, 1.5, 2.25: p = 2 and phi_ext = 1 exactly (Richardson), and
        # GCI21 = 1.25 |phi1 - phi2| / phi1 / (r^2 - 1) (Roache 1994).
        phi = sequence(1.0, 0.3, 2.0, (1.0, 1.5, 2.25))
        study = ThreeGridStudy(*phi, 1.5, 1.5)
        self.assertAlmostEqual(study.order, 2.0, delta=1e-10)
        self.assertAlmostEqual(study.extrapolated, 1.0, delta=1e-12)
        self.assertAlmostEqual(
            study.gci21, 1.25 * abs(phi[0] - phi[1]) / phi[0] / (1.5**2 - 1.0), delta=1e-14
        )
        self.assertEqual(study.kind, "monotone")
        # In the asymptotic range |phi2 - phi3| = r^p |phi1 - phi2|, so GCI32 / (r^p GCI21) = phi1 / phi2.
        self.assertAlmostEqual(study.asymptotic, phi[0] / phi[1], delta=1e-12)

    def test_varying_ratio_recovers_order(self):
        # The refinement of the cavity grids (129/65, 65/33) with a known order 1.7: Celik et al.
        # (2008) iterate q(p) to the exact order; the extrapolation returns the exact limit.
        h = (1.0 / 129, 1.0 / 65, 1.0 / 33)
        phi = sequence(-0.2, 0.5, 1.7, h)
        study = ThreeGridStudy(*phi, h[1] / h[0], h[2] / h[1])
        self.assertAlmostEqual(study.order, 1.7, delta=1e-9)
        self.assertAlmostEqual(study.extrapolated, -0.2, delta=1e-12)

    def test_oscillatory_and_two_grid(self):
        study = ThreeGridStudy(1.0, 1.1, 0.95, 2.0, 2.0)
        self.assertEqual(study.kind, "oscillatory")
        self.assertLess(study.ratio, 0.0)
        # Two grids: F_s = 3 with the assumed order (Roache 1994).
        self.assertAlmostEqual(two_grid_gci(1.0, 1.02, 2.0, 2.0), 3.0 * 0.02 / 3.0, delta=1e-15)
        self.assertAlmostEqual(observed_order_from_errors(4e-3, 1e-3, 2.0), 2.0, delta=1e-12)


class ReferenceTables(TempDirTest):
    def test_names_from_the_columns_comment(self):
        dns = read_table(SOURCE_DIR / "tests" / "data" / "channel-mkm1999" / "mkm_retau395_means.dat")
        self.assertEqual(dns.names, ["y/h", "y+", "U+", "dU+/d(y/h)", "W+", "dW+/d(y/h)", "P"])
        self.assertEqual(dns.n_rows, 129)
        ghia, _ = ref.ghia_tables()
        self.assertEqual(ghia.names, ["grid_pt", "y", "u(Re=100)", "u(Re=400)", "u(Re=1000)"])
        stress = read_table(SOURCE_DIR / "tests" / "data" / "channel-mkm1999" / "mkm_retau180_reystress.dat")
        self.assertEqual(stress.names[-1], "R_vw+")

    def test_published_values_read_from_the_files(self):
        # The data README's check values: bulk U+ 17.54 (trapezoid) and f''(0) = 0.3320573362.
        self.assertAlmostEqual(ref.ChannelDns("395", 392.24).bulk_u_plus(), 17.54, delta=0.005)
        self.assertAlmostEqual(ref.blasius_wall_curvature(), 0.3320573362, delta=1e-12)
        table, header = ref.schlatter_orlu()
        self.assertAlmostEqual(header["cf"], 0.002970989, delta=1e-12)
        self.assertEqual(ref.nearest_channel_dns(400.0).label, "395")
        self.assertEqual(ref.nearest_channel_dns(250.0).label, "180")

    def test_bad_tables(self):
        path = self.tmp / "bad.csv"
        path.write_text("a,b\n1,2\n3\n", encoding="utf-8")
        with self.assertRaisesRegex(InputError, r"bad.csv:3: expected 2 fields \(a, b\), got 1"):
            read_table(path)
        with self.assertRaisesRegex(InputError, "no column 'c'; the columns are: a, b"):
            Table(path, ["a", "b"], [[1.0, 2.0]])["c"]


class WallGroups(unittest.TestCase):
    def test_cavity_walls_without_segment_columns(self):
        # Rows of the four sides of a unit cavity in the order of a 2-rank gather (interleaved sides).
        xs, ys = [], []
        for c in (0.25, 0.75, 0.5):
            xs += [c, c, 0.0, 1.0]
            ys += [0.0, 1.0, c, c]
        wall = Table("wall.csv", ["x", "y"], list(zip(xs, ys)))
        groups = {g.name: g for g in wall_groups(wall)}
        self.assertEqual(sorted(groups), ["wall at x = 0", "wall at x = 1", "wall at y = 0", "wall at y = 1"])
        bottom = groups["wall at y = 0"]
        self.assertEqual(list(np.asarray(xs)[bottom.rows]), [0.25, 0.5, 0.75])  # ordered along the wall
        self.assertFalse(bottom.along_y)
        self.assertTrue(groups["wall at x = 1"].along_y)
        self.assertTrue(math.isclose(np.asarray(ys)[groups["wall at x = 1"].rows][-1], 0.75))

    def test_walls_by_segment_columns(self):
        # A file with segment and side columns (text): grouped by them, whatever the coordinates.
        rows = [
            ["plate", "bottom", 0.2, 0.0],
            ["block", "left", 0.5, 0.001],
            ["plate", "bottom", 0.1, 0.0],
            ["block", "left", 0.5, 0.002],
        ]
        wall = Table("wall.csv", ["segment", "side", "x", "y"], rows)
        groups = {g.name: g for g in wall_groups(wall)}
        self.assertEqual(sorted(groups), ["segment block, left", "segment plate, bottom"])
        self.assertEqual(list(groups["segment plate, bottom"].rows), [2, 0])
        self.assertTrue(groups["segment block, left"].along_y)
        with self.assertRaisesRegex(
            InputError, r"wall.csv:1: column 'segment': expected a number, got 'plate'"
        ):
            wall["segment"]


if __name__ == "__main__":
    unittest.main()
