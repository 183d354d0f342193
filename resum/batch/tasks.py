"""The tasks a family spec can ask for at every grid point.

Each task takes the series built at the point (and the point's source
parameters), runs one library entry point and returns a JSON-ready dict in
a fixed layout. Numbers are decimal strings; every estimate carries its band
as ``{"value", "lo", "hi"}``. Tasks never print or write files.

Tasks
-----
coefficients
    What the coefficients alone say, without any resummation: number of
    terms, digits carried, partial sums at ``at`` (with the size of the last
    term kept, which is *not* an error band), and a ratio estimate of the
    radius of convergence (or, for factorially growing coefficients, of the
    nearest Borel-plane singularity) -- see :func:`ratio_estimate`.
analyze
    :func:`resum.analysis.analyze`: radius, singularities with exponents,
    growth, Borel singularity, each with its band.
evaluate
    :func:`resum.resummation.evaluate` at the couplings ``at`` with
    ``method``.
strong
    :func:`resum.resummation.probe_strong_coupling`: leading strong-coupling
    behaviour with bands.
truth
    The source's own finite-coupling evaluator (where it has one) at ``at``,
    for comparison with ``evaluate``. Where the evaluator cannot give a value
    at a point's parameters (it raises InputError: Euler's same-sign series
    has no Borel sum) the task records ``status = "not available"`` and
    ``message = "not available: <reason>"``, and the point stays ``ok``: its
    other tasks are what the study is about (see :func:`truth_values`).
"""
from __future__ import annotations

import math
from dataclasses import dataclass
from fractions import Fraction
from typing import Callable, Mapping

import mpmath

from ..context import Context
from ..errors import InputError
from ..results import Estimate, Status, num_to_str
from .spec import _get

__all__ = ["TASKS", "TaskDef", "validate_task", "ratio_estimate", "estimate_json"]


@dataclass(frozen=True)
class TaskDef:
    name: str
    help: str
    options: Mapping          # option -> kind: "numbers", "number", "int", "ints", "bool", "str", "strs", "raw"
    run: Callable
    required: tuple = ()
    #: the worker passes ``rebuild(n_terms) -> Series`` (the point's series with another length)
    wants_rebuild: bool = False


# ----------------------------------------------------------------------------
# helpers
# ----------------------------------------------------------------------------

def estimate_json(e, dps=None):
    """``{"value", "lo", "hi"}`` of an Estimate (None stays None)."""
    if e is None:
        return None
    if isinstance(e, dict):
        return e
    return e.to_dict()


def _num(x, dps):
    if isinstance(x, (int, Fraction)):
        return num_to_str(x)
    return num_to_str(x, dps)


def _at(x) -> str:
    """A coupling as text, written as :mod:`resum.resummation` writes it (30 digits)."""
    if isinstance(x, Fraction):
        x = mpmath.mpf(x.numerator) / x.denominator
    return num_to_str(mpmath.mpf(x), 30)


def _numbers(vals, dps, key):
    from .spec import _number
    if not isinstance(vals, list) or not vals:
        raise InputError(f"{key}: expected a non-empty list of numbers")
    out = []
    for i, v in enumerate(vals):
        out.append(_number(v, dps, f"{key}[{i}]"))
    return out


def _check_kind(key, val, kind, dps):
    if kind == "numbers":
        return _numbers(val, dps, key)
    if kind == "number":
        from .spec import _number
        return _number(val, dps, key)
    if kind == "raw":          # checked by the task's own check (_CHECKS)
        return val
    if kind == "ints":
        if not isinstance(val, list) or not val or not all(
                isinstance(v, int) and not isinstance(v, bool) and v > 0 for v in val):
            raise InputError(f"{key}: expected a non-empty list of positive integers")
        return list(val)
    if kind == "int":
        if not isinstance(val, int) or isinstance(val, bool):
            raise InputError(f"{key}: expected an integer, got {val!r}")
        return val
    if kind == "bool":
        if not isinstance(val, bool):
            raise InputError(f"{key}: expected true or false, got {val!r}")
        return val
    if kind == "str":
        if not isinstance(val, str):
            raise InputError(f"{key}: expected a string, got {val!r}")
        return val
    if kind == "strs":
        if not isinstance(val, list) or not all(isinstance(v, str) for v in val) or not val:
            raise InputError(f"{key}: expected a non-empty list of strings")
        return list(val)
    if kind == "table":
        if not isinstance(val, dict):
            raise InputError(f"{key}: expected a table")
        return dict(val)
    raise AssertionError(kind)


