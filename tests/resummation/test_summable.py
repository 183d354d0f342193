"""Resummation of Borel-summable and non-Borel-summable factorial series.

Each check states its outside source. Three things are asserted: the truth
lies in the band (honest), the band is narrow (sharp), enough digits match.
"""
import math

import mpmath
import pytest

from resum.context import Context, workdps
from resum.resummation import evaluate
from resum.series import Series


def _digits(est, truth):
    return float(-mpmath.log10(abs(est.value - truth) / abs(truth)))


@pytest.mark.parametrize("x, method", [("0.1", "borel-pade"), ("1", "borel-pade"), ("1", "auto")])
def test_euler_series(x, method):
    # Euler series sum (-1)^n n! x^n; Borel sum e^{1/x} E_1(1/x) / x (Euler; see C. M. Bender and
    # S. A. Orszag, Advanced Mathematical Methods for Scientists and Engineers (1978), sec. 8.2);
    # reference values from mpmath's exponential integral e1.
    s = Series([(-1) ** n * math.factorial(n) for n in range(30)])
    r = evaluate(s, [x], Context(dps=25), method=method, verify=False)
    p = r.points[0]
    with workdps(60):
        X = mpmath.mpf(x)
        truth = mpmath.exp(1 / X) * mpmath.e1(1 / X) / X
        assert p.success and p.value.contains(truth)
        assert p.value.digits() >= 24                      # sharp: what was asked (25 digits)
        assert _digits(p.value, truth) >= 24
        # the optimal-truncation baseline is reported and is honest too
        assert p.baseline.value.contains(truth)


@pytest.mark.parametrize("x", ["0.1", "0.25"])
def test_non_borel_summable_lateral_sums(x):
    # sum n! x^n: Borel transform 1/(1-t), pole on the Laplace ray. Lateral sums
    # S(x +- i0) = e^{-1/x} (Ei(1/x) -+ ... ) / x: real part e^{-1/x} Ei(1/x) / x (principal value),
    # imaginary part +- pi e^{-1/x} / x (Bender and Orszag 1978, sec. 8.2); mpmath ei as reference.
    s = Series([math.factorial(n) for n in range(30)])
    r = evaluate(s, [x], Context(dps=20), method="borel-pade", verify=False)
    p = r.points[0]
    with workdps(60):
        X = mpmath.mpf(x)
        re_truth = mpmath.exp(-1 / X) * mpmath.ei(1 / X) / X
        im_truth = mpmath.pi * mpmath.exp(-1 / X) / X
        assert p.success and p.diagnostics["lateral"]
        assert p.value.contains(re_truth) and p.imag.contains(im_truth)
        assert _digits(p.value, re_truth) >= 19 and _digits(p.imag, im_truth) >= 19
        assert p.imag.error <= abs(re_truth) * mpmath.mpf(10) ** -19   # band at the asked 20 digits
        # the ambiguity is compared with exp(-A/x) for the ray singularity A = 1
        assert abs(mpmath.mpf(p.diagnostics["ray_singularity"]) - 1) < 1e-12
    cd = r.contract_dict()
    assert set(cd["values"][0]) - {"terms_needed", "message"} == {"at", "value", "lo", "hi", "method", "digits",
                                                                   "im", "im_lo", "im_hi", "status", "text",
                                                                   "im_text", "truncation"}


@pytest.mark.parametrize("g", ["0.5", "2"])
def test_phi4_integral(g):
    # zero-dimensional phi^4 integral; closed form e^{1/(8g)} K_{1/4}(1/(8g)) / (2 sqrt(pi g))
    # (Gradshteyn-Ryzhik 3.323.3), evaluated here with mpmath besselk, and cross-checked
    # against direct quadrature (mpmath.quad).
    from resum.sources import phi4
    s = phi4.series(60)
    r = evaluate(s, [g], Context(dps=20), verify=False)
    p = r.points[0]
    with workdps(50):
        G = mpmath.mpf(g)
        truth = mpmath.exp(1 / (8 * G)) * mpmath.besselk(mpmath.mpf(1) / 4, 1 / (8 * G)) / (2 * mpmath.sqrt(mpmath.pi * G))
        quad = mpmath.quad(lambda t: mpmath.exp(-t ** 2 / 2 - G * t ** 4 / 4), [-mpmath.inf, 0, mpmath.inf]) / mpmath.sqrt(2 * mpmath.pi)
        assert abs(truth - quad) < mpmath.mpf(10) ** -40
        assert p.success and p.value.contains(truth)
        want = 15 if g == "0.5" else 9
        assert _digits(p.value, truth) >= want
        assert p.value.error <= 100 * abs(p.value.value - truth) + abs(truth) * mpmath.mpf(10) ** -19


def test_oscillator_ground_state_borel_conformal():
    # quartic oscillator H = p^2 + x^2 + g x^4: Rayleigh-Schrodinger series from the Bender-Wu
    # recursion (C. M. Bender and T. T. Wu, Phys. Rev. 184 (1969) 1231); E(g = 1) =
    # 1.392351641530291855657507876609934 (F. T. Hioe and E. W. Montroll, J. Math. Phys. 16 (1975) 1945).
    from resum.sources import oscillator
    s = oscillator.series(0, 100)
    assert s.coefficients[:4] == (1, mpmath.mpf(3) / 4, mpmath.mpf(-21) / 16, mpmath.mpf(333) / 64)
    r = evaluate(s, ["1"], Context(dps=30), verify=False)
    p = r.points[0]
    assert p.method == "borel-conformal-pade"
    with workdps(50):
        truth = mpmath.mpf("1.392351641530291855657507876609934")
        assert p.success and p.value.contains(truth)
        assert _digits(p.value, truth) >= 19            # ~20 digits from 100 terms
        assert p.value.error <= 100 * abs(p.value.value - truth)
        # the nearest Borel singularity the evaluation mapped from: t = -2/3 (Bender-Wu: c_n ~ (-3/2)^n Gamma(n+1/2))
        assert abs(mpmath.mpf(r.provenance.options["map"]["x0"]) + mpmath.mpf(2) / 3) < 1e-6


@pytest.mark.slow
def test_oscillator_200_terms_strong():
    # as above, 200 terms; truth at g = 1 from Hioe-Montroll (1975), at g = 10 from the sources'
    # basis diagonalization (independent of the series), both checked to 30 digits
    from resum.sources import oscillator
    s = oscillator.series(0, 200)
    r = evaluate(s, ["1", "10"], Context(dps=40), verify=False)
    with workdps(60):
        t1 = mpmath.mpf("1.392351641530291855657507876609934")      # published to 34 digits
        t1_diag = oscillator.energy(1, 0, Context(dps=45)).value.value
        assert abs(t1_diag - t1) < mpmath.mpf(10) ** -33
        t10 = oscillator.energy(10, 0, Context(dps=40)).value.value
        p1, p10 = r.points
        assert p1.value.contains(t1_diag) and _digits(p1.value, t1) >= 30
        assert p10.value.contains(t10) and _digits(p10.value, t10) >= 15
