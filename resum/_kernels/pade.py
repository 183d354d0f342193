"""Padé approximants at high precision: one approximant, or the near-diagonal table.

``pade(c, L, M, dps)`` returns the [L/M] Padé approximant ``p(x)/q(x)`` of the
power series ``c[0] + c[1] x + ...`` (deg p <= L, deg q <= M, q(0) = 1,
``q c - p = O(x^(L+M+1))``) as a :class:`PadeApprox`. ``pade_table`` returns
all approximants with ``L - M`` in a set of offsets.

Three constructions, chosen automatically:

``exact``
    int/Fraction coefficients: exact rational arithmetic (FLINT ``fmpq_mat``),
    with the degree reduction of Gonnet, Güttel and Trefethen done with the
    exact rank, so the result is the exact Padé approximant in lowest terms.
``fraction``
    inexact coefficients, normal case: the continued-fraction (staircase)
    recursion below, in Arb ball arithmetic. O(N^2) operations for the whole
    staircase, so one approximant costs O(N^2) and a diagonal of the table
    costs the same. The ball radii bound the rounding error rigorously
    (midpoints of the input treated as exact); the precision is raised until
    the coefficients carry the requested digits.
``svd``
    inexact coefficients where the recursion meets a singular block (a
    degenerate, non-normal table) or a lower-degree rational function: the
    SVD-based robust construction of Gonnet, Güttel and Trefethen (2013) in
    mpmath at the working precision; it reduces the degrees when the lower
    Toeplitz block is rank-deficient at the tolerance set by the input digits.
    This is O(N^3) in pure Python: slow for M beyond ~40.

The recursion
-------------
For ``g(0) != 0``, ``g = g0 / (1 + d1 x / (1 + d2 x / (1 + ...)))`` (a
corresponding continued fraction). With ``u1 = (g0 - g)/x`` and ``v1 = g``,
``d_k = u_k(0)/v_k(0)``, ``u_{k+1} = (d_k v_k - u_k)/x``, ``v_{k+1} = u_k``;
each step costs O(N). The convergents ``A_k/B_k``
(``A_k = A_{k-1} + d_k x A_{k-2}``, same for B, ``A_{-1}=0, B_{-1}=1,
A_0=g0, B_0=1``) are the staircase [0/0], [0/1], [1/1], [1/2], [2/2], ...
of g. Other diagonals follow from ``[M+d/M]_f = T_d + x^d [M/M]_{g_d}``
with ``f = T_d + x^d g_d`` (T_d the first d terms) and
``[L/M]_f = 1/[M/L]_{1/f}``.

On real balls the steps of the recursion and of the denominators run in
place, calling Arb's vector functions through FLINT's C library
(:mod:`.arb_inplace`): the same operations at the same precisions as the
python-flint polynomial code (kept for complex input and unusual steps), so
the same numbers, without a polynomial copy per step (a quarter less time at
[100/100]).

>>> from fractions import Fraction
>>> import math
>>> c = [Fraction(1, math.factorial(k)) for k in range(5)]     # exp(x)
>>> r = pade(c, 2, 2, dps=30)
>>> r.p, r.q                                                  # 1 + x/2 + x^2/12 over ...
((Fraction(1, 1), Fraction(1, 2), Fraction(1, 12)), (Fraction(1, 1), Fraction(-1, 2), Fraction(1, 12)))
>>> from mpmath import mpf
>>> with mpmath.workdps(40):
...     c = [1 / mpmath.factorial(k) for k in range(5)]
>>> r = pade(c, 2, 2, dps=30)
>>> r.method, mpmath.nstr(r.q[2], 25), r.digits >= 30
('fraction', '0.08333333333333333333333333', True)

Notes
-----
How to read the error. ``PadeApprox.digits`` is the number of correct
significant digits of the coefficients of p and q (normwise: relative to the
largest coefficient of each), for the input *as given*:

* ``exact``: infinite (exact rational arithmetic);
* ``fraction``: a rigorous bound from the ball arithmetic, treating the
  given coefficients as exact numbers (against exact rational references the
  bound is within a few digits of the true error, see tests/kernels);
* ``lu`` (ball LU on the Toeplitz system, used at singular blocks of the
  recursion): a rigorous bound as for ``fraction``;
* ``svd``: the agreement between two runs at different precisions (an
  estimate).
* ``fraction_rerun`` (``pade(..., check='rerun')``): the same recursion on
  plain MPFR numbers (gmpy2), run at ``lo`` bits (plan: ``dps + 1.6 M``
  digits) and at ``lo`` + 20 digits; ``digits`` is where the two runs agree,
  minus one, and never more than the ``lo`` run carries. An estimate, not a
  bound: it assumes the rounding error shrinks with the precision, and it
  cannot see an error that does not (for example input rounded to the
  wrong precision before either run). Measured on log(1+x)/x at [100/100],
  300 digits: claim 326, true 347. It is not faster than ``fraction`` on
  this machine (the ball recursion runs in C with a falling precision
  schedule; the MPFR one is a Python loop run twice), see
  studies/performance.

* ``fraction_residual`` (``pade(..., check='residual')``): the recursion on
  Arb ball midpoints (each ``d_k`` the quotient of two midpoints, made exact),
  so it loses what MPFR would (the system's conditioning, about 1.5-1.7
  digits per M) at Arb's speed; then the residual ``r = T q`` of the
  (M+1) x (M+1) Toeplitz system is computed in ball arithmetic and the error
  of q is ``T^-1 r``, applied by the Gohberg-Semencul formula whose
  generators are the [L/M] and [L-1/M] denominators (four polynomial
  products). ``digits`` is that error's size, minus one. An estimate, not a
  bound (the inverse is built from computed generators); it is
  first order only in the sense that the generators carry errors of their
  own, far below the one digit needed. Measured against exact rational
  references (tests/kernels) it is one digit below the true error, every
  time; on log(1+x)/x at [200/200], 100 digits: claim 142.8, true 143.8,
  in a third of the ball recursion's time (which claims 112, true 176).

If fewer than ``dps`` digits could be earned, ``diagnostics['message']``
says so; callers should check ``digits`` against what they need.

When ``input_digits`` is given, the effect of the input's own uncertainty is
estimated by one rerun with the input perturbed at its last digit, and
``digits`` is the smaller of the two (the perturbation part is an estimate,
not a bound; ``diagnostics['input_sensitivity_digits']`` keeps it apart).
Values of the approximant are not bounded by this: near poles and far from
the origin they can be much less accurate.

Applicability: any series with a non-zero coefficient among the first L+1.
Exact input is always handled; for inexact input the recursion needs a normal
staircase (no singular blocks) and otherwise the slow SVD construction runs.
Even/odd series (only every s-th coefficient non-zero) are reduced to the
series in ``x^s`` first, which removes the commonest singular blocks.

References
----------
P. Gonnet, S. Güttel and L. N. Trefethen, "Robust Padé approximation via
SVD", SIAM Review 55 (2013) 101-117.
G. A. Baker, Jr. and P. Graves-Morris, *Padé Approximants*, 2nd ed.,
Cambridge University Press (1996), ch. 2 (the Padé table, block structure)
and ch. 4 (continued fractions and the staircase).
W. B. Gragg, "The Padé table and its relation to certain algorithms of
numerical analysis", SIAM Review 14 (1972) 1-62.
"""
from __future__ import annotations

import math
import random
from dataclasses import dataclass, field
from fractions import Fraction
from typing import Optional, Sequence

import flint
import gmpy2
import mpmath

from . import arb_inplace as _ip
from . import flint_bridge as fb

__all__ = ["PadeApprox", "pade", "pade_table", "guard_digits_for_pade", "pade_fp"]

#: Digits lost per unit of denominator degree M by the continued-fraction
#: recursion *as its ball radii certify them*, measured on [M/M] of log(1+x)/x
#: and exp(x) for M = 10..100 (about 4 digits per M; the Toeplitz system itself
#: loses about 1.5, see guard_digits_for_pade). The ball midpoints are as poor
#: as the radii say (Arb rounds a result's midpoint to the accuracy its radius
#: leaves), but the same recursion in plain MPFR arithmetic (gmpy2, one flat
#: precision, no radii) loses only about 150 digits at [100/100] of
#: log(1+x)/x, i.e. about what the system's conditioning costs
#: (studies/performance/radius_vs_midpoint.py). A radius-free recursion with a
#: cheaper certificate would let the plan drop to ~1.6 digits per M; none that
#: costs less than the ball recursion is implemented yet (a ball LU of the
#: system at the lower precision costs more than the whole recursion at N = 100).
DEFAULT_GROWTH = 4.2

#: Digits above the request kept at the last step of the recursion's
#: precision schedule (and for the denominators). Measured at [100/100] of
#: log(1+x)/x, 300 digits: 40 saves ~5% but leaves a one-digit margin; 25
#: triggers a second run at higher precision (twice the time).
_FINAL_MARGIN = 60


# ----------------------------------------------------------------------------
# precision plan
# ----------------------------------------------------------------------------

def guard_digits_for_pade(n_terms: int, dps_out: int, growth: Optional[float] = None) -> int:
    """Guard digits to carry so an [L/M] table built from ``n_terms``
    coefficients has ``dps_out`` correct digits.

    The plan: the Padé coefficients are at least as sensitive to the input
    as the Toeplitz system that defines them. For series of Stieltjes type
    (moments of a positive measure, the commonest case in perturbation
    theory) the condition number of the M x M Hankel matrix grows like
    ``(1 + sqrt 2)^(4M)``, as for the Hilbert matrix: about 1.53 decimal
    digits per unit of M. The continued-fraction recursion's ball radii grow
    faster than that: they certify about 4 fewer digits per unit of M
    (log(1+x)/x and exp(x), M up to 100), and Arb's midpoints follow the
    radii; in plain MPFR arithmetic the recursion loses only about what the
    conditioning costs (see :data:`DEFAULT_GROWTH`). As the digits reported
    are the certified ones, the plan follows the radii. We therefore carry
    ``growth * M + 10 + log10(n_terms)`` guard digits with
    ``M = n_terms // 2``. Kernels that use this plan still verify: the ball
    radii bound the rounding error, and the precision is raised by the
    measured loss if fewer than ``dps_out`` digits remain. A conformal
    re-expansion or a Borel transform of ``n_terms`` coefficients (O(N^2)
    sums of terms of one sign pattern) loses at most ``log10`` of the
    largest term over the result; callers add that to this plan.

    Parameters
    ----------
    n_terms : int
        Coefficients used (L + M + 1 of the largest approximant).
    dps_out : int
        Digits wanted in the coefficients.
    growth : float, optional
        Digits lost per unit of denominator degree (default
        :data:`DEFAULT_GROWTH`).

    Returns
    -------
    int
        Guard digits (working precision = dps_out + guard).

    Examples
    --------
    >>> guard_digits_for_pade(201, 300)
    433
    >>> guard_digits_for_pade(21, 30, growth=0.5)
    17

    References
    ----------
    B. Beckermann, "The condition number of real Vandermonde, Krylov and
    positive definite Hankel matrices", Numer. Math. 85 (2000) 553-577.
    J. Todd, "The condition of the finite segments of the Hilbert matrix",
    NBS Applied Math. Series 39 (1954) 109-116.
    """
    if n_terms < 1:
        raise ValueError("n_terms must be positive")
    g = DEFAULT_GROWTH if growth is None else float(growth)
    M = n_terms // 2
    return int(math.ceil(g * M + 10 + math.log10(n_terms)))


