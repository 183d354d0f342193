r"""The angle-deformed BES kernel family.

For integers :math:`i, j \ge 1` let

.. math::

   K_{ij}(g) = 2j\,(-1)^{j(i+1)} \int_0^\infty \frac{dt}{t}\,
               \frac{J_i(2gt)\,J_j(2gt)}{e^t - 1},

the kernel of Beisert, Eden and Staudacher (J. Stat. Mech. (2007) P01021,
hep-th/0610251) in the matrix form of later integrability papers. Split the
indices into odd (o) and even (e) ones and, for an angle ``a``, put

.. math::

   K(a) = 2\cos a \begin{pmatrix} \cos a\,K_{oo} & \sin a\,K_{oe} \\
                                  \sin a\,K_{eo} & \cos a\,K_{ee} \end{pmatrix},
   \qquad F_a(g) = 4 g^2 \left[(1 + K(a))^{-1}\right]_{11}.

At ``a = pi/4`` this is the cusp anomalous dimension (half the BES
``f(g)``); at ``a = 0`` it is ``(2/pi^2) log cosh(2 pi g)``; ``a = pi/2``
gives ``4 g^2``. The coupling is ``g`` with ``g^2 = lambda/(16 pi^2)``.

What this module computes
-------------------------
* :func:`weak_coupling_coefficients` -- the coefficients ``c_l`` of
  ``F_a = sum_l c_l g^(2l)`` at any angle, as certified balls (python-flint
  arb): the Bessel products are expanded exactly and
  ``int_0^oo t^(s-1)/(e^t-1) dt = Gamma(s) zeta(s)``. With ``K = D M D``,
  ``D = diag(g^i)``, one has ``[(1+K)^-1]_11 = [(1 + D^2 M)^-1]_11`` and
  ``D^2 M`` is a power series in ``x = g^2`` whose row ``i`` starts at
  ``x^i``; the vector ``w = (1 + D^2 M)^-1 e_1`` is built order by order
  (a Neumann series in the order), so an ``L``-loop result needs only an
  ``(L-2) x (L-2)`` block and no truncation error arises.
* :func:`exact_weak_coefficients` -- the same coefficients exactly, as
  polynomials with rational coefficients in ``c = cos(a)^2``, ``pi^2`` and the
  odd zeta values (FLINT multivariate polynomials). Limits, about two seconds
  each: 24 loops for a symbolic angle, 30 for a rational ``cos(a)^2``, 60 at
  ``a = 0`` (pure powers of ``pi^2``); see :func:`exact_loop_limit`.
* :func:`weak_coupling_series` -- a :class:`resum.series.Series` in
  ``x = g^2``.
* :func:`finite_coupling` -- ``F_a(g)`` at finite coupling from a truncated
  matrix and Gauss-Legendre quadrature of the kernel, with the truncation
  size and the quadrature both checked.

A similarity transform ``diag(1 on odd, sin 2a on even)`` leaves the ``(1,1)``
element unchanged and makes every entry a polynomial in ``cos(a)^2``: same
parity blocks carry ``2 cos(a)^2``, the odd-even block ``1`` and the even-odd
block ``sin(2a)^2 = 4 cos(a)^2 (1 - cos(a)^2)``. Both paths use it.
"""
from __future__ import annotations

import math
from dataclasses import dataclass, field
from fractions import Fraction
from typing import Optional

import flint
import mpmath
import numpy as np

from ..context import DEFAULT, Context, bits_for, workdps
from ..errors import InputError
from ..progress import report
from ..results import Estimate, Provenance, Status, num_to_str
from ..results import longest_number
from ..series.core import Coupling, Series
from ._arb import acb_from_mpc, arb_from_mpf, arb_rad_to_mpf, arb_to_mpf, flint_prec
from ._params import number, whole

__all__ = ["weak_coupling_coefficients", "weak_coupling_series", "exact_weak_coefficients",
           "ExactCoefficient", "exact_loop_limit", "finite_coupling", "FiniteCouplingResult", "parse_angle",
           "zero_angle_closed_form", "cusp_strong_coupling", "MAX_LOOPS", "MAX_EXACT_LOOPS"]

MAX_LOOPS = 400           # cost grows like loops^4 (150 loops: ~2 s), memory like loops^3
# exact coefficients: loops allowed (about two seconds each at the limit)
MAX_EXACT_LOOPS = {"symbolic": 24, "rational": 30, "even": 60}


def exact_loop_limit(cos2=None) -> int:
    """Largest ``loops`` for :func:`exact_weak_coefficients` at this ``cos2``
    (None: symbolic angle; 0 or 1: only even zeta values appear)."""
    if cos2 is None:
        return MAX_EXACT_LOOPS["symbolic"]
    return MAX_EXACT_LOOPS["even"] if cos2 in (0, 1) else MAX_EXACT_LOOPS["rational"]
_BUCKET = 8                   # column widths of the order blocks are rounded up to this


# ----------------------------------------------------------------------------
# angle input
# ----------------------------------------------------------------------------

