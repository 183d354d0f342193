"""Two-point Padé approximants in the disk variable: the weak-coupling series at ``w = 0`` and
terms of the strong-coupling expansion the user knows at ``w = 1`` (the image of infinity).

Setting. A ray map ``w = (s - 1)/(s + 1)``, ``s = sqrt(1 - x/x0)`` with ``x0 < 0`` (the cut
``x <= x0``), sends ``x = infinity`` to ``w = 1``; with ``eps = 1 - w``,
``x = -4 x0 (1 - eps)/eps^2``. A function with the large-x expansion

    f(x) ~ b_0 x^p0 + b_1 x^(p0 - 1/2) + b_2 x^(p0 - 1) + ...     (2 p0 an integer)

(for a series in ``x = g^2``: powers of the coupling ``g`` spaced by 1, the usual strong-coupling
form) has ``H(w) = (1 - w)^(2 p0) f(x(w)) ~ sum_j b_j (-4 x0)^(p0 - j/2) eps^j (1 - eps)^(p0 - j/2)``,
a power series in ``eps`` whose first ``n1`` coefficients follow from the ``n1`` terms given
(exponentially small corrections, ``exp(-k g)``, vanish faster than any power of ``eps``).
The two-point approximant ``P/Q`` (``deg P = L``, ``deg Q = M``, ``Q(0) = 1``) matches ``n0``
Taylor coefficients of ``H`` at ``w = 0`` and ``n1`` at ``w = 1``, ``n0 + n1 = L + M + 1``; the
value is ``P(w)/Q(w) / (1 - w)^(2 p0)``. (Two-point Padé approximants: G. A. Baker Jr. and
P. Graves-Morris, *Padé Approximants*, 2nd ed., Cambridge University Press (1996), ch. 7,
"multipoint Padé approximants", from memory.)

The band comes as for the other Padé methods from the spread and convergence of the
approximants over the weak-coupling orders ``n0`` (:func:`~resum.estimators.resum_band.
outcomes_from_table`), and is widened to cover the change when the last strong-coupling term
is left out (the same approximants with ``n1 - 1`` terms at ``w = 1``): the weak orders cannot
see an error made at infinity. It is an estimate, not a bound, and it trusts the terms given.

>>> import mpmath
>>> from resum.context import workdps
>>> from resum.transforms.conformal import RayMap
>>> from resum.estimators.resum_conformal import mapped_coefficients
>>> with workdps(40):       # f = sqrt(1 + x) + sqrt(1 + x/2), cut from -1; at large x
...     r = 1 / mpmath.sqrt(2)           # f = (1 + r) x^(1/2) + 0 + (1/2 + r) x^(-1/2) + ...
...     c = [mpmath.binomial(mpmath.mpf(1) / 2, n) * (1 + mpmath.mpf(2) ** -n) for n in range(30)]
...     p0, h1 = rim_coefficients([(mpmath.mpf(1) / 2, 1 + r), (0, 0), (-mpmath.mpf(1) / 2, 0.5 + r)], -1)
...     h0 = mapped_coefficients(c, RayMap(-1), 40, alpha=2 * p0)
...     P, Q, _ = twopoint_fit(h0, h1, 20, 11, 11, 30)
...     w = RayMap(-1).w_of_x(10 ** 6)
...     v = mpmath.polyval(P[::-1], w) / mpmath.polyval(Q[::-1], w) / (1 - w) ** (2 * p0)
...     err = abs(v / (mpmath.sqrt(1 + 10 ** 6) + mpmath.sqrt(1 + mpmath.mpf(10) ** 6 / 2)) - 1)
>>> bool(err < 1e-16)          # 2e-8 from the weak-coupling side alone
True
"""
from __future__ import annotations

import functools
import math
from typing import Callable, Optional, Sequence

import flint
import mpmath

from .._kernels.pade import _rel_digits
from ..errors import InputError
from ..results import Estimate
from ..transforms._arb import arb_to_mp, flint_precision, to_arb
from .resum_band import PointOutcome, candidate_orders, outcomes_from_table

__all__ = ["check_strong_terms", "rim_coefficients", "shifted_rim_coefficients", "twopoint_fit",
           "twopoint_evaluate"]


