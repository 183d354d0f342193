r"""Euler's series ``sum_n s^n n! x^n`` (``s = -1``: alternating, Borel summable).

The alternating series is the asymptotic expansion of the Stieltjes function

.. math::

   E(x) = \int_0^\infty \frac{e^{-t}}{1 + x t}\, dt
        = \frac{1}{x} e^{1/x} E_1(1/x), \qquad x > 0,

its Borel sum; the tests compare with mpmath's ``e1``. With ``s = +1`` the
Borel transform ``1/(1 - t)`` has a pole on the positive axis and the sum is
ambiguous (a lateral Borel sum has imaginary part ``pi e^{-1/x} / x``).
"""
from __future__ import annotations

from typing import Optional, Sequence

import mpmath

from ..context import DEFAULT, Context
from ..errors import InputError
from ..results import Estimate
from ..series.core import Series
from ._params import number, whole

__all__ = ["coefficients", "series", "borel_sum"]


def coefficients(orders: int, sign: int = -1) -> list:
    """``[s^n n!]`` for ``n < orders`` (exact integers).

    >>> coefficients(5)
    [1, -1, 2, -6, 24]
    """
    whole(orders, "orders", 1)
    whole(sign, "sign", choices=(1, -1))
    out, f = [], 1
    for n in range(orders):           # running product: math.factorial per term is O(n^2) digits
        if n:
            f *= n
        out.append(f if sign > 0 or n % 2 == 0 else -f)
    return out


def series(orders: int = 50, sign: int = -1) -> Series:
    kind = "alternating" if sign == -1 else "same-sign"
    return Series(coefficients(orders, sign), variable="x", name=f"euler({kind})",
                  description=f"Euler's series sum ({sign})^n n! x^n",
                  provenance={"source": "euler", "orders": orders, "sign": sign})


def borel_sum(x, ctx: Optional[Context] = None) -> Estimate:
    """``int_0^oo e^-t/(1 + x t) dt = e^{1/x} E_1(1/x)/x`` for ``x > 0``, with a
    band from recomputing at higher precision.

    >>> mpmath.nstr(borel_sum(1, Context(dps=20)).value, 15)
    '0.596347362323194'
    """
    ctx = ctx or DEFAULT
    vals = []
    for c in (ctx, ctx.higher()):
        with c.working():
            xx = number(x, "x")
            if isinstance(xx, mpmath.mpc) or not xx > 0:
                raise InputError(f"x: the Borel sum is evaluated for real x > 0, got {x}")
            vals.append(mpmath.exp(1 / xx) * mpmath.e1(1 / xx) / xx)
    with ctx.higher().working():
        err = abs(vals[1] - vals[0]) + abs(vals[1]) * mpmath.mpf(10) ** (-ctx.dps - 2)
        return Estimate(vals[1], vals[1] - err, vals[1] + err)


def truth(ctx: Context, points: Sequence, sign: int = -1, **params) -> list:
    if whole(sign, "sign", choices=(1, -1)) != -1:
        raise InputError("sign = 1: sum n! x^n is not Borel summable for x > 0 (the Borel transform "
                         "1/(1 - t) has a pole on the integration path and the lateral sums are complex); "
                         "a finite-coupling value exists only for the alternating series (sign = -1)")
    return [borel_sum(x, ctx) for x in points]
