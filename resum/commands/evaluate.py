"""``resum evaluate FILE --at X [--at Y ...]``: resummed values with bands.

Reference file format (``--reference FILE``), plain text, one point a line::

    # comments start with '#'; blank lines are ignored
    # at        value                      [error]
    1           1.6533182652538835029858   1e-20
    2           3.66228853258437715269

``at`` is a point in the same variable as ``--at`` (the coupling when the
series declares one); ``value`` the reference value; the optional third
column its uncertainty (default: half a unit in the last digit written). Columns are separated by spaces, tabs or commas;
numbers may be expressions (``sqrt(2)/4``).
"""
from __future__ import annotations

import math
import os
import sys

from ..errors import InputError
from ..results import point_text
from ._common import (with_input_notes, AT_HELP_RANGE, add_common_options, add_map_options, at_file, emit_json,
                      expand_points, load_series, log, map_options, power_term, prepare_plot_dir,
                      require_power_series, check_plan_terms, stage_log, write_figures)

MIN_TERMS = 6       # resum.resummation.evaluate refuses fewer terms

HELP = "resummed values at given points (beyond the radius, strong coupling), with error bands"
DESCRIPTION = (
    HELP + ". Methods: partial-sum, pade, conformal-pade, conformal-quadratic, borel-pade, borel-conformal-pade, "
    "ode, borel-ode, "
    "auto (default: chosen from the growth of the coefficients and their singularities; ode or borel-ode "
    "when the series, or its Borel transform, obeys a linear differential equation exactly). Each value "
    "comes with a band from the spread and convergence of stable approximants (or from reruns of the "
    "equation's continuation), checked (unless --no-verify) "
    "by reruns at higher precision and with fewer terms; optimal truncation is shown beside it. "
    "Exit code 0 when every point converged, 1 when some failed, 2 for an input error.")


def add_arguments(parser) -> None:
    from ..resummation import METHODS
    parser.add_argument("file", metavar="FILE", help="series file (JSON, CSV or text)")
    parser.add_argument("--at", action="append", required=True, metavar="X",
                        help="point to evaluate at (the coupling if the file declares one); decimal or "
                             "expression such as 1/4 or sqrt(2); repeat for more points" + AT_HELP_RANGE)
    parser.add_argument("--method", default="auto", metavar="M",
                        help=f"one of: {', '.join(METHODS)} (default auto)")
    parser.add_argument("--plot", default=None, metavar="DIR",
                        help="write evaluation.png, digits.png (and borel_plane.png) to DIR")
    parser.add_argument("--curve", default=None, metavar="N",
                        help="with --plot: also resum at N more points spanning those asked for and draw "
                             "the curve with its band (one run, no verification reruns; default 24, 8 for the "
                             "Borel-plane methods; 0: only the points asked for)")
    parser.add_argument("--reference", default=None, metavar="FILE",
                        help="reference values to compare with (lines 'at value [error]')")
    parser.add_argument("--large-power", default=None, metavar="P",
                        help="expected power p of f ~ x^p at large x (conformal maps absorb it; default: read from "
                             "the series when it is clearly a simple fraction; 0 turns that off)")
    parser.add_argument("--goal", default=None, metavar="D",
                        help="digits wanted at every point: where a band falls short, regenerate the series "
                             "with the terms its convergence projects (a file written by 'resum generate' "
                             "names its source) and evaluate again, at most three times")
    parser.add_argument("--max-terms", default=None, metavar="N",
                        help="with --goal: never more terms than N (default 3 x the terms in FILE)")
    parser.add_argument("--no-verify", action="store_true",
                        help="skip the reruns at higher precision and with fewer terms (faster, less safe)")
    parser.add_argument("--strong-term", action="append", default=None, metavar="LABEL=VALUE",
                        help="a known term of the expansion at large coupling, e.g. 'g^1=2' or "
                             "'g^0=-3*log(2)/(2*pi)'; repeat for each term from the leading power down "
                             "(consecutive powers, zeros included). Conformal-Padé then also runs two-point "
                             "approximants matching these at infinity, chosen per point by its band")
    add_map_options(parser)
    add_common_options(parser)


