"""The figures of `wallrans-plot`: residual history, Cf and Cp along each wall with the relevant
correlation or DNS, U+ against y+ with the DNS and the log law, and maps of the velocity
magnitude (with streamlines) and of nu_t/nu with solid cells masked. Every figure has one size,
FIGURE_INCHES at the chosen dpi."""
import matplotlib

matplotlib.use("Agg")
import matplotlib.pyplot as plt  # noqa: E402
import matplotlib.tri as mtri  # noqa: E402
import numpy as np  # noqa: E402

from . import references as ref  # noqa: E402
from .run_dir import wall_groups  # noqa: E402

FIGURE_INCHES = (10.0, 6.0)


def _figure(rows=1, sharex=True):
    fig, axes = plt.subplots(rows, 1, figsize=FIGURE_INCHES, sharex=sharex and rows > 1, squeeze=False)
    return fig, axes[:, 0]


def _save(fig, path, dpi):
    fig.savefig(path, dpi=dpi)  # no tight bounding box: the pixel size stays FIGURE_INCHES * dpi
    plt.close(fig)
    return path


def residuals(run, out, dpi):
    history = run.history()
    fig, (ax,) = _figure()
    iteration = history["iteration"]
    for name in history.names:
        if name.endswith("_residual"):
            values = np.where(history[name] > 0.0, history[name], np.nan)
            ax.semilogy(iteration, values, label=name[: -len("_residual")])
    drop = run.residual_drop()
    if drop:
        ax.axhline(drop, color="k", linestyle="--", linewidth=0.8, label=f"residual_drop {drop:g}")
    ax.set_xlabel("outer iteration")
    ax.set_ylabel("normalised residual")
    ax.set_title(f"{run.title()}: residual history ({run.model()})")
    ax.grid(True, which="both", alpha=0.3)
    ax.legend(loc="upper right", fontsize="small")
    return _save(fig, out / "residuals.png", dpi)


def bulk_velocity(fields):
    """Volume-weighted mean x-velocity over the fluid cells."""
    fluid = ~fields.solid_mask()
    volume = fields.scalar("cell_volume")
    return float(np.sum(fields.cells["velocity"][:, :, 0][fluid] * volume[fluid]) / np.sum(volume[fluid]))


def channel_scales(run, wall):
    """(height between the walls 2h, u_tau from the mean wall shear, Re_tau = u_tau h / nu) of a
    channel; the height from the horizontal walls of wall.csv (solid rows excluded)."""
    tau = np.abs(wall["wall_shear_stress"])
    u_tau = float(np.sqrt(np.mean(tau)))
    ys = [wall["y"][g.rows[0]] for g in wall_groups(wall) if g.is_horizontal_line(wall)]
    height = (max(ys) - min(ys)) if len(ys) >= 2 else float(run.case["grid"]["height"])
    return height, u_tau, u_tau * 0.5 * height / run.nu()


def _channel_wall_reference(run, wall, fields):
    """Cf on the bulk velocity and the reference lines: MKM DNS and Dean (1978)."""
    u_b = bulk_velocity(fields)
    height, _, re_tau = channel_scales(run, wall)
    dns = ref.nearest_channel_dns(re_tau)
    re_b = u_b * height / run.nu()
    lines = [
        (2.0 / dns.bulk_u_plus() ** 2, f"{dns.legend()}: Cf = 2/U_b+^2"),
        (float(ref.DEAN_CHANNEL(re_b)), f"{ref.DEAN_CHANNEL.legend()} at Re_b = {re_b:.0f}"),
    ]
    return 2.0 * wall["wall_shear_stress"] / u_b**2, f"Cf = 2 tau_w / U_b^2 (U_b = {u_b:.4g} m/s)", lines


