"""Inhomogeneous differential approximants of first and second order.

>>> import mpmath
>>> from resum.series import Series
>>> from resum.context import Context
>>> from fractions import Fraction
>>> from math import comb
>>> c = [Fraction(comb(2 * n, n), 4 ** n) + (n + 1) * (-1) ** n for n in range(40)]
>>> r = estimate_diffapprox(Series(c), Context(dps=60))   # (1-x)^(-1/2) + (1+x)^(-2)
>>> s = min(r.singularities, key=lambda s: abs(s.location - 1))
>>> s.re.contains(1), s.exponent.contains(-0.5)
(True, True)

Notes
-----
An approximant of order ``K`` with degrees ``(L; M_0, ..., M_K)`` is the
linear ODE ``sum_j Q_j(x) f^(j)(x) + P(x) = O(x^T)`` whose polynomial
coefficients are fixed by the first ``T`` series terms (``Q_K(0) = 1``).
Its solutions are singular only at zeros of ``Q_K``. At a simple zero
``x_c``:

* ``K = 1``: ``f ~ (1 - x/x_c)^theta`` with ``theta = -Q_0(x_c)/Q_1'(x_c)``;
* ``K = 2``: the exponents are 0 (the analytic background) and
  ``theta = 1 - Q_1(x_c)/Q_2'(x_c)``.

``theta = 0`` is a logarithm (``f' ~ 1/(x_c - x)``). The inhomogeneous term
and, for ``K = 2``, the second solution absorb analytic backgrounds and
additive singular terms, so several singularities and confluent
corrections are handled better than by Dlog-Padé.

An ensemble of approximants with total order near the maximum and nearly
equal degrees is computed; zeros of ``Q_K`` that recur in at least half of
them form clusters. Bands: safety factor (2) times the largest deviation
of the members from the cluster's median, for locations and exponents; no
member is dropped as an outlier (dropping those more than 6 median
absolute deviations away was tried: it narrowed the bands on the 27-term
Ising susceptibility until the combined band missed ``sqrt(2) - 1``).
Approximants whose linear system loses the working precision are skipped.

Applicability: D-finite functions are reproduced exactly; algebraic, log
and confluent singularities, also several at once, to high accuracy;
natural boundaries and essential singularities poorly.

References
----------
A. J. Guttmann and G. S. Joyce, J. Phys. A 5 (1972) L81 (differential
approximants); A. J. Guttmann, in *Phase Transitions and Critical
Phenomena* vol. 13, eds. C. Domb and J. L. Lebowitz, Academic Press (1989);
D. L. Hunter and G. A. Baker, Phys. Rev. B 7 (1973) 3346 (inhomogeneous
first-order approximants; from memory).
"""
from __future__ import annotations

import math

import mpmath

from ..results import Status
from ..uncertainty.ensemble import SAFETY
from ._common import failed, finish, prepare
from .._kernels.hermite import hermite_pade
from ._num import CERTIFIED_MAX, poly_roots, polyder, polyval_many, root_digits, solve
from .pade_sing import clusters_to_singularities
from .ratio import classify_growth

__all__ = ["estimate_diffapprox", "diffapprox_orders", "fit_diffapprox"]


