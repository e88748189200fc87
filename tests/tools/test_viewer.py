#!/usr/bin/python3
"""Opt-in (ctest -L viewer): every result format wallrans writes opens in the real viewer. A small
case runs on 2 ranks with intermediate fields; then ParaView's headless pvbatch opens fields.pvts,
the .pvd series and the checkpoint's .xmf with OpenDataFile (the reader a double-click picks) and
reports cell counts and cell arrays, which must match the run. Skipped (exit 77) without pvbatch.

Needs Debian's paraview and python3-paraview, which conflict with python3-vtk9 (apt removes
libvtk9-dev with it, so the build no longer configures): install them only for this test and
reinstall the build packages afterwards with tools/setup-deps.sh."""
import json
import shutil
import subprocess
import sys
import unittest

from tool_testing import TempDirTest, run_wallrans

CELLS = 24
# Runs inside pvbatch (ParaView's Python): one JSON line per file.
PVBATCH_SCRIPT = """\
import json, sys
from paraview.simple import OpenDataFile
for path in sys.argv[1:]:
    reader = OpenDataFile(path)
    if reader is None:
        print(json.dumps({"path": path, "error": "no reader"}))
        continue
    times = list(getattr(reader, "TimestepValues", []) or [])
    reader.UpdatePipeline(times[-1] if times else 0.0)
    info = reader.GetDataInformation()
    print(json.dumps({"path": path, "reader": reader.GetXMLName(), "cells": info.GetNumberOfCells(),
                      "arrays": sorted(reader.CellData.keys()), "times": len(times)}), flush=True)
"""


class Viewer(TempDirTest):
    def test_every_format_opens(self):
        pvbatch = shutil.which("pvbatch")
        case = {
            "title": "viewer_cavity",
            "flow": {"kinematic_viscosity": 0.01},
            "grid": {"generator": "cavity", "cells": [CELLS, CELLS]},
            "boundaries": [
                {"side": "top", "kind": "wall", "velocity": [1.0, 0.0]},
                {"side": "bottom", "kind": "wall"},
                {"side": "left", "kind": "wall"},
                {"side": "right", "kind": "wall"},
            ],
            "iterations": {"max": 20, "report_every": 0, "coarse_grids": 0},
            "output": {"fields_every": 5},
        }
        code, run = run_wallrans(case, self.tmp / "cavity", ranks=2)
        self.assertIn(code, (0, 3))
        series = sorted(run.glob("*.pvd"))
        xmf = sorted(run.glob("checkpoint_*.xmf"))
        self.assertTrue(series, "no .pvd series of the intermediate fields in the run directory")
        self.assertTrue(xmf, "no checkpoint .xmf in the run directory")
        paths = [run / "fields.pvts", series[0], xmf[-1]]
        script = self.tmp / "open_all.py"
        script.write_text(PVBATCH_SCRIPT, encoding="utf-8")
        done = subprocess.run(
            [pvbatch, str(script), *map(str, paths)],
            stdout=subprocess.PIPE,
            stderr=subprocess.STDOUT,
            text=True,
            timeout=300,
        )
        self.assertEqual(done.returncode, 0, f"pvbatch failed (a crash of a reader?):\n{done.stdout}")
        opened = {}
        for line in done.stdout.splitlines():
            if line.startswith("{"):
                record = json.loads(line)
                opened[record["path"]] = record
        self.assertEqual(sorted(opened), sorted(map(str, paths)), done.stdout)
        import h5py

        with h5py.File(xmf[-1].with_suffix(".h5"), "r") as checkpoint:
            checkpoint_fields = sorted(checkpoint["fields"].keys())
        expected = {
            paths[0]: {"velocity", "pressure", "eddy_viscosity", "solid"},
            paths[1]: {"velocity", "pressure"},
            paths[2]: set(checkpoint_fields),
        }
        for path, arrays in expected.items():
            record = opened[str(path)]
            self.assertNotIn("error", record, record)
            print(f"{path.name}: {record['reader']}, {record['cells']} cells, arrays {record['arrays']}")
            self.assertEqual(record["cells"], CELLS * CELLS, record)
            self.assertTrue(
                arrays <= set(record["arrays"]), f"{path.name}: missing {arrays - set(record['arrays'])}"
            )
        self.assertGreaterEqual(opened[str(series[0])]["times"], 4, "the series should hold iterations 5..20")


def viewer_missing():
    """Why the viewer cannot run here, or None. The paraview package alone leaves a pvbatch that
    cannot import paraview.simple (python3-paraview removed when the build packages come back)."""
    pvbatch = shutil.which("pvbatch")
    if pvbatch is None:
        return "pvbatch not found"
    probe = subprocess.run(
        [pvbatch, "-c", "from paraview.simple import OpenDataFile"],
        stdout=subprocess.PIPE,
        stderr=subprocess.STDOUT,
        text=True,
        timeout=120,
    )
    if probe.returncode != 0:
        return "pvbatch cannot import paraview.simple (python3-paraview missing)"
    return None


if __name__ == "__main__":
    missing = viewer_missing()
    if missing is not None:
        print(
            f"SKIPPED: {missing}. Install the viewer only for this test: apt-get install "
            "--no-install-recommends paraview python3-paraview (this removes libvtk9-dev), run "
            "ctest -L viewer, then reinstall the build packages with tools/setup-deps.sh."
        )
        sys.exit(77)
    unittest.main()