# ----------------------------------------------------------------------------
# result
# ----------------------------------------------------------------------------

@dataclass(frozen=True)
class PadeApprox:
    """An [L/M] Padé approximant ``p(x)/q(x)``.

    Attributes
    ----------
    p, q : tuple
        Numerator and denominator coefficients, low to high, ``q[0] == 1``
        (Fractions for exact input, mpf/mpc otherwise). Trailing zero
        coefficients are removed, so ``len(p) - 1`` and ``len(q) - 1`` are the
        actual degrees.
    L, M : int
        Degrees after any reduction (``L = len(p) - 1``, ``M = len(q) - 1``;
        for the zero approximant ``L = 0``).
    requested : tuple
        The requested ``(L, M)``.
    defect : int
        How much the construction reduced the denominator degree
        (``requested[1] - M``); > 0 means the series is, to the tolerance, a
        rational function of lower type (or the table has a block there).
    digits : float
        Correct significant digits of the coefficients (module Notes); ``inf``
        for exact.
    exact : bool
    method : str
        'exact', 'fraction', 'fraction_rerun', 'lu', 'svd' or 'fp' (double
        precision).
    dps : int
        Digits the caller asked for.
    diagnostics : dict
        prec_bits, tol, scale exponent, deflation, messages.
    """

    p: tuple
    q: tuple
    L: int
    M: int
    requested: tuple
    defect: int
    digits: float
    exact: bool
    method: str
    dps: int
    diagnostics: dict = field(default_factory=dict, compare=False)

    # -- evaluation ----------------------------------------------------------
    def __call__(self, x, dps: Optional[int] = None):
        """Value ``p(x)/q(x)`` computed at ``dps`` (default ``self.dps``) plus
        10 guard digits; exact Fractions give an exact Fraction for a
        rational ``x``."""
        if self.exact and fb.is_exact(x):
            x = Fraction(x)
            return _horner(self.p, x) / _horner(self.q, x)
        from ..context import workdps
        with workdps((dps or self.dps) + 10):
            x = mpmath.mpmathify(x)
            v = _horner([mpmath.mpmathify(a) for a in self.p], x) / \
                _horner([mpmath.mpmathify(b) for b in self.q], x)
        return +v

    def numerator(self):
        return list(self.p)

    def denominator(self):
        return list(self.q)

    def poles(self, dps: Optional[int] = None):
        """Roots of q as ``(mpc, radius)`` pairs (see :mod:`resum._kernels.roots`)."""
        from .roots import poly_roots
        if len(self.q) < 2:
            return []
        return poly_roots(list(self.q), dps or self.dps,
                          input_digits=None if self.exact else self.digits)

    def zeros(self, dps: Optional[int] = None):
        """Roots of p as ``(mpc, radius)`` pairs."""
        from .roots import poly_roots
        if len(self.p) < 2 or all(a == 0 for a in self.p):
            return []
        return poly_roots(list(self.p), dps or self.dps,
                          input_digits=None if self.exact else self.digits)

    def residues(self, dps: Optional[int] = None):
        """``(pole, residue)`` pairs for every simple pole: ``p(z)/q'(z)``."""
        from ..context import workdps
        d = dps or self.dps
        out = []
        poles = self.poles(d)
        with workdps(d + 10):
            P = [mpmath.mpmathify(a) for a in self.p]
            dQ = [k * mpmath.mpmathify(self.q[k]) for k in range(1, len(self.q))]
            for z, _ in poles:
                qd = _horner(dQ, z)
                out.append((z, _horner(P, z) / qd if qd != 0 else mpmath.inf))
        return out

    def to_dict(self) -> dict:
        from ..results import num_to_str
        return {"L": self.L, "M": self.M, "requested": list(self.requested),
                "defect": self.defect, "digits": self.digits if math.isfinite(self.digits)
                else "inf", "exact": self.exact, "method": self.method, "dps": self.dps,
                "p": [num_to_str(a) for a in self.p], "q": [num_to_str(b) for b in self.q]}


def _horner(a, x):
    s = 0
    for coef in reversed(a):
        s = s * x + coef
    return s


# ----------------------------------------------------------------------------
# input handling
# ----------------------------------------------------------------------------

def _validate(c, L, M, dps):
    if isinstance(L, bool) or not isinstance(L, int) or L < 0:
        raise ValueError(f"L must be a non-negative integer, got {L!r}")
    if isinstance(M, bool) or not isinstance(M, int) or M < 0:
        raise ValueError(f"M must be a non-negative integer, got {M!r}")
    if not isinstance(dps, int) or dps < 1:
        raise ValueError(f"dps must be a positive integer, got {dps!r}")
    if len(c) < L + M + 1:
        raise ValueError(f"[{L}/{M}] needs {L + M + 1} coefficients, got {len(c)}")


def _normalise(c):
    out = []
    for k, x in enumerate(c):
        if isinstance(x, bool):
            raise TypeError(f"coefficient {k} is a boolean")
        if isinstance(x, float):
            x = mpmath.mpf(x)
        elif isinstance(x, complex):
            x = mpmath.mpc(x)
        elif isinstance(x, Fraction) and x.denominator == 1:
            x = int(x)
        out.append(x)
    return out


def _deflation(c):
    """(v, s): c = x^v F(x^s) with the largest s (exact zeros only)."""
    nz = [k for k, x in enumerate(c) if not _is_zero(x)]
    if not nz:
        return 0, 1
    v = nz[0]
    g = 0
    for k in nz:
        g = math.gcd(g, k - v)
    return v, (g or 1)


def _zero_approx(L, M, dps, exact, method):
    zero = Fraction(0) if exact else mpmath.mpf(0)
    one = Fraction(1) if exact else mpmath.mpf(1)
    return PadeApprox((zero,), (one,), 0, 0, (L, M), M, math.inf,
                      exact, method, dps, {"note": "zero approximant"})


def _trim(a, tol=0):
    a = list(a)
    while len(a) > 1 and abs(a[-1]) <= tol:
        a.pop()
    return a


def _inflate(a, s):
    if s == 1:
        return list(a)
    out = [0] * ((len(a) - 1) * s + 1)
    for k, x in enumerate(a):
        out[k * s] = x
    return out


# ----------------------------------------------------------------------------
# exact construction
# ----------------------------------------------------------------------------

def _pade_exact_core(c, L, M):
    """Exact GGT: reduce (L, M) with the exact rank of the lower Toeplitz
    block, then take its null vector. c: list of fmpq. Returns (p, q) lists of
    fmpq with q[0] = 1, or None for the zero approximant."""
    if all(x == 0 for x in c[:L + 1]):
        return None
    while True:
        if M == 0:
            return list(c[:L + 1]), [flint.fmpq(1)]
        C = flint.fmpq_mat(M, M + 1, [c[L + 1 + i - j] if L + 1 + i - j >= 0 else 0
                                       for i in range(M) for j in range(M + 1)])
        rho = C.rank()
        if rho == M:
            break
        L -= M - rho
        M = rho
        if L < 0:
            return None
    # normalise q0 = 1 if possible: solve C[:,1:] b' = -C[:,0]
    T = flint.fmpq_mat(M, M, [C[i, j + 1] for i in range(M) for j in range(M)])
    rhs = flint.fmpq_mat(M, 1, [-C[i, 0] for i in range(M)])
    try:
        sol = T.solve(rhs)
        b = [flint.fmpq(1)] + [sol[i, 0] for i in range(M)]
    except ZeroDivisionError:
        # q(0) = 0 in the null vector: take it from the reduced row echelon form
        R, rank = C.rref()
        pivots, free = [], None
        r = 0
        for j in range(M + 1):
            if r < rank and R[r, j] != 0:
                pivots.append(j)
                r += 1
            elif free is None:
                free = j
        b = [flint.fmpq(0)] * (M + 1)
        b[free] = flint.fmpq(1)
        for i, j in enumerate(pivots):
            b[j] = -R[i, free]
    a = [sum((c[i - j] * b[j] for j in range(min(i, M) + 1)), flint.fmpq(0))
         for i in range(L + 1)]
    lam = 0
    while lam < len(b) and b[lam] == 0:
        lam += 1
    b = b[lam:]
    a = a[lam:] or [flint.fmpq(0)]
    b0 = b[0]
    a = [x / b0 for x in a]
    b = [x / b0 for x in b]
    return _trim(a), _trim(b)


def _pade_exact(c, L, M, dps):
    v, s = _deflation(c[:L + M + 1])
    if v > L or all(x == 0 for x in c[:L + 1]):
        return _zero_approx(L, M, dps, True, "exact")
    g = [fb.to_fmpq(x) for x in c[v:L + M + 1:s]]
    Lg, Mg = (L - v) // s, M // s
    g = g[:Lg + Mg + 1]
    res = _pade_exact_core(g, Lg, Mg)
    if res is None:
        return _zero_approx(L, M, dps, True, "exact")
    a, b = res
    p = [Fraction(0)] * v + [fb.fmpq_to_fraction(x) for x in _inflate(a, s)]
    q = [fb.fmpq_to_fraction(x) for x in _inflate(b, s)]
    p, q = _trim(p), _trim(q)
    p = [Fraction(x) for x in p]
    q = [Fraction(x) for x in q]
    return PadeApprox(tuple(p), tuple(q), len(p) - 1, len(q) - 1, (L, M), M - (len(q) - 1),
                      math.inf, True, "exact", dps,
                      {"deflation": (v, s), "reduced_to": (Lg, Mg)})


# ----------------------------------------------------------------------------
# number backends: the recursion below runs on Arb balls (certified) or on
# plain MPFR numbers (gmpy2; checked by a rerun at higher precision)
# ----------------------------------------------------------------------------

_BALL_TYPES = (flint.arb, flint.acb)
_GMP_TYPES = (type(gmpy2.mpfr(0)), type(gmpy2.mpc(0)))


def _mid(x):
    """Midpoint of a ball; a plain number is its own midpoint."""
    return x.mid() if isinstance(x, _BALL_TYPES) else x


def _rad(x):
    """Radius of a ball; 0 for a plain number."""
    return x.rad() if isinstance(x, _BALL_TYPES) else 0


_MPF_ZERO = mpmath.libmp.fzero


