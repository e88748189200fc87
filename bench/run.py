#!/usr/bin/python3
"""The wallrans benchmark: a fixed set of cases on 1 and 2 ranks, with a memory-bandwidth ceiling
measured in the same run. Writes bench/results/latest.json and latest.md. See bench/README.md.

It builds nothing: configure and build first (cmake --build build), then run bench/run.py.
Python standard library only.
"""
import argparse
import datetime
import json
import math
import os
import platform
import re
import shutil
import socket
import subprocess
import sys
import tempfile
import time
from pathlib import Path

REPO = Path(__file__).resolve().parent.parent
BENCH = REPO / "bench"
RESIDUAL_DROP = 1.0e-6  # the target residual drop of the iteration counts
STAGE_PREFIX = "wr_"  # our PETSc log stages (solver/coupling/iteration_stages.hpp)
# Column order and short headers of the phases in the Markdown table; stages not listed here
# still appear in the JSON.
PHASES = [
    ("wr_momentum_assembly", "mom asm"),
    ("wr_momentum_solve", "mom solve"),
    ("wr_pressure_assembly", "p asm"),
    ("wr_pressure_solve", "p solve"),
    ("wr_correction_gradients", "corr/grad"),
    ("wr_turbulence", "turb"),
    ("wr_monitors", "monitors"),
]
TARGETS = {
    "growth_per_doubling": 1.3,
    "plate_67k_seconds_1_rank": 60.0,
    "plate_207k_seconds_2_ranks": 180.0,
    "us_per_cell_iteration_1_rank": 1.0,
    "speedup_fraction_of_triad": 0.8,
}


# ---------------------------------------------------------------------------------------------
# The case set. Grids of one family: the shipped plate grid refined by `scale` in both directions,
# with the first-cell height and the leading-edge spacing divided by it (as the plate GCI test
# does), so the first-cell y+ stays below 1 and the grids differ only in resolution.


def plate_case(name, scale, quick=False):
    def overrides(base):
        nx, ny = scaled(base["grid.cells"], scale)
        run_up = scaled([base["grid.run_up_cells"]], scale)[0]
        return {
            "title": f"bench_{name}",
            "grid.cells": f"[{nx}, {ny}]",
            "grid.run_up_cells": str(run_up),
            "grid.first_cell_height": fmt(float(base["grid.first_cell_height"]) / scale),
            "grid.leading_edge_spacing": fmt(float(base["grid.leading_edge_spacing"]) / scale),
            "iterations.residual_drop": fmt(RESIDUAL_DROP),
        }

    return {
        "name": name,
        "family": "plate",
        "scale": scale,
        "config": "configs/plate_sa.yaml",
        "reads": ["grid.cells", "grid.run_up_cells", "grid.first_cell_height", "grid.leading_edge_spacing"],
        "overrides": overrides,
        "quick": quick,
        "description": f"turbulent flat plate, SA, shipped grid x {scale:g}",
    }


# SA channel at Re_tau = 1000 (nu = 1/1000 in wall units), derived from the Re_tau 395 case:
# first-cell height 1 wall unit at 96 cells across, halved per doubling.
def channel_case(name, cells_y, quick=False):
    def overrides(_base):
        return {
            "title": f"bench_{name}",
            "flow.kinematic_viscosity": "1.0e-3",
            "flow.reference_velocity": "20.0",  # about the bulk velocity in wall units
            "flow.initial_velocity": "[20.0, 0.0]",
            "grid.cells": f"[4, {cells_y}]",
            "grid.first_cell_height": fmt(1.0e-3 * 96 / cells_y),
            "iterations.residual_drop": fmt(RESIDUAL_DROP),
        }

    return {
        "name": name,
        "family": "channel",
        "scale": cells_y / 96,
        "config": "configs/channel_sa_re395.yaml",
        "reads": [],
        "overrides": overrides,
        "quick": quick,
        "description": f"periodic channel, SA, Re_tau 1000, {cells_y} cells across",
    }


