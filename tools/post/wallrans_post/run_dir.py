"""A wallrans run directory as the post-processing sees it: the resolved case, the summary, the
residual history, wall data, profiles and the final fields (fields.pvts, read with python3-vtk9)."""
import json
from pathlib import Path

import numpy as np

from .cli import InputError
from .tables import read_table

# Names of the residual history in this and earlier versions (first found wins); otherwise any CSV
# whose first column is `iteration`.
HISTORY_NAMES = ("residuals.csv",)


class Fields:
    """Final cell fields on the structured grid: nodes x, y of shape (ny+1, nx+1); cell arrays of
    shape (ny, nx) or (ny, nx, components)."""

    def __init__(self, x, y, cells):
        self.x, self.y, self.cells = x, y, cells
        self.ny, self.nx = x.shape[0] - 1, x.shape[1] - 1

    def centres(self):
        """Cell centres: the mean of the four corner nodes (as the solver defines them)."""
        cx = 0.25 * (self.x[:-1, :-1] + self.x[1:, :-1] + self.x[:-1, 1:] + self.x[1:, 1:])
        cy = 0.25 * (self.y[:-1, :-1] + self.y[1:, :-1] + self.y[:-1, 1:] + self.y[1:, 1:])
        return cx, cy

    def scalar(self, name, default=None):
        if name in self.cells:
            return self.cells[name]
        if default is not None:
            return np.full((self.ny, self.nx), default, dtype=float)
        raise InputError(f"fields: no cell array '{name}'; arrays: {', '.join(sorted(self.cells))}")

    def solid_mask(self):
        return self.scalar("solid", 0.0) > 0.5


def read_vtk_fields(path):
    """Reads a parallel structured-grid file (.pvts) with VTK's own reader."""
    try:
        from vtkmodules.util.numpy_support import vtk_to_numpy
        from vtkmodules.vtkIOXML import vtkXMLPStructuredGridReader
    except ImportError:
        raise InputError(
            "reading fields needs Debian's python3-vtk9 (tools/setup-deps.sh installs it)"
        ) from None
    if not Path(path).is_file():
        raise InputError(f"{path}: no such file")
    reader = vtkXMLPStructuredGridReader()
    reader.SetFileName(str(path))
    reader.Update()
    grid = reader.GetOutput()
    nx1, ny1, _ = grid.GetDimensions()
    if grid.GetNumberOfCells() == 0 or nx1 < 2 or ny1 < 2:
        raise InputError(f"{path}: no cells read (missing or damaged pieces?)")
    points = vtk_to_numpy(grid.GetPoints().GetData()).reshape(ny1, nx1, 3)
    cells = {}
    data = grid.GetCellData()
    for k in range(data.GetNumberOfArrays()):
        array = data.GetArray(k)
        values = vtk_to_numpy(array).astype(float)
        components = array.GetNumberOfComponents()
        shape = (ny1 - 1, nx1 - 1) if components == 1 else (ny1 - 1, nx1 - 1, components)
        cells[array.GetName()] = values.reshape(shape)
    return Fields(points[:, :, 0].copy(), points[:, :, 1].copy(), cells)


