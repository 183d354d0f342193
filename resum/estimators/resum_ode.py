"""Values from the differential equation a series obeys exactly (method ``ode``).

When the series obeys a linear differential equation with polynomial coefficients,
``sum_j Q_j(x) f^(j)(x) + P(x) = 0`` (order 1 or 2, found by
:func:`resum.estimators.diffapprox.exact_equation` and checked on every coefficient
beyond those it was fitted to), the function is known wherever the equation can be
followed. ``ode_evaluate`` starts inside the disk of convergence (values from the
series itself) and steps along the straight line from 0 to the point: at each step
the Taylor coefficients of the solution at the current centre follow from the
equation by a recurrence, and the step is at most half the distance to the nearest
zero of ``Q_K`` (where solutions can be singular), so each local series converges
at least like ``2^-n``. The value is thus the continuation along the straight line
from 0 (for radial cuts, the principal branch). A zero of ``Q_K`` within ``1e-8 |x|`` of
the line is gone round by two half circles, one on each side: if both arrive at the same
values, the function is single-valued there (a pole, or an apparent singular point of the
equation) and the walk goes on; if not, the point lies beyond a branch point on its line
and is refused. For exact input a small gap (below 1e-8) is taken for an apparent point
seen through an equation fitted at too few digits, and the point is retried once with the
equation fitted at twice the digits. A series whose equation has an irregular singular
point at the origin (a divergent series such as ``sum (-1)^n n! x^n``) is refused.

The band: the whole continuation is run twice, at the working precision and with
20 more digits, starting from the series with all terms and with five fewer; the
band is 10 times the larger change (an estimate, not a proof). Common practice
(analytic continuation by Taylor steps), no source.
"""
from __future__ import annotations

import math

import flint
import mpmath

from .._kernels.flint_bridge import acb_to_mpc, flint_prec, to_acb
from ..results import Estimate, point_text
from ._common import first_term_scale
from ._num import poly_roots
from .diffapprox import (_deriv_coeffs, _equation_at, _normalisation_vanishes, _residual_ok, exact_equation,
                         exact_tolerance, fit_diffapprox)
from .resum_band import PointOutcome

__all__ = ["ode_evaluate", "find_equation", "equation_shape"]

#: the band is this many times the change under the reruns
SAFETY = 10


def find_equation(c, dps: int, digits: int, shape=None):
    """``(K, Q, P)`` of the lowest-order equation the coefficients ``c`` obey exactly (order
    1, then 2), or None. A rational function (``Q_0 f + P = 0``, order 0: it also obeys a family
    of first-order equations, whose fit is then singular) is returned as the first-order
    equation ``Q_0 f' + Q_0' f + P' = 0``.

    ``shape`` (from :func:`equation_shape` of an equation found earlier for the same series,
    for example at other digits or with more terms) is fitted first and kept if it passes the
    same test on every coefficient; otherwise the full search runs (a long series that obeys a
    first-order equation with ``Q_1(0) = 0`` costs the search about a second: some 150 linear
    systems)."""
    tol = exact_tolerance(digits)
    if shape is not None:
        eq = _fit_shape(c, dps, tol, *shape)
        if eq is not None:
            return eq
    for K in (0, 1, 2):
        if K == 0 and not _maybe_rational(c, dps, tol):
            continue
        D = _deriv_coeffs(c, K)
        eqs = exact_equation(D, K, dps, tol)
        if eqs:
            L, _, Q, _ = eqs[0]
            P = _inhomogeneity(D, K, Q, L, dps)
            if K == 0:
                q = Q[0]
                dq = [k * q[k] for k in range(1, len(q))] or [mpmath.mpf(0)]
                dp = [k * P[k] for k in range(1, len(P))] or [mpmath.mpf(0)]
                return 1, [dq, list(q)], dp
            return K, Q, P
    return None


def equation_shape(eq):
    """``(K, lead, M, L)`` of an equation from :func:`find_equation` (order, order of the
    zero of ``Q_K`` at 0, degree of the ``Q_j``, degree of ``P``), to pass back as its
    ``shape``; None for a rational function's converted equation (found quickly anyway)."""
    if eq is None:
        return None
    K, Q, P = eq
    if len({len(q) for q in Q}) != 1:
        return None
    return K, _order_at_zero(Q[K]), len(Q[K]) - 1, len(P) - 1


