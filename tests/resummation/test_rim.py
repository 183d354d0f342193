"""Points near the rim of the mapped disk (far beyond the radius).

Binomial series (1 + x)^p = sum binom(p, k) x^k, cut (-inf, -1] (common practice, no source);
truths from mpmath's power function at 50 digits. With the map from x0 = -1,
w = (sqrt(1 + x) - 1)/(sqrt(1 + x) + 1), so x = 1e6 sits at 1 - |w| = 0.002.
"""
from fractions import Fraction

import mpmath
import pytest

from resum.context import Context, workdps
from resum.resummation import evaluate
from resum.series import Series
from tests.known_series import binomial_series


@pytest.mark.parametrize("x", ["1e5", "1e6"])
def test_pole_on_the_rim_is_not_a_reason_to_drop_approximants(x):
    # sqrt(1 + x) = (1 + w)/(1 - w): a genuine pole at w = 1, which every approximant
    # reproduces. Before, each was dropped for a "pole near the point" and the point failed
    # ("only 1 usable approximants") for x >= 1e5; now 30 digits.
    res = evaluate(binomial_series(Fraction(1, 2), 40), [x], Context(dps=30), method="conformal-pade")
    p = res.points[0]
    assert p.success and p.method == "conformal-pade"
    with workdps(50):
        truth = mpmath.sqrt(1 + mpmath.mpf(x))
        assert p.value.contains(truth)
        assert abs(p.value.value - truth) / truth < mpmath.mpf(10) ** -25


@pytest.mark.parametrize("x,widened", [("1e3", False), ("1e6", True), ("1e7", True)])
def test_band_near_the_rim_still_holds(x, widened):
    # (1 + x)^(-1/3) from 40 terms: at 1e6 the band used to be 0.0109(7) around the true
    # 0.0100000 (band/error 0.67, truth outside). Points within 1/40 of the rim now get
    # their band widened by 1/((1 - |w|) 40): band/error 8.4 at 1e6 and 19 at 1e7.
    # The power x^(-1/3) is not given (large_x_power=0), as for a function whose large-x
    # power cannot be read off; read off, it makes the mapped function (1 + w)^(-2/3) and
    # the rim harmless (next test).
    res = evaluate(binomial_series(Fraction(-1, 3), 40), [x], Context(dps=30), method="conformal-pade",
                   large_x_power=0)
    p = res.points[0]
    with workdps(50):
        truth = (1 + mpmath.mpf(x)) ** (-mpmath.mpf(1) / 3)
        err = abs(p.value.value - truth)
        assert p.value.contains(truth)
        assert p.value.error / err <= 100
    assert ("rim_layer" in p.diagnostics) == widened
    assert any("rim of the mapped disk" in w for w in res.warnings) == widened


@pytest.mark.parametrize("x", ["1e4", "1e6", "1e7"])
def test_power_read_from_the_series_removes_the_rim_problem(x):
    # |w| >= 0.98 here: the power read from the series is used (from |w| = 0.95 on)
    res = evaluate(binomial_series(Fraction(-1, 3), 40), [x], Context(dps=30), method="conformal-pade")
    p = res.points[0]
    assert "x^(-1/3) at large x" in res.diagnostics["why"]
    assert p.diagnostics["rim_power_alpha"] is not None
    with workdps(50):
        truth = (1 + mpmath.mpf(x)) ** (-mpmath.mpf(1) / 3)
        assert p.value.contains(truth)
        assert abs(p.value.value - truth) / truth < mpmath.mpf(10) ** -29


@pytest.mark.parametrize("n", [40, 80])
def test_rounded_series_reads_its_power_closer_in(n):
    # (1 + x)^(1/3) from 40 or 80 terms rounded to 16 digits (as from double precision) at
    # x = 1000, |w| = 0.939: without the power read from the series every approximant sat 0.01
    # below the truth 10.0033 and the band (9.992(9) from 40 terms, 9.991(13) from 80) missed it.
    # The power is now divided out within 4/N of the rim, N at most 2 x 16 + 8 for 16-digit
    # input: 11-12 digits, in band
    with workdps(16):
        c = [+mpmath.mpf(v.numerator) / v.denominator for v in binomial_series(Fraction(1, 3), n).coefficients]
    res = evaluate(Series(c, digits=16), ["1000"], Context(dps=20))
    p = res.points[0]
    assert p.diagnostics["rim_power_alpha"] is not None
    with workdps(50):
        truth = mpmath.mpf(1001) ** (mpmath.mpf(1) / 3)
        assert p.value.contains(truth)
        assert abs(p.value.value - truth) / truth < mpmath.mpf(10) ** -9
