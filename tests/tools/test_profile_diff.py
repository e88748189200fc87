#!/usr/bin/python3
"""wallrans-profile-diff: error norms on tables whose errors are known, the reference tables of
tests/data read by column name, bounds and exit codes, --help and wrong arguments."""
import math
import re
import unittest

from tool_testing import SOURCE_DIR, TempDirTest, run_command

SCRIPT = "wallrans_profile_diff.py"
MKM395 = SOURCE_DIR / "tests" / "data" / "channel-mkm1999" / "mkm_retau395_means.dat"


def norm(name, text):
    return float(re.search(name + r" +\([a-z]+, [a-z ]+\) += ([0-9.e+-]+)", text).group(1))


# The columns of the tables of these tests.
COLUMNS = ["--x", "y_plus", "--y", "u_plus", "--ref-x", "x", "--ref-y", "y"]
# The norms are printed with 7 significant digits: half a unit of the last one is 5e-7 relative.
PRINTED = 5e-7


class ProfileDiff(TempDirTest):
    def setUp(self):
        super().setUp()
        # Reference y = 2x + 1 (linear, so interpolation adds no error); profile = reference + e with
        # e = 0.1, -0.2, 0.3 at x = 0.5, 1.5, 2.5, and one point (x = 11) beyond the reference.
        self.reference = self.tmp / "reference.dat"
        self.reference.write_text(
            "# a table\n# columns: x  y (remark)\n" + "".join(f"{x} {2 * x + 1}\n" for x in range(11)),
            encoding="utf-8",
        )
        self.profile = self.tmp / "profile.csv"
        self.profile.write_text("y_plus,u_plus\n0.5,2.1\n1.5,3.8\n2.5,6.3\n11,30\n", encoding="utf-8")

    def test_known_norms(self):
        code, out, err = run_command(
            SCRIPT,
            self.profile,
            self.reference,
            *COLUMNS,
        )
        self.assertEqual(code, 0, err)
        self.assertAlmostEqual(norm("L2", out), math.sqrt((0.01 + 0.04 + 0.09) / 3.0), delta=PRINTED * 0.22)
        self.assertAlmostEqual(norm("Linf", out), 0.3, delta=PRINTED * 0.3)
        self.assertIn("at y_plus = 2.5", out)
        self.assertIn("points compared: 3 (1 outside the reference's range", out)

    def test_relative_norms_and_bounds(self):
        # Relative errors 0.1/2, -0.2/4, 0.3/6 are all 0.05.
        args = [
            self.profile,
            self.reference,
            *COLUMNS,
            "--relative",
        ]
        code, out, _ = run_command(SCRIPT, *args, "--max-linf", "0.051", "--max-l2", "0.051")
        self.assertEqual(code, 0)
        self.assertAlmostEqual(norm("L2", out), 0.05, delta=PRINTED * 0.05)
        self.assertIn("Linf within the bound 0.051", out)
        code, out, _ = run_command(SCRIPT, *args, "--max-linf", "0.049")
        self.assertEqual(code, 1)
        self.assertIn("Linf EXCEEDS the bound 0.049", out)

    def test_range_selects_points(self):
        code, out, _ = run_command(
            SCRIPT,
            self.profile,
            self.reference,
            *COLUMNS,
            "--range",
            "1",
            "3",
        )
        self.assertEqual(code, 0)
        self.assertIn("points compared: 2", out)
        self.assertAlmostEqual(norm("Linf", out), 0.3, delta=PRINTED * 0.3)

    def test_dns_table_against_itself(self):
        # The DNS table of tests/data, columns by the names of its '# columns:' line, compared with its own
        # rows written as a profile CSV: every error is zero.
        rows = [
            line.split()
            for line in MKM395.read_text().splitlines()
            if line.strip() and not line.startswith("#")
        ]
        copy = self.tmp / "dns.csv"
        copy.write_text("y_plus,u_plus\n" + "".join(f"{r[1]},{r[2]}\n" for r in rows), encoding="utf-8")
        code, out, err = run_command(
            SCRIPT, copy, MKM395, "--x", "y_plus", "--y", "u_plus", "--ref-x", "y+", "--ref-y", "U+"
        )
        self.assertEqual(code, 0, err)
        self.assertIn(f"points compared: {len(rows)}", out)
        self.assertEqual(norm("Linf", out), 0.0)

    def test_reference_without_names(self):
        bare = self.tmp / "bare.txt"
        bare.write_text("".join(f"{x} {2 * x + 1}\n" for x in range(11)), encoding="utf-8")
        args = [self.profile, bare, "--x", "y_plus", "--y", "u_plus", "--ref-x", "a", "--ref-y", "b"]
        code, _, err = run_command(SCRIPT, *args)
        self.assertEqual(code, 2)
        self.assert_one_line_error(err, "bare.txt:1", "no column names")
        code, out, _ = run_command(SCRIPT, *args, "--ref-names", "a,b")
        self.assertEqual(code, 0)
        self.assertAlmostEqual(norm("Linf", out), 0.3, delta=PRINTED * 0.3)

    def test_help(self):
        self.assert_help(SCRIPT, "--ref-x", "--max-linf", "L2 = sqrt", "examples:", "exit codes")

    def test_wrong_arguments(self):
        base = COLUMNS
        broken = self.tmp / "broken.csv"
        broken.write_text("y_plus,u_plus\n1,2\n3,oops\n", encoding="utf-8")
        cases = (
            ([self.tmp / "missing.csv", self.reference] + base, "missing.csv: no such file"),
            (
                [
                    self.profile,
                    self.reference,
                    "--x",
                    "yplus",
                    "--y",
                    "u_plus",
                    "--ref-x",
                    "x",
                    "--ref-y",
                    "y",
                ],
                "no column 'yplus'",
            ),
            ([broken, self.reference] + base, "broken.csv:3: column 'u_plus': expected a number"),
            ([self.profile, self.reference] + base + ["--range", "5", "1"], "LOW < HIGH"),
            ([self.profile, self.reference] + base + ["--range", "20", "30"], "no point"),
            ([self.profile, self.reference] + base[:-2], "--ref-y"),
            ([self.profile, self.reference] + base + ["--max-l2", "0"], "positive number"),
        )
        self.assert_bad_input(SCRIPT, "wallrans-profile-diff", cases)


if __name__ == "__main__":
    unittest.main()
