"""Tests of the angle-deformed BES kernel family (resum.sources.bes)."""
from fractions import Fraction

import mpmath
import pytest

from resum.context import Context, workdps
from resum.errors import InputError
from resum.sources import bes


def _cusp_reference(dps):
    """Cusp anomalous dimension F = f/2 through five loops.

    Beisert, Eden, Staudacher, J. Stat. Mech. (2007) P01021, hep-th/0610251:
    f(g) = 8 g^2 - 8/3 pi^2 g^4 + 88/45 pi^4 g^6 - 16 (73/630 pi^6 + 4 zeta(3)^2) g^8 + ...
    (four loops as quoted there); the five-loop term
    32 (887/14175 pi^8 + 4/3 pi^2 zeta(3)^2 + 40 zeta(3) zeta(5)) g^10 is from memory.
    """
    with workdps(dps):
        pi, z3, z5 = mpmath.pi, mpmath.zeta(3), mpmath.zeta(5)
        f = [8, -mpmath.mpf(8) / 3 * pi ** 2, mpmath.mpf(88) / 45 * pi ** 4,
             -16 * (mpmath.mpf(73) / 630 * pi ** 6 + 4 * z3 ** 2),
             32 * (mpmath.mpf(887) / 14175 * pi ** 8 + mpmath.mpf(4) / 3 * pi ** 2 * z3 ** 2
                   + 40 * z3 * z5)]
        return [x / 2 for x in f]


def _logcosh_coefficients(loops, dps):
    """Coefficients of (2/pi^2) log cosh(2 pi g) in x = g^2 from the Bernoulli expansion
    log cosh y = sum_n 2^(2n) (2^(2n) - 1) B_(2n) y^(2n) / (2n (2n)!)
    (integrated tanh series, DLMF 4.33.3; from memory)."""
    with workdps(dps):
        out = [mpmath.mpf(0)]
        for n in range(1, loops + 1):
            c = (mpmath.mpf(2) ** (2 * n) * (mpmath.mpf(2) ** (2 * n) - 1) * mpmath.bernoulli(2 * n)
                 / (2 * n * mpmath.factorial(2 * n)))
            out.append(2 / mpmath.pi ** 2 * c * (2 * mpmath.pi) ** (2 * n))
        return out


def _zero_angle_exact(g, dps):
    # F_0(g) = (2/pi^2) log cosh(2 pi g): Belitsky and Korchemsky, "Exact null octagon",
    # arXiv:1907.13131 (closed form of the null-octagon anomalous dimension); the
    # normalisation of F_0 is from memory and is pinned at order g^4 by K_11 = pi^2 g^2/3.
    with workdps(dps):
        g = mpmath.mpf(g)
        return 2 / mpmath.pi ** 2 * mpmath.log(mpmath.cosh(2 * mpmath.pi * g))


def test_cusp_coefficients_50_digits():
    ctx = Context(dps=50)
    cs = bes.weak_coupling_coefficients("pi/4", 5, ctx)
    ref = _cusp_reference(70)
    with workdps(70):
        for c, r in zip(cs[1:], ref):
            assert c.contains(r)                       # honest: reference inside the ball
            assert abs(c.value - r) <= abs(r) * mpmath.mpf(10) ** -50
            assert c.error <= abs(r) * mpmath.mpf(10) ** -52   # sharp


def test_exact_cusp_coefficients():
    # the same BES values, exactly (hep-th/0610251; five loops from memory, see above)
    cs = bes.exact_weak_coefficients(5, cos2=Fraction(1, 2))
    assert cs[1].expression() == "4"
    assert cs[2].expression() == "-4/3*pi^2"
    assert cs[3].expression() == "44/45*pi^4"
    assert cs[4].expression() == "-292/315*pi^6 - 32*zeta(3)^2"     # = -8 (73/630 pi^6 + 4 zeta3^2)
    assert cs[5].expression() == "14192/14175*pi^8 + 64/3*pi^2*zeta(3)^2 + 640*zeta(3)*zeta(5)"


def test_zero_angle_equals_logcosh_100_loops_100_digits():
    ctx = Context(dps=100)
    cs = bes.weak_coupling_coefficients(0, 100, ctx)
    ref = _logcosh_coefficients(100, 130)
    with workdps(130):
        for k in range(1, 101):
            assert abs(cs[k].value - ref[k]) <= abs(ref[k]) * mpmath.mpf(10) ** -100, k
            # honest: the ball holds the reference (up to the reference's own rounding)
            assert abs(cs[k].value - ref[k]) <= cs[k].error + abs(ref[k]) * mpmath.mpf(10) ** -125, k


