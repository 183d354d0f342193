"""Cases that once gave a wrong band, lost the map or took minutes.

All series are binomial or sums of binomial series (closed forms, common practice, no source);
truths from mpmath's principal powers at 50 digits.
"""
import math
from fractions import Fraction

import mpmath
import pytest

from resum.analysis import analyze
from resum.context import Context, workdps
from resum.estimators.resum_band import _roots
from resum.resummation import PLAN_METHODS, evaluate
from resum.series import Series
from tests.known_series import binomial_series, quadratic_series


def _two_points(n):
    # sqrt(1 + x) + (1 + x/2)^(-1/3): branch points at -1 and -2, growth sqrt(x)
    a = binomial_series(Fraction(1, 2), n).coefficients
    b = binomial_series(Fraction(-1, 3), n, scale=2).coefficients
    return Series([u + v for u, v in zip(a, b)])


def _two_points_truth(x):
    with workdps(50):
        X = mpmath.mpf(x)
        return mpmath.sqrt(1 + X) + (1 + X / 2) ** (-mpmath.mpf(1) / 3)


def _digits(v, t):
    with workdps(50):
        return float(-mpmath.log10(abs(v - t) / abs(t)))


@pytest.mark.parametrize("x", ["100", "1000"])
def test_top_approximant_leaving_a_plateau_stays_in_the_band(x):
    # 40 terms: the approximant with the most terms moved away from two lower ones that agreed
    # to 8e-11; it was set aside as a spike and the band (3e-10) missed the truth by 4e-9 at
    # x = 100 (band/error 0.07), 0.03 at x = 1000
    res = evaluate(_two_points(40), [x], Context(dps=20))
    p = res.points[0]
    truth = _two_points_truth(x)
    assert p.value.contains(truth)
    assert _digits(p.value.value, truth) >= (9 if x == "100" else 5)      # 9.7 and 5.9 measured


@pytest.mark.slow
def test_lone_pair_one_percent_inside_is_screened():
    # 80 terms: differential approximants alone put a pair at 0.836 +- 0.529i (|s| = 0.990)
    # while the ratios pin the radius to 1e-10; no map was chosen and x = 100 got 6.7 digits
    s = _two_points(80)
    an = analyze(s, Context(dps=20), methods=list(PLAN_METHODS), verify=False)
    assert an.radius.contains(1) and an.radius.error < mpmath.mpf("1e-6")
    assert all(abs(z.location) > mpmath.mpf("0.999") for z in an.singularities)
    p = evaluate(s, ["100"], Context(dps=20), method="conformal-pade").points[0]
    truth = _two_points_truth("100")
    assert p.method == "conformal-pade" and p.value.contains(truth)
    assert _digits(p.value.value, truth) >= 15                            # 20 measured


@pytest.mark.slow
def test_degenerate_table_of_a_rational_function_is_fast_and_right():
    # (1 + x)^(-5/2) = ((1 - w)/(1 + w))^5 in the disk variable: the Padé denominators carry a
    # five-fold root that FLINT cannot isolate; the fallback (mpmath.polyroots) took 6 s per
    # denominator, 79 s for one point with 80 terms. Now double-precision roots serve the pole
    # check. (Speed is measured in studies/, not here: this checks the value.)
    p = evaluate(binomial_series(Fraction(-5, 2), 80), ["100"], Context(dps=20)).points[0]
    with workdps(50):
        truth = mpmath.mpf(101) ** (-mpmath.mpf(5) / 2)
    assert p.value.contains(truth) and _digits(p.value.value, truth) >= 19


def test_roots_of_a_polynomial_with_a_multiple_root():
    # (z + 1)^5 (z - 3) (z - i/2), expanded exactly (mpmath.polyroots's convention reversed);
    # a five-fold root splits by about eps^(1/5) ~ 1e-3 in double precision
    with workdps(40):
        poly = [mpmath.mpc(1)]
        for r in [-1] * 5 + [3, mpmath.mpc(0, "0.5")]:
            poly = [(poly[k - 1] if k > 0 else 0) - r * (poly[k] if k < len(poly) else 0)
                    for k in range(len(poly) + 1)]
        rts = _roots(poly, 40)
    assert len(rts) == 7
    for r in [-1] * 5 + [3, mpmath.mpc(0, "0.5")]:
        assert min(abs(z - r) for z in rts) < 1e-2