CASES = [
    plate_case("plate_17k", 1, quick=True),
    plate_case("plate_67k", 2),
    plate_case("plate_207k", 3.5),
    channel_case("channel_y96", 96, quick=True),
    channel_case("channel_y192", 192),
]
# Consecutive grids of one family, for the iteration growth per 2x refinement.
REFINEMENTS = [("plate_17k", "plate_67k"), ("plate_67k", "plate_207k"), ("channel_y96", "channel_y192")]


def scaled(values, scale):
    out = []
    for v in values:
        n = int(v) * scale
        if abs(n - round(n)) > 1e-9:
            raise SystemExit(f"bench: cell count {v} x {scale} is not an integer")
        out.append(int(round(n)))
    return out


def fmt(x):
    return f"{x:.6g}"


# ---------------------------------------------------------------------------------------------
# Case files: a copy of a shipped YAML file with some keys of its top-level sections replaced.
# The shipped files use block mappings with two-space indentation, which is all this handles;
# wallrans itself validates the result (`wallrans check`) before any run.

SECTION_RE = re.compile(r"^([A-Za-z_]\w*):(.*)$")


def split_key(dotted):
    parts = dotted.split(".")
    if len(parts) > 2:
        raise ValueError(f"bench: key '{dotted}': only section.key is supported")
    return (None, parts[0]) if len(parts) == 1 else (parts[0], parts[1])


def find_key(lines, dotted):
    """Index of the line holding `dotted`, or (None, insertion index) if the section lacks it."""
    section, key = split_key(dotted)
    key_re = re.compile((r"^\s+" if section else r"^") + re.escape(key) + r":")
    if section is None:
        for k, line in enumerate(lines):
            if key_re.match(line):
                return k, None
        return None, len(lines)
    section_re = re.compile(r"^" + re.escape(section) + r":\s*(#.*)?$")
    start = next((k for k, line in enumerate(lines) if section_re.match(line)), None)
    if start is None:
        raise ValueError(f"bench: section '{section}' not found (only block sections are supported)")
    end = start + 1
    while end < len(lines) and (lines[end].startswith(" ") or not lines[end].strip()):
        end += 1
    for k in range(start + 1, end):
        if key_re.match(lines[k]):
            return k, None
    while end > start + 1 and not lines[end - 1].strip():
        end -= 1
    return None, end


def read_key(text, dotted):
    lines = text.splitlines()
    k, _ = find_key(lines, dotted)
    if k is None:
        raise ValueError(f"bench: key '{dotted}' not found")
    value = lines[k].split(":", 1)[1].split("#", 1)[0].strip()
    if value.startswith("[") and value.endswith("]"):
        return [v.strip() for v in value[1:-1].split(",")]
    return value


def override(text, values):
    lines = text.splitlines()
    for dotted, value in values.items():
        section, key = split_key(dotted)
        indent = "  " if section else ""
        new = f"{indent}{key}: {value}  # bench"
        k, insert_at = find_key(lines, dotted)
        if k is not None:
            lines[k] = new
        else:
            lines.insert(insert_at, new)
    return "\n".join(lines) + "\n"


def write_case(case, workdir):
    source = REPO / case["config"]
    text = source.read_text()
    base = {key: read_key(text, key) for key in case["reads"]}
    values = case["overrides"](base)
    header = f"# Written by bench/run.py from {case['config']}; keys marked '# bench' are replaced.\n"
    path = workdir / case["name"] / "case.yaml"
    path.parent.mkdir(parents=True, exist_ok=True)
    path.write_text(header + override(text, values))
    return path, values


# ---------------------------------------------------------------------------------------------
# Running things.


def mpi_env():
    env = dict(os.environ)
    env.setdefault("OMPI_ALLOW_RUN_AS_ROOT", "1")
    env.setdefault("OMPI_ALLOW_RUN_AS_ROOT_CONFIRM", "1")
    return env


def mpirun(ranks):
    launcher = shutil.which("mpirun") or shutil.which("mpiexec")
    if not launcher:
        raise SystemExit("bench: mpirun not found (Debian: openmpi-bin)")
    extra = ["--oversubscribe"] if ranks > len(os.sched_getaffinity(0)) else []
    return [launcher, "-n", str(ranks)] + extra


