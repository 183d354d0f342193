"""Series with closed forms, shared by the tests.

partition_numbers(n): coefficients of prod_k 1/(1 - x^k) (natural boundary on |x| = 1).

binomial_series(p, n, scale=1): (1 + x/scale)^p = sum_k binom(p, k) (x/scale)^k, exact
rationals; one branch point at x = -scale (cut (-inf, -scale]), radius |scale| (common
practice, no source).
quadratic_series(p, a1, a2, n): (1 + a1 x + a2 x^2)^p, exact rationals, from the first-order
equation (1 + a1 x + a2 x^2) f' = p (a1 + 2 a2 x) f (common practice, no source).
Truths come from mpmath's principal power in each test.
"""
from fractions import Fraction

from resum.series import Series


def binomial_series(p, n: int, name: str = "binomial", scale=1) -> Series:
    """The first ``n`` coefficients of (1 + x/scale)^p as a Series of Fractions."""
    c = [Fraction(1)]
    for k in range(1, n):
        c.append(c[-1] * (p - (k - 1)) / k / Fraction(scale))
    return Series(c, name=name)


def quadratic_series(p, a1, a2, n: int) -> list:
    """The first ``n`` coefficients of (1 + a1 x + a2 x^2)^p (Fractions)."""
    c = [Fraction(1)] + [Fraction(0)] * (n - 1)
    for m in range(1, n):
        v = (p - (m - 1)) * a1 * c[m - 1]
        if m >= 2:
            v += (2 * p - (m - 2)) * a2 * c[m - 2]
        c[m] = v / m
    return c


def partition_numbers(n: int) -> list:
    """p(0..n-1), the coefficients of prod_k 1/(1 - x^k) (Euler's recurrence by parts; common
    practice, no source): exact integers."""
    p = [1] + [0] * (n - 1)
    for k in range(1, n):
        for m in range(k, n):
            p[m] += p[m - k]
    return p
