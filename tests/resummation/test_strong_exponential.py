"""Exponentially small terms in the strong-coupling probe.

Reference: the angle-deformed kernel family at a = 0 is (2/pi^2) log cosh(2 pi g) (Belitsky and
Korchemsky, arXiv:1907.13131), i.e. 4g/pi - 2 ln2/pi^2 + (2/pi^2) log(1 + e^(-4 pi g)): two power
terms, then e^(-4 pi g) (kappa = 4 pi) and its powers. Its values here come from mpmath (50 digits)
and are given to the probe with a 1e-30 relative band, so only the fitted form is tested.
"""
import mpmath
import pytest

from resum.context import Context
from resum.errors import InputError
from resum.results import Estimate
from resum.series import Series
from resum.estimators.strong_coupling import probe_strong_coupling

GS = ["1", "1.1", "1.2", "1.3", "1.4", "1.5", "1.6", "1.8", "2", "2.5", "3"]


def _closed_form_values():
    with mpmath.workdps(50):
        out = []
        for g in GS:
            v = 2 / mpmath.pi ** 2 * mpmath.log(mpmath.cosh(2 * mpmath.pi * mpmath.mpf(g)))
            out.append(Estimate(v, v * (1 - mpmath.mpf(10) ** -30), v * (1 + mpmath.mpf(10) ** -30)))
        return out


def _probe(mode):
    return probe_strong_coupling(Series([0, 4, 1], name="log cosh values"), couplings=GS,
                                 values=_closed_form_values(), ctx=Context(dps=30), leading_power=1,
                                 exponential=mode)


def test_exponential_term_found_and_the_power_coefficients_sharpen():
    with mpmath.workdps(30):
        c1, c0 = 4 / mpmath.pi, -2 * mpmath.log(2) / mpmath.pi ** 2
    plain, with_exp = _probe("never"), _probe("auto")
    assert "exponential" not in plain.diagnostics
    # from g = 1 the power form alone misses e^(-4 pi g) = 3.5e-6, which the bands see
    ex = with_exp.diagnostics["exponential"]
    assert with_exp.success and ex["kappa"].contains(4 * mpmath.pi)
    assert ex["kappa"].error < 0.5 * 4 * mpmath.pi
    for lab, truth, tol in (("x^1", c1, 1e-7), ("x^0", c0, 1e-5)):
        e, p = with_exp.coefficient(lab), plain.coefficient(lab)
        assert e.contains(truth) and p.contains(truth), (lab, e, p)
        assert e.error < tol and e.error * 10 < p.error, (lab, e.error, p.error)
    assert "kappa" in with_exp.message


def test_always_and_never_and_bad_values():
    assert "exponential" in _probe("always").diagnostics
    assert "exponential" in _probe(True).diagnostics
    assert "exponential" not in _probe(False).diagnostics
    with pytest.raises(InputError) as err:
        _probe("sometimes")
    assert "exponential" in str(err.value) and "auto, always, never" in str(err.value)


def test_powers_that_match_are_left_alone():
    # (1 + x)^(1/2) = x^(1/2) (1 + 1/(2x) - 1/(8x^2) + ...): pure powers, no exponential;
    # mpmath values at x = 20 ... 200 (binomial series, common practice, no source)
    xs = ["20", "25", "30", "40", "50", "60", "80", "100", "150", "200"]
    with mpmath.workdps(50):
        vals = [Estimate(mpmath.sqrt(1 + mpmath.mpf(x)), mpmath.sqrt(1 + mpmath.mpf(x)) * (1 - mpmath.mpf(10) ** -25),
                         mpmath.sqrt(1 + mpmath.mpf(x)) * (1 + mpmath.mpf(10) ** -25)) for x in xs]
    r = probe_strong_coupling(Series([1, mpmath.mpf(1) / 2], name="sqrt"), couplings=xs, values=vals,
                              ctx=Context(dps=30), leading_power=mpmath.mpf(1) / 2, spacing=1)
    assert "exponential" not in r.diagnostics and not r.warnings
    assert r.coefficient("x^1/2").contains(1) and r.coefficient("x^-1/2").contains(mpmath.mpf(1) / 2)


def test_a_given_rate_is_used_as_given():
    # kappa = 4 pi, the closed form's own rate: the fits are linear, the rate is reported exact,
    # and the coefficient bands still hold 4/pi and -2 ln2/pi^2
    with mpmath.workdps(30):
        c1, c0 = 4 / mpmath.pi, -2 * mpmath.log(2) / mpmath.pi ** 2
    r = probe_strong_coupling(Series([0, 4, 1], name="log cosh values"), couplings=GS,
                              values=_closed_form_values(), ctx=Context(dps=30), leading_power=1,
                              kappa="4*pi")
    ex = r.diagnostics["exponential"]
    assert ex["given"] and ex["kappa"].error == 0
    with mpmath.workdps(40):
        assert abs(ex["kappa"].value - 4 * mpmath.pi) < mpmath.mpf(10) ** -25
    assert r.coefficient("x^1").contains(c1) and r.coefficient("x^1").error < 1e-7
    assert r.coefficient("x^0").contains(c0)
    for bad, words in ((dict(kappa="-1"), "positive"), (dict(kappa="2", exponential="never"), "never")):
        with pytest.raises(InputError) as err:
            probe_strong_coupling(Series([0, 4, 1]), couplings=GS, values=_closed_form_values(),
                                  ctx=Context(dps=30), leading_power=1, **bad)
        assert "kappa" in str(err.value) and words in str(err.value)
