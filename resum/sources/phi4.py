r"""The zero-dimensional :math:`\phi^4` integral.

.. math::

   Z(g) = \frac{1}{\sqrt{2\pi}} \int_{-\infty}^{\infty}
          e^{-x^2/2 - g x^4/4}\, dx .

Weak coupling (expand the quartic exponential and use
:math:`\langle x^{2m} \rangle = (2m-1)!!` under the unit Gaussian):

.. math::

   Z(g) = \sum_{n \ge 0} \frac{(-1)^n (4n-1)!!}{4^n\, n!}\, g^n
        = 1 - \tfrac34 g + \tfrac{105}{32} g^2 - \dots,

a divergent series (the coefficients grow like :math:`4^n\,\Gamma(n+1/2)/\dots`,
Borel singularity at :math:`g = -1/4`).

Closed form. The integrand is even, so the line integral is twice the half-line
one; the standard integral (Gradshteyn and Ryzhik, Table of Integrals, 3.323.3)
:math:`\int_0^\infty e^{-a x^2 - b x^4} dx = \frac14 \sqrt{a/b}\, e^{a^2/(8b)} K_{1/4}(a^2/(8b))`
with :math:`a = 1/2`, :math:`b = g/4` (so :math:`a^2/(8b) = 1/(8g)` and
:math:`\sqrt{a/b} = \sqrt{2/g}`) gives

.. math::

   Z(g) = \frac{2}{\sqrt{2\pi}} \cdot \frac14 \sqrt{\frac{2}{g}}\, e^{1/(8g)} K_{1/4}\!\left(\frac{1}{8g}\right)
        = \frac{e^{1/(8g)}}{2\sqrt{\pi g}}\, K_{1/4}\!\left(\frac{1}{8g}\right), \qquad g > 0,

which the tests check against direct quadrature (mpmath.quad).
"""
from __future__ import annotations

from fractions import Fraction
from typing import Optional, Sequence

import mpmath

from ..context import DEFAULT, Context
from ..errors import InputError
from ..results import Estimate
from ..series.core import Series
from ._params import number, whole

__all__ = ["coefficients", "series", "closed_form", "value"]


def coefficients(orders: int) -> list:
    """Exact coefficients ``a_0..a_{orders-1}`` of ``Z(g)`` (Fractions).

    >>> [str(c) for c in coefficients(4)]
    ['1', '-3/4', '105/32', '-3465/128']
    """
    whole(orders, "orders", 1)
    out = [Fraction(1)]
    # a_n / a_{n-1} = -(4n-1)(4n-3)/(4 n)
    for n in range(1, orders):
        out.append(out[-1] * Fraction(-(4 * n - 1) * (4 * n - 3), 4 * n))
    return out


def series(orders: int = 60) -> Series:
    """``Z(g)`` as an exact :class:`Series` in ``g``."""
    cs = coefficients(orders)
    return Series(cs, variable="g", name="phi4",
                  description="zero-dimensional phi^4 integral Z(g) = (2 pi)^(-1/2) "
                              "Int exp(-x^2/2 - g x^4/4) dx",
                  provenance={"source": "phi4", "orders": orders,
                              "method": "a_n = (-1)^n (4n-1)!! / (4^n n!), exact"})


def closed_form(g, ctx: Optional[Context] = None):
    """``Z(g) = e^{1/(8g)} K_{1/4}(1/(8g)) / (2 sqrt(pi g))`` at ``ctx`` precision.

    Valid for ``Re g > 0`` (principal branches). For small ``|g|`` the Bessel
    function is evaluated with extra digits, since ``e^{1/(8g)}`` and
    ``K_{1/4}(1/(8g)) ~ e^{-1/(8g)}`` cancel in magnitude.

    >>> mpmath.nstr(closed_form(1, Context(dps=20)), 15)
    '0.772052177852982'
    """
    ctx = ctx or DEFAULT
    with ctx.working():
        g = number(g, "g")
        if mpmath.re(g) <= 0:
            raise InputError(f"g: the closed form needs Re g > 0, got {g}")
        y = 1 / (8 * g)
        v = mpmath.exp(y) * mpmath.besselk(mpmath.mpf(1) / 4, y) / (2 * mpmath.sqrt(mpmath.pi * g))
        return +v


def value(g, ctx: Optional[Context] = None) -> Estimate:
    """Closed form with a band from recomputing at higher precision."""
    ctx = ctx or DEFAULT
    v1 = closed_form(g, ctx)
    v2 = closed_form(g, ctx.higher())
    with ctx.higher().working():
        if isinstance(v2, mpmath.mpc):
            raise InputError("value: use closed_form for complex g")
        err = abs(v2 - v1) + abs(v2) * mpmath.mpf(10) ** (-ctx.dps - 2)
        return Estimate(v2, v2 - err, v2 + err)


def truth(ctx: Context, points: Sequence, **params) -> list:
    """Finite-coupling values at ``points`` (for family studies)."""
    return [value(g, ctx) for g in points]
