"""Optimal truncation when the series has vanishing terms (leading zeros, gaps of a series in x^m,
the zeros after the last term of a polynomial) and inexact coefficients.

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


@pytest.mark.parametrize("x, truth", [("0.5", "2.75"), ("2", "17"), ("-3", "22")])
def test_exact_polynomial_is_summed_whole(x, truth):
    # 1 + 2x + 3x^2 padded with zeros: the zeros are not the smallest terms, the sum is exact
    # (its values by hand, common practice, no source); the band is the input's precision alone
    c = [1, 2, 3] + [0] * 7
    with workdps(40):
        t = optimal_truncation(c, mpmath.mpf(x), 40, digits=30)
        assert t["n_terms"] == 3 and t["reached"] and t["smallest_term"] == 0
        assert t["value"].value == mpmath.mpf(truth)
        assert 0 < t["value"].error <= 10 * abs(mpmath.mpf(truth)) * mpmath.mpf(10) ** -30


def test_evaluate_baseline_of_a_polynomial():
    # the baseline beside the resummed values of 1 + 2x + 3x^2 (exact: 2.75 and 17, common
    # practice, no source) is the whole polynomial, at the digits reported
    from resum.context import Context
    from resum.resummation import evaluate
    from resum.series import Series
    r = evaluate(Series([1, 2, 3] + [0] * 7), ["0.5", "2"], Context(dps=20), verify=False)
    for p, truth in zip(r.points, ("2.75", "17")):
        b = p.baseline
        assert b.n_terms == 3 and b.reached
        assert b.value.contains(mpmath.mpf(truth)) and b.value.error < mpmath.mpf(10) ** -15


@pytest.mark.parametrize("name, x", [("cos", "3"), ("cos", "-1.25"), ("exp2", "1.5"), ("exp2", "0.5")])
def test_gapped_series_against_mpmath(name, x):
    # cos(x) = sum (-1)^k x^(2k)/(2k)!, exp(x^2) = sum x^(2k)/k! (common practice, no source):
    # every other coefficient zero, both entire; mpmath's cos and exp as reference
    with workdps(40):
        c = []
        for k in range(20):
            c += [(-1) ** k / mpmath.factorial(2 * k) if name == "cos" else 1 / mpmath.factorial(k), 0]
        xv = mpmath.mpf(x)
        truth = mpmath.cos(xv) if name == "cos" else mpmath.exp(xv ** 2)
        t = optimal_truncation(c, xv, 40, digits=35)
        assert t["value"].contains(truth)
        assert t["value"].error < abs(truth) * mpmath.mpf(10) ** -9


def test_input_digits_bound_the_band():
    # coefficients known to 3 digits: the partial sum cannot claim more, even where the last
    # term is far smaller (log(1+x)/x = sum (-1)^n x^n/(n+1), common practice, no source)
    with workdps(30):
        c = [mpmath.mpf((-1) ** n) / (n + 1) for n in range(40)]
        t = optimal_truncation(c, mpmath.mpf("0.1"), 30, digits=3)
        assert t["value"].error >= mpmath.mpf(10) ** -3
        assert t["value"].contains(mpmath.log(mpmath.mpf("1.1")) / mpmath.mpf("0.1"))
