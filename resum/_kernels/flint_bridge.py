"""Lossless conversions between mpmath, Python rationals and python-flint.

mpmath numbers are converted through their binary ``_mpf_`` tuples
(sign, mantissa, exponent), never through decimal strings, so no bit is lost
and no time is spent printing and parsing. python-flint balls go back to
mpmath through their midpoint's ``man_exp()``; the radius is returned
separately when asked for.

flint's working precision is, like mpmath's, a global setting. Kernels set it
only through :func:`flint_prec`, which restores the previous value on exit.

>>> from mpmath import mpf
>>> x = mpf(1) / 3
>>> a = mpf_to_arb(x)
>>> arb_to_mpf(a) == x
True
>>> from fractions import Fraction
>>> fmpq_to_fraction(fraction_to_fmpq(Fraction(-7, 12)))
Fraction(-7, 12)
"""
from __future__ import annotations

import contextlib
from fractions import Fraction
from numbers import Integral, Rational

import flint
import mpmath
from mpmath.libmp import from_man_exp

__all__ = [
    "flint_prec", "prec_for_dps", "mpf_to_arb", "arb_to_mpf", "arb_rad", "mpc_to_acb",
    "acb_to_mpc", "acb_rad", "fraction_to_fmpq", "fmpq_to_fraction", "to_arb", "to_acb",
    "to_fmpq", "is_exact", "is_complex_list", "vector_kind", "arb_rel_digits",
]

_LOG2_10 = 3.3219280948873626


def prec_for_dps(dps: int) -> int:
    """Bits for ``dps`` decimal digits (with 8 bits to spare), as in resum.context."""
    return int(dps * _LOG2_10) + 8


def flint_dps(dps: int):
    """:func:`flint_prec` for ``dps`` decimal digits as python-flint converts them
    (``flint.ctx.dps``), as a context manager."""
    old = flint.ctx.prec
    flint.ctx.dps = int(dps)
    bits = flint.ctx.prec
    flint.ctx.prec = old
    return flint_prec(bits)


@contextlib.contextmanager
def flint_prec(bits: int):
    """Set python-flint's working precision to ``bits`` for a block, then restore it."""
    old = flint.ctx.prec
    flint.ctx.prec = int(bits)
    try:
        yield
    finally:
        flint.ctx.prec = old


# ----------------------------------------------------------------------------
# exact numbers
# ----------------------------------------------------------------------------

def is_exact(c) -> bool:
    """True for int/Fraction (and fmpz/fmpq), the numbers resum keeps exact."""
    return (isinstance(c, (Integral, Rational)) and not isinstance(c, bool)) or \
        isinstance(c, (flint.fmpz, flint.fmpq))


def fraction_to_fmpq(x) -> flint.fmpq:
    """int or Fraction -> fmpq (exact)."""
    if isinstance(x, flint.fmpq):
        return x
    if isinstance(x, (int, flint.fmpz)):
        return flint.fmpq(int(x))
    return flint.fmpq(int(x.numerator), int(x.denominator))


def fmpq_to_fraction(x) -> Fraction:
    """fmpq (or fmpz, int, Fraction) -> Fraction (exact)."""
    if isinstance(x, (int, flint.fmpz)):
        return Fraction(int(x))
    if isinstance(x, Fraction):
        return x
    return Fraction(int(x.p), int(x.q))


to_fmpq = fraction_to_fmpq


# ----------------------------------------------------------------------------
# reals
# ----------------------------------------------------------------------------

def mpf_to_arb(x) -> flint.arb:
    """mpmath mpf -> exact arb (zero radius), bit for bit."""
    sign, man, exp, bc = x._mpf_
    if not man:
        if exp == 0:
            return flint.arb(0)
        # special values (inf, nan): go through float, which keeps them
        return flint.arb(float(x))
    m = int(man)
    return flint.arb((-m if sign else m, int(exp)))


