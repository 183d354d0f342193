"""Ratio family against closed forms and published recursions.

Each test checks the truth lies in the band, the band is narrower than a
stated width, and (through the width) how many digits were reached.
"""
from fractions import Fraction

import mpmath
import pytest

from resum.context import Context, workdps
from resum.estimators.ratio import (classify_growth, estimate_conjugate_pair, estimate_large_order,
                                    estimate_ratio, estimate_root_test)
from resum.series import Series

from .refs import binomial_power, catalan, complex_pair, euler_series, lattice, log1p_series, \
    quartic_oscillator

CTX = Context(dps=50)


def _mp(x):
    return mpmath.mpf(x.numerator) / x.denominator if isinstance(x, Fraction) else mpmath.mpmathify(x)


def _check(est, truth, width):
    with workdps(120):
        truth = _mp(truth)
        assert est.contains(truth), (str(est), truth)
        assert est.width < width, (str(est), width)


def test_algebraic_non_integer_exponent():
    # (1 - 3x)^(-1/3): x_c = 1/3, theta = -1/3 (binomial series, common practice, no source)
    r = estimate_ratio(Series(binomial_power(Fraction(-1, 3), 50, scale=3)), CTX)
    assert r.success
    s = r.singularities[0]
    _check(s.re, Fraction(1, 3), 1e-30)
    _check(s.exponent, Fraction(-1, 3), 1e-30)
    assert s.kind == "branch"
    _check(r.radius, Fraction(1, 3), 1e-30)


def test_catalan_radius_and_exponent():
    # Catalan g.f.: radius 1/4, exponent +1/2 (common practice, no source)
    r = estimate_ratio(Series(catalan(50)), CTX)
    s = r.singularities[0]
    _check(r.radius, Fraction(1, 4), 1e-18)     # 18+ digits
    _check(s.exponent, Fraction(1, 2), 1e-14)


def test_log_singularity_recognised():
    # log(1+x): log singularity at x = -1 (common practice, no source)
    r = estimate_ratio(Series(log1p_series(40)), CTX)
    s = r.singularities[0]
    _check(s.re, -1, 1e-20)
    assert s.kind == "log"


def test_series_in_x_squared():
    # 1/(1 - 4x^2)^(1/2): only even terms; singularities at x = +-1/2 (common practice)
    cs = binomial_power(Fraction(-1, 2), 40, scale=4)
    even = []
    for c in cs:
        even += [c, 0]
    r = estimate_ratio(Series(even[:79]), CTX)
    assert r.diagnostics["stride"] == 2
    _check(r.radius, Fraction(1, 2), 1e-20)
    res = sorted(float(s.re.value) for s in r.singularities)
    assert res == pytest.approx([-0.5, 0.5], abs=1e-12)


def test_saw_growth_constant_step2():
    # square-lattice SAW, 80 terms (I. Jensen, J. Phys. A 49 (2016) 424003, arXiv:1607.01109);
    # mu = 2.63815853032790(3) (Jacobsen, Scullard, Guttmann, J. Phys. A 49 (2016) 494004,
    # arXiv:1607.02984); gamma = 43/32 (Nienhuis, PRL 49 (1982) 1062). The even/odd
    # oscillation forces step-2 ratios.
    cs, _ = lattice("saw_square_lattice")
    r = estimate_ratio(Series(cs), CTX)
    assert r.diagnostics["step"] == 2
    s = r.singularities[0]
    xc = 1 / mpmath.mpf("2.63815853032790")
    with workdps(30):
        assert abs(s.re.value - xc) / xc < 5e-8           # 7+ digits reached
        assert s.exponent.width < 1e-3
        assert abs(s.exponent.value + Fraction(43, 32)) < 5e-4


def test_conjugate_pair():
    # 1/(1 - x + x^2)^(2/5): pair at exp(+-i pi/3), theta = -2/5 (common practice, no source)
    with workdps(70):
        cs = complex_pair(80, 70)
    r = estimate_conjugate_pair(Series(cs, digits=60), Context(dps=55))
    assert r.success, r.message
    _check(r.radius, 1, 1e-10)
    ang = r.diagnostics["angle"]
    with workdps(60):
        _check(ang, mpmath.pi / 3, 1e-8)
        ims = sorted(float(s.im.value) for s in r.singularities)
    assert ims == pytest.approx([-3 ** 0.5 / 2, 3 ** 0.5 / 2], abs=1e-9)
    _check(r.singularities[0].exponent, Fraction(-2, 5), 1e-3)