def validate_task(name: str, opts: dict, dps: int, source_name: str, source, names=None) -> dict:
    """Check a task's options; returns them converted (numbers parsed). ``names``: the family's
    parameters at one point (their first values), which expressions in ``strong_terms`` may use."""
    td = TASKS[name]
    out = {}
    for k, kind in td.options.items():
        if k in opts:
            out[k] = _check_kind(k, opts[k], kind, dps)
    for k in td.required:
        if k not in out:
            raise InputError(f"task {name!r} needs option {k!r}")
    check = _CHECKS.get(name)
    if check:
        check(out, source_name, source, names=names)
    if out.get("goal_digits") is not None and float(out["goal_digits"]) > dps:
        # a band is never narrower than the digits the study works at: the goal could not be met
        raise InputError(f"goal_digits = {float(out['goal_digits']):g} is more than the study's dps = {dps}; "
                         "raise dps or lower the goal")
    return out


# ----------------------------------------------------------------------------
# coefficients: partial sums and a plain ratio estimate
# ----------------------------------------------------------------------------

def ratio_estimate(coeffs, ctx: Context, tail: int = 8, digits=None, order: int = 3) -> dict:
    """Ratio-method estimate of the radius from coefficients alone.

    With ``r_n = c_n / c_{n-d}`` (``d`` the spacing of the non-zero
    coefficients) and the usual ansatz ``r_n = mu^d (1 + a_1/n + a_2/n^2 + ...)``,
    Neville's table extrapolates ``r_n`` polynomially in ``1/n`` to
    ``1/n = 0``; column ``k`` removes the terms up to ``1/n^k``. The estimate
    is column ``order`` at the highest ``n`` and the radius is
    ``|T|^(-1/d)``. When ``log|r_n|`` grows like ``log n`` (factorial growth,
    ``c_n ~ A^-n n!``) the radius is zero and the same table applied to
    ``r_n / n^d`` estimates ``1/|A|^d``, the distance of the nearest
    Borel-plane singularity.

    Returns a dict with ``growth`` ("finite radius" or "factorial"),
    ``radius`` or ``borel_distance`` (estimate dicts), ``status``, the
    columns used and ``how``.

    Notes
    -----
    The band is the largest of: three times the change from column ``order - 1``
    to column ``order`` at the highest ``n``; twice the spread of column
    ``order`` over the last ``tail`` orders; and the rounding of the table
    (``n^order`` times the relative precision ``10^-digits`` of the
    coefficients, ``digits`` defaulting to ``ctx.dps``). It is an estimate,
    not a bound: the columns converge slowly when the singularity carries
    logarithms or a second singularity lies nearly as close, and they
    oscillate when several singularities share the nearest modulus (complex
    pairs); then the band is wide and the status says ``not converged``
    (relative band above 1 %).

    Examples
    --------
    >>> from resum.context import Context
    >>> ctx = Context(dps=20)
    >>> r = ratio_estimate([(n + 1) * mpmath.mpf(2) ** -n for n in range(30)], ctx)
    >>> r["growth"], r["radius"]["value"][:6]
    ('finite radius', '2.0')

    References
    ----------
    Ratio method with polynomial extrapolation in 1/n: common practice, no
    source (see e.g. the reviews of series analysis in critical phenomena).
    """
    with ctx.working():
        c = [mpmath.mpf(x) if not isinstance(x, mpmath.mpc) else x for x in coeffs]
        nz = [k for k, x in enumerate(c) if x != 0]
        base = {"method": "ratio", "tail": tail, "order": order}
        need = tail + order + 2
        if len(nz) < need:
            return {**base, "status": Status.TOO_FEW_TERMS.value, "growth": "",
                    "radius": None, "borel_distance": None,
                    "how": f"needs at least {need} non-zero coefficients, has {len(nz)}"}
        d = 0
        for a, b in zip(nz, nz[1:]):
            d = math.gcd(d, b - a)
        ns = [n for n in range(nz[0] + d, len(c), d) if c[n - d] != 0 and c[n] != 0]
        r = {n: c[n] / c[n - d] for n in ns}
        keys = sorted(r)
        # growth: the analysis' classification (a robust slope of log|c_n/c_(n-2)| against log n
        # in u = x^d): two ratios alone swing by orders of magnitude where a complex pair makes
        # the coefficients oscillate (1/(1 + x/2 + x^2) was read as factorial, radius 0 +- 0)
        from ..estimators.ratio import classify_growth
        kind, kappa = classify_growth(c[nz[0]::d])
        slope = kappa * d
        factorial = kind == "factorial"
        last_r = [r[n] for n in keys[-tail:]]
        if all(not isinstance(v, mpmath.mpc) for v in last_r) and len({mpmath.sign(v) for v in last_r}) > 1:
            # ratios of changing sign: a complex pair (or several singularities at one distance),
            # which a plain ratio table cannot extrapolate
            return {**base, "status": Status.NOT_CONVERGED.value, "growth": kind,
                    "radius": None, "borel_distance": None, "spacing": d,
                    "log_slope": num_to_str(slope, 6),
                    "how": f"the last {tail} ratios c_n/c_(n-d) change sign (a complex pair or several "
                           "singularities at the same distance): no plain ratio estimate; the analyze "
                           "task's conjugate-pair and Padé estimators handle it"}
        col = {n: (r[n] / mpmath.mpf(n) ** d if factorial else r[n]) for n in keys}
        table = [col]
        for k in range(1, order + 1):
            prev, cur = table[-1], {}
            for n in keys:
                m = n - k * d
                if n in prev and (n - d) in prev and m > 0:
                    hn, hm = mpmath.mpf(1) / n, mpmath.mpf(1) / m
                    cur[n] = (hm * prev[n] - hn * prev[n - d]) / (hm - hn)
            table.append(cur)
        top, below = table[order], table[order - 1]
        usable = [n for n in sorted(top) if top[n] != 0]
        if len(usable) < tail:
            return {**base, "status": Status.TOO_FEW_TERMS.value, "growth": "",
                    "radius": None, "borel_distance": None,
                    "how": f"only {len(usable)} usable orders in column {order}"}

        def dist(t):
            return abs(t) ** (-mpmath.mpf(1) / d)

        n_top = usable[-1]
        last = dist(top[n_top])
        samples = [dist(top[n]) for n in usable[-tail:]]
        step = abs(dist(below[n_top]) - last) if below.get(n_top) else mpmath.inf
        spread = max(abs(v - last) for v in samples)
        dig = ctx.dps if digits is None else min(int(digits), ctx.dps)
        floor = abs(last) * mpmath.mpf(n_top) ** order * mpmath.mpf(10) ** (-dig)
        half_width = max(3 * step, 2 * spread, floor)
        est = Estimate(last, last - half_width, last + half_width)
        rel = half_width / abs(last) if last != 0 else mpmath.inf
        status = Status.CONVERGED if rel < mpmath.mpf("0.01") else Status.NOT_CONVERGED
        if factorial:
            out = {**base, "growth": "factorial", "radius": estimate_json(Estimate.exact(0)),
                   "borel_distance": estimate_json(est)}
        else:
            out = {**base, "growth": "finite radius", "radius": estimate_json(est),
                   "borel_distance": None}
        out.update(status=status.value, spacing=d, orders_used=[usable[-tail], n_top],
                   log_slope=num_to_str(slope, 6),
                   how=(f"Neville table in 1/n of the ratios r_n = c_n/c_(n-d), d={d}"
                        f"{', divided by n^d' if factorial else ''}, column {order} at n={n_top}; "
                        f"band = max(3 x change from column {order - 1}, 2 x spread of the last "
                        f"{tail}, rounding)"))
        return out