def command_output(cmd, cwd=REPO):
    try:
        return subprocess.run(cmd, cwd=cwd, capture_output=True, text=True, check=True).stdout.strip()
    except (OSError, subprocess.CalledProcessError):
        return None


def machine_info(build_dir):
    cpu = None
    try:
        for line in Path("/proc/cpuinfo").read_text().splitlines():
            if line.startswith("model name"):
                cpu = line.split(":", 1)[1].strip()
                break
    except OSError:
        pass
    memory_gib = None
    try:
        for line in Path("/proc/meminfo").read_text().splitlines():
            if line.startswith("MemTotal:"):
                memory_gib = round(int(line.split()[1]) / 1024**2, 1)
    except OSError:
        pass
    load = os.getloadavg()
    dirty = command_output(["git", "status", "--porcelain", "--untracked-files=no"])
    return {
        "date": datetime.datetime.now().astimezone().isoformat(timespec="seconds"),
        "host": socket.gethostname(),
        "cpu_model": cpu,
        "cores": os.cpu_count(),
        "cores_available": len(os.sched_getaffinity(0)),
        "memory_gib": memory_gib,
        "kernel": platform.release(),
        "git_commit": command_output(["git", "rev-parse", "HEAD"]),
        "git_branch": command_output(["git", "rev-parse", "--abbrev-ref", "HEAD"]),
        "git_dirty": bool(dirty) if dirty is not None else None,
        "wallrans_version": command_output([str(build_dir / "wallrans"), "version"]),
        "mpirun_version": (command_output(mpirun(1)[:1] + ["--version"]) or "").split("\n")[0] or None,
        "load_average_start": [round(x, 2) for x in load],
        # Load from other work at start; above ~0.5 the 2 cores were shared and times are noisy.
        "busy_at_start": load[0] > 0.5,
    }


def run_triad(build_dir, processes, mib):
    cmd = mpirun(processes) + [str(build_dir / "bench" / "wallrans_triad"), str(mib), "10"]
    out = subprocess.run(cmd, capture_output=True, text=True, env=mpi_env())
    if out.returncode != 0:
        raise SystemExit(f"bench: triad with {processes} process(es) failed:\n{out.stderr}")
    return json.loads(out.stdout.strip().splitlines()[-1])


def parse_petsc_log(path):
    """Per-stage, per-rank times of our stages from -log_view ...:ascii_info_detail."""
    stage = r'^Stages\["(' + STAGE_PREFIX + r'[^"]*)"\]'
    summary = re.compile(stage + r'\["summary"\]\[(\d+)\] = \{"time" : ([^,]+),')
    event = re.compile(stage + r'\["([^"]+)"\]\[(\d+)\] = \{"count" : (\d+), "time" : ([^,]+),')
    stages, events = {}, {}
    with open(path) as log:
        for line in log:
            m = summary.match(line)
            if m:
                stages.setdefault(m.group(1), {})[int(m.group(2))] = float(m.group(3))
                continue
            m = event.match(line)
            if m and m.group(2) != "summary" and int(m.group(4)) > 0:
                stage_events = events.setdefault(m.group(1), {})
                name = m.group(2)
                stage_events[name] = max(stage_events.get(name, 0.0), float(m.group(5)))
    return stages, events


def peak_rss_kib(prefix, ranks):
    total = 0
    for rank in range(ranks):
        try:
            total += int(Path(f"{prefix}.{rank}").read_text().split()[0])
        except (OSError, ValueError, IndexError):
            return None
    return total


def read_history(path):
    try:
        lines = path.read_text().splitlines()
    except OSError:
        return None
    if len(lines) < 2:
        return None
    header = lines[0].split(",")
    rows = [[float(x) for x in line.split(",")] for line in lines[1:] if line.strip()]
    return {name: [row[k] for row in rows] for k, name in enumerate(header)}


