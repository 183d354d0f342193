"""Conformal maps and Borel transforms against closed forms."""
from fractions import Fraction

import mpmath
import pytest

from resum.context import workdps
from resum.transforms.borel import borel_coefficients, laplace
from resum.transforms.conformal import ArcMap, PairMap, RayMap, StarMap, choose_map, pull_back


@pytest.mark.parametrize("cmap", [RayMap(mpmath.mpf(-1) / 16), RayMap(mpmath.mpc(1, 2)),
                                  ArcMap(mpmath.mpf(2), mpmath.mpf(-1)),
                                  ArcMap(mpmath.mpc(0, 1), mpmath.mpc(0, -1))])
def test_map_inverse_and_series(cmap):
    # x(w(x)) = x, and the Taylor series of x(w) reproduces x(w) inside the disk
    # (common practice, no source)
    with workdps(40):
        for x in [mpmath.mpf("0.3"), mpmath.mpf(-0.01), mpmath.mpc("0.2", "0.1")]:
            assert abs(cmap.x_of_w(cmap.w_of_x(x)) - x) < mpmath.mpf(10) ** -35
        w = mpmath.mpf("0.3")
        cs = cmap.x_series(120, 40)
        assert abs(sum(c * w ** k for k, c in enumerate(cs)) - cmap.x_of_w(w)) < mpmath.mpf(10) ** -30
        # the branch points sit on the unit circle
        for z in cmap.branch_points():
            assert abs(abs(cmap.w_of_x(z * (1 + mpmath.mpf(10) ** -30))) - 1) < mpmath.mpf(10) ** -10


def test_pull_back_exact_log():
    # log(1+x) with x = 4w/(1-w)^2 (cut (-inf,-1]) is 2 log((1+w)/(1-w)) = 4 (w + w^3/3 + w^5/5 + ...)
    cs = [0] + [Fraction((-1) ** (k + 1), k) for k in range(1, 30)]
    cw = pull_back(cs, RayMap(-1), 30)
    assert cw == [0] + [Fraction(4, k) if k % 2 else 0 for k in range(1, 30)]


def test_choose_map():
    assert isinstance(choose_map([mpmath.mpf(-1) / 16]), RayMap)
    assert isinstance(choose_map([mpmath.mpc(0, 1), mpmath.mpc(0, -1)]), ArcMap)
    # a pair off the imaginary axis: cuts to infinity along Re x = -1 (an arc joining the pair
    # through the far side would put x = infinity inside the disk)
    assert isinstance(choose_map([mpmath.mpc(-1, 1), mpmath.mpc(-1, -1)]), PairMap)
    assert isinstance(choose_map([mpmath.mpf(1), mpmath.mpf(-2)]), ArcMap)
    assert choose_map([]) is None


def test_borel_laplace_stieltjes():
    # Borel transform of sum (-1)^n n! x^n is 1/(1+t); Laplace integral = e^{1/x} E_1(1/x)/x
    # (Bender and Orszag 1978, sec. 8.2; mpmath e1)
    with workdps(40):
        d = borel_coefficients([(-1) ** n * mpmath.factorial(n) for n in range(10)], 0)
        assert all(abs(v - (-1) ** n) < mpmath.mpf(10) ** -35 for n, v in enumerate(d))
        v, err = laplace(lambda t: 1 / (1 + t), mpmath.mpf(2), 0, 40)
        assert abs(v - mpmath.e ** mpmath.mpf(0.5) * mpmath.e1(0.5) / 2) < mpmath.mpf(10) ** -35
        # Borel-Le Roy b = 1/2 with the Gamma(n + 3/2) weights, same function
        d2 = borel_coefficients([(-1) ** n * mpmath.factorial(n) for n in range(3)], mpmath.mpf(1) / 2)
        assert abs(d2[1] + 1 / mpmath.gamma(mpmath.mpf(5) / 2)) < mpmath.mpf(10) ** -35


@pytest.mark.parametrize("x, dps", [("0.1", 20), ("2", 30), ("0.5", 45)])
def test_laplace_digits_asked_at_higher_working_precision(x, dps):
    # the quadrature runs at dps + LAPLACE_GUARD digits while the caller works at 100: the value
    # must still carry the dps digits asked and its error estimate must cover the actual error;
    # reference e^{1/x} E_1(1/x)/x, the Borel sum of sum (-1)^n n! x^n (Bender and Orszag 1978,
    # sec. 8.2; mpmath e1)
    with workdps(100):
        X = mpmath.mpf(x)
        ref = mpmath.e ** (1 / X) * mpmath.e1(1 / X) / X
        v, err = laplace(lambda t: 1 / (1 + t), X, 0, dps)
        assert abs(v - ref) <= err
        assert abs(v - ref) < abs(ref) * mpmath.mpf(10) ** (-dps)