def _run_coefficients(series, params, ctx, opts, source):
    dense = series.dense(ctx)
    out = {"n_terms": series.n_terms, "digits": series.digits,
           "exact": series.is_exact, "variable": series.variable}
    out["ratio"] = ratio_estimate(dense, ctx, tail=opts.get("tail", 8), digits=series.digits,
                                  order=opts.get("order", 3))
    sums = []
    with ctx.working():
        for x in opts.get("at", []):
            xv = mpmath.mpf(x.numerator) / x.denominator if isinstance(x, Fraction) else mpmath.mpf(x)
            s = mpmath.mpf(0)
            last = mpmath.mpf(0)
            for n, cn in enumerate(dense):
                term = cn * xv ** n
                s += term
                if cn != 0:
                    last = abs(term)
            sums.append({"at": _at(x), "partial_sum": num_to_str(s, ctx.dps),
                         "last_term": num_to_str(last, 6)})
    out["partial_sums"] = sums
    out["note"] = ("partial sums of all terms; last_term is the size of the last non-zero term, "
                   "not an error band")
    return out


# ----------------------------------------------------------------------------
# analyze / evaluate / strong / truth: thin wrappers over the library
# ----------------------------------------------------------------------------

def _result_json(res) -> dict:
    """A result object as JSON: its contract dict when it has one, else to_dict()."""
    if hasattr(res, "contract_dict"):
        return res.contract_dict()
    if hasattr(res, "to_dict"):
        return res.to_dict()
    raise TypeError(f"cannot record a {type(res).__name__}")