#: Points of the figure's curve (``--curve``): the default, and the default for the Borel-plane
#: methods, whose Laplace integrals cost about a second per point (measured 4 December 2026: 24
#: points of the oscillator from 100 terms by borel-conformal-pade about 25 s, the two points
#: asked for with their verification reruns about 6 s; the Euler series by borel-ode 0.85 s per
#: point; conformal-pade on 60 loops of the kernel family under 2 s for all 24).
CURVE_POINTS = 24
CURVE_POINTS_BOREL = 8


def _curve_count(text):
    if text is None:
        return None
    try:
        n = int(text)
    except ValueError:
        n = -1
    if not 0 <= n <= 400:
        raise InputError(f"expected a whole number of points from 0 to 400, got {text!r}", where="--curve")
    return n


def _curve(series, ctx, points, n, args, large, known):
    """The evaluation on the figure's extra points (None without them or when it fails: the
    figure then shows the points asked for only)."""
    from ..plots.evaluation import curve_grid
    from ..resummation import evaluate
    grid = curve_grid(points, n)
    if not grid:
        return None
    if not args.json:
        log(f"figure: the resummed curve at {len(grid)} points (one run, no verification reruns; "
            "--curve 0 skips it)")
    try:
        # (the same context as the points asked for: the plan's analysis is then reused)
        return evaluate(series, grid, ctx, method=args.method, verify=False, large_x_power=large, **known)
    except InputError as exc:
        log(f"warning: figure without the curve ({exc.bare})")
        return None


def read_reference(path: str, dps: int) -> list:
    """Read a reference file: list of ``(at, value, error_or_None)`` (mpmath numbers)."""
    from ..resummation import parse_points
    import mpmath
    try:
        from ..series.io import MAX_FILE_BYTES
        with open(path, "rb") as fh:       # bounded: /dev/zero or a pipe may never end
            raw = fh.read(MAX_FILE_BYTES + 1)
        if len(raw) > MAX_FILE_BYTES:
            raise InputError(f"file larger than {MAX_FILE_BYTES // 2**20} MiB", where=path)
        text = raw.decode("utf-8-sig")      # a byte-order mark is no part of the text
    except OSError as exc:
        raise InputError(f"cannot read reference file ({exc.strerror}); check the path", where=path) from None
    except UnicodeDecodeError as exc:
        raise InputError(f"not UTF-8 text (bad byte at offset {exc.start}); save the file as UTF-8",
                         where=path) from None
    out = []
    for k, line in enumerate(text.splitlines(), start=1):
        line = line.split("#", 1)[0].strip()
        if not line:
            continue
        parts = [p for p in line.replace(",", " ").replace("\t", " ").split(" ") if p]
        if len(parts) not in (2, 3):
            raise InputError(f"expected 'at value [error]', got {len(parts)} fields", where=f"{path}:{k}")
        try:
            nums = parse_points(parts, dps)
        except InputError as exc:
            raise InputError(exc.bare, where=f"{path}:{k}") from None
        if isinstance(nums[1], mpmath.mpc):
            raise InputError(f"the reference value {parts[1]!r} is complex; the comparison is of real "
                             "values: give the real part", where=f"{path}:{k}")
        if len(nums) == 3 and (isinstance(nums[2], mpmath.mpc) or nums[2] < 0):
            raise InputError(f"the error {parts[2]!r} must be a real number >= 0 (the half-width of the "
                             "reference's band)", where=f"{path}:{k}")
        err = nums[2] if len(nums) == 3 else _literal_error(parts[1], nums[1])
        out.append((nums[0], nums[1], err))
    if not out:
        raise InputError("no reference values found; give lines 'at value [error]'", where=path)
    return out


def _literal_error(text, value):
    """Half a unit in the last digit of a decimal literal (None for expressions)."""
    import re
    import mpmath
    m = re.fullmatch(r"[+-]?(\d*)\.?(\d*)([eE][+-]?\d+)?", text)
    if not m or not (m.group(1) or m.group(2)):
        return None
    exp = int(m.group(3)[1:]) if m.group(3) else 0
    return mpmath.mpf(10) ** (exp - len(m.group(2))) / 2


