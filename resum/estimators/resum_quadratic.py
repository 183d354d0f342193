"""Quadratic (Hermite-Padé) approximants: values beyond the disk from ``P + Q f + R f^2 = 0``.

For a series ``f = c_0 + c_1 w + ...`` the quadratic approximant of degrees
``(l, m, k)`` is the triple of polynomials ``P, Q, R`` (``deg P <= l``,
``deg Q <= m``, ``deg R <= k``, ``Q(0) = 1``) with
``P + Q f + R f^2 = O(w^(l+m+k+2))``; the approximant is the root of
``R y^2 + Q y + P = 0`` that equals ``c_0`` at ``w = 0``, continued along the
segment from ``0`` to ``w``. A rational (linear Padé) approximant can only
put poles along a cut; a quadratic one has square-root branch points of its
own and represents an accumulation of branch points on the rim of the disk
better. Measured on the 100-loop angle-deformed BES series (studies/accuracy):
in the disk variable of the cut plane it gains 0.5-1.5 digits over the best
linear Padé at ``g = 5`` and ``g = 20``.

>>> import mpmath
>>> from resum.context import workdps
>>> with workdps(40):
...     c = [mpmath.binomial(mpmath.mpf(1) / 2, n) for n in range(12)]   # sqrt(1 + w) - 1
...     c[0] = 0
...     r = quadratic_fit(c, 1, 1, 1, 40)
...     v = r(mpmath.mpf(8))                      # y^2 + 2 y - w = 0 exactly: y(8) = 2
>>> mpmath.almosteq(v, 2, 1e-30), mpmath.almosteq(r.R[0] / r.Q[0], mpmath.mpf(1) / 2, 1e-30)
(True, True)

Notes
-----
The linear system for ``Q`` and ``R`` (``P`` follows from the first
coefficients) is solved by a ball LU (python-flint ``arb_mat``/``acb_mat``),
or, from :data:`ORDER_BASIS_FROM` terms on, by an O(n^2) order-basis
recursion on ball polynomials (:func:`_order_basis`; the LU where it fails),
at a precision raised until the solution carries the requested digits for
the input as given, as for the Padé kernel. A candidate is refused at a point
when its two roots come close along the path (a branch point of the
approximant on or next to the segment: the branch is ambiguous there) or when
a real series gives a complex value at a real point. The band comes, as for
every Padé-type method here, from the spread of the approximants of the
highest orders and the trend of lower ones (an estimate, not a bound).

References
----------
.. [1] R. E. Shafer, "On quadratic approximation", SIAM J. Numer. Anal. 11
   (1974) 447-460.
.. [2] G. A. Baker Jr. and P. Graves-Morris, *Padé Approximants*, 2nd ed.,
   Cambridge University Press (1996), ch. 8 (algebraic and Hermite-Padé
   approximants).
"""
from __future__ import annotations

import math
from typing import Callable, Optional, Sequence

import flint
import mpmath

from .._kernels.pade import _rel_digits
from ..transforms._arb import acb_to_mp, arb_to_mp, flint_precision, to_acb, to_arb
from .resum_band import _horner, candidate_orders, outcomes_from_table

__all__ = ["QuadraticApprox", "quadratic_fit", "quadratic_degrees", "quadratic_evaluate"]

#: digits of the low-precision continuation that picks the branch
_TRACK_DPS = 30
#: steps along the segment from 0 to w (halved where the branch is hard to follow)
_STEPS = 48


def quadratic_degrees(n_used: int):
    """Degrees ``(l, m, k)`` using ``n_used`` coefficients (``l + m + k + 2 = n_used``),
    as equal as possible, the extra ones to ``P`` then ``Q``; None below 5 terms."""
    if n_used < 5:
        return None
    m, r = divmod(n_used - 2, 3)
    return m + (r > 0), m + (r > 1), m


