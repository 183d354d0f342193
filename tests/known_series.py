"""Series with closed forms, shared by the tests.

binomial_series(p, n): (1 + x)^p = sum_k binom(p, k) x^k, exact rationals; one branch point at
x = -1 (cut (-inf, -1]), radius 1 (common practice, no source). Truths come from mpmath's
principal power in each test.
"""
from fractions import Fraction

from resum.series import Series


def binomial_series(p, n: int, name: str = "binomial") -> Series:
    """The first ``n`` coefficients of (1 + x)^p as a Series of Fractions."""
    c = [Fraction(1)]
    for k in range(1, n):
        c.append(c[-1] * (p - (k - 1)) / k)
    return Series(c, name=name)
