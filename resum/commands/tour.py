"""``resum tour``: the main job on a built-in default, end to end.

Scenario (our own): a group has computed the weak-coupling series of the
angle-deformed kernel quantity F_a(g) at the angle a = pi/5 to 60 loops and
wants to know (1) where the series stops converging and what sits there,
(2) the function at couplings well outside the disk, with error bands,
(3) whether those bands hold against an independent finite-coupling
evaluation, and (4) how the function grows at strong coupling. The tour
generates the series with resum's own source, runs the singularity analysis
and the resummation, checks against the finite-coupling evaluator, probes the
strong-coupling form, and writes a report, JSON documents and plots into one
folder.
"""
from __future__ import annotations

import json
import time
from pathlib import Path

import mpmath

from ..context import Context
from ..errors import InputError
from ..results import jsonable
from ..series.io import atomic_write_text, write_series
from ._common import log

HELP = "run the guided tour: generate a series, analyse it, resum it, write a report and plots"

ANGLE = "pi/5"
LOOPS = 60
DPS = 40
#: digits of the generated coefficients: the conformal re-expansion of 60 loops cancels about 40
#: digits, so coefficients with only the 40 asked leave the top orders none (resum evaluate warns)
SERIES_DPS = 80
TRUTH_DPS = 25
COUPLINGS = ("0.2", "0.5", "1", "2", "4")


def add_arguments(parser) -> None:
    parser.add_argument("-o", "--output", default="resum-tour", metavar="DIR",
                        help="folder for the report and plots (default: ./resum-tour)")
    parser.add_argument("--no-plots", action="store_true", help="skip the figures")


def _step(msg, t0):
    log(f"[{time.perf_counter() - t0:6.1f} s] {msg}")


def run(args) -> int:
    from ..analysis import analyze
    from ..report.analysis_text import render_analysis
    from ..report.evaluation_text import render_evaluation
    from ..resummation import evaluate
    from ..sources import get_source

    if not str(args.output).strip():
        # Path("") is the current folder: an unset variable in '-o "$DIR"' must not fill it
        raise InputError("empty folder name; give a folder for the report", where="--output")
    out = Path(args.output)
    if out.exists() and not out.is_dir():
        raise InputError("exists and is not a folder; choose another --output", where=str(out))
    try:
        out.mkdir(parents=True, exist_ok=True)
        import tempfile
        with tempfile.TemporaryFile(dir=out):
            pass
    except OSError as exc:
        raise InputError(f"cannot write there ({exc.strerror or exc}); choose another --output",
                         where=str(out)) from None
    t0 = time.perf_counter()
    ctx = Context(dps=DPS)
    src = get_source("bes")

    _step(f"generating the {LOOPS}-loop series of F_a(g) at a = {ANGLE} ({SERIES_DPS} digits)", t0)
    series = src.build(ctx, angle=ANGLE, loops=LOOPS, dps=SERIES_DPS)
    write_series(series, out / "series.json")

    _step("singularity analysis (ratio, Padé, Dlog-Padé, differential approximants; verified)", t0)
    ana = analyze(series, ctx)
    atomic_write_text(out / "analysis.txt", render_analysis(ana, title=series.name) + "\n")
    atomic_write_text(out / "analysis.json", json.dumps(ana.to_dict(), indent=1) + "\n")

    _step(f"resummation at g = {', '.join(COUPLINGS)} (automatic method; verified)", t0)
    ev = evaluate(series, list(COUPLINGS), ctx, analysis=ana)
    atomic_write_text(out / "evaluation.txt", render_evaluation(ev) + "\n")
    atomic_write_text(out / "evaluation.json", json.dumps(ev.to_dict(), indent=1) + "\n")

    _step("independent finite-coupling evaluation (truncated kernel matrix + quadrature)", t0)
    truth = src.truth(Context(dps=TRUTH_DPS), list(COUPLINGS), angle=ANGLE)
    rows, held = [], 0
    with ctx.working():
        for g, p, t in zip(COUPLINGS, ev.points, truth):
            if p.value is None or t is None:
                rows.append((g, "failed" if p.value is None else str(p.value), "n/a", "n/a", "n/a"))
                continue
            tv = _val(t)
            err = abs(p.value.value - tv)
            # the reference carries its own error: the band holds if the two bands touch
            terr = _err(t) or 0
            inside = bool(p.value.lower - terr <= tv <= p.value.upper + terr)
            if terr and err < terr:
                err = terr           # cannot claim more digits than the reference has
            held += inside
            digits = "exact" if err == 0 else f"{float(-mpmath.log10(err / abs(tv))):.1f}"
            if terr and err == terr:
                digits = f">= {digits} (reference limit)"
            # the reference with its own band (value(error)), so its digits can be checked
            ref = str(t) if hasattr(t, "lower") else mpmath.nstr(tv, 40)
            rows.append((g, str(p.value), ref, digits, "yes" if inside else "NO"))
    comparison = {"couplings": list(COUPLINGS),
                  "rows": [dict(zip(("g", "resummed", "finite_coupling", "digits_correct", "in_band"),
                                    r[:4] + ({"yes": True, "NO": False}.get(r[4]),)))
                           for r in rows]}
    atomic_write_text(out / "comparison.json", json.dumps(jsonable(comparison), indent=1) + "\n")

    _step("strong-coupling probe (resummed values at growing g, fitted by a g^p + b g^(p - S) + ...)", t0)
    from ..estimators.strong_coupling import probe_strong_coupling
    strong = probe_strong_coupling(series, ctx=ctx, evaluate_options={"analysis": ana})
    atomic_write_text(out / "strong.json", json.dumps(strong.to_dict(), indent=1) + "\n")

    figures = []
    if not args.no_plots:
        _step("figures", t0)
        from ..plots.analysis import write_analysis_plots
        from ..plots.evaluation import write_evaluation_plots
        figures += [Path(f).name for f in write_analysis_plots(ana, series, out)]
        reference = [(mpmath.mpf(g), _val(t), _err(t)) for g, t in zip(COUPLINGS, truth) if t is not None]
        from ..plots.evaluation import curve_grid
        # the resummed curve between the couplings (one run, no verification reruns)
        curve = evaluate(series, curve_grid(COUPLINGS, 24), ctx, verify=False, analysis=ana)
        figures += [Path(f).name for f in write_evaluation_plots(ev, series, ctx, out, reference, curve)]
        from ..plots.evaluation import write_strong_plot
        figures += [Path(f).name for f in write_strong_plot(strong, out)]

    report = _report(series, ana, ev, rows, held, figures, time.perf_counter() - t0, strong)
    atomic_write_text(out / "report.md", report)
    _step(f"done: report in {out / 'report.md'}", t0)
    print(report)
    return 0 if ana.success and ev.success and held == len(rows) else 1