def check_strong_terms(terms) -> list:
    """``[(power, coefficient, uncertainty)]`` (powers in the expansion variable) sorted from the
    leading power down, checked: real powers spaced by exactly 1/2 from the leading one, with
    twice the leading power an integer; InputError naming what is wrong otherwise. An item may be
    ``(power, coefficient)`` (an exact coefficient: uncertainty 0) or carry the coefficient's
    uncertainty third (for a decimal, half a unit in its last digit)."""
    out = sorted(((mpmath.mpmathify(t[0]), mpmath.mpmathify(t[1]),
                   abs(mpmath.mpmathify(t[2])) if len(t) > 2 else mpmath.mpf(0)) for t in terms),
                 key=lambda t: -t[0])
    if not out:
        raise InputError("no strong-coupling terms given", where="strong_terms")
    for q, b, _ in out:
        if isinstance(q, mpmath.mpc) or isinstance(b, mpmath.mpc):
            raise InputError("strong-coupling powers and coefficients must be real", where="strong_terms")
    p0 = out[0][0]
    if abs(2 * p0 - mpmath.nint(2 * p0)) > mpmath.mpf(10) ** -20:
        raise InputError(f"the leading power {mpmath.nstr(p0, 8)} (in the expansion variable) is not a "
                         "multiple of 1/2: the two-point approximant needs f ~ x^p0 with 2 p0 a whole "
                         "number (for x = g^2: a whole power of g)", where="strong_terms")
    for j, (q, _, _) in enumerate(out):
        if abs(q - (p0 - mpmath.mpf(j) / 2)) > mpmath.mpf(10) ** -20:
            raise InputError("give every term from the leading power down to the last one, each power "
                             "1/2 below the one before in the expansion variable (1 below it in g for "
                             "x = g^2), zeros included: the terms must be consecutive", where="strong_terms")
    return out


def rim_coefficients(terms, x0):
    """``(p0, h1)``: the leading power and the first ``len(terms)`` coefficients in
    ``eps = 1 - w`` of ``(1 - w)^(2 p0) f(x(w))`` for the ray map with branch point ``x0 < 0``,
    from the large-x terms ``[(power, coefficient)]`` (checked by :func:`check_strong_terms`)."""
    terms = check_strong_terms(terms)
    p0 = mpmath.nint(2 * terms[0][0]) / 2
    n1 = len(terms)
    h1 = [mpmath.mpf(0)] * n1
    base = -4 * mpmath.mpmathify(x0)
    for j, (_, b, _) in enumerate(terms):
        q = p0 - mpmath.mpf(j) / 2
        lead = b * base ** q
        for r in range(n1 - j):         # (1 - eps)^q = sum_r binomial(q, r) (-eps)^r
            h1[j + r] += lead * mpmath.binomial(q, r) * (-1) ** r
    return p0, h1


def twopoint_fit(h0: Sequence, h1: Sequence, n0: int, L: int, M: int, dps: int,
                 max_dps: Optional[int] = None):
    """See :func:`_fit` (this wrapper remembers the last few fits: one evaluation asks for the
    same approximants for its points near and far from the rim separately)."""
    return _fit_cached(tuple(h0[:n0]), tuple(h1), n0, L, M, int(dps), max_dps)


@functools.lru_cache(maxsize=64)
def _fit_cached(h0, h1, n0, L, M, dps, max_dps):
    return _fit(h0, h1, n0, L, M, dps, max_dps)


def _fit(h0: Sequence, h1: Sequence, n0: int, L: int, M: int, dps: int,
         max_dps: Optional[int] = None):
    """``(P, Q, digits)``: the two-point approximant of degrees ``(L, M)`` matching ``h0[:n0]``
    at ``w = 0`` and ``h1`` (in ``eps = 1 - w``) at ``w = 1``, ``n0 + len(h1) = L + M + 1``,
    ``Q(0) = 1``; solved by a ball LU (python-flint ``arb_mat``) at a precision raised until the
    unknowns carry ``dps`` digits for the input as given (or ``max_dps``, default ``4 dps + 60``,
    is reached). None when the system is singular at the cap."""
    n1 = len(h1)
    if n0 + n1 != L + M + 1 or n0 > len(h0):
        raise ValueError(f"need n0 + n1 = L + M + 1 and n0 <= {len(h0)} (got {n0}, {n1}, {L}, {M})")
    cap = max_dps or 4 * int(dps) + 60
    prec = int(dps) + 2 * M + 20
    nun = L + 1 + M                       # p_0..p_L, q_1..q_M
    while True:
        with flint_precision(prec):
            zero = flint.arb(0)
            H0 = [to_arb(v) for v in h0[:n0]]
            H1 = [to_arb(v) for v in h1]
            rows, rhs = [], []
            for i in range(n0):           # [w^i] (Q H0 - P) = 0
                row = [zero] * nun
                if i <= L:
                    row[i] = flint.arb(-1)
                for j in range(1, M + 1):
                    if i - j >= 0:
                        row[L + j] = H0[i - j]
                rows.append(row)
                rhs.append([-H0[i]])
            # w^j = (1 - eps)^j: [eps^r] = binomial(j, r) (-1)^r
            binom = [[flint.arb(math.comb(j, r) * (-1) ** r) for r in range(n1)] for j in range(max(L, M) + 1)]
            for m in range(n1):            # [eps^m] (Q H1 - P) = 0
                row = [zero] * nun
                for i in range(L + 1):
                    row[i] = -binom[i][m]
                for j in range(M + 1):
                    t = sum((binom[j][r] * H1[m - r] for r in range(m + 1)), zero)
                    if j == 0:
                        rhs.append([-t])
                    else:
                        row[L + j] = t
                rows.append(row)
            try:
                sol = flint.arb_mat(rows).solve(flint.arb_mat(rhs))
                x = [sol[i, 0] for i in range(nun)]
            except (ZeroDivisionError, ValueError):
                x = None
            if x is not None:
                got = min(_rel_digits(x), float(prec))
                if got >= dps or (prec >= cap and got >= dps / 2):
                    with mpmath.workdps(prec):
                        P = [arb_to_mp(v) for v in x[:L + 1]]
                        Q = [mpmath.mpf(1)] + [arb_to_mp(v) for v in x[L + 1:]]
                    return P, Q, got
        if prec >= cap:
            return None
        prec = min(cap, 2 * prec)


