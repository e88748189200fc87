#!/usr/bin/python3
"""Skin friction along the bottom wall of backward-facing step runs, from their wall.csv files.

Plots Cf = 2 tau_w / U_ref^2 (the wall.csv column cf) on the wall below the step, x > 0, y = 0,
against x / step height (the step cases of configs/ have step height 1 m at x = 0), one line per
run, with the reattachment points (sign changes of the wall shear, linear interpolation between
face centres as in solver/coupling/wall_shear_zeros). Writes a PNG; needs Debian's matplotlib.
With --table, also prints a Markdown table of Cf at the given x/h (linear between face centres).
Usage: tools/plot_step_cf.py OUT.png LABEL=RUN_DIR [LABEL=RUN_DIR ...] [--reference X_R:LABEL ...]
       [--table 1,2,4,6,8]
"""
import argparse
import csv
import sys

import matplotlib

matplotlib.use("Agg")
import matplotlib.pyplot as plt  # noqa: E402


def bottom_wall(path):
    """(x, cf, tau) of the wall faces with y = 0 and x > 0, sorted by x."""
    with open(path, newline="") as f:
        rows = [r for r in csv.DictReader(f)]
    faces = [(float(r["x"]), float(r["cf"]), float(r["wall_shear_stress"]))
             for r in rows if abs(float(r["y"])) <= 1e-9 and float(r["x"]) > 0.0]
    return sorted(faces)


def interpolate(faces, x):
    """Cf at x, linear between the two face centres around it."""
    for (x0, c0, _), (x1, c1, _) in zip(faces, faces[1:]):
        if x0 <= x <= x1:
            return c0 + (c1 - c0) * (x - x0) / (x1 - x0)
    return float("nan")


def reattachments(faces):
    """Positions where the wall shear turns from negative to positive."""
    out = []
    for (x0, _, t0), (x1, _, t1) in zip(faces, faces[1:]):
        if t0 < 0.0 <= t1 and t1 != 0.0:
            out.append(x0 - t0 * (x1 - x0) / (t1 - t0))
    return out


def main():
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("png")
    parser.add_argument("runs", nargs="+", help="LABEL=RUN_DIRECTORY (holding wall.csv)")
    parser.add_argument("--reference", action="append", default=[],
                        help="X_R:LABEL, a reference reattachment length drawn as a vertical line")
    parser.add_argument("--title", default="")
    parser.add_argument("--xmax", type=float, default=20.0)
    parser.add_argument("--table", default="", help="comma-separated x/h stations for a Cf table")
    args = parser.parse_args()
    stations = [float(x) for x in args.table.split(",")] if args.table else []
    table = []
    fig, ax = plt.subplots(figsize=(8, 4.2))
    for run in args.runs:
        label, _, directory = run.partition("=")
        faces = bottom_wall(directory + "/wall.csv")
        if not faces:
            sys.exit(f"{directory}/wall.csv: no bottom-wall faces downstream of the step")
        xr = reattachments(faces)
        table.append((label, [interpolate(faces, x) for x in stations], xr))
        line, = ax.plot([f[0] for f in faces], [f[1] for f in faces], label=label, lw=1.2)
        if xr:
            ax.plot([xr[-1]], [0.0], "o", color=line.get_color(), ms=4)
    for ref in args.reference:
        x, _, label = ref.partition(":")
        ax.axvline(float(x), color="k", ls="--", lw=0.8)
        ax.text(float(x), ax.get_ylim()[1], " " + label, va="top", fontsize=8)
    ax.axhline(0.0, color="0.6", lw=0.6)
    ax.set_xlim(0.0, args.xmax)
    ax.set_xlabel("x / h (step face at x = 0)")
    ax.set_ylabel("Cf = 2 tau_w / U_ref^2, bottom wall")
    if args.title:
        ax.set_title(args.title, fontsize=10)
    ax.legend(fontsize=8)
    ax.grid(alpha=0.3)
    fig.tight_layout()
    fig.savefig(args.png, dpi=120)
    if stations:
        print("| run | " + " | ".join(f"Cf at x/h = {x:g}" for x in stations) + " | min Cf (x/h) | x_r/h |")
        print("|---" * (len(stations) + 3) + "|")
        for (label, values, xr), run in zip(table, args.runs):
            faces = bottom_wall(run.partition("=")[2] + "/wall.csv")
            low = min(faces, key=lambda f: f[1])
            cells = " | ".join(f"{v:.2e}" for v in values)
            print(f"| {label} | {cells} | {low[1]:.2e} ({low[0]:.2f}) | {xr[-1]:.3f} |" if xr else
                  f"| {label} | {cells} | {low[1]:.2e} ({low[0]:.2f}) | none |")


if __name__ == "__main__":
    main()