def _is_zero(x):
    """``x == 0`` for an input coefficient, without mpmath's comparison machinery for an mpf
    (a tenth of the cost; these tests run several times over every coefficient per call)."""
    m = getattr(x, "_mpf_", None)
    return m == _MPF_ZERO if m is not None else x == 0


def _has_zero(x):
    """Whether a ball contains 0 (a plain number: whether it is 0)."""
    return x.contains(0) if isinstance(x, _BALL_TYPES) else x == 0


class _MPoly:
    """A polynomial as a list of gmpy2 numbers (mpfr or mpc), low to high,
    with the operations of python-flint's arb_poly that the recursion uses;
    every operation rounds to the current gmpy2 precision. Unlike arb_poly,
    trailing zeros are kept (``length`` is the list's length)."""

    __slots__ = ("c",)

    def __init__(self, c):
        self.c = c

    def coeffs(self):
        return self.c

    def length(self):
        return len(self.c)

    def __getitem__(self, i):
        return self.c[i]

    def __neg__(self):
        return _MPoly([-x for x in self.c])

    def __add__(self, other):
        a, b = self.c, other.c
        if len(a) < len(b):
            a, b = b, a
        return _MPoly([x + y for x, y in zip(a, b)] + a[len(b):])

    def __sub__(self, other):
        a, b = self.c, other.c
        n = min(len(a), len(b))
        return _MPoly([x - y for x, y in zip(a, b)] + a[n:] + [-y for y in b[n:]])

    def __mul__(self, other):
        if not isinstance(other, _MPoly):
            return _MPoly([x * other for x in self.c])
        # one product in FLINT on exact balls at the gmpy2 precision: each
        # coefficient of the result is rounded about once, as a dot product
        # in MPFR would be, but in C (the schoolbook loop in Python costs
        # ~10 ms at degree 100 and 1500 bits)
        a, b = self.c, other.c
        if not a or not b:
            return _MPoly([])
        bits = gmpy2.get_context().precision
        cplx = any(isinstance(x, _GMP_TYPES[1]) for x in a + b)
        P = flint.acb_poly if cplx else flint.arb_poly
        with fb.flint_prec(bits):
            prod = P([_gmp_to_ball(x) for x in a]) * P([_gmp_to_ball(x) for x in b])
            return _MPoly([_mp_to_gmp(_mid_to_mp(z), cplx) for z in prod.coeffs()])

    def right_shift(self, n):
        return _MPoly(self.c[n:])

    def left_shift(self, n):
        zero = self.c[0] * 0 if self.c else gmpy2.mpfr(0)
        return _MPoly([zero] * n + self.c)

    def truncate(self, n):
        return _MPoly(self.c[:n])


def _gmp_to_ball(x):
    """gmpy2 mpfr/mpc -> exact arb/acb."""
    if isinstance(x, _GMP_TYPES[1]):
        return flint.acb(_gmp_to_ball(x.real), _gmp_to_ball(x.imag))
    if x == 0:
        return flint.arb(0)
    m, e = x.as_mantissa_exp()
    return flint.arb((int(m), int(e)))


def _mid_to_mp(z):
    """Midpoint of an arb/acb as an exact mpf/mpc."""
    if isinstance(z, flint.acb):
        return fb.acb_to_mpc(z)
    return fb.arb_to_mpf(z)


def _mp_to_gmp(x, cplx=False):
    """int, Fraction, mpf or mpc -> gmpy2 mpfr/mpc, rounded to the current
    gmpy2 precision (exact when the precision holds all the bits)."""
    if isinstance(x, _GMP_TYPES):
        return gmpy2.mpc(x) if cplx else x
    if isinstance(x, complex):
        x = mpmath.mpc(x)              # exact: a double fits mpmath's precision
    if isinstance(x, mpmath.mpc):      # (never mpmath.mpc(x) on an mpc: it rounds)
        return gmpy2.mpc(_mp_to_gmp(x.real), _mp_to_gmp(x.imag))
    if isinstance(x, Fraction):
        r = gmpy2.mpfr(gmpy2.mpq(x.numerator, x.denominator))
    elif isinstance(x, int):
        r = gmpy2.mpfr(x)
    else:
        # the mpf's own bits (mpmath.mpf(x) would round to mpmath's precision)
        sign, man, exp, _ = x._mpf_ if isinstance(x, mpmath.mpf) else mpmath.mpf(x)._mpf_
        if not man:
            r = gmpy2.mpfr(0) if exp == 0 else gmpy2.mpfr(float(x))
        else:
            r = gmpy2.mul_2exp(gmpy2.mpfr(-int(man) if sign else int(man)), int(exp))
    return gmpy2.mpc(r) if cplx else r


def _gmp_to_mp(x):
    """gmpy2 mpfr/mpc (or int) -> mpf/mpc, every bit kept."""
    if isinstance(x, int):
        return mpmath.mpf(x)
    if isinstance(x, _GMP_TYPES[1]):
        re, im = _gmp_to_mp(x.real), _gmp_to_mp(x.imag)
        return mpmath.mp.make_mpc((re._mpf_, im._mpf_))
    if not gmpy2.is_finite(x):
        return mpmath.mpf(float(x))
    m, e = x.as_mantissa_exp()
    return mpmath.mp.make_mpf(mpmath.libmp.from_man_exp(int(m), int(e)))


class _BallArith:
    """Arb/Acb balls (python-flint): radii bound every rounding error."""
    name = "ball"

    @staticmethod
    def poly(cplx):
        return flint.acb_poly if cplx else flint.arb_poly

    @staticmethod
    def get_prec():
        return flint.ctx.prec

    @staticmethod
    def set_prec(bits):
        flint.ctx.prec = bits

    @staticmethod
    def precision(bits):
        return fb.flint_prec(bits)

    @staticmethod
    def scalar(x):
        return x if isinstance(x, flint.arb) else fb.to_arb(x)

    @staticmethod
    def convert(c, cplx):
        return _balls(c, cplx)

    @staticmethod
    def recip(c, n, cplx):
        return _series_recip(c, n, cplx)

    @staticmethod
    def div(a, b):
        return a / b

    has_zero = staticmethod(_has_zero)


class _MidArith(_BallArith):
    """Arb polynomials whose radii are ignored: every continued-fraction
    coefficient ``d_k`` is the quotient of the two midpoints, rounded once and
    made an exact ball. The arithmetic runs in C at Arb's speed, and the
    midpoints then carry what plain MPFR arithmetic would (about the Toeplitz
    system's conditioning lost, 1.5 digits per unit of M at [100/100] of
    log(1+x)/x), not what the radii certify (about 4.2). Nothing is certified:
    the digits come from the residual check (:func:`_residual_digits`)."""
    name = "mid"

    @staticmethod
    def div(a, b):
        return (a.mid() / b.mid()).mid()

    @staticmethod
    def has_zero(x):
        return x.mid() == 0


class _MPFRArith:
    """Plain MPFR numbers (gmpy2) at one working precision, no radii. The
    precision lives in gmpy2's context, entered by :meth:`precision` (a fresh
    default context: round to nearest, mpc parts at the same precision)."""
    name = "mpfr"

    @staticmethod
    def poly(cplx):
        def make(c):
            return _MPoly([_mp_to_gmp(x, cplx) for x in c])
        return make

    @staticmethod
    def get_prec():
        return gmpy2.get_context().precision

    @staticmethod
    def set_prec(bits):
        gmpy2.get_context().precision = bits

    @staticmethod
    def precision(bits):
        return gmpy2.context(precision=int(bits))

    @staticmethod
    def scalar(x):
        return _mp_to_gmp(x)

    @staticmethod
    def convert(c, cplx):
        return [_mp_to_gmp(x, cplx) for x in c]

    @staticmethod
    def recip(c, n, cplx):
        """1/c to n terms (schoolbook, O(n^2))."""
        c = list(c[:n]) + [c[0] * 0] * max(0, n - len(c))
        inv0 = 1 / c[0]
        r = [inv0]
        for k in range(1, n):
            r.append(-inv0 * sum((c[j] * r[k - j] for j in range(1, k + 1)), c[0] * 0))
        return r

    @staticmethod
    def div(a, b):
        return a / b

    @staticmethod
    def has_zero(x):
        return x == 0


_BALL = _BallArith()
_MID = _MidArith()
_MPFR = _MPFRArith()


def _gmp_agree_digits(a, b):
    """Normwise decimal digits to which two coefficient lists of gmpy2
    numbers agree: -log10(max|a_i - b_i| / max|b_i|), inf if identical.
    Each difference is rounded once to 64 bits (relative error 2^-64), so the
    count is accurate to far better than the digit reported."""
    with gmpy2.context(precision=64):
        n = max(len(a), len(b))
        zero = gmpy2.mpfr(0)
        a = list(a) + [zero] * (n - len(a))
        b = list(b) + [zero] * (n - len(b))
        big = max(abs(x) for x in b)
        diff = max(abs(x - y) for x, y in zip(a, b))
        if diff == 0:
            return math.inf
        if big == 0:
            return 0.0
        return max(0.0, float(gmpy2.log10(big / diff)))


# ----------------------------------------------------------------------------
# the continued-fraction staircase (on either backend)
# ----------------------------------------------------------------------------

class _Block(Exception):
    """The recursion met a singular block at step k (``precision=True``: the
    ball of u_k(0) contains zero only because too few bits are left)."""

    def __init__(self, k, precision=False):
        super().__init__(k)
        self.k = k
        self.precision = precision


def _norm_inf(pol):
    """Largest |midpoint| of a ball polynomial's coefficients (or of a list of balls)."""
    m = 0
    for x in (pol.coeffs() if hasattr(pol, "coeffs") else pol):
        a = abs(_mid(x))
        if a > m:
            m = a
    return m


#: Below this, ``arf_abs_bound_lt_2exp_si`` is reporting an exact zero.
_EXACT_ZERO = -(1 << 40)