def run_case(case, case_file, ranks, build_dir, workdir, cap):
    rundir = workdir / case["name"] / f"np{ranks}"
    if rundir.exists():
        shutil.rmtree(rundir)
    rundir.mkdir(parents=True)
    log = rundir / "petsc_log.txt"
    cmd = mpirun(ranks) + [sys.executable, str(BENCH / "peak_rss.py"), str(rundir / "peak_rss")]
    cmd += [str(build_dir / "wallrans"), "run", str(case_file), "--output-dir", str(rundir)]
    cmd += ["--max-iterations", str(cap), "--quiet", "-log_view", f":{log}:ascii_info_detail"]
    load = os.getloadavg()[0]
    t0 = time.monotonic()
    with open(rundir / "stdout.txt", "w") as out, open(rundir / "stderr.txt", "w") as err:
        code = subprocess.run(cmd, stdout=out, stderr=err, env=mpi_env()).returncode
    wall = time.monotonic() - t0
    status = {0: "converged", 3: "not converged (cap)", 4: "diverged"}.get(code, f"failed (exit {code})")
    result = {
        "case": case["name"],
        "ranks": ranks,
        "status": status,
        "exit_code": code,
        "converged": code == 0,
        "wall_time_s": round(wall, 3),
        "load_average_at_start": round(load, 2),
        "run_directory": str(rundir),
    }
    if code not in (0, 3, 4):
        result["error"] = (rundir / "stderr.txt").read_text()[-2000:]
    summary_path = rundir / "summary.json"
    if summary_path.exists():
        summary = json.loads(summary_path.read_text())
        result["cells"] = summary["cells"][0] * summary["cells"][1]
        result["grid"] = summary["cells"]
        result["iterations"] = summary["iterations"]
        # With a nested start, the coarse-grid iterations in units of fine-grid iterations
        # (iterations x cells / fine cells) are added: growth and cost per iteration use this.
        result["coarse_grids"] = summary.get("coarse_grids", [])
        result["work_iterations"] = summary.get("work_in_fine_grid_iterations", summary["iterations"])
        result["solver_time_s"] = summary["wall_time_s"]
        result["final_residuals"] = summary["residuals"]
    history = read_history(rundir / "residuals.csv")
    if history and history.get("iteration"):
        result.setdefault("iterations", int(history["iteration"][-1]))
        n = len(history["iteration"])
        result["momentum_linear_its_per_iteration"] = round(sum(history["momentum_linear_its"]) / n, 2)
        result["pressure_linear_its_per_iteration"] = round(sum(history["pressure_linear_its"]) / n, 2)
    if log.exists():
        stages, events = parse_petsc_log(log)
        per_rank_loop = {}
        for times in stages.values():
            for rank, t in times.items():
                per_rank_loop[rank] = per_rank_loop.get(rank, 0.0) + t
        mean = {name: sum(t.values()) / len(t) for name, t in stages.items() if t}
        total = sum(mean.values())
        loop = max(per_rank_loop.values()) if per_rank_loop else None
        result["iteration_loop_s"] = round(loop, 3) if loop is not None else None
        result["stage_seconds"] = {name: round(v, 4) for name, v in mean.items()}
        result["phase_shares"] = {name: round(v / total, 4) for name, v in mean.items()} if total > 0 else {}
        # PETSc events that take at least 5 % of their stage (times inclusive, max over ranks).
        result["stage_events_s"] = {}
        for name, ev in events.items():
            floor = 0.05 * mean.get(name, 0.0)
            big = sorted(((e, t) for e, t in ev.items() if t >= floor), key=lambda x: -x[1])
            result["stage_events_s"][name] = {e: round(t, 4) for e, t in big}
        cells, its = result.get("cells"), result.get("work_iterations", result.get("iterations"))
        if loop and cells and its:
            result["us_per_cell_iteration"] = round(loop / (cells * its) * 1e6, 4)
    rss = peak_rss_kib(rundir / "peak_rss", ranks)
    if rss is not None:
        result["peak_rss_mib_total"] = round(rss / 1024, 1)
        if result.get("cells"):
            result["peak_rss_kib_per_cell"] = round(rss * 1.024 / result["cells"], 3)  # kB (1000 B)
    return result