def test_laplace_borel_le_roy_and_near_singular_integrands():
    """Both quadratures of :func:`laplace`: with b = 1/2 (tanh-sinh: u^b is an end-point
    singularity), the Borel-Le Roy transform of sum (-1)^n n! x^n, B(t) = 2F1(1, 1; 3/2; -t) /
    Gamma(3/2), must give the same Borel sum e^{1/x} E_1(1/x)/x (Bender and Orszag 1978, sec.
    8.2; mpmath hyp2f1 and e1); and an integrand with poles 10^-3 off the real ray (where the
    Gauss-Legendre panels cannot meet the digits asked and tanh-sinh takes over) must still be
    inside its error estimate against mpmath.quad split at the near-pole (common practice, no
    source)."""
    with workdps(60):
        X = mpmath.mpf("0.5")
        ref = mpmath.e ** (1 / X) * mpmath.e1(1 / X) / X
        B = lambda t: mpmath.hyp2f1(1, 1, mpmath.mpf(3) / 2, -t) / mpmath.gamma(mpmath.mpf(3) / 2)  # noqa: E731
        v, err = laplace(B, X, mpmath.mpf(1) / 2, 30)
        assert abs(v - ref) <= err and abs(v - ref) < abs(ref) * mpmath.mpf(10) ** -30
        eps = mpmath.mpf("1e-3")
        F = lambda t: 1 / ((t - 1) ** 2 + eps ** 2)  # noqa: E731
        v, err = laplace(F, mpmath.mpf(1), 0, 20)
        ref = mpmath.quad(lambda u: mpmath.exp(-u) * F(u), [0, 1 - 10 * eps, 1, 1 + 10 * eps, 10, mpmath.inf])
        assert abs(v - ref) <= err and abs(v - ref) < abs(ref) * mpmath.mpf(10) ** -15


@pytest.mark.parametrize("s", [mpmath.mpc("0.5", "0.8660254037844386467637231707529"), mpmath.mpc(-1, 2)])
def test_pair_map_geometry(s):
    # w(x) maps the plane cut along Re x = Re s (|Im x| >= Im s) onto the unit disk; checked
    # against its own inverse, and its Taylor series against mpmath's numerical derivatives
    # of x(w) (mpmath.taylor; common practice, no source)
    with workdps(30):
        m = PairMap(s)
        assert m.w_of_x(0) == 0 and abs(m.rim_point() - 1) < 1e-25       # x = infinity -> w = 1
        for x in [mpmath.mpf("0.3"), mpmath.mpf(7), mpmath.mpf(-4), mpmath.mpc(1, "0.5")]:
            w = m.w_of_x(x)
            assert abs(w) < 1 and abs(m.x_of_w(w) - x) < mpmath.mpf(10) ** -25
        for b in m.branch_points():                                       # the pair sits on the rim
            assert abs(abs(m.w_of_x(b + mpmath.mpf(10) ** -20 * (b - s.real))) - 1) < 1e-9
        assert isinstance(m.w_of_x(mpmath.mpf(2)), mpmath.mpf)           # real points stay real
        ser = m.x_series(8, 30)
        ref = mpmath.taylor(lambda w: m.x_of_w(w), 0, 7)
        assert all(abs(a - b) < mpmath.mpf(10) ** -15 for a, b in zip(ser, ref))


@pytest.mark.parametrize("s", [mpmath.mpc("0.5", "0.8660254037844386467637231707529"), mpmath.mpc(-3, 1),
                               mpmath.mpc(0, 2)])
def test_star_map_geometry(s):
    # x(w) = w / (C (1-w)^a (1+w)^(2-a)), a = 2 arg(s)/pi, maps the unit disk onto the plane cut
    # radially from s and conj(s) (a Schwarz-Christoffel map of a V-shaped slit, common practice,
    # no source). Checked: the slit tips exp(+-i beta), cos beta = 1 - a, land on the pair; a
    # point just off a radial cut lands on the rim; x(w(x)) = x; real points stay real; the
    # Taylor series against mpmath's numerical derivatives (mpmath.taylor)
    with workdps(30):
        m = StarMap(s)
        a = m.large_x_exponent()
        tip = m.x_of_w(mpmath.expj(mpmath.acos(1 - a)))
        assert abs(tip - s) < mpmath.mpf(10) ** -25 or abs(tip - mpmath.conj(s)) < mpmath.mpf(10) ** -25
        for x in [mpmath.mpf("0.3"), mpmath.mpf(7), mpmath.mpf(-4), mpmath.mpc(1, "0.5"), 3 * s + 1e-3]:
            w = m.w_of_x(x)
            assert abs(w) < 1 and abs(m.x_of_w(w) - x) < mpmath.mpf(10) ** -25 * abs(x)
        assert m.on_cut(2 * s) and m.on_cut(5 * mpmath.conj(s)) and not m.on_cut(s / 2)
        assert 1 - abs(m.w_of_x(2 * s * (1 + mpmath.mpc(0, 1) * mpmath.mpf(10) ** -6))) < 1e-2
        assert isinstance(m.w_of_x(mpmath.mpf(2)), mpmath.mpf)
        ser = m.x_series(8, 30)
        ref = mpmath.taylor(lambda w: m.x_of_w(w), 0, 7)
        assert all(abs(A - B) < mpmath.mpf(10) ** -15 for A, B in zip(ser, ref))
        assert all(isinstance(v, mpmath.mpf) for v in ser)


