"""The ``ode`` method: continuation of the differential equation a series obeys exactly.

Truths are closed forms evaluated by mpmath at 50 digits (common practice, no source): the
continuation along the straight line from 0 is the product of the principal powers of
factors with radial cuts.
"""
import math
from fractions import Fraction

import mpmath
import pytest

from resum.context import Context, workdps
from resum.errors import InputError
from resum.resummation import evaluate
from resum.series import Series
from tests.known_series import binomial_series


def _two_cuts(n):
    # (1 - x)^(-1/2) (1 + x/3)^(1/3): branch points 1 and -3
    a = binomial_series(Fraction(-1, 2), n, scale=-1).coefficients
    b = binomial_series(Fraction(1, 3), n, scale=3).coefficients
    return Series([sum(a[i] * b[k - i] for i in range(k + 1)) for k in range(n)])


def test_ode_values_beyond_both_cuts_and_off_axis():
    r = evaluate(_two_cuts(40), ["-2.9", "2+1*I", "-5"], Context(dps=30), method="ode")
    assert r.method == "ode" and "f'" in r.diagnostics["equation"]
    near, off, on_cut = r.points
    with workdps(50):
        for p in (near, off):
            x = mpmath.mpc(p.x)
            t = (1 - x) ** (-mpmath.mpf(1) / 2) * (1 + x / 3) ** (mpmath.mpf(1) / 3)
            assert p.success and p.value.contains(t.real), (p.value, t)
            if p.imag is not None:
                assert p.imag.contains(t.imag)
            v = mpmath.mpc(p.value.value, p.imag.value if p.imag is not None else 0)
            assert abs(v - t) / abs(t) < 1e-28 and p.value.digits() >= 28
    assert not on_cut.success and "passes through a zero" in on_cut.message


def test_ode_catalan_with_a_singular_point_of_the_equation_at_the_origin():
    # C = (1 - sqrt(1 - 4x))/(2x): x (1 - 4x) C' + (1 - 2x) C - 1 = 0 (common practice); the
    # continuation starts off the origin and reaches x = -3 and the side 0.3 + 1e-6 i of the cut
    c = [Fraction(math.comb(2 * n, n), n + 1) for n in range(50)]
    r = evaluate(Series(c), ["-3", "0.3+1e-6*I"], Context(dps=30), method="ode")
    with workdps(50):
        for p in r.points:
            x = mpmath.mpc(p.x)
            t = (1 - mpmath.sqrt(1 - 4 * x)) / (2 * x)
            v = mpmath.mpc(p.value.value, p.imag.value if p.imag is not None else 0)
            assert p.success and abs(v - t) / abs(t) < 1e-28, (v, t)
            assert p.value.contains(t.real)


def test_ode_refuses_a_divergent_series_and_a_series_with_no_equation():
    # sum (-1)^n n! x^n obeys x^2 f' + (1 + x) f - 1 = 0, irregular at the origin (Euler's
    # series; common practice, no source): refused with a pointer to the Borel methods
    euler = Series([(-1) ** n * math.factorial(n) for n in range(30)])
    r = evaluate(euler, ["1"], Context(dps=20), method="ode")
    assert not r.points[0].success and "Borel" in r.points[0].message
    # coefficients (k^2 + 1)^(-1/3): no linear equation with polynomial coefficients of order
    # 1 or 2 and at most 64 unknowns reproduces them (they are not holonomic; common practice)
    with workdps(40):
        c = [1 / mpmath.cbrt(k * k + 1) for k in range(40)]
    r = evaluate(Series(c, digits=40), ["2"], Context(dps=20), method="ode")
    assert not r.points[0].success and "obeys no linear differential equation" in r.points[0].message


def test_unknown_method_lists_ode():
    with pytest.raises(InputError, match="ode"):
        evaluate(_two_cuts(20), ["1"], method="odes")