# ---------------------------------------------------------------------------------------------
# Derived numbers and the report.


def find(results, case, ranks):
    return next((r for r in results if r["case"] == case and r["ranks"] == ranks), None)


def derived(results, triad, cases_by_name, ranks_list):
    out = {"growth": [], "speedup": [], "targets": []}
    ratio = triad["2"]["gb_per_s"] / triad["1"]["gb_per_s"] if "1" in triad and "2" in triad else None
    out["triad_ratio_2_over_1"] = round(ratio, 3) if ratio else None
    for coarse, fine in REFINEMENTS:
        if coarse not in cases_by_name or fine not in cases_by_name:
            continue
        doublings = math.log2(cases_by_name[fine]["scale"] / cases_by_name[coarse]["scale"])
        for ranks in ranks_list:
            a, b = find(results, coarse, ranks), find(results, fine, ranks)
            if not a or not b or not a.get("iterations") or not b.get("iterations") or not a["converged"]:
                continue
            work = lambda r: r.get("work_iterations") or r["iterations"]
            growth = (work(b) / work(a)) ** (1.0 / doublings)
            out["growth"].append({"coarse": coarse, "fine": fine, "ranks": ranks,
                                  "per_doubling": round(growth, 3), "lower_bound": not b["converged"]})
    for name in cases_by_name:
        one, two = find(results, name, 1), find(results, name, 2)
        if one and two and one.get("us_per_cell_iteration") and two.get("us_per_cell_iteration"):
            s = one["us_per_cell_iteration"] / two["us_per_cell_iteration"]
            entry = {"case": name, "speedup_per_iteration": round(s, 3)}
            if one["converged"] and two["converged"]:
                entry["speedup_time_to_converge"] = round(one["wall_time_s"] / two["wall_time_s"], 3)
            if ratio:
                entry["fraction_of_triad_ratio"] = round(s / ratio, 3)
            out["speedup"].append(entry)

    # Every target gets a row; met is None where the run it needs was not made or did not finish.
    def target(what, goal, measured=None, met=None, note=""):
        out["targets"].append({"target": what, "measured": measured, "goal": goal, "met": met, "note": note})

    g_goal = TARGETS["growth_per_doubling"]
    ranks = min(ranks_list)
    for coarse, fine in REFINEMENTS:
        what = f"iterations growth per 2x refinement, {coarse} -> {fine} ({ranks} rank)"
        key = (coarse, fine, ranks)
        g = next((g for g in out["growth"] if (g["coarse"], g["fine"], g["ranks"]) == key), None)
        if g:
            measured = f"{'> ' if g['lower_bound'] else ''}{g['per_doubling']:.2f}x"
            note = "fine grid not converged: lower bound" if g["lower_bound"] else ""
            met = (not g["lower_bound"]) and g["per_doubling"] <= g_goal
            target(what, f"<= {g_goal}x", measured, met, note)
        else:
            a = find(results, coarse, ranks)
            ran = a and find(results, fine, ranks)
            target(what, f"<= {g_goal}x", note="coarse grid not converged" if ran else "not run")
    time_targets = (("plate_67k", 1, "plate_67k_seconds_1_rank"),
                    ("plate_207k", 2, "plate_207k_seconds_2_ranks"))
    for name, ranks, key in time_targets:
        r, goal = find(results, name, ranks), TARGETS[key]
        what = f"{name} time to converge on {ranks} rank{'s' if ranks > 1 else ''}"
        if r:
            met = r["converged"] and r["wall_time_s"] <= goal
            note = "" if r["converged"] else r["status"]
            target(what, f"<= {goal:.0f} s", f"{r['wall_time_s']:.0f} s", met, note)
        else:
            target(what, f"<= {goal:.0f} s", note="not run")
    # The cost target is about the plate; the 4-column channel is dominated by per-iteration
    # overheads (its numbers are in the run table).
    goal = TARGETS["us_per_cell_iteration_1_rank"]
    plate_runs = [r for r in results if r["ranks"] == 1 and r.get("us_per_cell_iteration")
                  and cases_by_name[r["case"]]["family"] == "plate"]
    for r in plate_runs:
        target(f"us per cell per outer iteration, {r['case']} (1 rank)", f"<= {goal}",
               f"{r['us_per_cell_iteration']:.2f}", r["us_per_cell_iteration"] <= goal)
    if not plate_runs:
        target("us per cell per outer iteration, plate (1 rank)", f"<= {goal}", note="not run")
    frac = TARGETS["speedup_fraction_of_triad"]
    what = "2-rank speed-up per iteration, plate_207k"
    s = next((s for s in out["speedup"] if s["case"] == "plate_207k"), None)
    if s and ratio:
        goal = f">= {frac} x triad ratio {ratio:.2f} = {frac * ratio:.2f}"
        target(what, goal, f"{s['speedup_per_iteration']:.2f}", s["speedup_per_iteration"] >= frac * ratio)
    else:
        target(what, f">= {frac} x triad ratio", note="not run")
    return out


