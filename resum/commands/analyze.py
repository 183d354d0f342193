"""``resum analyze FILE``: radius of convergence and leading singularities with bands."""
from __future__ import annotations

import os

from ..analysis import analyze, default_context
from ..context import DEFAULT
from ..errors import InputError
from ..estimators import METHODS, validate_methods
from ._common import (with_input_notes, add_common_options, at_file, emit_json, load_series, log, prepare_plot_dir, stage_log,
                      write_figures)

HELP = "radius of convergence, singularities and growth of a series, with error bands"
DESCRIPTION = (HELP + ". Runs the ratio, Padé, Dlog-Padé and differential-approximant estimators, "
               "reconciles them and (by default) verifies the bands by rerunning with fewer terms and "
               "more digits. The bands are estimates from the spread of stable approximations, not proofs.")


# what resum.analysis.default_context does without --dps; a coefficient with a constant or a
# function (pi, sqrt(2)) is computed to the reading precision, DEFAULT.work_dps digits
DPS_DEFAULT_HELP = (f"default: for exact coefficients {DEFAULT.dps}, or terms/2 + 10 if more; for "
                    "decimals the digits the least precise one carries, kept between 10 and "
                    f"2 x terms + 30; coefficients with constants or functions such as pi or sqrt(2) "
                    f"carry {DEFAULT.work_dps}")


def add_arguments(parser) -> None:
    parser.add_argument("file", metavar="FILE", help="series file (JSON, CSV or text)")
    add_common_options(parser, dps_default=DPS_DEFAULT_HELP)
    parser.add_argument("--methods", default=None, metavar="M1,M2",
                        help=f"comma-separated estimators (default all): {', '.join(METHODS)}")
    parser.add_argument("--plot", default=None, metavar="DIR",
                        help="write the Domb-Sykes, extrapolation and complex-plane plots to DIR")
    parser.add_argument("--no-verify", action="store_true",
                        help="skip the reruns with fewer terms and higher precision (faster, less safe)")


def run(args) -> int:
    from ..estimators._common import prepare
    try:
        # an empty --methods '' is a mistake (an unset variable), not the default methods
        methods = validate_methods(args.methods) if args.methods is not None else None
    except InputError as exc:
        raise InputError(exc.bare, where="--methods") from None
    series, ctx = load_series(args.file, args.dps)
    if args.dps is None:
        ctx = default_context(series)
    try:
        prepare(series, ctx)      # the analysis' own input check, before any progress line
    except InputError as exc:
        raise at_file(exc, args.file) from None
    if args.plot is not None:
        try:
            from ..plots.analysis import write_analysis_plots
        except ImportError as exc:  # matplotlib missing
            raise InputError(f"--plot needs matplotlib ({exc}); install resum[plot]", where="--plot") from None
        prepare_plot_dir(args.plot)
    log(f"analyzing {series.n_terms} terms of {args.file} at {ctx.dps} digits")
    try:
        result = analyze(series, ctx, methods=methods, verify=not args.no_verify, progress=stage_log(args))
    except InputError as exc:
        raise at_file(exc, args.file) from None
    plot_note = None
    if args.plot is not None:
        _, plot_note = write_figures(args.plot, lambda: write_analysis_plots(result, series, args.plot))
    if args.json:
        doc = with_input_notes(result.contract_dict(), series)
        if plot_note:
            doc["warnings"] = list(doc["warnings"]) + [plot_note]
        emit_json(doc)
    else:
        from ..report.analysis_text import render_analysis
        import sys
        sys.stdout.write(render_analysis(result, title=series.name or os.path.basename(args.file)))
    for w in result.warnings:
        log(f"warning: {w}")
    return 0 if result.success and not plot_note else 1
