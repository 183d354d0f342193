"""Series with closed forms, shared by the tests.

binomial_series(p, n, scale=1): (1 + x/scale)^p = sum_k binom(p, k) (x/scale)^k, exact
rationals; one branch point at x = -scale (cut (-inf, -scale]), radius |scale| (common
practice, no source). Truths come from mpmath's principal power in each test.
"""
from fractions import Fraction

from resum.series import Series


def binomial_series(p, n: int, name: str = "binomial", scale=1) -> Series:
    """The first ``n`` coefficients of (1 + x/scale)^p as a Series of Fractions."""
    c = [Fraction(1)]
    for k in range(1, n):
        c.append(c[-1] * (p - (k - 1)) / k / Fraction(scale))
    return Series(c, name=name)