def cell(x, spec="{:.2f}", missing="-"):
    return missing if x is None else spec.format(x)


def markdown(report):
    m = report["machine"]
    lines = [f"# wallrans bench, {m['date']}", ""]
    commit = (m["git_commit"] or "unknown")[:12] + (" (uncommitted changes)" if m["git_dirty"] else "")
    lines.append(f"Commit {commit} on {m['git_branch']}; {m['cpu_model']}, {m['cores']} cores, "
                 f"{m['memory_gib']} GiB; {m['wallrans_version']}.")
    load = ", ".join(f"{x:.2f}" for x in m["load_average_start"])
    busy = "**busy: other work was running, times are noisy**" if m["busy_at_start"] else "quiet"
    lines.append(f"Load average at start {load} ({busy}); at end "
                 f"{', '.join(f'{x:.2f}' for x in m['load_average_end'])}.")
    opts = report["options"]
    lines.append(f"Mode {'quick' if opts['quick'] else 'full'}, ranks {opts['ranks']}, iteration cap "
                 f"{opts['max_iterations']}, residual drop {RESIDUAL_DROP:g}, bench time "
                 f"{report['bench_seconds'] / 60:.1f} min.")
    lines += ["", "## Memory bandwidth (triad, best of start and end of the run)", "",
              "| processes | GB/s | per process GB/s |", "|---|---|---|"]
    for p, t in sorted(report["triad"].items()):
        per = ", ".join(f"{x:.1f}" for x in t["per_process_gb_per_s"])
        lines.append(f"| {p} | {t['gb_per_s']:.1f} | {per} |")
    lines.append(f"\nRatio 2/1: {cell(report['derived']['triad_ratio_2_over_1'])}.")
    lines += ["", "## Runs", ""]
    head = ["case", "grid", "cells", "ranks", "iterations", "work", "status", "wall s", "us/cell/it", "peak MiB",
            "kB/cell"] + [short for _, short in PHASES]
    lines.append("| " + " | ".join(head) + " |")
    lines.append("|" + "---|" * len(head))
    for r in report["runs"]:
        grid = "x".join(str(n) for n in r["grid"]) if r.get("grid") else "-"
        shares = r.get("phase_shares", {})
        row = [r["case"], grid, cell(r.get("cells"), "{}"), str(r["ranks"]), cell(r.get("iterations"), "{}"),
               cell(r.get("work_iterations"), "{:.0f}"), r["status"], f"{r['wall_time_s']:.1f}", cell(r.get("us_per_cell_iteration")),
               cell(r.get("peak_rss_mib_total"), "{:.0f}"), cell(r.get("peak_rss_kib_per_cell"), "{:.2f}")]
        row += [cell(100 * shares[name] if name in shares else None, "{:.1f} %") for name, _ in PHASES]
        lines.append("| " + " | ".join(row) + " |")
    d = report["derived"]
    if d["speedup"]:
        lines += ["", "## 2 ranks vs 1", "", "| case | speed-up per iteration | speed-up to converge | "
                  "fraction of triad ratio |", "|---|---|---|---|"]
        for s in d["speedup"]:
            row = [s["case"], cell(s["speedup_per_iteration"]), cell(s.get("speedup_time_to_converge")),
                   cell(s.get("fraction_of_triad_ratio"))]
            lines.append("| " + " | ".join(row) + " |")
    lines += ["", "## Targets (issue 7)", "", "| target | measured | goal | met |", "|---|---|---|---|"]
    for t in d["targets"]:
        met = "-" if t["met"] is None else "yes" if t["met"] else "no"
        measured = t["measured"] or t["note"] or "-"
        if t["measured"] and t["note"]:
            measured += f" ({t['note']})"
        lines.append(f"| {t['target']} | {measured} | {t['goal']} | {met} |")
    lines += ["", "Columns: bench/README.md. Phase shares are of the time inside the outer iterations "
              "(PETSc log stages, mean over ranks)."]
    return "\n".join(lines) + "\n"