def arb_to_mpf(a, exact: bool = True):
    """Midpoint of an arb as an mpf.

    With ``exact=True`` (default) the midpoint is converted without rounding
    (the mpf keeps every bit of the midpoint); otherwise it is rounded to the
    current mpmath precision.
    """
    if not a.is_finite():
        return mpmath.mpf("nan") if a.is_nan() else mpmath.mpf(float(a.mid()))
    m, e = a.mid().man_exp()
    if exact:
        return mpmath.mp.make_mpf(from_man_exp(int(m), int(e)))
    return mpmath.mpf((int(m), int(e)))


def arb_rad(a):
    """Radius of an arb as an mpf (exact)."""
    r = a.rad()
    m, e = r.man_exp()
    return mpmath.mp.make_mpf(from_man_exp(int(m), int(e)))


def to_arb(x) -> flint.arb:
    """Any real number resum uses (int, Fraction, float, mpf, arb, fmpq) -> arb.

    Exact rationals are rounded to the current flint precision; mpf and
    floats are converted exactly.
    """
    if isinstance(x, flint.arb):
        return x
    if isinstance(x, mpmath.mpf):
        return mpf_to_arb(x)
    if isinstance(x, bool):
        raise TypeError("booleans are not numbers here")
    if isinstance(x, (int, flint.fmpz)):
        return flint.arb(int(x))
    if isinstance(x, (Fraction, flint.fmpq)):
        q = fraction_to_fmpq(x)
        return flint.arb(q)
    if isinstance(x, float):
        return flint.arb(x)
    if isinstance(x, Rational):
        return flint.arb(flint.fmpq(int(x.numerator), int(x.denominator)))
    raise TypeError(f"cannot convert {type(x).__name__} to a real ball")


def arb_rel_digits(a) -> float:
    """Correct significant decimal digits of a ball (``inf`` if exact, 0 if
    the ball contains zero)."""
    if a.rad() == 0:
        return float("inf")
    mid = abs(a.mid())
    if mid == 0 or a.contains(0):
        return 0.0
    return float(mpmath.log10(arb_to_mpf(flint.arb(mid)) / arb_rad(a)))


# ----------------------------------------------------------------------------
# complex
# ----------------------------------------------------------------------------

def mpc_to_acb(z) -> flint.acb:
    """mpmath mpc -> exact acb."""
    re, im = z._mpc_
    return flint.acb(mpf_to_arb(mpmath.mp.make_mpf(re)), mpf_to_arb(mpmath.mp.make_mpf(im)))


def acb_to_mpc(z, exact: bool = True):
    """Midpoint of an acb as an mpc (real and imaginary parts converted as in
    :func:`arb_to_mpf`)."""
    re, im = arb_to_mpf(z.real, exact), arb_to_mpf(z.imag, exact)
    if exact:
        return mpmath.mp.make_mpc((re._mpf_, im._mpf_))
    return mpmath.mpc(re, im)


def acb_rad(z):
    """Radius (upper bound of the distance to the midpoint) of an acb as an mpf."""
    return mpmath.hypot(arb_rad(z.real), arb_rad(z.imag))


def to_acb(x) -> flint.acb:
    """Any number resum uses -> acb (see :func:`to_arb` for exactness)."""
    if isinstance(x, flint.acb):
        return x
    if isinstance(x, mpmath.mpc):
        return mpc_to_acb(x)
    if isinstance(x, complex):
        return flint.acb(x.real, x.imag)
    return flint.acb(to_arb(x))


# ----------------------------------------------------------------------------
# lists
# ----------------------------------------------------------------------------

def is_complex_list(c) -> bool:
    """True if any entry is complex with a non-zero imaginary part type
    (mpc, complex, acb)."""
    return any(isinstance(x, (mpmath.mpc, complex, flint.acb)) for x in c)


def vector_kind(c) -> str:
    """'exact' (all int/Fraction), 'complex' (any mpc/complex/acb) or 'real'."""
    if all(is_exact(x) for x in c):
        return "exact"
    if is_complex_list(c):
        return "complex"
    return "real"
