"""Writes the verification report: README.md (Markdown, with the figures beside it in figures/)
and results.json (the same content for scripts)."""
import json
import math

CAUTION = (
    "RANS results are model-dependent. Validate them for your case, and defer to applicable codes and "
    "licensed engineering practice when results inform design decisions."
)

METHOD = """\
## Method

- Each case runs the shipped case file of `configs/` (grid changes only for the grid studies) with the
  `wallrans` program, as a user would, and evaluates the written outputs (`fields.pvts`, `wall.csv`).
  The checks, references and tolerances are those of the named test in `tests/verification/`, and the
  reference values are read from the same files in `tests/data/`. The tests solve in-process from a
  uniform start; the program starts on coarser grids (nested start), so both reach the same discrete
  solution to the iteration error of the case's residual drop.
- Observed order and grid convergence index (GCI): Roache (1994), J. Fluids Eng. 116:405, with the
  procedure of Celik et al. (2008), J. Fluids Eng. 130:078001: with phi1 the finest-grid value,
  R = (phi2 - phi1)/(phi3 - phi2) (0 < R < 1 monotone, R < 0 oscillatory), p from
  p = |ln|(phi3 - phi2)/(phi2 - phi1)| + q(p)| / ln r21, q(p) = ln((r21^p - s)/(r32^p - s)), the
  extrapolated value phi_ext = (r21^p phi1 - phi2)/(r21^p - 1) and GCI21 = 1.25 |(phi1 - phi2)/phi1| /
  (r21^p - 1); with two grids F_s = 3 and the formal order. The asymptotic ratio GCI32/(r21^p GCI21) is
  about 1 in the asymptotic range.
- Agreement with the tests: with `--compare-tests BUILD_DIR` the report also runs the test cases that
  make the same checks and lists their verdict beside its own; the report fails when they differ.
"""


def _fmt(value):
    if isinstance(value, str):
        return value
    if value is None or (isinstance(value, float) and not math.isfinite(value)):
        return "-"
    return f"{value:.6g}"


def _cell(text):
    return str(text).replace("|", "\\|").replace("\n", " ")


def _verdict(passed):
    return "**pass**" if passed else "**FAIL**"


def write(out, results, meta):
    lines = [
        "# wallrans verification report",
        "",
        f"Generated {meta['date']} by `{meta['command']}`: {meta['version']}"
        f"{' (' + meta['commit'] + ')' if meta.get('commit') else ''}, {meta['ranks']} rank(s) per run, "
        f"{meta['jobs']} run(s) side by side on {meta['host']}, {meta['seconds']:.0f} s in all.",
        "",
        "This folder is written by the command; to make it anew after a build: "
        "`tools/post/wallrans_verify.py --out docs/verification-report --compare-tests build`.",
        "",
        f"> **Caution.** {CAUTION}",
        "",
        "## Summary",
        "",
        "| case | checks | result | test making the same checks | test verdict | agrees |",
        "|---|---|---|---|---|---|",
    ]
    for r in results:
        tests = ", ".join(sorted({c.test.split(":")[0] for c in r.checks}))
        test_verdict = "not run" if r.test_verdict is None else ("pass" if r.test_verdict else "FAIL")
        agrees = "-" if r.agrees() is None else ("yes" if r.agrees() else "**NO**")
        lines.append(
            f"| [{r.title}](#{_anchor(r.title)}) | {sum(c.passed for c in r.checks)}/{len(r.checks)} | "
            f"{_verdict(r.passed())} | `{r.test_file}` ({tests}) | {test_verdict} | {agrees} |"
        )
    lines.append("")
    for r in results:
        lines += _case(r)
    lines.append(METHOD)
    (out / "README.md").write_text("\n".join(lines) + "\n", encoding="utf-8")
    payload = {
        "meta": meta,
        "caution": CAUTION,
        "all_passed": all(r.passed() for r in results),
        "cases": [r.as_dict() for r in results],
    }
    (out / "results.json").write_text(
        json.dumps(payload, indent=1, default=_json_default) + "\n", encoding="utf-8"
    )


def _json_default(value):
    if hasattr(value, "tolist"):
        return value.tolist()
    if isinstance(value, float) and not math.isfinite(value):
        return None
    return str(value)


def _anchor(title):
    keep = "".join(ch for ch in title.lower() if ch.isalnum() or ch in " -_")
    return keep.replace(" ", "-")


def _case(r):
    lines = [
        f"## {r.title}",
        "",
        r.description,
        "",
        f"Case file `configs/{r.config}.yaml`; test `{r.test_file}`. Result: {_verdict(r.passed())}.",
        "",
        "| run | cells | status | iterations | seconds |",
        "|---|---|---|---|---|",
    ]
    for run in r.runs:
        lines.append(
            f"| {run['name']} | {run['cells'][0]} x {run['cells'][1]} | {run['status']} | "
            f"{_fmt(run['iterations'])} | {run['seconds']} |"
        )
    lines += [
        "",
        "| # | quantity | reference (source) | ours | error | tolerance | result |",
        "|---|---|---|---|---|---|---|",
    ]
    for k, c in enumerate(r.checks, start=1):
        lines.append(
            f"| {k} | {_cell(c.quantity)} | {_cell(c.reference)} ({_cell(c.source)}) | {_cell(c.value)} | "
            f"{_cell(c.error)} | {_cell(c.tolerance)} | {_verdict(c.passed)} |"
        )
    lines += ["", "Tolerances and their derivation, and the test that makes each check:", ""]
    for k, c in enumerate(r.checks, start=1):
        lines.append(f"{k}. {c.derivation}. Test: `{c.test}`.")
    if r.studies:
        lines += [
            "",
            "Grid convergence:",
            "",
            "| quantity | grids (finest first) | values | method | observed order | R | phi_ext | GCI21 | "
            "GCI21 with p = 2 | GCI32 / (r^p GCI21) |",
            "|---|---|---|---|---|---|---|---|---|---|",
        ]
        for s in r.studies:
            res = s.results
            order = res.get("order")
            kind = res.get("kind", "")
            gci = res.get("gci21", res.get("gci_estimate"))
            lines.append(
                f"| {_cell(s.quantity)} | {', '.join(s.grids)} | {', '.join(_fmt(v) for v in s.values)} | "
                f"{_cell(s.method)} | {_fmt(order)}{' (' + kind + ')' if kind else ''} | {_fmt(res.get('R'))} | "
                f"{_fmt(res.get('extrapolated'))} | {_percent(gci)} | {_percent(res.get('gci21_formal'))} | "
                f"{_fmt(res.get('asymptotic_ratio'))} |"
            )
        notes = [f"{s.quantity}: {s.note}" for s in r.studies if s.note]
        for s in r.studies:
            order = s.results.get("order")
            if len(s.grids) == 3 and order is not None and math.isfinite(order) and not 1.0 <= order <= 3.0:
                notes.append(
                    f"{s.quantity}: the observed order {order:.2f} is far from the formal 2, so these grids are "
                    "not in the asymptotic range for it (Celik et al. 2008); quote the larger of GCI21 and "
                    "GCI21 with p = 2."
                )
        if notes:
            lines += [""] + [f"- {n}" for n in notes]
    for note in r.notes:
        lines += ["", note]
    for name, caption in r.figures:
        lines += ["", f"![{caption}](figures/{name})", "", f"*{caption}*"]
    lines.append("")
    return lines


def _percent(value):
    if value is None or (isinstance(value, float) and not math.isfinite(value)):
        return "-"
    return f"{100 * value:.3g} %"