def test_zero_angle_exact_rationals_times_pi_powers():
    # a = 0: c_l = r_l pi^(2l-2) with r_l from the Bernoulli expansion above (exact)
    cs = bes.exact_weak_coefficients(30, cos2=1)
    for n in range(1, 31):
        from flint import fmpq
        B = fmpq.bernoulli(2 * n)
        B = Fraction(int(B.p), int(B.q))
        # (2/pi^2) * coef(y^(2n)) * (2 pi)^(2n) = r_n pi^(2n-2)
        r = 2 * Fraction(2 ** (2 * n) * (2 ** (2 * n) - 1)) * B * 2 ** (2 * n) / (2 * n * _fact(2 * n))
        terms = cs[n].terms()
        assert len(terms) == 1
        coef, mon = terms[0]
        assert coef == r
        assert mon == ({"pi2": n - 1} if n > 1 else {})


def _fact(n):
    import math
    return math.factorial(n)


def test_exact_symbolic_angle_matches_numeric():
    # the symbolic form in c = cos(a)^2 evaluated at a = 0.7 equals the numeric balls
    # (two independent evaluations inside this module: exact polynomials vs arb recursion)
    ctx = Context(dps=40)
    ex = bes.exact_weak_coefficients(8)
    num = bes.weak_coupling_coefficients("0.7", 8, ctx)
    with workdps(60):
        c2 = mpmath.cos(mpmath.mpf("0.7")) ** 2
        for k in range(1, 9):
            v = ex[k].evaluate(Context(dps=50), cos2=c2)
            assert abs(v - num[k].value) <= abs(v) * mpmath.mpf(10) ** -38


@pytest.mark.parametrize("g", ["0.1", "0.5", "1", "5", "20"])
def test_finite_coupling_zero_angle_closed_form(g):
    r = bes.finite_coupling(g, 0, Context(dps=15))
    assert r.success, r.message
    ref = _zero_angle_exact(g, 40)
    with workdps(40):
        assert abs(r.value.value - ref) <= abs(ref) * mpmath.mpf(10) ** -15
        assert r.value.contains(ref)


@pytest.mark.slow
def test_cusp_strong_coupling_remainder():
    # Strong coupling: F = 2g - 3 ln2/(2 pi) - K/(8 pi^2 g) + O(1/g^2), K Catalan
    # (Frolov-Tseytlin hep-th/0204226; Roiban-Tseytlin arXiv:0709.0681).
    # The remainder must fall like 1/g^2: from g = 10 to g = 20 it shrinks about 4 times,
    # and at g = 20 it is small against the 1/g term it follows.
    rem = {}
    for g in (10, 20):
        r = bes.finite_coupling(g, "pi/4", Context(dps=15))
        assert r.success, r.message
        with workdps(30):
            rem[g] = r.value.value - bes.cusp_strong_coupling(g, Context(dps=30))
            assert r.value.error < abs(rem[g]) / 100
    with workdps(30):
        ratio = rem[10] / rem[20]
        assert 3 < ratio < 5, ratio
        catalan_term = mpmath.catalan / (8 * mpmath.pi ** 2 * 20)
        assert abs(rem[20]) < catalan_term / 20


def test_weak_series_summed_inside_radius_equals_finite_coupling():
    # |g| = 0.1 < 1/4: the weak series converges; both must agree to 20 digits
    for angle in ("pi/4", "0.7"):
        cs = bes.weak_coupling_coefficients(angle, 60, Context(dps=30))
        r = bes.finite_coupling("0.1", angle, Context(dps=22))
        assert r.success, r.message
        with workdps(40):
            x = mpmath.mpf("0.1") ** 2
            s = mpmath.fsum(c.value * x ** k for k, c in enumerate(cs))
            assert abs(s - r.value.value) <= abs(s) * mpmath.mpf(10) ** -20
            assert r.value.contains(s)


def test_complex_coupling_matches_series():
    # complex g inside the disk: the summed series is the analytic continuation
    g = mpmath.mpc("0.08", "0.05")
    cs = bes.weak_coupling_coefficients("pi/4", 60, Context(dps=25))
    r = bes.finite_coupling(g, "pi/4", Context(dps=18))
    assert r.success, r.message
    with workdps(40):
        s = mpmath.fsum(c.value * (g * g) ** k for k, c in enumerate(cs))
        assert abs(s - mpmath.mpc(r.value.value, r.imag.value)) <= abs(s) * mpmath.mpf(10) ** -17


