#!/usr/bin/python3
"""wallrans-wall-spacing: the first-cell height that puts the first cell at a target y+, from a
published skin-friction correlation."""
import math
import sys
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))

from wallrans_post import cli  # noqa: E402
from wallrans_post import references as ref  # noqa: E402

PROG = "wallrans-wall-spacing"
EXAMPLES = """\
  wallrans-wall-spacing --reynolds 1e7 --length 1.0               # turbulent plate, y+ = 1 at x = L
  wallrans-wall-spacing --reynolds 1e7 --length 1.0 --at 0.5 --y-plus 0.5 --correlation power-law
  wallrans-wall-spacing --reynolds 1e5 --length 1.0 --correlation blasius    # laminar plate
  wallrans-wall-spacing --flow channel --reynolds 13764 --length 2.0         # Re_b = U_b H / nu

How it works: u_tau / U = sqrt(Cf / 2), so the wall distance of the first cell centre for the target
is y = y+ (nu / U) / sqrt(Cf / 2) with nu / U = length / Reynolds. wallrans measures y+ at the centre
of the first cell (wall.csv, first_cell_y_plus), so grid.first_cell_height is twice that distance on
a grid whose first cell is orthogonal to the wall. The skin friction of a plate falls downstream:
the same spacing gives a larger y+ upstream, which the table of stations shows.

exit codes: 0 printed; 2 bad input (missing or non-positive value, station off the plate, a
correlation that does not fit the flow)."""


def plate(args):
    if args.at is not None and args.at > args.length:
        raise cli.InputError(
            f"--at {args.at:g}: expected a station on the plate, 0 < x <= --length ({args.length:g})"
        )
    correlation = ref.PLATE_CORRELATIONS[args.correlation or "white"]
    station = args.at if args.at is not None else args.length
    nu_over_u = args.length / args.reynolds
    re_x = args.reynolds * station / args.length
    if correlation.key == "white" and 0.06 * re_x <= 1.5:
        raise cli.InputError(
            f"--reynolds: Re_x = {re_x:.4g} at x = {station:g} is far below the range of "
            f"{correlation.short} (turbulent flow)"
        )
    cf = float(correlation(re_x))
    u_tau_over_u = math.sqrt(0.5 * cf)
    distance = args.y_plus * nu_over_u / u_tau_over_u
    print(
        f"flat plate: Re_L = {args.reynolds:.6g} on L = {args.length:g} m, target first-cell y+ = {args.y_plus:g} "
        f"at x = {station:g} m (Re_x = {re_x:.6g})"
    )
    print(f"skin-friction correlation: {correlation.short}, {correlation.formula}")
    print(f"  source: {correlation.source}")
    if correlation.key != "blasius" and re_x < 5e5:
        print(
            f"  note: Re_x = {re_x:.3g} is below about 5e5, where a plate boundary layer is usually still laminar"
        )
    _print_spacing(cf, u_tau_over_u, distance)
    print("y+ of the first cell centre with this spacing along the plate (the correlation at each x):")
    print(f"  {'x [m]':>10} {'Re_x':>12} {'Cf':>11} {'y+':>8}")
    for fraction in (0.05, 0.1, 0.25, 0.5, 1.0):
        x = fraction * args.length
        re_xs = args.reynolds * fraction
        if correlation.key == "white" and 0.06 * re_xs <= 1.5:
            continue
        cf_x = float(correlation(re_xs))
        print(f"  {x:10.4g} {re_xs:12.4g} {cf_x:11.4e} {distance * math.sqrt(0.5 * cf_x) / nu_over_u:8.3f}")


def channel(args):
    if args.correlation not in (None, "dean"):
        raise cli.InputError(f"--correlation {args.correlation}: a channel takes 'dean' (Dean 1978)")
    if args.at is not None:
        raise cli.InputError("--at: a fully developed channel has no streamwise station")
    correlation = ref.DEAN_CHANNEL
    cf = float(correlation(args.reynolds))
    u_tau_over_u = math.sqrt(0.5 * cf)
    distance = args.y_plus * (args.length / args.reynolds) / u_tau_over_u
    print(
        f"plane channel: Re_b = U_b H / nu = {args.reynolds:.6g}, full height H = {args.length:g} m, "
        f"target first-cell y+ = {args.y_plus:g}"
    )
    print(f"skin-friction correlation: {correlation.short}, {correlation.formula}")
    print(f"  source: {correlation.source}")
    _print_spacing(cf, u_tau_over_u, distance)
    print(f"estimated Re_tau = u_tau (H/2) / nu = {0.5 * args.reynolds * u_tau_over_u:.1f}")


def _print_spacing(cf, u_tau_over_u, distance):
    print(f"Cf = {cf:.4e}, u_tau / U = sqrt(Cf/2) = {u_tau_over_u:.4e}")
    print(f"first cell centre at {distance:.4e} m from the wall")
    print(f"grid.first_cell_height: {2.0 * distance:.3e}   # the cell is twice the centre's wall distance")


def main(argv):
    parser = cli.Parser(
        PROG, "First-cell height for a target y+ from a published skin-friction correlation.", EXAMPLES
    )
    parser.add_argument(
        "--reynolds",
        type=cli.positive_number,
        required=True,
        help="plate: U L / nu on --length; channel: bulk U_b H / nu on the full height",
    )
    parser.add_argument(
        "--length", type=cli.positive_number, required=True, help="plate length or channel full height [m]"
    )
    parser.add_argument(
        "--y-plus",
        type=cli.positive_number,
        default=1.0,
        help="target y+ at the first cell centre (default 1; wallrans' models need < 1)",
    )
    parser.add_argument("--flow", choices=("plate", "channel"), default="plate", help="default: plate")
    parser.add_argument(
        "--correlation",
        choices=("white", "power-law", "blasius", "dean"),
        help="plate: white (default), power-law, blasius (laminar); channel: dean",
    )
    parser.add_argument(
        "--at", type=cli.positive_number, help="plate station x from the leading edge [m] (default L)"
    )
    args = parser.parse_args(argv)
    if args.flow == "plate":
        if args.correlation == "dean":
            raise cli.InputError("--correlation dean: that is the channel correlation (use --flow channel)")
        plate(args)
    else:
        channel(args)
    return cli.EXIT_OK


if __name__ == "__main__":
    cli.run(PROG, main)