def _val(t):
    return t.value if hasattr(t, "value") else mpmath.mpf(t)


def _err(t):
    return t.error if hasattr(t, "error") else None


def _report(series, ana, ev, rows, held, figures, seconds, strong=None) -> str:
    rad = ana.radius
    lines = [
        f"# resum tour: F_a(g) at a = {ANGLE}, {series.n_terms - 1} loops",
        "",
        "The series is in x = g^2 (coefficients[k] multiplies x^k). Every number below is an",
        "estimate: its band is the spread of the stable approximants across orders and methods,",
        "widened by a safety factor and by reruns at higher precision and with fewer terms. It is",
        "meant to contain the truth; it is not a rigorous bound.",
        "",
        "## Where the series stops converging",
        "",
        f"- radius of convergence in x: {rad if rad is not None else 'not determined'}"
        + (f" (|g| = {_sqrt_band(rad)})" if rad is not None else ""),
    ]
    for s in ana.singularities[:4]:
        ex = "exponent not determined" if s.exponent is None else f"exponent {s.exponent}"
        at = (f"{s.re}" if s.im.value == 0 and s.im.lower == 0 and s.im.upper == 0 else
              f"{s.re} {'+' if s.im.value >= 0 else '-'} {str(s.im).lstrip('-')} i")
        lines.append(f"- singularity at x = {at}: {s.kind}, {ex}")
    for w in ana.warnings:
        lines.append(f"- warning: {w}")
    lines += ["", "## Resummed values against the finite-coupling evaluation", "",
              "| g | resummed (band) | finite coupling | digits correct | truth in band |",
              "|---|---|---|---|---|"]
    lines += [f"| {' | '.join(r)} |" for r in rows]
    lines += ["", f"{held} of {len(rows)} bands contain the independent value.", ""]
    for w in ev.warnings:
        lines.append(f"- warning: {w}")
    if strong is not None:
        lines += _strong_lines(strong)
    lines += ["", "## Files", "", "- series.json: the generated series (our JSON series document)",
              "- analysis.txt / analysis.json: the singularity analysis",
              "- evaluation.txt / evaluation.json: the resummed values",
              "- comparison.json: resummed against finite coupling",
              "- strong.json: the strong-coupling probe"]
    lines += [f"- {f}" for f in figures]
    lines += ["", f"Total time: {seconds:.0f} s.", ""]
    return "\n".join(lines)


def _strong_lines(strong) -> list:
    from ..estimators.strong_coupling import leading_power_text
    from .strong import _shown, exponential_text
    lines = ["", "## Strong coupling", "",
             f"The resummed values at growing g (those whose band is below 1e-4 of the value, up to "
             f"g = {strong.trusted_up_to}) fitted by a g^p + b g^(p - S) + ...: {strong.status.value}.", ""]
    if strong.leading_power is not None:
        lines.append(f"- leading power p = {leading_power_text(strong.leading_power)} ({strong.power_source})")
    if strong.spacing is not None:
        lines.append(f"- powers spaced by S = {strong.spacing}")
    for label, e in strong.coefficients:
        lines.append(f"- coefficient of {_shown(label)}: {e}")
    exp = exponential_text(strong)
    if exp:
        lines.append(f"- {exp}")
    for w in strong.warnings:
        lines.append(f"- warning: {w}")
    lines += ["", "The coefficient bands come from the spread over an ensemble of fits (numbers of terms "
              "and fit windows) and the bands of the resummed values; they are estimates, not proofs.", ""]
    return lines


def _sqrt_band(e) -> str:
    """sqrt of a non-negative band, printed to the digits the band supports (as the radius is)."""
    from ..results import Estimate, format_value_error
    lo = mpmath.sqrt(max(e.lower, 0))
    return format_value_error(mpmath.sqrt(e.value), lo, mpmath.sqrt(e.upper)) if isinstance(e, Estimate) \
        else mpmath.nstr(mpmath.sqrt(e), 6)
