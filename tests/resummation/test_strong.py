"""Strong-coupling probe on the BES family.

Expected coefficients: at a = pi/4 (the cusp anomalous dimension, half the BES f(g))
F = 2g - 3 ln2/(2 pi) - K/(8 pi^2 g) + ... (S. Frolov and A. A. Tseytlin, JHEP 0206 (2002) 007,
hep-th/0204226; R. Roiban and A. A. Tseytlin, JHEP 0711 (2007) 016, arXiv:0709.0681); at a = 0
the closed form (2/pi^2) log cosh(2 pi g) = 4g/pi - 2 ln2/pi^2 + O(exp(-4 pi g)).
"""
import mpmath
import pytest

from resum.context import Context, workdps
from resum.estimators.strong_coupling import probe_strong_coupling, simple_rational
from resum.sources.bes import weak_coupling_series

GRID = [2, 3, 4, 5, 6, 8, 10, 12, 15, 20]


def _check(r, expected, max_band):
    assert r.success
    assert r.leading_power.value == 1 and "rounded to 1" in r.power_source
    for lab, ev in expected.items():
        e = r.coefficient(lab)
        assert e is not None and e.contains(ev), (lab, e, ev)
        assert e.error < max_band[lab], (lab, e.error)


def test_zero_angle_strong_coupling():
    s = weak_coupling_series("0", 100, Context(dps=150))
    with workdps(30):
        exp = {"g^1": 4 / mpmath.pi, "g^0": -2 * mpmath.log(2) / mpmath.pi ** 2}
    r = probe_strong_coupling(s, couplings=GRID, ctx=Context(dps=30), expected=exp,
                              evaluate_options={"verify": False})
    _check(r, exp, {"g^1": 1e-4, "g^0": 1e-3})
    assert r.trusted_up_to >= 12
    assert all(v["inside"] for v in r.comparison.values())


@pytest.mark.slow
def test_cusp_strong_coupling():
    s = weak_coupling_series("pi/4", 100, Context(dps=150))
    with workdps(30):
        exp = {"g^1": 2, "g^0": -3 * mpmath.log(2) / (2 * mpmath.pi)}
    r = probe_strong_coupling(s, couplings=GRID, ctx=Context(dps=30), expected=exp,
                              evaluate_options={"verify": False})
    _check(r, exp, {"g^1": 1e-3, "g^0": 2e-2})


def test_simple_rational():
    # common practice, no source
    assert simple_rational(mpmath.mpf("0.3334"), mpmath.mpf("0.001")) == __import__("fractions").Fraction(1, 3)
    assert simple_rational(mpmath.mpf("0.37"), mpmath.mpf("0.001")) is None


def test_too_few_trusted_points():
    s = weak_coupling_series("0", 20, Context(dps=40))
    r = probe_strong_coupling(s, couplings=[30, 40, 50, 60], ctx=Context(dps=20),
                              evaluate_options={"verify": False})
    assert not r.success and r.status.value == "too few terms"


def test_exact_polynomial_is_its_own_strong_coupling_expansion():
    # at a = pi/2 the source's series is the polynomial F = 4 g^2 (x = g^2; the source's docstring);
    # a polynomial is its own strong-coupling expansion: leading power 2, coefficient 4, nothing else
    s = weak_coupling_series("pi/2", 40, Context(dps=40))
    r = probe_strong_coupling(s, couplings=[2, 5, 10, 20], ctx=Context(dps=20),
                              expected={"g^2": 4, "g^1": 0, "g^0": 0})
    assert r.success and r.leading_power.value == 2 and r.leading_power.error == 0
    assert [k for k, _ in r.coefficients] == ["g^2"]
    assert r.coefficient("g^2").contains(4) and r.coefficient("g^2").error <= mpmath.mpf(10) ** -38 * 4
    assert all(v["inside"] for v in r.comparison.values())
    assert all(v.contains(4 * g ** 2) for g, v in zip(r.couplings, r.values))
    # a wrong expectation is reported, not hidden
    bad = probe_strong_coupling(s, couplings=[2, 5], ctx=Context(dps=20), expected={"g^2": 3})
    assert bad.comparison["g^2"]["inside"] is False and bad.warnings


def test_polynomial_degree_needs_enough_known_zeros():
    # common practice, no source: a series stopping at x^k counts as a polynomial only when it is
    # known to vanish through at least k + 1 (and 4) further powers
    from resum.resummation import polynomial_degree
    assert polynomial_degree([1, 2, 3, 0, 0, 0, 0]) == 2
    assert polynomial_degree([1, 2, 3, 0, 0]) is None
    assert polynomial_degree([1, 2, 3, 4, 5, 6, 7, 8]) is None
    assert polynomial_degree([1, 0, 0, 1, 0, 0, 0, 0]) == 3


