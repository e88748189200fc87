#!/usr/bin/python3
"""wallrans-plot: the standard pictures of one run directory, as PNG files."""
import sys
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))

from wallrans_post import cli  # noqa: E402
from wallrans_post.run_dir import RunDirectory  # noqa: E402

PROG = "wallrans-plot"
EXAMPLES = """\
  wallrans-plot out/plate_sa                  # PNGs into out/plate_sa/plots/
  wallrans-plot out/channel_sa_re395 --out figs --dpi 150

files written (each FIGURE_INCHES 10 x 6 at the dpi, so 1200 x 720 pixels by default):
  residuals.png       every normalised residual of residuals.csv against the iteration
  wall_<k>.png        Cf and Cp along wall k of wall.csv; a plate adds its skin-friction correlation
                      (turbulent: White 2006; laminar: Blasius), a periodic channel shows Cf on the
                      bulk velocity beside the DNS of Moser, Kim & Mansour (1999) and Dean (1978)
  profiles.png        U+ against y+ of every profile_*.csv with the DNS (channel: Moser, Kim &
                      Mansour 1999 at the nearest Re_tau; plate: Schlatter & Orlu 2010) and the log
                      law (kappa = 0.41, B = 5.0); a laminar plate: u/U against eta with Blasius
  velocity.png        velocity magnitude with streamlines (fields.pvts), solid cells grey
  eddy_viscosity.png  nu_t/nu (fields.pvts), solid cells grey

exit codes: 0 written; 2 bad input (not a run directory, unreadable file, bad option)."""


def main(argv):
    parser = cli.Parser(PROG, "Writes the standard plots of a wallrans run directory as PNG files.", EXAMPLES)
    parser.add_argument("run_dir", help="a run directory (output.directory or --output-dir of the run)")
    parser.add_argument("--out", help="folder for the PNG files (default: RUN_DIR/plots)")
    parser.add_argument("--dpi", type=cli.positive_integer, default=120, help="pixels per inch (default 120)")
    args = parser.parse_args(argv)

    run = RunDirectory(args.run_dir)
    out = Path(args.out) if args.out else run.path / "plots"
    try:
        out.mkdir(parents=True, exist_ok=True)
    except OSError as error:
        raise cli.InputError(f"{out}: cannot create the output folder: {error.strerror}") from None

    from wallrans_post import plots  # matplotlib is imported only when plotting

    written, skipped = [plots.residuals(run, out, args.dpi)], []
    fields = run.fields() if (run.path / "fields.pvts").is_file() else None
    if fields is None:
        skipped.append("maps and channel Cf (no fields.pvts: the run diverged, failed or is still running)")
    walls = plots.walls(run, out, args.dpi, fields)
    if not walls:
        skipped.append("wall plots (no wall.csv: output.wall_data is false or the case has no wall)")
    profiles = plots.profiles(run, out, args.dpi)
    if not profiles:
        skipped.append("profiles (no profile_*.csv: set output.profiles_at_x)")
    written += walls + profiles
    if fields is not None:
        written += [
            plots.velocity_map(run, fields, out, args.dpi),
            plots.eddy_viscosity_map(run, fields, out, args.dpi),
        ]
    for path in written:
        print(f"{PROG}: wrote {path}")
    for item in skipped:
        print(f"{PROG}: skipped {item}")
    return cli.EXIT_OK


if __name__ == "__main__":
    cli.run(PROG, main)
