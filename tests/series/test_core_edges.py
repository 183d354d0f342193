"""Edge cases of the Series object, the kernels and the sources found by testing the API against
independent computations: digits kept through rescaling and explicit low-precision contexts,
terms a composition cannot know, multiple roots, trimmed Padé coefficients, bad input."""
from fractions import Fraction
from math import factorial

import mpmath
import pytest

from resum import Context, Series
from resum.context import workdps
from resum.errors import InputError


def _exp_series(digits=90):
    with workdps(digits + 10):
        return Series([mpmath.mpf(1) / factorial(k) for k in range(20)], digits=digits)


def _rel_err(got, want):
    return max(abs(a - b) / abs(b) for a, b in zip(got, want))


def test_rescale_keeps_the_digits_it_claims():
    # exp(3x) term by term: 3^k / k! (exact reference)
    r = _exp_series().rescale(3)
    with workdps(120):
        assert r.digits == 90
        assert _rel_err(r.coefficients, [mpmath.mpf(3) ** k / factorial(k) for k in range(20)]) < 1e-89


def test_explicit_low_precision_context_keeps_the_series_digits():
    # 1/exp(x) = exp(-x): (-1)^k / k! (exact reference)
    r = _exp_series().reciprocal(ctx=Context(dps=10))
    with workdps(120):
        assert _rel_err(r.coefficients, [mpmath.mpf(-1) ** k / factorial(k) for k in range(20)]) < 1e-89


def test_composition_keeps_only_the_terms_it_knows():
    # exp(x^2 + x^3) with the inner series known to x^3: the result is known to x^3 only
    # (an x^4 term of the inner series would change the x^4 coefficient; common practice, no source)
    e = Series([Fraction(1, factorial(k)) for k in range(8)])
    out = e.compose(Series([0, 0, 1, 1]))
    assert out.coefficients == (1, 0, 1, 1)


def test_borel_le_roy_with_a_negative_integer_parameter_and_bad_parameters():
    # c_n / Gamma(n + 1 + b) with b = -2: c_0, c_1 must vanish; c_2 / 0! , c_3 / 1!
    assert Series([0, 0, 1, 1]).borel(-2).coefficients == (0, 0, 1, 1)
    for b in (-1.5, mpmath.inf):
        with pytest.raises(InputError):
            Series([1, 2]).borel(b)


def test_float_coefficients_carry_double_precision_whatever_the_ambient_precision():
    with workdps(50):
        assert Series([0.1, 0.2]).digits == 15


@pytest.mark.parametrize("make", [lambda: Series([1, mpmath.inf]), lambda: Series([1, 2], digits=0),
                                  lambda: Series([1, 2]) / 0, lambda: Series([]).exp()])
def test_bad_series_input_is_an_input_error(make):
    with pytest.raises(InputError):
        make()


def test_roots_of_a_rounded_multiple_root_do_not_crash():
    # (1 - x)^3 at 50 digits: the iteration stalls on the triple root; rough roots, not a traceback
    from resum._kernels.roots import poly_roots_full
    with workdps(50):
        r = poly_roots_full([mpmath.mpf(1), -3, 3, -1], 30)
    assert not r.success and len(r.roots) == 3
    assert all(abs(z - 1) <= rad for z, rad in zip(r.roots, r.radii))


def test_pade_claims_no_more_than_a_dropped_top_coefficient_allows():
    # [40/40] of log(1+x)/x asked for 30 digits: the top numerator coefficient, 2.7e-31 of the
    # largest, falls below the tolerance and is dropped; reference mpmath.pade at 400 digits
    from resum._kernels.pade import pade
    with workdps(400):
        lg = [mpmath.mpf((-1) ** k) / (k + 1) for k in range(81)]
        _, qref = mpmath.pade(lg, 40, 40)
    with workdps(200):
        lg2 = [mpmath.mpf((-1) ** k) / (k + 1) for k in range(81)]
        r = pade(lg2, 40, 40, 30)
    with workdps(400):
        q = list(r.q) + [0] * (41 - len(r.q))
        err = max(abs(a - b) for a, b in zip(q, qref)) / max(abs(b) for b in qref)
        measured = float(-mpmath.log10(err))
    assert r.digits <= measured + 0.5


@pytest.mark.parametrize("call", [
    lambda: __import__("resum.sources.oscillator", fromlist=["energy"]).energy(float("nan")),
    lambda: __import__("resum.sources.oscillator", fromlist=["energy"]).energy(1, max_basis=0),
    lambda: __import__("resum.sources.oscillator", fromlist=["rs_coefficients"]).rs_coefficients(10 ** 6, 2),
    lambda: __import__("resum.sources.phi4", fromlist=["value"]).value("abc"),
    lambda: __import__("resum.sources.bes", fromlist=["finite_coupling"]).finite_coupling(1, max_size=5),
    lambda: __import__("resum.sources", fromlist=["get_source"]).get_source("bes").build(foo=1),
    lambda: __import__("resum.sources", fromlist=["get_source"]).get_source("bes").build(Context(dps=20000),
                                                                                        loops=2),
])
def test_bad_source_arguments_are_input_errors(call):
    with pytest.raises(InputError):
        call()


def test_cancelling_subtraction_keeps_only_the_digits_left():
    # e^x and 1 + x + x^2/2 agree in their first three coefficients up to the
    # rounding of the 30-digit e^x series... here they are made to differ at the
    # 1e-9 level on purpose: the difference keeps 30 - 9 = 21 digits at most
    # (relative error of a difference = sum of the absolute errors over the
    # result: common practice, no source). The claim must hold against the
    # exact difference computed by mpmath at 60 digits.
    with workdps(30):
        a = Series([mpmath.mpf(1) + mpmath.mpf("1e-9"), mpmath.mpf(1), 1 / mpmath.mpf(2)], digits=30)
    b = Series([Fraction(1), Fraction(1), Fraction(1, 2)])
    d = a - b
    assert d.digits == 20
    with workdps(60):
        exact = (mpmath.mpf(1) + mpmath.mpf("1e-9")) - 1
        got = mpmath.mpf(d.coefficients[0])
        assert abs(got / exact - 1) < mpmath.mpf(10) ** -d.digits
    # no cancellation: the digits stay; an exact zero (a - a) is not a loss
    assert (a + b).digits == 30 and (a - a).digits == 30
    assert (a - 1).digits == 20
    # negation, scalar multiples and the derivative keep the series' 30 digits even where
    # mpmath's ambient precision is 15 (-x on an mpf rounds to it); reference: mpmath at 40
    with workdps(30):
        t = Series([1 / mpmath.mpf(3), 2 / mpmath.mpf(7)], digits=30)
    with workdps(15):
        neg, tri, der = (-t).coefficients[0], (3 * t).coefficients[1], t.derivative().coefficients[0]
    with workdps(40):
        for got, want in ((neg, -mpmath.mpf(1) / 3), (tri, mpmath.mpf(6) / 7), (der, mpmath.mpf(2) / 7)):
            assert abs(got / want - 1) < mpmath.mpf(10) ** -29