@pytest.mark.slow
def test_rational_borel_transform_verifies_at_higher_precision():
    # sum (-1)^n (n+2)!/2 x^n: its Borel transform is 1/(1+t)^3, so the Padé tables of the
    # (mapped) transform are degenerate. The sum is the Stieltjes integral
    # int_0^inf e^(-t) t^2/2 /(1 + x t) dt (mpmath.quad; common practice, no source). The
    # rerun at higher precision used to lose every approximant to pole-zero pairs on the
    # path whose residues, computed at roots good to 1e-16 only, looked large: the points were
    # marked unstable although correct to 21 digits.
    c = [Fraction(1)]
    for k in range(1, 40):
        c.append(c[-1] * -(k + 2))
    res = evaluate(Series(c), ["0.3", "1"], Context(dps=20))
    with workdps(40):
        for p in res.points:
            x = p.x
            truth = mpmath.quad(lambda t: mpmath.exp(-t) * t ** 2 / 2 / (1 + x * t), [0, 1, 10, mpmath.inf])
            assert p.success, p.message
            assert p.value.contains(truth) and _digits(p.value.value, truth) >= 18


@pytest.mark.parametrize("b,digits,points,want", [(Fraction(1, 3), 19, ("0.5", "2"), (15, 11)),
                                                   (Fraction(3, 2), 16, ("0.3", "1"), (15, 14))])
def test_rounded_stieltjes_series_keeps_its_precision_check(b, digits, points, want):
    # sum (-1)^n (b)_n x^n given to 19 or 16 significant digits (as a user's file would carry
    # it). It is the asymptotic series of int_0^inf e^(-t) (1 + x t)^(-b) dt = U(1, 2 - b, 1/x)/x
    # (DLMF 13.4.4 with a = 1; mpmath.hyperu as reference). The rounding noise makes Froissart
    # doublets on the Laplace path of the mapped Borel transform; the rerun at higher precision
    # dropped every approximant carrying one (b = 1/3: kept 1 of 10), and the points were marked
    # unstable although right to 17 and 13 digits. Pairs whose contribution lies near the noise
    # of the digits the input carries are now cancelled against their zero.
    c, r = [], Fraction(1)
    for n in range(40):
        c.append(r)
        r *= -(b + n)
    with workdps(digits + 1):
        rounded = [mpmath.mpf(v.numerator) / v.denominator for v in c]
    s = Series(rounded, digits=digits)
    res = evaluate(s, list(points), Context(dps=20))
    with workdps(40):
        bb = mpmath.mpf(b.numerator) / b.denominator
        for p, w in zip(res.points, want):
            truth = mpmath.hyperu(1, 2 - bb, 1 / p.x) / p.x
            assert p.success, p.message
            assert p.value.contains(truth)
            assert _digits(p.value.value, truth) >= w
            assert p.value.digits() >= w - 2


def _power_of_quadratic(b1, b2, p, n):
    # (1 + b1 x + b2 x^2)^p, exact (tests/known_series.py)
    return Series(quadratic_series(p, Fraction(b1), Fraction(b2), n))


@pytest.mark.parametrize("b1,p,x,want", [(-1, Fraction(-1, 3), "2", 8), (1, Fraction(-1, 2), "3", 8)])
def test_complex_pair_off_the_axis_gets_a_map(b1, p, x, want):
    # (1 - x + x^2)^(-1/3): branch points exp(+-i pi/3), and (1 + x + x^2)^(-1/2): exp(+-2i pi/3);
    # both singular at infinity too. Before, such a pair got no conformal map and plain Padé
    # reached 2.6 digits at x = 2 from 40 terms; the pair map gives 9.2. Truth: mpmath's
    # principal power (the quadratic is positive on the real axis).
    res = evaluate(_power_of_quadratic(b1, 1, p, 40), [x], Context(dps=20), method="conformal-pade")
    pt = res.points[0]
    assert pt.method == "conformal-pade" and res.provenance.options["map"]["kind"] == "pair"
    with workdps(50):
        X = mpmath.mpf(x)
        truth = (1 + b1 * X + X * X) ** (mpmath.mpf(p.numerator) / p.denominator)
    assert pt.imag is None and pt.value.contains(truth)
    assert _digits(pt.value.value, truth) >= want


def test_second_cut_on_the_other_side_is_mapped():
    # (1-x)^(-1/2) (1+x/3)^(1/3): cuts [1, inf) and (-inf, -3]. Plain Padé alone saw the far
    # branch point, so only the near cut was mapped and x = -2.9 (next to the far one) got 7
    # digits; the exact differential equation now confirms -3 and the two-cut map gives 12+
    # (measured 13.7 true, 11.9 claimed, 60 terms, 30 digits asked)
    n = 60
    a = binomial_series(Fraction(-1, 2), n, scale=-1).coefficients
    b = binomial_series(Fraction(1, 3), n, scale=3).coefficients
    s = Series([sum(a[i] * b[k - i] for i in range(k + 1)) for k in range(n)])
    r = evaluate(s, ["-2.9"], Context(dps=30), method="conformal-pade")
    assert r.diagnostics["map"]["kind"] == "arc", r.diagnostics["map"]
    p = r.points[0]
    with workdps(50):
        t = (1 - mpmath.mpf("-2.9")) ** (-mpmath.mpf(1) / 2) * (1 + mpmath.mpf("-2.9") / 3) ** (mpmath.mpf(1) / 3)
        assert p.value.contains(t), (p.value, t)
        assert _digits(p.value.value, t) > 11 and p.value.digits() > 10