def test_no_coefficient_carried_by_two_fits_is_a_failure():
    """Four values of 4g/pi - 2 ln2/pi^2 (the a = 0 closed form's strong-coupling
    form) fitted with three terms leave exactly one fit: no coefficient can be
    checked against a second fit, so the probe must not report success."""
    s = weak_coupling_series("0", 20, Context(dps=40))
    with workdps(30):
        gs = [4, 6, 8, 10]
        vals = [4 * g / mpmath.pi - 2 * mpmath.log(2) / mpmath.pi ** 2 for g in gs]
        from resum.results import Estimate
        vals = [Estimate(v, v - mpmath.mpf(10) ** -20, v + mpmath.mpf(10) ** -20) for v in vals]
    r = probe_strong_coupling(s, couplings=gs, ctx=Context(dps=30), values=vals,
                              leading_power=1, n_terms_fit=[3])
    assert not r.success and r.status.value == "not converged", (r.status, r.message)
    assert "two fits" in r.message and not r.coefficients


def test_unconfirmed_rounded_power_keeps_its_band():
    """The same one-fit situation with the power read from the values (not given): the power
    rounded to 1 is not confirmed by any fit, so it must not come back as the exact 1 [1, 1]; its
    band is the log-derivative's and contains the closed form's power 1."""
    s = weak_coupling_series("0", 20, Context(dps=40))
    with workdps(30):
        gs = [4, 6, 8, 10]
        from resum.results import Estimate
        vals = []
        for g in gs:
            v = 2 / mpmath.pi ** 2 * mpmath.log(mpmath.cosh(2 * mpmath.pi * g))   # the closed form
            vals.append(Estimate(v, v - mpmath.mpf(10) ** -20, v + mpmath.mpf(10) ** -20))
    r = probe_strong_coupling(s, couplings=gs, ctx=Context(dps=30), values=vals, n_terms_fit=[3])
    assert not r.success
    lp = r.leading_power
    assert lp.upper > lp.lower and lp.contains(1), lp
    assert "not confirmed" in r.power_source or "not settled" in r.power_source


def test_negative_powers_are_an_input_error():
    from resum.errors import InputError
    from resum.series import Series
    s = Series([1, 2, 3, 4, 5, 6, 7, 8], start=-1)
    with pytest.raises(InputError, match="starts at x"):
        probe_strong_coupling(s, ["1", "2"], Context(dps=20))


def _log1p_over_x_expansion():
    """log(1 + x)/x = log(x)/x + sum_{k>=2} (-1)^k x^-k/(k - 1) at large x (the Taylor series
    of log(1 + 1/x), common practice, no source): x^-k log x vanishes for k >= 2."""
    exp = {"x^-1": 0, "x^-1 log x": 1}
    for k in range(2, 8):
        exp[f"x^-{k}"] = mpmath.mpf((-1) ** k) / (k - 1)
        exp[f"x^-{k} log x"] = 0
    return exp


def test_top_term_of_the_largest_fits_is_not_reported():
    """With log terms the four-term fits (8 unknowns) fit only two windows of 10 values; their top
    pair x^-4, x^-4 log x absorbs all the omitted terms, and the two windows agreed on 0.27(3) and
    0.13(4) against the expansion's 1/3 and 0 (mpmath.log1p values). A term carried by one number
    of terms only is not reported; every reported band holds the expansion."""
    from resum.results import Estimate
    from resum.series import Series
    s = Series([mpmath.mpf(-1) ** k / (k + 1) for k in range(40)])
    gs = [4, 6, 8, 12, 16, 24, 32, 48, 64, 80]
    with workdps(40):
        vals = []
        for g in gs:
            v = mpmath.log1p(g) / g
            vals.append(Estimate(v, v - abs(v) * mpmath.mpf(10) ** -12, v + abs(v) * mpmath.mpf(10) ** -12))
    r = probe_strong_coupling(s, couplings=gs, ctx=Context(dps=30), values=vals,
                              leading_power=-1, log_terms=True)
    assert r.success, r.message
    exp = _log1p_over_x_expansion()
    labels = [lab for lab, _ in r.coefficients]
    assert "x^-1 log x" in labels and "x^-4" not in labels and "x^-4 log x" not in labels, labels
    for lab, e in r.coefficients:
        assert e.contains(exp[lab]), (lab, e, exp[lab])


def test_default_grid_of_a_factorially_divergent_series():
    """Radius zero: the default couplings scale with the Borel-plane singularity, not with the ~1e-6
    a ratio fit gives (which put the oscillator's whole grid below g = 1.2e-4). Euler's
    sum (-1)^n n! x^n has Borel transform 1/(1 + t), singular at distance 1 (common practice, no
    source); the oscillator p^2 + x^2 + g x^4 has E_k ~ (-1)^(k+1) (3/2)^k Gamma(k + 1/2)
    (Bender and Wu, Phys. Rev. D 7 (1973) 1620, in the normalisation of test_oscillator.py,
    from memory), singular at distance 2/3."""
    from resum.estimators.strong_coupling import _default_grid
    from resum.sources import euler, oscillator
    ctx = Context(dps=30)
    g = _default_grid(euler.series(40, -1), ctx)
    assert g == [4, 6, 8, 12, 16, 24, 32, 48, 64, 80], g
    g = _default_grid(oscillator.series(0, 60), ctx)
    assert abs(g[0] - mpmath.mpf(8) / 3) < 0.05 and abs(g[-1] - mpmath.mpf(160) / 3) < 1, g