def run(args) -> int:
    from ..resummation import evaluate, parse_points, _check_method
    try:
        _check_method(args.method)
    except InputError as exc:
        raise InputError(exc.bare, where="--method") from None
    series, ctx = load_series(args.file, args.dps)
    require_power_series(series, args.file, MIN_TERMS, "resummation")
    check_plan_terms(series, ctx, args.method, args.file, given=bool(args.singularity))
    points = expand_points(args.at, ctx.work_dps + series.n_terms)
    reference = read_reference(args.reference, ctx.work_dps) if args.reference else None
    large = None
    if args.large_power is not None:
        try:
            large = parse_points([args.large_power], ctx.work_dps)[0]
        except InputError as exc:
            raise InputError(exc.bare, where="--large-power") from None
    known = map_options(args, ctx.work_dps)
    if args.strong_term:
        known["strong_terms"] = _strong_terms(args.strong_term, series, ctx)
    goal, max_terms, rebuild = _goal_options(args, series, ctx)
    n_curve = _curve_count(args.curve)     # None: the default, chosen from the method below
    if args.curve is not None and args.plot is None:
        raise InputError("the curve is drawn into the figure: give --plot DIR as well", where="--curve")
    if args.plot is not None:
        try:
            from ..plots.evaluation import write_evaluation_plots
        except ImportError as exc:
            raise InputError(f"--plot needs matplotlib ({exc}); install resum[plot]", where="--plot") from None
        prepare_plot_dir(args.plot)
    log(f"evaluating {series.n_terms} terms of {args.file} at {len(points)} point(s), {ctx.dps} digits")
    search = None
    try:
        if goal is None:
            result = evaluate(series, points, ctx, method=args.method, verify=not args.no_verify,
                              large_x_power=large, progress=stage_log(args), **known)
        else:
            from ..resummation import evaluate_with_goal
            result, search, series = evaluate_with_goal(
                series, points, goal, _logged(rebuild), ctx, max_terms=max_terms, method=args.method,
                verify=not args.no_verify, large_x_power=large, progress=stage_log(args), **known)
    except InputError as exc:
        raise at_file(exc, args.file) from None
    plot_note = None
    if args.plot is not None:
        if n_curve is None:
            # a Borel-plane method pays a Laplace integral per point (and approximant)
            meth = result.provenance.method if result.provenance else ""
            n_curve = CURVE_POINTS_BOREL if meth.startswith("borel") else CURVE_POINTS
        curve = _curve(series, ctx, points, n_curve, args, large, known)
        _, plot_note = write_figures(args.plot, lambda: write_evaluation_plots(result, series, ctx, args.plot,
                                                                                reference, curve))
    goal_note = None
    if search is not None and not search["reached"]:
        # the user asked for these digits: not reaching them is a partial failure (exit 1)
        goal_note = (f"--goal: {search['goal_digits']} digits not reached at every point with "
                     f"{search['terms_used']} terms ({search['note']}); the bands are those of that run")
    failed = _failure_notes(result) + ([plot_note] if plot_note else []) + ([goal_note] if goal_note else [])
    if args.json:
        doc = result.contract_dict()
        doc["warnings"] = list(doc["warnings"]) + failed
        if search is not None:
            doc["order_search"] = search
        with_input_notes(doc, series)
        if reference:
            from ..report.evaluation_text import compare_reference
            from ..results import num_to_str, point_label
            doc["reference"] = [{"at": point_label(num_to_str(c["at"], 30)), "value": num_to_str(c["value"], 30),
                                 "error": None if c["error"] is None else num_to_str(c["error"], 5),
                                 "difference": None if c["difference"] is None else num_to_str(c["difference"], 5),
                                 "inside": c["inside"]} for c in compare_reference(result, reference)]
        emit_json(doc)
    else:
        from ..report.evaluation_text import render_evaluation
        sys.stdout.write(render_evaluation(result, title=series.name or os.path.basename(args.file),
                                           reference=reference))
        if search is not None:
            sys.stdout.write(_goal_text(search))
    for w in list(result.warnings) + [f for f in failed if f != plot_note]:     # plot_note: logged
        log(f"warning: {w}")
    return 0 if result.success and not plot_note and not goal_note else 1


def _strong_terms(items, series, ctx) -> dict:
    """``--strong-term`` items as ``{power: value}`` (texts), each label and value checked, and
    the set checked (consecutive powers from the leading one) before any work."""
    from ..resummation import _strong_in_x, strong_coefficient
    terms = {}
    for item in items:
        label, power, value = power_term(item, series, "--strong-term")
        if power in terms:
            raise InputError(f"the power {label} is given twice; give each term once", where="--strong-term")
        try:
            strong_coefficient(value, ctx.work_dps)
        except InputError as exc:
            raise InputError(exc.bare, where=f"--strong-term {label}") from None
        terms[power] = value
    try:
        _strong_in_x(terms, series.coupling, ctx.work_dps)
    except InputError as exc:
        raise InputError(exc.bare, where="--strong-term") from None
    return terms