def test_function_vanishing_at_the_point_is_an_absolute_result():
    # (1+x)^(1/3) - 2 vanishes at x = 7 (outside the disk); from 45-digit decimals the
    # resummed value is ~1e-24 with a band around 0: no relative digit, but the band is an
    # absolute statement ("zero to 1e-23"), which used to be reported as not converged.
    # Closed form, common practice, no source
    n = 40
    c = list(binomial_series(Fraction(1, 3), n).coefficients)
    c[0] -= 2
    with workdps(45):
        cm = [mpmath.mpf(v.numerator) / v.denominator for v in c]
    r = evaluate(Series(cm, digits=45), ["7", "6"], Context(dps=30))
    zero, other = r.points
    assert zero.success and zero.value.contains(0) and zero.value.error < 1e-15
    assert "absolute" in zero.diagnostics and any("zero to within" in w for w in r.warnings)
    assert "reach" not in zero.diagnostics
    with workdps(50):
        t = mpmath.cbrt(7) - 2
        assert other.success and other.value.contains(t) and "absolute" not in other.diagnostics


def test_rerun_that_supports_no_digit_is_covered():
    # exp(-x)/sqrt(1+x) from 80 terms rounded to 16 digits, at x = 10 (truth 1.37e-5 from the
    # closed form, common practice, no source). The approximants agreed to 7e-6 around -5e-6,
    # "zero to within 1.1e-5", while the rerun with the input moved by a unit in its last digit
    # had a band of 4e-3: the truth lay outside. A rerun band that supports no digit is now
    # covered whole, and the point claims no relative digit either
    n = 80
    e = [Fraction((-1) ** k, math.factorial(k)) for k in range(n)]
    b = binomial_series(Fraction(-1, 2), n).coefficients
    c = [sum(e[j] * b[k - j] for j in range(k + 1)) for k in range(n)]
    with workdps(16):
        cm = [+mpmath.mpf(v.numerator) / v.denominator for v in c]
    r = evaluate(Series(cm, digits=16), ["10"], Context(dps=20))
    p = r.points[0]
    with workdps(40):
        truth = mpmath.exp(-10) / mpmath.sqrt(11)
        assert p.value.contains(truth)
    # no relative digit is claimed: either no result or an absolute "zero to within" statement
    assert not p.success or "absolute" in p.diagnostics
    # the rerun's band is covered whole, or the main band is within RERUN_WIDER of it (since the
    # derivative variant's band covers what poles inside the disk add, the direct variant is
    # kept here, with a band of 1.3e-4 against the rerun's 4.9e-4, and no widening is due)
    from resum.resummation import RERUN_WIDER
    rerun = mpmath.mpf(p.diagnostics["verification"]["higher precision band"])
    assert (any("supports no digit here; band widened to cover it" in w for w in r.warnings)
            or RERUN_WIDER * p.value.error >= rerun)


def test_point_beyond_a_vertical_cut_of_the_pair_map_gets_radial_cuts():
    # (1 - 3x/2 + 9 x^2)^(1/3) = ((1 - x/s)(1 - x/conj(s)))^(1/3), s = (1 + i sqrt(15))/12
    # (closed form, common practice, no source). The pair map cuts along Re x = 1/12, where the
    # quadratic is negative; beyond those cuts its value is another branch than the
    # continuation along the straight line from 0, (1 - x/s)^(1/3) (1 - x/conj(s))^(1/3) (each
    # factor's cut radial): at 0.18 + 0.98 i the two differ by a cube root of unity, and the
    # value came out on the other branch with no word. A point beyond a vertical cut now gets
    # the star map (radial cuts) and the straight-line value; x = 2 keeps the pair map
    c = quadratic_series(Fraction(1, 3), Fraction(-3, 2), 9, 60)
    r = evaluate(Series(c), ["0.1834148615 + 0.9830355988*I", "2"], Context(dps=20), method="conformal-pade")
    assert r.diagnostics["map"]["kind"] == "pair"
    far, real = r.points
    assert far.diagnostics["map"]["kind"] == "star" and "map" not in real.diagnostics
    assert "branch" not in far.diagnostics and "branch" not in real.diagnostics
    with workdps(50):
        x = mpmath.mpc("0.1834148615", "0.9830355988")
        z = (1 + 1j * mpmath.sqrt(15)) / 12
        third = mpmath.mpf(1) / 3
        straight = (1 - x / z) ** third * (1 - x / mpmath.conj(z)) ** third
        v = mpmath.mpc(far.value.value, far.imag.value)
        assert far.value.contains(straight.real) and far.imag.contains(straight.imag)
        assert abs(v / straight - 1) < 1e-8
        t2 = (1 - 3 + 36) ** third
        assert real.value.contains(t2) and real.value.digits() > 8      # 8.9 measured (7.9 with the star map)


