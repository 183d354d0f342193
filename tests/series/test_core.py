"""Series operations against closed forms (exact rationals; mpmath as reference)."""
import math
from fractions import Fraction

import mpmath
import pytest

from resum import Context, Coupling, Series
from resum.context import workdps

N = 12


def geometric(n=N):
    return Series([1] * n)


def test_exp_log_roundtrip_exact():
    # log(1/(1-x)) = sum x^k/k; exp of it is 1/(1-x)  (common practice, no source)
    s = geometric()
    lg = s.log()
    assert lg.coefficients == tuple([0] + [Fraction(1, k) for k in range(1, N)])
    assert lg.exp().coefficients == s.coefficients


def test_exp_of_x_gives_inverse_factorials():
    e = Series([0, 1] + [0] * (N - 2)).exp()
    assert e.coefficients == tuple(Fraction(1, math.factorial(k)) for k in range(N))


def test_reciprocal_division_and_multiplication():
    s = geometric()
    assert s.reciprocal().coefficients == tuple([1, -1] + [0] * (N - 2))
    assert (s * s).coefficients == tuple(range(1, N + 1))
    assert (s / s).coefficients == tuple([1] + [0] * (N - 1))


def test_compose_and_substitutions():
    # 1/(1-y) with y = x/(1-x)... gives (1-x)/(1-2x) = 1 + x + 2x^2 + 4x^3 ...
    y = Series([0] + [1] * (N - 1))
    c = geometric().compose(y)
    assert c.coefficients == tuple([1] + [2 ** (k - 1) for k in range(1, N)])
    assert geometric(4).rescale(3).coefficients == (1, 3, 9, 27)
    assert geometric(3).substitute_power(2).coefficients == (1, 0, 1, 0, 1)


def test_derivative_and_log_derivative():
    s = geometric()
    assert s.derivative().coefficients == tuple(range(1, N))
    # d/dx log(1/(1-x)) = 1/(1-x)
    assert s.log_derivative().coefficients == tuple([1] * (N - 1))
    x2 = Series([0, 0, 1, 1, 1])
    ld = x2.log_derivative()
    assert ld.start == -1 and ld.coefficients[0] == 2


def test_borel_and_borel_le_roy():
    # Borel of sum n! x^n is 1/(1-t)  (common practice, no source)
    s = Series([math.factorial(n) for n in range(N)])
    assert s.borel().coefficients == tuple([1] * N)
    with workdps(40):
        b = s.borel(Fraction(1, 2), ctx=Context(dps=30))
        for n, c in enumerate(b.coefficients):
            ref = mpmath.factorial(n) / mpmath.gamma(n + mpmath.mpf(3) / 2)
            assert abs(c - ref) < mpmath.mpf(10) ** -30 * ref


def test_coupling_relation():
    s = Series([0, 4, -1], coupling=Coupling("g", 2, 1))
    assert s.coupling.to_variable(mpmath.mpf("0.5")) == mpmath.mpf("0.25")
    assert s.coupling.from_variable(mpmath.mpf("0.25")) == mpmath.mpf("0.5")
    g = s.in_coupling()
    assert g.variable == "g" and g.coefficients == (0, 0, 4, 0, -1)


def test_inexact_series_records_digits():
    with workdps(60):
        s = Series([mpmath.mpf(1) / 3] * 5, digits=50)
    assert not s.is_exact and s.digits == 50
    assert (s + geometric(5)).digits == 50


def test_rejects_non_finite():
    with pytest.raises(ValueError):
        Series([1, mpmath.nan])
    with pytest.raises(TypeError):
        Series([1, "2"])


def test_rescale_with_negative_powers_stays_exact():
    # x^-1 (1 + x + x^2) with x -> 2x: (1/2) x^-1 + 1 + 2x (common practice, no source)
    s = Series([1, 1, 1], start=-1).rescale(2)
    assert s.is_exact and s.digits is None
    assert s.coefficients == (Fraction(1, 2), 1, 2)


def _exp_series(dps=60, n=25, digits=50):
    with workdps(dps):
        return Series([1 / mpmath.factorial(k) for k in range(n)], digits=digits)


def test_scalar_division_keeps_the_series_digits_at_low_ambient_precision():
    # e^x / 3 and e^x / mpf(2) against mpmath.taylor of the same closed forms, while the
    # ambient precision is mpmath's default 15 digits
    s = _exp_series()
    assert mpmath.mp.dps == 15
    for div, f in ((3, lambda x: mpmath.exp(x) / 3), (mpmath.mpf(2), lambda x: mpmath.exp(x) / 2)):
        q = s / div
        with workdps(60):
            ref = mpmath.taylor(f, 0, s.n_terms - 1)
            worst = max(abs(a - b) / abs(b) for a, b in zip(q.coefficients, ref))
        assert worst < mpmath.mpf(10) ** -45, (div, worst)


def test_borel_with_integer_b_keeps_the_series_digits_at_low_ambient_precision():
    # Borel(-Le Roy) of e^x: c_n = 1/(n! Gamma(n + 1 + b)), b = 0 and 1 (mpmath.factorial)
    s = _exp_series()
    assert mpmath.mp.dps == 15
    for b in (0, 1):
        t = s.borel(b)
        with workdps(60):
            worst = max(abs(c - 1 / (mpmath.factorial(k) * mpmath.factorial(k + b)))
                        * mpmath.factorial(k) * mpmath.factorial(k + b) for k, c in enumerate(t.coefficients))
        assert worst < mpmath.mpf(10) ** -45, (b, worst)


def test_evaluate_partial_with_zero_terms_is_zero():
    # the empty partial sum (common practice, no source)
    s = Series([1, 1, 1])
    assert s.evaluate_partial(2, n=0) == 0
    assert s.evaluate_partial(2, n=1) == 1
    assert s.evaluate_partial(2) == 7


def test_coupling_given_as_text_or_wrong_type():
    s = Series([0, 4, -1], coupling="x = g^2")
    assert s.coupling == Coupling("g", 2, 1)
    assert s.in_coupling().coefficients == (0, 0, 4, 0, -1)
    from resum.errors import InputError
    with pytest.raises(InputError, match="coupling"):
        Series([1, 2], coupling=2)
    with pytest.raises(InputError, match="coupling"):
        Series([1, 2], coupling="y = g^2")


def test_number_divided_by_series():
    # 2/(1 - x) = 2 + 2x + 2x^2 + ..., and 1/(x (1 - x)) = x^-1 + 1 + x + ... (geometric series,
    # common practice, no source)
    assert (2 / Series([1, -1, 0, 0])).coefficients == (2, 2, 2, 2)
    q = Fraction(1) / Series([1, -1, 0], start=1)
    assert q.start == -1 and q.coefficients == (1, 1, 1)