def walls(run, out, dpi, fields):
    wall = run.wall()
    if wall is None:
        return []
    written = []
    kind, laminar = run.kind(), run.model() == "laminar"
    cf, cf_label, lines = wall["cf"], "Cf = 2 tau_w / U_ref^2", []
    if kind == "channel" and fields is not None:
        cf, cf_label, lines = _channel_wall_reference(run, wall, fields)
    groups = wall_groups(wall)
    bottom_y = min(wall["y"]) if len(wall["y"]) else 0.0
    for k, group in enumerate(groups, start=1):
        name, rows, vertical = group.name, group.rows, group.along_y
        along = wall["y"][rows] if vertical else wall["x"][rows]
        fig, (ax_cf, ax_cp) = _figure(rows=2)
        ax_cf.plot(along, cf[rows], "o-", markersize=2, label=f"wallrans, {cf_label}")
        for colour, (value, label) in zip(("C1", "C2"), lines):
            ax_cf.axhline(value, linestyle="--", linewidth=1.0, color=colour, label=label)
        if kind == "plate" and group.is_horizontal_line(wall) and abs(wall["y"][rows[0]] - bottom_y) < 1e-12:
            x = along[along > 0.0]
            re_x = run.reference_velocity() * x / run.nu()
            for key in ("blasius",) if laminar else ("white", "power-law"):
                correlation = ref.PLATE_CORRELATIONS[key]
                ax_cf.plot(x, correlation(re_x), "--", label=correlation.legend())
            ax_cp.axhline(0.0, color="0.5", linestyle=":", linewidth=1.0, label="zero pressure gradient")
        ax_cp.plot(along, wall["cp"][rows], "o-", markersize=2, color="C3", label="wallrans Cp")
        for ax, values in ((ax_cf, cf[rows]), (ax_cp, wall["cp"][rows])):
            if np.ptp(values) < 1e-9 * max(1.0, float(np.max(np.abs(values)))):  # constant: no round-off zoom
                ax.set_ylim(float(np.mean(values)) - 1e-3, float(np.mean(values)) + 1e-3)
        ax_cf.set_ylabel("Cf")
        ax_cp.set_ylabel("Cp = 2 (p - p_ref) / U_ref^2")
        ax_cp.set_xlabel(("y" if vertical else "x") + " [m]")
        ax_cf.set_title(
            f"{run.title()}: Cf and Cp, {name} (Cf > 0: near-wall flow along +x; vertical walls +y)"
        )
        for ax in (ax_cf, ax_cp):
            ax.grid(True, alpha=0.3)
            ax.legend(loc="best", fontsize="x-small")
        if kind == "plate" and not vertical:
            positive = cf[rows][along > 0.05 * max(along.max(), 1e-300)]
            if len(positive):
                ax_cf.set_ylim(0.0, 1.5 * float(np.max(np.abs(positive))))
        written.append(_save(fig, out / f"wall_{k}.png", dpi))
    return written


def profiles(run, out, dpi):
    found = run.profiles()
    if not found:
        return []
    fig, (ax,) = _figure()
    kind, laminar = run.kind(), run.model() == "laminar"
    if laminar and kind == "plate":
        table = ref.blasius_table()
        u_ref = run.reference_velocity()
        for x, prof in found:
            distance = prof.first_of("wall_distance", "y")
            eta = distance * np.sqrt(u_ref / (run.nu() * x)) if x > 0 else distance * np.nan
            ax.plot(
                eta,
                prof.first_of("u_tangential", "u") / u_ref,
                "o",
                markersize=3,
                label=f"wallrans, x = {x:g} m",
            )
        ax.plot(table["eta"], table["f'"], "k-", label=f"u/U = f'(eta), {ref.BLASIUS_SOURCE}")
        ax.set_xlim(0.0, 8.0)
        ax.set_xlabel("eta = y sqrt(U / (nu x))")
        ax.set_ylabel("u / U")
    else:
        y_plus_max, half_height, re_tau = 1.0, None, None
        if kind == "channel" and run.wall() is not None:
            height, _, re_tau = channel_scales(run, run.wall())
            half_height = 0.5 * height
        for x, prof in found:
            y_plus, u_plus = prof["y_plus"], prof["u_plus"]
            keep = y_plus > 0.0
            if half_height:  # the half of the channel next to the wall the profile is measured from
                keep &= prof.first_of("wall_distance", "y") <= half_height * (1 + 1e-9)
            ax.semilogx(y_plus[keep], u_plus[keep], "o", markersize=3, label=f"wallrans, x = {x:g} m")
            y_plus_max = max(y_plus_max, float(np.max(y_plus[keep], initial=1.0)))
        if kind == "channel":
            dns = ref.nearest_channel_dns(re_tau or y_plus_max)
            ax.semilogx(dns.y_plus[1:], dns.u_plus[1:], "k-", label=dns.legend())
        elif kind == "plate":
            table, header = ref.schlatter_orlu()
            keep = table["y+"] > 0
            ax.semilogx(table["y+"][keep], table["U+"][keep], "k-", label=ref.SCHLATTER_ORLU_SHORT)
        yp = np.logspace(-1, np.log10(max(y_plus_max, 10.0)), 200)
        ax.semilogx(yp[yp <= 12], yp[yp <= 12], ":", color="0.4", label="viscous sublayer U+ = y+")
        ax.semilogx(yp[yp >= 10], ref.log_law(yp[yp >= 10]), "--", color="0.4", label=ref.LOG_LAW["short"])
        ax.set_xlabel("y+")
        ax.set_ylabel("U+")
    ax.set_title(f"{run.title()}: velocity profiles ({run.model()})")
    ax.grid(True, which="both", alpha=0.3)
    ax.legend(loc="upper left", fontsize="x-small")
    return [_save(fig, out / "profiles.png", dpi)]


