"""Method ``borel-ode``: Borel sums through the exact equation of the Borel transform.

Truths are closed forms evaluated by mpmath at 60 digits; each check names its source.
"""
import math
from fractions import Fraction

import mpmath
import pytest

from resum.context import Context, workdps
from resum.resummation import evaluate
from resum.series import Series


def _digits(value, truth):
    return float(-mpmath.log10(abs(value - truth) / abs(truth)))


@pytest.mark.parametrize("x", ["0.1", "1"])
def test_euler_series_by_auto(x):
    # sum (-1)^n n! x^n: Borel transform 1/(1+t); Borel sum e^{1/x} E_1(1/x)/x (C. M. Bender and
    # S. A. Orszag, Advanced Mathematical Methods for Scientists and Engineers (1978), sec. 8.2);
    # mpmath's e1 as reference
    s = Series([(-1) ** n * math.factorial(n) for n in range(30)])
    r = evaluate(s, [x], Context(dps=30))
    p = r.points[0]
    assert p.method == "borel-ode" and "B'" in r.diagnostics["equation"]
    with workdps(60):
        X = mpmath.mpf(x)
        truth = mpmath.exp(1 / X) * mpmath.e1(1 / X) / X
        assert p.success and p.value.contains(truth) and _digits(p.value.value, truth) >= 30


def test_non_borel_summable_series_gives_both_lateral_sums():
    # sum n! x^n: Borel transform 1/(1-t), a pole on the Laplace ray at t = 1. Lateral sums: real
    # part e^{-1/x} Ei(1/x)/x, imaginary part +-pi e^{-1/x}/x (Bender and Orszag 1978, sec. 8.2);
    # mpmath's ei as reference
    s = Series([math.factorial(n) for n in range(30)])
    r = evaluate(s, ["0.25"], Context(dps=25))
    p = r.points[0]
    assert p.method == "borel-ode" and p.diagnostics["lateral"]
    assert abs(mpmath.mpf(p.diagnostics["ray_singularity"]) - 1) < 1e-20
    with workdps(60):
        X = mpmath.mpf("0.25")
        re_truth = mpmath.exp(-1 / X) * mpmath.ei(1 / X) / X
        im_truth = mpmath.pi * mpmath.exp(-1 / X) / X
        assert p.value.contains(re_truth) and p.imag.contains(im_truth)
        assert _digits(p.value.value, re_truth) >= 25 and _digits(p.imag.value, im_truth) >= 25
    # the lateral sums in the diagnostics carry the final bands' digits, not more
    assert p.diagnostics["S_plus"] == f"{p.value} + i {p.imag}"
    assert p.diagnostics["S_minus"] == f"{p.value} - i {p.imag}"


@pytest.mark.parametrize("g", ["0.5", "2"])
def test_phi4_integral(g):
    # zero-dimensional phi^4 integral, closed form e^{1/(8g)} K_{1/4}(1/(8g)) / (2 sqrt(pi g))
    # (Gradshteyn-Ryzhik 3.323.3), mpmath besselk. Its Borel transform obeys a second-order
    # equation; conformal Borel-Padé gave 29.0 and 21.4 digits from 60 terms (studies/accuracy)
    from resum.sources import phi4
    r = evaluate(phi4.series(60), [g], Context(dps=30), verify=False)
    p = r.points[0]
    assert p.method == "borel-ode" and "B''" in r.diagnostics["equation"]
    with workdps(60):
        G = mpmath.mpf(g)
        truth = (mpmath.exp(1 / (8 * G)) * mpmath.besselk(mpmath.mpf(1) / 4, 1 / (8 * G))
                 / (2 * mpmath.sqrt(mpmath.pi * G)))
        assert p.value.contains(truth) and _digits(p.value.value, truth) >= 30


def test_stieltjes_series_with_a_branch_point():
    # sum (-1)^k Gamma(k+b+1)/Gamma(b+1) x^k, b = -1/3 (exact rationals): Borel transform
    # (1+t)^(-b-1), Borel sum e^{1/x} E_{b+1}(1/x)/x with E_a the generalized exponential
    # integral (DLMF 8.19.1 after t -> 1 + x u); mpmath expint as reference
    b = Fraction(-1, 3)
    c, v = [], Fraction(1)
    for k in range(40):
        c.append((-1) ** k * v)
        v *= k + b + 1
    r = evaluate(Series(c), ["5"], Context(dps=30), verify=False)
    p = r.points[0]
    assert p.method == "borel-ode"
    with workdps(60):
        X = mpmath.mpf(5)
        truth = mpmath.exp(1 / X) * mpmath.expint(mpmath.mpf(2) / 3, 1 / X) / X
        assert p.value.contains(truth) and _digits(p.value.value, truth) >= 30


def test_series_whose_borel_transform_obeys_no_equation_is_refused():
    # the quartic oscillator's Rayleigh-Schroedinger series (Bender-Wu recursion) is not D-finite
    # (common practice, no source): borel-ode refuses it and auto keeps conformal Borel-Padé
    from resum.sources import oscillator
    s = oscillator.series(0, 40)
    r = evaluate(s, ["1"], Context(dps=15), method="borel-ode", verify=False)
    assert not r.points[0].success and "Borel transform obeys no" in r.points[0].message
    assert evaluate(s, ["1"], Context(dps=15), verify=False).points[0].method == "borel-conformal-pade"
