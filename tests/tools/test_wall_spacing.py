#!/usr/bin/python3
"""wallrans-wall-spacing: the printed skin friction against published values, the spacing from
them, --help, exit codes and wrong arguments."""
import math
import re
import unittest

from tool_testing import TempDirTest, run_command

SCRIPT = "wallrans_wall_spacing.py"


def printed(pattern, text):
    match = re.search(pattern, text)
    if not match:
        raise AssertionError(f"'{pattern}' not in output:\n{text}")
    return float(match.group(1))


class WallSpacing(TempDirTest):
    def test_white_against_the_tmr_values(self):
        # White's formula as tabulated by the NASA Turbulence Modeling Resource: Re_x = 1e6 gives
        # Cf = 3.759e-3 (shared/VERIFICATION-VALUES.md, section 4). The tool prints Cf to 5 digits, so
        # the printed value carries at most half a unit of the table's 4th digit (5e-7).
        code, out, _ = run_command(SCRIPT, "--reynolds", "1e7", "--length", "2.0", "--at", "0.2")
        self.assertEqual(code, 0)
        self.assertIn("White", out)
        self.assertIn("Viscous Fluid Flow", out)  # the source is named
        cf = printed(r"Cf = ([0-9.e+-]+),", out)
        self.assertAlmostEqual(cf, 3.759e-3, delta=5e-7)
        # y = y+ (nu/U) / sqrt(Cf/2) with nu/U = L/Re: from the published Cf, the first cell centre sits at
        # 2e-7 / sqrt(3.759e-3/2); the 4-digit Cf bounds the relative difference by 1.3e-4.
        distance = printed(r"first cell centre at ([0-9.e+-]+) m", out)
        expected = 1.0 * (2.0 / 1e7) / math.sqrt(0.5 * 3.759e-3)
        self.assertAlmostEqual(distance / expected, 1.0, delta=2e-4)
        self.assertAlmostEqual(
            printed(r"grid.first_cell_height: ([0-9.e+-]+)", out) / (2 * expected), 1.0, delta=1e-3
        )

    def test_power_law_against_the_tmr_value(self):
        # 1/5-power law, Re_x = 4.85e6: Cf = 2.724e-3 (TMR data, VERIFICATION-VALUES.md section 4).
        code, out, _ = run_command(
            SCRIPT, "--reynolds", "4.85e6", "--length", "1", "--correlation", "power-law", "--y-plus", "0.5"
        )
        self.assertEqual(code, 0)
        self.assertIn("Schlichting", out)
        self.assertAlmostEqual(printed(r"Cf = ([0-9.e+-]+),", out), 2.724e-3, delta=5e-7)
        distance = printed(r"first cell centre at ([0-9.e+-]+) m", out)
        self.assertAlmostEqual(distance / (0.5 / 4.85e6 / math.sqrt(0.5 * 2.724e-3)), 1.0, delta=2e-4)

    def test_blasius_and_y_plus_along_the_plate(self):
        # Laminar: Cf sqrt(Re_x) = 2 f''(0) = 0.664115 (Ganapol 2010). The y+ table shows larger y+ upstream.
        code, out, _ = run_command(SCRIPT, "--reynolds", "1e5", "--length", "1", "--correlation", "blasius")
        self.assertEqual(code, 0)
        self.assertAlmostEqual(printed(r"Cf = ([0-9.e+-]+),", out), 0.664115 / math.sqrt(1e5), delta=5e-8)
        rows = re.findall(r"^\s+([0-9.e+-]+)\s+([0-9.e+-]+)\s+([0-9.e+-]+)\s+([0-9.]+)$", out, re.M)
        y_plus = [float(r[3]) for r in rows]
        self.assertEqual(len(y_plus), 5)
        self.assertEqual(y_plus, sorted(y_plus, reverse=True))
        self.assertAlmostEqual(y_plus[-1], 1.0, delta=1e-3)

    def test_channel_against_dean(self):
        # Dean (1978): Cf = 0.073 Re_b^-1/4; at the Re_b of the Re_tau 395 DNS, 13764: 6.74e-3
        # (VERIFICATION-VALUES.md section 3, 3.7 % above the DNS).
        code, out, _ = run_command(SCRIPT, "--flow", "channel", "--reynolds", "13764", "--length", "2")
        self.assertEqual(code, 0)
        self.assertIn("Dean (1978)", out)
        self.assertAlmostEqual(printed(r"Cf = ([0-9.e+-]+),", out), 6.74e-3, delta=5e-6)
        self.assertAlmostEqual(printed(r"Re_tau = u_tau \(H/2\) / nu = ([0-9.]+)", out), 399.5, delta=0.5)

    def test_help(self):
        self.assert_help(SCRIPT, "--reynolds", "--length", "--y-plus", "examples:", "exit codes")

    def test_wrong_arguments(self):
        self.assert_bad_input(
            SCRIPT,
            "wallrans-wall-spacing",
            (
                (["--length", "1"], "--reynolds"),
                (["--reynolds", "-5", "--length", "1"], "positive number"),
                (["--reynolds", "1e6", "--length", "1", "--at", "3"], "--at 3"),
                (["--reynolds", "1e6", "--length", "1", "--correlation", "dean"], "--flow channel"),
                (["--flow", "channel", "--reynolds", "1e4", "--length", "2", "--at", "1"], "--at"),
                (["--reynolds", "1e6", "--length", "1", "--correlation", "nonsense"], "invalid choice"),
            ),
        )


if __name__ == "__main__":
    unittest.main()