class QuadraticApprox:
    """``P + Q y + R y^2 = 0`` with coefficient lists (low to high); ``y(0) = c0``."""

    def __init__(self, P, Q, R, c0, digits):
        self.P, self.Q, self.R = list(P), list(Q), list(R)
        self.c0 = c0
        self.digits = digits
        self.real = not any(isinstance(v, mpmath.mpc) for v in self.P + self.Q + self.R + [c0])

    def _roots(self, z):
        p, q, r = _horner(self.P, z), _horner(self.Q, z), _horner(self.R, z)
        if r == 0:
            return (-p / q, None) if q != 0 else (None, None)
        s = mpmath.sqrt(q * q - 4 * p * r)
        if mpmath.re(mpmath.conj(q) * s) < 0:
            s = -s
        h = -(q + s) / 2
        if h == 0:
            return None, None
        return p / h, h / r          # the root of small size first (no cancellation)

    def _track_polys(self):
        """P, Q, R as complex ball polynomials rounded to the tracking precision (cached)."""
        tp = self.__dict__.get("_tp")
        if tp is None:
            with flint_precision(_TRACK_DPS):
                tp = tuple(flint.acb_poly([+to_acb(c) for c in cs]) for cs in (self.P, self.Q, self.R))
            self._tp = tp
        return tp

    @staticmethod
    def _roots_ball(p, q, r):
        """The two roots of ``r y^2 + q y + p`` as acb (small one first), as :meth:`_roots`."""
        if r.is_zero():
            return (-p / q, None) if not q.is_zero() else (None, None)
        s = (q * q - 4 * p * r).sqrt()
        if float((q.conjugate() * s).real.mid()) < 0:
            s = -s
        h = -(q + s) / 2
        if h.is_zero():
            return None, None
        return p / h, h / r

    def _track(self, w):
        """The branch value at ``w`` at low precision (an acb), or None where it is ambiguous.

        The continuation runs on python-flint balls at :data:`_TRACK_DPS` digits (only the
        branch is picked here; the value is recomputed at the working precision): about 20
        times faster than the same steps in mpmath, which made most of an evaluation of the
        100-loop BES series near the rim."""
        tp = self._track_polys()
        with flint_precision(_TRACK_DPS):
            wa = to_acb(w)
            y, prev, last = +to_acb(self.c0), None, 1.0
            t, dt = 0.0, 1.0 / _STEPS
            while t < 1:
                step = min(dt, 1 - t)
                pred = y if prev is None else y + (y - prev) * (step / last)
                z = wa * (t + step)
                a, b = self._roots_ball(*(f(z) for f in tp))
                cands = [v for v in (a, b) if v is not None and v.is_finite()]
                if not cands:
                    return None
                dist = [float(abs(v - pred).mid()) for v in cands]
                i = 0 if len(cands) == 1 or dist[0] <= dist[1] else 1
                pick = cands[i]
                sep = float(abs(cands[1 - i] - pick).mid()) if len(cands) == 2 else math.inf
                if dist[i] * 8 > sep:
                    if step < 1.0 / (_STEPS * 64):
                        return None          # the two roots meet near the path
                    dt = step / 2
                    continue
                prev, y, last, t = y, pick, step, t + step
                dt = min(1.0 / _STEPS, 2 * step)
        return y

    def __call__(self, w):
        """Value at ``w`` (working precision), or None where the branch is ambiguous."""
        w = mpmath.mpmathify(w)
        y = self._track(w)
        if y is None:
            return None
        y = acb_to_mp(y)
        a, b = self._roots(w)
        cands = [v for v in (a, b) if v is not None and mpmath.isfinite(abs(v))]
        if not cands:
            return None
        pick = min(cands, key=lambda v: abs(v - y))
        if len(cands) == 2 and abs(cands[0] - cands[1]) < 8 * abs(pick - y):
            return None
        if self.real and isinstance(w, mpmath.mpf) and isinstance(pick, mpmath.mpc):
            if abs(pick.imag) > abs(pick) * mpmath.mpf(10) ** (5 - mpmath.mp.dps):
                return None          # a branch cut of the approximant crosses the real axis
            pick = pick.real
        return pick


#: The order-basis recursion loses about this many digits per term in ball arithmetic (the
#: radii of its residuals grow; measured on the mapped 100- and 150-loop kernel series: 1.6
#: and 2.1), the dense LU only about 20 in all; the recursion is O(n^2) at that precision, the LU
#: O(n^3) at the lower one. Measured (same series, 50 digits asked): at 101 terms 20-40 ms
#: against 28 ms for the LU, at 151 terms 47 ms against 410 ms; so "auto" uses the recursion
#: from ORDER_BASIS_FROM terms on.
ORDER_BASIS_LOSS = 2.2
ORDER_BASIS_FROM = 120


