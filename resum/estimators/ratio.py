"""Ratio family: ratios, Domb-Sykes fits with Neville tables, root test,
complex-conjugate pairs, growth classification and large-order fits.

Each public ``estimate_*`` function takes a :class:`~resum.series.Series` and
a :class:`~resum.context.Context` and returns a
:class:`~resum.results.MethodResult`.

>>> import mpmath
>>> from resum.series import Series
>>> from resum.context import Context
>>> c = [1]
>>> for n in range(1, 40):            # (1 - 4x)^(-1/2): c_n = binomial(2n, n)
...     c.append(c[-1] * 2 * (2 * n - 1) // n)
>>> r = estimate_ratio(Series(c), Context(dps=30))
>>> r.radius.contains(0.25), r.singularities[0].exponent.contains(-0.5)
(True, True)

Notes
-----
For ``f(x) ~ A (1 - x/x_c)^theta`` the coefficients behave as
``c_n ~ C mu^n n^(-theta-1) (1 + a_1/n + ...)`` with ``mu = 1/x_c``, so the
ratios ``z_n = c_n/c_(n-s)`` satisfy ``z_n = mu^s (1 - s (1+theta)/n + O(1/n^2))``
(the Domb-Sykes plot of ``z_n`` against ``1/n`` is a line with intercept
``mu^s`` and slope ``-s (1+theta) mu^s``). The intercept is extrapolated by a
Neville table in ``1/n`` (:mod:`resum.estimators._extrap`), the exponent from
``n (z_n/mu^s - 1)/s`` in the same way. The step ``s`` is 1 or 2, chosen by
the data (``s = 2`` removes the even/odd oscillation caused by a competing
singularity at ``-x_c``). The same tables are also built in ``1/sqrt(n)``,
which removes the half-integer powers that confluent corrections bring; if
the two extrapolations differ by more than the band, the band becomes twice
their difference. Bands: safety factor (2) times the spread of the
last entries of the chosen Neville column and its change to the next
column, never below the amplified coefficient noise; and never below what is
left of a steady movement of the columns with the order (a correction
``n^-Delta`` with ``Delta`` not a multiple of 1/2, which neither table removes,
makes the columns creep one way with steps that shrink like a power of the
order; :func:`resum.estimators._extrap.column_tail`). The exponent band also
carries the effect of the intercept's band.

Applicability: one dominant real singularity (or, for ``s = 2``, a dominant
pair ``+-x_c`` seen through ``mu^2``). Complex-conjugate pairs: use
:func:`estimate_conjugate_pair`. Factorially divergent series: use
:func:`estimate_large_order`.

References
----------
C. Domb and M. F. Sykes, Proc. Roy. Soc. A 240 (1957) 214 (ratio method).
A. J. Guttmann, in *Phase Transitions and Critical Phenomena* vol. 13,
eds. C. Domb and J. L. Lebowitz, Academic Press (1989) (ratio method,
Neville tables, differential approximants).
D. L. Hunter and G. A. Baker, Phys. Rev. B 19 (1979) 3808 (complex
singularities; from memory).
G. N. Mercer and A. J. Roberts, SIAM J. Appl. Math. 50 (1990) 1547 (fit of
coefficients to a three-term recurrence for a conjugate pair; from memory).
C. M. Bender and T. T. Wu, Phys. Rev. D 7 (1973) 1620 (large-order
behaviour of perturbation theory).
"""
from __future__ import annotations

import math

import mpmath

from ..results import Estimate, Singularity, Status, sig_text
from ..uncertainty.ensemble import SAFETY
from ._common import classify_kind, complex_exponent_note, failed, finish, prepare
from ._extrap import extrapolate
from ._num import lu_solve

__all__ = ["estimate_ratio", "estimate_root_test", "estimate_conjugate_pair",
           "estimate_large_order", "classify_growth", "ratio_sequence"]


def ratio_sequence(c, step=1, n_min=1):
    """``(ns, z)`` with ``z_n = c_n / c_(n-step)`` for the n where both are non-zero."""
    ns, z = [], []
    for n in range(max(step, n_min), len(c)):
        if c[n - step] != 0 and c[n] != 0:
            ns.append(n)
            z.append(c[n] / c[n - step])
    return ns, z


# ---------------------------------------------------------------------------
# growth classification
# ---------------------------------------------------------------------------