@pytest.mark.parametrize("x0, alpha", [(Fraction(-1, 3), None), (Fraction(-2), Fraction(1, 2)),
                                       ((-1, 1), None), (Fraction(-1, 3), Fraction(-1, 4))])
def test_ray_integrand_matches_mpmath_composition(x0, alpha):
    # the Borel sums' fused FLINT integrand r(w(t)) / (1 - w/rim)^alpha against the same
    # composition in plain mpmath (map formula w = sign (s - 1)/(s + 1), s = sqrt(1 - t/x0),
    # Horner sums; mpmath as the general-purpose reference), real and complex t
    from resum.estimators.resum_band import Rational
    from resum.estimators.resum_borel import _ray_integrand
    with workdps(50):
        x0 = mpmath.mpc(*x0) if isinstance(x0, tuple) else mpmath.mpf(x0.numerator) / x0.denominator
        al = None if alpha is None else mpmath.mpf(alpha.numerator) / alpha.denominator
        p = [mpmath.mpf(1) / (k + 2) for k in range(6)]
        q = [mpmath.mpf(1)] + [mpmath.mpf((-1) ** k) / (k + 3) ** 2 for k in range(1, 7)]
        r = Rational(tuple(p), tuple(q), 5, 6)
        m = RayMap(x0)
        F = _ray_integrand(r, m, al, m.rim_point())
        for t in [mpmath.mpf("0.01"), mpmath.mpf(1), mpmath.mpf(37), mpmath.mpc(2, 1), mpmath.mpc(5, -3)]:
            w = m.w_of_x(t)
            ref = mpmath.polyval(p[::-1], w) / mpmath.polyval(q[::-1], w)
            if al is not None:
                ref /= (1 - w / m.rim_point()) ** al
            got = F(t)
            assert abs(got - ref) <= abs(ref) * mpmath.mpf(10) ** -45
            # a real integrand stays real (the Laplace sum of a real series is real)
            assert isinstance(got, mpmath.mpc) == isinstance(ref, mpmath.mpc)


def test_path_prefilter_keeps_every_near_segment():
    # the double-precision prefilter of the Borel path check must keep every segment that the
    # exact distance (mpmath, point to segment: common practice, no source) finds within tol,
    # including poles just off a ray sampled at powers of two, as the Borel sums sample it
    import random
    from resum.estimators.resum_borel import _near_segments, _seg_dist
    rng = random.Random(5)
    with workdps(40):
        for _ in range(200):
            th = mpmath.mpf(rng.uniform(-0.5, 0.5))
            e = mpmath.expj(th)
            path = [mpmath.mpf(0)] + [e * mpmath.mpf(2) ** k for k in range(-6, 8)]
            p = e * mpmath.mpf(rng.uniform(0, 100)) + mpmath.mpc(0, rng.uniform(-1, 1)) * 10 ** rng.randint(-30, 0)
            tol = mpmath.mpf("0.002") * abs(p)
            exact = [k for k in range(len(path) - 1) if _seg_dist(p, path[k], path[k + 1]) < tol]
            assert set(exact) <= set(_near_segments(p, path, tol))


def test_pair_and_real_point_on_one_circle_take_the_pair_map():
    # (1 - x + x^2)^(-1/2) + (1 + x)^(3/2): a pair at exp(+-i pi/3) and a real point at -1, all
    # on |x| = 1 (closed form, common practice, no source). The order of the three came from
    # rounding: a ray map from -1 left the pair to the approximants, and at x = 3 + 3i the value
    # (band 0.036) was the other branch of the pair's root, 0.5 away from the truth.
    from resum import Context, Series
    from resum.resummation import evaluate
    from tests.known_series import binomial_series, quadratic_series
    s0 = mpmath.exp(1j * mpmath.pi / 3)
    m = choose_map([-1 + mpmath.mpf(10) ** -11, s0, mpmath.conj(s0)])
    assert isinstance(m, PairMap)
    n = 80
    a = quadratic_series(Fraction(-1, 2), Fraction(-1), Fraction(1), n)
    b = binomial_series(Fraction(3, 2), n).coefficients
    with mpmath.workdps(50):
        c = [mpmath.mpf(u.numerator) / u.denominator for u in (p + q for p, q in zip(a, b))]
    res = evaluate(Series(c, digits=50), ["3+3*I"], Context(dps=30))
    p = res.points[0]
    with mpmath.workdps(50):
        x = mpmath.mpc(3, 3)
        truth = ((1 - x / s0) ** mpmath.mpf(-0.5) * (1 - x / mpmath.conj(s0)) ** mpmath.mpf(-0.5)
                 + (1 + x) ** mpmath.mpf(1.5))
        assert p.value.contains(truth.real) and p.imag.contains(truth.imag)
    assert p.success and p.value.digits() > 8