def test_conjugate_pair_declines_a_real_point_with_corrections():
    # (1 + 16x)^(1/8) - 3 (1 + 16x)^(5/8): one real singular point x = -1/16, exponents 1/8 and
    # 5/8 (binomial series, common practice, no source). Its coefficients fit the pair
    # recurrence with an angle 1e-6 from the real axis; before, the estimator reported a pair
    # -1/16 +- 1.3e-7 i with exponent 0.875 (neither 1/8 nor 5/8). Over 80 terms such an angle
    # has not turned through a sixth of a period: not applicable, the ratio methods take the point
    a = binomial_power(Fraction(1, 8), 80, scale=-16)
    b = binomial_power(Fraction(5, 8), 80, scale=-16)
    r = estimate_conjugate_pair(Series([x - 3 * y for x, y in zip(a, b)]), Context(dps=60))
    assert not r.success and "real singular point" in r.message
    # a genuine pair at a small angle, resolved by the data, is still found: (1 - 2x cos(1/4) +
    # x^2)^(-1/3) has x_c = exp(+-i/4), theta = -1/3 (common practice, no source)
    with workdps(80):
        t = mpmath.cos(mpmath.mpf(1) / 4)
        cs = mpmath.taylor(lambda x: (1 - 2 * x * t + x * x) ** (-mpmath.mpf(1) / 3), 0, 79)
    r = estimate_conjugate_pair(Series(cs, digits=60), Context(dps=55))
    assert r.success, r.message
    with workdps(60):
        _check(r.diagnostics["angle"], mpmath.mpf(1) / 4, 1e-4)


def test_large_order_euler():
    # sum (-1)^n n! x^n: A = -1, b = 1 exactly (common practice, no source)
    r = estimate_large_order(Series(euler_series(40)), CTX)
    _check(r.borel_singularity, -1, 1e-20)
    _check(r.borel_exponent, 1, 1e-15)
    assert r.growth == "factorial"


def test_large_order_quartic_oscillator():
    # H = p^2 + x^2 + g x^4, Bender-Wu recursion (Bender and Wu, Phys. Rev. 184 (1969) 1231).
    # Large order (Bender and Wu, Phys. Rev. D 7 (1973) 1620) for H' = p^2 + x^2/4 + l x^4/4:
    # E'_n ~ (-1)^(n+1) sqrt(6)/pi^(3/2) 3^n Gamma(n+1/2). Rescaling x = sqrt(2) y gives
    # H' = (p_y^2 + y^2 + 2 l y^4)/2, so E'(l) = E(g = 2l)/2 and E_n = 2 E'_n / 2^n
    # ~ (-1)^(n+1) 2 sqrt(6)/pi^(3/2) (3/2)^n Gamma(n+1/2): A = -2/3, b = 1/2.
    E = quartic_oscillator(60)
    assert E[:4] == [1, Fraction(3, 4), Fraction(-21, 16), Fraction(333, 64)]  # Bender-Wu 1969
    r = estimate_large_order(Series(E), CTX)
    _check(r.borel_singularity, Fraction(-2, 3), 1e-5)
    _check(r.borel_exponent, Fraction(1, 2), 1e-2)


def test_root_test_radius():
    # (1 - 2x)^(-3/2): radius 1/2 (common practice); the root test is crude
    r = estimate_root_test(Series(binomial_power(Fraction(-3, 2), 60, scale=2)), CTX)
    _check(r.radius, Fraction(1, 2), 0.05)