class RunDirectory:
    def __init__(self, path):
        self.path = Path(path)
        if not self.path.is_dir():
            raise InputError(f"{path}: not a directory (expected a wallrans run directory)")
        case_file = self.path / "case.resolved.yaml"
        if not case_file.is_file():
            raise InputError(f"{path}: no case.resolved.yaml (not a wallrans run directory)")
        import yaml  # Debian's python3-yaml

        try:
            self.case = yaml.safe_load(case_file.read_text(encoding="utf-8"))
        except yaml.YAMLError as error:
            raise InputError(f"{case_file}: not valid YAML: {str(error).splitlines()[0]}") from None
        summary_file = self.path / "summary.json"
        self.summary = {}
        if summary_file.is_file():
            try:
                self.summary = json.loads(summary_file.read_text(encoding="utf-8"))
            except json.JSONDecodeError as error:
                raise InputError(f"{summary_file}:{error.lineno}: not valid JSON: {error.msg}") from None

    # --- the case ---
    def title(self):
        return str(self.case.get("title", self.path.name))

    def nu(self):
        return float(self.case["flow"]["kinematic_viscosity"])

    def reference_velocity(self):
        return float(self.case["flow"].get("reference_velocity", 1.0))

    def model(self):
        turbulence = self.case.get("turbulence") or {}
        return str(turbulence.get("model", "laminar"))

    def kind(self):
        """'plate', 'channel' (streamwise periodic), 'cavity' or 'other'."""
        if (self.case.get("periodic") or {}).get("axis") == "x":
            return "channel"
        generator = (self.case.get("grid") or {}).get("generator")
        return generator if generator in ("plate", "cavity") else "other"

    def residual_drop(self):
        return float((self.case.get("iterations") or {}).get("residual_drop", 0.0)) or None

    # --- output files ---
    def history(self):
        for name in HISTORY_NAMES:
            if (self.path / name).is_file():
                return read_table(self.path / name)
        for candidate in sorted(self.path.glob("*.csv")):
            with open(candidate, encoding="utf-8") as stream:
                if stream.readline().startswith("iteration,"):
                    return read_table(candidate)
        raise InputError(f"{self.path}: no residual history (residuals.csv)")

    def wall(self):
        path = self.path / "wall.csv"
        return read_table(path) if path.is_file() else None

    def profiles(self):
        """(station x, table) of every profile file, by station."""
        found = []
        for path in sorted(self.path.glob("profile_*.csv")):
            table = read_table(path)
            found.append((float(table["x"][0]), table))
        return sorted(found, key=lambda item: item[0])

    def fields(self):
        return read_vtk_fields(self.path / "fields.pvts")


class WallGroup:
    """One wall: a name, its rows of wall.csv in order along it, and whether it runs along y."""

    def __init__(self, name, rows, along_y):
        self.name, self.rows, self.along_y = name, rows, along_y

    def is_horizontal_line(self, wall):
        """All its rows on one line y = const."""
        return not self.along_y and np.ptp(wall["y"][self.rows]) <= 1e-12 * max(
            1.0, abs(wall["y"][self.rows[0]])
        )


def wall_groups(wall):
    """Splits wall rows into walls: by the `segment` (and `side`) columns when the file has them,
    otherwise by shared coordinate (rows on one horizontal line y = const, or vertical line
    x = const); rows on neither form one group. Returns WallGroups."""
    x, y = wall["x"], wall["y"]
    if "segment" in wall:
        keys = wall.text("segment")
        if "side" in wall:
            keys = [f"{segment}, {side}" for segment, side in zip(keys, wall.text("side"))]
        groups = {}
        for k, key in enumerate(keys):
            groups.setdefault(key, []).append(k)
        result = []
        for key, rows in groups.items():
            rows = np.array(rows)
            along_y = np.ptp(y[rows]) > np.ptp(x[rows])
            along = y if along_y else x
            result.append(WallGroup(f"segment {key}", rows[np.argsort(along[rows])], along_y))
        return result
    scale = max(np.ptp(x), np.ptp(y), 1e-300)
    ykey, xkey = np.round(y / scale, 9), np.round(x / scale, 9)
    ycount = {v: int(np.sum(ykey == v)) for v in np.unique(ykey)}
    xcount = {v: int(np.sum(xkey == v)) for v in np.unique(xkey)}
    groups = {}
    for k in range(len(x)):
        on_y_line, on_x_line = ycount[ykey[k]], xcount[xkey[k]]
        if max(on_y_line, on_x_line) < 2:
            groups.setdefault(("other", 0.0), []).append(k)
        elif on_y_line >= on_x_line:
            groups.setdefault(("y", y[k]), []).append(k)
        else:
            groups.setdefault(("x", x[k]), []).append(k)
    result = []
    for (axis, value), rows in sorted(groups.items(), key=lambda item: (item[0][0], item[0][1])):
        rows = np.array(rows)
        along_y = axis == "x"
        rows = rows[np.argsort((y if along_y else x)[rows])]
        name = "wall" if axis == "other" else f"wall at {axis} = {value:.6g}"
        result.append(WallGroup(name, rows, along_y))
    return result
