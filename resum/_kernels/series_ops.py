"""Truncated power-series arithmetic on coefficient lists.

All functions take coefficient lists low to high and an output length ``n``
and work with any numbers that support ``+ - * /`` (ints, Fractions, mpf,
mpc), so exact input stays exact.

Fast paths: for ``n >= FAST_MIN_TERMS`` and input made only of ints,
Fractions, floats, mpf and mpc, the work is done by FLINT (python-flint):
exact input in ``fmpq_poly``/``fmpq_series`` (exact, result as Fractions,
ints where the denominator is 1), inexact input in Arb ball arithmetic
(``arb_series``/``acb_series``) at mpmath's current precision plus
``FAST_GUARD_BITS`` guard bits, rounded back to the current precision. The
ball arithmetic bounds every rounding error, so the fast results are at least
as accurate as the plain O(n^2) loops (which remain the reference, used for
small n and for other number types). Set ``FAST_MIN_TERMS`` to a huge value
to force the plain loops.

>>> from fractions import Fraction
>>> reciprocal([1, -1], 12)[:4]
[1, 1, 1, 1]
>>> with mpmath.workdps(30):
...     e = exp([0, mpmath.mpf(1)], 20)
...     print(mpmath.nstr(e[10] * mpmath.factorial(10), 25))
1.0
"""
from __future__ import annotations

from fractions import Fraction
from numbers import Integral

import mpmath

FAST_MIN_TERMS = 8
FAST_GUARD_BITS = 20


# ----------------------------------------------------------------------------
# FLINT fast paths
# ----------------------------------------------------------------------------

def _kind(*seqs):
    """'exact', 'real', 'complex' or None (some other number type)."""
    kind = "exact"
    for seq in seqs:
        for x in seq:
            if isinstance(x, bool):
                return None
            if isinstance(x, (Integral, Fraction)):
                continue
            if isinstance(x, (mpmath.mpf, float)):
                if kind == "exact":
                    kind = "real"
                continue
            if isinstance(x, (mpmath.mpc, complex)):
                kind = "complex"
                continue
            return None
    return kind


def _fast(n, *seqs):
    if n < FAST_MIN_TERMS:
        return None
    return _kind(*seqs)


class _Flint:
    """Sets flint's precision (mpmath's + guard) and series cap for a block."""

    def __init__(self, n):
        self.n = n

    def __enter__(self):
        import flint
        self.flint = flint
        self.old = (flint.ctx.prec, flint.ctx.cap)
        flint.ctx.prec = mpmath.mp.prec + FAST_GUARD_BITS
        flint.ctx.cap = max(int(self.n), 1)
        return flint

    def __exit__(self, *exc):
        self.flint.ctx.prec, self.flint.ctx.cap = self.old
        return False


def _to_q(a):
    from .flint_bridge import fraction_to_fmpq
    return [fraction_to_fmpq(x) for x in a]


def _from_q(coeffs, n):
    out = []
    for x in coeffs:
        p, q = int(x.p), int(x.q)
        out.append(p if q == 1 else Fraction(p, q))
    return (out + [0] * n)[:n]


def _to_ball(a, kind):
    from .flint_bridge import to_acb, to_arb
    return [to_acb(x) for x in a] if kind == "complex" else [to_arb(x) for x in a]


def _from_ball(coeffs, n, kind):
    from .flint_bridge import acb_to_mpc, arb_to_mpf
    if kind == "complex":
        out = [+acb_to_mpc(x, exact=False) for x in coeffs]
        zero = mpmath.mpc(0)
    else:
        out = [arb_to_mpf(x, exact=False) for x in coeffs]
        zero = mpmath.mpf(0)
    return (out + [zero] * n)[:n]


def _series_cls(flint, kind):
    return flint.acb_series if kind == "complex" else flint.arb_series


def _fast_unary(a, n, kind, op):
    """Apply a series function (inv, exp, log) with FLINT; None if not handled."""
    a = list(a[:n])
    with _Flint(n) as flint:
        if kind == "exact":
            s = flint.fmpq_series(_to_q(a), prec=n)
            r = {"inv": lambda t: 1 / t, "exp": lambda t: t.exp(), "log": lambda t: t.log()}[op](s)
            return _from_q(r.coeffs(), n)
        S = _series_cls(flint, kind)
        s = S(_to_ball(a, kind), prec=n)
        r = {"inv": lambda t: 1 / t, "exp": lambda t: t.exp(), "log": lambda t: t.log()}[op](s)
        return _from_ball(r.coeffs(), n, kind)


def _zero_like(x):
    return 0


