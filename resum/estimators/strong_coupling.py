"""Strong-coupling probe: resum at growing coupling and fit an asymptotic form.

:func:`probe_strong_coupling` evaluates the resummed function on a grid of
growing couplings (``resum.resummation.evaluate``), keeps the points whose
band is narrow enough to trust, estimates the leading power ``p`` of
``f ~ a_0 g^p`` from the log-derivative ``d log f / d log g`` (secants between
neighbouring points, extrapolated in ``g^-S``) unless the user gives it, and
fits

    f(g) = sum_k a_k g^(p - k S)   [+ sum_k b_k g^(p - k S) log g  with log_terms]

by weighted least squares (weights 1/band). The spacing ``S`` of the powers is
given, or chosen from :data:`AUTO_SPACINGS` (2, 1, 2/3, 1/2, 1/3) by
:func:`_choose_spacing`: of the spacings whose fits over all trusted couplings
match the values within their bands with the fewest terms, the largest. The
quartic oscillator needs 2/3 (``E(g) = g^(1/3) (e0 + e1 g^(-2/3) + ...)``), the
kernel family 1. The fit is repeated over an
ensemble (number of terms in the form, lowest coupling kept); each
coefficient's value is the median over the ensemble, and its band is 3
times the larger of the ensemble's central spread (16th to 84th percentile
around the median) and the median least-squares standard error. Weights are 1/band, floored at a 1e-10 relative band.

Exponentially small terms. Where no fit of the power form over all the trusted
couplings matches the values within their bands (chi2/dof above
:data:`MATCH_CHI2`), the fits are repeated
with ``A e^(-kappa g)`` (one term, or two with ``A' e^(-kappa g)/g``) added,
``kappa`` found per fit by a search of the least-squares misfit
(:func:`_ensemble_exp`); when one of those fits over all the trusted couplings
matches, they (those within :data:`EXP_KEEP_CHI2`) replace the power
fits and ``kappa`` is reported with its band (``diagnostics["exponential"]``).
Such terms arise where the strong-coupling expansion is asymptotic and its
Borel transform has a singularity at ``kappa`` (common practice, no source):
the angle-deformed kernel family at ``a = 0`` has exactly
``(2/pi^2) log(1 + e^(-4 pi g))`` beyond its two power terms.
``exponential="always"`` adds them in any case, ``"never"`` never.

What the bands mean: the coefficient bands measure how much the fitted
numbers move when the truncation of the asymptotic form and the fitting
window change, given the resummed values and their bands. They do not
account for terms the form leaves out entirely (exponentially small
corrections beyond the one fitted, unexpected logs); comparing ``log_terms``
on/off and the reported ``trusted_up_to`` coupling tells how far to rely on them.

>>> from resum.series import Series, Coupling
>>> from resum.context import Context, workdps
>>> import mpmath
>>> with workdps(60):                       # log(1 + x) as a series in x = g: ~ log g + 1/g
...     cs = [0] + [mpmath.mpf(-1) ** (k + 1) / k for k in range(1, 60)]
>>> s = Series(cs, digits=50)          # log(1 + x) = log x + 1/x - 1/(2 x^2) + ...
>>> r = probe_strong_coupling(s, couplings=[8, 10, 12, 16, 20, 24, 32, 40, 48, 64],
...                           leading_power=0, log_terms=True, n_terms_fit=(3, 4), ctx=Context(dps=20),
...                           evaluate_options={"verify": False, "use_analysis": False})
>>> r.coefficient("x^0 log x").contains(1), r.coefficient("x^-1").contains(1)
(True, True)
"""
from __future__ import annotations

import math
from dataclasses import dataclass, field
from fractions import Fraction
from typing import Optional, Sequence

import re

import flint
import mpmath

from ..context import Context, checked_context, workdps
from ..errors import InputError, InputTypeError
from ..results import Estimate, Provenance, Status, jsonable, num_to_str, sig_text
from ..series import Series
from ._num import lu_solve

__all__ = ["probe_strong_coupling", "StrongCouplingResult", "simple_rational"]


@dataclass(frozen=True)
class StrongCouplingResult:
    """Outcome of :func:`probe_strong_coupling`.

    ``couplings``/``values``: the resummed values used (Estimate each, ``None``
    where the resummation failed); ``trusted_up_to``: the largest coupling
    whose band met ``max_rel_band``; ``leading_power``: Estimate of ``p``
    (exact when given by the user or rounded to a simple rational, see
    ``power_source``); ``coefficients``: tuple of ``(label, Estimate)`` such as
    ``("g^1", ...)``, ``("g^0", ...)``, ``("g^-1 log g", ...)``;
    ``comparison``: per expected label, ``{"expected", "inside", "sigma"}``;
    ``spacing``: the step S between the fitted powers p, p - S, ... (a Fraction, or an
    mpf when not a simple fraction; None for an exact polynomial or before any fit),
    ``spacing_source``: "given" or why it was chosen.
    """

    success: bool
    status: Status
    message: str
    variable: str
    couplings: tuple
    values: tuple
    trusted_up_to: object
    leading_power: Optional[Estimate]
    power_source: str
    coefficients: tuple
    comparison: dict = field(default_factory=dict)
    warnings: tuple = ()
    diagnostics: dict = field(default_factory=dict)
    provenance: Optional[Provenance] = None
    spacing: object = None
    spacing_source: str = ""

    def coefficient(self, label: str) -> Optional[Estimate]:
        for k, e in self.coefficients:
            if k == label:
                return e
        return None

    def to_dict(self) -> dict:
        return {"success": self.success, "status": self.status.value, "message": self.message,
                "variable": self.variable,
                "couplings": [num_to_str(g, 20) for g in self.couplings],
                "values": [None if v is None else v.to_dict() for v in self.values],
                "trusted_up_to": None if self.trusted_up_to is None else num_to_str(self.trusted_up_to, 20),
                "leading_power": None if self.leading_power is None else self.leading_power.to_dict(),
                "power_source": self.power_source,
                "coefficients": [[k, e.to_dict()] for k, e in self.coefficients],
                "comparison": jsonable(self.comparison), "warnings": list(self.warnings),
                "diagnostics": jsonable(self.diagnostics),
                "provenance": None if self.provenance is None else self.provenance.to_dict(),
                "spacing": None if self.spacing is None else _spacing_str(self.spacing),
                "spacing_source": self.spacing_source}

    @classmethod
    def from_dict(cls, d: dict) -> "StrongCouplingResult":
        # couplings are written with 20 digits: read them with all of those, not at the ambient
        # precision (6.01 came back as 6.0099999999999997868)
        with workdps(max([mpmath.mp.dps, 30] + [len(str(g)) + 5 for g in d["couplings"]]
                         + [len(str(d.get("trusted_up_to") or "")) + 5])):
            return cls._from_dict(d)

    @classmethod
    def _from_dict(cls, d: dict) -> "StrongCouplingResult":
        return cls(bool(d["success"]), Status(d["status"]), d.get("message", ""), d.get("variable", "g"),
                   tuple(mpmath.mpf(g) for g in d["couplings"]),
                   tuple(None if v is None else Estimate.from_dict(v) for v in d["values"]),
                   None if d.get("trusted_up_to") is None else mpmath.mpf(d["trusted_up_to"]),
                   None if d.get("leading_power") is None else Estimate.from_dict(d["leading_power"]),
                   d.get("power_source", ""),
                   tuple((k, Estimate.from_dict(e)) for k, e in d.get("coefficients", [])),
                   dict(d.get("comparison", {})), tuple(d.get("warnings", [])),
                   dict(d.get("diagnostics", {})),
                   None if d.get("provenance") is None else Provenance.from_dict(d["provenance"]),
                   _read_spacing(d.get("spacing")), d.get("spacing_source", ""))