def test_root_test_fits_the_envelope_when_one_parity_falls_off():
    # (1 + x^2)^(-1/3) + (1 + x/2)^(1/2): radius 1 (binomial series, common practice, no source).
    # The odd coefficients shrink like 2^-n, the even ones like n^(-2/3): one fit through both
    # gave radius 3.0 [-7.6e+19, 7.6e+19]. The upper envelope (limsup, Cauchy-Hadamard) gives 1
    n = 40
    even = binomial_power(Fraction(-1, 3), n // 2, scale=-1)      # (1 + u)^(-1/3), u = x^2
    b = binomial_power(Fraction(1, 2), n, scale=Fraction(-1, 2))
    c = [b[k] + (even[k // 2] if k % 2 == 0 else 0) for k in range(n)]
    r = estimate_root_test(Series(c), CTX)
    assert r.success, r.message
    _check(r.radius, 1, 0.01)
    assert "upper envelope" in r.diagnostics["how"]


def test_root_test_refuses_magnitudes_without_one_law():
    # 1 at every ninth order, 5^-n elsewhere: the radius is 1 (Cauchy-Hadamard, common practice,
    # no source), but blocks of up to 4 orders often miss the large terms, so no fit through
    # magnitudes agrees with another; the test must say so rather than print a band wider than
    # its value
    c = [Fraction(1) if k % 9 == 0 else Fraction(1, 5 ** k) for k in range(60)]
    r = estimate_root_test(Series(c), CTX)
    assert not r.success and "disagree" in r.message


def test_growth_classes():
    with workdps(30):
        assert classify_growth([mpmath.mpf(math_fact) for math_fact in euler_series(40)])[0] == "factorial"
        assert classify_growth([1 / mpmath.factorial(n) for n in range(40)])[0] == "entire-like"
        assert classify_growth([_mp(c) for c in catalan(40)])[0] == "finite radius"


def test_growth_class_survives_a_crossover_of_two_terms():
    # (1 - x)^(1/3) + (1 - x/1.1)^(-1/2): radius 1 (binomial series, common practice, no source).
    # The two terms have opposite signs and cross over near n = 40, where a few ratios
    # c_n/c_(n-2) swing by orders of magnitude; a least-squares slope called 60 terms
    # factorial (kappa 0.62) and every estimator refused the series
    a = binomial_power(Fraction(1, 3), 60)
    b = binomial_power(Fraction(-1, 2), 60, scale=Fraction(10, 11))
    c = [x + y for x, y in zip(a, b)]
    with workdps(30):
        kind, kappa = classify_growth([_mp(x) for x in c])
    assert kind == "finite radius" and abs(kappa) < 0.5, kappa
    from resum.analysis import analyze
    r = analyze(Series(c), Context(dps=30))
    assert r.success and r.growth == "finite radius", r.message
    _check(r.radius, 1, 1e-3)


def test_not_applicable_is_reported_not_raised():
    r = estimate_ratio(Series(euler_series(30)), CTX)
    assert not r.success and r.status.value == "not applicable"


def test_short_series_is_told_it_is_short_not_that_it_has_zeros():
    # -log(1 - x)/x = sum x^k/(k + 1) (common practice, no source): 10 terms, none zero; the
    # messages used to ask about zero coefficients
    s = Series([Fraction(1, k + 1) for k in range(10)])
    r = estimate_root_test(s, CTX)
    assert not r.success and "needs 8" in r.message and "give more terms" in r.message
    assert "of them zero" not in r.message
    q = estimate_ratio(s, CTX)
    if not q.success:
        assert "zero coefficient" not in q.message and "give more terms" in q.message


@pytest.mark.parametrize("R", ["1", "0.5", "2"])
def test_slowly_turning_pole_pair_is_not_entire(R):
    # 1/(1 - 2 cos(t) x/R + x^2/R^2) = sum U_n(cos t) (x/R)^n with U_n(cos t) = sin((n+1)t)/sin t
    # (Chebyshev polynomials of the second kind; common practice, no source): poles at R e^(+-it).
    # With t = 0.1 the phase turns so slowly over 60 terms that the ratio slope read the series
    # as entire (radius infinite), even at R = 1/2 where the coefficients grow like 2^n.
    with workdps(40):
        t, r = mpmath.mpf("0.1"), mpmath.mpf(R)
        c = [mpmath.sin((n + 1) * t) / mpmath.sin(t) / r ** n for n in range(60)]
    assert classify_growth(c)[0] == "finite radius"


@pytest.mark.parametrize("f", ["exp", "gauss", "cos"])
def test_entire_functions_stay_entire(f):
    # exp(x) (order 1), exp(-x^2) (order 2, every other coefficient zero), cos x: coefficients
    # 1/n!, (-1)^k/k! at x^(2k), (-1)^k/(2k)! (common practice, no source)
    with workdps(40):
        if f == "exp":
            c = [1 / mpmath.factorial(n) for n in range(60)]
        elif f == "gauss":
            c = [(-1) ** (n // 2) / mpmath.factorial(n // 2) if n % 2 == 0 else mpmath.mpf(0) for n in range(60)]
        else:
            c = [(-1) ** (n // 2) / mpmath.factorial(n) if n % 2 == 0 else mpmath.mpf(0) for n in range(60)]
    assert classify_growth(c)[0] == "entire-like"


def test_a_logarithmic_correction_keeps_the_exponent_in_the_band():
    # sum x^n / log(n + 2): c_n ~ 1/log n, i.e. f ~ 1/((1 - x) log(1/(1 - x))) near x = 1, exponent
    # -1 with a logarithmic correction (singularity analysis, Flajolet and Odlyzko, SIAM J. Discrete
    # Math. 3 (1990) 216; from memory). The exponent estimates creep towards -1 like 1/log n (-0.86
    # from 120 terms): the band, extended for a drift that barely slows, must reach -1
    with workdps(60):
        c = [1 / mpmath.log(n + 2) for n in range(120)]
    res = estimate_ratio(Series(c, digits=55), Context(dps=50))
    s = res.singularities[0]
    assert s.re.contains(1)
    assert s.exponent.contains(-1) and s.exponent.width < 1
    assert "still drifting" in s.note


def test_neville_band_covers_a_correction_of_non_integer_order():
    # a_n = -16 (1 - 1.4/n + 0.3 n^-1.4 + 0.5/n^2), n = 18..36: limit -16 (closed form, common
    # practice, no source). No column of a Neville table in 1/n removes n^-1.4: the columns'
    # last entries creep towards -16 with steps that shrink like a power of the order, and the
    # spread within the chosen column (order 12, the top of the table) sees only the last step.
    # Before the band counted the rest of that movement it read -15.99965(11), missing -16.
    from resum.estimators._extrap import extrapolate
    with workdps(30):
        ns = list(range(18, 37))
        a = [-16 * (1 - mpmath.mpf("1.4") / n + mpmath.mpf("0.3") * mpmath.mpf(n) ** mpmath.mpf("-1.4")
                    + mpmath.mpf("0.5") / n ** 2) for n in ns]
        v, half, k, info = extrapolate(ns, a, mpmath.mpf(10) ** -30)
        assert abs(v + 16) <= half, (v, half)
        assert half < 4 * abs(v + 16)                  # not uselessly wide
        assert info["column_tail"] > 0
        # integer powers of 1/n only: the columns settle, no tail and the band stays sharp
        b = [1 + mpmath.mpf(3) / n - mpmath.mpf(2) / n ** 2 + mpmath.mpf(5) / n ** 3 for n in ns]
        v, half, k, info = extrapolate(ns, b, mpmath.mpf(10) ** -30)
        assert info["column_tail"] == 0 and abs(v - 1) <= half < 1e-20


@pytest.mark.parametrize("theta,delta,amp,n", [(Fraction(1, 3), Fraction(1, 3), 2, 48),
                                               (Fraction(3, 4), Fraction(3, 5), 1, 36),
                                               (Fraction(2, 5), Fraction(1, 5), -1, 48)])
def test_radius_band_holds_with_a_confluent_term_of_non_integer_order(theta, delta, amp, n):
    # (1 + 16x)^theta + amp (1 + 16x)^(theta + delta): radius 1/16 (binomial series, common
    # practice, no source). c_n carries a correction n^-delta (delta not a multiple of 1/2), which
    # neither the table in 1/n nor the one in 1/sqrt(n) removes; the ratio band read
    # 0.0624959(19), 0.0625014(6) and 0.062504(3), each missing 1/16, before it counted what is
    # left of the Neville columns' steady movement (resum/estimators/_extrap.py, column_tail)
    cs = [x + amp * y for x, y in zip(binomial_power(theta, n, scale=-16),
                                      binomial_power(theta + delta, n, scale=-16))]
    r = estimate_ratio(Series(cs), Context(dps=30))
    _check(r.radius, Fraction(1, 16), 1e-4)
