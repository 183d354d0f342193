"""Optimal truncation when the series has vanishing terms (leading zeros, gaps of a series in x^m).

Truth: the Borel sum of Euler's series, sum (-1)^n n! y^n = e^{1/y} E_1(1/y) / y (C. M. Bender and
S. A. Orszag, Advanced Mathematical Methods for Scientists and Engineers (1978), sec. 8.2), with
mpmath's e1 as the reference. Stopping at the smallest term misses the sum by about that term
(common practice, no source), so the band of +- the smallest term must hold the truth.
"""
import math

import mpmath
import pytest

from resum.context import workdps
from resum.estimators.resum_truncation import optimal_truncation


def _euler_sum(y):
    return mpmath.exp(1 / y) * mpmath.e1(1 / y) / y


@pytest.mark.parametrize("start", [0, 2, 3])
def test_series_starting_late(start):
    # x^start * sum (-1)^n n! x^n at x = 0.1: leading zeros must not stop the sum before it starts
    c = [0] * start + [(-1) ** n * math.factorial(n) for n in range(30)]
    with workdps(40):
        x = mpmath.mpf("0.1")
        t = optimal_truncation(c, x, 40)
        truth = x ** start * _euler_sum(x)
        assert t["n_terms"] > start + 5                 # the smallest term sits near n = 1/x
        assert t["value"].error > 0
        assert t["value"].contains(truth)
        assert t["value"].error < abs(truth) * mpmath.mpf(10) ** -3


@pytest.mark.parametrize("m", [2, 3])
def test_series_in_a_power_of_x(m):
    # sum (-1)^n n! x^(m n) at x^m = 0.1: m - 1 zeros between the terms
    c = []
    for n in range(30):
        c += [(-1) ** n * math.factorial(n)] + [0] * (m - 1)
    with workdps(40):
        x = mpmath.mpf("0.1") ** (mpmath.mpf(1) / m)
        t = optimal_truncation(c, x, 40)
        truth = _euler_sum(mpmath.mpf("0.1"))
        assert t["value"].error > 0
        assert t["value"].contains(truth)
        assert t["value"].error < abs(truth) * mpmath.mpf(10) ** -3


def test_convergent_series_ending_in_zeros():
    # atan(y)/y = sum (-1)^n y^(2n)/(2n+1) with y = x^3: five zeros between the terms and five
    # after the last one; all terms summed, the band is the last non-zero term, which bounds the
    # tail of an alternating series with decreasing terms (Leibniz; mpmath atan as reference)
    c = []
    for n in range(12):
        c += [mpmath.mpf((-1) ** n) / (2 * n + 1)] + [0] * 5
    with workdps(30):
        x = mpmath.mpf("0.9")
        t = optimal_truncation(c, x, 30)
        y = x ** 3
        assert not t["reached"] and t["value"].error > 0
        assert t["value"].contains(mpmath.atan(y) / y)