def mul(a, b, n):
    """Product of two series, first ``n`` coefficients."""
    kind = _fast(n, a, b)
    if kind is not None and a and b:
        with _Flint(n) as flint:
            if kind == "exact":
                r = flint.fmpq_poly(_to_q(a[:n])).mul_low(flint.fmpq_poly(_to_q(b[:n])), n)
                return _from_q(r.coeffs(), n)
            P = flint.acb_poly if kind == "complex" else flint.arb_poly
            r = (P(_to_ball(a[:n], kind)) * P(_to_ball(b[:n], kind)))
            return _from_ball(r.coeffs()[:n], n, kind)
    out = [0] * n
    la, lb = len(a), len(b)
    for i in range(min(la, n)):
        ai = a[i]
        if ai == 0:
            continue
        for j in range(min(lb, n - i)):
            out[i + j] += ai * b[j]
    return out


def reciprocal(a, n):
    """1/a to ``n`` terms; requires ``a[0] != 0``."""
    if not a or a[0] == 0:
        raise ZeroDivisionError("reciprocal of a series needs a non-zero constant term")
    kind = _fast(n, a)
    if kind is not None:
        return _fast_unary(a, n, kind, "inv")
    a0 = a[0]
    inv0 = Fraction(1, a0) if isinstance(a0, int) else (1 / a0)
    out = [inv0]
    for k in range(1, n):
        s = 0
        for j in range(1, min(k, len(a) - 1) + 1):
            s += a[j] * out[k - j]
        out.append(-s * inv0)
    return out


def div(a, b, n):
    return mul(a, reciprocal(b, n), n)


def compose(a, b, n):
    """a(b(x)) to ``n`` terms; requires ``b[0] == 0`` (Horner on series)."""
    if b and b[0] != 0:
        raise ValueError("composition a(b(x)) needs b(0) = 0")
    kind = _fast(n, a, b)
    if kind is not None and a and b:
        with _Flint(n) as flint:
            if kind == "exact":
                r = flint.fmpq_series(_to_q(a[:n]), prec=n)(flint.fmpq_series(_to_q(b[:n]), prec=n))
                return _from_q(r.coeffs(), n)
            S = _series_cls(flint, kind)
            r = S(_to_ball(a[:n], kind), prec=n)(S(_to_ball(b[:n], kind), prec=n))
            return _from_ball(r.coeffs(), n, kind)
    out = [0] * n
    for k in range(min(len(a), n) - 1, -1, -1):
        out = mul(out, b, n)
        out[0] += a[k]
    return out


def derivative(a):
    return [k * a[k] for k in range(1, len(a))]


def integral(a, c0=0):
    return [c0] + [a[k] / (k + 1) if not isinstance(a[k], int) else Fraction(a[k], k + 1)
                   for k in range(len(a))]


def log(a, n):
    """log a(x) to ``n`` terms; the constant is log a[0] (exact 0 when a[0] == 1)."""
    if not a or a[0] == 0:
        raise ValueError("log of a series needs a non-zero constant term")
    kind = _fast(n, a)
    if kind is not None and not (kind == "exact" and a[0] != 1) and \
            not (kind != "complex" and a[0] < 0):          # log of a negative: plain path
        return _fast_unary(a, n, kind, "log")
    d = div(derivative(a), a, n - 1) if n > 1 else []
    c0 = 0 if a[0] == 1 else mpmath.log(a[0])
    return integral(d, c0)[:n]


def exp(a, n):
    """exp a(x) to ``n`` terms (recurrence n b_n = sum k a_k b_{n-k})."""
    a = list(a) + [0] * max(0, n - len(a))
    kind = _fast(n, a)
    if kind is not None and not (kind == "exact" and a[0] != 0):
        return _fast_unary(a, n, kind, "exp")
    b0 = 1 if a[0] == 0 else mpmath.exp(a[0])
    b = [b0]
    for m in range(1, n):
        s = 0
        for k in range(1, m + 1):
            if a[k] != 0:
                s += k * a[k] * b[m - k]
        b.append(Fraction(s, m) if isinstance(s, (int, Fraction)) and not isinstance(s, bool) else s / m)
    return b


def power(a, p, n):
    """a(x)^p for a rational or real p, via exp(p log a) when a[0] != 0."""
    if isinstance(p, int) and p >= 0:
        out = [1] + [0] * (n - 1)
        base = list(a[:n])
        while p:
            if p & 1:
                out = mul(out, base, n)
            base = mul(base, base, n)
            p >>= 1
        return out
    return exp([p * c for c in log(a, n)], n)