def classify_growth(c):
    """Classify coefficient growth: ``(kind, kappa)``.

    ``kappa`` is the slope of ``log |c_n / c_(n-2)|^(1/2)`` against ``log n``
    over the second half of the coefficients: about 1 for ``c_n ~ Gamma(n)``
    growth (factorial, radius 0), about 0 for a finite radius, negative for
    an entire-like function (-1/rho for order rho). ``kind`` is ``"factorial"`` (kappa > 0.6),
    ``"entire-like"`` (kappa < -0.3 and the apparent radius ``|c_n|^(-1/n)`` growing, see
    :func:`_apparent_radius_grows`; exp(-x^2) has kappa -1/2 exactly) or ``"finite radius"``.
    # common practice, no source (thresholds chosen here)

    The slope is the median of the slopes between all pairs of points
    (Theil-Sen; H. Theil, Indag. Math. 12 (1950) 85 and P. K. Sen,
    J. Amer. Statist. Assoc. 63 (1968) 1379, from memory), not a least-squares
    fit: where two singular terms of opposite sign cross over, a few ratios
    swing by orders of magnitude, and a least-squares slope through them read
    60 terms of ``(1 - x)^(1/3) + (1 - x/1.1)^(-1/2)`` as factorial
    (kappa 0.62), so that every estimator refused the series.
    """
    n0 = max(2, len(c) // 2)
    xs, ys = [], []
    for n in range(n0, len(c)):
        if c[n] != 0 and c[n - 2] != 0:
            xs.append(mpmath.log(n))
            ys.append(mpmath.log(abs(c[n] / c[n - 2])) / 2)
    if len(xs) < 3:
        return "finite radius", mpmath.mpf(0)
    # in floats: the slope decides a class, and O(N^2) pairs in mpmath would cost 0.1 s at N = 300
    xs, ys = [float(x) for x in xs], [float(y) for y in ys]
    slopes = sorted((ys[j] - ys[i]) / (xs[j] - xs[i]) for i in range(len(xs)) for j in range(i + 1, len(xs)))
    m = len(slopes)
    kappa = mpmath.mpf(slopes[m // 2] if m % 2 else (slopes[m // 2 - 1] + slopes[m // 2]) / 2)
    if kappa > 0.6:
        return "factorial", kappa
    if kappa < -0.3 and _apparent_radius_grows(c):
        return "entire-like", kappa
    return "finite radius", kappa


def _apparent_radius_grows(c) -> bool:
    """Whether the apparent radius ``|c_n|^(-1/n)`` grows with ``n`` over the second half, as
    for an entire function (like ``n^(1/rho)`` for order rho: ``exp x`` slope 1 of its log
    against ``log n``, ``exp(-x^2)`` slope 1/2), rather than settling (finite radius: slope near
    0). The coefficients' envelope (the largest ``|c_m|`` over the last few ``m <= n``) stands
    in for ``|c_n|``, so that a slowly turning phase (a pair of poles at angle 0.1 from the real
    axis: ``c_n = sin((n + 1) t)/sin t``) does not pass for decay. The ratio slope alone read
    that pair, and its twin at radius 1/2 with coefficients growing like 2^n, as entire.
    Threshold 1/4 (entire functions up to order 4); common practice, no source."""
    N = len(c)
    n0 = max(2, N // 2)
    w = max(3, N // 12)
    logs = [None if v == 0 else float(mpmath.log(abs(v))) for v in c]
    xs, ys = [], []
    for n in range(n0, N):
        win = [v for v in logs[max(1, n - w):n + 1] if v is not None]
        if win:
            xs.append(math.log(n))
            ys.append(-max(win) / n)
    if len(xs) < 4:
        return True
    slopes = sorted((ys[j] - ys[i]) / (xs[j] - xs[i]) for i in range(len(xs)) for j in range(i + 1, len(xs)))
    m = len(slopes)
    slope = slopes[m // 2] if m % 2 else (slopes[m // 2 - 1] + slopes[m // 2]) / 2
    return slope > 0.25


# ---------------------------------------------------------------------------
# plain ratio / Domb-Sykes with Neville tables
# ---------------------------------------------------------------------------

def _window(ns, vals, frac=0.5, min_len=8, parity=None):
    """Last part of a sequence (optionally one parity of n only)."""
    pairs = list(zip(ns, vals))
    if parity is not None:
        pairs = [p for p in pairs if p[0] % 2 == parity]
    k = max(min_len, int(len(pairs) * frac))
    pairs = pairs[-k:]
    return [p[0] for p in pairs], [p[1] for p in pairs]


def _ratio_step(c, step, eps, parity=None):
    """Intercept mu^step and exponent from step-``step`` ratios.

    Step 2 uses the ratios of one parity of n: that of the last coefficient, unless the
    other parity's intercept is larger in modulus beyond both bands. The radius is set by
    the faster-growing subsequence: in ``(1 + x^2)^(-1/3) + (1 + x/2)^(1/2)`` the odd
    coefficients come from the second term alone (radius 2), the even ones from the first
    (radius 1); with 40 terms the odd ones were used and the verdict dropped the points
    +-i that five other methods found, as lying inside "radius 2"."""
    N = len(c)
    if step == 2 and parity is None:
        last = _ratio_step(c, 2, eps, parity=(N - 1) % 2)
        other = _ratio_step(c, 2, eps, parity=N % 2)
        if last is None or (other is not None and abs(other["mu_s"]) - other["mu_s_half"] >
                            abs(last["mu_s"]) + last["mu_s_half"]):
            return other
        return last
    ns, z = ratio_sequence(c, step)
    if len(ns) < 10:
        return None
    wn, wz = _window(ns, z, parity=parity)
    if len(wn) < 6:
        return None
    noise = eps * 4
    mus, mu_half, k_mu, info_mu = extrapolate(wn, wz, noise)
    if mus == 0:
        return None
    # confluent corrections make z_n - mu^s contain half-integer powers of 1/n, which a table
    # in 1/n does not remove; a table in 1/sqrt(n) does (at some cost in sharpness). Their
    # difference is added to the band.
    sq, sq_half, _, info_sq = extrapolate([mpmath.sqrt(n) for n in wn], wz, noise)
    confluent_shift = abs(sq - mus)
    # both settled, and they disagree (judged on the bands without the columns' tail, which
    # is there for a correction that neither table removes; see _extrap.column_tail)
    confluent = confluent_shift > max(info_mu["settled_half"], info_sq["settled_half"])
    if confluent:
        mu_half = max(mu_half, SAFETY * confluent_shift)
    # exponent: g_n = n (z_n / mu^s - 1) / s  ->  -(1 + theta)
    g_of = lambda m: [n * (zz / m - 1) / step for n, zz in zip(wn, wz)]  # noqa: E731
    g_noise = [n * noise * 2 for n in wn]
    g, g_half, k_g, info_g = extrapolate(wn, g_of(mus), noise, noise=[abs(x) for x in g_noise])
    gs, gs_half, _, info_gs = extrapolate([mpmath.sqrt(n) for n in wn], g_of(mus), noise,
                                          noise=[abs(x) for x in g_noise])
    if abs(gs - g) > max(info_g["settled_half"], info_gs["settled_half"]):
        g_half = max(g_half, SAFETY * abs(gs - g))
    elif confluent:
        # half-integer corrections seen in the intercept: the exponent is only as good as
        # the cruder of the two tables
        g_half = max(g_half, SAFETY * abs(gs - g), gs_half)
    # sensitivity to the intercept band
    if mu_half > 0:
        for m in (mus - mu_half, mus + mu_half):
            if m != 0:
                gm, _, _, _ = extrapolate(wn, g_of(m), noise, noise=[abs(x) for x in g_noise])
                g_half = max(g_half, abs(gm - g))
    theta = -(1 + g)
    return {"step": step, "mu_s": mus, "mu_s_half": mu_half, "theta": theta, "theta_half": g_half,
            "k_mu": k_mu, "k_theta": k_g, "ns": wn, "z": wz, "table_mu": info_mu,
            "table_theta": info_g}


#: a drift that shrinks by less than this factor per step of sqrt(2) in the number of terms is
#: extrapolated as if it shrank by this factor (a correction falling like n^-0.64 or slower)
DRIFT_Q_MAX = mpmath.mpf("0.8")


def drift_extension(v_half, v_mid, v_full, noise=0, n_full=None):
    """Room left by a steady drift of an estimate with the number of terms.

    ``v_half``, ``v_mid``, ``v_full`` are the estimates from ``N/2``,
    ``N/sqrt(2)`` and ``N`` terms. When the two changes have the same sign and
    both exceed ``noise``, the estimate is still moving: a correction falling
    like ``N^-delta`` shrinks by ``q = 2^(-delta/2)`` per step, and what is
    left after ``v_full`` is ``d q / (1 - q)`` (``d`` the last change; ``q``
    read from the two changes, at most :data:`DRIFT_Q_MAX`). Returns
    ``(down, up, slow)``: how far the band must reach below and above ``v_full``
    (before the safety factor); ``(0, 0, False)`` when there is no steady drift.

    ``slow`` (third value) is True when the changes do not shrink by at least
    :data:`DRIFT_Q_MAX` per step. With ``n_full`` (``N``) such a drift is then also
    extrapolated as a correction falling like ``1/log N`` (a logarithmic correction, the
    slowest common kind: ``c_n ~ mu^n n^-1/log n``, whose exponent estimates creep towards -1
    like ``1/log n``): what is left of it is ``d log(N/sqrt 2)/log(sqrt 2)`` (the change over
    the last step ``d`` carried on as ``a/log N``), about 11 ``d`` at N = 60 against 4 ``d``
    from the geometric cap; the larger is kept.

    Corrections of non-integer order (confluent singularities whose exponents
    differ by a small amount) are what the Neville tables in ``1/n`` and
    ``1/sqrt(n)`` cannot remove; this is the check that sees them.
    """
    if v_half is None or v_mid is None:
        return 0, 0, False
    d1, d2 = mpmath.re(v_mid - v_half), mpmath.re(v_full - v_mid)
    if d1 == 0 or d2 == 0 or (d1 > 0) != (d2 > 0) or min(abs(d1), abs(d2)) <= noise:
        return 0, 0, False
    q = min(abs(d2 / d1), DRIFT_Q_MAX)
    rest = abs(d2) * q / (1 - q)
    slow = abs(d2 / d1) >= DRIFT_Q_MAX
    if slow and n_full is not None and n_full > 4:
        # v = v_inf + a/log n through the last two estimates: what is left is a/log N
        rest = max(rest, abs(d2) * mpmath.log(n_full / mpmath.sqrt(2)) / mpmath.log(mpmath.sqrt(2)))
    return (0, rest, slow) if d2 > 0 else (rest, 0, slow)


def _choose_mu(c, mus, step):
    """mu from mu^step: the root consistent with the one-step ratios."""
    if step == 1:
        return mus
    last = [c[n] / c[n - 1] for n in range(len(c) - 6, len(c)) if c[n - 1] != 0]
    roots = [mpmath.root(mus, step, k) for k in range(step)]
    if not last:
        return roots[0]
    if all(not isinstance(r, mpmath.mpc) or r.imag == 0 for r in roots) or not isinstance(mus, mpmath.mpc):
        # real case: sign from the majority of signs of c_n c_(n-1)
        pos = sum(1 for v in last if mpmath.re(v) > 0)
        m = abs(mpmath.re(mpmath.root(mus, step))) if mpmath.re(mus) > 0 else None
        if m is None:
            return None
        return m if pos * 2 >= len(last) else -m
    ref = last[-1]
    return min(roots, key=lambda r: abs(r - ref))


def estimate_ratio(series, ctx=None, step=None):
    """Dominant singularity from ratios of successive coefficients.

    Parameters
    ----------
    series : Series
    ctx : Context, optional
    step : {1, 2, None}
        Ratio step; None chooses the step whose extrapolation is sharper.

    Returns
    -------
    MethodResult
        One singularity (location, exponent, kind) and the radius; the
        diagnostics hold the ratios and the Neville columns.
    """
    method = "ratio"
    prep = prepare(series, ctx)
    with prep.ctx.working():
        c = prep.c
        growth, kappa = classify_growth(c)
        if growth != "finite radius":
            return failed(method, Status.NOT_APPLICABLE,
                          f"coefficients grow like {'a factorial' if growth == 'factorial' else 'an entire-like'} series "
                          f"(kappa = {sig_text(kappa, 3)}); "
                          "ratio extrapolation needs a finite radius", prep, {"kappa": kappa})
        steps = [step] if step else [1, 2]
        # zero coefficients in the tail that are not one whole parity class: the ratios skip
        # them and read the period as a singularity (1/(1 + x + x^2): 1, -1, 0, 1, -1, 0, ...
        # gave a "pole at x = -1" with a 40-digit band)
        half = len(c) // 2
        zeros = [n for n in range(half, len(c)) if c[n] == 0]
        if zeros:
            par = {n % 2 for n in zeros}
            whole_class = len(par) == 1 and all(c[n] == 0 for n in range(half, len(c))
                                                if n % 2 == zeros[0] % 2)
            if not whole_class:
                return failed(method, Status.NOT_APPLICABLE,
                              f"{len(zeros)} zero coefficients among the last {len(c) - half} "
                              f"(at n = {', '.join(str(n) for n in zeros[:4])}{', ...' if len(zeros) > 4 else ''})"
                              " in no simple stride: ratios would skip them and read their period "
                              "as a singularity; the Padé and conjugate-pair methods do not", prep)
            steps = [2]
        cands = []
        for s in steps:
            r = _ratio_step(c, s, prep.eps)
            if r is not None:
                rel = r["mu_s_half"] / abs(r["mu_s"])
                cands.append((rel, r))
        if not cands:
            n_zero = sum(1 for v in c if v == 0)
            why = (f"the coefficients carry only {prep.digits} digit{'s' if prep.digits != 1 else ''}"
                   if prep.digits is not None and prep.digits < 6 else
                   f"{n_zero} zero coefficient{'s' if n_zero != 1 else ''} among {len(c)}" if n_zero else
                   f"{len(c)} terms are too few for the ratio fits; give more terms")
            return failed(method, Status.TOO_FEW_TERMS, f"too few usable ratios ({why})", prep)
        cands.sort(key=lambda t: t[0])
        rel, r = cands[0]
        s = r["step"]
        mu = _choose_mu(c, r["mu_s"], s)
        if mu is None or rel > 0.1:
            return failed(method, Status.NOT_CONVERGED,
                          "ratios do not settle (complex or competing singularities?); try the "
                          "conjugate-pair, Padé or differential-approximant methods", prep,
                          {"relative_half_width": rel})
        # steady drift with the number of terms (checked with N/2 and N/sqrt(2) terms): the
        # band reaches, in the direction of the drift, as far as the drift has yet to go
        N = len(c)
        short = [_ratio_step(c[:m], s, prep.eps) for m in (N // 2, int(N / mpmath.sqrt(2)))]
        short = [t if t is not None and t["step"] == s else None for t in short]
        get = lambda key: [None if t is None else t[key] for t in short]  # noqa: E731
        mu_dn, mu_up, mu_slow = drift_extension(*get("mu_s"), r["mu_s"], noise=prep.eps * 16 * abs(r["mu_s"]),
                                                n_full=N)
        th_dn, th_up, th_slow = drift_extension(*get("theta"), r["theta"], noise=prep.eps * 16 * N, n_full=N)
        drift = {"mu_s": [t for t in get("mu_s")] + [r["mu_s"]],
                 "theta": [t for t in get("theta")] + [r["theta"]],
                 "n_terms": [N // 2, int(N / mpmath.sqrt(2)), N]}
        # band on mu from band on mu^s: d mu = d(mu^s) / (s mu^(s-1))
        to_mu = s * abs(mu) ** (s - 1)
        mu_half = r["mu_s_half"] / to_mu
        # |mu| below / above its value (for mu < 0 with s = 1 a larger mu^s is a smaller |mu|)
        flip = s == 1 and mpmath.re(mu) < 0
        lo_ext, hi_ext = (mu_up, mu_dn) if flip else (mu_dn, mu_up)
        amu_dn = mu_half + SAFETY * lo_ext / to_mu
        amu_up = mu_half + SAFETY * hi_ext / to_mu
        xc = 1 / mu
        amu = abs(mu)
        if isinstance(xc, mpmath.mpc) and xc.imag != 0:
            m_half = max(amu_dn, amu_up)
            xc_half = m_half / amu ** 2 * (1 + m_half / amu) if m_half < amu else abs(xc)
            re = Estimate(xc.real, xc.real - xc_half, xc.real + xc_half)
            im = Estimate(xc.imag, xc.imag - xc_half, xc.imag + xc_half)
        else:
            xc = mpmath.re(xc)
            # |x_c| = 1/|mu|: from 1/(|mu| + up) to 1/(|mu| - down)
            near, far = 1 / (amu + amu_up), (1 / (amu - amu_dn) if amu_dn < amu else mpmath.inf)
            re = Estimate(xc, near, far) if xc > 0 else Estimate(xc, -far, -near)
            im = Estimate.exact(0)
        th = mpmath.re(r["theta"])
        theta = Estimate(th, th - r["theta_half"] - SAFETY * th_dn, th + r["theta_half"] + SAFETY * th_up)
        kind = classify_kind(theta)
        cnote = complex_exponent_note(r["theta"], theta.error)
        if cnote:
            theta, kind = None, "branch"
        slow = [w for w, f in (("location", mu_slow), ("exponent", th_slow)) if f]
        sing = Singularity(re, im, kind, theta, method,
                           f"ratio step {s}, Neville orders {r['k_mu']} (intercept) and {r['k_theta']} (exponent)"
                           + (f"; {' and '.join(slow)} still drifting with the number of terms" if slow else "")
                           + (f"; {cnote}" if cnote else ""))
        how = (f"Ratios z_n = c_n/c_(n-{s}) over n = {r['ns'][0]}..{r['ns'][-1]}; intercept mu^{s} and "
               f"exponent extrapolated in 1/n by Neville tables, order chosen where the last 4 entries "
               f"agree best; band = {SAFETY} x (spread of those entries, change to the next order, "
               "noise floor, what is left of a steady movement of the columns with the order); exponent "
               "band includes the intercept's band; a steady drift of either "
               f"between N/2, N/sqrt(2) and N terms extends the band (x {SAFETY}) in its direction by what "
               "is left of it if it shrinks geometrically (by at most 0.8 per step), or, if it shrinks "
               "more slowly, like 1/log N, whichever is more.")
        diag = {"how": how, "step": s, "kappa": kappa, "ratios": [(n, z) for n, z in zip(r["ns"], r["z"])],
                "neville_intercept": r["table_mu"], "neville_exponent": r["table_theta"],
                "steps_tried": [{"step": t[1]["step"], "rel_half_width": t[0]} for t in cands],
                "drift": drift}
        return finish(method, prep, [sing], diagnostics=diag, step=s)


# ---------------------------------------------------------------------------
# root test
# ---------------------------------------------------------------------------

#: root test: relative band above which the upper-envelope fit is tried, and beyond which the
#: test reports no radius (common practice, no source)
ROOT_ENVELOPE_SPREAD = mpmath.mpf("0.1")
ROOT_MAX_SPREAD = mpmath.mpf("0.5")


def _root_fits(pts):
    """Fits of ``log|c_n|`` (``pts``: (n, log|c_n|)) over three windows and two model sizes:
    ``(radius, SAFETY x spread, fits)`` or ``None``."""
    ests = []
    for nb in (3, 4):
        for w in (len(pts), (2 * len(pts)) // 3, len(pts) // 2):
            sub = pts[-w:]
            if len(sub) < nb + 2:
                continue
            basis = lambda n: [mpmath.mpf(n), mpmath.log(n), mpmath.mpf(1), mpmath.mpf(1) / n][:nb]  # noqa: E731
            A = mpmath.matrix([basis(n) for n, _ in sub])
            b = mpmath.matrix([y for _, y in sub])
            try:
                sol = lu_solve(A.T * A, A.T * b)
            except ZeroDivisionError:
                continue
            ests.append(mpmath.exp(-sol[0]))
    if not ests:
        return None
    v = ests[0]
    return v, SAFETY * max(abs(e - v) for e in ests), ests


def estimate_root_test(series, ctx=None):
    """Radius from the growth of ``|c_n|``: fits of ``log|c_n|`` to
    ``n log mu + (g) log n + b + d/n`` over the last coefficients.

    Notes
    -----
    The plain root test ``|c_n|^(-1/n)`` converges like ``log n / n``; the fit
    removes the power and the constant. Band: safety factor (2) times the
    spread of fits over three windows and two model sizes. Only the modulus
    is found (oscillating coefficients give wide bands); no exponent is
    reported. Where the fits disagree by more than ``ROOT_ENVELOPE_SPREAD`` of
    the radius (one parity or phase of the coefficients falls off faster), the
    upper envelope is fitted instead (the limsup of Cauchy-Hadamard); beyond
    ``ROOT_MAX_SPREAD`` no radius is reported. Applicability: finite non-zero
    radius. # common practice, no source
    """
    method = "root-test"
    prep = prepare(series, ctx)
    with prep.ctx.working():
        c = prep.c
        growth, kappa = classify_growth(c)
        if growth != "finite radius":
            return failed(method, Status.NOT_APPLICABLE, f"{growth} growth: no finite radius", prep)
        N = len(c)
        pts = [(n, mpmath.log(abs(c[n]))) for n in range(N // 3, N) if c[n] != 0]
        if len(pts) < 8:
            zeros = N - N // 3 - len(pts)
            return failed(method, Status.TOO_FEW_TERMS,
                          f"only {len(pts)} non-zero coefficients from order {N // 3} on (the upper two "
                          f"thirds{f', {zeros} of them zero' if zeros else ''}); the root test needs 8: "
                          "give more terms", prep)
        fit = _root_fits(pts)
        envelope = None
        if fit is None or fit[1] > fit[0] * ROOT_ENVELOPE_SPREAD:
            # the magnitudes follow no single law: a subsequence (a parity, a phase of a complex
            # pair) falls off faster. The radius is the limsup (Cauchy-Hadamard): fit the upper
            # envelope, the largest |c_n| of each block of k consecutive orders
            for k in (2, 3, 4):
                env = [max(pts[i:i + k], key=lambda q: q[1]) for i in range(0, len(pts) - k + 1, k)]
                if len(env) < 8:
                    continue
                f = _root_fits(env)
                if f is not None and (fit is None or f[1] / f[0] < fit[1] / fit[0]):
                    fit, envelope = f, k
        if fit is None:
            return failed(method, Status.TOO_FEW_TERMS, "too few non-zero coefficients", prep)
        v, half, ests = fit
        if half > v * ROOT_MAX_SPREAD:
            return failed(method, Status.NOT_CONVERGED,
                          f"the fits of log|c_n| disagree by more than {int(ROOT_MAX_SPREAD * 100)} % of the radius "
                          "(competing singularities of different radii?); use the ratio, conjugate-pair or "
                          "Padé estimates", prep)
        half = max(half, v * mpmath.mpf(10) ** -(prep.digits // 2))
        radius = Estimate(v, v - half, v + half)
        how = ("Least-squares fits of log|c_n| to n log(mu) + g log n + b (+ d/n) over three windows of "
               f"the last coefficients; band = {SAFETY} x spread of the six fits.")
        if envelope:
            how += f" Fitted to the upper envelope (largest |c_n| of each {envelope} consecutive orders)."
        return finish(method, prep, [], diagnostics={"how": how, "fits": ests}, radius_u=radius)


# ---------------------------------------------------------------------------
# complex-conjugate pair: coefficients fitted to a three-term recurrence
# ---------------------------------------------------------------------------

def _pair_fit(c, n, D):
    """Fit c_m = alpha(m) c_(m-1) + beta(m) c_(m-2), alpha, beta polynomials of
    degree D in 1/m, through the equations m = n, n-1, ..., n-2D-1."""
    K = 2 * (D + 1)
    rows, rhs = [], []
    for m in range(n - K + 1, n + 1):
        if m - 2 < 0:
            return None
        row = [c[m - 1] / mpmath.mpf(m) ** j for j in range(D + 1)] + \
              [c[m - 2] / mpmath.mpf(m) ** j for j in range(D + 1)]
        rows.append(row)
        rhs.append(c[m])
    try:
        sol = lu_solve(mpmath.matrix(rows), mpmath.matrix(rhs))
    except ZeroDivisionError:
        return None
    a0 = sol[0]
    b0, b1 = sol[D + 1], (sol[D + 2] if D >= 1 else 0)
    if b0 >= 0:
        return None       # mu^2 = -beta_0 must be positive for a conjugate pair
    mu = mpmath.sqrt(-b0)
    cosphi = a0 / (2 * mu)
    g = b1 / (2 * b0) if D >= 1 else None
    return mu, cosphi, g


def estimate_conjugate_pair(series, ctx=None):
    """A dominant complex-conjugate pair ``x_c = R exp(+-i phi)`` and its exponent.

    For ``c_n ~ mu^n n^g cos(n phi + psi)`` (``mu = 1/R``), the coefficients
    nearly obey ``c_n = alpha(n) c_(n-1) + beta(n) c_(n-2)`` with
    ``alpha -> 2 mu cos(phi) (1 + g/n)``, ``beta -> -mu^2 (1 + 2 g/n)``.
    Fitting ``alpha`` and ``beta`` as polynomials of degree ``D`` in ``1/n`` to
    consecutive coefficients gives ``mu``, ``phi`` and ``theta = -1 - g``.

    Notes
    -----
    Estimates from the last windows of n are compared for D = 1..4 and the
    most stable D is used; band = safety (2) x spread over the last 6 n. The
    exponent band is wider since ``g`` enters at order 1/n.
    Applicability: real coefficients, one dominant conjugate pair whose
    oscillation the data resolve: a fitted angle within ``1/N`` of the real
    axis (less than a sixth of a period over the N terms) is reported as not
    applicable, since a real singular point with corrections in ``1/n`` fits
    the same recurrence.

    References
    ----------
    G. N. Mercer and A. J. Roberts, SIAM J. Appl. Math. 50 (1990) 1547;
    D. L. Hunter and G. A. Baker, Phys. Rev. B 19 (1979) 3808 (both from memory;
    the recurrence fit here is written out in this docstring).
    """
    method = "conjugate-pair"
    prep = prepare(series, ctx)
    if prep.is_complex:
        return failed(method, Status.NOT_APPLICABLE, "complex coefficients: no conjugate pair", prep)
    with prep.ctx.working():
        c = prep.c
        N = len(c)
        growth, _ = classify_growth(c)
        if growth != "finite radius":
            return failed(method, Status.NOT_APPLICABLE, f"{growth} growth: no finite radius", prep)
        best = None
        table = {}
        W = 6
        for D in (1, 2, 3, 4):
            seq = []
            for n in range(N - W, N):
                if n - 2 * (D + 1) - 1 < N // 3:
                    continue
                f = _pair_fit(c, n, D)
                if f is None:
                    seq = []
                    break
                seq.append((n,) + f)
            if len(seq) < 4:
                continue
            mus = [s[1] for s in seq]
            cps = [s[2] for s in seq]
            if any(abs(x) >= 1 for x in cps):
                continue
            spread = max(mus) - min(mus) + (max(cps) - min(cps))
            table[D] = seq
            score = spread / mus[-1]
            if best is None or score < best[0]:
                best = (score, D, seq)
        if best is None:
            return failed(method, Status.NOT_CONVERGED,
                          "coefficients do not fit a three-term recurrence of a conjugate pair", prep)
        score, D, seq = best
        if score > 0.05:
            return failed(method, Status.NOT_CONVERGED,
                          f"conjugate-pair fits unstable (relative spread {sig_text(score, 2)})", prep)
        n_last, mu, cphi, g = seq[-1]
        floor = prep.eps * 10 ** (2 * D + 2) * 100
        mu_half = max(SAFETY * max(abs(s[1] - mu) for s in seq), floor * mu)
        c_half = max(SAFETY * max(abs(s[2] - cphi) for s in seq), floor)
        gs = [s[3] for s in seq]
        g_half = max(SAFETY * max(abs(x - g) for x in gs), floor * N)
        # add the D -> D+1 change where available
        if D + 1 in table:
            n2, mu2, c2, g2 = table[D + 1][-1]
            mu_half = max(mu_half, SAFETY * abs(mu2 - mu))
            c_half = max(c_half, SAFETY * abs(c2 - cphi))
            g_half = max(g_half, SAFETY * abs(g2 - g))
        R = 1 / mu
        phi = mpmath.acos(cphi)
        off_axis = min(phi, mpmath.pi - phi)
        if N * off_axis < 1:
            # c_n ~ mu^n n^g cos(n phi + psi) with N phi << 1 (or N (pi - phi) << 1) has not
            # turned through a sixth of a period by the last coefficient: over the data it is a
            # real point whose corrections in 1/n the fit has mistaken for an angle (measured:
            # (1 + 16x)^(1/8) - 3 (1 + 16x)^(5/8), 80 terms, gave -1/16 +- 1.3e-7 i and an
            # exponent 0.875 for the true 1/8)
            return failed(method, Status.NOT_APPLICABLE,
                          f"fitted angle {sig_text(off_axis, 2)} from the real axis turns through less "
                          f"than a sixth of a period over {N} terms: a real singular point, left to the "
                          "ratio methods", prep)
        R_half = mu_half / mu ** 2
        sinphi = mpmath.sin(phi)
        phi_half = c_half / max(abs(sinphi), mpmath.mpf(10) ** -10)
        theta = Estimate(-1 - g, -1 - g - g_half, -1 - g + g_half)
        kind = classify_kind(theta)
        sings = []
        for sgn in (1, -1):
            z = R * mpmath.expj(sgn * phi)
            # rectangle from the (R, phi) band
            pts = [r * mpmath.expj(sgn * p) for r in (R - R_half, R + R_half)
                   for p in (phi - phi_half, phi + phi_half)]
            re = Estimate(z.real, min(p.real for p in pts), max(p.real for p in pts))
            im = Estimate(z.imag, min(p.imag for p in pts), max(p.imag for p in pts))
            sings.append(Singularity(re, im, kind, theta, method, f"recurrence fit, degree {D} in 1/n"))
        radius = Estimate(R, R - R_half, R + R_half)
        how = (f"Coefficients fitted to c_n = alpha(n) c_(n-1) + beta(n) c_(n-2) with alpha, beta of degree "
               f"{D} in 1/n (degree chosen by stability); band = {SAFETY} x spread over the last "
               f"{len(seq)} n and the change to degree {D + 1}.")
        diag = {"how": how, "degree": D, "angle": Estimate(phi, phi - phi_half, phi + phi_half),
                "fits": [{"n": s[0], "mu": s[1], "cos_phi": s[2], "g": s[3]} for s in seq]}
        return finish(method, prep, sings, diagnostics=diag, radius_u=radius)


# ---------------------------------------------------------------------------
# factorial divergence: c_n ~ S A^-n Gamma(n + b)
# ---------------------------------------------------------------------------

def estimate_large_order(series, ctx=None):
    """Borel-plane singularity ``A`` and exponent ``b`` of a factorially divergent series.

    For ``c_n ~ S A^(-n) Gamma(n + b) (1 + a_1/n + ...)``,
    ``z_n = c_n/c_(n-1) = (n - 1 + b)/A (1 + O(1/n^2))``; so ``z_n/n -> 1/A``
    and ``A z_n - n + 1 -> b``, both extrapolated by Neville tables in 1/n.
    The Borel transform ``sum c_n t^n / n!`` is then singular at ``t = A``
    like ``(1 - t/A)^(-b)``.

    Notes
    -----
    Bands: safety (2) x the Neville spread (see :mod:`resum.estimators._extrap`);
    the band of ``b`` includes the effect of the band of ``A``. A negative
    ``A`` means alternating coefficients (Borel singularity on the negative
    axis, the Borel-summable case). The radius of the series is 0.
    Applicability: ``c_n`` of one sign pattern (fixed or alternating) with
    Gamma(n) growth; a series in ``x^k`` is analysed in ``u = x^k``, and ``A``,
    ``b`` refer to ``u``.

    References
    ----------
    C. M. Bender and T. T. Wu, Phys. Rev. D 7 (1973) 1620; J. Zinn-Justin,
    *Quantum Field Theory and Critical Phenomena*, Oxford (large-order
    behaviour; from memory).
    """
    method = "large-order"
    prep = prepare(series, ctx)
    with prep.ctx.working():
        c = prep.c
        growth, kappa = classify_growth(c)
        if growth != "factorial":
            return failed(method, Status.NOT_APPLICABLE,
                          f"coefficients do not grow factorially (kappa = {sig_text(kappa, 3)})",
                          prep, {"kappa": kappa})
        ns, z = ratio_sequence(c, 1)
        wn, wz = _window(ns, z)
        if len(wn) < 6:
            return failed(method, Status.TOO_FEW_TERMS, "too few usable ratios", prep)
        # Gamma(m n + b) growth: m = 1 usually; m = 2 for a series in x^2 whose terms grow like
        # Gamma(n_x) in x (Stirling's series: Borel-plane singularities at +-2 pi i in x)
        m = 1
        if kappa > 1.6 and abs(kappa - round(float(kappa))) < 0.35:
            m = int(round(float(kappa)))
        y = [zz / (m * n) ** m for n, zz in zip(wn, wz)]
        inv_a, ia_half, k1, info1 = extrapolate(wn, y, prep.eps * 4)
        if inv_a == 0 or ia_half > abs(inv_a) / 10:
            # the growth is factorial all the same (the verdict keeps that, without A and b)
            return failed(method, Status.NOT_CONVERGED, f"z_n/n{'' if m == 1 else f'^{m}'} does not settle",
                          prep, {"table": info1, "kappa": kappa, "factorial": True})
        A = 1 / inv_a
        A_half = ia_half / abs(inv_a) ** 2
        if m == 1:
            bseq = lambda a: [a * zz - n + 1 for n, zz in zip(wn, wz)]  # noqa: E731
        else:
            # (A z_n)^(1/m) = m n + b - (m + 1)/2 + O(1/n)
            bseq = lambda a: [mpmath.re(mpmath.root(a * zz, m)) - m * n + mpmath.mpf(m + 1) / 2  # noqa: E731
                              for n, zz in zip(wn, wz)]
        bnoise = [abs(A * zz) * prep.eps * 8 for zz in wz]
        b, b_half, k2, info2 = extrapolate(wn, bseq(A), prep.eps, noise=bnoise)
        for a in (A - A_half, A + A_half):
            bb, _, _, _ = extrapolate(wn, bseq(a), prep.eps, noise=bnoise)
            b_half = max(b_half, abs(bb - b))
        A_est = Estimate(mpmath.re(A), mpmath.re(A) - A_half, mpmath.re(A) + A_half)
        b_est = Estimate(mpmath.re(b), mpmath.re(b) - b_half, mpmath.re(b) + b_half)
        if m == 1:
            how = (f"z_n = c_n/c_(n-1) for n = {wn[0]}..{wn[-1]}; 1/A = lim z_n/n and b = lim (A z_n - n + 1) "
                   f"by Neville tables in 1/n; band = {SAFETY} x spread of the chosen column (b includes "
                   "the band of A).")
        else:
            how = (f"c_n ~ S A^-n Gamma({m} n + b): z_n = c_n/c_(n-1) for n = {wn[0]}..{wn[-1]}; 1/A = "
                   f"lim z_n/({m} n)^{m} and b = lim ((A z_n)^(1/{m}) - {m} n + {(m + 1) / 2:g}) by Neville "
                   f"tables in 1/n; band = {SAFETY} x spread of the chosen column (b includes the band of A).")
        diag = {"how": how, "kappa": kappa, "neville_inverse_A": info1, "neville_b": info2,
                "ratios": list(zip(wn, wz)), "gamma_multiple": m}
        zero = Estimate.exact(0)
        return finish(method, prep, [], growth="factorial", diagnostics=diag, borel=A_est,
                      borel_b=b_est, radius_u=zero)