def _run_analyze(series, params, ctx, opts, source):
    from ..analysis import analyze
    from ..estimators._common import refused_polynomial_degree
    deg = None if series.is_zero() else refused_polynomial_degree(series, ctx)
    if deg is not None:
        # a point of a family where the series is a polynomial (the bes angle pi/2: 4 g^2) is an
        # answer, not a failure: entire, no singularity (the analysis itself refuses the input)
        return {"radius": {"value": "inf", "lo": "inf", "hi": "inf"}, "singularities": [],
                "warnings": [f"the series is a polynomial of degree {deg} in {series.variable}: "
                             "entire, no singularity"],
                "growth": "polynomial", "status": "converged", "methods": {}}
    kw = {}
    if "methods" in opts:
        kw["methods"] = opts["methods"]
    res = analyze(series, ctx=ctx, verify=opts.get("verify", True), **kw)
    return _result_json(res)


def _points_arg(vals):
    return list(vals)


def _number_params(params) -> dict:
    """The parameters of a point that are numbers (names an expression may use)."""
    out = {}
    for k, v in (params or {}).items():
        if isinstance(v, bool):
            continue
        if isinstance(v, (int, Fraction, mpmath.mpf)):
            out[k] = v
        elif isinstance(v, float):
            out[k] = mpmath.mpf(repr(v))
    return out


def _toml_text(v):
    """A TOML value for the expression reader: a float as the digits it was written with."""
    return repr(v) if isinstance(v, float) else v


def _known(opts, dps: int = 30, names=None) -> dict:
    """The keywords of :func:`resum.resummation.evaluate` from a task's ``singularities`` and
    ``borel_singularities`` (lists of numbers or expression strings, complex allowed),
    ``borel_b`` and ``strong_terms`` (whose expressions may name the family's parameters:
    ``names``, the point's values); InputError naming the key."""
    from ..resummation import borel_parameter, singular_points
    text = _toml_text
    kw = {}
    for key in ("singularities", "borel_singularities"):
        if key not in opts:
            continue
        vals = opts[key]
        if not isinstance(vals, list) or not vals:
            raise InputError(f"{key}: expected a non-empty list of numbers or expression strings")
        kw[key] = singular_points([text(v) for v in vals], dps, name=lambda k, key=key: f"{key}[{k}]")
    if "borel_b" in opts:
        try:
            kw["borel_b"] = borel_parameter(text(opts["borel_b"]), dps)
        except InputError as exc:
            raise InputError(exc.bare, where="borel_b") from None
    if "strong_terms" in opts:
        kw["strong_terms"] = _strong_table(opts["strong_terms"], dps, names)
    return kw