def test_point_beyond_an_unmapped_complex_pair_is_flagged():
    # (1 + 3x/2 + x^2)^(1/2) (1 + 3x)^(2/5) (1 + 4x)^(3/2): the map takes the cut from -1/4;
    # the pair -3/4 +- i sqrt(7)/4 stays to the approximants, which cut it their own way: at
    # -2.32 + 0.92 i the value came out as minus the principal one, with no word (closed form,
    # common practice, no source). The point is now flagged; x = 1 (opposite side) is not
    n = 60
    c = quadratic_series(Fraction(1, 2), Fraction(3, 2), 1, n)
    for p, s in ((Fraction(2, 5), Fraction(-1, 3)), (Fraction(3, 2), Fraction(-1, 4))):
        b = binomial_series(p, n, scale=-s).coefficients
        c = [sum(c[i] * b[k - i] for i in range(k + 1)) for k in range(n)]
    r = evaluate(Series(c), ["-2.323549565 + 0.922560252*I", "1"], Context(dps=20), method="conformal-pade")
    far, near = r.points
    assert "beyond" in far.diagnostics.get("branch", ""), far.diagnostics.get("branch")
    assert "branch" not in near.diagnostics
    # method auto follows the differential equation the product obeys, along the straight line,
    # so the same point gets the straight-line value itself (closed form at 50 digits)
    far = evaluate(Series(c), ["-2.323549565 + 0.922560252*I"], Context(dps=20)).points[0]
    assert far.method == "ode"
    with workdps(50):
        x = mpmath.mpc("-2.323549565", "0.922560252")
        t = ((1 + 3 * x / 2 + x * x) ** (mpmath.mpf(1) / 2) * (1 + 3 * x) ** (mpmath.mpf(2) / 5)
             * (1 + 4 * x) ** (mpmath.mpf(3) / 2))
        u = (mpmath.sqrt(1 - x / mpmath.mpc(-0.75, mpmath.sqrt(7) / 4))
             * mpmath.sqrt(1 - x / mpmath.mpc(-0.75, -mpmath.sqrt(7) / 4))
             * (1 + 3 * x) ** (mpmath.mpf(2) / 5) * (1 + 4 * x) ** (mpmath.mpf(3) / 2))
        v = mpmath.mpc(far.value.value, far.imag.value)
        assert abs(v / u - 1) < 1e-18 and far.value.contains(u.real) and far.imag.contains(u.imag)
        assert abs(t / u - 1) < 1e-40      # here also the principal power of the whole product


def test_rounding_artifacts_do_not_choose_the_map():
    # sqrt(1 + x) (1 - 2x/3)^(-3/10), 50 terms rounded to 30 digits: branch points -1 and 3/2
    # (closed form). The differential approximants alone also put two conjugate pairs on the
    # circle |x| = 1 that move when the last digit moves; the plan built a pair map on one of
    # them (0.700 + 0.709 i) and reached 12.2 digits at x = -0.5 + 1.5 i. Screened, the map is
    # built on the true points (two cuts, from -1 and from 3/2) and the value carries 24+ digits.
    # Truth: principal powers (the segment from 0 crosses neither cut), mpmath at 50 digits
    a = binomial_series(Fraction(1, 2), 50).coefficients
    b = binomial_series(Fraction(-3, 10), 50, scale=Fraction(-3, 2)).coefficients
    c = [sum(a[j] * b[k - j] for j in range(k + 1)) for k in range(50)]
    with workdps(30):
        c = [mpmath.mpf(x.numerator) / x.denominator for x in c]
    r = evaluate(Series(c, digits=30), ["-0.5+1.5*I"], ctx=Context(dps=30), method="conformal-pade")
    p = r.points[0]
    with workdps(50):
        x = mpmath.mpc("-0.5", "1.5")
        truth = mpmath.sqrt(1 + x) * (1 - 2 * x / 3) ** (-mpmath.mpf(3) / 10)
    assert p.value.contains(truth.real) and p.imag.contains(truth.imag), (str(p.value), str(p.imag))
    assert max(p.value.width, p.imag.width) < 1e-23
    m = r.diagnostics["map"]
    ends = sorted(mpmath.mpf(mpmath.mpmathify(m[k]).real) for k in ("s1", "s2")) if m["kind"] == "arc" else []
    assert len(ends) == 2 and abs(ends[0] + 1) < 1e-20 and abs(ends[1] - 1.5) < 1e-20, m
