#!/usr/bin/python3
"""wallrans-verification-report: runs the coarse verification cases and writes a report folder
(README.md with figures, results.json)."""
import datetime
import os
import shutil
import socket
import subprocess
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))

from wallrans_post import cli  # noqa: E402

PROG = "wallrans-verification-report"
CASES = ("poiseuille", "cavity", "blasius", "channel", "plate")
EXAMPLES = """\
  wallrans-verification-report --out docs/verification-report            # every case, 2 runs at a time
  wallrans-verification-report --out /tmp/report --cases poiseuille,blasius --jobs 1
  wallrans-verification-report --out docs/verification-report --compare-tests build   # also run the tests

The cases (about 2 minutes in all on 2 cores): poiseuille (exact parabola; stretched pair for the
order), cavity (Re 100, Ghia et al. 1982; 33/65/129 cells for the GCI), blasius (Ganapol 2010
table; three grids), channel (SA, Re_tau 392, Moser, Kim & Mansour 1999 and the 1-D solver; three
grids), plate (SA, Re_L 1e7, published Cf band and log law; the three grids of the GCI test).
Each check, reference and tolerance is that of the test named beside it. The folder gets
README.md, figures/*.png and results.json; the runs go to OUT/runs (removed unless --keep-runs).

exit codes: 0 every check passed (and agrees with the tests when --compare-tests is given);
1 a check failed, a run failed, or a test verdict differs; 2 bad input."""


def _test_programs(build, cases):
    """(case key, test program, gtest filter) of the tests making the same checks as `cases`."""
    found = []
    for case in cases:
        for binary, gtest_filter in case.tests:
            path = Path(build) / "tests" / binary
            if not path.is_file():
                raise cli.InputError(
                    f"--compare-tests {build}: no test program {path} (build the tests first)"
                )
            found.append((case.key, path, gtest_filter))
    return found


def _compare_tests(programs, results, jobs, mpiexec):
    """Runs the test cases that make the same checks; sets each case's test verdict."""
    import concurrent.futures

    env = dict(
        os.environ,
        OMPI_ALLOW_RUN_AS_ROOT="1",
        OMPI_ALLOW_RUN_AS_ROOT_CONFIRM="1",
        OMPI_MCA_rmaps_base_oversubscribe="1",
    )
    by_key = {result.key: result for result in results}
    jobs_list = [
        (by_key[key], [mpiexec, "-n", "1", str(path), f"--gtest_filter={gtest_filter}"])
        for key, path, gtest_filter in programs
    ]

    def run(item):
        result, command = item
        done = subprocess.run(command, stdout=subprocess.PIPE, stderr=subprocess.STDOUT, env=env, text=True)
        return result, done.returncode == 0

    verdicts = {}
    with concurrent.futures.ThreadPoolExecutor(max_workers=jobs) as pool:
        for result, passed in pool.map(run, jobs_list):
            verdicts[result.key] = verdicts.get(result.key, True) and passed
    for key, result in by_key.items():
        if key in verdicts:
            result.test_verdict = verdicts[key]


def _meta(program, args, seconds):
    version = subprocess.run(
        [str(program), "version"], stdout=subprocess.PIPE, stderr=subprocess.DEVNULL, text=True
    ).stdout.strip()
    root = Path(__file__).resolve().parents[2]
    commit = ""
    if (root / ".git").exists():
        git = subprocess.run(
            ["git", "-C", str(root), "describe", "--always", "--dirty"],
            stdout=subprocess.PIPE,
            stderr=subprocess.DEVNULL,
            text=True,
        )
        commit = git.stdout.strip()
    return {
        "date": datetime.datetime.now(datetime.timezone.utc).strftime("%Y-%m-%d %H:%M UTC"),
        "command": "tools/post/wallrans_verify.py " + " ".join(args),
        "version": version or "unknown",
        "commit": commit,
        "host": socket.gethostname(),
        "ranks": 0,
        "jobs": 0,
        "seconds": seconds,
    }