def _centre_triangulation(fields, cx, cy, solid):
    """Triangles between neighbouring cell centres of the structured grid; triangles touching a
    solid cell are masked, so interpolation never reaches into solids."""
    ny, nx = cx.shape
    index = np.arange(ny * nx).reshape(ny, nx)
    a, b, c, d = index[:-1, :-1], index[:-1, 1:], index[1:, 1:], index[1:, :-1]
    triangles = np.concatenate(
        [np.stack([a, b, c], -1).reshape(-1, 3), np.stack([a, c, d], -1).reshape(-1, 3)]
    )
    flat_solid = solid.ravel()
    mask = flat_solid[triangles].any(axis=1)
    return mtri.Triangulation(cx.ravel(), cy.ravel(), triangles, mask=mask)


def _map_axes(fields, title):
    fig, (ax,) = _figure()
    width, height = np.ptp(fields.x), np.ptp(fields.y)
    ax.set_aspect("equal" if max(width, height) / max(min(width, height), 1e-300) < 4.0 else "auto")
    ax.set_facecolor("0.55")  # solid cells are masked and show this grey
    ax.set_xlabel("x [m]")
    ax.set_ylabel("y [m]")
    ax.set_title(title)
    return fig, ax


def velocity_map(run, fields, out, dpi):
    solid = fields.solid_mask()
    velocity = fields.cells["velocity"]
    u, v = velocity[:, :, 0], velocity[:, :, 1]
    magnitude = np.ma.masked_where(solid, np.hypot(u, v))
    fig, ax = _map_axes(fields, f"{run.title()}: velocity magnitude [m/s] and streamlines (solid cells grey)")
    mesh = ax.pcolormesh(fields.x, fields.y, magnitude, shading="flat", cmap="viridis")
    fig.colorbar(mesh, ax=ax, label="|U| [m/s]")
    cx, cy = fields.centres()
    if cx.shape[0] > 1 and cx.shape[1] > 1:
        triangulation = _centre_triangulation(fields, cx, cy, solid)
        xs = np.linspace(cx.min(), cx.max(), 200)
        ys = np.linspace(cy.min(), cy.max(), 120)
        grid_x, grid_y = np.meshgrid(xs, ys)
        su = mtri.LinearTriInterpolator(triangulation, u.ravel())(grid_x, grid_y)
        sv = mtri.LinearTriInterpolator(triangulation, v.ravel())(grid_x, grid_y)
        if np.ma.count(su) > 0 and float(np.ma.max(np.hypot(su, sv))) > 0.0:
            ax.streamplot(
                xs,
                ys,
                su.filled(np.nan),
                sv.filled(np.nan),
                color="white",
                linewidth=0.6,
                density=1.2,
                arrowsize=0.7,
            )
    ax.set_xlim(fields.x.min(), fields.x.max())
    ax.set_ylim(fields.y.min(), fields.y.max())
    return _save(fig, out / "velocity.png", dpi)


def eddy_viscosity_map(run, fields, out, dpi):
    solid = fields.solid_mask()
    ratio = np.ma.masked_where(solid, fields.scalar("eddy_viscosity", 0.0) / run.nu())
    fig, ax = _map_axes(
        fields, f"{run.title()}: eddy-viscosity ratio nu_t/nu ({run.model()}; solid cells grey)"
    )
    mesh = ax.pcolormesh(fields.x, fields.y, ratio, shading="flat", cmap="magma")
    fig.colorbar(mesh, ax=ax, label="nu_t / nu")
    return _save(fig, out / "eddy_viscosity.png", dpi)


def figure(rows=1, sharex=False):
    """A figure of the standard size for other modules (the verification report)."""
    return _figure(rows, sharex)


def save(fig, path, dpi=120):
    return _save(fig, path, dpi)


def finish_axes(ax, xlabel, ylabel, title=None, legend_size="small"):
    """Labels, grid and legend of a report axis."""
    ax.set_xlabel(xlabel)
    ax.set_ylabel(ylabel)
    if title:
        ax.set_title(title)
    ax.grid(True, which="both", alpha=0.3)
    ax.legend(fontsize=legend_size)