def _strong_table(table, dps: int, names=None) -> dict:
    """A task's ``strong_terms`` table, ``{"g^1" = 2, "g^0" = "-3*log(2)/(2*pi)"}`` (labels: a
    power of the coupling, P a whole number or a fraction), as ``{power: value}`` for
    :func:`resum.resummation.evaluate`; the powers' spacing is checked when the series is known.
    A value may name the family's parameters (``"8*angle/(pi*sin(2*angle))"``), bound to the
    point's values in ``names``: it is then evaluated here
    (:func:`resum.resummation.strong_coefficient`: value(error) text or a decimal make it an
    Estimate)."""
    from ..estimators.strong_coupling import label_power, power_key
    from ..resummation import strong_coefficient
    if not isinstance(table, dict) or not table:
        raise InputError("strong_terms: expected a table such as {\"g^1\" = 2, \"g^0\" = \"-3*log(2)/(2*pi)\"}")
    out = {}
    for label, v in table.items():
        lp = label_power(power_key(label))
        if lp is None or lp[1] or not str(label).strip()[:1].isalpha():
            raise InputError(f"strong_terms: write each key as a power of the coupling such as \"g^1\" or "
                             f"\"g^-1/2\", got {label!r}")
        if isinstance(v, bool) or not isinstance(v, (int, float, str)):
            raise InputError(f"strong_terms.{label}: expected a number or an expression string")
        try:
            with mpmath.workdps(dps):
                val = strong_coefficient(_toml_text(v), dps, names=names)
        except InputError as exc:
            raise InputError(exc.bare, where=f"strong_terms.{label}") from None
        # with parameters bound, the value of this point; without, the text (checked) as written
        out[str(lp[0])] = val if names else _toml_text(v)
    return out


def _run_evaluate(series, params, ctx, opts, source, rebuild=None):
    from ..resummation import evaluate, evaluate_with_goal
    kw = {"method": opts.get("method", "auto"), "verify": opts.get("verify", True)}
    kw.update(_known(opts, ctx.work_dps, names=_number_params(params)))
    if opts.get("goal_digits") is None or rebuild is None:
        return _result_json(evaluate(series, _points_arg(opts["at"]), ctx=ctx, **kw))
    res, search, _ = evaluate_with_goal(series, _points_arg(opts["at"]), float(opts["goal_digits"]),
                                     rebuild, ctx=ctx, max_terms=opts.get("max_terms"), **kw)
    out = _result_json(res)
    out["order_search"] = search
    return out


def _strong_json(res) -> dict:
    """Compact record of a StrongCouplingResult: coefficients as a label -> band table."""
    from ..estimators.strong_coupling import _spacing_str
    est = lambda e: None if e is None else e.to_dict()  # noqa: E731
    exp = res.diagnostics.get("exponential")
    kappa = {"kappa": exp["kappa"].to_dict()} if isinstance(exp, dict) and exp.get("kappa") is not None else {}
    return {"success": res.success, "status": res.status.value, "message": res.message,
            "variable": res.variable,
            "leading_power": est(res.leading_power), "power_source": res.power_source,
            "spacing": None if res.spacing is None else _spacing_str(res.spacing),
            "spacing_source": res.spacing_source,
            "coefficients": {k: e.to_dict() for k, e in res.coefficients},
            "trusted_up_to": None if res.trusted_up_to is None else num_to_str(res.trusted_up_to, 20),
            "couplings": [num_to_str(g, 20) for g in res.couplings],
            "values": [est(v) for v in res.values],
            "warnings": list(res.warnings), **kappa}


def _run_strong(series, params, ctx, opts, source):
    from ..resummation import probe_strong_coupling
    kw = {k: opts[k] for k in ("couplings", "method", "leading_power", "log_terms",
                               "max_rel_band", "spacing", "exponential", "kappa") if k in opts}
    if "n_terms_fit" in opts:
        kw["n_terms_fit"] = tuple(opts["n_terms_fit"])
    known = _known(opts, ctx.work_dps)
    if known:
        kw["evaluate_options"] = known
    out = {}
    if opts.get("resummed", True):
        out["resummed"] = _strong_json(probe_strong_coupling(series, ctx=ctx, **kw))
    if opts.get("from_truth", False):
        f = truth_function(source)
        if "couplings" not in kw:
            raise InputError("strong: from_truth needs explicit couplings")
        vals, reasons = truth_values(f, _truth_ctx(ctx, opts), list(kw["couplings"]), params)
        if any(reasons):
            # the evaluator cannot give these values (Euler's same-sign series has no Borel sum):
            # the fit to them is not available; the resummed fit and the other tasks stand
            out["truth"] = {"success": False, "status": NOT_AVAILABLE,
                            "message": _not_available(kw["couplings"], reasons)}
        elif any(v is None for v in vals):
            out["truth"] = {"success": False, "status": Status.FAILED.value,
                            "message": "the finite-coupling evaluator failed at some coupling"}
        else:
            out["truth"] = _strong_json(probe_strong_coupling(series, ctx=ctx, values=vals, **kw))
    return out


