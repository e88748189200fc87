#!/usr/bin/python3
"""Skin friction along the bottom wall of the periodic hill on the grids of the three-grid study.

Reads the hill_gci_<nx>x<ny>_bottom_wall.csv files that tests/validation/test_hill_gci.cpp writes
into its working directory (build/tests) and draws Cf = 2 tau_w / U_b^2 against x/h, with the
floor contour below and the wall-resolved LES ranges of the separation and reattachment points
(recalled from memory in the shared reference README; not verified) as shaded bands.

usage: tools/plot_hill_cf.py [DIRECTORY] [OUTPUT.png]
"""
import glob
import os
import sys

import matplotlib

matplotlib.use("Agg")
import matplotlib.pyplot as plt
import numpy as np


def main():
    directory = sys.argv[1] if len(sys.argv) > 1 else "build/tests"
    output = sys.argv[2] if len(sys.argv) > 2 else "docs/validation-hill-cf.png"
    files = glob.glob(os.path.join(directory, "hill_gci_*_bottom_wall.csv"))
    if not files:
        sys.exit(f"{directory}: expected hill_gci_*_bottom_wall.csv files (run test_hill_gci_np2), got none")
    cells = lambda path: int(os.path.basename(path).split("_")[2].split("x")[0])
    files.sort(key=cells, reverse=True)
    fig, (top, bottom) = plt.subplots(2, 1, sharex=True, figsize=(8, 5.5),
                                      gridspec_kw={"height_ratios": [3, 1]})
    for path, style in zip(files, ["-", "--", ":"]):
        data = np.genfromtxt(path, delimiter=",", names=True)
        label = os.path.basename(path).split("_")[2].replace("x", " x ")
        top.plot(data["x_over_h"], data["cf"], style, color="k", lw=1.0, label=f"SA, {label}")
    top.axhline(0.0, color="0.5", lw=0.5)
    top.axvspan(0.19, 0.22, color="tab:blue", alpha=0.25, label="LES separation 0.19-0.22 (from memory)")
    top.axvspan(4.6, 4.7, color="tab:red", alpha=0.25, label="LES reattachment 4.6-4.7 (from memory)")
    top.set_ylabel(r"$C_f = 2\tau_w / U_b^2$")
    top.legend(fontsize=8, loc="upper center")
    top.set_title(r"Periodic hill, $Re_h$ = 10 595: bottom-wall skin friction")
    data = np.genfromtxt(files[0], delimiter=",", names=True)
    bottom.fill_between(data["x_over_h"], 0.0, data["floor_y_over_h"], color="0.8")
    bottom.plot(data["x_over_h"], data["floor_y_over_h"], color="k", lw=0.8)
    bottom.set_ylabel("y/h")
    bottom.set_xlabel("x/h")
    bottom.set_xlim(0.0, 9.0)
    bottom.set_ylim(0.0, 1.2)
    fig.tight_layout()
    fig.savefig(output, dpi=120)
    print(f"wrote {output}")


if __name__ == "__main__":
    main()
