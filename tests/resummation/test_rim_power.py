"""The large-x power read from the series through the conformal map (rim_power) and its
use by conformal plans when the user gives none.

Sources: binomial series (1 + x)^p = sum binom(p, k) x^k, and arctan(sqrt x)/sqrt x ~
(pi/2) x^(-1/2) at large x (common practice, no source); log(1 + x)/x ~ log(x)/x, not a
power (common practice, no source). The angle-deformed kernel family at a = 0 is
(2/pi^2) log cosh(2 pi g) ~ 4 g/pi, i.e. x^(1/2) with x = g^2 (closed form: Belitsky and
Korchemsky, arXiv:1907.13131), at a = pi/4 the cusp anomalous dimension ~ 2 g (Frolov and
Tseytlin, hep-th/0204226); truth at finite coupling from mpmath's log and cosh.
"""
from fractions import Fraction

import mpmath
import pytest

from resum.context import Context, workdps
from resum.estimators.resum_conformal import rim_power
from resum.resummation import evaluate
from resum.sources.bes import weak_coupling_series, zero_angle_closed_form
from resum.transforms.conformal import RayMap
from tests.known_series import binomial_series


@pytest.mark.parametrize("p", [Fraction(1, 3), Fraction(-1, 2), Fraction(3, 4)])
def test_binomial_power(p):
    got = rim_power(binomial_series(p, 40).coefficients, RayMap(-1), 30)
    assert got is not None and got[0] == p
    assert abs(got[1] - mpmath.mpf(p.numerator) / p.denominator) < 1e-10


def test_arctan_power():
    with workdps(40):
        c = mpmath.taylor(lambda x: mpmath.atan(mpmath.sqrt(x)) / mpmath.sqrt(x) if x else 1, 0, 40)
    got = rim_power(c, RayMap(-1), 40)
    assert got is not None and got[0] == Fraction(-1, 2)


def test_logarithm_is_not_a_power():
    with workdps(40):
        c = [mpmath.mpf(-1) ** k / (k + 1) for k in range(80)]
    assert rim_power(c, RayMap(-1), 40) is None


@pytest.mark.parametrize("angle", ["0", "pi/4"])
def test_kernel_family_grows_like_g(angle):
    s = weak_coupling_series(angle, 60, Context(dps=60))
    got = rim_power(s.coefficients, RayMap(mpmath.mpf(-1) / 16), 40)
    assert got is not None and got[0] == Fraction(1, 2)


def test_auto_uses_the_power_near_the_rim_and_can_be_turned_off():
    s = weak_coupling_series("0", 60, Context(dps=60))
    ctx = Context(dps=20)
    r = evaluate(s, ["3", "20"], ctx, verify=True)       # |w| = 0.85 and 0.975
    assert r.points[0].method == "conformal-pade" and "x^(1/2) at large x" in r.diagnostics["why"]
    assert [p.diagnostics["rim_power_alpha"] for p in r.points] == [None, "1.0"]
    from resum.report.evaluation_text import render_evaluation
    assert "Growth divided out at 20.0:" in render_evaluation(r)       # the report says where
    off = evaluate(s, ["3", "20"], ctx, verify=False, large_x_power=0)
    assert "at large x" not in off.diagnostics["why"]
    assert "rim_power_alpha" not in off.points[1].diagnostics
    with workdps(40):
        for p, g, want in zip(r.points, ["3", "20"], [12, 5]):
            truth = zero_angle_closed_form(g, Context(dps=40))
            assert p.value.contains(truth)
            assert -mpmath.log10(abs(p.value.value - truth) / truth) > want