def _values(h0, h1, ws, dps, orders, post):
    """The candidate table ``[point][order]`` of two-point values (None where singular)."""
    table = [[None] * len(orders) for _ in ws]
    singular = 0
    for i, (n0, _, _) in enumerate(orders):
        tot = n0 + len(h1)
        M = (tot - 1) // 2
        L = tot - 1 - M
        r = twopoint_fit(h0, h1, n0, L, M, dps)
        if r is None:
            singular += 1
            continue
        P, Q, _ = r
        for j, w in enumerate(ws):
            q = mpmath.polyval(Q[::-1], w)
            if q == 0:
                continue
            table[j][i] = post(j, mpmath.polyval(P[::-1], w) / q)
    return table, singular


def shifted_rim_coefficients(terms, x0) -> list:
    """For each term whose coefficient carries an uncertainty, the rim coefficients with that
    coefficient moved by it (:func:`rim_coefficients`); ``[]`` when every term is exact."""
    terms = check_strong_terms(terms)
    out = []
    for j, (q, b, u) in enumerate(terms):
        if u:
            moved = list(terms)
            moved[j] = (q, b + u, 0)
            out.append(rim_coefficients(moved, x0)[1])
    return out


def twopoint_evaluate(h0: Sequence, h1: Sequence, ws: Sequence, dps: int, *, n_orders: int = 7,
                      post: Optional[Callable] = None, safety=4, h1_moved: Sequence = ()):
    """Two-point values with bands at the disk points ``ws``.

    ``h0``: coefficients of ``H`` at ``w = 0``; ``h1``: its first coefficients in ``eps = 1 - w``
    (:func:`rim_coefficients`); ``post(j, v)`` turns a value of ``H`` into one of ``f`` at point
    ``j``. Candidates: the weak-coupling term counts of
    :func:`~resum.estimators.resum_band.candidate_orders`, each with every term at ``w = 1``; the
    band of each point is widened to cover the median change when the last term at ``w = 1`` is
    left out, and by the sum of the median changes when each uncertain term is moved by its
    uncertainty (``h1_moved``: :func:`shifted_rim_coefficients`). Returns (outcomes, diagnostics)."""
    post = post or (lambda j, v: v)
    orders = [o for o in candidate_orders(len(h0), n_orders) if o[0] >= 2]
    ns = [o[0] for o in orders]
    table, singular = _values(h0, h1, ws, dps, orders, post)
    outs = outcomes_from_table(table, ns, safety=safety)
    # the top approximants again without the last term given (check_strong_terms: at least one)
    fewer, _ = _values(h0, h1[:-1], ws, dps, orders[:4], post)
    moved = [_values(h0, hm, ws, dps, orders[:4], post)[0] for hm in h1_moved]
    for j, o in enumerate(outs):
        o.info["orders"] = [f"[{n}+{len(h1)}]" for n in ns]
        o.info["values"] = [None if v is None else mpmath.nstr(v, 45) for v in table[j]]
        if not o.ok or o.re is None:
            continue
        alt = sorted((v for v in fewer[j] if v is not None), key=lambda v: mpmath.re(v))
        if not alt:
            continue
        dv = abs(mpmath.re(alt[len(alt) // 2]) - o.re.value)
        o.info["strong_truncation"] = mpmath.nstr(dv, 5)
        if dv > o.re.error:
            re = Estimate(o.re.value, min(o.re.lower, o.re.value - dv), max(o.re.upper, o.re.value + dv))
            o = outs[j] = PointOutcome(re, o.im, o.ok, o.reason, o.info)
        if moved:
            # the terms' own uncertainty: each moved by it, the changes added
            du = mpmath.mpf(0)
            for tab in moved:
                alt = sorted((v for v in tab[j] if v is not None), key=lambda v: mpmath.re(v))
                if alt:
                    du += abs(mpmath.re(alt[len(alt) // 2]) - o.re.value)
            o.info["strong_terms_uncertainty"] = mpmath.nstr(du, 5)
            re = Estimate(o.re.value, o.re.lower - du, o.re.upper + du)
            outs[j] = PointOutcome(re, o.im, o.ok, o.reason, o.info)
    return outs, {"n_singular_systems": singular, "n_strong_terms": len(h1),
                  "orders": [list(o[:1]) for o in orders]}