def parse_angle(angle, dps: int):
    """The angle as an mpf at ``dps`` digits (radians).

    Accepts a number (int, Fraction, float, mpf) or an expression string such
    as ``"pi/3"`` or ``"0.7"``. Decimal literals and floats are taken as exact
    (``"0.7"`` means 7/10, a float its binary value); expressions are
    evaluated at ``dps`` digits and that rounding is carried into the balls
    downstream. Raises :class:`InputError` for anything else.
    """
    v = number(angle, "angle", dps, real=True)
    if abs(v) > mpmath.mpf(10) ** (dps // 2):
        # cos and sin of such an angle keep fewer than half the working digits
        raise InputError(f"angle: {angle!r} is too large to take its cosine at {dps} digits; "
                         "give it reduced modulo 2 pi")
    return v


def _angle_factors(angle_mpf, bits, dps):
    """arb balls (alpha, beta2) = (2 cos^2 a, sin^2 2a) at ``bits``.

    The angle was evaluated to ``dps`` digits; that rounding is put into the ball.
    """
    with flint_prec(bits), workdps(dps + 5):
        rad = abs(angle_mpf) * mpmath.mpf(10) ** (-dps) if angle_mpf else 0
        a = arb_from_mpf(angle_mpf, rad)
        c = a.cos()
        s = a.sin()
        alpha = 2 * c * c
        beta2 = (2 * s * c) ** 2
    return alpha, beta2


def _rational_cos2(angle_mpf, max_den=10000):
    """cos(a)^2 as a Fraction if it is one with a small denominator (to all digits)."""
    c2 = mpmath.cos(angle_mpf) ** 2
    f = Fraction(str(mpmath.nstr(c2, mpmath.mp.dps))).limit_denominator(max_den)
    if abs(mpmath.mpf(f.numerator) / f.denominator - c2) <= mpmath.mpf(10) ** (-mpmath.mp.dps + 5):
        return f
    return None


# ----------------------------------------------------------------------------
# weak coupling: numeric (balls)
# ----------------------------------------------------------------------------

def _factorials(m):
    fact = [flint.arb(1)]
    for k in range(1, m + 1):
        fact.append(fact[-1] * k)
    return fact


def _weak_arb(loops: int, alpha, beta2):
    """c_1..c_loops as arb balls at the current flint precision."""
    P = loops - 1
    if P == 0:
        return [flint.arb(4)]
    N = max(1, P - 1)
    maxn = 3 * P + 2 * _BUCKET + 4
    fact = _factorials(maxn)
    invf = [1 / f for f in fact]
    A = [flint.arb(0), flint.arb(0)] + [fact[n] * fact[n - 1] * flint.arb(n).zeta()
                                        for n in range(2, maxn + 1)]
    two_j = [flint.arb(2 * j) for j in range(maxn + 1)]
    same = [alpha * two_j[j] for j in range(maxn + 1)]
    cross = [-(beta2 * two_j[j]) for j in range(maxn + 1)]
    blocks, width = {}, {}
    # progress: the blocks take about 30 % of the time (measured at 100 and 200 loops), the
    # products the rest, each step of s costing about P - s block products
    work1 = sum(min(q, N) * min(N, -(-max(1, P - q) // _BUCKET) * _BUCKET) for q in range(1, P + 1))
    done1 = 0
    for q in range(1, P + 1):
        rows = min(q, N)
        C = min(N, -(-max(1, P - q) // _BUCKET) * _BUCKET)
        width[q] = C
        done1 += rows * C
        report(0.3 * done1 / work1)
        mat = []
        for i in range(1, rows + 1):
            k = q - i
            ci = invf[k] * invf[i + k]
            if k % 2:
                ci = -ci
            ip = i % 2
            row = []
            for j in range(1, C + 1):
                v = A[i + j + 2 * k] * invf[i + j + k] * invf[j + k] * ci
                if ip == j % 2:
                    v = v * same[j]
                elif ip == 1:
                    v = v * two_j[j]
                else:
                    v = v * cross[j]
                row.append(v)
            mat.append(row)
        blocks[q] = flint.arb_mat(mat)
    zero = flint.arb(0)
    acc = [[zero] * N for _ in range(P + 1)]
    u = []
    w = [flint.arb(1)] + [zero] * (N - 1)
    work2 = P * (P + 1) // 2
    for s in range(P):
        report(0.3 + 0.7 * (s * P - s * (s - 1) // 2) / work2)
        if s >= 1:
            w = [-a for a in acc[s]]
        u.append(w[0])
        cache = {}
        for q in range(1, P - s + 1):
            C = width[q]
            vec = cache.get(C)
            if vec is None:
                vec = cache[C] = flint.arb_mat([[x] for x in w[:C]])
            y = (blocks[q] * vec).entries()
            a = acc[s + q]
            if s + q < P:
                for i, yi in enumerate(y):
                    a[i] = a[i] + yi
            else:
                a[0] = a[0] + y[0]
    u.append(-acc[P][0])
    return [4 * x for x in u]


def weak_coupling_coefficients(angle, loops: int, ctx: Optional[Context] = None):
    """Weak-coupling coefficients of ``F_a(g) = sum_l c_l g^(2l)``.

    Parameters
    ----------
    angle : number or str
        The deformation angle ``a`` in radians (``"pi/4"`` is the cusp).
    loops : int
        Highest power ``g^(2 loops)``.
    ctx : Context
        ``ctx.dps`` is the number of correct digits wanted in each coefficient.

    Returns
    -------
    list of Estimate
        ``[c_0, c_1, ..., c_loops]`` with ``c_0 = 0``. Each band is a
        certified ball from python-flint (midpoint and radius); the only
        input error is the angle's rounding at the working precision, which is
        inside the ball.

    Examples
    --------
    >>> cs = weak_coupling_coefficients("pi/4", 3, Context(dps=20))
    >>> [str(c.value)[:12] for c in cs]
    ['0.0', '4.0', '-13.15947253', '95.244444566']

    Notes
    -----
    The working precision is raised (up to four times) until every returned
    coefficient's ball radius is below ``10^-(dps+2)`` times its midpoint, so
    rounding each to ``dps`` significant digits is correct to within one unit
    of the last digit. No truncation error: ``loops`` loops need only the
    finite ``(loops-2)``-square block.

    Applicability: any real angle, ``loops <= 400`` (cost grows like
    ``loops^4``; 150 loops at 100 digits take about two seconds).

    References
    ----------
    N. Beisert, B. Eden, M. Staudacher, J. Stat. Mech. (2007) P01021, hep-th/0610251.
    """
    ctx = ctx or DEFAULT
    loops = _check_loops(loops)
    bits = bits_for(ctx.work_dps) + 2 * int(math.log2(loops + 2))
    with ctx.working(20):
        a = parse_angle(angle, ctx.work_dps + 20)
        for attempt in range(4):
            alpha, beta2 = _angle_factors(a, bits + 64, ctx.work_dps + 20)
            with flint_prec(bits):
                cs = _weak_arb(loops, alpha, beta2)
            worst = _worst_relative_radius(cs, ctx.dps)
            if worst <= mpmath.mpf(10) ** (-(ctx.dps + 2)):
                break
            bits = int(bits * 1.5) + 64
        out = [Estimate.exact(0)]
        for k, c in enumerate(cs, start=1):
            m, r = arb_to_mpf(c), arb_rad_to_mpf(c)
            if _negligible(m, r, k, ctx.dps):
                m = mpmath.mpf(0)          # a ball around 0, e.g. every c_k, k >= 2, at a = pi/2
            out.append(Estimate(m, m - r, m + r))
    return out


def _negligible(m, r, k, dps):
    """A coefficient compatible with 0 whose ball is below 10^-dps of the natural
    size 4 * 16^(k-1) (coefficients grow like 16^k: radius |g| = 1/4)."""
    return abs(m) <= r and r <= mpmath.mpf(10) ** (-dps - 2) * 4 * mpmath.mpf(16) ** (k - 1)


def _worst_relative_radius(cs, dps):
    worst = mpmath.mpf(0)
    for k, c in enumerate(cs, start=1):
        m, r = arb_to_mpf(c), arb_rad_to_mpf(c)
        if _negligible(m, r, k, dps):
            continue
        if m == 0:
            return mpmath.inf
        worst = max(worst, r / abs(m))
    return worst


def _check_loops(loops):
    return whole(loops, "loops", 1, MAX_LOOPS, why="cost grows like loops^4")


# ----------------------------------------------------------------------------
# weak coupling: exact
# ----------------------------------------------------------------------------

def _zeta_even_rational(m2: int) -> Fraction:
    """zeta(2m) / pi^(2m) as a Fraction (from the Bernoulli numbers)."""
    m = m2 // 2
    b = Fraction(int(flint.fmpq.bernoulli(m2).p), int(flint.fmpq.bernoulli(m2).q))
    return (-1) ** (m + 1) * b * Fraction(2) ** (m2 - 1) / math.factorial(m2)


@dataclass(frozen=True)
class ExactCoefficient:
    """One exact coefficient: a polynomial with rational coefficients in
    ``c = cos(a)^2`` (absent when the angle was fixed), ``pi^2`` and the odd
    zeta values.

    ``expression()`` writes it in the syntax of
    :func:`resum.series.expr.evaluate_expression` (``pi``, ``zeta(3)``;
    the symbol ``c`` stays as ``c`` when symbolic); ``evaluate(ctx, cos2)``
    gives its value.
    """

    poly: object          # flint.fmpq_mpoly
    names: tuple          # generator names of poly's context

    def terms(self):
        """``[(Fraction, {name: power}), ...]``."""
        out = []
        for mon, coef in self.poly.terms():
            out.append((Fraction(int(coef.p), int(coef.q)),
                        {n: int(e) for n, e in zip(self.names, mon) if e}))
        return out

    def expression(self) -> str:
        parts = []
        for coef, mon in self.terms():
            fac = []
            for n, e in mon.items():
                base = {"pi2": "pi", "c": "c"}.get(n, f"zeta({n[1:]})" if n.startswith("z") else n)
                pw = 2 * e if n == "pi2" else e
                fac.append(base if pw == 1 else f"{base}^{pw}")
            num = f"{abs(coef.numerator)}" + ("" if coef.denominator == 1 else f"/{coef.denominator}")
            body = "*".join(([num] if (num != "1" or not fac) else []) + fac)
            parts.append(("-" if coef < 0 else "+") + body)
        if not parts:
            return "0"
        txt = " ".join(p[0] + " " + p[1:] for p in parts)
        return txt[2:] if txt.startswith("+ ") else "-" + txt[2:]

    def evaluate(self, ctx: Optional[Context] = None, cos2=None):
        ctx = ctx or DEFAULT
        with ctx.working():
            val = mpmath.mpf(0)
            for coef, mon in self.terms():
                t = mpmath.mpf(coef.numerator) / coef.denominator
                for n, e in mon.items():
                    if n == "pi2":
                        t *= mpmath.pi ** (2 * e)
                    elif n == "c":
                        if cos2 is None:
                            raise InputError("cos2: this coefficient is symbolic in c = cos(a)^2; "
                                             "give cos2")
                        t *= mpmath.mpmathify(cos2) ** e
                    else:
                        t *= mpmath.zeta(int(n[1:])) ** e
                val += t
            return +val

    def __str__(self):
        return self.expression()


def exact_weak_coefficients(loops: int, cos2=None):
    """Exact weak-coupling coefficients ``[c_0, ..., c_loops]``.

    Parameters
    ----------
    loops : int
    cos2 : Fraction, int or None
        ``cos(a)^2`` as an exact rational (``1/2`` is the cusp, ``1`` is
        ``a = 0``), or None to keep ``c = cos(a)^2`` as a symbol.

    Returns
    -------
    list of ExactCoefficient

    Examples
    --------
    >>> cs = exact_weak_coefficients(4, cos2=Fraction(1, 2))
    >>> [c.expression() for c in cs[1:]]
    ['4', '-4/3*pi^2', '44/45*pi^4', '-292/315*pi^6 - 32*zeta(3)^2']
    >>> exact_weak_coefficients(2)[2].expression()
    '-8/3*c*pi^2'

    Notes
    -----
    Each coefficient of ``g^(2l)`` has uniform weight ``2l - 2`` in ``pi^2``
    (weight 2) and ``zeta(n)`` (weight n). The number of monomials grows
    quickly with the order (2629 at 20 loops for a symbolic angle), and the
    recursion is done term by term in Python, so the loops are limited by
    :func:`exact_loop_limit` (24 symbolic, 30 at a rational ``cos2``, 60 at
    ``cos2`` in {0, 1}).
    """
    loops = _check_loops(loops)
    if cos2 is not None:
        try:
            cos2 = Fraction(cos2)
        except (TypeError, ValueError):
            raise InputError(f"cos2: expected an exact rational, got {cos2!r}") from None
        if not 0 <= cos2 <= 1:
            raise InputError(f"cos2: cos(a)^2 must lie in [0, 1], got {cos2}")
    even_only = cos2 is not None and cos2 in (0, 1)
    limit = exact_loop_limit(cos2)
    if loops > limit:
        raise InputError(f"loops: exact coefficients at this angle are limited to {limit} loops "
                         "(the number of zeta monomials grows fast); use the numeric series for more")
    P = loops - 1
    N = max(1, P - 1)
    odd_z = [] if even_only else list(range(3, 2 * P + 2, 2))
    names = (("c",) if cos2 is None else ()) + ("pi2",) + tuple(f"z{n}" for n in odd_z)
    R = flint.fmpq_mpoly_ctx.get(names, "lex")
    gens = dict(zip(names, R.gens()))
    one = R.from_dict({(0,) * len(names): 1})
    zero = R.from_dict({})
    if cos2 is None:
        alpha = 2 * gens["c"]
        beta2 = 4 * gens["c"] * (1 - gens["c"])
    else:
        alpha = one * flint.fmpq(2 * cos2.numerator, cos2.denominator)
        b2 = 4 * cos2 * (1 - cos2)
        beta2 = one * flint.fmpq(b2.numerator, b2.denominator)

    zcache = {}

    def zeta_poly(n):
        if n not in zcache:
            if n % 2 == 0:
                r = _zeta_even_rational(n)
                zcache[n] = gens["pi2"] ** (n // 2) * flint.fmpq(r.numerator, r.denominator)
            else:
                zcache[n] = gens[f"z{n}"]
        return zcache[n]

    fact = [1]
    for m in range(1, 4 * P + 4):
        fact.append(fact[-1] * m)
    mcache = {}

    def m_entry(i, j, k):
        key = (i, j, k)
        if key in mcache:
            return mcache[key]
        n = i + j + 2 * k
        val = None
        if not (even_only and n % 2):
            rat = Fraction(fact[n] * fact[n - 1],
                           fact[k] * fact[i + k] * fact[j + k] * fact[i + j + k]) * (2 * j) * (-1) ** k
            if i % 2 != j % 2 and i % 2 == 0:
                fac = None if beta2.is_zero() else beta2
                rat = -rat
            elif i % 2 == j % 2:
                fac = alpha
            else:
                fac = one
            if fac is not None:
                val = zeta_poly(n) * fac * flint.fmpq(rat.numerator, rat.denominator)
        mcache[key] = val
        return val

    # w[s][i] = coefficient of x^s in w_{i+1}; nz[s] lists the indices j with w_j^(s) != 0
    w = [[one] + [zero] * (N - 1)]
    nz = [[1]]
    u = [one]
    for p in range(1, P + 1):
        rows = 1 if p == P else min(p, N)
        new = []
        for i in range(1, rows + 1):
            tot = zero
            for q in range(i, p + 1):
                s = p - q
                k = q - i
                ws = w[s]
                for j in nz[s]:
                    m = m_entry(i, j, k)
                    if m is not None:
                        tot = tot + m * ws[j - 1]
            new.append(-tot)
        new += [zero] * (N - len(new))
        w.append(new)
        nz.append([j for j in range(1, N + 1) if not new[j - 1].is_zero()])
        u.append(new[0])
    out = [ExactCoefficient(zero, names)] + [ExactCoefficient(4 * x, names) for x in u]
    return out


# ----------------------------------------------------------------------------
# series
# ----------------------------------------------------------------------------

def weak_coupling_series(angle, loops: int, ctx: Optional[Context] = None,
                         exact: bool = False) -> Series:
    """The weak-coupling series of ``F_a`` in ``x = g^2`` as a :class:`Series`.

    ``coefficients[k]`` multiplies ``x^k`` from ``k = 0`` (so the first is 0);
    each is correct to ``ctx.dps`` significant digits (certified balls, see
    :func:`weak_coupling_coefficients`); ``series.digits == ctx.dps``. The
    coupling is recorded as ``g`` with ``x = g^2``. With ``exact=True`` and an
    angle whose ``cos(a)^2`` is a rational with denominator up to 10^4 (to all
    working digits), the exact coefficients (expressions in ``pi`` and
    ``zeta(n)``) are stored in ``provenance["exact_coefficients"]``; for other
    angles the symbolic form in ``c = cos(a)^2``. Exact forms cover the first
    ``provenance["exact_loops"]`` loops (see :func:`exact_loop_limit`).

    >>> s = weak_coupling_series("0", 3, Context(dps=15))
    >>> s.coupling.power, [mpmath.nstr(c, 10) for c in s.coefficients]
    (2, ['0', '4.0', '-26.31894507', '277.0747478'])
    """
    ctx = ctx or DEFAULT
    cs = weak_coupling_coefficients(angle, loops, ctx)
    with ctx.working(10):
        a = parse_angle(angle, ctx.work_dps + 10)
        angle_text = angle if isinstance(angle, str) else num_to_str(a, ctx.dps)
        prov = {"source": "bes", "angle": angle_text, "angle_value": num_to_str(a, ctx.dps + 5),
                "loops": loops, "dps": ctx.dps,
                "method": "exact Bessel-product expansion, Gamma(s) zeta(s) moments, order-by-order "
                          "Neumann series in x = g^2; python-flint balls",
                "max_relative_radius": num_to_str(max((c.error / abs(c.value) for c in cs[1:]
                                                       if c.value != 0), default=mpmath.mpf(0)), 3)}
        if exact:
            c2 = _rational_cos2(a)
            n_exact = min(loops, exact_loop_limit(c2))
            ex = exact_weak_coefficients(n_exact, cos2=c2)
            prov["exact_coefficients"] = [e.expression() for e in ex]
            prov["exact_loops"] = n_exact
            prov["exact_cos2"] = "symbolic c = cos(a)^2" if c2 is None else num_to_str(c2)
        coeffs = [0] + [c.value if c.value != 0 else 0 for c in cs[1:]]
    return Series(coeffs, variable="x", digits=ctx.dps, coupling=Coupling("g", 2, 1),
                  name=f"bes(angle={angle_text})",
                  description=f"angle-deformed BES kernel quantity F_a, a = {angle_text}, "
                              f"{loops} loops, in x = g^2",
                  provenance=prov)


# ----------------------------------------------------------------------------
# finite coupling
# ----------------------------------------------------------------------------

@dataclass(frozen=True)
class FiniteCouplingResult:
    """``F_a(g)`` at one coupling.

    ``value`` is the real part with its band; ``imag`` the imaginary part
    (None for real ``g``). ``size`` is the matrix truncation used for the
    value, ``size_check`` the smaller size it was compared with, ``nodes`` and
    ``nodes_check`` the quadrature nodes of the two rules compared.
    ``digits_agreeing`` is the number of significant digits on which the
    size comparison and the quadrature comparison both agree.

    Notes
    -----
    The band is ``2 (|F(size) - F(size_check)| + |F(rule 1) - F(rule 2)|)``
    plus a bound on the neglected tail of the ``t`` integral and the ball
    radius of the linear solve.
    Both comparisons converge exponentially, so the band overstates the error
    of the reported value in practice, but it is an estimate, not a proof: the
    Bessel values are computed by recurrence in midpoint arithmetic with guard
    digits, and the truncation error is judged from the change between sizes.
    """

    g: object
    angle: object
    success: bool
    status: Status
    message: str
    value: Optional[Estimate]
    imag: Optional[Estimate] = None
    size: int = 0
    size_check: int = 0
    nodes: int = 0
    nodes_check: int = 0
    digits_agreeing: float = 0.0
    diagnostics: dict = field(default_factory=dict)
    provenance: Optional[Provenance] = None

    def to_dict(self) -> dict:
        from ..results import jsonable
        return {"g": num_to_str(self.g), "angle": num_to_str(self.angle), "success": self.success,
                "status": self.status.value, "message": self.message,
                "value": None if self.value is None else self.value.to_dict(),
                "imag": None if self.imag is None else self.imag.to_dict(),
                "size": self.size, "size_check": self.size_check, "nodes": self.nodes,
                "nodes_check": self.nodes_check, "digits_agreeing": self.digits_agreeing,
                "diagnostics": jsonable(self.diagnostics),
                "provenance": None if self.provenance is None else self.provenance.to_dict()}

    @classmethod
    def from_dict(cls, d: dict) -> "FiniteCouplingResult":
        # parse the decimal strings at as many digits as they carry
        with workdps(longest_number(d) + 10):
            return cls._from_dict(d)

    @classmethod
    def _from_dict(cls, d: dict) -> "FiniteCouplingResult":
        from ..results import str_to_num
        est = lambda k: None if d.get(k) is None else Estimate.from_dict(d[k])  # noqa: E731
        return cls(str_to_num(d["g"]), str_to_num(d["angle"]), bool(d["success"]), Status(d["status"]),
                   d.get("message", ""), est("value"), est("imag"), int(d.get("size", 0)),
                   int(d.get("size_check", 0)), int(d.get("nodes", 0)), int(d.get("nodes_check", 0)),
                   float(d.get("digits_agreeing", 0.0)), dict(d.get("diagnostics", {})),
                   None if d.get("provenance") is None else Provenance.from_dict(d["provenance"]))


_GL_CACHE = {}


def _gauss_legendre(n: int, dps: int):
    """Nodes and weights of the n-point Gauss-Legendre rule on [-1, 1] at ``dps`` digits (n even)."""
    if n % 2:
        raise ValueError("n must be even")
    key = (n, dps)
    if key in _GL_CACHE:
        return _GL_CACHE[key]
    with workdps(dps + 10):
        xs, ws = [], []
        for k in range(1, n // 2 + 1):
            x = mpmath.cos(mpmath.pi * (k - mpmath.mpf(1) / 4) / (n + mpmath.mpf(1) / 2))
            for _ in range(100):
                p0, p1 = mpmath.mpf(1), x
                for m in range(2, n + 1):
                    p0, p1 = p1, ((2 * m - 1) * x * p1 - (m - 1) * p0) / m
                dp = n * (x * p1 - p0) / (x * x - 1)
                dx = p1 / dp
                x -= dx
                if abs(dx) < mpmath.mpf(10) ** (-(dps + 8)):
                    break
            p0, p1 = mpmath.mpf(1), x
            for m in range(2, n + 1):
                p0, p1 = p1, ((2 * m - 1) * x * p1 - (m - 1) * p0) / m
            dp = n * (x * p1 - p0) / (x * x - 1)
            wt = 2 / ((1 - x * x) * dp * dp)
            xs += [x, -x]
            ws += [wt, wt]
    _GL_CACHE[key] = (xs, ws)
    return xs, ws


def _panel_nodes(omega: float, digits: float, T: float, shrink: float, extra: int,
                 decay: float = 1.0):
    """Composite Gauss-Legendre layout: list of (a, b, n) panels on [0, T].

    ``digits`` is the absolute accuracy (``10^-digits``) wanted for the kernel
    entries. Panel half-length r is at most ``8 / omega`` (and 1); the node
    count on a panel starting at ``a`` is the smallest n with
    ``(omega r e / (4 n))^(2n)`` below ``10^-(digits - a / ln 10)`` (the
    integrand is bounded by ``e^-t / t``, since ``|J_n| <= 1`` on the real axis).
    """
    r = min(1.0, 40.0 / max(omega, 1e-30)) * shrink
    w = 2 * r
    panels = []
    k = 0
    with workdps(40):
        while k * w < T:
            a = mpmath.mpf(k) * w            # exact: w is a double, k a small integer
            b = min(mpmath.mpf(T), a + w)
            need = digits - decay * float(a) / math.log(10) + 2
            if need <= 0:
                break
            rr = float(b - a) / 2
            n = 6
            while n < 400:
                z = (omega + 1.0) * rr * math.e / (4 * n)
                if 2 * n * math.log10(max(z, 1e-300)) < -need:
                    break
                n += 2
            panels.append((a, b, n + extra))
            k += 1
    return panels


def _miller_start(N: int, bits: int) -> int:
    """Order M with J_M(z) / J_N(z) below 2^-bits for every z <= N.

    Debye: J_nu(nu sech a) ~ exp(nu (tanh a - a)) / sqrt(2 pi nu tanh a); the
    worst node is z = N.
    """
    target = -(bits + 10) * math.log(2)
    M = N + 4
    while True:
        a = math.acosh(M / N)
        if M * (math.tanh(a) - a) < target:
            return M
        M += max(1, M // 50)


def _bessel_table(N: int, zs, bits: int, cplx: bool):
    """J_1..J_N at the nodes ``zs`` (arb/acb list) -> numpy object array N x Q.

    Nodes with ``|z| >= N`` (oscillatory for every order used): ``J_0`` and
    ``J_1`` from python-flint, then the forward recurrence, which is neutrally
    stable for ``n < |z|``. Nodes with ``|z| < N``: Miller's backward
    recurrence from an order ``M`` past which ``J_n`` has decayed below
    ``2^-bits`` (Debye estimate at ``z = N``, :func:`_miller_start`), normalised by
    ``J_0 + 2 sum_k J_2k = 1``. Both run on midpoints at ``bits``
    (ball radii of three-term recurrences grow without meaning).
    """
    Q = len(zs)
    big = [m for m, z in enumerate(zs) if abs(z) >= N]
    small = [m for m, z in enumerate(zs) if not abs(z) >= N]
    J = np.empty((N, Q), dtype=object)
    mid = np.frompyfunc(lambda x: x.mid(), 1, 1)
    with flint_prec(bits):
        if big:
            zb = [zs[m] for m in big]
            with flint_prec(bits + 32):
                j0 = [z.bessel_j(0).mid() for z in zb]
                j1 = [z.bessel_j(1).mid() for z in zb]
            inv2z = np.array([(2 / z).mid() for z in zb], dtype=object)
            prev = np.array([+x for x in j0], dtype=object)
            cur = np.array([+x for x in j1], dtype=object)
            J[0, big] = cur
            for n in range(1, N):
                nxt = (inv2z * cur) * n - prev
                if n % 2 == 0:
                    nxt = mid(nxt)
                prev, cur = cur, nxt
                J[n, big] = cur
        if small:
            zsm = [zs[m] for m in small]
            M = _miller_start(N, bits)
            M += M % 2
            inv2z = np.array([(2 / z).mid() for z in zsm], dtype=object)
            tiny = flint.acb(flint.arb((1, -64))) if cplx else flint.arb((1, -64))
            nxt = np.array([tiny * 0] * len(zsm), dtype=object)
            cur = np.array([tiny] * len(zsm), dtype=object)   # order M
            norm = cur * 2 if M % 2 == 0 else cur * 0
            rows = {}
            for n in range(M, 0, -1):
                # midpoints every step: python-flint trims the midpoint precision of a
                # ball whose radius has grown, and these radii grow without meaning
                prv = mid((inv2z * cur) * n - nxt)          # order n - 1
                nxt, cur = cur, prv
                k = n - 1
                if k <= N and k >= 1:
                    rows[k] = cur
                if k % 2 == 0:
                    norm = norm + (cur if k == 0 else cur * 2)
            inv_norm = np.array([(1 / x).mid() for x in norm], dtype=object)
            for k in range(1, N + 1):
                J[k - 1, small] = rows[k] * inv_norm
        J = mid(J)
    return J


_GL_ARB = {}


def _gauss_legendre_arb(n: int, dps: int, bits: int):
    """:func:`_gauss_legendre` as python-flint balls (midpoints), cached."""
    key = (n, dps, bits)
    if key not in _GL_ARB:
        xs, ws = _gauss_legendre(n, dps)
        _GL_ARB[key] = ([arb_from_mpf(x) for x in xs], [arb_from_mpf(w) for w in ws])
    return _GL_ARB[key]


def _kernel_matrix_fixed(N: int, zs, wts, bits: int):
    """Real coupling: I = Jh Jh^T, Jh = J sqrt(w), entirely in fixed point.

    Every value is an integer at scale 2^P (P = bits). Nodes with z >= N: the
    forward recurrence J_{n+1} = (2n/z) J_n - J_{n-1} from python-flint J_0, J_1
    runs on Python integers (neutrally stable for n < z: the error stays a few
    units of 2^-P per step). Nodes with z < N: Miller's recurrence in balls
    (:func:`_bessel_table`), then rounded. The product of the integer matrices is
    exact; each entry of I is off by at most about Q N 2^-P.
    """
    P = bits
    Q = len(zs)
    big = [m for m, z in enumerate(zs) if z >= N]
    small = [m for m, z in enumerate(zs) if not z >= N]
    J = np.zeros((N, Q), dtype=object)
    with flint_prec(bits + 32):
        scale = flint.arb(2) ** P
        to_int = (lambda x: int((x * scale).mid().floor().unique_fmpz()))
        if big:
            zb = [zs[m] for m in big]
            prev = np.array([to_int(z.bessel_j(0)) for z in zb], dtype=object)
            cur = np.array([to_int(z.bessel_j(1)) for z in zb], dtype=object)
            c2z = np.array([to_int(2 / z) for z in zb], dtype=object)
            J[0, big] = cur
            for n in range(1, N):
                nxt = ((cur * c2z) * n >> P) - prev
                prev, cur = cur, nxt
                J[n, big] = cur
        if small:
            Js = _bessel_table(N, [zs[m] for m in small], bits, False)
            conv = np.frompyfunc(to_int, 1, 1)
            J[:, small] = conv(Js)
        sw = np.array([to_int(w_.sqrt()) for w_ in wts], dtype=object)
    Jh = (J * sw[None, :]) >> P
    with flint_prec(2 * P + 64):
        A = flint.arb_mat(N, Q, [int(v) for v in Jh.ravel()])
        prod = A * A.transpose()
    with flint_prec(bits):
        inv = flint.arb(2) ** (-2 * P)
        I = [(x * inv) for x in prod.entries()]
    return np.array(I, dtype=object).reshape(N, N)


def _kernel_matrix(g, N: int, panels, bits: int, dps: int):
    """Quadrature approximation of the BES integrals I_ij (i, j <= N) as numpy object N x N."""
    cplx = isinstance(g, mpmath.mpc)
    with flint_prec(bits):
        tw, wl = [], []
        for a, b, n in panels:
            xs, ws = _gauss_legendre_arb(n, dps, bits)
            h = (arb_from_mpf(b) - arb_from_mpf(a)) / 2
            c = (arb_from_mpf(a) + arb_from_mpf(b)) / 2
            for x, w_ in zip(xs, ws):
                t = (c + h * x).mid()
                tw.append(t)
                wl.append((w_ * h / (t * t.expm1())).mid())
        nodes = tw
        if cplx:
            g2 = 2 * acb_from_mpc(g)
        else:
            g2 = 2 * arb_from_mpf(g)
        zs = [g2 * t for t in tw]
        wts = np.array(wl, dtype=object)
    if not cplx:
        return _kernel_matrix_fixed(N, zs, wts, bits), len(nodes)
    J = _bessel_table(N, zs, bits, cplx)
    Q = len(nodes)
    with flint_prec(bits):
        if cplx:
            JW = J * wts[None, :]
            A = flint.acb_mat(N, Q, list(JW.ravel()))
            B = flint.acb_mat(Q, N, list(J.T.ravel()))
            I = (A * B).entries()
        else:
            # I = Jh Jh^T with Jh = J sqrt(w) (the weights are positive), in fixed point:
            # entries rounded to integers at scale 2^P, so the product is an exact integer
            # matrix product (much faster than floating entries spread over many
            # binades); rounding error of each entry of I <= Q 2^-P (|Jh| <= 2).
            P = bits
            scale = flint.arb(2) ** P
            sw = np.array([(w_.sqrt() * scale).mid() for w_ in wts], dtype=object)
            to_int = np.frompyfunc(lambda x: (x.mid() + 0.5).floor(), 1, 1)
            Jh = to_int(J * sw[None, :])
            A = flint.arb_mat(N, Q, list(Jh.ravel()))
            with flint_prec(P + 24):
                prod = A * A.transpose()
            inv = flint.arb(2) ** (-2 * P)
            I = [(x * inv) for x in prod.entries()]
    return np.array(I, dtype=object).reshape(N, N), Q


def _solve_F(I, N, g, alpha, beta2, bits, cplx):
    """4 g^2 [(1 + K(a))^-1]_11 from the integral matrix I (leading N x N block)."""
    with flint_prec(bits):
        rows = []
        for i in range(1, N + 1):
            row = []
            for j in range(1, N + 1):
                v = I[i - 1, j - 1] * (2 * j)
                if i % 2 == j % 2:
                    v = v * alpha
                elif i % 2 == 0:
                    v = -(v * beta2)
                row.append(v + (1 if i == j else 0))
            rows.append(row)
        Mat = flint.acb_mat if cplx else flint.arb_mat
        M = Mat(rows)
        rhs = Mat([[1]] + [[0]] * (N - 1))
        u = M.solve(rhs).entries()[0]
        gg = acb_from_mpc(g) if cplx else arb_from_mpf(g)
        return 4 * gg * gg * u


def _initial_size(g_abs: float, digits: float) -> int:
    """Matrix size at which the truncation error should be near ``10^-digits``.

    Measured (double and 40-digit runs at a = 0 and pi/4): the relative change
    between sizes falls by about ``0.67 / sqrt(g)`` decades per added index
    for g >= 1, faster below."""
    rate = 0.8 / math.sqrt(max(g_abs, 0.5))
    return int(math.ceil((digits + 1) / rate)) + 4


def finite_coupling(g, angle="pi/4", ctx: Optional[Context] = None, digits: Optional[int] = None,
                    max_size: int = 600) -> FiniteCouplingResult:
    """``F_a(g)`` at finite coupling, with a checked error band.

    Parameters
    ----------
    g : number or str
        The coupling; real, or complex with ``|Im g| < 1/4`` (where the
        kernel integrals converge).
    angle : number or str
        The angle ``a`` in radians.
    ctx : Context
        Working precision; ``digits`` defaults to ``ctx.dps``.
    digits : int
        Significant digits wanted. The result has ``success=False`` when the
        band cannot be brought below ``10^-digits |F|`` within ``max_size``.
    max_size : int
        Largest matrix truncation tried.

    Returns
    -------
    FiniteCouplingResult

    Examples
    --------
    >>> r = finite_coupling(1, "0", Context(dps=20))
    >>> r.success, mpmath.nstr(r.value.value, 15)
    (True, '1.13277926587188')

    Notes
    -----
    The kernel integrals are computed by composite Gauss-Legendre quadrature
    on ``[0, T]`` (``e^-T`` below the requested accuracy), panels spanning a
    few oscillations of ``J_i(2gt) J_j(2gt)``, node counts falling with ``t``
    as ``e^-t`` lowers the accuracy each panel needs. Bessel functions come
    from three-term recurrences (forward where ``2gt`` exceeds the matrix
    size, Miller's backward one below) started from python-flint values; for
    real ``g`` the recurrence and the kernel product run in fixed-point
    integers. The matrix is
    truncated at a size chosen from ``|g|`` and the digits asked (about
    ``digits sqrt(g)``), then checked against a smaller size (same
    quadrature) and against a second quadrature rule (other panels, more
    nodes, longer interval). See :class:`FiniteCouplingResult` for the band.

    Applicability: real ``g`` up to a few dozen (the cost grows like
    ``g^2`` for the quadrature and ``g^1.5`` for the size); complex ``g``
    inside the strip ``|Im g| < 1/4``.
    """
    ctx = ctx or DEFAULT
    if digits is not None:
        whole(digits, "digits")
    whole(max_size, "max_size", 16, why="the largest truncation of the kernel matrix")
    digits = ctx.dps if digits is None else digits
    if digits < 3:
        raise InputError(f"digits: ask for at least 3, got {digits}")
    with ctx.working(10):
        gv = _parse_coupling(g, ctx.work_dps + 10)
        a = parse_angle(angle, ctx.work_dps + 10)
    cplx = isinstance(gv, mpmath.mpc)
    if cplx and abs(gv.imag) >= mpmath.mpf(1) / 4:
        raise InputError(f"g: |Im g| must be below 1/4 (the kernel integrals diverge there), got {g}")
    if gv == 0:
        z = Estimate.exact(0)
        return FiniteCouplingResult(gv, a, True, Status.CONVERGED, "F(0) = 0", z,
                                    Estimate.exact(0) if cplx else None)
    g_abs = float(abs(gv))
    work_digits = digits + 12
    bits = bits_for(work_digits + int(math.log10(g_abs + 2)) * 2 + 10)
    omega = 4 * g_abs
    decay = 1.0 - (4 * float(abs(gv.imag)) if cplx else 0.0)
    # F changes by about 4 g^2 dK for a change dK of the kernel entries, and
    # F / (4 g^2) >= 1/(2g + 2): absolute accuracy 10^-quad_digits on the entries
    quad_digits = digits + 1.5 + math.log10(2 * g_abs + 2)
    alpha, beta2 = _angle_factors(a, bits + 64, ctx.work_dps + 10)
    check = min(_initial_size(g_abs, digits), max_size - 8)
    size = check + max(8, check // 4)
    history = []
    status, msg = Status.NOT_CONVERGED, ""
    while True:
        qd = quad_digits + math.log10(2 * size)          # entries carry the factor 2j <= 2 size
        T1 = (qd + 1) * math.log(10) / decay
        T2 = (qd + 4) * math.log(10) / decay + 3
        p1 = _panel_nodes(omega, qd, T1, 1.0, 0, decay)
        p2 = _panel_nodes(omega, qd + 2, T2, 0.83, 0, decay)
        I1, Q1 = _kernel_matrix(gv, size, p1, bits, work_digits + 5)
        I2, Q2 = _kernel_matrix(gv, size, p2, bits, work_digits + 5)
        F_big = _solve_F(I1, size, gv, alpha, beta2, bits, cplx)
        F_small = _solve_F(I1, check, gv, alpha, beta2, bits, cplx)
        F_rule2 = _solve_F(I2, size, gv, alpha, beta2, bits, cplx)
        with ctx.working(10):
            vals = [_to_mp(F_big, cplx), _to_mp(F_small, cplx), _to_mp(F_rule2, cplx)]
            rad = _rad(F_big, cplx)
            d_size = abs(vals[0] - vals[1])
            d_quad = abs(vals[0] - vals[2])
            # tail of the t integral beyond the first rule's end, entries times 4 g^2
            tail = 4 * abs(gv) ** 2 * 2 * size * mpmath.exp(-decay * float(p1[-1][1])) \
                / float(p1[-1][1])
            band = 2 * (d_size + d_quad) + tail + rad
            scale = abs(vals[0])
            history.append({"size": size, "size_check": check, "nodes": Q1, "nodes_check": Q2,
                            "size_change": mpmath.mpf(d_size), "quadrature_change": mpmath.mpf(d_quad),
                            "ball_radius": mpmath.mpf(rad), "tail_bound": mpmath.mpf(tail)})
            ok = scale > 0 and band <= mpmath.mpf(10) ** (-digits) * scale
        if ok:
            status, msg = Status.CONVERGED, (f"size {size} vs {check} and two quadrature rules agree "
                                              f"to the {digits} digits asked")
            break
        if size >= max_size:
            msg = (f"could not reach {digits} digits with matrices up to {max_size}: band "
                   f"{mpmath.nstr(band, 3)} on |F| = {mpmath.nstr(scale, 5)}; raise max_size or "
                   "ask for fewer digits")
            break
        if d_quad > d_size and len(history) > 1 and history[-2]["quadrature_change"] <= d_quad:
            msg = "the quadrature does not converge at this coupling; ask for fewer digits"
            break
        # the size change falls exponentially: aim the check size past the digits still missing
        rate = max(0.05, 0.8 / math.sqrt(max(g_abs, 0.5)))
        missing = float(mpmath.log10(band / (mpmath.mpf(10) ** (-digits) * scale))) if scale > 0 else 5
        check = min(max_size - 8, size, check + int(missing / rate) + 8)
        size = min(max_size, check + max(8, check // 4))
    with ctx.working(10):
        v = vals[0]
        re = Estimate(mpmath.re(v), mpmath.re(v) - band, mpmath.re(v) + band)
        im = Estimate(mpmath.im(v), mpmath.im(v) - band, mpmath.im(v) + band) if cplx else None
        agree = float(-mpmath.log10(band / scale)) if band > 0 and scale > 0 else float(digits + 5)
        prov = Provenance("bes.finite_coupling", {"angle": num_to_str(a, 20), "g": num_to_str(gv, 20),
                                                  "digits": digits, "max_size": max_size}, size, ctx.dps)
    return FiniteCouplingResult(gv, a, status == Status.CONVERGED, status, msg, re, im, size,
                                history[-1]["size_check"], history[-1]["nodes"],
                                history[-1]["nodes_check"], round(agree, 2),
                                {"history": history,
                                 "how": "band = 2 (|F(size) - F(size_check)| + |F(rule 1) - F(rule 2)|) "
                                        "+ tail bound of the t integral + ball radius of the solve"},
                                prov)


def _parse_coupling(g, dps):
    v = number(g, "g", dps)
    if not isinstance(v, mpmath.mpc) and v < 0:
        v = -v          # F_a is even in g
    return v


def _to_mp(x, cplx):
    if cplx:
        return mpmath.mpc(arb_to_mpf(x.real), arb_to_mpf(x.imag))
    return arb_to_mpf(x)


def _rad(x, cplx):
    if cplx:
        return arb_rad_to_mpf(x.real) + arb_rad_to_mpf(x.imag)
    return arb_rad_to_mpf(x)


# ----------------------------------------------------------------------------
# known closed forms (for checks and as ground truth)
# ----------------------------------------------------------------------------

def zero_angle_closed_form(g, ctx: Optional[Context] = None):
    """``F_0(g) = (2/pi^2) log cosh(2 pi g)`` (exact at ``a = 0``)."""
    ctx = ctx or DEFAULT
    with ctx.working():
        g = mpmath.mpmathify(g)
        return 2 / mpmath.pi ** 2 * mpmath.log(mpmath.cosh(2 * mpmath.pi * g))


def cusp_strong_coupling(g, ctx: Optional[Context] = None):
    """Strong-coupling expansion of the cusp (``a = pi/4``):
    ``2g - 3 ln2/(2 pi) - K/(8 pi^2 g)``, ``K`` Catalan's constant; the
    remainder is ``O(1/g^2)``."""
    ctx = ctx or DEFAULT
    with ctx.working():
        g = mpmath.mpmathify(g)
        return 2 * g - 3 * mpmath.log(2) / (2 * mpmath.pi) - mpmath.catalan / (8 * mpmath.pi ** 2 * g)

