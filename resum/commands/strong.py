"""``resum strong FILE``: strong-coupling probe of a resummed series.

Resums the series at growing coupling, finds the leading power p from the
log-derivative (or takes ``--power``), fits the asymptotic form
``a_0 g^p + a_1 g^(p-S) + a_2 g^(p-2S) + ...`` over an ensemble of fits, and
reports each coefficient with a band and the largest coupling whose resummed
band was trusted. The spacing S is ``--spacing`` or, by default, one of 2, 1,
2/3, 1/2, 1/3: of those whose fits over all trusted couplings match the
resummed values within their bands with the fewest terms, the largest (the
report says which and why; when none matches, 1). The quartic oscillator's
levels go as g^(1/3) (e0 + e1 g^(-2/3) + ...): from 40 orders the first
excited level's g^(1/3) coefficient comes out 3.800(4) with S = 2/3 (the
level of p^2 + x^4 is 3.79967), and 3.86(5) with S = 1. Where no fit of the powers
matches the values over all trusted couplings, fits with an exponentially small term
``A e^(-kappa g)`` are tried and kept if one matches (``--exponential``). With ``--expect``
the fitted coefficients are compared with values the user supplies.
"""
from __future__ import annotations


import mpmath

from ..errors import InputError
from ..series.expr import evaluate_expression
from ._common import (check_plan_terms, with_input_notes, AT_HELP_RANGE, add_common_options, add_map_options, at_file,
                      emit_json, expand_points, load_series, log, map_options, power_term, prepare_plot_dir,
                      require_power_series, write_figures)

HELP = "strong-coupling probe: fit the asymptotic form of the resummed function, with bands"
DESCRIPTION = __doc__.split("\n\n", 1)[1].strip()


def add_arguments(parser) -> None:
    parser.add_argument("file", metavar="FILE", help="series file (JSON, CSV or text)")
    parser.add_argument("--at", action="append", default=None, metavar="G",
                        help="coupling to resum at (repeat; default: a geometric ladder beyond "
                             "the nearest singularity, or of the Borel transform's for a "
                             "factorially divergent series)" + AT_HELP_RANGE)
    parser.add_argument("--power", default=None, metavar="P",
                        help="leading power p in f ~ a g^p (default: estimated from x f'/f)")
    parser.add_argument("--spacing", default=None, metavar="S",
                        help="step S between the powers of the form, p, p - S, p - 2S, ... (a number "
                             "or a fraction such as 2/3; default auto: of 2, 1, 2/3, 1/2, 1/3, those "
                             "whose fits over all trusted couplings match the resummed values within "
                             "their bands with the fewest terms, the largest)")
    parser.add_argument("--logs", action="store_true", help="also fit g^(p - k S) log g terms")
    parser.add_argument("--exponential", default="auto", metavar="WHEN",
                        help="exponentially small terms A e^(-kappa g) (+ A' e^(-kappa g)/g), kappa "
                             "fitted: auto (default: where no fit of the powers alone matches the "
                             "values over all trusted couplings and one with them does), always, never")
    parser.add_argument("--kappa", default=None, metavar="K",
                        help="the rate of the exponentially small term when it is known, e.g. '4*pi' "
                             "(the fits then use it as given; implies --exponential always)")
    parser.add_argument("--expect", action="append", default=[], metavar="LABEL=VALUE",
                        help="expected coefficient to compare with, e.g. 'g^1=2', "
                             "'g^0=-3*log(2)/(2*pi)' or 'g^(1/3)=3.8' (repeat)")
    parser.add_argument("--method", default="auto", help="resummation method (as in evaluate)")
    parser.add_argument("--no-verify", action="store_true",
                        help="resum each coupling once, without the verification reruns at higher "
                             "precision and with fewer terms (faster; the bands then miss that part)")
    parser.add_argument("--plot", default=None, metavar="DIR",
                        help="write strong.png to DIR: f / g^p with the bands against the coupling, "
                             "the fitted form and the leading coefficient's band")
    parser.add_argument("--max-band", default=None, metavar="REL",
                        help="largest relative band of a resummed value that the fit uses "
                             "(default 1e-4; a larger one lets less sharp values in)")
    add_map_options(parser)
    add_common_options(parser)


def _number(text, dps, where):
    try:
        v = evaluate_expression(text, dps)
    except InputError as e:
        raise e.at(where) from None
    return v.value


def _couplings(texts, dps):
    """The ``--at`` couplings, each refused (naming its ``--at``) before any work unless real,
    positive and not given twice: the probe follows the function out along the positive axis."""
    out, seen = [], {}
    for text in texts:
        for g in expand_points([text], dps):
            if isinstance(g, mpmath.mpc) or not g > 0:
                raise InputError("a strong-coupling coupling must be real and positive; give "
                                 "couplings beyond the nearest singularity on the positive axis",
                                 where=f"--at {text[:40]}")
            if g in seen:
                raise InputError(f"coupling {mpmath.nstr(g, 8)} is given twice (also by --at "
                                 f"{seen[g][:40]}); give each coupling once", where=f"--at {text[:40]}")
            seen[g] = text
            out.append(g)
    return out


