"""Reference series for the singularity tests, each with its source.

Coefficients come from closed forms evaluated exactly (Fractions) or with
mpmath, or from published recursions; nothing here is fitted or invented.
"""
import json
import math
import os
from fractions import Fraction

import mpmath

from resum.context import workdps
from resum.series import Series

DATA = os.path.join(os.path.dirname(__file__), os.pardir, "data")


def binomial_power(theta, n, scale=1):
    """(1 - x/x_c)^theta with x_c = 1/scale: c_k = binomial(theta, k) (-scale)^k, exact
    for rational theta. # common practice, no source (binomial series)"""
    theta = Fraction(theta)
    out, c = [], Fraction(1)
    for k in range(n):
        out.append(c)
        c = c * (theta - k) / (k + 1) * (-Fraction(scale))
    return out


def catalan(n):
    """Catalan generating function (1 - sqrt(1-4x))/(2x): radius 1/4, exponent 1/2
    (common practice, no source)."""
    return [Fraction(math.comb(2 * k, k), k + 1) for k in range(n)]


def log1p_series(n):
    """log(1+x) = sum (-1)^(k+1) x^k / k: log singularity at x = -1 (common practice)."""
    return [Fraction(0)] + [Fraction((-1) ** (k + 1), k) for k in range(1, n)]


def complex_pair(n, dps):
    """1/(1 - x + x^2)^(2/5): conjugate pair at exp(+-i pi/3), exponent -2/5, coefficients
    from mpmath's series arithmetic (common practice, no source)."""
    from resum._kernels import series_ops as ops
    with workdps(dps):
        return ops.power([mpmath.mpf(1), mpmath.mpf(-1), mpmath.mpf(1)], -mpmath.mpf(2) / 5, n)


def two_singularities(n):
    """(1-x)^(-1/2) + (1+x/2)^(-3/2): points 1 (theta -1/2) and -2 (theta -3/2)."""
    a = binomial_power(Fraction(-1, 2), n)
    b = binomial_power(Fraction(-3, 2), n, scale=Fraction(-1, 2))
    return [x + y for x, y in zip(a, b)]


def confluent(n):
    """(1-x)^(-1/3) (1 + (1-x)^(1/2)): leading exponent -1/3 with a confluent correction
    of relative order (1-x)^(1/2)."""
    a = binomial_power(Fraction(-1, 3), n)
    b = binomial_power(Fraction(1, 6), n)
    return [x + y for x, y in zip(a, b)]


def euler_series(n):
    """sum (-1)^k k! x^k: c_k = S A^-k Gamma(k+b) with A = -1, b = 1 (common practice)."""
    return [(-1) ** k * math.factorial(k) for k in range(n)]


def quartic_oscillator(n):
    """Ground-state energy of H = p^2 + x^2 + g x^4 to order g^(n-1), exactly.

    Bender-Wu recursion (C. M. Bender and T. T. Wu, Phys. Rev. 184 (1969) 1231): with
    psi = exp(-x^2/2) sum_m g^m sum_j B[m][j] x^(2j) and B[m][0] = delta_m0, order m gives
    4 j B[m][j] - (2j+2)(2j+1) B[m][j+1] = sum_{k=1}^{m-1} E_k B[m-k][j] - B[m-1][j-2]
    for j >= 1 and E_m = -2 B[m][1]. First terms 1, 3/4, -21/16, 333/64 (Bender-Wu 1969,
    from memory).
    """
    B = [[Fraction(1)]]
    E = [Fraction(1)]
    for m in range(1, n):
        top = 2 * m
        row = [Fraction(0)] * (top + 2)

        def get(mm, j):
            r = B[mm]
            return r[j] if 0 <= j < len(r) else Fraction(0)

        for j in range(top, 0, -1):
            rhs = sum((E[k] * get(m - k, j) for k in range(1, m)), Fraction(0)) - get(m - 1, j - 2)
            row[j] = (rhs + (2 * j + 2) * (2 * j + 1) * row[j + 1]) / (4 * j)
        B.append(row)
        E.append(-2 * row[1])
    return E


def lattice(name):
    """A published lattice series from tests/data (sources kept in each file)."""
    with open(os.path.join(DATA, name + ".json")) as f:
        d = json.load(f)
    return [int(x) for x in d["coefficients"]], d


def series(cs, **kw):
    return Series(cs, **kw)