README_START, README_END = "<!-- bench:latest:start -->", "<!-- bench:latest:end -->"


def update_readme(path, table):
    """Replaces the block between the markers in bench/README.md by the table (title dropped)."""
    text = path.read_text()
    if README_START not in text or README_END not in text:
        raise SystemExit(f"bench: {path} has no {README_START} ... {README_END} block")
    body = table.split("\n", 1)[1].lstrip("\n").replace("\n## ", "\n### ")
    head, rest = text.split(README_START, 1)
    tail = rest.split(README_END, 1)[1]
    path.write_text(f"{head}{README_START}\n{body}{README_END}{tail}")


# ---------------------------------------------------------------------------------------------


def parse_args():
    p = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    p.add_argument("--build-dir", default="build", help="CMake build folder with wallrans (default: build, "
                   "relative to the current folder, else to the repository)")
    p.add_argument("--quick", action="store_true", help="only the smallest grids, to try the harness")
    p.add_argument("--only", action="append", default=[], metavar="NAME",
                   help="run only these cases (repeat or comma-separate); see --list")
    p.add_argument("--max-iterations", type=int, default=20000, metavar="N",
                   help="outer-iteration cap per run (default 20000); capped runs count as not converged")
    p.add_argument("--ranks", default="1,2", help="rank counts, comma-separated (default 1,2)")
    p.add_argument("--work-dir", help="folder for case files and run outputs (default: a new folder in /tmp)")
    p.add_argument("--results-dir", default=str(BENCH / "results"), help="where latest.json/.md go")
    p.add_argument("--triad-mib", type=int, default=160,
                   help="MiB per triad array (default 160; 3 arrays per process)")
    p.add_argument("--update-readme", action="store_true", help="also copy the table into bench/README.md")
    p.add_argument("--list", action="store_true", help="list the cases and exit")
    return p.parse_args()