def test_auto_follows_the_equation_and_refuses_points_across_a_branch_point():
    # the same two-cut product, as exact rationals and as 50-digit decimals: method auto finds
    # that the series obeys an equation (the analysis) and follows it; -5 lies on the cut from -3,
    # where going round -3 on the two sides gives different values: the point is refused there
    # (no fallback: a map need not cut there, and its number would be neither side's value).
    # Truth: the closed form, mpmath at 50 digits (common practice, no source)
    exact = _two_cuts(40)
    with workdps(50):
        dec = Series([mpmath.mpf(v.numerator) / v.denominator for v in exact.coefficients], digits=50)
    for s in (exact, dec):
        r = evaluate(s, ["-2.9", "2+1*I", "0.9", "-5"], Context(dps=30))
        assert r.provenance.method == "ode" and "conformal-pade" in r.provenance.options["why"]
        *good, on_cut = r.points
        with workdps(50):
            for p in good:
                x = mpmath.mpc(p.x)
                t = (1 - x) ** (-mpmath.mpf(1) / 2) * (1 + x / 3) ** (mpmath.mpf(1) / 3)
                v = mpmath.mpc(p.value.value, p.imag.value if p.imag is not None else 0)
                assert p.method == "ode" and p.success and p.value.contains(t.real)
                assert abs(v - t) / abs(t) < 1e-29 and p.value.digits() >= 29
        assert on_cut.method == "ode" and not on_cut.success and on_cut.value is None
        assert "either side gives different values" in on_cut.message


def test_equation_with_a_zero_of_the_leading_coefficient_at_the_origin_is_normalised_there():
    # log(1+x)/x obeys (x + x^2) f' + (1 + x) f - 1 = 0 (common practice, no source); normalising
    # Q_1(0) = 1 used to return that equation times 1e113 plus rounding, whose leading
    # coefficient had a spurious zero near 0 that blocked every path
    from resum.estimators.resum_ode import find_equation
    with workdps(120):
        c = [mpmath.mpf((-1) ** k) / (k + 1) for k in range(60)]
        K, Q, P = find_equation(c, 120, 100)
        assert K == 1 and Q[1][0] == 0
        q = Q[1]
        assert abs(q[2] / q[1] - 1) < 1e-60 and all(abs(v) < 1e-60 * abs(q[1]) for v in q[3:])
    r = evaluate(Series([Fraction((-1) ** k, k + 1) for k in range(60)]), ["10"], Context(dps=30))
    with workdps(50):
        t = mpmath.log(11) / 10
    p = r.points[0]
    assert p.method == "ode" and p.value.contains(t) and abs(p.value.value - t) < 1e-30


def test_auto_finds_a_second_order_equation_for_exact_input():
    # log(1+x)^2 obeys (1+x)^2 f'' + (1+x) f' - 2 = 0 and sqrt(1+x) + (1+x/2)^(-1/3) a
    # second-order equation too (common practice, no source); the plan's analysis only looks
    # for first-order ones, so for exact input auto searches order 2 itself. Truth: mpmath at
    # 50 digits
    n = 40
    lg = [Fraction(0)] + [Fraction((-1) ** (k + 1), k) for k in range(1, n)]
    sq = [sum(lg[i] * lg[k - i] for i in range(k + 1)) for k in range(n)]
    a = binomial_series(Fraction(1, 2), n).coefficients
    b = binomial_series(Fraction(-1, 3), n, scale=2).coefficients
    sm = [a[k] + b[k] for k in range(n)]
    cases = ((sq, lambda x: mpmath.log(1 + x) ** 2),
             (sm, lambda x: mpmath.sqrt(1 + x) + (1 + x / 2) ** (-mpmath.mpf(1) / 3)))
    for c, f in cases:
        r = evaluate(Series(c), ["1000"], Context(dps=30))
        p = r.points[0]
        assert p.method == "ode" and "f''" in r.diagnostics["equation"]
        with workdps(50):
            t = f(mpmath.mpf(1000))
            assert p.value.contains(t) and abs(p.value.value - t) / t < 1e-30


def test_a_pole_and_an_apparent_point_on_the_path_are_gone_round():
    # (1+x)^(-1/2) + 1/(1 - x/3): a pole at 3 on the line to 10, a double zero of the equation's
    # leading coefficient; going round it on either side gives the same values, so the walk
    # goes on. sqrt(1+x) + (1+x/2)^(-1/3) from 80 terms: the second-order equation has an
    # apparent singular point near 0.87 on the line to 100; fitted at the working digits it
    # leaves a gap of 2e-31 there, the refit at twice the digits closes it. Truth: the closed
    # forms, mpmath at 50 digits (common practice, no source)
    n = 40
    a = binomial_series(Fraction(-1, 2), n).coefficients
    pole = Series([a[k] + Fraction(1, 3 ** k) for k in range(n)])
    n = 80
    a = binomial_series(Fraction(1, 2), n).coefficients
    b = binomial_series(Fraction(-1, 3), n, scale=2).coefficients
    apparent = Series([a[k] + b[k] for k in range(n)])
    cases = ((pole, "10", 30, lambda x: (1 + x) ** (-mpmath.mpf(1) / 2) + 1 / (1 - x / 3)),
             (apparent, "100", 20, lambda x: mpmath.sqrt(1 + x) + (1 + x / 2) ** (-mpmath.mpf(1) / 3)))
    for s, at, dps, f in cases:
        for method in ("auto", "ode"):
            r = evaluate(s, [at], Context(dps=dps), method=method)
            p = r.points[0]
            assert p.method == "ode" and p.success, r.warnings
            with workdps(50):
                t = f(mpmath.mpf(at))
                assert p.value.contains(t) and abs(p.value.value - t) / abs(t) < mpmath.mpf(10) ** -dps
    # asked for by name, the equation is searched afresh at the working digits and leaves the gap
    # (auto fits the shape its plan found, which closes it at once; at 30 digits asked the first
    # fit is close enough either way)
    assert "refit_digits" in p.diagnostics