def test_series_object_and_provenance():
    s = bes.weak_coupling_series("pi/3", 12, Context(dps=25), exact=True)
    assert s.coefficients[0] == 0 and s.n_terms == 13
    assert s.coupling.symbol == "g" and s.coupling.power == 2
    assert s.digits == 25
    assert s.provenance["loops"] == 12
    from resum.series.expr import evaluate_expression
    with workdps(40):
        # cos(pi/3)^2 = 1/4: the stored exact expressions evaluate to the numeric coefficients
        assert s.provenance["exact_cos2"] == "1/4"
        for k in (2, 5, 12):
            v = evaluate_expression(s.provenance["exact_coefficients"][k], dps=40).value
            assert abs(v - s.coefficients[k]) <= abs(v) * mpmath.mpf(10) ** -24


def test_bad_input():
    with pytest.raises(InputError, match="loops"):
        bes.weak_coupling_coefficients("pi/4", 0)
    with pytest.raises(InputError, match="angle"):
        bes.weak_coupling_coefficients("pie/4", 3)
    with pytest.raises(InputError, match="Im g"):
        bes.finite_coupling(mpmath.mpc(1, 0.3), 0)
    with pytest.raises(InputError, match="loops"):
        bes.exact_weak_coefficients(bes.exact_loop_limit() + 1)


def test_failure_is_reported_not_silent():
    # too small a matrix for the digits asked: success False with a reason
    r = bes.finite_coupling(5, "pi/4", Context(dps=20), max_size=30)
    assert not r.success
    assert "could not reach" in r.message


def test_bessel_table_against_mpmath():
    # the recurrences behind the quadrature (forward for z >= N, Miller below) against
    # mpmath.besselj at nodes on both sides of the turning point z = N
    from resum.sources._arb import arb_from_mpf, arb_to_mpf, flint_prec
    N, bits = 60, 120
    with workdps(45):
        zs_m = [mpmath.mpf(x) for x in ("0.002", "7.5", "59.9", "60", "61.3", "800.25")]
    with flint_prec(bits):
        zs = [arb_from_mpf(z) for z in zs_m]
    J = bes._bessel_table(N, zs, bits, False)
    with workdps(45):
        for m, z in enumerate(zs_m):
            for n in (1, 2, 30, 59, 60):
                ref = mpmath.besselj(n, z)
                assert abs(arb_to_mpf(J[n - 1, m]) - ref) <= abs(ref) * mpmath.mpf(10) ** -30, (z, n)


def test_right_angle_is_free():
    # a = pi/2: K(a) = 0 by the definition (cos a = 0), so F = 4 g^2 exactly (no source needed)
    cs = bes.weak_coupling_coefficients("pi/2", 6, Context(dps=30))
    assert cs[1].value == 4 and all(c.value == 0 for c in cs[2:])
    r = bes.finite_coupling(3, "pi/2", Context(dps=20))
    assert r.success and r.value.contains(36) and r.value.error < 1e-19


def test_finite_coupling_result_json_round_trip():
    import json
    r = bes.finite_coupling(1, "pi/4", Context(dps=35))
    back = bes.FiniteCouplingResult.from_dict(json.loads(json.dumps(r.to_dict())))
    assert back.success and back.size == r.size and back.status == r.status
    with workdps(50):
        assert abs(back.value.value - r.value.value) <= r.value.error / 100
        assert abs(back.value.error - r.value.error) <= r.value.error / 100


def test_kernel_integrals_against_mpmath_quad():
    # the quadrature of int_0^oo dt/t J_i(2gt) J_j(2gt)/(e^t - 1) (fixed-point path for real g)
    # against mpmath.quad with mpmath.besselj
    g = mpmath.mpf(3)
    panels = bes._panel_nodes(12.0, 30, 75.0, 1.0, 0)
    I, Q = bes._kernel_matrix(g, 5, panels, 150, 40)
    from resum.sources._arb import arb_to_mpf
    with workdps(30):
        for i, j in ((1, 4), (5, 5)):
            f = lambda t: mpmath.besselj(i, 2 * g * t) * mpmath.besselj(j, 2 * g * t) / (t * mpmath.expm1(t))
            ref = mpmath.quad(f, mpmath.linspace(0, 72, 37))
            assert abs(arb_to_mpf(I[i - 1, j - 1]) - ref) < mpmath.mpf(10) ** -25, (i, j)
