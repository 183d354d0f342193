"""A band that supports no significant digit is not 'converged'.

Binomial series (1 + x)^p = sum binom(p, k) x^k, cut (-inf, -1] (common practice, no
source); truths from mpmath's principal power at 50 digits.
"""
from fractions import Fraction

import mpmath

from resum.context import Context, workdps
from resum.resummation import evaluate
from resum.results import Status
from resum.series import Series
from tests.known_series import binomial_series


def test_pade_far_away_is_not_converged():
    # plain Padé of (1+x)^(-1/3) from 40 terms at x = 1e6 gave -99 [-500, 300], "converged"
    res = evaluate(binomial_series(Fraction(-1, 3), 40), ["1/2", "1e6"], Context(dps=30), method="pade")
    near, far = res.points
    with workdps(50):
        for p in (near, far):
            truth = (1 + mpmath.mpf(p.at)) ** (-mpmath.mpf(1) / 3)
            assert p.value.contains(truth)           # the bands themselves are unchanged
        assert far.value.error * 10 > abs(far.value.value)
    assert near.success and near.status == Status.CONVERGED and near.value.digits() > 20
    assert not far.success and far.status == Status.NOT_CONVERGED
    assert "supports no significant digit" in far.message and "\n" not in far.message
    assert any("supports no significant digit" in w for w in res.warnings)
    assert not res.success


def test_small_real_part_of_a_complex_value_is_judged_by_its_modulus():
    # log(1 + x)/x = sum (-1)^k x^k/(k + 1) (common practice, no source) just above its cut at
    # x = -2: about 7.9e-10 - 1.5708 i; the real part alone has no digit against the band,
    # the complex value has about nine
    s = Series([Fraction((-1) ** k, k + 1) for k in range(40)])
    res = evaluate(s, ["-2+1e-9*I"], Context(dps=20), method="conformal-pade", singularities=[-1])
    p = res.points[0]
    with workdps(50):
        x = mpmath.mpc(-2, mpmath.mpf("1e-9"))
        truth = mpmath.log(1 + x) / x
        assert p.value.contains(truth.real) and p.imag.contains(truth.imag)
        assert p.value.error * 10 > abs(p.value.value)       # the case this test is about
        assert p.imag.error < mpmath.mpf(10) ** -6
    assert p.success and p.status == Status.CONVERGED


def test_message_names_the_wide_imaginary_band():
    # (1 - x + x^2)^(-1/2) + (1 + x)^(3/2): a pair at exp(+-i pi/3) and a real point at -1, all
    # on |x| = 1 (closed form, common practice, no source); 80 terms as 50-digit decimals. At
    # x = 1 + 2i the real band alone holds about three digits and the imaginary one none: the
    # message once printed only "[1.7, 1.7]" as the band that "supports no significant digit".
    from tests.known_series import quadratic_series
    n = 80
    a = quadratic_series(Fraction(-1, 2), Fraction(-1), Fraction(1), n)
    b = binomial_series(Fraction(3, 2), n).coefficients
    with workdps(50):
        c = [mpmath.mpf(u.numerator) / u.denominator for u in (p + q for p, q in zip(a, b))]
    # the ray map from -1 leaves the pair to the approximants (auto now takes the pair map here)
    res = evaluate(Series(c, digits=50), ["1+2*I"], Context(dps=30), method="conformal-pade",
                   singularities=[-1])
    p = res.points[0]
    with workdps(50):
        x = mpmath.mpc(1, 2)
        s = mpmath.exp(1j * mpmath.pi / 3)     # the straight-line continuation: radial cuts
        truth = ((1 - x / s) ** mpmath.mpf(-0.5) * (1 - x / mpmath.conj(s)) ** mpmath.mpf(-0.5)
                 + (1 + x) ** mpmath.mpf(1.5))
        assert p.value.contains(truth.real) and p.imag.contains(truth.imag)
        assert p.value.error * 10 < abs(p.value.value)          # the real band alone has a digit
        assert p.imag.error * 10 > abs(p.imag.value)            # the imaginary one has none
    assert p.status == Status.NOT_CONVERGED
    lo, hi = (mpmath.nstr(v, 2) for v in (p.imag.lower, p.imag.upper))
    assert f"+ i [{lo}, {hi}]" in p.message
