"""Private ball-arithmetic helpers for the transforms and resummation code.

Everything here takes an explicit number of decimal digits ``dps`` and
restores python-flint's global precision on exit. Inputs and outputs are
mpmath numbers (or exact ints/Fractions where said), so callers never see
flint types.

>>> import mpmath
>>> from resum.context import workdps
>>> with workdps(30):
...     c = compose_series([mpmath.mpf(1)] * 4, [0, mpmath.mpf(1), mpmath.mpf(1)], 4, 30)
>>> [int(v) for v in c]          # 1/(1-y) at y = w + w^2: 1, 1, 2, 3
[1, 1, 2, 3]
"""
from __future__ import annotations

import contextlib
from fractions import Fraction

import flint
import mpmath

from ..context import bits_for

__all__ = ["flint_precision", "to_arb", "to_acb", "arb_to_mp", "acb_to_mp", "compose_series",
           "rational_series"]


@contextlib.contextmanager
def flint_precision(dps: int, cap: int | None = None):
    """Set python-flint's working precision (and series cap) for a block, then restore."""
    old_prec, old_cap = flint.ctx.prec, flint.ctx.cap
    flint.ctx.prec = bits_for(int(dps))
    if cap is not None:
        flint.ctx.cap = int(cap)
    try:
        yield
    finally:
        flint.ctx.prec, flint.ctx.cap = old_prec, old_cap


def to_arb(c):
    """An exact int/Fraction or mpf as an arb at the current flint precision."""
    if isinstance(c, int):
        return flint.arb(c)
    if isinstance(c, Fraction):
        return flint.arb(c.numerator) / c.denominator
    if isinstance(c, mpmath.mpc):
        raise TypeError("complex coefficient where a real one was expected")
    return flint.arb(mpmath.mpf(c))


def to_acb(c):
    if isinstance(c, (mpmath.mpc, complex)):
        c = mpmath.mpc(c)
        return flint.acb(to_arb(c.real), to_arb(c.imag))
    return flint.acb(to_arb(c))


def arb_to_mp(a) -> mpmath.mpf:
    """Midpoint of an arb as an mpf (the radius is dropped; callers track errors)."""
    man, exp = a.mid().man_exp()
    return mpmath.mpf((int(man), int(exp)))


def acb_to_mp(a):
    return mpmath.mpc(arb_to_mp(a.real), arb_to_mp(a.imag))


def _is_complex(cs) -> bool:
    return any(isinstance(c, (mpmath.mpc, complex)) for c in cs)


def compose_series(outer, inner, n: int, dps: int) -> list:
    """Coefficients of ``outer(inner(w))`` to ``n`` terms; ``inner[0]`` must be 0.

    Done in ball arithmetic at ``dps`` digits (fast: flint's series
    composition); exact ints/Fractions go through exact rational series.
    Returns mpmath numbers (or Fractions when both inputs are exact).
    """
    if inner and inner[0] != 0:
        raise ValueError("composition needs inner(0) = 0")
    outer = list(outer)[:n] + [0] * max(0, n - len(outer))
    inner = list(inner)[:n] + [0] * max(0, n - len(inner))
    exact = all(isinstance(c, (int, Fraction)) for c in outer + inner)
    with flint_precision(dps + 10, cap=n):
        if exact:
            fo = flint.fmpq_series([flint.fmpq(Fraction(c).numerator, Fraction(c).denominator)
                                    for c in outer], prec=n)
            fi = flint.fmpq_series([flint.fmpq(Fraction(c).numerator, Fraction(c).denominator)
                                    for c in inner], prec=n)
            out = fo(fi).coeffs()
            res = [Fraction(int(q.p), int(q.q)) for q in out]
            return res + [Fraction(0)] * (n - len(res))
        if _is_complex(outer + inner):
            fo = flint.acb_series([to_acb(c) for c in outer], prec=n)
            fi = flint.acb_series([to_acb(c) for c in inner], prec=n)
            out = [acb_to_mp(v) for v in fo(fi).coeffs()]
        else:
            fo = flint.arb_series([to_arb(c) for c in outer], prec=n)
            fi = flint.arb_series([to_arb(c) for c in inner], prec=n)
            out = [arb_to_mp(v) for v in fo(fi).coeffs()]
    return out + [mpmath.mpf(0)] * (n - len(out))


def rational_series(num, den, n: int, dps: int) -> list:
    """Taylor coefficients of ``num(w)/den(w)`` (polynomials low to high) to ``n`` terms."""
    with flint_precision(dps + 10, cap=n):
        if _is_complex(list(num) + list(den)):
            a = flint.acb_series([to_acb(c) for c in num], prec=n)
            b = flint.acb_series([to_acb(c) for c in den], prec=n)
            out = [acb_to_mp(v) for v in (a / b).coeffs()]
        else:
            a = flint.arb_series([to_arb(c) for c in num], prec=n)
            b = flint.arb_series([to_arb(c) for c in den], prec=n)
            out = [arb_to_mp(v) for v in (a / b).coeffs()]
    return out + [mpmath.mpf(0)] * (n - len(out))