def truth_function(source):
    """The source's finite-coupling evaluator, or None."""
    for attr in ("truth", "exact", "finite_coupling"):
        f = _get(source, attr)
        if callable(f):
            return f
    return None


def _truth_ctx(ctx, opts):
    d = opts.get("truth_dps", opts.get("dps"))
    return ctx if d is None else Context(dps=int(d))


NOT_AVAILABLE = "not available"


def truth_values(f, ctx, points, params):
    """``(values, reasons)``: the evaluator ``f``'s values at ``points`` and, for each point, None
    or why ``f`` cannot give a value there.

    An InputError from the evaluator at a point of a validated spec says that the value does not
    exist for these parameters (Euler's same-sign series has no Borel sum on the positive axis) or
    lies outside the evaluator's reach (the phi^4 closed form at g <= 0): the values are then
    asked one coupling at a time, so that those it can give are kept. Any other exception passes
    (a failure of the point, with its traceback)."""
    points = list(points)
    try:
        return list(f(ctx, points, **params)), [None] * len(points)
    except InputError:
        pass
    vals, reasons = [], []
    for x in points:
        try:
            (v,) = f(ctx, [x], **params)
            why = None
        except InputError as exc:
            v, why = None, str(exc).strip().splitlines()[0] if str(exc).strip() else "InputError"
        vals.append(v)
        reasons.append(why)
    return vals, reasons


def _not_available(points, reasons) -> str:
    """``"not available: <reason>"`` (with the couplings it concerns when not all)."""
    missing = [(x, r) for x, r in zip(points, reasons) if r]
    if len(missing) == len(points) and len({r for _, r in missing}) == 1:
        return f"not available: {missing[0][1]}"
    return "not available at " + "; ".join(f"{_at(x)}: {r}" for x, r in missing)


def _run_truth(series, params, ctx, opts, source):
    f = truth_function(source)
    tctx = _truth_ctx(ctx, opts)
    res, reasons = truth_values(f, tctx, _points_arg(opts["at"]), params)
    out = []
    for x, v, why in zip(opts["at"], res, reasons):
        row = {"at": _at(x)}
        if why:
            # no value to compare with: an empty cell in the summary, nothing drawn
            row.update(value=None, success=False, message=f"not available: {why}")
        elif v is None:
            row.update(value="nan", lo="nan", hi="nan", success=False)
        elif isinstance(v, Estimate):
            row.update(v.to_dict(), success=True)
        else:
            row.update(value=_num(v, tctx.dps), success=True)
        out.append(row)
    rec = {"values": out, "dps": tctx.dps}
    if any(reasons):
        rec.update(status=NOT_AVAILABLE if all(reasons) else "partly available",
                   message=_not_available(opts["at"], reasons))
    else:
        rec["status"] = "ok"
    return rec


def _check_truth(opts, source_name, source):
    if truth_function(source) is None:
        raise InputError(f"source {source_name!r} has no finite-coupling evaluator; "
                         "drop the truth task")


def _check_module(mod, name):
    def check(opts, source_name, source, names=None):
        import importlib
        try:
            m = importlib.import_module(f"resum.{mod}")
        except ImportError:
            raise InputError(f"task needs resum.{mod}, which is not available in this "
                             "installation") from None
        if not hasattr(m, name):
            raise InputError(f"task needs resum.{mod}.{name}, which is not available")
        methods = getattr(m, "METHODS", None)
        asked = opts.get("methods") or ([opts["method"]] if "method" in opts else [])
        if methods is not None:
            for a in asked:
                if a != "auto" and a not in methods:
                    raise InputError(f"unknown method {a!r}; known: {', '.join(sorted(methods))}")
    return check


