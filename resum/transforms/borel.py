"""Borel(-Le Roy) transform and the Laplace integral that inverts it.

For ``f(x) = sum c_n x^n`` the Borel-Le Roy transform with parameter ``b`` is
``B_b(t) = sum c_n t^n / Gamma(n + 1 + b)``; formally

    f(x) = integral_0^inf exp(-u) u^b B_b(x u) du        (t = x u)

which is the (Borel-Le Roy) sum when ``B_b`` continued along the ray has no
singularity. With a singularity on the ray the two lateral sums (the ray
turned slightly above or below) differ by an exponentially small imaginary
part: the ambiguity.

>>> import mpmath
>>> from resum.context import workdps
>>> with workdps(30):
...     d = borel_coefficients([mpmath.factorial(n) for n in range(5)], 0)
>>> [int(v) for v in d]
[1, 1, 1, 1, 1]
>>> with workdps(30):
...     v, err = laplace(lambda t: 1 / (1 + t), mpmath.mpf('0.1'), 0, 30)   # Euler series sum
>>> mpmath.nstr(v, 15)
'0.915633339397881'

References
----------
.. [1] G. H. Hardy, *Divergent Series*, Oxford (1949), chapter 8 (Borel's methods).
.. [2] J. Zinn-Justin, *Quantum Field Theory and Critical Phenomena*, Oxford,
   chapter on summation of divergent series (Borel-Le Roy, conformal mapping).
"""
from __future__ import annotations

from typing import Callable, Sequence

import mpmath

__all__ = ["borel_coefficients", "laplace", "ray_points", "LAPLACE_GUARD"]

#: Digits beyond the ``dps`` asked of :func:`laplace` at which the quadrature runs (its nodes,
#: weights and stopping test); the integrand is evaluated at the caller's precision.
LAPLACE_GUARD = 10


def borel_coefficients(c: Sequence, b=0) -> list:
    """``c_n / Gamma(n + 1 + b)`` at the current working precision (``b > -1``)."""
    b = mpmath.mpmathify(b)
    if b <= -1:
        raise ValueError("Borel-Le Roy parameter b must be > -1")
    out = []
    g = mpmath.gamma(1 + b)
    for n, cn in enumerate(c):
        if n > 0:
            g *= (n + b)
        out.append(mpmath.mpmathify(cn) / g)
    return out


def ray_points(scale, s_max) -> list:
    """Split points ``0, scale/16, scale/4, scale, 4 scale, ...`` up to ``s_max``."""
    scale = mpmath.mpf(scale)
    pts = [mpmath.mpf(0)]
    v = scale / 16
    while v < s_max:
        pts.append(v)
        v *= 4
    pts.append(mpmath.mpf(s_max))
    return pts


def laplace(F: Callable, x, b, dps: int, *, theta=0, scale=1, s_max=None):
    """``e^{i theta} int_0^inf exp(-u) u^b F(x u) du`` along ``u = s e^{i theta}``.

    The path is split at ``scale`` times powers of 4 (``scale`` = the distance
    of the nearest Borel-plane singularity in units of ``|x|``, so the
    integrand's structure near the origin is resolved) and cut off at
    ``s_max`` (default: where ``exp(-s cos theta)`` drops below ``10^-(dps+5)``).
    Returns ``(value, error_estimate)``; the error estimate is mpmath's
    quadrature error, at least ``10^(3-dps)`` relative.
    """
    x = mpmath.mpmathify(x)
    b = mpmath.mpmathify(b)
    theta = mpmath.mpf(theta)
    e = mpmath.expjpi(theta / mpmath.pi) if theta != 0 else mpmath.mpf(1)
    c = mpmath.cos(theta)
    if c <= 0:
        raise ValueError("the Laplace ray must stay within |theta| < pi/2")
    if s_max is None:
        s_max = ((dps + 5) * mpmath.log(10) + 10 + 4 * abs(b)) / c
    pts = ray_points(min(mpmath.mpf(scale), s_max / 8), s_max)

    # The integrand runs at the caller's precision (the approximant's coefficients may need all
    # of it: cancellation in P/Q), the quadrature at dps + LAPLACE_GUARD digits: tanh-sinh's
    # nodes, weights and stopping test follow mpmath's precision, and at the caller's (often
    # twice dps: the Padé plan) it refined every panel towards digits nobody asked for (4000
    # integrand calls per integral at 81 digits for a 36-digit request).
    hi = mpmath.mp.prec

    def integrand(s):
        u = s * e
        with mpmath.workprec(hi):
            f = F(x * u)
        w = mpmath.exp(-u) * f
        if b != 0:
            w *= u ** b
        return w

    with mpmath.workdps(min(int(dps) + LAPLACE_GUARD, mpmath.mp.dps)):
        pts = [+p for p in pts]
        v = None
        if b == 0:
            # the integrand is analytic at u = 0 and its Borel-plane singularities lie off the
            # panels (each panel [a, 4a] sits at least its own length from them on the real ray;
            # on a turned ray, for the lateral sums, at a fixed angle from them): Gauss-Legendre
            # converges geometrically there and needs about half of tanh-sinh's nodes (oscillator
            # from 100 terms at 30 digits, 5 points: 36 000 integrand calls against 74 000, every
            # value and band the same to 30 digits; Euler's series at x = -0.2 and 0.5, lateral
            # sums included: 21 s against 30 s, the same values and bands). It is kept only when
            # its error estimate meets the digits asked; otherwise tanh-sinh, as with u^b (an
            # end-point singularity for non-integer b), where it copes better.
            v, err = mpmath.quad(integrand, pts, error=True, method="gauss-legendre",
                                 maxdegree=6 + int(dps) // 40)
            if not err <= abs(v) * mpmath.mpf(10) ** (-dps):
                v = None
        if v is None:
            v, err = mpmath.quad(integrand, pts, error=True, maxdegree=8 + int(dps) // 20)
    v = v * e
    floor = abs(v) * mpmath.mpf(10) ** (3 - dps)
    return v, max(mpmath.mpf(err), floor)