def _deriv_coeffs(c, K):
    """D[j][n]: coefficient of x^n in f^(j)."""
    out = []
    for j in range(K + 1):
        out.append([c[n + j] * mpmath.mpf(math.factorial(n + j) // math.factorial(n))
                    for n in range(len(c) - j)])
    return out


def fit_diffapprox(D, K, L, Ms, dps, lead=0, max_err=None):
    """Polynomials ``Q_0..Q_K`` of the approximant ``(L; Ms)`` (P eliminated).

    Uses the equations for the coefficients of ``x^n``, ``n = L+1 .. L+S``
    with ``S = sum(M_j + 1) - 1 - lead`` unknowns. ``Q_K`` is normalised by
    ``Q_K(x) = x^lead + ...`` (``lead > 0``: the equation has a regular singular
    point at the origin, as for generating functions ``(1 - sqrt(...))/x``).
    Returns ``(Q, rel_err)`` or None. Above :data:`CERTIFIED_MAX` unknowns (with ``lead = 0``)
    the order-basis recursion solves it (:func:`_fit_structured`), and the dense solve only
    when that keeps fewer digits than ``max_err`` asks (default ``10^-(dps/3)``, the
    estimators' rule) but not far fewer (see :data:`FALLBACK_SPAN`).
    """
    S = sum(M + 1 for M in Ms) - 1 - lead
    if lead > Ms[K]:
        return None
    if lead == 0 and S > CERTIFIED_MAX:
        fit = _fit_structured(D, K, L, Ms, dps)
        limit = 10.0 ** -max(10, dps / 3) if max_err is None else max_err
        if fit is not None and (fit[1] <= limit or fit[1] > FALLBACK_SPAN * limit):
            return fit
    unknowns = [(j, i) for j in range(K + 1) for i in range(Ms[j] + 1) if not (j == K and i <= lead)]
    rows, rhs = [], []
    for n in range(L + 1, L + S + 1):
        if n > len(D[K]) - 1:
            return None
        rows.append([D[j][n - i] if n - i >= 0 else 0 for j, i in unknowns])
        rhs.append(-D[K][n - lead] if n - lead >= 0 else 0)
    sol = solve(rows, rhs, dps)
    if sol is None:
        return None
    x, err = sol
    Q = [[mpmath.mpf(0)] * (M + 1) for M in Ms]
    Q[K][lead] = mpmath.mpf(1)
    for (j, i), v in zip(unknowns, x):
        Q[j][i] = v
    return Q, err


#: The dense solve is tried after the order-basis recursion only when the recursion's error
#: estimate misses the estimator's limit by less than this factor: on the 200-term series
#: measured (the 200-loop kernel series at 210 digits, an algebraic sum at 80 digits) the two
#: estimates differed by at most a factor of 25 either way, and an approximant missing the
#: limit by more was rejected by both (each such dense solve cost 0.6-0.7 s for nothing)
FALLBACK_SPAN = 1e6


def _fit_structured(D, K, L, Ms, dps):
    """:func:`fit_diffapprox` for ``lead = 0`` by the order-basis recursion
    (:func:`resum._kernels.hermite.hermite_pade` on ``1, f, f', ...``): O(N^2) where the dense
    system costs O(N^3). None when the recursion cannot give the form; the caller falls back to
    the dense solve also when it keeps too few digits (it does not pivot across degrees, and a
    near-singular leading block costs it digits that the dense solve keeps). Used above
    :data:`CERTIFIED_MAX` unknowns, where the dense solve's error is an estimate of the same
    kind; below it the certified solve stays."""
    sigma = L + sum(M + 1 for M in Ms)
    if any(len(D[j]) < sigma for j in range(K + 1)):
        return None
    ones = [1] + [0] * (sigma - 1)
    got = hermite_pade([ones] + [D[j][:sigma] for j in range(K + 1)], [L] + list(Ms), dps,
                       normalize=(1 + K, 0))
    if got is None:
        return None
    forms, err = got
    Q = forms[1:]
    Q[K][0] = mpmath.mpf(1)
    return Q, err


def diffapprox_orders(N, K, count=16, Ls=(0, 1, 2, 4, 6)):
    """Degrees ``(L, Ms)`` using (almost) all ``N`` coefficients."""
    out = []
    if K == 1:
        shifts = [(0,), (1,), (-1,)]
    else:
        shifts = [(0, 0), (1, 0), (0, 1), (-1, 0), (0, -1)]
    for t in range(0, 3):
        for L in Ls:
            for sh in shifts:
                # S + L = N - 1 - K - t, S = (K+1) M + sum(sh) + K
                rest = N - 1 - K - t - L - K - sum(sh)
                if rest % (K + 1):
                    continue
                M = rest // (K + 1)
                Ms = [M + d for d in sh] + [M]
                if min(Ms) < 1:
                    continue
                out.append((L, Ms))
                if len(out) >= count:
                    return out
    return out


def _equation_at(D, K, Q, n):
    """Coefficient of ``x^n`` in ``sum_j Q_j f^(j)`` and the sum of the absolute values of the
    terms that form it."""
    tot, size = 0, 0
    for j in range(K + 1):
        for i, q in enumerate(Q[j]):
            if q != 0 and 0 <= n - i < len(D[j]):
                t = q * D[j][n - i]
                tot += t
                size += abs(t)
    return tot, size


def _residual_ok(D, K, L, Q, tol):
    """Does the equation ``sum_j Q_j f^(j) + P = 0`` (P of degree L) hold for every
    coefficient the series gives, not only those it was fitted to? ``tol`` relative to
    the size of the terms in each equation. Checked from the highest coefficient down: the
    fit holds the lowest ones by construction, so a failing equation fails at once."""
    for n in range(len(D[K]) - 1, L, -1):
        tot, size = _equation_at(D, K, Q, n)
        if abs(tot) > tol * size:
            return False
    return True


def exact_equation(D, K, dps, tol, Ls=(0, 1, 2, 3, 4)):
    """The equation the series obeys exactly, normalised by ``Q_K(0) = 1`` or, failing
    that, with a zero of ``Q_K`` at the origin (``Q_K = x + ...`` or ``x^2 + ...``): see
    :func:`_exact_equation` (which returns ``[(L, Ms, Q, rel_err)]``)."""
    for lead in (0, 1, 2):
        out = _exact_equation(D, K, dps, tol, Ls, lead)
        if out:
            # a true equation is the same with fewer coefficients; a function with infinitely
            # many singular points can pass the residual test with the coefficients given,
            # but then the smallest passing degree moves with their number
            n = len(D[K])
            short = [d[:len(d) - max(5, n // 6)] for d in D]
            again = _exact_equation(short, K, dps, tol, Ls, lead)
            if again and again[0][1] == out[0][1]:
                return out
            return []
    return []


def _exact_equation(D, K, dps, tol, Ls=(0, 1, 2, 3, 4), lead=0):
    """Approximants of the lowest order that satisfy the whole series.

    A series that obeys a linear ODE ``sum_j Q_j f^(j) + P = 0`` with polynomials
    of low degree exactly (products and powers of algebraic functions, D-finite
    functions) makes every larger approximant singular: the table is degenerate.
    The ODE itself is the approximant of the smallest degrees ``(L; M, ..., M)``
    whose system is regular *and* whose equation holds for every coefficient
    given, beyond the ones it was fitted to (residual below ``tol``). Each ``M`` is
    tried once with the largest ``L`` (it holds for any ``P`` of degree up to ``L``);
    when it passes, the fits for every ``L`` in ``Ls`` that also pass are returned
    (they share ``Q`` up to rounding) as ``[(L, Ms, Q, rel_err)]``; ``[]`` if none.
    Equations with more than 64 unknowns are not searched. Common practice, no
    source (the degree reduction of a degenerate Padé table carried over).
    """
    n = len(D[K])
    for M in range(1, n):
        Ms = [M] * (K + 1)
        if lead > M:
            continue
        S = (K + 1) * (M + 1) - 1 - lead
        if 2 * (S + 1) > n or S > 64:      # at least half the coefficients must check it
            return []
        Ltop = min(Ls[-1], n - S - 5)       # at least 4 coefficients beyond the fit
        if Ltop < Ls[0]:
            return []
        fit = fit_diffapprox(D, K, Ltop, Ms, dps, lead)
        # (the fit's err is per entry, large for an exactly-zero top coefficient: the residual
        # over all coefficients is the test)
        if fit is None or not _residual_ok(D, K, Ltop, fit[0], tol):
            continue
        if _normalisation_vanishes(fit[0], dps):
            # Q_K has a zero of higher order at 0 than this normalisation says: the solution is
            # the true equation times a huge factor plus rounding (measured: log(1+x)/x with
            # Q_1 = 1 - 5e113 (x + x^2) at 116 digits); the next ``lead`` finds it
            return []
        out = [(Ltop, Ms, fit[0], fit[1])]
        for L in Ls:
            if L >= Ltop:
                break
            f2 = fit_diffapprox(D, K, L, Ms, dps, lead)
            if f2 is not None and _residual_ok(D, K, L, f2[0], tol):
                out.append((L, Ms, f2[0], f2[1]))
        return sorted(out, key=lambda t: t[0])
    return []


def _normalisation_vanishes(Q, dps) -> bool:
    """The fitted coefficients dwarf the normalising one (which is 1) by more than a third of the
    working digits: the normalisation fixes a coefficient that is zero."""
    big = max((abs(v) for q in Q for v in q), default=0)
    return big > mpmath.mpf(10) ** (dps / 3)


def exact_tolerance(digits) -> float:
    """Residual (relative to the terms that form it) below which an equation is taken to hold
    exactly: three quarters of the digits the coefficients carry. Half of them let a
    meromorphic series with infinitely many poles (``sum 1/zeta(k+2) x^k`` at 40 digits)
    pass as obeying a first-order equation."""
    return 10.0 ** -max(10, 0.75 * digits)


def _exact_ensemble(D, K, prep):
    """(ensemble, table, equations) from :func:`exact_equation`, or None when the series obeys
    no such equation (or fewer than 3 fits of it have singular points)."""
    tol = exact_tolerance(prep.digits)
    eqs = exact_equation(D, K, prep.dps, tol)
    ens, table = [], []
    for L, Ms, Q, err in eqs:
        pts = exact_exponents(Q, K, poly_roots(Q[K], prep.dps), prep.dps,
                              homogeneous=_is_homogeneous(D, K, L, Q, tol))
        if pts:
            ens.append({"L": L, "M": tuple(Ms), "poles": pts, "zeros": [], "spurious": [], "rel_err": err})
            table.append({"L": L, "M": list(Ms), "roots": [z for z, _ in pts],
                          "exponents": [t for _, t in pts]})
    return (ens, table, eqs) if len(ens) >= 3 else None


def _coefficient_text(v, dps):
    """A coefficient of the exact equation: the rational it equals to the working digits
    (denominator up to 10^6), else a decimal with 12 digits."""
    from fractions import Fraction
    v = mpmath.re(v) if isinstance(v, mpmath.mpc) and abs(mpmath.im(v)) <= abs(v) * mpmath.mpf(10) ** (-dps // 2) else v
    if isinstance(v, mpmath.mpf):
        fr = Fraction(float(v)).limit_denominator(10 ** 6) if abs(v) < 1e15 else None
        if fr is not None and abs(v - mpmath.mpf(fr.numerator) / fr.denominator) <= mpmath.mpf(10) ** (-dps // 2) * max(1, abs(v)):
            return str(fr)
    return mpmath.nstr(v, 12)


def equation_text(Q, P, var="x", dps=30) -> str:
    """``sum_j Q_j f^(j) + P = 0`` as text, polynomials low to high."""
    def poly(cs):
        terms = []
        for k, c in enumerate(cs):
            t = _coefficient_text(c, dps)
            if c == 0 or t in ("0", "-0"):
                continue
            mono = "" if k == 0 else (var if k == 1 else f"{var}^{k}")
            if not mono:
                terms.append(t)
            elif t in ("1", "-1"):
                terms.append(mono if t == "1" else f"-{mono}")
            else:
                terms.append(f"{t} {mono}" if "/" not in t and "e" not in t else f"({t}) {mono}")
        return " + ".join(terms).replace("+ -", "- ") if terms else "0"
    parts = []
    for j in range(len(Q) - 1, -1, -1):
        if all(c == 0 for c in Q[j]):
            continue
        d = "f" + "'" * j
        parts.append(f"[{poly(Q[j])}] {d}")
    if any(c != 0 for c in P):
        parts.append(f"[{poly(P)}]")
    return " + ".join(parts) + " = 0"


def _is_homogeneous(D, K, L, Q, tol):
    """Is the inhomogeneous term ``P = -(sum_j Q_j f^(j))`` truncated to degree ``L`` zero (to
    ``tol`` relative to the terms that form it)?"""
    for n in range(L + 1):
        tot, size = _equation_at(D, K, Q, n)
        if abs(tot) > tol * size:
            return False
    return True


def exact_exponents(Q, K, roots, dps, homogeneous=False):
    """``[(x_c, theta)]`` at the zeros of ``Q_K`` of an equation the series obeys exactly.

    Roots closer than ``10^-min(dps/4, 12)`` (relative) are one multiple zero (a double zero
    splits by about the square root of the fit's error, which can be far above the
    working precision's). A simple zero:
    :func:`exponents_at`. A double zero of ``Q_2`` with a simple zero of ``Q_1`` there is
    a regular singular point: the exponents solve the indicial equation
    ``a rho (rho - 1) + b rho + c = 0`` with ``a = Q_2''(x_c)/2``, ``b = Q_1'(x_c)``,
    ``c = Q_0(x_c)``, and the smaller one (it dominates the growth of the coefficients)
    is returned (common practice, no source: Frobenius' method). Other multiple
    zeros (irregular points) are left out. With ``homogeneous`` (no inhomogeneous term) and
    ``K = 1``, a simple zero with a non-negative integer exponent is an apparent singular point:
    the solution is ``(x - x_c)^n`` times an analytic function there, and it is left out
    (``(1 + x/2) (1 - x)^(-1/2)`` gives ``Q_1 = (1 + x/2)(1 - x)`` with exponent 1 at -2)."""
    tol = mpmath.mpf(10) ** (-min(dps // 4, 12))
    groups = []
    for z in roots:
        if z == 0:
            continue        # the origin (normalisation Q_K = x^lead + ...): the series is analytic there
        for g in groups:
            if abs(z - g[0]) <= tol * max(1, abs(g[0])):
                g.append(z)
                break
        else:
            groups.append([z])
    out = []
    for g in groups:
        z = sum(g) / len(g)
        if len(g) == 1:
            th = exponents_at(Q, K, [z], dps)[0]
            if (homogeneous and K == 1 and th is not None and mpmath.re(th) > -0.5
                    and abs(th - mpmath.nint(mpmath.re(th))) <= mpmath.mpf(10) ** (-min(dps // 4, 12))):
                continue
        elif len(g) == 2 and K == 2:
            a = polyval_many(polyder(polyder(Q[2])), [z], dps)[0] / 2
            b = polyval_many(polyder(Q[1]), [z], dps)[0]
            c0 = polyval_many(Q[0], [z], dps)[0]
            if a == 0:
                continue
            disc = mpmath.sqrt((b - a) ** 2 - 4 * a * c0)
            rhos = [((a - b) + disc) / (2 * a), ((a - b) - disc) / (2 * a)]
            th = min(rhos, key=lambda r: mpmath.re(r))
        else:
            continue
        if th is not None and mpmath.isfinite(th):
            out.append((z, th))
    return out


def _mark_log_points(sings, Q, dps):
    """Kind ``branch-log`` at regular singular points of an exact second-order equation whose
    indicial equation has a double root: the second Frobenius solution then carries
    ``log(x - x_c)`` (common practice, no source: Frobenius' method), e.g.
    ``log(1 - x) (1 - x)^(-1/2)``, whose equation ``(1 - x)^2 f'' - 2 (1 - x) f' + f/4 = 0``
    has the double root -1/2 at x = 1. A non-integer exponent keeps the kind ``branch-log``; an
    integer one is left to :func:`classify_kind` (``log`` or ``pole``)."""
    from dataclasses import replace
    tol = mpmath.mpf(10) ** (-min(dps // 4, 12))
    out = []
    for sg in sings:
        z = sg.location
        a = polyval_many(polyder(polyder(Q[2])), [z], dps)[0] / 2
        q2 = polyval_many(Q[2], [z], dps)[0]
        dq2 = polyval_many(polyder(Q[2]), [z], dps)[0]
        scale = max(abs(a), mpmath.mpf(1))
        if a != 0 and abs(q2) <= tol * scale and abs(dq2) <= tol * scale and sg.kind == "branch":
            b = polyval_many(polyder(Q[1]), [z], dps)[0]
            c0 = polyval_many(Q[0], [z], dps)[0]
            disc = (b - a) ** 2 - 4 * a * c0
            if abs(disc) <= tol * max(abs(b - a) ** 2, abs(4 * a * c0), mpmath.mpf(1)):
                sg = replace(sg, kind="branch-log")
        out.append(sg)
    return out


#: first order, exponent 0: the zero of Q_1 is a logarithmic point of the approximant only if
#: the log's coefficient -P(z)/Q_1'(z) is at least this fraction of the function's size there
APPARENT_LOG = mpmath.mpf("1e-6")


def _without_apparent(D, L, Q, pts, c, dps):
    """First-order approximants: drop zeros of ``Q_1`` whose exponent is 0 and whose logarithm
    has a negligible coefficient. Near a simple zero ``z`` of ``Q_1`` with ``Q_0(z) = 0`` the
    solution is analytic plus ``-P(z)/Q_1'(z) log(x - z)`` (common practice, no source: the
    equation's local solution); with that coefficient near zero the point is regular, an
    apparent singular point of the approximating equation. Rounding noise fills the approximants
    with such zeros (measured: (1 - 3x/4 + 9x^2/4)^(1/3) (1 - 2x/5)^(-1/3) from 40 terms rounded to
    16 digits: 40 zeros with exponent below 1e-10 and log coefficients below 6e-11 in 16
    approximants, one conjugate pair of them on the circle of convergence reported as
    logarithmic singularities)."""
    if not any(abs(th) < APPARENT_LOG for _, th in pts):
        return pts
    P = [-_equation_at(D, 1, Q, n)[0] for n in range(L + 1)]
    zs = [z for z, th in pts if abs(th) < APPARENT_LOG]
    apparent = set()
    for z, pz, d in zip(zs, polyval_many(P, zs, dps), polyval_many(polyder(Q[1]), zs, dps)):
        size = max(abs(v) * abs(z) ** k for k, v in enumerate(c[:4]))
        if d != 0 and abs(pz / d) < APPARENT_LOG * size:
            apparent.add(z)
    return [(z, th) for z, th in pts if z not in apparent]


def exponents_at(Q, K, zs, dps):
    """Critical exponents of the approximant at simple zeros ``zs`` of ``Q_K``
    (``None`` where ``Q_K'`` vanishes); polynomials evaluated in flint."""
    dQK = polyval_many(polyder(Q[K]), zs, dps)
    top = polyval_many(Q[0] if K == 1 else Q[K - 1], zs, dps)
    out = []
    for d, t in zip(dQK, top):
        if d == 0:
            out.append(None)
        else:
            out.append(-t / d if K == 1 else 1 - t / d)
    return out


def estimate_diffapprox(series, ctx=None, order=1, count=16, max_radius_factor=2.5, _strip=False):
    """Singularities from an ensemble of inhomogeneous differential approximants.

    Parameters
    ----------
    series : Series
    ctx : Context, optional
    order : {1, 2}
        Order ``K`` of the differential equation.
    count : int
        Number of approximants in the ensemble.
    """
    method = "diff-approx" if order == 1 else f"diff-approx{order}"
    if order not in (1, 2):
        from ..errors import InputError
        raise InputError(f"differential approximant order must be 1 or 2, got {order}", where="order")
    prep = prepare(series, ctx, min_terms=10 + 3 * order)
    with prep.ctx.working():
        c = prep.c
        growth, kappa = classify_growth(c)
        if growth == "factorial":
            return failed(method, Status.NOT_APPLICABLE, "factorially divergent series: radius 0", prep)
        if growth == "entire-like":
            return failed(method, Status.NOT_APPLICABLE, "coefficients decay faster than any power: "
                          "entire-like, no finite singular point", prep)
        K = order
        # f = x^r g with g(0) != 0 has the singular points and exponents of g away from 0.
        # Leading zeros can make every approximant of f with a low-degree P singular; then
        # (and only then: the approximants of f and of g differ, and those of f have served
        # well elsewhere) the table of g is used
        r = next(i for i, v in enumerate(c) if v != 0)
        if _strip:
            c = c[r:]
        retry = (not _strip and r > 0)
        D = _deriv_coeffs(c, K)
        N = len(c)
        if N > 100:
            # fewer for long series: a dense solve costs O(N^3). Above CERTIFIED_MAX unknowns the
            # order basis costs O(N^2), but the count stays, so verdicts do not move with the solver
            count = min(count, 10)
        max_err = 10.0 ** -max(10, prep.digits / 3)   # approximants must keep a third of the digits
        ens, skipped, table = [], [], []
        # highest orders first; a degenerate (exactly D-finite) or ill-conditioned top of the
        # table is followed by lower total orders until enough approximants are regular. A
        # level whose first approximant fails is skipped (the others there fail the same way).
        step = max(2, N // 15)
        # approximants using fewer than half the terms are not used: a table that is singular
        # down to there belongs to a series satisfying a low-order equation exactly, where
        # near-degenerate approximants give biased exponents
        levels = list(range(N, 4 * (K + 1) + 1, -step))
        # exact input often obeys a low-order equation exactly (algebraic and D-finite
        # generating functions); when it does, that equation beats any ensemble of approximants
        exact_eq = None
        if series.is_exact:
            found = _exact_ensemble(D, K, prep)
            if found is not None:
                ens, table, exact_eq = found
                levels = []
        floor_level = max(N // 2, 4 * (K + 1) + 1)
        probed = False
        last_roots = None
        tried = 0
        n_singular = 0
        fits = {}

        def get_fit(L, Ms):
            nonlocal tried, n_singular
            key = (L, tuple(Ms))
            if key not in fits:
                tried += 1
                fits[key] = fit_diffapprox(D, K, L, Ms, prep.dps, max_err=max_err)
                if fits[key] is None:
                    n_singular += 1
            return fits[key]

        def usable(i):
            """Is the first approximant of levels[i] usable (regular, keeps its digits)?"""
            L, Ms = diffapprox_orders(levels[i], K, 1)[0]
            fit = get_fit(L, Ms)
            if fit is None or fit[1] > max_err:
                skipped.append((L, tuple(Ms)))
                return False
            return True

        # Long series at a modest precision: the top levels are often all singular (each a
        # dense solve costing ~1 s at 200 terms and 120 digits, measured on the 200-loop BES
        # series at a = pi/4: 7 of them before the first usable one). The highest usable level
        # at or above the floor is found by bisection, which assumes that a level whose first
        # approximant fails has no usable level above it; the walk below then starts there.
        above = [i for i, lv in enumerate(levels) if lv >= floor_level]
        if len(above) >= 4 and not usable(0):
            lo, hi = 0, above[-1]
            if usable(hi):
                while hi - lo > 1:
                    mid = (lo + hi) // 2
                    if usable(mid):
                        hi = mid
                    else:
                        lo = mid
                levels = levels[hi:]
            else:
                levels = levels[hi + 1:]
        for level in levels:
            if len(ens) >= count:
                break
            if level < floor_level and not ens:
                # is the top of the table singular because of the precision or because the
                # series satisfies a lower-order equation exactly? One probe at twice the digits.
                if not probed:
                    probed = True
                    L0, Ms0 = diffapprox_orders(N, K, 1)[0]
                    if fit_diffapprox(D, K, L0, Ms0, 2 * prep.dps) is None:
                        break          # degenerate: do not descend to tiny approximants
            for idx, (L, Ms) in enumerate(diffapprox_orders(level, K, count)):
                if len(ens) >= count:
                    break
                known = (L, tuple(Ms)) in fits
                fit = get_fit(L, Ms)
                if fit is None or fit[1] > max_err:
                    if not known:
                        skipped.append((L, tuple(Ms)))
                    if idx == 0:
                        break
                    continue
                Q, err = fit
                roots = poly_roots(Q[K], prep.dps, tol_digits=root_digits(err, prep.dps), seeds=last_roots)
                last_roots = roots or last_roots
                if not roots:
                    skipped.append((L, tuple(Ms)))
                    continue
                pts = [(z, th) for z, th in zip(roots, exponents_at(Q, K, roots, prep.dps))
                       if th is not None and mpmath.isfinite(th)]
                if K == 1:
                    pts = _without_apparent(D, L, Q, pts, prep.c, prep.dps)
                ens.append({"L": L, "M": tuple(Ms), "poles": pts, "zeros": [], "spurious": [], "rel_err": err})
                table.append({"L": L, "M": list(Ms), "roots": [z for z, _ in pts],
                              "exponents": [t for _, t in pts]})
        if len(ens) < 3 and exact_eq is None:
            # degenerate table: look for the equation the series satisfies exactly
            found = _exact_ensemble(D, K, prep)
            if found is not None:
                ens, table, exact_eq = found
        if len(ens) < 3 and retry:
            return estimate_diffapprox(series, ctx, order, count, max_radius_factor, _strip=True)
        if len(ens) < 3 and n_singular >= tried - len(ens) - 1:
            return failed(method, Status.NOT_APPLICABLE,
                          "every approximant is degenerate: the series seems to satisfy an equation of "
                          "lower order exactly (use the Dlog-Padé or ratio results)", prep, {"skipped": skipped})
        if len(ens) < 3:
            return failed(method, Status.UNSTABLE_PRECISION,
                          f"only {len(ens)} approximants usable: the systems are singular or ill-conditioned at "
                          f"{prep.dps} digits (the series may satisfy a lower-order equation exactly -- "
                          "degenerate table -- or the precision is too low)",
                          prep, {"skipped": skipped})
        # up to 12 points: rounding noise in the coefficients can put several conjugate pairs of
        # zeros on the circle of convergence in every approximant, and with the default 6 they
        # crowded out the true singular points just beyond them (measured: (1 + x)^(1/3)
        # (1 - 2x/3)^(-3/10), 50 terms at 30 digits: three noise pairs at |x| = 0.97-1 kept, -1
        # and 3/2 dropped although every approximant has them; the analysis screens the noise)
        sings, info = clusters_to_singularities(ens, method, prep.eps, residue_is_exponent=True,
                                                real_series=not prep.is_complex, max_count=12,
                                                radius_factor=max_radius_factor if not exact_eq
                                                else max(max_radius_factor, 10), detect_cuts=False)
        how = (f"{len(ens)} inhomogeneous differential approximants of order {K} (L in 0..6, degrees of the "
               "Q_j within 1 of each other, from the highest total order down, skipping orders whose system is "
               "singular or keeps fewer than 10 digits); zeros of Q_K found in at "
               f"least half of them clustered; band = {SAFETY} x spread of locations and exponents.")
        if exact_eq:
            L0, Ms0 = exact_eq[0][0], exact_eq[0][1]
            how = (f"the series satisfies an order-{K} linear equation with polynomial coefficients of "
                   f"degree {Ms0[0]} exactly: every larger approximant is singular, and this one, fitted "
                   f"with L = {', '.join(str(e[0]) for e in exact_eq)}, reproduces all {N} coefficients "
                   "given; its singular points are the zeros of Q_K; band = "
                   f"{SAFETY} x spread over the {len(ens)} fits (rounding only)")
        diag = {"how": how, "order": K, "approximants": table, "skipped": skipped, **info}
        if exact_eq:
            diag["exact_equation"] = True
            L0, _, Q0, _ = exact_eq[0]
            P0 = [-_equation_at(D, K, Q0, n)[0] for n in range(L0 + 1)]
            while len(P0) > 1 and abs(P0[-1]) <= mpmath.mpf(10) ** (-prep.dps // 2) * max(
                    [abs(v) for v in P0] + [mpmath.mpf(1)]):
                P0.pop()
            if len(P0) == 1 and abs(P0[0]) <= mpmath.mpf(10) ** (-prep.dps // 2):
                P0 = [mpmath.mpf(0)]
            if prep.stride > 1 or prep.offset:
                # the fit ran on F with f(x) = x^offset F(x^stride): its equation is in u, not x
                # ((1 - x^2)^(-1/3) printed "[1 - x] f' + [-1/3] f = 0", which f does not obey)
                u = "x" if prep.stride == 1 else f"x^{prep.stride}"
                xr = "" if not prep.offset else (" x" if prep.offset == 1 else f" x^{prep.offset}")
                diag["equation"] = (equation_text(Q0, P0, "u" if prep.stride > 1 else "x", prep.digits)
                                    .replace("f'", "F'").replace("] f", "] F")
                                    + (f", with u = {u} and f(x) ={xr} F(u)" if prep.stride > 1
                                       else f", with f(x) ={xr} F(x)"))
            else:
                diag["equation"] = equation_text(Q0, P0, "x", prep.digits)
        if probed and ens and not exact_eq:
            diag["note"] = ("the highest orders are ill-conditioned at this precision; lower orders were used "
                            "(more digits would use more terms)")
        if exact_eq and K == 2:
            sings = _mark_log_points(sings, exact_eq[0][2], prep.dps)
        if K == 2:
            # a zero of Q_2 with exponents 0 and a positive integer is usually an apparent
            # singularity of the approximating equation, not of f
            sings = [s for s in sings if not (s.exponent is not None and s.exponent.width < 0.2
                                              and s.exponent.value > 0.5
                                              and abs(s.exponent.value - mpmath.nint(s.exponent.value))
                                              <= max(s.exponent.error, mpmath.mpf(10) ** -6))]
        if not sings:
            return failed(method, Status.NOT_CONVERGED, "no zero of Q_K recurs across the ensemble", prep, diag)
        return finish(method, prep, sings, diagnostics=diag, order=K, count=count)
