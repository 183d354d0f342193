"""Small closed-form sources for testing the family machinery.

``binomial``: f(x) = (1 - x/R)^(-a), coefficients binom(a+n-1, n) R^-n, exact
for rational a and R; radius R, a branch point (pole for integer a) at x = R
(closed form, common practice, no source). ``R <= 0`` is refused by the
build, which gives the tests a point that fails for a reason of its own.
``delay`` makes the build sleep (interrupt tests); ``crash = true`` ends
the process computing the point (dead-worker tests).
"""
from __future__ import annotations

import os
import time
from fractions import Fraction

import mpmath

from resum.errors import InputError
from resum.series import Series


def _build(ctx, radius=2, exponent=1, orders=30, delay=0, crash=False):
    if crash:       # the worker process dies (as if killed or out of memory)
        os._exit(3)
    if radius <= 0:
        raise InputError(f"radius must be positive, got {radius}")
    exact = all(isinstance(v, (int, Fraction)) for v in (radius, exponent))
    if exact:
        a, r = Fraction(exponent), Fraction(radius)
        cs, c = [], Fraction(1)
        for n in range(orders):
            cs.append(c)
            c = c * (a + n) / ((n + 1) * r)
        cs = [int(x) if x.denominator == 1 else x for x in cs]
        digits = None
    else:
        with ctx.working():
            a, r = mpmath.mpf(exponent), mpmath.mpf(radius)
            cs, c = [], mpmath.mpf(1)
            for n in range(orders):
                cs.append(+c)
                c = c * (a + n) / ((n + 1) * r)
        digits = ctx.dps
    if delay:
        time.sleep(float(delay))
    return Series(cs, variable="x", digits=digits, name="binomial",
                  provenance={"radius": str(radius), "exponent": str(exponent)})


PARAMS = [
    {"name": "radius", "type": "float", "default": 2, "help": "radius of convergence R"},
    {"name": "exponent", "type": "float", "default": 1, "help": "a in (1 - x/R)^-a"},
    {"name": "orders", "type": "int", "default": 30, "help": "number of terms"},
    {"name": "delay", "type": "float", "default": 0, "help": "seconds to sleep (tests)"},
    {"name": "crash", "type": "bool", "default": False, "help": "end the process (tests)"},
]

binomial = {"name": "binomial", "help": "(1 - x/R)^-a", "params": PARAMS, "build": _build}
