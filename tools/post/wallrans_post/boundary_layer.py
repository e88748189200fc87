"""Boundary-layer quantities of a plate run along the grid columns above the bottom wall, from the
output files (fields.pvts and wall.csv). The same definitions as
tests/verification/plate_boundary_layer.hpp: edge at the largest u of the column, integrals by the
trapezoidal rule from the wall through the cell centres, Cf = 2 tau_w / U_e^2."""
import numpy as np

from .cli import InputError


class Column:
    """Cell centres of one bottom-wall column: normal distance y from the bottom face, velocity u
    along the face, and the face's shear stress tau_w (per unit density)."""

    def __init__(self, x, y, u, nut, shear_stress, first_cell_distance):
        self.x, self.y, self.u, self.nut = x, y, u, nut
        self.shear_stress, self.first_cell_distance = shear_stress, first_cell_distance


class BottomWall:
    """The bottom faces of a run and the wall.csv rows on them (matched by face centre)."""

    def __init__(self, fields, wall):
        self.fields = fields
        x0, y0 = fields.x[0, :], fields.y[0, :]
        self.face_x = 0.5 * (x0[:-1] + x0[1:])
        face_y = 0.5 * (y0[:-1] + y0[1:])
        tangent = np.stack([x0[1:] - x0[:-1], y0[1:] - y0[:-1]], axis=-1)
        tangent /= np.linalg.norm(tangent, axis=-1, keepdims=True)
        self.tangent = tangent
        self.normal = np.stack([-tangent[:, 1], tangent[:, 0]], axis=-1)  # into the domain
        self.face_centre = np.stack([self.face_x, face_y], axis=-1)
        self.shear = np.full(fields.nx, np.nan)
        self.first_distance = np.full(fields.nx, np.nan)
        scale = max(np.ptp(fields.x), np.ptp(fields.y))
        for k in range(len(wall["x"])):
            distance = np.hypot(self.face_x - wall["x"][k], face_y - wall["y"][k])
            i = int(np.argmin(distance))
            if distance[i] < 1e-9 * scale:
                self.shear[i] = wall["wall_shear_stress"][k]
                self.first_distance[i] = wall["first_cell_distance"][k]

    def is_wall(self, i):
        return np.isfinite(self.shear[i])

    def column(self, i):
        if not self.is_wall(i):
            raise InputError(
                f"wall.csv: no wall row at the bottom face of column {i} (x = {self.face_x[i]:g})"
            )
        cx, cy = self.fields.centres()
        offset = np.stack([cx[:, i], cy[:, i]], axis=-1) - self.face_centre[i]
        y = offset @ self.normal[i]
        velocity = self.fields.cells["velocity"][:, i, :2]
        u = velocity @ self.tangent[i]
        nut = self.fields.scalar("eddy_viscosity", 0.0)[:, i]
        return Column(self.face_x[i], y, u, nut, self.shear[i], self.first_distance[i])


class Layer:
    """Integral quantities of one column (edge-based)."""

    def __init__(self, column, nu):
        self.x = column.x
        edge = int(np.argmax(column.u))
        ue = column.u[edge]
        self.edge_velocity = ue
        y = np.concatenate([[0.0], column.y[: edge + 1]])
        u = np.concatenate([[0.0], column.u[: edge + 1] / ue])
        self.displacement_thickness = float(np.sum(0.5 * ((1 - u[:-1]) + (1 - u[1:])) * np.diff(y)))
        self.momentum_thickness = float(
            np.sum(0.5 * (u[:-1] * (1 - u[:-1]) + u[1:] * (1 - u[1:])) * np.diff(y))
        )
        above = np.nonzero(u >= 0.99)[0]
        self.delta99 = 0.0
        if len(above):
            j = int(above[0])
            self.delta99 = float(y[j - 1] + (0.99 - u[j - 1]) / (u[j] - u[j - 1]) * (y[j] - y[j - 1]))
        self.re_theta = ue * self.momentum_thickness / nu
        self.cf = 2.0 * column.shear_stress / ue**2
        self.u_tau = float(np.sqrt(abs(column.shear_stress)))


def layer_at(bottom, x, nu):
    """Linear interpolation between the two wall columns whose face centres bracket x."""
    left = int(np.searchsorted(bottom.face_x, x)) - 1
    left = min(max(left, 0), len(bottom.face_x) - 2)
    a, b = Layer(bottom.column(left), nu), Layer(bottom.column(left + 1), nu)
    w = (x - a.x) / (b.x - a.x)
    mixed = Layer.__new__(Layer)
    for name in vars(a):
        setattr(mixed, name, (1.0 - w) * getattr(a, name) + w * getattr(b, name))
    mixed.x = x
    return mixed


def nearest_column(bottom, x):
    return int(np.argmin(np.abs(bottom.face_x - x)))
