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
from 0 (for radial cuts, the principal branch). A point whose line passes within
``1e-8 |x|`` of a zero of ``Q_K`` is refused (it lies on a cut, or beside an apparent
singular point of the equation). A series whose equation has an irregular singular
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
from ..results import Estimate
from ._common import first_term_scale
from ._num import poly_roots
from .diffapprox import _deriv_coeffs, _equation_at, exact_equation, exact_tolerance
from .resum_band import PointOutcome

__all__ = ["ode_evaluate", "find_equation"]

#: the band is this many times the change under the reruns
SAFETY = 10


def find_equation(c, dps: int, digits: int):
    """``(K, Q, P)`` of the lowest-order equation the coefficients ``c`` obey exactly (order
    1, then 2), or None."""
    tol = exact_tolerance(digits)
    for K in (1, 2):
        D = _deriv_coeffs(c, K)
        eqs = exact_equation(D, K, dps, tol)
        if eqs:
            L, _, Q, _ = eqs[0]
            P = [-_equation_at(D, K, Q, n)[0] for n in range(L + 1)]
            scale = max([abs(v) for q in Q for v in q] + [mpmath.mpf(1)])
            P = [v if abs(v) > mpmath.mpf(10) ** (-dps // 2) * scale else mpmath.mpf(0) for v in P]
            return K, Q, P
    return None


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


def _step(Q, P, K, z, init, h, eps):
    """Values ``f^(j)(z + h)``, ``j < K``, from ``init = [f^(j)(z)]`` by the local Taylor series
    of the equation's solution at ``z``. Scaled coefficients ``b_n = a_n h^n`` (``|h|`` is at
    most half the local radius, so ``|b_n|`` falls like ``2^-n``); summed until five in a row
    are below ``eps`` times the largest.

    The recurrence runs on FLINT complex numbers at the current mpmath precision plus 20 bits,
    midpoints only (the ball radii are dropped at every step: the rounding is measured by the
    rerun at higher precision instead); about 15 times faster than mpmath numbers."""
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
    return [mpmath.mpf(v.real) if v.imag == 0 else v for v in out]


def _continue(Q, P, K, roots, c, x, dps, n_terms):
    """``f(x)`` by continuation along the straight line from 0 (None and a reason if refused)."""
    with mpmath.workdps(dps):
        x = mpmath.mpmathify(x)
        eps = mpmath.mpf(10) ** (-dps)
        # the origin may be a (regular) singular point of the equation, where the series is
        # analytic all the same: the start uses the nearest other zero
        dist0 = min((abs(r) for r in roots if r != 0), default=mpmath.inf)
        if not mpmath.isfinite(dist0):
            dist0 = abs(x)
        # start inside the disk, where the series (n_terms of it) is accurate to eps
        rho = min(mpmath.mpf(1) / 2, mpmath.mpf(10) ** (-(dps + 10) / max(n_terms, 1)))
        r0 = min(dist0 * rho, abs(x))
        z = x / abs(x) * r0 if x != 0 else mpmath.mpf(0)
        cs = list(c[:n_terms])
        vals = [sum(cs[n] * mpmath.ff(n, j) * z ** (n - j) for n in range(j, len(cs))) for j in range(K)]
        if z == x:
            return vals[0], ""
        direction = (x - z) / abs(x - z)
        for _ in range(100000):
            rem = abs(x - z)
            if rem <= eps * abs(x):
                break           # at the point to the working precision
            near = min((abs(z - r) for r in roots), default=mpmath.inf)
            if near <= mpmath.mpf(10) ** -8 * max(1, abs(x)):
                return None, (f"the straight line from 0 to {mpmath.nstr(x, 10)} passes through a zero of the "
                              "equation's leading coefficient (a branch point on the path, or an apparent "
                              "singular point of the equation); to pick a side of a cut, give the point a "
                              "small imaginary part (for example add 1e-6*I)")
            h = direction * min(rem, near / 2)
            vals = _step(Q, P, K, z, vals, h, eps)
            z = z + h
        return vals[0], ""


def ode_evaluate(c, xs, dps: int, digits: int | None = None):
    """Values at ``xs`` from the exact equation of ``c`` (see the module docstring).

    Returns ``(outcomes, diagnostics)`` like the other evaluators."""
    digits = dps if digits is None else digits
    with mpmath.workdps(dps + 10):
        cm = [mpmath.mpmathify(v) for v in c]
        eq = find_equation(cm, dps + 10, digits)
    if eq is None:
        why = ("the series obeys no linear differential equation of order 1 or 2 with polynomial "
               "coefficients (up to 64 unknowns) exactly: use another method")
        return [PointOutcome(None, None, False, why, {}) for _ in xs], {"equation": None}
    K, Q, P = eq
    if not _regular_at_origin(Q, K):
        why = ("the origin is an irregular singular point of the equation the series obeys (the series "
               "diverges, or its sum is not fixed by it there): use a Borel method")
        return [PointOutcome(None, None, False, why, {}) for _ in xs], {"equation": None}
    with mpmath.workdps(dps + 10):
        roots = [r for r in poly_roots(Q[K], dps + 10) if r != 0] + (
            [mpmath.mpf(0)] if Q[K][0] == 0 else [])
    from .diffapprox import equation_text
    diag = {"equation": equation_text(Q, P, "x", digits), "order": K,
            "singular_points": [mpmath.nstr(r, 15) for r in roots]}
    outs = []
    n = len(c)
    for x in xs:
        v1, why = _continue(Q, P, K, roots, cm, x, dps + 10, n)
        if v1 is None:
            outs.append(PointOutcome(None, None, False, why, {}))
            continue
        v2, _ = _continue(Q, P, K, roots, cm, x, dps + 30, n)
        v3, _ = _continue(Q, P, K, roots, cm, x, dps + 10, max(K + 2, n - 5))
        with mpmath.workdps(dps + 10):
            # the natural size of f at x (its first term there), for a value that vanishes
            scale = max(abs(v1), first_term_scale(cm, x))
            dev = max(abs(v1 - v2), abs(v1 - v3) if v3 is not None else abs(v1) * mpmath.mpf(10) ** -5)
            err = SAFETY * dev + scale * mpmath.mpf(10) ** (-(digits + 5))
            vr, vi = mpmath.re(v1), mpmath.im(v1)
            re = Estimate(vr, vr - err, vr + err)
            im = Estimate(vi, vi - err, vi + err) if (isinstance(mpmath.mpmathify(x), mpmath.mpc) or vi != 0) else None
        outs.append(PointOutcome(re, im, True, "", {"how": "continuation of the exact equation along the straight "
                                                         "line from 0", "rerun_change": mpmath.nstr(dev, 5)}))
    return outs, diag
