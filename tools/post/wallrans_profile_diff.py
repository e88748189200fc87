#!/usr/bin/python3
"""wallrans-profile-diff: compares a profile with a reference table and prints error norms."""
import sys
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parent))

from wallrans_post import cli  # noqa: E402
from wallrans_post.tables import interpolate, read_table  # noqa: E402

PROG = "wallrans-profile-diff"
EXAMPLES = """\
  # U+ of a channel run against the DNS of Moser, Kim & Mansour (1999), log region only:
  wallrans-profile-diff out/channel_sa_re395/profile_x0.25.csv tests/data/channel-mkm1999/mkm_retau395_means.dat \\
      --x y_plus --y u_plus --ref-x y+ --ref-y U+ --range 30 350
  # relative errors, and exit code 1 when the largest exceeds 3 %:
  wallrans-profile-diff profile_x0.5.csv reference.csv --x y_plus --y u_plus --ref-x y_plus --ref-y u_plus \\
      --relative --max-linf 0.03

Both files are tables with named columns: a CSV file with a header line (wallrans' profiles), or a
whitespace table whose names come from a '# columns:' comment (the tables in tests/data) or from a
first header line; --ref-names names the columns of a table that has none. The reference is
interpolated linearly to the profile's points; points outside the reference's range (or outside
--range) are left out and counted. Norms of e_i = y_i - y_ref(x_i) over the n points compared:
L2 = sqrt(sum e_i^2 / n) (root mean square), Linf = max |e_i|; with --relative, e_i / |y_ref(x_i)|.

exit codes: 0 compared (and within --max-l2/--max-linf if given); 1 a given bound exceeded;
2 bad input (missing file or column, no overlapping points, bad option)."""


def main(argv):
    parser = cli.Parser(
        PROG, "Compares a profile with a reference table; prints the L2 and Linf error norms.", EXAMPLES
    )
    parser.add_argument("profile", help="profile table (e.g. a run's profile_x<x>.csv)")
    parser.add_argument("reference", help="reference table (CSV or whitespace with named columns)")
    parser.add_argument("--x", required=True, help="profile column of the abscissa (e.g. y_plus)")
    parser.add_argument("--y", required=True, help="profile column compared (e.g. u_plus)")
    parser.add_argument("--ref-x", required=True, help="reference column of the abscissa (e.g. y+)")
    parser.add_argument("--ref-y", required=True, help="reference column compared (e.g. U+)")
    parser.add_argument("--ref-names", help="comma-separated column names of a reference without names")
    parser.add_argument(
        "--range",
        nargs=2,
        type=float,
        metavar=("LOW", "HIGH"),
        help="compare only points with LOW <= x <= HIGH",
    )
    parser.add_argument("--relative", action="store_true", help="errors relative to the reference value")
    parser.add_argument("--max-l2", type=cli.positive_number, help="exit 1 if L2 exceeds this")
    parser.add_argument("--max-linf", type=cli.positive_number, help="exit 1 if Linf exceeds this")
    args = parser.parse_args(argv)
    if args.range and not args.range[0] < args.range[1]:
        raise cli.InputError(f"--range {args.range[0]:g} {args.range[1]:g}: expected LOW < HIGH")

    profile = read_table(args.profile)
    names = [n.strip() for n in args.ref_names.split(",")] if args.ref_names else None
    reference = read_table(args.reference, names=names)
    x, y = profile[args.x], profile[args.y]
    x_ref, y_ref = reference[args.ref_x], reference[args.ref_y]

    selected = np.ones(len(x), dtype=bool)
    if args.range:
        selected &= (x >= args.range[0]) & (x <= args.range[1])
    at = interpolate(x_ref, y_ref, x)
    outside = selected & np.isnan(at)
    compared = selected & ~np.isnan(at)
    if args.relative:
        tiny = compared & (np.abs(at) < 1e-300)
        if tiny.any():
            raise cli.InputError(
                f"{args.reference}: reference '{args.ref_y}' is zero at {args.x} = "
                f"{x[np.argmax(tiny)]:g}; relative errors need a non-zero reference (use --range)"
            )
    n = int(compared.sum())
    if n == 0:
        raise cli.InputError(
            f"{args.profile}: no point of '{args.x}' lies within the reference's range "
            f"[{np.min(x_ref):g}, {np.max(x_ref):g}]" + (" and --range" if args.range else "")
        )
    error = y[compared] - at[compared]
    if args.relative:
        error = error / np.abs(at[compared])
    l2, linf = float(np.sqrt(np.mean(error**2))), float(np.max(np.abs(error)))
    worst = int(np.argmax(np.abs(error)))
    kind = "relative" if args.relative else "absolute"
    print(f"profile:   {args.profile} ({args.y} against {args.x})")
    print(f"reference: {args.reference} ({args.ref_y} against {args.ref_x}), linear interpolation")
    print(
        f"points compared: {n} ({int(outside.sum())} outside the reference's range, "
        f"{int((~selected).sum())} outside --range)"
    )
    print(f"L2   ({kind}, root mean square) = {l2:.6e}")
    print(f"Linf ({kind}, largest)          = {linf:.6e} at {args.x} = {x[compared][worst]:.6g}")
    code = cli.EXIT_OK
    for name, value, bound in (("L2", l2, args.max_l2), ("Linf", linf, args.max_linf)):
        if bound is not None:
            verdict = "within" if value <= bound else "EXCEEDS"
            print(f"{name} {verdict} the bound {bound:g}")
            if value > bound:
                code = cli.EXIT_FAILED
    return code


if __name__ == "__main__":
    cli.run(PROG, main)
