"""Properties every registered estimator must have (common practice, no source):

* x -> c x divides the radius (and every singular point) by c, and the Borel
  singularity A of a factorial series by c;
* adding a polynomial changes no singularity;
* multiplying by x^2 (two leading zeros) changes no singularity;
* a rerun at higher precision agrees within the bands.
"""
import math
from fractions import Fraction

import mpmath
import pytest

from resum.context import Context, workdps
from resum.errors import InputError
from resum.estimators import METHODS, get_method
from resum.series import Series

from .refs import binomial_power, complex_pair, lattice, quartic_oscillator


def _series_for(name):
    if name in ("ratio", "root-test"):
        cs, _ = lattice("saw_square_lattice")       # Jensen, J. Phys. A 49 (2016) 424003
        return Series(cs), Context(dps=50)
    if name in ("diff-approx", "diff-approx2"):
        cs, _ = lattice("ising_sq_susceptibility_hightemp")   # Sykes et al. 1972 / OEIS A002906
        return Series(cs), Context(dps=40)
    if name == "conjugate-pair":
        return Series(complex_pair(60, 70), digits=60), Context(dps=50)
    if name == "large-order":
        return Series(quartic_oscillator(40)), Context(dps=40)   # Bender and Wu 1969
    if name == "pade":
        # 1/(1 - x/2) + exp(x): one pole at x = 2
        return Series([Fraction(1, 2 ** n) + Fraction(1, math.factorial(n)) for n in range(30)]), \
            Context(dps=40)
    if name == "dlog":
        return Series(binomial_power(Fraction(-1, 3), 40, scale=2)), Context(dps=40)
    raise AssertionError(f"no test series for new method {name!r}: add one here")


def _agree(a, b, scale=1):
    """Bands of a and b*scale overlap."""
    with workdps(80):
        v = mpmath.mpf(b.value) * scale
        return abs(a.value - v) <= a.error + b.error * abs(scale) + mpmath.mpf(10) ** -30 * abs(v)


def _key(r):
    if r.borel_singularity is not None:
        return r.borel_singularity
    return r.radius


@pytest.mark.parametrize("name", sorted(METHODS))
def test_rescaling_divides_radius(name):
    s, ctx = _series_for(name)
    f = get_method(name)
    r1 = f(s, ctx)
    assert r1.success, r1.message
    r2 = f(s.rescale(2), ctx)
    assert r2.success, r2.message
    assert _agree(_key(r2), _key(r1), Fraction(1, 2))
    if r1.singularities:
        z = r1.singularities[0].location / 2
        near = min(r2.singularities, key=lambda t: abs(t.location - z))
        assert abs(near.location - z) <= 2 * (near.re.error + near.im.error) + \
            (r1.singularities[0].re.error + r1.singularities[0].im.error)


@pytest.mark.parametrize("name", sorted(METHODS))
def test_adding_polynomial_changes_no_singularity(name):
    s, ctx = _series_for(name)
    f = get_method(name)
    r1 = f(s, ctx)
    # add 3 - x + 2 x^2 + x^3 (padded with zeros so no order is lost)
    bumped = s + Series([3, -1, 2, 1] + [0] * (s.n_terms - 4), variable=s.variable)
    r2 = f(bumped, ctx)
    assert r2.success, r2.message
    assert _agree(_key(r2), _key(r1))


@pytest.mark.parametrize("name", sorted(METHODS))
def test_higher_precision_agrees(name):
    s, ctx = _series_for(name)
    f = get_method(name)
    r1 = f(s, ctx)
    r2 = f(s, ctx.higher())
    assert r2.success, r2.message
    assert _agree(_key(r2), _key(r1))


@pytest.mark.parametrize("name", sorted(METHODS))
def test_monomial_factor_changes_no_singularity(name):
    s, ctx = _series_for(name)
    f = get_method(name)
    base = s.truncate(s.n_terms - 2)        # the same information with and without the factor
    r1 = f(base, ctx)
    assert r1.success, r1.message
    zeros = Series([0, 0] + list(base.coefficients), variable=s.variable, digits=s.digits)
    for times_x2 in (zeros, base.shift(2)):      # explicit zeros, or a series starting at x^2
        r2 = f(times_x2, ctx)
        assert r2.success, r2.message
        assert _agree(_key(r2), _key(r1))


@pytest.mark.parametrize("name", sorted(METHODS))
def test_an_isolated_zero_coefficient_is_no_crash(name):
    # 1/(1-x)^2 - 3x^2 to 10 terms: one zero coefficient among non-zero ones (the conjugate-pair fit
    # met a singular system there and mpmath raised an internal TypeError); every estimator
    # returns a result, and a successful one finds the double pole at 1 (common practice,
    # no source)
    cs = [n + 1 for n in range(10)]
    cs[2] = 0
    try:
        r = get_method(name)(Series(cs), Context(dps=30))
    except InputError:
        return           # too few terms for this estimator: refused cleanly
    if r.success and r.singularities:
        z = min(r.singularities, key=lambda t: abs(t.location - 1))
        assert abs(z.location - 1) <= 2 * (z.re.error + z.im.error) + mpmath.mpf(10) ** -20
