"""Runs wallrans on the cases of the verification report: each run gets its own case file (a
shipped config with a few keys changed) and run directory, and runs as a user would run it
(`wallrans run CASE --output-dir DIR`); several runs go side by side."""
import concurrent.futures
import copy
import os
import shutil
import subprocess
import time
from pathlib import Path

import yaml

from .cli import InputError
from .run_dir import RunDirectory

HERE = Path(__file__).resolve().parent


def resource(kind):
    """A folder or file shipped with wallrans: 'configs', 'data' or 'channel1d' (the 1-D channel
    solver), in the source tree or in an installation (share/wallrans)."""
    source_tree = {
        "configs": HERE.parents[2] / "configs",
        "data": HERE.parents[2] / "tests" / "data",
        "channel1d": HERE.parents[2] / "tools" / "channel1d.py",
    }
    installed = {
        "configs": HERE.parents[1] / "configs",
        "data": HERE.parents[1] / "data",
        "channel1d": HERE.parents[1] / "tools" / "channel1d.py",
    }
    for place in (source_tree, installed):
        if place[kind].exists():
            return place[kind]
    raise InputError(f"cannot find the shipped {kind} (run from the source tree or an installation)")


def find_program(given):
    """The wallrans program: --program, else $WALLRANS_PROGRAM, build/wallrans of the source tree,
    bin/ of the installation, or PATH."""

    def executable(candidate):
        return candidate and Path(candidate).is_file() and os.access(candidate, os.X_OK)

    if given:
        if not executable(given):
            raise InputError(f"--program {given}: not an executable file")
        return Path(given).resolve()
    for candidate in (
        os.environ.get("WALLRANS_PROGRAM"),
        HERE.parents[2] / "build" / "wallrans",
        HERE.parents[3] / "bin" / "wallrans",
        shutil.which("wallrans"),
    ):
        if executable(candidate):
            return Path(candidate).resolve()
    raise InputError("wallrans program not found (build it, or give --program PATH)")


def load_config(name):
    path = resource("configs") / f"{name}.yaml"
    with open(path, encoding="utf-8") as stream:
        return yaml.safe_load(stream)


def modified(config, changes):
    """A deep copy of config with dotted keys set, e.g. {'grid.cells': [4, 96]}."""
    case = copy.deepcopy(config)
    for dotted, value in changes.items():
        node = case
        keys = dotted.split(".")
        for key in keys[:-1]:
            node = node.setdefault(key, {})
        node[keys[-1]] = value
    return case


def coarsened_plate(config, numerator, denominator):
    """A plate case of the same grid family with every cell count times numerator/denominator
    (exactly) and the first-cell height and leading-edge spacing divided by that ratio."""

    def count(n):
        if n * numerator % denominator:
            raise ValueError(f"{n} cells do not coarsen by {numerator}/{denominator}")
        return n * numerator // denominator

    g, stretch = config["grid"], denominator / numerator
    return modified(
        config,
        {
            "grid.cells": [count(g["cells"][0]), count(g["cells"][1])],
            "grid.run_up_cells": count(g["run_up_cells"]),
            "grid.first_cell_height": g["first_cell_height"] * stretch,
            "grid.leading_edge_spacing": g["leading_edge_spacing"] * stretch,
        },
    )


def family(runs, prefix):
    """Names of the runs `prefix` + cell count, finest first."""
    return sorted((n for n in runs if n.startswith(prefix)), key=lambda n: -int(n[len(prefix) :]))


class Run:
    """One wallrans run: its case, where it ran, how it ended."""

    def __init__(self, name, case):
        self.name, self.case = name, case
        self.exit_code, self.seconds, self.directory = None, 0.0, None

    def status(self):
        return (
            RunDirectory(self.directory).summary.get("status", "no summary") if self.directory else "not run"
        )

    def result(self):
        return RunDirectory(self.directory)

    def cells(self):
        return self.case["grid"]["cells"]

    def iterations(self):
        return RunDirectory(self.directory).summary.get("iterations")


class Runner:
    def __init__(self, program, work, ranks, jobs, mpiexec):
        self.program, self.work, self.ranks, self.jobs, self.mpiexec = (
            program,
            Path(work),
            ranks,
            jobs,
            mpiexec,
        )
        self.work.mkdir(parents=True, exist_ok=True)

    def _run_one(self, run):
        folder = self.work / run.name
        if folder.exists():
            shutil.rmtree(folder)
        folder.mkdir(parents=True)
        case_file = folder / "case.yaml"
        run.case["output"] = dict(run.case.get("output") or {}, directory=str(folder / "out"))
        case_file.write_text(yaml.safe_dump(run.case, sort_keys=False), encoding="utf-8")
        command = [str(self.program), "run", str(case_file), "--output-dir", str(folder / "out"), "--quiet"]
        if self.ranks > 1:
            command = [self.mpiexec, "-n", str(self.ranks)] + command
        start = time.monotonic()
        with open(folder / "log.txt", "w", encoding="utf-8") as log:
            run.exit_code = subprocess.call(command, stdout=log, stderr=subprocess.STDOUT)
        run.seconds = time.monotonic() - start
        run.directory = folder / "out"
        return run

    def run_all(self, runs):
        """Runs every Run (self.jobs at a time); returns them by name."""
        largest_first = sorted(runs, key=lambda run: -run.cells()[0] * run.cells()[1])
        with concurrent.futures.ThreadPoolExecutor(max_workers=self.jobs) as pool:
            done = list(pool.map(self._run_one, largest_first))
        return {run.name: run for run in done}