def main(argv):
    parser = cli.Parser(
        PROG, "Runs the coarse verification cases and writes a report (Markdown + PNG).", EXAMPLES
    )
    parser.add_argument("--out", required=True, help="report folder (created; its README.md is replaced)")
    parser.add_argument(
        "--cases", default=",".join(CASES), help=f"comma-separated subset of {','.join(CASES)}"
    )
    parser.add_argument("--program", help="the wallrans program (default: build/wallrans, then PATH)")
    parser.add_argument("--jobs", type=cli.positive_integer, default=2, help="runs side by side (default 2)")
    parser.add_argument("--ranks", type=cli.positive_integer, default=1, help="MPI ranks per run (default 1)")
    parser.add_argument("--mpiexec", default="mpiexec", help="MPI launcher for --ranks > 1 and the tests")
    parser.add_argument(
        "--compare-tests", metavar="BUILD_DIR", help="also run the tests making the same checks"
    )
    parser.add_argument(
        "--compare-cases", help="with --compare-tests: only these cases' tests (default: all chosen)"
    )
    parser.add_argument("--keep-runs", action="store_true", help="keep the run directories in OUT/runs")
    args = parser.parse_args(argv)
    chosen = [c.strip() for c in args.cases.split(",") if c.strip()]
    unknown = [c for c in chosen if c not in CASES]
    if unknown or not chosen:
        raise cli.InputError(f"--cases {args.cases}: expected names from {', '.join(CASES)}")
    compared = chosen
    if args.compare_cases is not None:
        compared = [c.strip() for c in args.compare_cases.split(",") if c.strip()]
        if not args.compare_tests or not compared or any(c not in chosen for c in compared):
            raise cli.InputError(
                f"--compare-cases {args.compare_cases}: expected names from --cases, "
                "together with --compare-tests"
            )

    from wallrans_post.verify_laminar import Blasius, Cavity, Poiseuille
    from wallrans_post.verify_report import write
    from wallrans_post.verify_runs import Runner, find_program
    from wallrans_post.verify_channel import Channel
    from wallrans_post.verify_plate import Plate

    program = find_program(args.program)
    classes = {
        "poiseuille": Poiseuille,
        "cavity": Cavity,
        "blasius": Blasius,
        "channel": Channel,
        "plate": Plate,
    }
    cases = [classes[name]() for name in CASES if name in chosen]
    programs = (
        _test_programs(args.compare_tests, [c for c in cases if c.key in compared])
        if args.compare_tests
        else []
    )
    out = Path(args.out)
    figures = out / "figures"
    try:
        figures.mkdir(parents=True, exist_ok=True)
    except OSError as error:
        raise cli.InputError(f"--out {args.out}: cannot create the folder: {error.strerror}") from None
    for old in figures.glob("*.png"):
        old.unlink()
    start = time.monotonic()
    runner = Runner(program, out / "runs", args.ranks, args.jobs, args.mpiexec)
    runs = runner.run_all([run for case in cases for run in case.plan()])
    failed = [r for r in runs.values() if r.exit_code not in (0, 3)]  # 3: capped, a result
    runs.update(
        runner.run_all([run for case in cases for run in case.plan_after(runs)]) if not failed else {}
    )
    failed = [r for r in runs.values() if r.exit_code not in (0, 3)]  # 3: capped, a result
    if failed:
        for r in failed:
            print(
                f"{PROG}: run {r.name} ended with exit code {r.exit_code} (log: {runner.work / r.name / 'log.txt'})",
                file=sys.stderr,
            )
        return cli.EXIT_FAILED
    results = [case.evaluate(runs, figures) for case in cases]
    if programs:
        _compare_tests(programs, results, args.jobs, args.mpiexec)
    meta = _meta(program, argv, time.monotonic() - start)
    meta.update(ranks=args.ranks, jobs=args.jobs)
    write(out, results, meta)
    if not args.keep_runs:
        shutil.rmtree(out / "runs", ignore_errors=True)
    for r in results:
        agrees = "" if r.agrees() is None else ("; test agrees" if r.agrees() else "; TEST DISAGREES")
        print(
            f"{PROG}: {r.key}: {'pass' if r.passed() else 'FAIL'} "
            f"({sum(c.passed for c in r.checks)}/{len(r.checks)} checks{agrees})"
        )
    print(f"{PROG}: wrote {out / 'README.md'} and {out / 'results.json'} in {meta['seconds']:.0f} s")
    ok = all(r.passed() and r.agrees() is not False for r in results)
    return cli.EXIT_OK if ok else cli.EXIT_FAILED


if __name__ == "__main__":
    cli.run(PROG, main)