def main():
    args = parse_args()
    if args.list:
        for c in CASES:
            print(f"{c['name']:14s} {'quick ' if c['quick'] else '      '}{c['description']}")
        return 0
    build_dir = Path(args.build_dir)
    if not build_dir.is_absolute() and not (build_dir / "wallrans").exists():
        build_dir = REPO / build_dir
    build_dir = build_dir.resolve()
    for exe in (build_dir / "wallrans", build_dir / "bench" / "wallrans_triad"):
        if not exe.exists():
            raise SystemExit(f"bench: {exe} not found; build first (cmake --build {build_dir})")
    try:
        ranks_list = sorted({int(x) for x in args.ranks.split(",") if x.strip()})
    except ValueError:
        raise SystemExit(f"bench: --ranks: expected comma-separated integers, got '{args.ranks}'")
    if not ranks_list or min(ranks_list) < 1:
        raise SystemExit("bench: --ranks: expected positive rank counts")
    if args.max_iterations < 1:
        raise SystemExit("bench: --max-iterations: expected a positive integer")
    only = {name for item in args.only for name in item.split(",") if name}
    unknown = only - {c["name"] for c in CASES}
    if unknown:
        names = [c["name"] for c in CASES]
        raise SystemExit(f"bench: unknown case(s) {sorted(unknown)}; expected some of {names}")
    cases = [c for c in CASES if (not only or c["name"] in only) and (not args.quick or c["quick"])]
    if not cases:
        raise SystemExit("bench: no case selected")
    if args.work_dir:
        workdir = Path(args.work_dir).resolve()
    else:
        workdir = Path(tempfile.mkdtemp(prefix="wallrans-bench-"))
    workdir.mkdir(parents=True, exist_ok=True)

    started = time.monotonic()
    machine = machine_info(build_dir)
    print(f"bench: work folder {workdir}; load average {machine['load_average_start']}", flush=True)
    # Every case file is checked before the first run, so a bad override fails in seconds.
    case_files = {}
    for case in cases:
        path, values = write_case(case, workdir)
        check = subprocess.run([str(build_dir / "wallrans"), "check", str(path)], capture_output=True,
                               text=True, env=mpi_env())
        if check.returncode != 0:
            raise SystemExit(f"bench: derived case {path} is invalid:\n{check.stdout}{check.stderr}")
        case_files[case["name"]] = (path, values)

    triads = {str(p): [run_triad(build_dir, p, args.triad_mib)] for p in (1, 2)}
    print("bench: triad " + ", ".join(f"{p}: {t[0]['gb_per_s']:.1f} GB/s" for p, t in triads.items()),
          flush=True)
    results = []
    for case in cases:
        for ranks in ranks_list:
            print(f"bench: {case['name']} on {ranks} rank(s) ...", end=" ", flush=True)
            r = run_case(case, case_files[case["name"]][0], ranks, build_dir, workdir, args.max_iterations)
            r["overrides"] = case_files[case["name"]][1]
            r["config"] = case["config"]
            results.append(r)
            print(f"{r['status']}, {r.get('iterations')} iterations, {r['wall_time_s']:.1f} s, "
                  f"{cell(r.get('us_per_cell_iteration'))} us/cell/it", flush=True)
            if r["exit_code"] == 2:
                path = case_files[case["name"]][0]
                raise SystemExit(f"bench: wallrans rejected {path}:\n{r.get('error', '')}")
    for p in (1, 2):
        triads[str(p)].append(run_triad(build_dir, p, args.triad_mib))
    triad = {p: max(t, key=lambda x: x["gb_per_s"]) for p, t in triads.items()}
    machine["load_average_end"] = [round(x, 2) for x in os.getloadavg()]

    by_name = {c["name"]: c for c in cases}
    report = {
        "format": "wallrans-bench",
        "format_version": 1,
        "machine": machine,
        "options": {"quick": args.quick, "only": sorted(only), "ranks": ranks_list,
                    "max_iterations": args.max_iterations, "residual_drop": RESIDUAL_DROP,
                    "build_dir": (str(build_dir.relative_to(REPO)) if build_dir.is_relative_to(REPO) else str(build_dir)), "work_dir": str(workdir)},
        "cases": {c["name"]: {"config": c["config"], "description": c["description"], "scale": c["scale"]}
                  for c in cases},
        "triad": triad,
        "triad_all": triads,
        "runs": results,
        "targets": TARGETS,
        "bench_seconds": round(time.monotonic() - started, 1),
    }
    report["derived"] = derived(results, triad, by_name, ranks_list)
    out = Path(args.results_dir)
    out.mkdir(parents=True, exist_ok=True)
    (out / "latest.json").write_text(json.dumps(report, indent=2) + "\n")
    table = markdown(report)
    (out / "latest.md").write_text(table)
    if args.update_readme:
        update_readme(BENCH / "README.md", table)
    minutes = report["bench_seconds"] / 60
    print(f"bench: wrote {out / 'latest.json'} and {out / 'latest.md'} ({minutes:.1f} min)")
    return 0


if __name__ == "__main__":
    sys.exit(main())
