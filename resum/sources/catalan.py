r"""Generating function of the Catalan numbers: a convergent toy series with a square-root branch point.

.. math::

   f(x) = \sum_{n \ge 0} c_n x^n = \frac{1 - \sqrt{1 - 4x}}{2x}, \qquad
   c_n = \frac{1}{n+1}\binom{2n}{n} = 1, 1, 2, 5, 14, 42, \dots

(common practice, no source). The radius of convergence is ``1/4``; at ``x = 1/4``
the function has a square-root branch point (``f = 2 - 2 sqrt(1 - 4x) + ...``: exponent
``1/2``), so ``c_n ~ 4^n n^(-3/2) / sqrt(pi)``. Beyond the radius the closed form with the
principal square root continues the series: real on ``x < 1/4``, with its cut along
``[1/4, oo)``. The coefficients are exact integers, from ``c_{n+1} = c_n 2(2n+1)/(n+2)``;
the tests compare them with ``mpmath.binomial`` and the closed form with mpmath's
hypergeometric function ``2F1(1/2, 1; 2; 4x)``.
"""
from __future__ import annotations

from typing import Optional, Sequence

import mpmath

from ..context import DEFAULT, Context
from ..errors import InputError
from ..results import Estimate
from ..series.core import Series
from ._params import number, whole

__all__ = ["coefficients", "series", "closed_form", "value", "truth"]


def coefficients(orders: int) -> list:
    """``[c_0, ..., c_{orders-1}]``, exact integers.

    >>> coefficients(6)
    [1, 1, 2, 5, 14, 42]
    """
    whole(orders, "orders", 1)
    out, c = [], 1
    for n in range(orders):            # running product: a binomial per term costs O(n) multiplications
        out.append(c)
        c = c * 2 * (2 * n + 1) // (n + 2)       # exact: c_{n+1} is a whole number
    return out


def series(orders: int = 60) -> Series:
    """``f(x)`` as an exact :class:`Series` in ``x``."""
    return Series(coefficients(orders), variable="x", name="catalan",
                  description="Catalan numbers' generating function (1 - sqrt(1 - 4x))/(2x)",
                  provenance={"source": "catalan", "orders": orders,
                              "method": "c_n = binomial(2n, n)/(n + 1), exact"})


def closed_form(x, ctx: Optional[Context] = None):
    """``(1 - sqrt(1 - 4x))/(2x)`` with the principal square root, at ``ctx`` precision; any
    finite complex ``x`` (``f(0) = 1``). Computed as ``2/(1 + sqrt(1 - 4x))``, the same number
    without the cancellation of the first form at small ``|x|``. On the cut ``x > 1/4`` this is
    the principal branch's value (the limit from ``Im x < 0``).

    >>> mpmath.nstr(closed_form(-1, Context(dps=20)), 15)    # (sqrt(5) - 1)/2
    '0.618033988749895'
    """
    ctx = ctx or DEFAULT
    with ctx.working():
        x = number(x, "x")
        return +(2 / (1 + mpmath.sqrt(1 - 4 * x)))


def value(x, ctx: Optional[Context] = None) -> Estimate:
    """The closed form at real ``x < 1/4`` with a band from recomputing at higher precision.
    On the cut ``x >= 1/4`` the value is complex: an input error (use :func:`closed_form`)."""
    ctx = ctx or DEFAULT
    with ctx.working():
        xx = number(x, "x")
        if isinstance(xx, mpmath.mpc) or not xx < mpmath.mpf(1) / 4:
            raise InputError(f"x: the value is real for real x < 1/4 only (cut from 1/4 on), got {x}")
    v1 = closed_form(x, ctx)
    v2 = closed_form(x, ctx.higher())
    with ctx.higher().working():
        err = abs(v2 - v1) + abs(v2) * mpmath.mpf(10) ** (-ctx.dps - 2)
        return Estimate(v2, v2 - err, v2 + err)


def truth(ctx: Context, points: Sequence, **params) -> list:
    """Finite-coupling values at ``points`` (for family studies)."""
    return [value(x, ctx) for x in points]
