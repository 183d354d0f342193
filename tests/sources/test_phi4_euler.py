"""Zero-dimensional phi^4 integral and Euler's series against mpmath quadrature."""

import mpmath
import pytest

from resum.context import Context, workdps
from resum.errors import InputError
from resum.sources import euler, phi4


def test_phi4_coefficients_are_gaussian_moments():
    # a_n = (-1/4)^n / n! * <x^(4n)>, the moments taken by mpmath.quad
    cs = phi4.coefficients(8)
    with workdps(30):
        for n, c in enumerate(cs):
            m = mpmath.quad(lambda x: x ** (4 * n) * mpmath.exp(-x * x / 2), [-mpmath.inf, 0, mpmath.inf])
            m /= mpmath.sqrt(2 * mpmath.pi)
            ref = (-mpmath.mpf(1) / 4) ** n / mpmath.factorial(n) * m
            assert abs(mpmath.mpf(c.numerator) / c.denominator - ref) < abs(ref) * mpmath.mpf(10) ** -25


@pytest.mark.parametrize("g", ["0.02", "0.3", "1", "4"])
def test_phi4_closed_form_vs_quadrature(g):
    v = phi4.value(g, Context(dps=25))
    with workdps(40):
        gg = mpmath.mpf(g)
        q = mpmath.quad(lambda x: mpmath.exp(-x * x / 2 - gg * x ** 4 / 4), [-mpmath.inf, -1, 0, 1, mpmath.inf])
        q /= mpmath.sqrt(2 * mpmath.pi)
        assert abs(v.value - q) < abs(q) * mpmath.mpf(10) ** -24
        assert v.lower - abs(q) * mpmath.mpf(10) ** -30 <= q <= v.upper + abs(q) * mpmath.mpf(10) ** -30


def test_euler_borel_sum_vs_quadrature():
    # Stieltjes integral int_0^oo e^-t/(1 + x t) dt by mpmath.quad
    for x in ("0.1", "1", "3"):
        v = euler.borel_sum(x, Context(dps=25))
        with workdps(40):
            xx = mpmath.mpf(x)
            q = mpmath.quad(lambda t: mpmath.exp(-t) / (1 + xx * t), [0, 1, 10, mpmath.inf])
            assert abs(v.value - q) < abs(q) * mpmath.mpf(10) ** -24


def test_euler_coefficients_and_input():
    assert euler.coefficients(5, 1) == [1, 1, 2, 6, 24]
    with pytest.raises(InputError, match="sign"):
        euler.coefficients(5, 2)
    with pytest.raises(InputError, match="x"):
        euler.borel_sum(-1)
    with pytest.raises(InputError, match="Re g"):
        phi4.closed_form(-1)