def _scheduled_bits(k, nsteps, start_bits, final_bits):
    """Working bits at step ``k`` of the recursion: from ``start_bits`` down to ``final_bits``
    linearly, rounded up to whole 64-bit limbs (see :func:`_cf_coefficients`)."""
    bits = final_bits + ((start_bits - final_bits) * (nsteps - k)) // max(nsteps, 1)
    return min(start_bits, -(-bits // 64) * 64)


class _Fallback(Exception):
    """The in-place kernel met a case it leaves to the python-flint loop."""


#: Fewest steps for which the in-place kernel pays for its set-up.
_INPLACE_MIN_STEPS = 12


def _cf_coefficients_inplace(g, nsteps, tol, final_bits, ar):
    """:func:`_cf_coefficients` on real balls, in place (:mod:`.arb_inplace`):
    the same Arb operations at the same precisions, so the same d_k bit for bit.

    It covers the normal steps only. Where the loop of :func:`_cf_coefficients`
    would look closer (``u_k(0)`` containing zero, or within a few bits of the
    tolerance times the terms that cancelled to form it: a possible block or
    termination), and at exact zeros that python-flint would strip from a
    polynomial's length, it raises :class:`_Fallback` and the caller runs that
    loop from the start. The test here is looser than the loop's by a factor 8
    (exponent bounds), so it never passes a step the loop would have stopped at."""
    lib = _ip.lib
    start_bits = flint.ctx.prec
    if final_bits is None or final_bits >= start_bits:
        final_bits = start_bits
    n = len(g)
    if n < 2:
        raise _Fallback
    mid_only = ar is _MID
    bound = lib.arf_abs_bound_lt_2exp_si
    tol_ball = tol if isinstance(tol, flint.arb) else fb.to_arb(tol)    # alive while read
    e_tol = bound(_ip.addr(tol_ball))
    V = _ip.Vec.of(g)                       # v_1 = g
    if lib.arb_contains_zero(V[0]):
        raise _Fallback
    U = _ip.Vec.of(g[1:], neg=True)         # u_1 = (g0 - g)/x
    D = _ip.Vec(nsteps)
    if mid_only:
        t1, t2 = _ip.Vec(1), _ip.Vec(1)
    e_cheap = max(bound(V[i]) for i in range(n))
    # exponent bounds carried from step to step instead of asked again: v_k = u_(k-1), so
    # |v_k(0)| and |v_k[1]| are the previous step's |u(0)| and |u[1]|
    e_v0, e_v1 = bound(V[0]), bound(V[1])
    if e_v1 < _EXACT_ZERO:
        raise _Fallback
    S = _ip.ARB_SIZE
    pv, pu, pd = V.p, U.p, D.p          # addresses of v_k(0), u_k(0), d_k
    span = start_bits - final_bits
    mul, sub, div = lib._arb_vec_scalar_mul, lib._arb_vec_sub, lib.arb_div
    getmid, has_zero = lib.arb_get_mid_arb, lib.arb_contains_zero
    bits = start_bits
    for k in range(1, nsteps + 1):
        if span:
            bits = _scheduled_bits(k, nsteps, start_bits, final_bits)
        e_u0 = bound(pu)
        if e_u0 < e_tol + e_cheap + 3 or (not mid_only and has_zero(pu)):
            raise _Fallback
        if mid_only:
            getmid(t1.p, pu)
            getmid(t2.p, pv)
            div(pd, t1.p, t2.p, bits)
            getmid(pd, pd)
        else:
            div(pd, pu, pv, bits)
        if k == nsteps:
            break
        valid = n - 1 - k
        if valid < 1:
            raise _Fallback
        e_u1 = bound(pu + S)
        if e_u1 < _EXACT_ZERO:          # an exact zero: leave it to the loop
            raise _Fallback
        # |d_k| < 2^(e_u0 - e_v0 + 1), and a bit each for the roundings of d_k and d_k v_k[1]
        e_cheap = max(e_u0 - e_v0 + e_v1 + 3, e_u1)
        w = pv + S
        mul(w, w, valid, pd, bits)
        sub(w, w, pu + S, valid, bits)
        # u_{k+1} = w (in v's vector, one place up), v_{k+1} = u_k
        pv, pu = pu, w
        e_v0, e_v1 = e_u0, e_u1
        pd += S
    flint.ctx.prec = bits
    return D.to_list(0, nsteps), None


def _cf_coefficients(g, nsteps, tol, cplx, final_bits=None, ar=None):
    """d_1..d_nsteps of the corresponding fraction of g (list of numbers of
    the backend ``ar``, default Arb balls; g[0] != 0).

    Returns (d, terminated_at): if the remainder u_k vanishes (to ``tol``
    relative to the terms that cancelled to form it) the fraction terminates
    and d has k - 1 entries. Raises _Block(k) at a singular block.

    Precision schedule: errors made at step k are amplified only by the
    steps after it, and the loss per step is roughly constant, so the
    working precision is lowered linearly from the current flint precision at
    step 1 to ``final_bits`` at the last step (about halving the cost). The
    ball arithmetic still bounds the resulting error. The precision is
    rounded up to whole 64-bit limbs, so it changes only every few steps
    (setting it costs a few microseconds)."""
    ar = ar or _BALL
    start_bits = ar.get_prec()
    if (not cplx and ar is not _MPFR and _ip.available() and nsteps >= _INPLACE_MIN_STEPS
            and all(isinstance(x, flint.arb) for x in g)):
        try:
            return _cf_coefficients_inplace(g, nsteps, tol, final_bits, ar)
        except _Fallback:
            flint.ctx.prec = start_bits
    if final_bits is None or final_bits >= start_bits:
        final_bits = start_bits
    P = ar.poly(cplx)
    n = len(g)
    gp = P(g)
    ref = _norm_inf(gp)
    # the tolerance as a number of the backend once: mixing an mpf into arb
    # arithmetic costs a conversion (~15 us) at every step
    tol = ar.scalar(tol)
    cur_bits = start_bits
    if _has_zero(g[0]):
        raise _Block(0, precision=bool(_rad(g[0]) > tol * ref))
    u = (-gp).right_shift(1)     # (g0 - g)/x
    vv = gp
    vv_prev = gp
    d = []
    cheap = ref
    span = start_bits - final_bits
    for k in range(1, nsteps + 1):
        if span:
            bits = _scheduled_bits(k, nsteps, start_bits, final_bits)
            if bits != cur_bits:
                ar.set_prec(bits)
                cur_bits = bits
        if u.length() == 0:
            return d, k
        u0 = u[0]
        if ar.has_zero(u0) or abs(_mid(u0)) <= tol * cheap:
            # possible termination or block: decide with the full norms
            if ref is None:
                ref = max(_norm_inf(vv_prev * d[-1]), _norm_inf(vv)) if d else _norm_inf(gp)
            thr = tol * ref
            if _poly_small(u, thr):
                return d, k
            if abs(_mid(u0)) <= thr:
                raise _Block(k, precision=False)
            if ar.has_zero(u0):
                raise _Block(k, precision=True)
        dk = ar.div(u0, vv[0])
        d.append(dk)
        if k == nsteps:
            break
        dv = vv * dk
        if dv.length() > 1 and u.length() > 1:
            # size of the terms that cancel in the next u(0); the full
            # norms are only computed when that cancellation is severe
            cheap = max(abs(_mid(dv[1])), abs(_mid(u[1])))
            ref = None
        w = dv - u
        vv_prev = vv
        vv = u
        u = w.right_shift(1)
        valid = n - 1 - k        # coefficients of u_{k+1} still determined by g
        if u.length() > valid:
            u = u.truncate(valid)
    return d, None


def _poly_small(pol, thr):
    for x in pol.coeffs():
        if abs(_mid(x)) + _rad(x) > thr:
            return False
    return True


def _denominators_inplace(d, want):
    """:func:`_denominators` on real balls, in place, at the current flint
    precision: the same Arb operations (``arb_mul``, ``arb_add``, and
    ``arb_set_round`` where python-flint's polynomial sum copies a tail), so the
    same B_k bit for bit."""
    lib = _ip.lib
    bits = flint.ctx.prec
    top = max(want)
    size = top // 2 + 2
    Bm, B, T, S = _ip.Vec(size), _ip.Vec(size), _ip.Vec(size), _ip.Vec(size)
    dv = _ip.Vec.of(d[:top])
    lib.arb_set_si(Bm[0], 1)
    lib.arb_set_si(B[0], 1)
    lm = lb = 1
    out = {}
    mul, add, setr = lib._arb_vec_scalar_mul, lib._arb_vec_add, lib.arb_set_round
    P = flint.arb_poly
    if 0 in want:
        out[0] = P(B.to_list(0, lb))
    Z = _ip.ARB_SIZE
    ps, pd = S.p, dv.p
    for k in range(1, top + 1):
        # T = B + x d_k Bm: coefficient 0 is B's (plus an exact zero), then the sums
        pm, pb, pt = Bm.p, B.p, T.p
        mul(ps, pm, lm, pd, bits)
        setr(pt, pb, bits)
        both = min(lb - 1, lm)
        add(pt + Z, pb + Z, ps, both, bits)
        for i in range(both + 1, lb):
            setr(pt + i * Z, pb + i * Z, bits)
        for i in range(both, lm):
            setr(pt + (i + 1) * Z, ps + i * Z, bits)
        Bm, B, T = B, T, Bm
        lm, lb = lb, max(lb, lm + 1)
        pd += Z
        if k in want:
            out[k] = P(B.to_list(0, lb))
    return out


def _denominators(d, cplx, want, ar=None):
    """Denominators B_k of the convergents, for k in ``want``:
    ``B_k = B_{k-1} + d_k x B_{k-2}``, ``B_{-1} = B_0 = 1``; the convergent
    A_k/B_k is the staircase entry and its numerator is the truncation of
    ``g B_k`` (computed by the caller with one product). O(k) per step."""
    if (not cplx and (ar or _BALL) is not _MPFR and _ip.available() and want
            and max(want) >= _INPLACE_MIN_STEPS and max(want) <= len(d)
            and all(isinstance(x, flint.arb) and x != 0 for x in d[:max(want)])):
        return _denominators_inplace(d, want)
    P = (ar or _BALL).poly(cplx)
    Bm, B = P([1]), P([1])
    out = {}
    if 0 in want:
        out[0] = B
    top = max(want) if want else 0
    for k, dk in enumerate(d[:top], start=1):
        Bm, B = B, B + (Bm * dk).left_shift(1)
        if k in want:
            out[k] = B
    return out


def _balls(c, cplx):
    return [fb.to_acb(x) for x in c] if cplx else [fb.to_arb(x) for x in c]


def _series_recip(c, n, cplx):
    """1/c to n terms as ball list."""
    S = flint.acb_series if cplx else flint.arb_series
    old_cap = flint.ctx.cap
    flint.ctx.cap = max(n, 1)          # series length cap is global in python-flint
    try:
        r = 1 / S(list(c)[:n], prec=n)
        co = r.coeffs()
    finally:
        flint.ctx.cap = old_cap
    Z = flint.acb(0) if cplx else flint.arb(0)
    return (list(co) + [Z] * n)[:n]


def _log2_abs(x):
    """log2 of |x| for an arf (to within one unit), -inf for zero."""
    m, e = x.man_exp()
    m = int(m)
    if m == 0:
        return -math.inf
    return (abs(m).bit_length() + int(e))


def _rel_digits(poly_coeffs):
    """Normwise correct digits of a list of balls (rounded down by one bit)."""
    big = -math.inf
    rad = -math.inf
    for z in poly_coeffs:
        parts = (z.real, z.imag) if isinstance(z, flint.acb) else (z,)
        for x in parts:
            big = max(big, _log2_abs(x.mid()))
            rad = max(rad, _log2_abs(x.rad()))
    if rad == -math.inf:
        return math.inf
    if big == -math.inf:
        return 0.0
    return max(0.0, (big - rad - 2) * 0.30102999566398120)


def _ldexp(x, n):
    """x * 2^n exactly, for mpf and mpc (and 0)."""
    if isinstance(x, mpmath.mpc):
        re, im = x._mpc_
        return mpmath.mp.make_mpc((mpmath.libmp.mpf_shift(re, n), mpmath.libmp.mpf_shift(im, n)))
    if isinstance(x, mpmath.mpf):
        return mpmath.mp.make_mpf(mpmath.libmp.mpf_shift(x._mpf_, n))
    return mpmath.ldexp(mpmath.mpmathify(x), n)


def _scale_exponent(c):
    """Power-of-two rescaling x -> 2^s x that balances |c_k| (exactly
    representable, so rescaling loses no bit)."""
    nz = [(k, x) for k, x in enumerate(c) if not _is_zero(x)]
    if len(nz) < 2:
        return 0
    (k0, a0), (k1, a1) = nz[0], nz[-1]
    with mpmath.workprec(64):
        la = mpmath.log(abs(mpmath.mpmathify(a0)), 2)
        lb = mpmath.log(abs(mpmath.mpmathify(a1)), 2)
    return int(round(-float(lb - la) / (k1 - k0)))


class _Staircase:
    """All [M+d/M] (d >= 0) or [M/M+|d|] (d < 0) of one series from one run
    of the recursion, at one precision. ``entries[m]`` = (p_balls, q_balls)
    for m = min(L, M); entries past a singular block are missing."""

    def __init__(self, f, d, cplx, tol, Mmax, only=None, final_bits=None, ar=None):
        ar = ar or _BALL
        self.d = d
        self.cplx = cplx
        n = len(f)
        self.ok_upto = -1        # largest M available from the recursion
        self.entries = {}
        self.broken_at = None
        self.precision_block = False
        self.terminated = None
        e = abs(d)
        if d >= 0:
            base = f
        else:
            if _has_zero(f[0]):
                return
            base = ar.recip(f, n, cplx)
        g = base[e:]
        Mmax = min(Mmax, (len(g) - 1) // 2)
        if Mmax < 0:
            return
        bits = ar.get_prec()
        try:
            dcoef, term = _cf_coefficients(g, 2 * Mmax, tol, cplx, final_bits, ar)
        except _Block as b:
            ar.set_prec(bits)
            self.broken_at = b.k
            self.precision_block = b.precision
            term = None
            dcoef = []
            if b.k > 1:
                dcoef, term = _cf_coefficients(g, b.k - 1, tol, cplx, final_bits, ar)
        ar.set_prec(bits if final_bits is None else max(final_bits, 64))
        self.terminated = term
        lastk = len(dcoef)
        P = ar.poly(cplx)
        Ms = range(Mmax + 1) if only is None else [m for m in only if 0 <= m <= Mmax]
        want = set(min(2 * m, lastk) for m in Ms)
        dens = _denominators(dcoef, cplx, want, ar)
        basepoly = P(base)
        for M in Ms:
            k = 2 * M
            if k <= lastk:
                B = dens[k]
            elif term is not None:
                B = dens[lastk]   # the fraction terminated: g is rational
            else:
                continue
            # the other polynomial is the truncated product with the series
            if d >= 0:
                qb = B
                pb = (basepoly.truncate(M + e + 1) * B).truncate(M + e + 1)
            else:
                pb = B
                qb = (basepoly.truncate(M + e + 1) * B).truncate(M + e + 1)
            inv0 = 1 / qb[0]
            self.entries[M] = (pb * inv0, qb * inv0)
            self.ok_upto = M


def _trim_balls(pol, L, tol):
    """Drop trailing coefficients that are zero to the accuracy (ball contains
    zero) or to the tolerance (relative to the largest coefficient)."""
    co = list(pol.coeffs())[:L + 1]
    if not co:
        return pol
    if isinstance(pol, _MPoly):
        tol = _MPFR.scalar(tol)
    big = max(abs(_mid(x)) for x in co)
    while len(co) > 1 and (_has_zero(co[-1]) or abs(_mid(co[-1])) <= tol * big):
        co.pop()
    return type(pol)(co)


def _ball_poly_to_list(pol, L):
    co = pol.coeffs()
    if isinstance(pol, _MPoly):
        conv = _gmp_to_mp
    else:
        conv = fb.acb_to_mpc if isinstance(pol, flint.acb_poly) else fb.arb_to_mpf
    out = [conv(x) for x in co[:L + 1]]
    return out or [mpmath.mpf(0)]


def _prepare_inexact(c, n):
    """Deflation, scale and ball conversion shared by pade and pade_table."""
    cplx = fb.is_complex_list(c[:n])
    v, s = _deflation(c[:n])
    return cplx, v, s


def _tolerance(dps, input_digits, tol):
    if tol is not None:
        return mpmath.mpf(tol)
    d = input_digits if input_digits is not None else dps
    return mpmath.mpf(10) ** (-d)


def _finish_inexact(pb, qb, L, M, requested, v, s, sc, digits, dps, method, diag):
    """Ball polynomials of the deflated, scaled problem -> PadeApprox."""
    pt = _trim_balls(pb, L, diag.get("tol", 0))
    qt = _trim_balls(qb, M, diag.get("tol", 0))
    # a trailing coefficient dropped as below the tolerance is an error of its own size: the
    # digits claimed cannot exceed it (log(1+x)/x at [40/40] asked for 30 digits: p_40 / max|p|
    # = 2.7e-31 was dropped and 70.7 digits claimed)
    for full, cut in ((pb, pt), (qb, qt)):
        co = list(full.coeffs())          # Arb polynomials and _MPoly alike
        kept = len(cut.coeffs())
        if kept < len(co) and co:
            big = max(abs(_mid(x)) for x in co)
            gone = max(abs(_mid(x)) for x in co[kept:])
            if big > 0 and gone > 0:
                digits = min(digits, max(0.0, -math.log10(float(gone / big))))
    p = _ball_poly_to_list(pt, L)
    q = _ball_poly_to_list(qt, M)
    return _assemble(p, q, requested, v, s, sc, digits, dps, method, diag)


def _assemble(p, q, requested, v, s, sc, digits, dps, method, diag):
    L0, M0 = requested
    # unscale: coefficient k of the scaled problem multiplies (2^sc x^s)^k
    if sc:
        p = [_ldexp(a, -sc * k) for k, a in enumerate(p)]
        q = [_ldexp(b, -sc * k) for k, b in enumerate(q)]
    p = [mpmath.mpf(0)] * v + _inflate(p, s)
    q = _inflate(q, s)
    p = [mpmath.mpf(0) if _is_zero(a) else a for a in p]
    q = [mpmath.mpf(0) if _is_zero(b) else b for b in q]
    p, q = _trim(p), _trim(q)
    diag = dict(diag)
    diag.update({"deflation": (v, s), "scale_exponent": sc})
    if digits < dps:
        diag["message"] = (f"only {digits:.1f} of the {dps} requested digits earned "
                           "(precision cap or input accuracy reached)")
    return PadeApprox(tuple(p), tuple(q), len(p) - 1, len(q) - 1, (L0, M0), M0 - (len(q) - 1),
                      digits, False, method, dps, diag)


def _inexact_problem(c, L, M):
    """Reduce [L/M] of c to [Lg/Mg] of g (deflated, scaled, as mpmath list)."""
    n = L + M + 1
    cc = c[:n]
    v, s = _deflation(cc)
    if v > L or all(_is_zero(x) for x in cc[:L + 1]):
        return None
    g = cc[v::s]
    Lg, Mg = (L - v) // s, M // s
    g = g[:Lg + Mg + 1]
    sc = _scale_exponent(g)
    if sc:
        g = [x if _is_zero(x) else _ldexp(x, sc * k) for k, x in enumerate(g)]
    return g, Lg, Mg, v, s, sc


def _perturbed(g, input_digits, seed=12345):
    """The input perturbed by random relative amounts 10^-input_digits."""
    from ..context import workdps
    rng = random.Random(seed)
    out = []
    with workdps(int(input_digits) + 40):     # the perturbation, not rounding, must dominate
        eps = mpmath.mpf(10) ** (-input_digits)
        for x in g:
            if x == 0:
                out.append(x)
            else:
                out.append(x * (1 + eps * (2 * rng.random() - 1)))
    return out


def _coeff_diff_digits(p1, p2):
    """Normwise digits of agreement of two coefficient lists."""
    n = max(len(p1), len(p2))
    a = list(p1) + [0] * (n - len(p1))
    b = list(p2) + [0] * (n - len(p2))
    mx = max(abs(x) for x in a) or mpmath.mpf(1)
    df = max(abs(x - y) for x, y in zip(a, b))
    if df == 0:
        return math.inf
    return max(0.0, float(mpmath.log10(mx / df)))


def _pair_agree_digits(pb, qb, p2, q2, L, M):
    """Digits to which two numerator/denominator pairs agree (the smaller of the two counts):
    the input-sensitivity estimate of :func:`pade` (the rerun with the input moved)."""
    return min(_coeff_diff_digits(_ball_poly_to_list(pb, L), _ball_poly_to_list(p2, L)),
               _coeff_diff_digits(_ball_poly_to_list(qb, M), _ball_poly_to_list(q2, M)))


def _fraction_run(g, d, Mmax, tol, cplx, prec, final_bits=None, ar=None):
    """One run of the staircase for [Mmax+d/Mmax] (d >= 0) or [Mmax/Mmax-d].
    Returns ((p, q, certified digits), False), or (None, precision_block)
    when a singular block stops it. On the MPFR backend nothing is
    certified: the digits are None and a block is never a precision block."""
    ar = ar or _BALL
    with ar.precision(prec):
        st = _Staircase(ar.convert(g, cplx), d, cplx, tol, Mmax, only=[Mmax],
                        final_bits=final_bits, ar=ar)
        ent = st.entries.get(Mmax)
        if ent is None:
            return None, st.precision_block
        pb, qb = ent
        if ar is not _BALL:
            return (pb, qb, None), False
        cert = min(_rel_digits(pb.coeffs()), _rel_digits(qb.coeffs()))
        return (pb, qb, cert), False


#: Digits lost per unit of M by the recursion in plain MPFR arithmetic: about
#: what the Toeplitz system's conditioning costs (1.5 measured at [100/100]
#: of log(1+x)/x, studies/performance/radius_vs_midpoint.py), plus a little.
RERUN_GROWTH = 1.6

#: Extra digits of the second run of the rerun check (module Notes).
_RERUN_MARGIN = 20


def _fraction_rerun(g, Lg, Mg, dps, tol, cplx, max_prec_bits):
    """One approximant by the recursion on MPFR numbers, checked by a rerun.

    Runs the staircase at ``lo`` bits and at ``hi = lo + _RERUN_MARGIN``
    digits' worth of bits and compares: the claim is the normwise digits on
    which the two runs agree, minus one, never more than the ``lo`` run
    carries; the ``hi`` run is returned. If fewer than ``dps`` digits agree,
    ``lo`` is raised by the shortfall and both runs repeated. Returns
    (p, q, digits, hi_bits, lo_bits, agree) with p, q as _MPoly, or None at
    a singular block (the caller falls back as for the ball recursion)."""
    n = Lg + Mg + 1
    lo = fb.prec_for_dps(dps + guard_digits_for_pade(n, dps, growth=RERUN_GROWTH))
    margin = fb.prec_for_dps(_RERUN_MARGIN) - 8
    d = Lg - Mg
    Mmax = Mg if d >= 0 else Lg
    while True:
        hi = lo + margin
        r1, _ = _fraction_run(g, d, Mmax, tol, cplx, lo, ar=_MPFR)
        r2, _ = _fraction_run(g, d, Mmax, tol, cplx, hi, ar=_MPFR)
        if r1 is None or r2 is None:
            return None
        (p1, q1, _), (p2, q2, _) = r1, r2
        if p1.length() != p2.length() or q1.length() != q2.length():
            agree = 0.0         # the runs ended the fraction at different steps
        else:
            with _MPFR.precision(hi):      # read every bit out of both runs
                agree = min(_gmp_agree_digits(p1.coeffs(), p2.coeffs()),
                            _gmp_agree_digits(q1.coeffs(), q2.coeffs()))
        digs = min(agree - 1, (lo - 8) * 0.30102999566398120)
        if digs >= dps or hi >= max_prec_bits:
            return p2, q2, max(0.0, digs), hi, lo, agree
        lo = min(max_prec_bits - margin, lo + int(3.3219 * (1.1 * (dps - digs) + 10)))


#: Digits lost per unit of M by the recursion on midpoints (:class:`_MidArith`):
#: the conditioning of the Toeplitz system (1.5 at [100/100] of log(1+x)/x)
#: plus a little; the plan of the residual check.
RESIDUAL_GROWTH = 1.75

#: Digits held back from the residual estimate: it is first order in the
#: error and uses an inverse built from the computed denominators.
_RESIDUAL_SAFETY = 1.0


def _top_bits(vals):
    """log2 of the largest |midpoint| among balls (0 if all vanish): :func:`_norm_inf` of a list."""
    top = _norm_inf(vals)
    return _log2_abs(top.mid()) if top != 0 else 0


def _rev_times(b, r, n, P):
    """``U(b) r`` for the upper triangular Toeplitz matrix with first row b:
    ``w_i = sum_{j >= i} b_(j-i) r_j``, as one polynomial product."""
    co = (P(list(b[:n])) * P(list(reversed(r[:n])))).coeffs()
    co = co + [r[0] * 0] * (n - len(co))
    return [co[n - 1 - i] for i in range(n)]


def _residual_digits(h, L, M, q, q1, cplx, bits, hb=None):
    """A posteriori digits of the [L/M] approximant with denominator ``q``
    (q(0) = 1) of the series ``h``, given also the denominator ``q1`` of
    [L-1/M] (both lists of exact numbers, midpoints of the recursion).

    The denominator solves ``T q = rho e_0`` with the (M+1) x (M+1) Toeplitz
    matrix ``T_ij = h_(L+i-j)``; the residual ``r = T q`` (rows 1..M should
    vanish) is computed in ball arithmetic at ``bits`` plus 64 bits, and the
    first-order error of q is ``z = T^-1 (0, r_1, .., r_M)``, renormalised to
    q(0) = 1. ``T^-1`` is applied through the Gohberg-Semencul formula, whose
    generators are the first and last columns of ``T^-1``: ``q / rho`` and
    ``q1 / s`` with ``s = (T q1)_M`` (I. C. Gohberg and A. A. Semencul, Mat.
    Issled. 7 (1972) 201-223; the form ``x_0 T^-1 = L(x) U(Jy) - L(Zy) U(ZJx)``
    of G. Heinig and K. Rost, *Algebraic Methods for Toeplitz-like Matrices
    and Operators*, Birkhauser (1984)), i.e. four polynomial products at low
    precision. The numerator's error follows as ``(h z)`` truncated.

    ``hb``: the first ``L + M + 1`` coefficients already as (exact) balls.

    Returns (p as ball list, digits): digits normwise, as ``PadeApprox.digits``.
    It is an estimate, not a bound: first order in the error, and the inverse
    is built from computed generators (accurate to the digits they carry, far
    more than the one digit the estimate needs)."""
    P = flint.acb_poly if cplx else flint.arb_poly
    n = L + M + 1
    hb = _balls(h[:n], cplx) if hb is None else hb[:n]
    with fb.flint_prec(bits + 64):
        H = P(hb)
        Q = P(q)
        hq = (H * Q).coeffs()
        hq = hq + [hq[0] * 0] * (n + 1 - len(hq))
        p = hq[:L + 1]
        r = [hq[L + i] for i in range(M + 1)]
        s = sum((hb[L + M - j] * q1[j] for j in range(len(q1)) if L + M - j >= 0), hb[0] * 0)
    rho = r[0]
    if _has_zero(rho) or _has_zero(s):
        return p, 0.0
    rr = [r[0] * 0] + r[1:]
    # Start where the Gohberg-Semencul products can resolve T^-1 r: their terms
    # are about |q| |q1| |h| / |s| times |r| (the conditioning of T), so a ball
    # at fewer bits than log2 of that holds no bit of the result (at [100/100]
    # of log(1+x)/x: 128 and 256 bits fail, 512 hold; starting there saves two
    # rounds of the loop below, a fifth of the check's time).
    lo = min(bits, max(128, 64 * -(-(_top_bits(q) + _top_bits(q1) + _top_bits(hb)
                                      - _top_bits([s]) + 96) // 64)))
    prev = None
    while True:
        with fb.flint_prec(lo):
            x = [xi / rho for xi in q] + [rho * 0] * (M + 1 - len(q))
            y = [yi / s for yi in q1] + [s * 0] * (M + 1 - len(q1))
            Jy = list(reversed(y))
            Zy = [y[0] * 0] + y[:-1]
            ZJx = [x[0] * 0] + list(reversed(x))[:-1]
            w1 = _rev_times(Jy, rr, M + 1, P)
            w2 = _rev_times(ZJx, rr, M + 1, P)
            z = ((P(x) * P(w1)).truncate(M + 1) - (P(Zy) * P(w2)).truncate(M + 1)) * rho
            zc = z.coeffs() + [rho * 0] * (M + 1 - z.length())
            dq = [zi - zc[0] * qi for zi, qi in zip(zc, list(q) + [0] * (M + 1 - len(q)))]
            dp = (H * P(dq)).truncate(L + 1).coeffs() if any(not _has_zero(t) for t in dq) else []
            errq = max((abs(_mid(t)) + _rad(t) for t in dq), default=0)
            big_dq = max((abs(_mid(t)) for t in dq), default=0)
            rad_dq = max((_rad(t) for t in dq), default=0)
            errp = max((abs(_mid(t)) + _rad(t) for t in dp), default=0) + \
                max(_rad(t) for t in p)
        # done when the balls hold a bit, or when more bits no longer shrink them: then
        # the radius is the residual's own (it lies at the rounding level of its
        # product) and mid + rad is the estimate
        if rad_dq <= big_dq or lo >= bits or (prev is not None and rad_dq * 2 ** 16 > prev):
            break
        prev = rad_dq
        lo = min(bits, 2 * lo)
    nq = max(abs(_mid(t)) for t in q)
    npv = max(abs(_mid(t)) for t in p)
    digs = []
    for err, nrm in ((errq, nq), (errp, npv)):
        if err == 0:
            digs.append((bits - 8) * 0.30102999566398120)
        elif nrm == 0:
            digs.append(0.0)
        else:
            digs.append(float(mpmath.log10(fb.arb_to_mpf(nrm) / fb.arb_to_mpf(err))))
    dig = min(min(digs) - _RESIDUAL_SAFETY, (bits - 8) * 0.30102999566398120)
    return p, max(0.0, dig)


def _fraction_residual(g, Lg, Mg, dps, tol, cplx, max_prec_bits, start=None):
    """One approximant by the recursion on midpoints (:class:`_MidArith`),
    its digits estimated from the residual (:func:`_residual_digits`).

    Precision schedule as in :func:`_fraction_one`, planned at
    :data:`RESIDUAL_GROWTH` digits per M instead of the radii's 4.2; raised by
    the shortfall and rerun if the estimate falls short of ``dps``. Returns
    (p_balls, q_balls, digits, prec) or None (L < M, M = 0, a singular block
    or a terminating fraction: the caller falls back to the ball recursion).
    ``start``: begin at these bits instead of the plan (the input-sensitivity
    rerun repeats the first run's precision)."""
    if Lg < Mg or Mg < 1:
        return None
    e = Lg - Mg
    n = 2 * Mg + 1
    gb = _balls(g[:e + n], cplx)      # exact balls: converted once for the recursion and the check
    prec = start or fb.prec_for_dps(dps + guard_digits_for_pade(n, dps, growth=RESIDUAL_GROWTH))
    final = min(prec, fb.prec_for_dps(dps + _FINAL_MARGIN))
    P = flint.acb_poly if cplx else flint.arb_poly
    while True:
        with fb.flint_prec(prec):
            try:
                dcoef, term = _cf_coefficients(gb[e:], 2 * Mg, tol, cplx, final, _MID)
            except _Block:
                return None
            if term is not None or len(dcoef) < 2 * Mg:
                return None
            flint.ctx.prec = max(final, 64)
            dens = _denominators(dcoef, cplx, {2 * Mg - 1, 2 * Mg}, _MID)
            q = [t.mid() for t in dens[2 * Mg].coeffs()]
            q1 = [t.mid() for t in dens[2 * Mg - 1].coeffs()]
        if not q or q[0] != 1:        # B_k(0) = 1 exactly by the recurrence
            return None
        pl, digs = _residual_digits(g, Lg, Mg, q, q1, cplx, prec, gb)
        if digs >= dps or prec >= max_prec_bits:
            break
        delta = int(3.3219 * (1.1 * (dps - digs) + 10))
        prec = min(max_prec_bits, prec + delta)
        final = min(prec, final + delta)
    with fb.flint_prec(prec):
        return P(pl), P(q), digs, prec


def _fraction_one(g, Lg, Mg, dps, tol, cplx, max_prec_bits, growth=None):
    """One approximant by the recursion with adaptive precision.

    The ball radii bound the rounding error rigorously (and, measured against
    exact rational references, overestimate it by only a few digits), so one
    run suffices when the precision plan is right; otherwise the precision is
    raised by the measured loss and the run repeated. Returns (p_balls,
    q_balls, digits, prec) or None if blocked."""
    n = Lg + Mg + 1
    guard = guard_digits_for_pade(n, dps, growth=growth)
    prec = fb.prec_for_dps(dps + guard)
    d = Lg - Mg
    Mmax = Mg if d >= 0 else Lg
    final = fb.prec_for_dps(dps + _FINAL_MARGIN)
    while True:
        r, pblock = _fraction_run(g, d, Mmax, tol, cplx, prec, final)
        if r is None:
            if pblock and prec < max_prec_bits:
                prec = min(max_prec_bits, 2 * prec)
                continue
            return None
        pb, qb, digs = r
        if digs >= dps or prec >= max_prec_bits:
            return pb, qb, digs, prec
        # short by (dps - digs) digits: raise both ends of the schedule
        delta = int(3.3219 * (1.1 * (dps - digs) + 10))
        prec = min(max_prec_bits, prec + delta)
        final = min(prec, final + delta)


def pade(c: Sequence, L: int, M: int, dps: int, *, input_digits: Optional[float] = None,
         tol=None, method: str = "auto", max_prec_bits: Optional[int] = None,
         growth: Optional[float] = None, check: str = "ball") -> PadeApprox:
    """The [L/M] Padé approximant of the series with coefficients ``c``.

    Parameters
    ----------
    c : sequence
        Coefficients low to high (int, Fraction, float, mpf, mpc);
        ``len(c) >= L + M + 1``; only the first ``L + M + 1`` are used.
    L, M : int
        Numerator and denominator degrees.
    dps : int
        Correct significant digits wanted in the coefficients of p and q.
    input_digits : float, optional
        Digits the inexact coefficients carry (None: treat them as exact
        to ``dps``). Sets the tolerance of the degree reduction and turns on
        the input-sensitivity estimate in ``digits``.
    tol : float or mpf, optional
        Relative tolerance of the degree reduction (default
        ``10**-input_digits`` or ``10**-dps``).
    method : {'auto', 'exact', 'fraction', 'svd'}
        Force one construction (module docstring); 'auto' picks 'exact' for
        int/Fraction input, otherwise 'fraction', then (at a singular block)
        a ball LU solve of the Toeplitz system ('lu', O(M^3) in C), then
        'svd' if that system is singular too.
    max_prec_bits : int, optional
        Cap on the working precision (default: the larger of 8 x the bits of
        ``dps`` + 1024 and twice the precision plan). If the cap is reached
        before ``dps`` digits are earned, the result says so in ``digits``.
    growth : float, optional
        Digits lost per unit of M assumed by the precision plan
        (:func:`guard_digits_for_pade`); the precision is raised anyway if
        the estimate shows fewer than ``dps`` digits.
    check : {'ball', 'rerun', 'residual'}
        How the recursion's digits are earned (inexact input only; exact
        input is always solved exactly). 'ball' (default): the recursion
        runs in Arb ball arithmetic and ``digits`` is a rigorous bound
        (method 'fraction'). 'rerun': it runs on plain MPFR numbers (gmpy2)
        at about ``dps + 1.6 M`` digits, twice, the second time with 20 more
        digits, and ``digits`` is where the two runs agree minus one (method
        'fraction_rerun'; an estimate, not a bound, see the module Notes).
        'residual' (L >= M >= 1; otherwise as 'ball'): the recursion on ball
        midpoints at about ``dps + 1.75 M`` digits, and ``digits`` from the
        residual of the Toeplitz system pushed through its inverse
        (Gohberg-Semencul, from the computed denominators), minus one
        (method 'fraction_residual'; an estimate, see the module Notes).
        About 2-3 times faster than 'ball' at M = 200, no faster at
        M = 100. Singular blocks fall back to the same certified ball LU /
        SVD path in all three.

    Returns
    -------
    PadeApprox

    Examples
    --------
    >>> r = pade([1, 1, 1, 1, 1], 2, 2, dps=20)     # 1/(1-x): exact, reduced to [0/1]
    >>> r.p, r.q, r.defect
    ((Fraction(1, 1),), (Fraction(1, 1), Fraction(-1, 1)), 1)
    """
    _validate(c, L, M, dps)
    c = _normalise(list(c[:L + M + 1]))
    if method not in ("auto", "exact", "fraction", "svd"):
        raise ValueError(f"unknown method {method!r}; choose auto, exact, fraction or svd")
    if check not in ("ball", "rerun", "residual"):
        raise ValueError(f"unknown check {check!r}; choose ball, rerun or residual")
    exact = all(fb.is_exact(x) for x in c)
    if method == "exact" and not exact:
        raise ValueError("method='exact' needs int/Fraction coefficients")
    if exact and method in ("auto", "exact"):
        return _pade_exact(c, L, M, dps)
    if exact:
        c = [_exact_to_mp(x, dps) for x in c]
    maxp = max_prec_bits or _default_max_prec(L + M + 1, dps, growth)
    tl = _tolerance(dps, input_digits, tol)
    prob = _inexact_problem(c, L, M)
    if prob is None:
        return _zero_approx(L, M, dps, False, "fraction")
    g, Lg, Mg, v, s, sc = prob
    cplx = fb.is_complex_list(g)
    diag = {"tol": tl}
    if method in ("auto", "fraction"):
        out = None
        if check == "residual":
            ar, how = _BALL, "fraction_residual"
            out = _fraction_residual(g, Lg, Mg, dps, tl, cplx, maxp)
        if check == "rerun":
            ar, how = _MPFR, "fraction_rerun"
            out = _fraction_rerun(g, Lg, Mg, dps, tl, cplx, maxp)
            if out is not None:
                pb, qb, digs, prec, lo, agree = out
                out = pb, qb, digs, prec
                diag["rerun"] = {"prec_bits": (lo, prec), "agree_digits": agree}
        elif out is None:
            ar, how = _BALL, "fraction"
            out = _fraction_one(g, Lg, Mg, dps, tl, cplx, maxp, growth)
        if out is not None:
            pb, qb, digs, prec = out
            diag["prec_bits"] = prec
            if input_digits is not None:
                gp = _perturbed(g, input_digits)
                if how == "fraction_residual":
                    # the same midpoint recursion at the same precision
                    out2 = _fraction_residual(gp, Lg, Mg, 0, tl, cplx, prec, start=prec)
                else:
                    out2, _ = _fraction_run(gp, Lg - Mg, min(Lg, Mg), tl, cplx, prec, ar=ar)
                if out2 is not None:
                    with ar.precision(prec):
                        d2 = _pair_agree_digits(pb, qb, out2[0], out2[1], Lg, Mg)
                    diag["input_sensitivity_digits"] = d2
                    digs = min(digs, d2)
            with ar.precision(prec):
                return _finish_inexact(pb, qb, Lg, Mg, (L, M), v, s, sc, digs, dps,
                                       how, diag)
        if method == "fraction":
            raise ArithmeticError("the continued-fraction recursion met a singular block; "
                                  "use method='auto' or 'svd'")
        if Mg > 0:
            out = _pade_lu(g, Lg, Mg, dps, cplx, maxp)
            if out is not None:
                pb, qb, digs, prec = out
                diag["prec_bits"] = prec
                diag["note"] = "recursion met a singular block; ball LU on the Toeplitz system used"
                if input_digits is not None:
                    gp = _perturbed(g, input_digits)
                    out2 = _pade_lu(gp, Lg, Mg, dps, cplx, prec)
                    if out2 is not None:
                        with fb.flint_prec(prec):
                            d2 = _pair_agree_digits(pb, qb, out2[0], out2[1], Lg, Mg)
                        diag["input_sensitivity_digits"] = d2
                        digs = min(digs, d2)
                with fb.flint_prec(prec):
                    return _finish_inexact(pb, qb, Lg, Mg, (L, M), v, s, sc, digs, dps, "lu", diag)
        diag["note"] = "recursion met a singular block and the Toeplitz system is singular; " \
                       "SVD construction used"
    return _pade_svd(g, Lg, Mg, (L, M), v, s, sc, dps, tl, input_digits, diag)


def _pade_lu(g, L, M, dps, cplx, max_prec_bits):
    """[L/M] with q(0) = 1 from the Toeplitz system by ball LU (O(M^3) in C).
    Returns (p_balls, q_balls, digits, prec) or None when the system is
    numerically singular even at the cap (then a lower-degree or q(0) = 0
    solution is needed: the SVD construction)."""
    prec = fb.prec_for_dps(dps + guard_digits_for_pade(L + M + 1, dps, growth=1.6))
    Mat = flint.acb_mat if cplx else flint.arb_mat
    P = flint.acb_poly if cplx else flint.arb_poly
    while True:
        with fb.flint_prec(prec):
            f = _balls(g, cplx)
            Z = flint.acb(0) if cplx else flint.arb(0)
            T = Mat(M, M, [f[L + i - j] if L + i - j >= 0 else Z
                           for i in range(1, M + 1) for j in range(1, M + 1)])
            rhs = Mat(M, 1, [-f[L + i] for i in range(1, M + 1)])
            try:
                x = T.solve(rhs)
            except ZeroDivisionError:
                x = None
            if x is not None:
                qb = P([flint.acb(1) if cplx else flint.arb(1)] + [x[i, 0] for i in range(M)])
                pb = (P(f[:L + 1]) * qb).truncate(L + 1)
                digs = min(_rel_digits(pb.coeffs()), _rel_digits(qb.coeffs()))
                if digs >= dps or prec >= max_prec_bits:
                    return pb, qb, digs, prec
        if prec >= max_prec_bits:
            return None
        prec = min(max_prec_bits, 2 * prec)


def _default_max_prec(n_terms, dps, growth):
    """Precision cap: 8x the request or 2x the plan, whichever is larger."""
    plan = fb.prec_for_dps(dps + guard_digits_for_pade(n_terms, dps, growth))
    return max(8 * fb.prec_for_dps(dps) + 1024, 2 * plan)


def _exact_to_mp(x, dps):
    if isinstance(x, Fraction):
        with mpmath.workdps(dps + 20):
            return mpmath.mpf(x.numerator) / x.denominator
    return mpmath.mpf(x)


# ----------------------------------------------------------------------------
# SVD construction (Gonnet-Guettel-Trefethen)
# ----------------------------------------------------------------------------

def _ggt_mp(g, L, M, tol):
    """GGT robust Padé in mpmath at the current precision; g mp numbers.
    Returns (a, b) mp lists (b[0] = 1) or None (zero approximant)."""
    cplx = any(isinstance(x, mpmath.mpc) for x in g)
    n = L + M + 1
    g = list(g[:n])
    nrm = mpmath.sqrt(sum(abs(x) ** 2 for x in g))
    if nrm == 0 or max(abs(x) for x in g[:L + 1]) <= tol * max(abs(x) for x in g):
        return None
    ts = tol * nrm
    svd = mpmath.svd_c if cplx else mpmath.svd_r
    while True:
        if M == 0:
            return list(g[:L + 1]), [mpmath.mpf(1)]
        C = mpmath.matrix(M, M + 1)
        for i in range(M):
            for j in range(M + 1):
                k = L + 1 + i - j
                C[i, j] = g[k] if 0 <= k < n else 0
        S = svd(C, compute_uv=False)
        rho = sum(1 for i in range(len(S)) if S[i] > ts)
        if rho == M:
            break
        L -= M - rho
        M = rho
        if L < 0:
            return None
    U, S, V = svd(C, full_matrices=True, compute_uv=True)
    b = [V[M, j] for j in range(M + 1)]
    if cplx:
        b = [mpmath.conj(x) for x in b]
    a = [sum(g[i - j] * b[j] for j in range(min(i, M) + 1)) for i in range(L + 1)]
    bn = max(abs(x) for x in b)
    lam = 0
    while lam < len(b) - 1 and abs(b[lam]) <= tol * bn:
        lam += 1
    b = b[lam:]
    a = a[lam:] or [mpmath.mpf(0)]
    b0 = b[0]
    a = [x / b0 for x in a]
    b = [x / b0 for x in b]
    an = max(abs(x) for x in a) if a else 0
    bn = max(abs(x) for x in b)
    return _trim(a, tol * an), _trim(b, tol * bn)


def _pade_svd(g, Lg, Mg, requested, v, s, sc, dps, tl, input_digits, diag):
    from ..context import workdps
    n = Lg + Mg + 1
    # the SVD construction is backward stable: it loses about what the
    # Toeplitz system's conditioning costs (~1.6 digits per unit of M)
    guard = guard_digits_for_pade(n, dps, growth=1.6)
    w1 = dps + guard
    with workdps(w1):
        gg = [mpmath.mpmathify(x) for x in g]
        r1 = _ggt_mp(gg, Lg, Mg, tl)
    if r1 is None:
        return _zero_approx(*requested, dps, False, "svd")
    with workdps(w1 + 20 + w1 // 4):
        gg = [mpmath.mpmathify(x) for x in g]
        r2 = _ggt_mp(gg, Lg, Mg, tl)
    if r2 is None or len(r2[1]) != len(r1[1]) or len(r2[0]) != len(r1[0]):
        digs = 0.0
        diag["note2"] = "degree reduction differs between precisions"
    else:
        with workdps(w1 + 20):
            digs = min(_coeff_diff_digits(r1[0], r2[0]), _coeff_diff_digits(r1[1], r2[1]))
    if input_digits is not None:
        with workdps(w1):
            gp = _perturbed([mpmath.mpmathify(x) for x in g], input_digits)
            r3 = _ggt_mp(gp, Lg, Mg, tl)
            if r3 is not None and len(r3[1]) == len(r1[1]) and len(r3[0]) == len(r1[0]):
                d3 = min(_coeff_diff_digits(r1[0], r3[0]), _coeff_diff_digits(r1[1], r3[1]))
            else:
                d3 = 0.0
        diag["input_sensitivity_digits"] = d3
        digs = min(digs, d3)
    diag["prec_digits"] = w1
    a, b = (r2 if r2 is not None else r1)
    with workdps(w1):
        return _assemble(a, b, requested, v, s, sc, min(digs, float(w1)), dps, "svd", diag)


# ----------------------------------------------------------------------------
# the near-diagonal table
# ----------------------------------------------------------------------------

def pade_table(c: Sequence, dps: int, offsets=(-2, -1, 0, 1, 2), min_order: int = 0,
               max_order: Optional[int] = None, *, input_digits: Optional[float] = None,
               tol=None, growth: Optional[float] = None) -> dict:
    """All [L/M] with ``L - M`` in ``offsets`` and ``min_order <= L + M <= max_order``.

    Parameters
    ----------
    c : sequence
        Coefficients low to high.
    dps : int
        Digits wanted in the coefficients (as in :func:`pade`).
    offsets : iterable of int
        Diagonals ``L - M`` to build.
    min_order, max_order : int
        Range of ``L + M`` (default up to ``len(c) - 1``).
    input_digits, tol
        As in :func:`pade`.

    Returns
    -------
    dict
        ``{(L, M): PadeApprox}``, ordered from the highest ``L + M`` down
        (ties: by offset).

    Notes
    -----
    Each diagonal comes from one run of the continued-fraction recursion
    (O(N^2) operations for the whole diagonal; see the module docstring),
    in ball arithmetic at a precision set by :func:`guard_digits_for_pade`
    and raised if the radii of the highest entry show too few digits.
    Entries the recursion cannot reach (singular blocks) are computed one by
    one with :func:`pade` (exact or SVD construction). Exact input uses the
    exact construction for every entry.

    Examples
    --------
    >>> from mpmath import mpf
    >>> with mpmath.workdps(30):
    ...     c = [mpf(1) / (k + 1) for k in range(9)]       # -log(1-x)/x
    >>> t = pade_table(c, dps=20, offsets=(0, 1), min_order=6)
    >>> [(k, a.method) for k, a in t.items()]
    [((4, 4), 'fraction'), ((4, 3), 'fraction'), ((3, 3), 'fraction')]
    """
    if not isinstance(dps, int) or dps < 1:
        raise ValueError(f"dps must be a positive integer, got {dps!r}")
    n_all = len(c)
    if n_all < 1:
        raise ValueError("no coefficients")
    top = n_all - 1 if max_order is None else min(int(max_order), n_all - 1)
    offsets = sorted(set(int(d) for d in offsets))
    wanted = []
    for n in range(top, min_order - 1, -1):
        for d in offsets:
            if (n + d) % 2:
                continue
            L = (n + d) // 2
            M = (n - d) // 2
            if L >= 0 and M >= 0:
                wanted.append((L, M))
    c = _normalise(list(c[:top + 1]))
    exact = all(fb.is_exact(x) for x in c)
    out = {}
    if exact:
        for L, M in wanted:
            out[(L, M)] = pade(c, L, M, dps)
        return out
    tl = _tolerance(dps, input_digits, tol)
    v, s = _deflation(c)
    maxp = _default_max_prec(len(c), dps, growth)
    done = {}
    if s == 1 and v == 0 and c[0] != 0:
        cplx = fb.is_complex_list(c)
        sc = _scale_exponent(c)
        g = [x if _is_zero(x) else _ldexp(x, sc * k) for k, x in enumerate(c)]
        guard = guard_digits_for_pade(len(g), dps, growth)
        for d in offsets:
            prec = fb.prec_for_dps(dps + guard)
            final = fb.prec_for_dps(dps + 60)
            entries = [(L, M) for (L, M) in wanted if L - M == d]
            if not entries:
                continue
            Mtop = max(min(L, M) for L, M in entries)
            while True:
                with fb.flint_prec(prec):
                    st = _Staircase(_balls(g, cplx), d, cplx, tl, Mtop,
                                    only=[min(L, M) for L, M in entries], final_bits=final)
                    res = {}
                    worst = math.inf
                    for L, M in entries:
                        m = min(L, M)
                        if m in st.entries:
                            pb, qb = st.entries[m]
                            digs = min(_rel_digits(pb.coeffs()), _rel_digits(qb.coeffs()))
                            worst = min(worst, digs)
                            res[(L, M)] = (pb, qb, digs)
                if prec >= maxp:
                    break
                if st.precision_block and len(res) < len(entries):
                    prec = min(maxp, 2 * prec)
                    continue
                if worst >= dps or not res:
                    break
                delta = int(3.3219 * (1.1 * (dps - worst) + 10))
                prec = min(maxp, prec + delta)
                final = min(prec, final + delta)
            with fb.flint_prec(prec):
                for (L, M), (pb, qb, digs) in res.items():
                    done[(L, M)] = _finish_inexact(pb, qb, L, M, (L, M), 0, 1, sc, digs, dps,
                                                   "fraction", {"prec_bits": prec, "tol": tl})
    for L, M in wanted:
        if (L, M) in done:
            out[(L, M)] = done[(L, M)]
        else:
            out[(L, M)] = pade(c, L, M, dps, input_digits=input_digits, tol=tol, growth=growth)
    return out


# ----------------------------------------------------------------------------
# double precision
# ----------------------------------------------------------------------------

def pade_fp(c, L: int, M: int, tol: float = 1e-14) -> PadeApprox:
    """[L/M] in double precision by the SVD construction of Gonnet, Güttel and
    Trefethen (numpy); fast and uncertified (``digits`` is NaN), for scans.

    Examples
    --------
    >>> r = pade_fp([1.0, 1.0, 0.5, 1 / 6, 1 / 24], 2, 2)
    >>> round(r.q[1], 12), round(r.q[2], 12)
    (-0.5, 0.083333333333)
    """
    import numpy as np
    _validate(c, L, M, 1)
    cc = np.array([complex(x) for x in c[:L + M + 1]])
    cplx = bool(np.any(cc.imag != 0))
    if not cplx:
        cc = cc.real
    requested = (L, M)
    nrm = np.linalg.norm(cc)
    if nrm == 0 or np.max(np.abs(cc[:L + 1])) <= tol * np.max(np.abs(cc)):
        return PadeApprox((0.0,), (1.0,), 0, 0, requested, M, float("nan"), False, "fp", 16)
    n = L + M + 1
    while True:
        if M == 0:
            a, b = cc[:L + 1].copy(), np.ones(1)
            break
        C = np.array([[cc[L + 1 + i - j] if 0 <= L + 1 + i - j < n else 0
                       for j in range(M + 1)] for i in range(M)])
        sv = np.linalg.svd(C, compute_uv=False)
        rho = int(np.sum(sv > tol * nrm))
        if rho == M:
            _, _, Vh = np.linalg.svd(C)
            b = Vh[-1].conj()
            # rescaled QR step for exact zeros in b (GGT 2013, sec. 5)
            D = np.diag(np.abs(b) + np.sqrt(np.finfo(float).eps))
            Q, _ = np.linalg.qr((C @ D).conj().T, mode="complete")
            b = D @ Q[:, M]
            b = b / np.linalg.norm(b)
            a = np.array([sum(cc[i - j] * b[j] for j in range(min(i, M) + 1))
                          for i in range(L + 1)])
            lam = 0
            while lam < len(b) - 1 and abs(b[lam]) <= tol:
                lam += 1
            b, a = b[lam:], (a[lam:] if lam < len(a) else np.zeros(1))
            break
        L -= M - rho
        M = rho
        if L < 0:
            return PadeApprox((0.0,), (1.0,), 0, 0, requested, requested[1], float("nan"),
                              False, "fp", 16)
    a = a / b[0]
    b = b / b[0]
    a = list(_trim(list(a), tol * (np.max(np.abs(a)) if len(a) else 0)))
    b = list(_trim(list(b), tol * np.max(np.abs(b))))
    conv = complex if cplx else float
    a = tuple(conv(x) for x in a)
    b = tuple(conv(x) for x in b)
    return PadeApprox(a, b, len(a) - 1, len(b) - 1, requested, requested[1] - (len(b) - 1),
                      float("nan"), False, "fp", 16)