def _goal_options(args, series, ctx):
    """(goal digits, max terms, rebuild) from --goal/--max-terms; (None, None, None) without."""
    if args.goal is None:
        if args.max_terms is not None:
            raise InputError("--max-terms bounds the search of --goal: give --goal D as well",
                             where="--max-terms")
        return None, None, None
    try:
        goal = float(args.goal)
    except ValueError:
        goal = float("nan")
    if not 0 < goal <= ctx.dps:
        more = ""
        if goal > ctx.dps and series.digits is not None and series.digits <= ctx.dps:
            # the file's digits cap --dps: more digits need the coefficients again
            need = math.ceil(goal) + 10
            more = (f"; the coefficients carry {series.digits} digits: for {args.goal} digits "
                    f"{_regenerate_advice(series, need)}")
        raise InputError(f"expected a number of digits from 1 to the --dps asked ({ctx.dps}), got "
                         f"{args.goal!r}{more}", where="--goal")
    max_terms = None
    if args.max_terms is not None:
        try:
            max_terms = int(args.max_terms)
        except ValueError:
            max_terms = 0
        if max_terms < series.n_terms:
            raise InputError(f"expected a whole number of terms, at least the {series.n_terms} in the "
                             f"file, got {args.max_terms!r}", where="--max-terms")
    from ..sources import rebuilder_from_provenance
    try:
        rebuild = rebuilder_from_provenance(series, ctx)
    except InputError as exc:
        raise InputError(exc.bare, where=f"{args.file}: --goal") from None
    return goal, max_terms, rebuild


def _regenerate_advice(series, digits: int) -> str:
    """How to get the file's series with ``digits`` digits: the ``resum generate`` command its
    provenance names (the source's own parameters, ``--dps`` raised), or, for a series not made by
    a built-in source, to write its coefficients with that many digits."""
    from ..sources import SOURCES
    prov = dict(series.provenance or {})
    src = SOURCES.get(prov.get("source"))
    if src is None:
        return f"write the coefficients with at least {digits} digits"
    opts = []
    for p in src.params:
        if p.name == "dps" or p.name not in prov:
            continue
        v = prov[p.name]
        if p.type == "bool":
            if v in (True, "true", "True"):
                opts.append(f"--{p.name.replace('_', '-')}")
            continue
        opts.append(f"--{p.name.replace('_', '-')} {v}")
    return f"regenerate it with 'resum generate {src.name} {' '.join(opts + [f'--dps {digits}'])} -o FILE'"


def _logged(rebuild):
    def run(n, digits=None):
        if digits is None:
            log(f"--goal: regenerating the series with {n} terms")
            return rebuild(n)
        log(f"--goal: regenerating the series with {n} terms and at least {digits} digits")
        return rebuild(n, digits=digits)
    run.takes_digits = getattr(rebuild, "takes_digits", False)
    return run


def _goal_text(search) -> str:
    rounds = "; ".join(f"{r['terms']} terms" + (f" at {r['digits']} digits" if r.get("digits") else "")
                       + f": {r['min_digits']} digits" for r in search["rounds"])
    verdict = "reached" if search["reached"] else "not reached"
    return (f"\nGoal {search['goal_digits']} digits at every point: {verdict} ({search['note']}). "
            f"Rounds (terms: fewest digits a band supports): {rounds}. The terms of each round were "
            f"projected from how fast the approximants converged at the points short of the goal, "
            f"and the digits of the coefficients raised where their rounding set a band (estimates); "
            f"the values above are the evaluation of the last round, with its own bands.\n")


def _failure_notes(result) -> list:
    """Why each failed point failed, as warnings (``at X: reason``), unless a warning of the
    result already says it: a point printed as "nan" in the JSON document must not be left
    without its reason."""
    notes = []
    for p in result.points:
        if p.success or not p.message:
            continue
        if any(w.endswith(p.message) for w in result.warnings):
            continue
        notes.append(f"at {point_text(p.at, 12)}: {p.message}")
    return notes
