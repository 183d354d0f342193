"""Truncated power-series arithmetic on coefficient lists.

All functions take coefficient lists low to high and an output length ``n``
and work with any numbers that support ``+ - * /`` (ints, Fractions, mpf,
mpc), so exact input stays exact. Cost is O(n^2) in the number type used;
the fast ball-arithmetic versions live beside these where they pay.
"""
from __future__ import annotations

from fractions import Fraction

import mpmath


def _zero_like(x):
    return 0


def mul(a, b, n):
    """Product of two series, first ``n`` coefficients."""
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
    d = div(derivative(a), a, n - 1) if n > 1 else []
    c0 = 0 if a[0] == 1 else mpmath.log(a[0])
    return integral(d, c0)[:n]


def exp(a, n):
    """exp a(x) to ``n`` terms (recurrence n b_n = sum k a_k b_{n-k})."""
    a = list(a) + [0] * max(0, n - len(a))
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
