"""Strong-coupling probe: resum at growing coupling and fit an asymptotic form.

:func:`probe_strong_coupling` evaluates the resummed function on a grid of
growing couplings (``resum.resummation.evaluate``), keeps the points whose
band is narrow enough to trust, estimates the leading power ``p`` of
``f ~ a_0 g^p`` from the log-derivative ``d log f / d log g`` (secants between
neighbouring points, extrapolated in ``1/g``) unless the user gives it, and
fits

    f(g) = sum_k a_k g^(p - k)   [+ sum_k b_k g^(p - k) log g  with log_terms]

by weighted least squares (weights 1/band). The fit is repeated over an
ensemble (number of terms in the form, lowest coupling kept); each
coefficient's value is the median over the ensemble, and its band is 3
times the larger of the ensemble's central spread (16th to 84th percentile
around the median) and the median least-squares standard error. Weights are 1/band, floored at a 1e-10 relative band.

What the bands mean: the coefficient bands measure how much the fitted
numbers move when the truncation of the asymptotic form and the fitting
window change, given the resummed values and their bands. They do not
account for terms the form leaves out entirely (exponentially small
corrections, unexpected logs); comparing ``log_terms`` on/off and the
reported ``trusted_up_to`` coupling tells how far to rely on them.

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

from dataclasses import dataclass, field
from typing import Optional, Sequence

import mpmath

from ..context import DEFAULT, Context, checked_context, workdps
from ..errors import InputError
from ..results import Estimate, Provenance, Status, jsonable, num_to_str
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
    ``comparison``: per expected label, ``{"expected", "inside", "sigma"}``.
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
                "provenance": None if self.provenance is None else self.provenance.to_dict()}

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
                   None if d.get("provenance") is None else Provenance.from_dict(d["provenance"]))


#: best chi2 per degree of freedom over the ensemble above which the fitted form is rejected:
#: the fits miss the values by 100 times their bands (between 4 and this, a warning only)
GROSS_MISFIT = 10 ** 4


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


def leading_label(labels):
    """The label of the leading term among coefficient labels such as ``"g^1"``, ``"g^-1 log g"``,
    ``"g^0.94526707"``: the highest power without a log (the term the fit's leading power
    multiplies). Not the first label: a record written with sorted keys puts ``"g^-1"``
    before ``"g^1"``. None when no label has that form."""
    from fractions import Fraction
    best = None
    for lab in labels:
        head, _, rest = str(lab).partition("^")
        if not rest or " " in rest.strip():
            continue                     # a log term, or not a power
        try:
            pw = Fraction(rest.strip())
        except (ValueError, ZeroDivisionError):
            continue
        if best is None or pw > best[0]:
            best = (pw, lab)
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


def probe_strong_coupling(series, couplings: Optional[Sequence] = None, ctx: Optional[Context] = None,
                          method: str = "auto", leading_power=None, log_terms: bool = False,
                          n_terms_fit: Sequence[int] = (3, 4, 5, 6), expected: Optional[dict] = None,
                          max_rel_band=mpmath.mpf("1e-4"), evaluate_options: Optional[dict] = None,
                          values: Optional[Sequence] = None) -> StrongCouplingResult:
    """Fit the strong-coupling form of a resummed series.

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
        Also fit ``g^(p-k) log g`` terms.
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

    Returns
    -------
    StrongCouplingResult
    """
    from ..resummation import evaluate, _nearest_singularity  # noqa: F401
    ctx = checked_context(ctx)
    n_terms_fit = tuple(int(k) for k in n_terms_fit)
    if not n_terms_fit or min(n_terms_fit) < 1:
        raise InputError("n_terms_fit must list positive integers", where="n_terms_fit")
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
                                        f"band below {mpmath.nstr(max_rel_band, 3)} of the value "
                                        f"({len(got)} gave a value at all); the fit needs 4: give more terms, "
                                        "other couplings (--at), or a larger max_rel_band (--max-band)" + why,
                                        var, tuple(gs), tuple(vals), trusted_up_to, None, "", ())
        # leading power from log-derivative secants, extrapolated in 1/g
        secants = []
        for (g1, v1), (g2, v2) in zip(trusted, trusted[1:]):
            if v1.value * v2.value <= 0:
                continue
            ps = mpmath.log(v2.value / v1.value) / mpmath.log(g2 / g1)
            gm = mpmath.sqrt(g1 * g2)
            dp = (v1.error / abs(v1.value) + v2.error / abs(v2.value)) / abs(mpmath.log(g2 / g1))
            secants.append((gm, ps, dp))
        p_est = None
        if len(secants) >= 3:
            pts = secants[-min(6, len(secants)):]
            ests = []
            for m in (2, 3):
                if len(pts) < m + 1:
                    continue
                rows = [[mpmath.mpf(1)] + [1 / g ** j for j in range(1, m)] for g, _, _ in pts]
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
        if leading_power is not None:
            from ..resummation import _to_mp
            p = leading_power
            p_mp = _to_mp(p) if not isinstance(p, str) else parse_points([p], ctx.work_dps)[0]
            lp = Estimate.exact(p_mp)
            source = "given"
        else:
            if p_est is None:
                return StrongCouplingResult(False, Status.FAILED, "could not estimate the leading power",
                                            var, tuple(gs), tuple(vals), trusted_up_to, None, "", ())
            fr = simple_rational(p_est.value, p_est.error)
            if fr is None:
                p_mp = p_est.value
                lp = p_est
                source = "log-derivative (not a simple rational)"
                warnings.append("the leading power is not close to a simple fraction; fitted with the estimate")
            else:
                # an exact fraction: made with more bits than the working precision, so that
                # printing it (every digit its mantissa holds) gives correct digits of k/q only
                with mpmath.workprec(mpmath.mp.prec + 64):
                    p_mp = mpmath.mpf(fr.numerator) / fr.denominator
                lp = Estimate.exact(p_mp)
                source = f"log-derivative {mpmath.nstr(p_est.value, 6)} rounded to {fr}"
        # ensemble of fits
        members = []
        for K in n_terms_fit:
            nb = K * (2 if log_terms else 1)
            for drop in range(0, max(1, len(trusted) - nb)):
                win = trusted[drop:]
                if len(win) < nb + 1:
                    break
                basis = []
                for k in range(K):
                    basis.append((p_mp - k, False))
                    if log_terms:
                        basis.append((p_mp - k, True))
                rows = [[g ** pw * (mpmath.log(g) if lg else 1) for pw, lg in basis] for g, _ in win]
                rhs = [v.value for _, v in win]
                # weights 1/band, but no point counts more than a 1e-10 relative band would:
                # the truncated asymptotic form is itself only that good
                wts = [1 / max(v.error, abs(v.value) * mpmath.mpf(10) ** -10) for _, v in win]
                try:
                    sol, se, chi2 = _lstsq(rows, rhs, wts)
                except (ZeroDivisionError, ValueError):
                    continue
                dof = len(win) - nb
                members.append({"K": K, "drop": drop, "basis": basis, "sol": sol, "se": se,
                                "chi2": chi2, "dof": dof, "g_min": win[0][0]})
        if not members:
            lp, source = _unconfirmed(lp, source, p_est, leading_power)
            return StrongCouplingResult(False, Status.FAILED, "no fit could be made", var, tuple(gs),
                                        tuple(vals), trusted_up_to, lp, source, ())
        ok = members
        ratios = [m["chi2"] / m["dof"] for m in members if m["dof"] > 0]
        best = min(ratios) if ratios else None
        mismatch = best is not None and best > GROSS_MISFIT
        if best is not None and best > 4 and not mismatch:
            warnings.append("no fit matches the values within their bands: the truncated form leaves out "
                            "terms bigger than the bands (the ensemble spread reflects this)")
        if mismatch:
            # the form p, p - 1, p - 2, ... misses the values by far more than their bands: the
            # leading power, or the spacing of the powers after it, is not what the form assumes
            # (2F1(1/3, 1/2; 7/4; -x): x^(-1/3) + x^(-1/2) + ..., read as x^(-1/4) and fitted as
            # -1/4, -5/4, ... with chi2/dof 1e11; the coefficient bands missed by 100 %)
            warnings.append(f"the form {_label(_frac_or(p_mp), False, var)} + "
                            f"{_label(_frac_or(p_mp - 1), False, var)} + ... misses the resummed values by "
                            f"{mpmath.nstr(mpmath.sqrt(best), 2)} times their bands at best: the leading power "
                            "or the spacing of the subleading powers is not what the form assumes, and the "
                            "coefficient bands do not hold (try leading_power / --power, log terms, "
                            "or values at larger coupling)")
            if p_est is not None and leading_power is None:
                # the secants are what the values show; the rounded fraction is not confirmed
                last = secants[-1][1]
                lo = min(p_est.lower, last, p_mp)
                hi = max(p_est.upper, last, p_mp)
                lp = Estimate(p_est.value, lo, hi)
                source = (f"log-derivative {mpmath.nstr(p_est.value, 6)}, not settled (last secant "
                          f"{mpmath.nstr(last, 6)}); the fits with power {_short_power(p_mp)} do not match; "
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
                tuple(vals), trusted_up_to, lp, source, (), {}, tuple(warnings))
        comparison = _compare(coeffs, expected, warnings)
        diag = {"n_fits": len(members), "n_fits_kept": len(ok), "secants": [
            (mpmath.nstr(g, 6), mpmath.nstr(p, 10)) for g, p, _ in secants],
            "power_estimate": None if p_est is None else p_est.to_dict(),
            "resummation_method": meth,
            "how": "coefficients: median over fits (terms in the form, lowest coupling kept); "
                   "band = 3 x max(16-84 percentile spread over fits, median least-squares standard error)",
            "chi2_per_dof": [mpmath.nstr(m["chi2"] / m["dof"], 3) if m["dof"] else None for m in members]}
        prov = Provenance("strong-coupling", {"method": meth, "leading_power": None if leading_power is None
                                              else str(leading_power), "log_terms": log_terms,
                                              "n_terms_fit": list(n_terms_fit)},
                          n_terms=getattr(series, "n_terms", 0), dps=ctx.work_dps,
                          input_hash=series.input_hash() if hasattr(series, "input_hash") else "")
        done = (f"fitted {len(coeffs)} coefficients from {len(trusted)} couplings up to "
                f"{var} = {mpmath.nstr(trusted_up_to, 6)}")
        if mismatch:
            done = "the asymptotic form does not fit the resummed values; " + done
        return StrongCouplingResult(not mismatch, Status.NOT_CONVERGED if mismatch else Status.CONVERGED,
                                    done, var, tuple(gs), tuple(vals),
                                    trusted_up_to, lp, source, tuple(coeffs), comparison, tuple(warnings),
                                    diag, prov)


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
                                prov)


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