#: best chi2 per degree of freedom over the ensemble above which the fitted form is rejected:
#: the fits miss the values by 100 times their bands (between MATCH_CHI2 and this, a warning only)
GROSS_MISFIT = 10 ** 4

#: best chi2 per degree of freedom at or below which the fits match the values within their
#: bands (the fits miss by at most twice the bands): the test of a spacing in the automatic choice
MATCH_CHI2 = 4

#: points to spare that a fit needs to count in the automatic choice of the spacing: with one,
#: a wrong form matches too easily (the kernel family at a = 5 pi/12 from 60 loops, 5 sharp
#: values up to g = 3: spacing 1/2 matched with 4 terms at chi2/dof 0.2, and its g^1 came out
#: 7.6 [-0.9, 16], against 7.0(9) with 1; the evaluator's values there, fitted with 3 or 4
#: terms, miss least with spacing 1, and give 6.7(3))
CHOICE_DOF = 2

#: the smallest and the largest spacing accepted
MIN_SPACING, MAX_SPACING = Fraction(1, 1000), 100

#: spacings of the subleading powers tried when none is given, largest first: 2 (a function odd
#: or even in 1/g after its leading power), 1, 2/3 (the quartic oscillator, g^(1/3) (e0 + e1
#: g^(-2/3) + ...)), 1/2, 1/3
AUTO_SPACINGS = (Fraction(2), Fraction(1), Fraction(2, 3), Fraction(1, 2), Fraction(1, 3))

#: exponentially small terms (:func:`_ensemble_exp`): how many, ``e^(-kappa g) g^-j`` for
#: ``j < n``; the range searched for ``kappa g_min`` (the smallest coupling of the fit's window)
#: on a log grid of EXP_GRID points, refined by EXP_REFINE golden-section steps; a fit whose best
#: kappa lies at an end of the range has no exponential to fit and is dropped
EXP_TERMS = (1, 2)
EXP_RANGE = (0.05, 80.0)
EXP_GRID = 40
EXP_REFINE = 24
#: exponential fits whose chi2/dof exceed this are left out of the coefficients' ensemble (the
#: power fits they replace all missed by far more: kernel family at a = 3 pi/8, 100 loops, g = 1
#: to 8, chi2/dof 1.5e6 at best; with the exponential 0.02 to 600, and the g^1 coefficient of
#: the fits below this 4.2442-4.2452 against 4.2426, of those above it down to 4.229)
EXP_KEEP_CHI2 = 100 * MATCH_CHI2
#: what exponential= accepts
EXPONENTIAL_CHOICES = ("auto", "always", "never")


def simple_rational(x, band, max_den: int = 6):
    """The simplest fraction ``k/q`` (``q <= max_den``) inside ``[x - band, x + band]``, or None."""
    from fractions import Fraction
    best = None
    for q in range(1, max_den + 1):
        k = int(mpmath.nint(x * q))
        if abs(mpmath.mpf(k) / q - x) <= band:
            f = Fraction(k, q)
            if best is None or f.denominator < best.denominator:
                best = f
    return best


def _label(power, log, var="g"):
    from fractions import Fraction
    p = Fraction(power).limit_denominator(1000) if not isinstance(power, mpmath.mpf) else power
    txt = str(p) if not isinstance(p, mpmath.mpf) else mpmath.nstr(p, 8)
    return f"{var}^{txt}" + (f" log {var}" if log else "")


def power_key(label: str) -> str:
    """The key a power label names: spaces normalised, and the printed form of a fractional
    power taken too (``g^(1/3)`` is ``g^1/3``)."""
    return re.sub(r"\^\((-?\d+(?:/\d+)?)\)", r"^\1", " ".join(str(label).split()))


def label_power(label):
    """``(power, with_log)`` of a coefficient label such as ``"g^1/3"``, ``"g^-1 log g"`` or
    ``"g^0.94526707"`` (the power as a Fraction), or None when the label has another form."""
    from fractions import Fraction
    head, sep, rest = str(label).partition("^")
    power, _, tail = rest.strip().partition(" ")
    if not sep or not power:
        return None
    try:
        return Fraction(power), tail.strip().startswith("log")
    except (ValueError, ZeroDivisionError):
        return None


def leading_label(labels):
    """The label of the leading term among coefficient labels such as ``"g^1"``, ``"g^-1 log g"``,
    ``"g^0.94526707"``: the highest power without a log (the term the fit's leading power
    multiplies). Not the first label: a record written with sorted keys puts ``"g^-1"``
    before ``"g^1"``. None when no label has that form."""
    best = None
    for lab in labels:
        lp = label_power(lab)
        if lp is None or lp[1]:
            continue                     # a log term, or not a power
        if best is None or lp[0] > best[0]:
            best = (lp[0], lab)
    return None if best is None else best[1]


def _lstsq(rows, rhs, weights):
    A = mpmath.matrix([[r * w for r in row] for row, w in zip(rows, weights)])
    b = mpmath.matrix([v * w for v, w in zip(rhs, weights)])
    Q, R = mpmath.qr(A)
    n = A.cols
    Rn = R[:n, :n]
    qb = (Q.T * b)[:n, 0] if hasattr(Q, "T") else None
    sol = lu_solve(Rn, qb)
    resid = A * sol - b
    chi2 = sum(resid[i] ** 2 for i in range(A.rows))
    # standard errors from (R^T R)^-1
    Rinv = mpmath.inverse(Rn)
    cov = Rinv * Rinv.T
    se = [mpmath.sqrt(abs(cov[i, i])) for i in range(n)]
    return [sol[i] for i in range(n)], se, chi2


def _whole(k) -> int:
    if isinstance(k, bool) or int(k) != k:
        raise ValueError(k)
    return int(k)


def _positive(v, where: str):
    """``v`` (a number or a decimal text such as ``"1e-3"``) as an mpf above 0, else an InputError."""
    try:
        if isinstance(v, bool):
            raise TypeError
        x = mpmath.mpmathify(v)
        ok = isinstance(x, mpmath.mpf) and mpmath.isfinite(x) and x > 0
    except (TypeError, ValueError):
        ok = False
    if not ok:
        raise InputError(f"must be a real number above 0 such as 1e-4, got {v!r}", where=where)
    return x