def _order_basis(fp, f2, n, l, m, k, Pol, conv):
    """``(Q, R)`` (lists of balls, ``Q(0) = 1``) of the quadratic approximant of degrees
    ``(l, m, k)`` by an order-basis recursion, O(n^2) ball operations, or None when a
    pivot's ball contains zero (precision too low, or a degenerate table).

    Three basis vectors ``v_i = (P_i, Q_i, R_i)`` with residuals ``r_i = P_i + Q_i f + R_i f^2``
    (mod ``w^n``) start as the unit vectors; at each order ``s`` the vector of smallest
    shifted degree ``max(deg P_i - l, deg Q_i - m, deg R_i - k)`` (the largest pivot among
    ties) whose ``r_i[s]`` is clear of zero eliminates ``r_j[s]`` from the others and is
    then multiplied by ``w``. After ``n`` orders the vector of smallest shifted degree
    (at most 0 unless the table is degenerate) solves the problem. This is the order-basis
    (sigma-basis) construction of Beckermann and Labahn, SIAM J. Matrix Anal. Appl. 15
    (1994) 804-823, in its simplest form (from memory); the dense LU below is its check."""
    zero, one = conv(0), conv(1)
    # only Q_i and R_i are kept: P_i enters the residuals, and P follows from Q and R at the end
    vec = [[Pol([]), Pol([])], [Pol([one]), Pol([])], [Pol([]), Pol([one])]]
    res = [Pol([one]), fp, Pol(f2)]
    sdeg = [-l, -m, -k]
    def exact_zero(x):
        return abs(x.mid()) == 0 and x.rad() == 0

    for s in range(n):
        cs = [r[s] if r.length() > s else zero for r in res]
        usable = [i for i in range(3) if not cs[i].contains(0)]
        if not usable:
            if all(exact_zero(x) for x in cs):
                continue                      # every residual already vanishes here (exactly)
            return None
        low = min(sdeg[i] for i in usable)
        piv = max((i for i in usable if sdeg[i] == low), key=lambda i: abs(cs[i].mid()))
        if any(sdeg[i] < low and not exact_zero(cs[i]) for i in range(3)):
            return None                       # a vector of lower degree has an unclear residual
        for i in range(3):
            if i == piv or exact_zero(cs[i]):
                continue
            t = cs[i] / cs[piv]
            vec[i] = [a - b * t for a, b in zip(vec[i], vec[piv])]
            res[i] = (res[i] - res[piv] * t).truncate(n)
        vec[piv] = [a.left_shift(1) for a in vec[piv]]
        res[piv] = res[piv].left_shift(1).truncate(n)
        sdeg[piv] += 1
    best = min(range(3), key=lambda i: sdeg[i])
    if sdeg[best] > 0:
        return None
    Q, R = vec[best]
    q0 = Q[0] if Q.length() else zero
    if q0.contains(0):
        return None
    Qc = (list(Q.coeffs()) + [zero] * (m + 1))[:m + 1]
    Rc = (list(R.coeffs()) + [zero] * (k + 1))[:k + 1]
    return [v / q0 for v in Qc], [v / q0 for v in Rc]