def run(args) -> int:
    from ..estimators.strong_coupling import probe_strong_coupling
    from ..resummation import _check_method
    try:
        _check_method(args.method)
    except InputError as exc:
        raise InputError(exc.bare, where="--method") from None
    series, ctx = load_series(args.file, args.dps)
    require_power_series(series, args.file, 6, "the strong-coupling probe (a resummation)")
    check_plan_terms(series, ctx, args.method, args.file, given=bool(args.singularity))
    couplings = None if not args.at else _couplings(args.at, ctx.work_dps)
    power = None if args.power is None else _number(args.power, ctx.work_dps, "--power")
    if isinstance(power, mpmath.mpc):
        raise InputError(f"the leading power must be a real number, got {args.power!r}", where="--power")
    extra = {}
    if args.spacing is not None:
        from ..estimators.strong_coupling import _spacing_arg
        try:
            _spacing_arg(args.spacing, ctx.work_dps)       # refused here, before any work
        except InputError as exc:
            raise InputError(exc.bare.replace("'auto'", "auto"), where="--spacing") from None
        extra["spacing"] = args.spacing.strip()
    from ..estimators.strong_coupling import exponential_options
    try:
        extra["exponential"], kappa = exponential_options(args.exponential, args.kappa, ctx.work_dps)
    except InputError as exc:
        raise InputError(exc.bare, where=f"--{exc.where}") from None
    if kappa is not None:
        extra["kappa"] = kappa
    if args.max_band is not None:
        band = _number(args.max_band, ctx.work_dps, "--max-band")
        if isinstance(band, mpmath.mpc) or not 0 < band < 1:
            raise InputError(f"give a number between 0 and 1 (a relative band), got "
                             f"{args.max_band!r}", where="--max-band")
        extra["max_rel_band"] = band
    expected = {}
    for item in args.expect:
        label, _, value = power_term(item, series, "--expect", logs=True)
        expected[label] = _number(value, ctx.work_dps, f"--expect {label}")
    known = map_options(args, ctx.work_dps)
    if args.no_verify or known:
        extra["evaluate_options"] = dict(known, **({"verify": False} if args.no_verify else {}))
    if args.plot is not None:
        try:
            from ..plots.evaluation import write_strong_plot
        except ImportError as exc:
            raise InputError(f"--plot needs matplotlib ({exc}); install resum[plot]", where="--plot") from None
        prepare_plot_dir(args.plot)
    if not args.json:
        log(f"probing {series.name or args.file} at growing coupling ({ctx.dps} digits)")
    try:
        res = probe_strong_coupling(series, couplings, ctx, method=args.method, leading_power=power,
                                    log_terms=args.logs, expected=expected or None, **extra)
    except InputError as exc:
        raise at_file(exc, args.file) from None
    plot_note = None
    if args.plot is not None:
        _, plot_note = write_figures(args.plot, lambda: write_strong_plot(res, args.plot))
    if args.json:
        doc = res.to_dict()
        if plot_note:
            doc["warnings"] = list(doc.get("warnings", [])) + [plot_note]
        emit_json(with_input_notes(doc, series))
    else:
        print(_render(res))
    return 0 if res.success and not plot_note else 1


def _shown(label: str) -> str:
    """A coefficient's label as printed: a fractional power in parentheses, ``g^(1/3)`` and
    ``g^(-1/3) log g`` (``g^1/3`` reads as g/3). The JSON keys and ``--expect`` keep the bare
    form (``g^1/3``); ``--expect`` takes both."""
    head, sep, rest = label.partition("^")
    if not sep:
        return label
    power, space, tail = rest.partition(" ")
    if "/" in power:
        power = f"({power})"
    return f"{head}^{power}{space}{tail}"


def exponential_text(res):
    """The exponentially small term the fit kept, as one line (``None`` when none was kept)."""
    exp = res.diagnostics.get("exponential")
    if not isinstance(exp, dict) or exp.get("kappa") is None:
        return None
    terms = " and A' e^(-kappa {0})/{0}".format(res.variable) if 2 in exp.get("terms", []) else ""
    k = exp["kappa"]
    if exp.get("given"):
        kap = f"kappa = {mpmath.nstr(k.value, 12)} = {mpmath.nstr(k.value / mpmath.pi, 12)} pi (given)"
    elif k.lower <= 0 or k.error > k.value / 2:
        # the fits kept agree on the power terms but not on the rate: say so rather than print a
        # band that reads as a measurement
        kap = f"kappa not determined ({k}: the fits kept disagree on it)"
    else:
        kap = f"kappa = {k} = {exp['kappa_over_pi']} pi"
    return f"plus A e^(-kappa {res.variable}){terms}: {kap}   ({exp.get('n_fits')} fits)"


def _render(res) -> str:
    lines = [f"Strong-coupling probe in {res.variable}: {res.status.value}"
             + (f" ({res.message})" if res.message else "")]
    if res.leading_power is not None:
        # an exact power reads as the fraction it is: 1/3 came out as 0.3333...3335033, its
        # working-precision tail printed to the global digits
        from ..estimators.strong_coupling import leading_power_text
        lines.append(f"leading power p = {leading_power_text(res.leading_power)}   ({res.power_source})")
    if res.spacing is not None:
        lines.append(f"powers spaced by S = {res.spacing}: p, p - S, p - 2S, ...   ({res.spacing_source})")
    if res.trusted_up_to is not None:
        lines.append(f"resummed values trusted up to {res.variable} = {res.trusted_up_to}")
    if res.coefficients:
        lines.append("fitted form f ~ sum of terms, coefficient with band:")
        for label, e in res.coefficients:
            cmp = res.comparison.get(label)
            tail = ""
            if cmp:
                tail = f"   expected {cmp.get('expected')}: {'inside' if cmp.get('inside') else 'OUTSIDE'} the band"
            lines.append(f"  {_shown(label):>14}  {e}{tail}")
    exp = exponential_text(res)
    if exp:
        lines.append(f"  {exp}")
    for w in res.warnings:
        lines.append(f"warning: {w}")
    lines.append("The bands come from the spread over an ensemble of fits (numbers of terms and "
                 "fit windows) and the bands of the resummed values; they are estimates, not proofs.")
    return "\n".join(lines)