def _fit_shape(c, dps, tol, K, lead, M, L):
    """The equation of exactly this shape if it holds for every coefficient, else None."""
    D = _deriv_coeffs(c, K)
    try:
        fit = fit_diffapprox(D, K, L, [M] * (K + 1), dps, lead)
    except (ValueError, ZeroDivisionError, ArithmeticError):
        return None
    if fit is None or not _residual_ok(D, K, L, fit[0], tol) or _normalisation_vanishes(fit[0], dps):
        return None
    return K, fit[0], _inhomogeneity(D, K, fit[0], L, dps)


def _inhomogeneity(D, K, Q, L, dps):
    """``P`` (degree ``L``) of ``sum_j Q_j f^(j) + P = 0``, rounding-level entries set to 0."""
    P = [-_equation_at(D, K, Q, n)[0] for n in range(L + 1)]
    scale = max([abs(v) for q in Q for v in q] + [mpmath.mpf(1)])
    return [v if abs(v) > mpmath.mpf(10) ** (-dps // 2) * scale else mpmath.mpf(0) for v in P]


def _maybe_rational(c, dps, tol) -> bool:
    """False when ``c`` is surely not a rational function of degree below ``len(c)/2``: its
    continued fraction (the Padé kernel's recursion, O(N^2) in ball arithmetic, ~20 ms at 200
    terms) runs through every coefficient without terminating, even at 1000 x the tolerance
    of the exact search. True otherwise (terminated, or a singular block: let the search
    decide). Saves the order-0 search, up to 64 growing linear systems at each of three
    normalisations (measured: 1.7 s of the 2 s that find_equation took on log(1+x)/x, 200 terms)."""
    from .._kernels.pade import pade
    n = len(c)
    if n < 8:
        return True
    M = (n - 1) // 2
    try:
        r = pade(list(c), n - 1 - M, M, dps, tol=mpmath.mpf(tol) * 1000, method="fraction")
    except (ArithmeticError, ValueError, ZeroDivisionError):
        return True
    return r.defect > 0


def _order_at_zero(p):
    """Order of the zero of the polynomial ``p`` at 0 (len(p) for the zero polynomial)."""
    return next((i for i, v in enumerate(p) if v != 0), len(p))


def _regular_at_origin(Q, K) -> bool:
    """Fuchs' condition at 0: ``Q_j/Q_K`` has a pole of order at most ``K - j`` there."""
    m = _order_at_zero(Q[K])
    return all(_order_at_zero(Q[j]) >= m - (K - j) for j in range(K))


def _shift(p, z):
    """Coefficients of ``p(z + u)`` in ``u`` (Horner-style Taylor shift, O(deg^2))."""
    out = list(p)
    n = len(out)
    for i in range(n):
        for k in range(n - 2, i - 1, -1):
            out[k] += z * out[k + 1]
    return out


def _step(Q, P, K, z, init, h, eps, coefficients=False):
    """Values ``f^(j)(z + h)``, ``j < K``, from ``init = [f^(j)(z)]`` by the local Taylor series
    of the equation's solution at ``z``. Scaled coefficients ``b_n = a_n h^n`` (``|h|`` is at
    most half the local radius, so ``|b_n|`` falls like ``2^-n``); summed until five in a row
    are below ``eps`` times the largest.

    The recurrence runs on FLINT complex numbers at the current mpmath precision plus 20 bits,
    midpoints only (the ball radii are dropped at every step: the rounding is measured by the
    rerun at higher precision instead); about 15 times faster than mpmath numbers. With
    ``coefficients``, also returns the scaled local coefficients ``b_n`` (FLINT numbers):
    ``f(z + tau h) = sum b_n tau^n`` for ``0 <= tau <= 1``."""
    q = [_shift(qj, z) for qj in Q]
    p = _shift(P, z)
    with flint_prec(mpmath.mp.prec + 20):
        A = flint.acb
        hA = to_acb(h)
        top = max(max(len(qj) for qj in q) + K + 2, len(p) + K + 1)
        hp = [A(1)]
        for _ in range(top):
            hp.append((hp[-1] * hA).mid())
        # the terms of the recurrence, (q value, j, i) with the power of h they carry
        terms = [((to_acb(qv) * hp[i + K - j]).mid(), j, i) for j in range(K + 1)
                 for i, qv in enumerate(q[j]) if qv != 0 and not (j == K and i == 0)]
        pt = [(to_acb(pv) * hp[m + K]).mid() for m, pv in enumerate(p)]
        lead = to_acb(q[K][0])
        b = [(to_acb(init[j]) * hp[j] / math.factorial(j)).mid() for j in range(K)]
        big = max([abs(v).mid() for v in b] + [flint.arb(0)])
        epsA = to_acb(eps).real
        small = 0
        m = 0
        while small < 5 and m < 20000:
            # coefficient of u^m: sum_j sum_i q_j[i] a_{m-i+j} (m-i+j)!/(m-i)! + p[m] = 0, scaled
            # by h^(m+K)
            acc = pt[m] if m < len(pt) else A(0)
            for qh, j, i in terms:
                if m - i < 0:
                    continue
                n = m - i + j
                f = 1 if j == 0 else (n if j == 1 else n * (n - 1))
                acc += qh * b[n] * f
            fk = (m + 1) if K == 1 else (m + 2) * (m + 1)
            new = (-acc / (lead * fk)).mid()
            b.append(new)
            mag = abs(new).mid()
            if mag > big:
                big = mag
            small = small + 1 if mag <= epsA * big else 0
            m += 1
        out = []
        for j in range(K):
            acc = A(0)
            for n in range(j, len(b)):
                acc += b[n] * (1 if j == 0 else n)
            out.append(acb_to_mpc((acc / hp[j]).mid()))
    out = [mpmath.mpf(v.real) if v.imag == 0 else v for v in out]
    return (out, b) if coefficients else out


#: a zero of Q_K closer than this (relative to |x|) to the straight line lies on the path
ON_PATH = mpmath.mpf(10) ** -8

#: chords of each half circle around a zero on the path (each 2 sin(pi/16) = 0.39 of the radius,
#: below the half-radius step limit)
ARC_CHORDS = 8


def _walk(Q, P, K, roots, z, target, vals, eps, record=None, budget=None):
    """Taylor steps along the segment from ``z`` to ``target`` (which stays off the zeros of
    ``Q_K``), each at most half the distance to the nearest zero. With a list ``record``, each
    step appends ``(z, h, b)``: its centre, length and scaled local coefficients."""
    while True:
        rem = abs(target - z)
        if rem <= eps * max(1, abs(target)):
            return vals
        near = min((abs(z - r) for r in roots), default=mpmath.inf)
        h = (target - z) / rem * min(rem, near / 2)
        if budget is not None:
            budget[0] -= 1
            if budget[0] < 0:
                raise _TooFar()
        if record is None:
            vals = _step(Q, P, K, z, vals, h, eps)
        else:
            vals, b = _step(Q, P, K, z, vals, h, eps, coefficients=True)
            record.append((z, h, b))
        z = z + h


def _start(roots, c, K, end, dps, n_terms):
    """``(z0, [f^(j)(z0)])``: the start of a walk towards ``end``, inside the disk where the
    series (``n_terms`` of it) is accurate to ``10^-dps``. The origin may be a (regular) singular
    point of the equation, where the series is analytic all the same: the radius uses the
    nearest other zero."""
    dist0 = min((abs(r) for r in roots if r != 0), default=mpmath.inf)
    if not mpmath.isfinite(dist0):
        dist0 = abs(end)
    rho = min(mpmath.mpf(1) / 2, mpmath.mpf(10) ** (-(dps + 10) / max(n_terms, 1)))
    r0 = min(dist0 * rho, abs(end))
    z = end / abs(end) * r0 if end != 0 else mpmath.mpf(0)
    cs = list(c[:n_terms])

    def derivative(j):                    # f^(j)(z) by Horner on n!/(n-j)! c_n (exact integers)
        acc = 0
        for n in range(len(cs) - 1, j - 1, -1):
            acc = acc * z + cs[n] * math.perm(n, j)
        return acc
    return z, [derivative(j) for j in range(K)]


def _clusters(roots, tol):
    """Roots closer than ``tol`` (relative) merged into their mean."""
    out = []
    for r in roots:
        for k, (m, n) in enumerate(out):
            if abs(r - m / n) <= tol * max(1, abs(r)):
                out[k] = (m + r, n + 1)
                break
        else:
            out.append((r, 1))
    return [m / n for m, n in out]


def _path_zeros(roots, z0, x):
    """Zeros of Q_K on the open segment (z0, x), ordered along it: (parameter t, zero)."""
    d = x - z0
    out = []
    for r in roots:
        t = mpmath.re((r - z0) * mpmath.conj(d)) / abs(d) ** 2
        if 0 < t < 1 and abs(z0 + t * d - r) <= ON_PATH * max(1, abs(x)):
            out.append((t, r))
    return sorted(out, key=lambda tr: tr[0])


#: the walk refuses a point needing more Taylor steps than this (half circles included): the
#: steps grow only geometrically away from a singular point (about log|x| / log 1.5 of them),
#: and each costs a local series at the full precision (log(1 + x) from 40 terms: x = 1e300
#: took 385 s and came back wrong; x = 1e999999 never returned)
MAX_WALK_STEPS = 200


class _TooFar(Exception):
    """The walk took more than MAX_WALK_STEPS steps."""


def _continue(Q, P, K, roots, c, x, dps, n_terms, digits):
    """:func:`_continue_walk` with the step budget: a point the walk cannot reach in
    MAX_WALK_STEPS steps is refused (None, reason, None)."""
    budget = [MAX_WALK_STEPS]
    try:
        return _continue_walk(Q, P, K, roots, c, x, dps, n_terms, digits, budget)
    except _TooFar:
        return None, (f"{point_text(x, 6)} is too far out for the walk along the line (more than "
                      f"{MAX_WALK_STEPS} Taylor steps, each at most half the distance to the nearest "
                      "singular point of the equation)"), None


def _continue_walk(Q, P, K, roots, c, x, dps, n_terms, digits, budget):
    """``f(x)`` by continuation along the straight line from 0 (None and a reason if refused).

    A zero ``r`` of ``Q_K`` on the line is passed by two half circles, one on each side; if the
    two arrive at the same values (to the working precision), ``f`` is single-valued around ``r``
    (an apparent singular point of the equation, or a pole of ``f``) and the walk goes on with
    their mean; otherwise ``r`` is a branch point of ``f`` on the path and the point is refused.
    "The same" is to ``digits`` relative digits. At an apparent point the fitted equation's own
    error opens a small gap (2e-31 measured for sqrt(1 + x) + (1 + x/2)^(-1/3) from 80 terms at 90
    digits), which the solutions that grow along the rest of the path may amplify (to 1e-5 at
    x = 100 there): ``digits`` must be close to the precision of the equation's coefficients."""
    with mpmath.workdps(dps):
        x = mpmath.mpmathify(x)
        eps = mpmath.mpf(10) ** (-dps)
        z, vals = _start(roots, c, K, x, dps, n_terms)
        if z == x:
            return vals[0], "", None
        if min((abs(x - r) for r in roots), default=mpmath.inf) <= ON_PATH * max(1, abs(x)):
            return None, (f"{point_text(x, 10)} is a zero of the equation's leading coefficient (a singular "
                          "point of the equation): no value there"), None
        direction = (x - z) / abs(x - z)
        tol = mpmath.mpf(10) ** (-digits)
        # a multiple zero comes out of the root finder as a tight cluster: one point to go round
        centres = _clusters(roots, mpmath.mpf(10) ** (-dps / 4))
        for _, r in _path_zeros(centres, z, x):
            others = [abs(r - q) for q in centres if q != r] + [abs(r), abs(x - r)]
            rad = min(others) / 2
            z1 = r - direction * rad
            vals = _walk(Q, P, K, roots, z, z1, vals, eps, budget=budget)
            ends = []
            for side in (1, -1):
                v, w = vals, z1
                for k in range(1, ARC_CHORDS + 1):
                    w2 = r - direction * rad * mpmath.expj(side * mpmath.pi * k / ARC_CHORDS)
                    v = _walk(Q, P, K, roots, w, w2, v, eps, budget=budget)
                    w = w2
                ends.append(v)
            (up, down) = ends
            scale = max([abs(a) for a in up + down] + [eps])
            gap = max(abs(a - b) for a, b in zip(up, down)) / scale
            if gap > tol:
                rr = mpmath.re(r) if abs(mpmath.im(r)) <= tol * abs(r) else r
                return None, (f"the straight line from 0 to {point_text(x, 10)} passes through a zero of the "
                              f"equation's leading coefficient at {mpmath.nstr(rr, 10)}, and going round it on "
                              "either side gives different values (a branch point of the function, or an "
                              "equation not known accurately enough there); to pick a side of a cut, give the "
                              "point a small imaginary part (for example add 1e-6*I)"), gap
            vals = [(a + b) / 2 for a, b in zip(up, down)]
            z = r + direction * rad
        vals = _walk(Q, P, K, roots, z, x, vals, eps, budget=budget)
        return vals[0], "", None


#: a gap below this (relative) when going round a zero of Q_K on the path means an apparent
#: singular point seen through an inexact equation, worth one refit at twice the digits
REFIT_GAP = mpmath.mpf(10) ** -8


def _prepare(c, dps, digits, shape=None):
    """(K, Q, P, roots, None) of the equation of ``c`` fitted at ``dps + 10`` digits, or
    (None, ..., reason) when there is none or the origin is irregular."""
    with mpmath.workdps(dps + 10):
        cm = [mpmath.mpmathify(v) for v in c]
        eq = find_equation(cm, dps + 10, digits, shape)
    if eq is None:
        return None, None, None, None, ("the series obeys no linear differential equation of order 1 or 2 with "
                                        "polynomial coefficients (up to 64 unknowns) exactly: use another method")
    K, Q, P = eq
    if not _regular_at_origin(Q, K):
        return None, None, None, None, ("the origin is an irregular singular point of the equation the series "
                                        "obeys (the series diverges, or its sum is not fixed by it there): use a "
                                        "Borel method")
    with mpmath.workdps(dps + 10):
        roots = [r for r in poly_roots(Q[K], dps + 10) if r != 0] + (
            [mpmath.mpf(0)] if Q[K][0] == 0 else [])
    return K, Q, P, roots, None


def _value(eq, cm, x, dps, digits):
    """``(outcome, gap)`` at ``x``: the PointOutcome, and for a refusal after going round a
    zero of the leading coefficient the gap that was left (None otherwise)."""
    K, Q, P, roots = eq
    n = len(cm)
    # going round a zero of Q_K must give the same values to the digits the equation was fitted
    # with (less 20 for the fit's conditioning), whatever the precision of the walk
    same = max(digits, dps - 10)
    v1, why, gap = _continue(Q, P, K, roots, cm, x, dps + 10, n, same)
    if v1 is None:
        # the two sides differ by far more than an inexact equation explains: a branch point
        # of the function on the line, so the point has no single value to fall back to
        info = {"branch_on_line": True} if gap is not None and gap >= REFIT_GAP else {}
        return PointOutcome(None, None, False, why, info), gap
    v2, why2, _ = _continue(Q, P, K, roots, cm, x, dps + 30, n, same)
    v3, why3, _ = _continue(Q, P, K, roots, cm, x, dps + 10, max(K + 2, n - 5), same)
    if v2 is None or v3 is None:
        return PointOutcome(None, None, False, "the reruns could not follow the path: " + (why2 or why3), {}), None
    with mpmath.workdps(dps + 10):
        # the natural size of f at x (its first term there), for a value that vanishes
        scale = max(abs(v1), first_term_scale(cm, x))
        dev = max(abs(v1 - v2), abs(v1 - v3))
        err = SAFETY * dev + scale * mpmath.mpf(10) ** (-(digits + 5))
        vr, vi = mpmath.re(v1), mpmath.im(v1)
        re = Estimate(vr, vr - err, vr + err)
        im = Estimate(vi, vi - err, vi + err) if (isinstance(mpmath.mpmathify(x), mpmath.mpc) or vi != 0) else None
    return PointOutcome(re, im, True, "", {"how": "continuation of the exact equation along the straight "
                                                  "line from 0", "rerun_change": mpmath.nstr(dev, 5)}), None


def ode_evaluate(c, xs, dps: int, digits: int | None = None, coefficients_at=None, shape=None):
    """Values at ``xs`` from the exact equation of ``c`` (see the module docstring).

    ``coefficients_at(d)``, if given, returns the coefficients at ``d`` digits (exact input): a
    point refused because going round an apparent singular point of the equation left a small
    gap is retried once with the equation fitted at twice the digits. ``shape``: see
    :func:`find_equation`.

    Returns ``(outcomes, diagnostics)`` like the other evaluators."""
    digits = dps if digits is None else digits
    K, Q, P, roots, why = _prepare(c, dps, digits, shape)
    if why:
        return [PointOutcome(None, None, False, why, {}) for _ in xs], {"equation": None}
    from .diffapprox import equation_text
    diag = {"equation": equation_text(Q, P, "x", digits), "order": K,
            "singular_points": [mpmath.nstr(r, 15) for r in roots]}
    with mpmath.workdps(dps + 10):
        cm = [mpmath.mpmathify(v) for v in c]
    outs = []
    fine = None
    for x in xs:
        o, gap = _value((K, Q, P, roots), cm, x, dps, digits)
        if not o.ok and gap is not None and gap < REFIT_GAP and coefficients_at is not None:
            if fine is None:
                d2 = 2 * dps + 20
                c2 = coefficients_at(d2 + 10)
                K2, Q2, P2, roots2, why2 = _prepare(c2, d2, d2 - 10, shape)
                with mpmath.workdps(d2 + 10):
                    fine = (None if why2 else ((K2, Q2, P2, roots2), [mpmath.mpmathify(v) for v in c2], d2))
                if fine is None:
                    fine = False
            if fine:
                eq2, cm2, d2 = fine
                o2, _ = _value(eq2, cm2, x, d2, digits)
                if o2.ok:
                    o2.info["refit_digits"] = d2
                    o = o2
                    diag["refit_digits"] = d2
        outs.append(o)
    return outs, diag
