"""What a verification case reports: its checks (quantity, reference and source, our value, the
error, the tolerance and its derivation, pass/fail, the test that makes the same check), its grid
study (observed order, GCI) and its figures."""
import math

from . import plots


class Check:
    def __init__(self, quantity, reference, source, value, error, tolerance, derivation, passed, test):
        self.quantity, self.reference, self.source = quantity, reference, source
        self.value, self.error, self.tolerance, self.derivation = value, error, tolerance, derivation
        self.passed, self.test = bool(passed), test

    def as_dict(self):
        return dict(vars(self))


class GridStudy:
    """A quantity on a grid sequence: grids (finest first), values, and the method's results."""

    def __init__(self, quantity, grids, values, method, results, note=""):
        self.quantity, self.grids, self.values = quantity, grids, values
        self.method, self.results, self.note = method, results, note

    def as_dict(self):
        return {
            "quantity": self.quantity,
            "grids": self.grids,
            "values": self.values,
            "method": self.method,
            "results": {
                k: (None if isinstance(v, float) and not math.isfinite(v) else v)
                for k, v in self.results.items()
            },
            "note": self.note,
        }


class CaseResult:
    def __init__(self, key, title, config, description, test_file):
        self.key, self.title, self.config, self.description, self.test_file = (
            key,
            title,
            config,
            description,
            test_file,
        )
        self.checks, self.studies, self.figures, self.runs, self.notes = [], [], [], [], []
        self.test_verdict = None  # set when the mirrored tests were run (--compare-tests)

    def passed(self):
        return bool(self.checks) and all(check.passed for check in self.checks)

    def add_figure(self, fig, folder, name, caption):
        """Saves fig as folder/name (the report's figure size) and lists it with its caption."""
        self.figures.append((plots.save(fig, folder / name).name, caption))

    def agrees(self):
        return None if self.test_verdict is None else self.test_verdict == self.passed()

    def as_dict(self):
        return {
            "key": self.key,
            "title": self.title,
            "config": self.config,
            "description": self.description,
            "test_file": self.test_file,
            "passed": self.passed(),
            "test_passed": self.test_verdict,
            "agrees_with_tests": self.agrees(),
            "checks": [c.as_dict() for c in self.checks],
            "grid_studies": [s.as_dict() for s in self.studies],
            "figures": [{"file": f, "caption": c} for f, c in self.figures],
            "runs": self.runs,
            "notes": self.notes,
        }


def run_record(run):
    """What the report says about one run: grid, status, iterations, seconds."""
    return {
        "name": run.name,
        "cells": run.cells(),
        "status": run.status(),
        "exit_code": run.exit_code,
        "iterations": run.iterations() if run.directory else None,
        "seconds": round(run.seconds, 1),
    }


def converged_check(run, test):
    """The run converged (every normalised residual below the case's residual drop)."""
    status = run.status()
    drop = run.case["iterations"]["residual_drop"]
    return Check(
        "run status",
        "converged",
        "residual drop of the case file",
        status,
        "-",
        f"every normalised residual < {drop:g}",
        "the checks below hold for a converged solution",
        status == "converged",
        test,
    )


class VerificationCase:
    """A case of the report: plan() lists its runs, plan_after(runs) any runs that need the results
    of the first ones, evaluate(runs, figures) makes its CaseResult. `tests` names the test programs
    and gtest filters that make the same checks."""

    key = config = test_file = ""
    tests = []

    def plan_after(self, runs):
        return []

    def new_result(self, title, description, runs):
        """The CaseResult of this case, listing `runs` (finest grid first)."""
        result = CaseResult(self.key, title, self.config, description, self.test_file)
        result.runs = [run_record(run) for run in runs]
        return result