def probe_strong_coupling(series, couplings: Optional[Sequence] = None, ctx: Optional[Context] = None,
                          method: str = "auto", leading_power=None, log_terms: bool = False,
                          n_terms_fit: Sequence[int] = (3, 4, 5, 6), expected: Optional[dict] = None,
                          max_rel_band=mpmath.mpf("1e-4"), evaluate_options: Optional[dict] = None,
                          values: Optional[Sequence] = None, spacing=None,
                          exponential="auto", kappa=None) -> StrongCouplingResult:
    """Fit the strong-coupling form ``sum_k a_k g^(p - k S)`` of a resummed series.

    Parameters
    ----------
    series : Series
        The weak-coupling series (its declared coupling, if any, is the ``g``).
    couplings : sequence, optional
        Couplings to evaluate at (default: 4, 6, 8, 12, 16, 24, 32, 48, 64, 80
        times the distance to the nearest singularity in ``g``, or for a
        factorially divergent series to the nearest singularity of its Borel
        transform, rounded to three significant digits).
    method, evaluate_options :
        Passed to :func:`resum.resummation.evaluate`.
    leading_power : number, optional
        ``p`` in ``f ~ a g^p``; estimated from the log-derivative if omitted.
    log_terms : bool
        Also fit ``g^(p - k S) log g`` terms.
    spacing : number, fraction or string, optional
        ``S``, the step between the powers of the form: ``p, p - S, p - 2 S, ...``
        (``2/3`` for the anharmonic oscillator's ``g^(1/3) (e0 + e1 g^(-2/3) + ...)``).
        Default (``None`` or ``"auto"``): each of :data:`AUTO_SPACINGS` is tried (with
        its own leading power, unless given) and of those whose fits over all trusted
        couplings match the values within their bands (chi2/dof at most
        :data:`MATCH_CHI2`) with the fewest terms the largest is kept; when none
        matches, 1 (see :func:`_choose_spacing`). The result's ``spacing`` (a Fraction,
        or an mpf when not a simple fraction) and ``spacing_source`` say which and why;
        ``diagnostics["spacing_trials"]`` holds, per spacing tried, its leading power
        and the chi2/dof of its fits over all trusted couplings per number of terms.
    n_terms_fit : sequence of int
        Numbers of power terms tried in the ensemble.
    expected : dict, optional
        ``{label: value}`` to compare with, labels as in the result
        (``"g^1"``, ``"g^0"``, ...).
    max_rel_band : number
        A point is trusted when its band is below this fraction of its value.
    values : sequence of Estimate, optional
        Use these values at ``couplings`` instead of resumming (for example
        from a finite-coupling evaluator); the series is then only used for
        its name.
    exponential : {"auto", "always", "never"}
        Exponentially small terms ``A e^(-kappa g) (+ A' e^(-kappa g)/g)`` in the form:
        "auto" (default) tries them where no power fit over all the trusted couplings
        matches the values within their bands and keeps them when one of those fits does;
        "always" keeps them; "never"
        leaves them out. When kept, ``diagnostics["exponential"]`` holds ``kappa`` (an
        Estimate: median and 3 x the central spread over the fits kept) and how it was
        obtained.
    kappa : number, optional
        The rate of the exponentially small term when it is known (an instanton action, a
        mass gap): the fits then use it as given (linear least squares, no search), and
        ``exponential`` must not be "never".

    Returns
    -------
    StrongCouplingResult
    """
    from ..resummation import evaluate
    if not isinstance(series, Series):
        raise InputTypeError(f"expected a resum.Series, got {type(series).__name__}; build one with "
                             "Series([c0, c1, ...])", where="series")
    ctx = checked_context(ctx)
    n_terms_fit_given = n_terms_fit
    try:
        n_terms_fit = tuple(_whole(k) for k in n_terms_fit)
    except (TypeError, ValueError):
        n_terms_fit = ()
    spacing_given = _spacing_arg(spacing, ctx.work_dps)
    exponential, kappa = exponential_options(exponential, kappa, ctx.work_dps)
    if not n_terms_fit or min(n_terms_fit) < 1:
        raise InputError("must list whole numbers >= 1 such as (3, 4, 5), got "
                         f"{n_terms_fit_given!r}", where="n_terms_fit")
    max_rel_band = _positive(max_rel_band, "max_rel_band")
    if getattr(series, "start", 0) < 0:
        raise InputError(f"series starts at {series.variable}^{series.start}; multiply by "
                         f"{series.variable}^{-series.start} first", where="series")
    var = series.coupling.symbol if getattr(series, "coupling", None) is not None else series.variable
    warnings = []
    with ctx.working(10):
        if couplings is None:
            gs = _default_grid(series, ctx)
        else:
            from ..resummation import parse_points
            gs = parse_points(couplings, ctx.work_dps)
        if any(isinstance(g, mpmath.mpc) or g <= 0 for g in gs):
            raise InputError("strong-coupling couplings must be real and positive", where="couplings")
        gs = sorted(gs)
        dup = [g for a, g in zip(gs, gs[1:]) if g == a]
        if dup:
            raise InputError(f"strong-coupling couplings must be distinct; {mpmath.nstr(dup[0], 8)} is given "
                             "more than once", where="couplings")
        if values is None and series.start >= 0:
            from .resum_truncation import polynomial_degree
            c = series.dense(Context(dps=ctx.work_dps, guard=0))
            deg = polynomial_degree(c)
            if deg is not None:
                return _polynomial_result(series, c, deg, gs, ctx, var, expected, n_terms_fit, log_terms)
        if values is None:
            res = evaluate(series, gs, ctx, method=method, **(evaluate_options or {}))
            vals = [p.value if p.success else None for p in res.points]
            meth = res.provenance.method if res.provenance else method
        else:
            if len(values) != len(gs):
                raise InputError("values must match couplings one to one", where="values")
            vals = list(values)
            meth = "given values"
        trusted = [(g, v) for g, v in zip(gs, vals)
                   if v is not None and v.value != 0 and v.error <= max_rel_band * abs(v.value)]
        trusted_up_to = trusted[-1][0] if trusted else None
        if len(trusted) < 4:
            got = [g for g, v in zip(gs, vals) if v is not None]
            why = ""
            if values is None:
                bad = [p for p in res.points if not p.success and p.message]
                if bad:
                    why = f"; at {var} = {mpmath.nstr(bad[0].at, 6)}: {bad[0].message}"
            return StrongCouplingResult(False, Status.TOO_FEW_TERMS,
                                        f"only {len(trusted)} of {len(gs)} couplings "
                                        f"({mpmath.nstr(gs[0], 4)} ... {mpmath.nstr(gs[-1], 4)}) have a resummed "
                                        f"band below {sig_text(max_rel_band, 3)} of the value "
                                        f"({len(got)} gave a value at all); the fit needs 4: give more terms, "
                                        "other couplings (--at), or a larger max_rel_band (--max-band)" + why,
                                        var, tuple(gs), tuple(vals), trusted_up_to, None, "", ())
        # log-derivative secants, for the leading power
        secants = []
        for (g1, v1), (g2, v2) in zip(trusted, trusted[1:]):
            if v1.value * v2.value <= 0:
                continue
            ps = mpmath.log(v2.value / v1.value) / mpmath.log(g2 / g1)
            gm = mpmath.sqrt(g1 * g2)
            dp = (v1.error / abs(v1.value) + v2.error / abs(v2.value)) / abs(mpmath.log(g2 / g1))
            secants.append((gm, ps, dp))
        if leading_power is not None:
            # (at the working precision: a Fraction such as 1/3 rounded at 15 digits would move
            # every power g^p by 1e-17 relative)
            from ..resummation import parse_points
            given_p = parse_points([leading_power], ctx.work_dps)[0]
        else:
            given_p = None
        # for the spacing given, or for each candidate spacing in turn: the leading power (the
        # secants extrapolated in g^-S) and the ensemble of fits
        trials = []
        for sp in ([spacing_given] if spacing_given is not None else _candidate_spacings()):
            pw = _leading_power(secants, sp[0], given_p)
            if pw is not None:
                trials.append((sp, _ensemble(trusted, pw["p"], sp[0], log_terms, n_terms_fit), pw))
        if not trials:
            return StrongCouplingResult(False, Status.FAILED, "could not estimate the leading power",
                                        var, tuple(gs), tuple(vals), trusted_up_to, None, "", ())
        if spacing_given is not None:
            chosen, spacing_source = trials[0], "given"
        else:
            chosen, spacing_source = _choose_spacing(trials)
        (S, S_frac), members, pw = chosen
        spacing_out = S_frac if S_frac is not None else S     # what the result reports
        p_mp, lp, source, p_est = pw["p"], pw["lp"], pw["source"], pw["estimate"]
        if pw["warning"]:
            warnings.append(pw["warning"])
        # per spacing tried: the leading power used, and chi2/dof of the fit over all trusted
        # couplings per number of terms
        spacing_trials = {_spacing_text(sp): {"power": leading_power_text(pw_["lp"]),
                                              "chi2_per_dof": {str(k): sig_text(v, 2)
                                                               for k, v in _full_window(ms).items()}}
                          for sp, ms, pw_ in trials}
        if not members:
            lp, source = _unconfirmed(lp, source, p_est, leading_power)
            return StrongCouplingResult(False, Status.FAILED, "no fit could be made", var, tuple(gs),
                                        tuple(vals), trusted_up_to, lp, source, (),
                                        diagnostics={"spacing_trials": spacing_trials},
                                        spacing=spacing_out,
                                        spacing_source=spacing_source)
        exp_info = None
        if exponential != "never":
            # tried where no power fit over all the trusted couplings matches (a fit over the few
            # largest couplings, with terms to match its points, says little), kept where an
            # exponential one does
            if exponential == "always" or not _matches_all(members):
                exp_members = _ensemble_exp(trusted, p_mp, S, log_terms, n_terms_fit, kappa)
                keep = [m for m in exp_members if m["dof"] > 0 and m["chi2"] / m["dof"] <= EXP_KEEP_CHI2]
                if len(keep) >= 2 and (exponential == "always" or _matches_all(keep)):
                    members = keep
                    exp_info = _kappa_estimate(keep, var, given=kappa is not None)
                else:
                    warnings.append(
                        "exponentially small terms e^(-kappa " + var + ") were tried and do not help: "
                        + (f"of {len(exp_members)} such fits, none matches the values within their bands"
                           if exp_members else "no such fit could be made (too few sharp values)"))
        ok = members
        best = _best_ratio(members)
        mismatch = best is not None and best > GROSS_MISFIT
        if best is not None and best > MATCH_CHI2 and not mismatch:
            warnings.append("no fit matches the values within their bands: the truncated form leaves out "
                            "terms bigger than the bands (the ensemble spread reflects this)")
        if mismatch:
            # the form p, p - S, p - 2 S, ... misses the values by far more than their bands: the
            # leading power, or the spacing of the powers after it, is not what the form assumes
            # (2F1(1/3, 1/2; 7/4; -x): x^(-1/3) + x^(-1/2) + ..., read as x^(-1/4) and fitted as
            # -1/4, -5/4, ... with chi2/dof 1e11; the coefficient bands missed by 100 %)
            warnings.append(f"the form {_label(_frac_or(p_mp), False, var)} + "
                            f"{_label(_frac_or(p_mp - S), False, var)} + ... misses the resummed values by "
                            f"{sig_text(mpmath.sqrt(best), 2)} times their bands at best: the leading power "
                            "or the spacing of the subleading powers is not what the form assumes, and the "
                            "coefficient bands do not hold (try leading_power / --power, spacing / "
                            "--spacing, log terms, or values at larger coupling)")
            if p_est is not None and leading_power is None:
                # the secants are what the values show; the rounded fraction is not confirmed
                last, last_band = secants[-1][1], secants[-1][2]
                lo = min(p_est.lower, last, p_mp)
                hi = max(p_est.upper, last, p_mp)
                lp = Estimate(p_est.value, lo, hi)
                fitted = _short_power(p_mp)
                source = (f"log-derivative {p_est}, not settled (last secant "
                          f"{Estimate(last, last - last_band, last + last_band)}); the fits with power "
                          f"{fitted if not isinstance(fitted, mpmath.mpf) else p_est} do not match; "
                          "the band spans what the values show, the limit may lie outside it")
        labels = []
        for m in ok:
            for pw, lg in m["basis"]:
                lab = _label(_frac_or(pw), lg, var)
                if lab not in labels:
                    labels.append(lab)
        coeffs = []
        several_k = len({m["K"] for m in ok}) > 1
        for lab in labels:
            samples, ses, ks = [], [], set()
            for m in ok:
                for (pw, lg), v, s_ in zip(m["basis"], m["sol"], m["se"]):
                    if _label(_frac_or(pw), lg, var) == lab:
                        samples.append(v)
                        ses.append(s_)
                        ks.add(m["K"])
            if len(samples) < 2 or (several_k and len(ks) < 2):
                # a term only the largest fits carry is not reported: it soaks up every term the
                # form leaves out, and fits differing only in their window do not show that
                # (log(1 + x)/x with log terms: the x^-4 pair from two four-term fits came out
                # 0.27(3) and 0.13(4) against 1/3 and 0)
                continue
            srt = sorted(samples)
            med = srt[len(srt) // 2]
            lo_q = srt[int(0.16 * (len(srt) - 1))]
            hi_q = srt[int(mpmath.ceil(0.84 * (len(srt) - 1)))]
            spread = max(hi_q - med, med - lo_q)
            w = 3 * max(spread, sorted(ses)[len(ses) // 2])
            coeffs.append((lab, Estimate(med, med - w, med + w)))
        if not coeffs:
            # fits were made, but no coefficient was carried by two of them: nothing to report
            lp, source = _unconfirmed(lp, source, p_est, leading_power)
            return StrongCouplingResult(
                False, Status.NOT_CONVERGED,
                f"no coefficient is supported by two fits: only {len(members)} fit(s) from "
                f"{len(trusted)} sharp values up to {var} = {mpmath.nstr(trusted_up_to, 6)}; give "
                f"more couplings, fewer fit terms (n_terms_fit) or sharper values", var, tuple(gs),
                tuple(vals), trusted_up_to, lp, source, (), {}, tuple(warnings),
                {"spacing_trials": spacing_trials}, None, spacing_out, spacing_source)
        comparison = _compare(coeffs, expected, warnings)
        diag = {"n_fits": len(members), "n_fits_kept": len(ok), "secants": [
            (mpmath.nstr(g, 6), str(Estimate(p, p - dp, p + dp))) for g, p, dp in secants],
            "power_estimate": None if p_est is None else p_est.to_dict(),
            "resummation_method": meth,
            "spacing_trials": spacing_trials,
            "how": "coefficients: median over fits (terms in the form, lowest coupling kept); "
                   "band = 3 x max(16-84 percentile spread over fits, median least-squares standard error)",
            "chi2_per_dof": [sig_text(m["chi2"] / m["dof"], 2) if m["dof"] else None for m in members]}
        if exp_info is not None:
            diag["exponential"] = exp_info
        prov = Provenance("strong-coupling", {"method": meth, "leading_power": None if leading_power is None
                                              else str(leading_power), "log_terms": log_terms,
                                              "n_terms_fit": list(n_terms_fit),
                                              "spacing": None if spacing_given is None
                                              else _spacing_text(spacing_given),
                                              "exponential": exponential,
                                              "kappa": None if kappa is None else mpmath.nstr(kappa, 20)},
                          n_terms=getattr(series, "n_terms", 0), dps=ctx.work_dps,
                          input_hash=series.input_hash() if hasattr(series, "input_hash") else "")
        done = (f"fitted {len(coeffs)} coefficients from {len(trusted)} couplings up to "
                f"{var} = {mpmath.nstr(trusted_up_to, 6)}")
        if exp_info is not None:
            k_text = (f"{mpmath.nstr(kappa, 12)} (given)" if exp_info.get("given") else str(exp_info["kappa"]))
            done += f", with an exponentially small term e^(-kappa {var}), kappa = {k_text}"
        if mismatch:
            done = "the asymptotic form does not fit the resummed values; " + done
        return StrongCouplingResult(not mismatch, Status.NOT_CONVERGED if mismatch else Status.CONVERGED,
                                    done, var, tuple(gs), tuple(vals),
                                    trusted_up_to, lp, source, tuple(coeffs), comparison, tuple(warnings),
                                    diag, prov, spacing_out, spacing_source)


def _leading_power(secants, S, given) -> Optional[dict]:
    """The leading power for a form with spacing ``S``: ``given`` when not None (exact), else the
    log-derivative secants ``(g, p_secant, band)`` extrapolated in ``g^-S`` (the powers after
    the leading one step by S, and so do the secants' corrections) and rounded to a simple
    fraction inside the band. None when the secants are too few. A dict with ``p`` (the
    power fitted), ``lp`` (its Estimate), ``source``, ``estimate`` (the extrapolated Estimate or
    None) and ``warning`` ("" or why the power is fitted unrounded)."""
    p_est = None
    if len(secants) >= 3:
        pts = secants[-min(6, len(secants)):]
        ests = []
        for m in (2, 3):
            if len(pts) < m + 1:
                continue
            rows = [[mpmath.mpf(1)] + [g ** (-j * S) for j in range(1, m)] for g, _, _ in pts]
            try:
                sol, se, _ = _lstsq(rows, [p for _, p, _ in pts], [1 for _ in pts])
                ests.append((sol[0], se[0]))
            except (ZeroDivisionError, ValueError):
                continue
        if ests:
            v0 = ests[-1][0]
            spread = max(abs(e[0] - v0) for e in ests)
            band = max(2 * spread, abs(pts[-1][1] - v0) / 4, mpmath.mpf(10) ** -6)
            p_est = Estimate(v0, v0 - band, v0 + band)
    if given is not None:
        return {"p": given, "lp": Estimate.exact(given), "source": "given", "estimate": p_est, "warning": ""}
    if p_est is None:
        return None
    fr = simple_rational(p_est.value, p_est.error)
    if fr is None:
        return {"p": p_est.value, "lp": p_est, "source": "log-derivative (not a simple rational)",
                "estimate": p_est,
                "warning": "the leading power is not close to a simple fraction; fitted with the estimate"}
    # an exact fraction: made with more bits than the working precision, so that printing it
    # (every digit its mantissa holds) gives correct digits of k/q only
    with mpmath.workprec(mpmath.mp.prec + 64):
        p_mp = mpmath.mpf(fr.numerator) / fr.denominator
    return {"p": p_mp, "lp": Estimate.exact(p_mp), "estimate": p_est, "warning": "",
            "source": f"log-derivative {p_est} rounded to {fr}"}


def _spacing_arg(spacing, dps):
    """``spacing`` as ``(mpf, Fraction or None)``, or None for the automatic choice (None or
    ``"auto"``); an InputError unless a real number from MIN_SPACING to MAX_SPACING. A float
    is read as the decimal it prints as (0.7 is 7/10, not 0.6999999999999999556)."""
    if spacing is None or (isinstance(spacing, str) and spacing.strip().lower() == "auto"):
        return None
    from ..resummation import parse_points
    want = "the spacing must be a real number above 0 such as 1 or 2/3, or 'auto'"
    if isinstance(spacing, bool):
        raise InputError(f"{want}; got {spacing!r}", where="spacing")
    if isinstance(spacing, float):
        spacing = repr(spacing)
    with workdps(dps):
        try:
            v = parse_points([spacing.strip() if isinstance(spacing, str) else spacing], dps)[0]
        except InputError as exc:
            raise InputError(f"{want}; got {spacing!r} ({exc.bare})", where="spacing") from None
        if isinstance(v, mpmath.mpc) or not v > 0:
            raise InputError(f"{want}; got {spacing!r}", where="spacing")
        smallest = mpmath.mpf(MIN_SPACING.numerator) / MIN_SPACING.denominator
        if v < smallest * (1 - mpmath.mpf(10) ** (5 - dps)):
            raise InputError(f"the spacing must be at least {MIN_SPACING} (smaller steps leave the powers "
                             f"of a fit indistinguishable); got {spacing!r}", where="spacing")
        if v > MAX_SPACING:
            raise InputError(f"the spacing must be at most {MAX_SPACING} (at strong coupling a larger step "
                             f"leaves nothing but the leading term to fit); got {spacing!r}", where="spacing")
        return _exact_spacing(v, dps)


def _exact_spacing(v, dps):
    """``(mpf, Fraction)`` when ``v`` is a fraction with denominator up to 1000 to the working
    precision (made with 64 extra bits, as the rounded leading power is), else ``(v, None)``."""
    with workdps(dps):
        f = Fraction(mpmath.nstr(v, dps)).limit_denominator(1000)
        if f > 0 and abs(mpmath.mpf(f.numerator) / f.denominator - v) <= abs(v) * mpmath.mpf(10) ** (5 - dps):
            with mpmath.workprec(mpmath.mp.prec + 64):
                return mpmath.mpf(f.numerator) / f.denominator, f
        return v, None


def _candidate_spacings():
    return [_exact_spacing(mpmath.mpf(f.numerator) / f.denominator, mpmath.mp.dps) for f in AUTO_SPACINGS]


def _spacing_text(sp) -> str:
    v, f = sp
    return str(f) if f is not None else mpmath.nstr(v, 8)


def _spacing_str(s) -> str:
    """A result's spacing (a Fraction, or an mpf when not a simple fraction) as text."""
    return str(s) if isinstance(s, Fraction) else mpmath.nstr(s, 15)


def _read_spacing(text):
    if text is None:
        return None
    try:
        return Fraction(str(text))
    except (ValueError, ZeroDivisionError):
        return mpmath.mpf(text)


def _ensemble(trusted, p_mp, S, log_terms, n_terms_fit) -> list:
    """Weighted least-squares fits of ``sum_k a_k g^(p - k S)`` (and ``b_k g^(p - k S) log g``)
    for each number of terms in ``n_terms_fit`` and each lowest coupling kept."""
    members = []
    for K in n_terms_fit:
        nb = K * (2 if log_terms else 1)
        for drop in range(0, max(1, len(trusted) - nb)):
            win = trusted[drop:]
            if len(win) < nb + 1:
                break
            basis = _basis(p_mp, S, K, log_terms)
            rows = _rows(basis, win)
            rhs = [v.value for _, v in win]
            wts = _weights(win)
            try:
                sol, se, chi2 = _lstsq(rows, rhs, wts)
            except (ZeroDivisionError, ValueError):
                continue
            dof = len(win) - nb
            members.append({"K": K, "drop": drop, "basis": basis, "sol": sol, "se": se,
                            "chi2": chi2, "dof": dof, "g_min": win[0][0]})
    return members


def exponential_options(exponential, kappa, dps: int):
    """``(exponential, kappa)`` checked and normalised as :func:`probe_strong_coupling` takes
    them (the command line and family specs check theirs here too): ``exponential`` one of
    :data:`EXPONENTIAL_CHOICES` (``True``/``False`` for "always"/"never"); ``kappa`` ``None`` or a
    positive real number (an expression such as ``"4*pi"``), which makes it "always" and may not
    come with "never". An :class:`InputError` naming the option otherwise."""
    if exponential is True or exponential is False:
        exponential = "always" if exponential else "never"
    if exponential not in EXPONENTIAL_CHOICES:
        raise InputError(f"must be one of {', '.join(EXPONENTIAL_CHOICES)}, got {exponential!r}",
                         where="exponential")
    if kappa is None:
        return exponential, None
    if exponential == "never":
        raise InputError("a rate kappa is given but exponential is 'never'; drop one of them",
                         where="kappa")
    from ..resummation import parse_points
    try:
        kappa = parse_points([kappa], dps)[0]
    except InputError as exc:
        raise InputError(exc.bare, where="kappa") from None
    if isinstance(kappa, mpmath.mpc) or not kappa > 0:
        raise InputError(f"the rate of e^(-kappa g) must be a positive number, got {mpmath.nstr(kappa, 8)}",
                         where="kappa")
    return "always", kappa


def _basis(p_mp, S, K: int, log_terms: bool) -> list:
    """``(power, log)`` of the form's first ``K`` powers ``p - k S`` (each also with ``log g``
    after it when ``log_terms``)."""
    out = []
    for k in range(K):
        out.append((p_mp - k * S, False))
        if log_terms:
            out.append((p_mp - k * S, True))
    return out


def _rows(basis, win) -> list:
    """The power columns of a fit at the couplings of ``win``."""
    return [[g ** pw * (mpmath.log(g) if lg else 1) for pw, lg in basis] for g, _ in win]


def _weights(win) -> list:
    """Fit weights 1/band, but no point counts more than a 1e-10 relative band would: the
    truncated asymptotic form is itself only that good."""
    return [1 / max(v.error, abs(v.value) * mpmath.mpf(10) ** -10) for _, v in win]


def _ensemble_exp(trusted, p_mp, S, log_terms, n_terms_fit, kappa_given=None) -> list:
    """As :func:`_ensemble`, with ``n`` exponentially small terms ``e^(-kappa g) g^-j``
    (``j < n``, ``n`` in :data:`EXP_TERMS`) added to the power form. Per fit, ``kappa`` minimises
    the weighted misfit: a log grid of ``kappa g_min`` over :data:`EXP_RANGE`, refined by golden
    section between the best grid point's neighbours (the search in FLINT's ball arithmetic by the
    normal equations at 320 bits, the final fit as the power fits are made). A fit whose best
    ``kappa`` lies at an end of the range is dropped. Members carry ``kappa`` and ``n_exp``; their
    ``basis``, ``sol`` and ``se`` are those of the power terms, and ``dof`` counts ``kappa``.
    With ``kappa_given`` every fit uses that rate (no search; ``dof`` does not count it)."""
    members = []
    for K in n_terms_fit:
        nb = K * (2 if log_terms else 1)
        basis = _basis(p_mp, S, K, log_terms)
        for n_exp in EXP_TERMS:
            free = 0 if kappa_given is not None else 1        # kappa itself, when searched
            for drop in range(0, max(1, len(trusted) - nb - n_exp - free)):
                win = trusted[drop:]
                if len(win) < nb + n_exp + free + 1:
                    break
                wts = _weights(win)
                prow = _rows(basis, win)
                kappa = kappa_given if kappa_given is not None else _kappa_search(win, prow, wts, n_exp)
                if kappa is None:
                    continue
                rows = [pr + [mpmath.exp(-kappa * g) * g ** (-j) for j in range(n_exp)]
                        for pr, (g, _) in zip(prow, win)]
                try:
                    sol, se, chi2 = _lstsq(rows, [v.value for _, v in win], wts)
                except (ZeroDivisionError, ValueError):
                    continue
                members.append({"K": K, "drop": drop, "basis": basis, "sol": sol[:nb], "se": se[:nb],
                                "chi2": chi2, "dof": len(win) - nb - n_exp - free, "g_min": win[0][0],
                                "kappa": kappa, "n_exp": n_exp})
    return members


def _kappa_search(win, prow, wts, n_exp):
    """The ``kappa`` minimising the weighted misfit of one fit (see :func:`_ensemble_exp`), or
    None when the best grid point is an end of the range."""
    misfit = _misfit_arb(win, prow, wts, n_exp)
    lo, hi = math.log(EXP_RANGE[0] / float(win[0][0])), math.log(EXP_RANGE[1] / float(win[0][0]))
    ts = [lo + (hi - lo) * i / (EXP_GRID - 1) for i in range(EXP_GRID)]
    chis = [misfit(math.exp(t)) for t in ts]
    i = min(range(EXP_GRID), key=lambda k: chis[k])
    if i in (0, EXP_GRID - 1) or not math.isfinite(chis[i]):
        return None
    a, b = ts[i - 1], ts[i + 1]
    r = (math.sqrt(5) - 1) / 2
    c, d = b - r * (b - a), a + r * (b - a)
    fc, fd = misfit(math.exp(c)), misfit(math.exp(d))
    for _ in range(EXP_REFINE):
        if fc < fd:
            b, d, fd = d, c, fc
            c = b - r * (b - a)
            fc = misfit(math.exp(c))
        else:
            a, c, fc = c, d, fd
            d = a + r * (b - a)
            fd = misfit(math.exp(d))
    return mpmath.exp(mpmath.mpf((a + b) / 2))


def _misfit_arb(win, prow, wts, n_exp):
    """``kappa -> chi2`` of the weighted least-squares fit of the power columns ``prow`` and
    ``n_exp`` exponential columns to the values of ``win`` (normal equations, 320 bits; inf
    where singular). Only the minimiser's position matters; the reported fit is redone in
    mpmath."""
    old = flint.ctx.prec
    flint.ctx.prec = 320
    try:
        gs = [flint.arb(mpmath.nstr(g, 40)) for g, _ in win]
        ws = [flint.arb(mpmath.nstr(w, 40)) for w in wts]
        base = [[flint.arb(mpmath.nstr(x, 40)) * w for x in pr] for pr, w in zip(prow, ws)]
        rhs = flint.arb_mat([[flint.arb(mpmath.nstr(v.value, 40)) * w] for (_, v), w in zip(win, ws)])
    finally:
        flint.ctx.prec = old

    def chi2(kappa: float) -> float:
        old = flint.ctx.prec
        flint.ctx.prec = 320
        try:
            k = flint.arb(kappa)
            rows = []
            for g, w, b in zip(gs, ws, base):
                e = (-k * g).exp() * w
                rows.append(b + [e / g ** j for j in range(n_exp)])
            A = flint.arb_mat(rows)
            At = A.transpose()
            sol = (At * A).solve(At * rhs, algorithm="approx")
            res = A * sol - rhs
            return float(sum((res[i, 0].mid() ** 2 for i in range(res.nrows())), flint.arb(0)))
        except (ZeroDivisionError, ValueError):
            return math.inf
        finally:
            flint.ctx.prec = old
    return chi2


def _kappa_estimate(members, var, given: bool = False) -> dict:
    """``kappa`` over the exponential fits kept: median, band 3 x the 16-84 percentile spread
    (at least 1 % of the median); the rate itself, exact, when it was given."""
    if given:
        k = members[0]["kappa"]
        return {"kappa": Estimate.exact(k), "kappa_over_pi": Estimate.exact(k / mpmath.pi), "given": True,
                "n_fits": len(members), "terms": sorted({m["n_exp"] for m in members}),
                "how": f"A e^(-kappa {var}) (and A' e^(-kappa {var})/{var}) added to the power form with "
                       "kappa as given; fits with chi2/dof at most "
                       f"{EXP_KEEP_CHI2} kept"}
    ks = sorted(m["kappa"] for m in members)
    med = ks[len(ks) // 2]
    lo_q = ks[int(0.16 * (len(ks) - 1))]
    hi_q = ks[int(mpmath.ceil(0.84 * (len(ks) - 1)))]
    w = 3 * max(hi_q - med, med - lo_q, med / 100)
    lo = max(med - w, mpmath.mpf(0))            # a decaying term: kappa > 0
    est = Estimate(med, lo, med + w)
    return {"kappa": est, "kappa_over_pi": Estimate(med / mpmath.pi, lo / mpmath.pi, (med + w) / mpmath.pi),
            "n_fits": len(members),
            "terms": sorted({m["n_exp"] for m in members}),
            "how": f"A e^(-kappa {var}) (and A' e^(-kappa {var})/{var}) added to the power form; kappa per fit "
                   "from a search of the weighted misfit; value: median over the fits kept (chi2/dof at most "
                   f"{EXP_KEEP_CHI2}); band: 3 x their 16-84 percentile spread, at least 1 % of the value, cut at 0"}


def _matches_all(members) -> bool:
    """Whether some fit over all the trusted couplings (none dropped, a point to spare) matches
    the values within their bands (chi2/dof at most :data:`MATCH_CHI2`)."""
    return any(m["drop"] == 0 and m["dof"] > 0 and m["chi2"] / m["dof"] <= MATCH_CHI2 for m in members)


def _best_ratio(members):
    """The smallest chi2/dof over the fits with points to spare, or None when no fit has any."""
    ratios = [m["chi2"] / m["dof"] for m in members if m["dof"] > 0]
    return min(ratios) if ratios else None


def _full_window(members) -> dict:
    """``{K: chi2/dof}`` of the fits over every trusted coupling (none dropped) with at least
    CHOICE_DOF points to spare."""
    return {m["K"]: m["chi2"] / m["dof"] for m in members if m["drop"] == 0 and m["dof"] >= CHOICE_DOF}


def _choose_spacing(trials):
    """The trial ``((S, fraction), members, power)`` to keep, and why.

    The fits over all the trusted couplings (none dropped) are compared at equal numbers of
    terms K: K* is the fewest with which some spacing's fit matches the values within their
    bands (chi2/dof at most MATCH_CHI2), and of the spacings matching with K* terms the largest
    is kept. When none matches with any K, spacing 1 (the form's classic choice).

    Why not simply the largest spacing any fit of the ensemble matches: a fit over the few
    largest couplings, with as many terms as points to spare, matches with almost any spacing.
    Measured (resummed values, default grids): the oscillator ground state from 60 orders,
    whose powers step by 2/3, was matched with spacing 1 at chi2/dof 0.69 by six terms over
    the 7 largest of 10 couplings (the g^(1/3) coefficient came out 1.07(3), the subleading
    ones meaningless); the cusp anomalous dimension from 60 loops with max_rel_band 1e-3
    (spacing 1) was matched with spacing 2 at 1.0 by six terms over all 7 couplings (its power
    read as 1.02). Over all couplings at equal K the right spacing matches first (3 terms: 2/3
    at 0.029 for the oscillator's first excited level from 40 orders, 1 at 3.5e2; 1 at 1.2 for
    the cusp, 2 at 2.5e5). A finer spacing whose powers include the right ones (1/3 for 2/3,
    1/2 for 1) can match with as few terms; the larger is kept. Fits with fewer than
    CHOICE_DOF points to spare do not count.
    """
    texts = ", ".join(_spacing_text(tr[0]) for tr in trials)
    # a spacing whose secants give no simple fraction for the leading power fits with a power
    # tuned to the values, one more free number: it competes only when every spacing's does
    # (the kernel family at a = pi/3 from 60 loops: spacing 2 with power 1.0297 matched with
    # 4 terms and gave 2.821(19) for the leading coefficient, against 3.08(3) with spacing 1)
    exact = [tr for tr in trials if tr[2]["lp"].error == 0]
    left_out = [tr for tr in trials if exact and tr[2]["lp"].error != 0]
    note = ""
    if left_out:
        note = ("; left out, their leading power being no simple fraction: "
                + ", ".join(f"{_spacing_text(tr[0])} (power {tr[2]['lp']})"
                            for tr in left_out))
    full = [(tr[0], tr, _full_window(tr[1])) for tr in (exact or trials)]
    ks = sorted({k for _, _, fw in full for k in fw})
    for k in ks:
        hits = [(sp, tr, fw) for sp, tr, fw in full if fw.get(k) is not None and fw[k] <= MATCH_CHI2]
        if not hits:
            continue
        sp, tr, fw = hits[0]                          # trials run from the largest spacing down
        n = next(m["dof"] + len(m["basis"]) for m in tr[1] if m["drop"] == 0)   # all trusted couplings
        others = "; ".join(f"{_spacing_text(s2)}: {sig_text(f2[k], 2)}" for s2, _, f2 in full
                           if s2 is not sp and f2.get(k) is not None)
        why = (f"automatic: the largest spacing whose {k}-term fit over all {n} trusted couplings matches "
               f"the values within their bands (chi2/dof {sig_text(fw[k], 2)}); {k} terms is "
               f"the fewest with which any of {texts} matches (the others with {k} terms: {others}){note}")
        return tr, why
    one = next((tr for tr in trials if tr[0][1] == 1), trials[0])
    kept = _spacing_text(one[0])
    if not ks:
        return one, (f"automatic: no fit over all the trusted couplings has {CHOICE_DOF} points to spare "
                     f"to tell the spacings {texts} apart{note}; fitted with {kept}")
    least = "; ".join(f"{_spacing_text(sp)}: {sig_text(min(fw.values()), 2)}" for sp, _, fw in full if fw)
    return one, (f"automatic: no spacing of {texts} gives a fit over all the trusted couplings that matches "
                 f"the values within their bands with up to {ks[-1]} terms (smallest chi2/dof: "
                 f"{least}{note}); fitted with {kept}")


def _compare(coeffs, expected, warnings, exact_polynomial=False) -> dict:
    """Each expected coefficient against the one found: ``{"expected", "inside",
    "sigma" or "note"}`` per label; a warning for each that is not inside. A label
    absent from an exact polynomial is a zero coefficient; absent from a fit, it
    is unknown (``inside`` None)."""
    found = dict(coeffs)
    comparison = {}
    for lab, ev in (expected or {}).items():
        e = found.get(lab)
        ev = mpmath.mpmathify(ev)
        if e is None:
            inside = (ev == 0) if exact_polynomial else None
            comparison[lab] = {"expected": ev, "inside": inside,
                               "note": "absent from the polynomial" if exact_polynomial else "not fitted"}
        else:
            inside = e.contains(ev)
            comparison[lab] = {"expected": ev, "inside": inside,
                               # distance in half-widths: two significant digits say it
                               "sigma": mpmath.mpf(mpmath.nstr((e.value - ev) / e.error, 2)) if e.error
                               else (0 if inside else mpmath.inf)}
        if e is None and not exact_polynomial:
            warnings.append(f"{lab}: expected {mpmath.nstr(ev, 12)}, but no fit carries this term (fitted: "
                            f"{', '.join(found) or 'none'})")
        if inside is False:
            what = "the polynomial gives" if exact_polynomial else "fitted"
            warnings.append(f"{lab}: {what} {e if e is not None else 0}, which does not contain the "
                            f"expected {mpmath.nstr(ev, 12)}")
    return comparison


def _polynomial_result(series, c, deg, gs, ctx, var, expected, n_terms_fit, log_terms):
    """The strong-coupling expansion of an exact polynomial: the polynomial itself.

    Leading power: the degree (times the coupling's power); coefficients: the
    polynomial's, in the coupling (``x = scale g^q`` gives ``c_k scale^k`` for
    ``g^(q k)``), exact, or with a band of one unit in the last digit the
    series carries.
    """
    cpl = getattr(series, "coupling", None)
    q = cpl.power if cpl is not None else 1
    scale = mpmath.mpmathify(cpl.scale) if cpl is not None else mpmath.mpf(1)
    rel = mpmath.mpf(0) if series.digits is None else mpmath.mpf(10) ** (-series.digits)

    def est(v):
        return Estimate(v, v - abs(v) * rel, v + abs(v) * rel)

    coeffs = []
    for k in range(deg, -1, -1):
        if c[k] != 0:
            coeffs.append((_label(q * k, False, var), est(c[k] * scale ** k)))
    vals = []
    for g in gs:
        x = scale * g ** q
        vals.append(est(sum(c[k] * x ** k for k in range(deg + 1))))
    warnings = []
    comparison = _compare(coeffs, expected, warnings, exact_polynomial=True)
    lp = Estimate.exact(mpmath.mpf(q * deg))
    how = (f"exact polynomial of degree {deg} in {series.variable}: its coefficients vanish from "
           f"{series.variable}^{deg + 1} through the last of the {len(c)} terms given, so it is its own "
           "strong-coupling expansion; no resummation or fit")
    prov = Provenance("strong-coupling", {"method": "exact polynomial", "leading_power": None,
                                          "log_terms": log_terms, "n_terms_fit": list(n_terms_fit)},
                      n_terms=getattr(series, "n_terms", 0), dps=ctx.work_dps,
                      input_hash=series.input_hash() if hasattr(series, "input_hash") else "")
    return StrongCouplingResult(True, Status.CONVERGED,
                                f"exact polynomial: leading power {q * deg}, {len(coeffs)} coefficient(s)",
                                var, tuple(gs), tuple(vals), gs[-1] if gs else None, lp,
                                f"exact polynomial of degree {deg} in {series.variable}", tuple(coeffs),
                                comparison, tuple(warnings), {"how": how, "resummation_method": "exact polynomial"},
                                prov, None, "exact polynomial: its own powers, no fit")


def _unconfirmed(lp, source, p_est, given):
    """A power rounded from the log-derivative that no fit went on to confirm keeps the
    log-derivative's band (with the rounded value inside it), not the zero-width band of an
    exact number: a record reading ``1.0 [1.0, 1.0]`` claimed a certainty nothing had earned."""
    if given is not None or p_est is None or lp is None or lp.error != 0:
        return lp, source
    v = lp.value
    return (Estimate(v, min(p_est.lower, v), max(p_est.upper, v)),
            source + "; not confirmed by a fit, so the band is the log-derivative's")


def _short_power(pw):
    """A power for messages: the fraction it is (to 1e-12), or its leading 8 digits."""
    f = _frac_or(pw)
    return f if not isinstance(f, mpmath.mpf) else mpmath.nstr(f, 8)


def leading_power_text(lp) -> str:
    """The leading power as printed: an exact one (given, or rounded to a simple fraction) as
    the fraction it is (1/3, not 0.3333...3335033 or 1.0), otherwise with its band."""
    if lp is None:
        return "not determined"
    if lp.error == 0:
        return str(_short_power(lp.value))
    return str(lp)


def _frac_or(pw):
    from fractions import Fraction
    f = Fraction(str(mpmath.nstr(pw, 15))).limit_denominator(1000)
    if abs(mpmath.mpf(f.numerator) / f.denominator - pw) < mpmath.mpf(10) ** -12:
        return f
    return pw


def _default_grid(series, ctx):
    from ..resummation import _borel_singularity, _growth, _series_singularities
    c = series.dense(Context(dps=ctx.work_dps, guard=0))
    r = None
    if _growth(c)["factorial"]:
        # a factorially divergent series has radius zero (the ratio fit gives ~1e-6 for the
        # oscillator, and a grid up to g ~ 1e-4); its scale is the Borel-plane singularity
        z = _borel_singularity(c)
        r = abs(z) if z is not None and z != 0 else None
    if r is None:
        sing = _series_singularities(c)
        r = abs(sing[0]) if sing and sing[0] != 0 else mpmath.mpf(1)
    if series.coupling is not None:
        r = abs(series.coupling.from_variable(r))
    # the distance is an estimate (0.2500004... for 1/4): the grid is rounded to three
    # significant digits, so that reports name couplings a reader recognises (20, not 20.0000345)
    return [_round_sig(r * k, 3) for k in (4, 6, 8, 12, 16, 24, 32, 48, 64, 80)]


def _round_sig(v, digits):
    """``v > 0`` rounded to ``digits`` significant decimal digits."""
    e = int(mpmath.floor(mpmath.log10(v))) - digits + 1
    return mpmath.nint(v / mpmath.mpf(10) ** e) * mpmath.mpf(10) ** e
