#!/usr/bin/python3
"""wallrans-verification-report: runs every case, writes a complete report whose pass/fail agrees
with the tests that make the same checks (run beside it for the cheaper cases); it fails when a
reference it reads is wrong; --help and wrong arguments."""
import json
import math
import os
import shutil
import unittest

from tool_testing import BUILD_DIR, PROGRAM, SOURCE_DIR, TempDirTest, png_size, run_command

SCRIPT = "wallrans_verify.py"
ALL_CASES = ["poiseuille", "cavity", "blasius", "channel", "plate"]
# The tests run beside the report: the cheaper ones (the cavity and channel tests run Re 400/1000 and
# Re_tau 180/590 as well, about a minute more; the checked-in report compares all five).
COMPARED = ["poiseuille", "blasius", "plate"]
CHECK_FIELDS = ("quantity", "reference", "source", "value", "error", "tolerance", "derivation", "test")


class VerificationReport(TempDirTest):
    def test_every_case_agrees_with_its_tests(self):
        out = self.tmp / "report"
        code, stdout, stderr = run_command(
            SCRIPT,
            "--out",
            out,
            "--program",
            PROGRAM,
            "--jobs",
            2,
            "--compare-tests",
            BUILD_DIR,
            "--compare-cases",
            ",".join(COMPARED),
        )
        self.assertEqual(code, 0, stdout + stderr)
        results = json.loads((out / "results.json").read_text())
        self.assertEqual([case["key"] for case in results["cases"]], ALL_CASES)
        for case in results["cases"]:
            # The default suite requires the tests of every case to pass, so agreeing means passing; the
            # compared cases show the tests' own verdict beside the report's.
            self.assertTrue(case["passed"], case["key"])
            if case["key"] in COMPARED:
                self.assertIs(case["test_passed"], True, case["key"])
                self.assertIs(case["agrees_with_tests"], True, case["key"])
            else:
                self.assertIsNone(case["test_passed"], case["key"])
            self.assertGreaterEqual(len(case["checks"]), 3, case["key"])
            for check in case["checks"]:
                for field in CHECK_FIELDS:
                    self.assertTrue(str(check[field]).strip(), f"{case['key']}: empty {field}")
                self.assertTrue(
                    check["test"].startswith(case["test_file"].split("/")[-1][:-4]), check["test"]
                )
            self.assertTrue(all(run["status"] == "converged" for run in case["runs"]), case["key"])
            self.assertTrue(case["figures"], case["key"])
            for figure in case["figures"]:
                path = out / "figures" / figure["file"]
                self.assertGreater(path.stat().st_size, 10000, figure["file"])
                self.assertEqual(png_size(path), (1200, 720), figure["file"])
        studies = {case["key"]: case["grid_studies"] for case in results["cases"]}
        for key in ("cavity", "blasius", "channel", "plate"):
            three_grid = [s for s in studies[key] if len(s["grids"]) == 3]
            self.assertTrue(three_grid, key)
            for study in three_grid:
                self.assertTrue(math.isfinite(study["results"]["order"]), key)
                self.assertGreater(study["results"]["gci21"], 0.0, key)
        self.assertGreater(studies["poiseuille"][0]["results"]["order"], 1.8)
        readme = (out / "README.md").read_text()
        self.assertIn("RANS results are model-dependent", readme)
        self.assertIn("Celik et al. (2008)", readme)
        self.assertEqual(
            readme.count("| **pass** |"), sum(len(c["checks"]) for c in results["cases"]) + len(ALL_CASES)
        )
        self.assertFalse((out / "runs").exists())  # removed without --keep-runs

    def test_fails_when_a_reference_is_wrong(self):
        # The Blasius table with f''(0) raised by 3 %: the report reads it, so Cf sqrt(Re_x) (2 % tolerance)
        # must fail, and the report exits 1 and says FAIL.
        data = self.tmp / "data"
        shutil.copytree(SOURCE_DIR / "tests" / "data", data)
        table = data / "blasius-ganapol2010" / "blasius_ganapol2010.dat"
        lines = table.read_text().splitlines()
        first = next(k for k, line in enumerate(lines) if line.strip() and not line.startswith("#"))
        eta, f, fp, fpp = lines[first].split()
        lines[first] = f"{eta} {f} {fp} {1.03 * float(fpp):.9E}"
        table.write_text("\n".join(lines) + "\n")
        out = self.tmp / "report"
        code, stdout, _ = run_command(
            SCRIPT,
            "--out",
            out,
            "--program",
            PROGRAM,
            "--cases",
            "blasius",
            env=dict(os.environ, WALLRANS_DATA_DIR=str(data)),
        )
        self.assertEqual(code, 1, stdout)
        case = json.loads((out / "results.json").read_text())["cases"][0]
        self.assertFalse(case["passed"])
        verdicts = {c["quantity"].split(" ")[0]: c["passed"] for c in case["checks"]}
        self.assertFalse(verdicts["Cf"])
        self.assertIn("**FAIL**", (out / "README.md").read_text())

    def test_help(self):
        self.assert_help(SCRIPT, "--out", "--cases", "--compare-tests", "exit codes", "Moser, Kim & Mansour")

    def test_wrong_arguments(self):
        self.assert_bad_input(
            SCRIPT,
            "wallrans-verification-report",
            (
                (["--out", self.tmp / "r", "--cases", "cavity,nonsense"], "--cases cavity,nonsense"),
                (["--out", self.tmp / "r", "--program", self.tmp / "nothing"], "not an executable"),
                (["--out", self.tmp / "r", "--compare-cases", "cavity"], "--compare-tests"),
                (["--out", self.tmp / "r", "--compare-tests", self.tmp], "no test program"),
                (["--cases", "cavity"], "--out"),
                (["--out", self.tmp / "r", "--jobs", "0"], "positive integer"),
            ),
        )
        self.assertFalse((self.tmp / "r" / "runs").exists())  # nothing was run


if __name__ == "__main__":
    unittest.main()