def test_auto_does_not_follow_a_stand_in_equation_of_a_function_with_infinitely_many_poles():
    # sum x^k / zeta(k+2) = sum_n mu(n)/n^2 / (1 - x/n) (Moebius inversion, common practice,
    # no source): poles at every square-free integer. At 30 digits from 60 terms (and 60 from
    # 100) a first-order equation with 19 (37) unknowns reproduces every coefficient, a rational
    # stand-in for the first poles; following it past x = -3 would give a confident wrong value.
    # x/(e^x - 1) (exact Bernoulli numbers; poles at 2 pi i k) likewise. auto keeps conformal-Padé
    # (or Padé, where the singularities the analysis finds are poles only)
    for digits, n in ((30, 60), (60, 100)):
        with workdps(digits + 20):
            c = [1 / mpmath.zeta(k + 2) for k in range(n)]
        with workdps(digits):
            c = [+v for v in c]
        r = evaluate(Series(c, digits=digits), ["-3"], Context(dps=20))
        assert r.provenance.method in ("conformal-pade", "pade")
    bern = [Fraction(int(p), int(q)) / math.factorial(k)
            for k, (p, q) in enumerate(mpmath.bernfrac(k) for k in range(40))]
    r = evaluate(Series(bern), ["10"], Context(dps=20))
    assert r.provenance.method in ("conformal-pade", "pade")
    with workdps(50):
        assert r.points[0].value.contains(10 / (mpmath.exp(10) - 1))


def test_a_stand_in_equation_with_too_many_unknowns_is_not_followed_even_if_flagged():
    # the same zeta series at 60 digits from 100 terms: an exact-equation search does find a
    # first-order equation (37 unknowns, a rational stand-in); were the analysis to flag it, the
    # plan still refuses it: fewer than 4 coefficients per unknown for inexact input
    from types import SimpleNamespace
    from resum.estimators.resum_ode import find_equation
    from resum.resummation import _follow_equation, _unknowns
    with workdps(80):
        c = [1 / mpmath.zeta(k + 2) for k in range(100)]
    with workdps(60):
        c = [+v for v in c]
    with workdps(100):
        eq = find_equation(c, 100, 60)
        assert eq is not None and _unknowns(eq) > 25
    flagged = SimpleNamespace(methods={"diff-approx": SimpleNamespace(diagnostics={"exact_equation": True})})
    with workdps(90):
        assert not _follow_equation(Series(c, digits=60), c, Context(dps=30), flagged)


def test_reexpansion_warning_only_when_a_point_used_the_map():
    # x (1 + x)^(-1/4) from 60 terms rounded to 40 digits (binomial series, common practice, no
    # source): auto follows the first-order equation the series obeys, so the conformal
    # re-expansion's cancellation (about 42 digits here) touches no value and is not warned about;
    # forced conformal-Padé still warns. Truth: the closed form, mpmath.
    c = [Fraction(1)]
    for k in range(1, 60):
        c.append(c[-1] * (Fraction(-1, 4) - (k - 1)) / k)
    with mpmath.workdps(40):
        s = Series([mpmath.mpf(v.numerator) / v.denominator for v in c], start=1, digits=40)
    r = evaluate(s, ["3", "10", "100"], Context(dps=30))
    assert [p.method for p in r.points] == ["ode"] * 3
    assert not any("re-expansion" in w for w in r.warnings)
    with mpmath.workdps(40):
        for p in r.points:
            x = mpmath.mpf(p.at)
            assert p.value.contains(x * (1 + x) ** (-mpmath.mpf(1) / 4))
    forced = evaluate(s, ["3"], Context(dps=30), method="conformal-pade")
    assert any("re-expansion in the disk variable cancels" in w for w in forced.warnings)