def quadratic_fit(c: Sequence, l: int, m: int, k: int, dps: int,
                  max_dps: Optional[int] = None, method: str = "auto") -> Optional[QuadraticApprox]:
    """The quadratic approximant of degrees ``(l, m, k)`` (needs ``l + m + k + 2`` terms).

    ``Q(0) = 1``; the unknowns ``Q_1..Q_m, R_0..R_k`` solve the equations of
    orders ``l + 1 .. l + m + k + 1``, at a precision raised until they carry
    ``dps`` digits (normwise, for the input as given) or ``max_dps`` (default
    ``4 dps + 60``) is reached; ``P`` then follows from orders ``0 .. l``. None
    when the system is singular at the cap. ``method``: "order-basis" (the
    O(n^2) recursion :func:`_order_basis`), "lu" (dense ball LU, O(n^3)) or
    "auto" (the recursion from :data:`ORDER_BASIS_FROM` terms on, the LU
    below that and wherever the recursion fails)."""
    if method not in ("auto", "order-basis", "lu"):
        raise ValueError(f"method must be 'auto', 'order-basis' or 'lu', got {method!r}")
    n = l + m + k + 2
    if len(c) < n:
        raise ValueError(f"quadratic approximant ({l}, {m}, {k}) needs {n} terms, got {len(c)}")
    cplx = any(isinstance(v, (mpmath.mpc, complex)) for v in c[:n])
    conv, back = (to_acb, acb_to_mp) if cplx else (to_arb, arb_to_mp)
    Mat = flint.acb_mat if cplx else flint.arb_mat
    Pol = flint.acb_poly if cplx else flint.arb_poly
    def plan(ob):
        """(starting precision, cap) in digits for the recursion (ob) or the dense LU."""
        lu_cap = max_dps or 4 * int(dps) + 60
        if ob:
            start = int(dps) + int(math.ceil(ORDER_BASIS_LOSS * n)) + 20
            return start, max(lu_cap, start)
        return int(dps) + 2 * (m + k) + 20, lu_cap

    use_ob = method == "order-basis" or (method == "auto" and n >= ORDER_BASIS_FROM)
    prec_dps, cap = plan(use_ob)
    while True:
        with flint_precision(prec_dps):
            f = [conv(v) for v in c[:n]]
            fp = Pol(f)
            f2 = (list((fp * fp).coeffs()) + [conv(0)] * n)[:n]
            x = None
            if use_ob:
                qr = _order_basis(fp, f2, n, l, m, k, Pol, conv)
                x = None if qr is None else qr[0][1:] + qr[1]
            else:
                rows, rhs = [], []
                for i in range(l + 1, n):
                    row = [f[i - j] if i - j >= 0 else 0 for j in range(1, m + 1)]
                    row += [f2[i - j] if i - j >= 0 else 0 for j in range(k + 1)]
                    rows.append(row)
                    rhs.append([-f[i]])
                try:
                    sol = Mat(rows).solve(Mat(rhs))
                    x = [sol[i, 0] for i in range(m + k + 1)]
                except (ZeroDivisionError, ValueError):
                    x = None
            if x is not None:
                got = min(_rel_digits(x), float(prec_dps)) if x else float(prec_dps)
                if got >= dps or (prec_dps >= cap and got >= dps / 2):
                    Q = [conv(1)] + x[:m]
                    R = x[m:]
                    Pp = -(Pol(Q) * fp + Pol(R) * Pol(f2))
                    P = (list(Pp.coeffs()) + [conv(0)] * (l + 1))[:l + 1]
                    with mpmath.workdps(prec_dps):
                        out = [[back(v) for v in part] for part in (P, Q, R)]
                    return QuadraticApprox(out[0], out[1], out[2], mpmath.mpmathify(c[0]), got)
        if prec_dps >= cap:
            if use_ob and method == "auto":
                # the recursion did not get there: the dense LU decides
                use_ob = False
                prec_dps, cap = plan(False)
                continue
            return None
        prec_dps = min(cap, 2 * prec_dps)


def quadratic_evaluate(c: Sequence, zs: Sequence, dps: int, *, n_orders: int = 7,
                       post: Optional[Callable] = None, safety=4):
    """Quadratic-approximant values with bands at the points ``zs`` (variable of ``c``).

    Candidates: one approximant per term count of
    :func:`~resum.estimators.resum_band.candidate_orders` (degrees from
    :func:`quadratic_degrees`); ``post(j, value)`` as in
    :func:`~resum.estimators.resum_pade.pade_evaluate`. Returns (outcomes, diagnostics).
    """
    N = len(c)
    orders = [o for o in candidate_orders(N, n_orders) if quadratic_degrees(o[0])]
    table = [[None] * len(orders) for _ in zs]
    refused = [[] for _ in zs]
    singular = 0
    for i, (n, _, _) in enumerate(orders):
        l, m, k = quadratic_degrees(n)
        r = quadratic_fit(c, l, m, k, dps)
        if r is None:
            singular += 1
            continue
        for j, z in enumerate(zs):
            v = r(z)
            if v is None:
                refused[j].append(f"({l},{m},{k}): branch ambiguous on the path")
                continue
            table[j][i] = post(j, v) if post else v
    ns = [o[0] for o in orders]
    outs = outcomes_from_table(table, ns, safety=safety)
    for j, o in enumerate(outs):
        o.info["refused"] = refused[j]
        o.info["orders"] = ["(%d,%d,%d)" % quadratic_degrees(n) for n in ns]
        o.info["values"] = [None if v is None else mpmath.nstr(v, 45) for v in table[j]]
    return outs, {"n_singular_systems": singular, "orders": [list(quadratic_degrees(n)) for n in ns]}