def _check_strong(opts, source_name, source, names=None):
    _check_module("resummation", "probe_strong_coupling")(opts, source_name, source)
    _known(opts)
    if opts.get("from_truth"):
        _check_truth(opts, source_name, source)
        if "couplings" not in opts:
            raise InputError("from_truth = true needs explicit couplings")
    if not opts.get("resummed", True) and not opts.get("from_truth"):
        raise InputError("nothing to do: resummed = false and from_truth is not set")
    for k in ("truth_dps",):
        if k in opts and not 5 <= opts[k] <= 1000:
            raise InputError(f"{k} out of range; use 5..1000")
    if "max_rel_band" in opts:
        try:
            ok = 0 < float(opts["max_rel_band"]) < 1
        except (TypeError, ValueError):
            ok = False
        if not ok:
            raise InputError("max_rel_band must be a number between 0 and 1 (the largest relative band of a "
                             "resummed value the fit uses)")
    if "spacing" in opts:
        from ..estimators.strong_coupling import _spacing_arg
        _spacing_arg(opts["spacing"], 30)
    if "exponential" in opts or "kappa" in opts:
        from ..estimators.strong_coupling import exponential_options
        exponential_options(opts.get("exponential", "auto"), opts.get("kappa"), 30)
    if "couplings" in opts and isinstance(opts["couplings"], (list, tuple)) and len(set(map(str, opts["couplings"]))) < 4:
        raise InputError("couplings: the fit needs at least 4 distinct couplings")


def _check_truth_task(opts, source_name, source, names=None):
    _check_truth(opts, source_name, source)
    if "dps" in opts and not 5 <= opts["dps"] <= 1000:
        raise InputError("dps out of range; use 5..1000")


def _check_evaluate(opts, source_name, source, names=None):
    _check_module("resummation", "evaluate")(opts, source_name, source)
    _known(opts, names=names)
    if opts.get("goal_digits") is not None:
        g = opts["goal_digits"]
        if not 0 < float(g) <= 1000:
            raise InputError("goal_digits must be a number of digits from 1 to 1000")
        if not _get(source, "length"):
            raise InputError(f"goal_digits: source {source_name!r} does not say which parameter sets "
                             "its number of terms (a 'length' entry), so it cannot be asked for more")
    if opts.get("max_terms") is not None and opts["max_terms"] < 3:
        raise InputError("max_terms must be at least 3")


def _check_coefficients(opts, source_name, source, names=None):
    if opts.get("tail", 8) < 3:
        raise InputError("tail must be at least 3")
    if not 1 <= opts.get("order", 3) <= 8:
        raise InputError("order (columns of the ratio table) must be 1..8")


TASKS = {
    "coefficients": TaskDef("coefficients", "partial sums and a plain ratio estimate",
                            {"at": "numbers", "tail": "int", "order": "int"}, _run_coefficients),
    "analyze": TaskDef("analyze", "radius, singularities and exponents with bands",
                       {"methods": "strs", "verify": "bool"}, _run_analyze),
    "evaluate": TaskDef("evaluate", "resummed values at given couplings (goal_digits: "
                        "regenerate the series with the terms projected to reach them)",
                        {"at": "numbers", "method": "str", "verify": "bool", "goal_digits": "number",
                         "max_terms": "int", "singularities": "raw", "borel_singularities": "raw",
                         "borel_b": "raw", "strong_terms": "raw"}, _run_evaluate, required=("at",), wants_rebuild=True),
    "strong": TaskDef("strong", "strong-coupling probe",
                      {"couplings": "numbers", "method": "str", "leading_power": "number",
                       "log_terms": "bool", "n_terms_fit": "ints", "max_rel_band": "number",
                       "spacing": "raw", "exponential": "str", "kappa": "number", "singularities": "raw",
                       "borel_singularities": "raw", "borel_b": "raw",
                       "resummed": "bool", "from_truth": "bool", "truth_dps": "int"},
                      _run_strong),
    "truth": TaskDef("truth", "finite-coupling ground truth from the source",
                     {"at": "numbers", "dps": "int"}, _run_truth, required=("at",)),
}

_CHECKS = {
    "coefficients": _check_coefficients,
    "analyze": _check_module("analysis", "analyze"),
    "evaluate": _check_evaluate,
    "strong": _check_strong,
    "truth": _check_truth_task,
}
