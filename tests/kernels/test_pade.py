"""Padé kernels against outside references.

References used below
- closed form of the [L/M] Padé approximant of exp(x): G. A. Baker, Jr. and
  P. Graves-Morris, "Padé Approximants", 2nd ed., CUP (1996), sec. 1.2
  (from memory; checked here against mpmath.pade as well);
- mpmath.pade (general-purpose reference library, dense LU solve);
- scipy.interpolate.pade (double precision reference);
- degree reduction for rational functions: P. Gonnet, S. Güttel and
  L. N. Trefethen, SIAM Review 55 (2013) 101-117, sec. 2-3 (the [L/M] of a
  rational function of exact type [l/m], l <= L, m <= M, M - m <= L - l, is
  that function itself).
"""
import math
import random
from fractions import Fraction

import mpmath
import pytest

from resum._kernels.pade import (PadeApprox, guard_digits_for_pade, pade, pade_fp,
                                 pade_table)
from resum.context import workdps


def exp_pade_closed_form(L, M):
    # Baker & Graves-Morris (1996) sec. 1.2, from memory
    n = L + M
    p = [Fraction(math.factorial(n - j) * math.factorial(L),
                  math.factorial(n) * math.factorial(j) * math.factorial(L - j))
         for j in range(L + 1)]
    q = [Fraction((-1) ** j * math.factorial(n - j) * math.factorial(M),
                  math.factorial(n) * math.factorial(j) * math.factorial(M - j))
         for j in range(M + 1)]
    return p, q


def mpf_to_fraction(x):
    sign, man, exp, _ = x._mpf_
    m = -int(man) if sign else int(man)
    return Fraction(m * 2 ** exp) if exp >= 0 else Fraction(m, 2 ** -exp)


def frac_to_mp(x):
    return mpmath.mpf(x.numerator) / x.denominator


def digits_agree(a, b):
    """Normwise agreeing digits of two coefficient lists (b is the reference)."""
    n = max(len(a), len(b))
    a = list(a) + [0] * (n - len(a))
    b = list(b) + [0] * (n - len(b))
    a = [frac_to_mp(x) if isinstance(x, Fraction) else mpmath.mpmathify(x) for x in a]
    b = [frac_to_mp(x) if isinstance(x, Fraction) else mpmath.mpmathify(x) for x in b]
    ref = max(abs(x) for x in b)
    err = max(abs(x - y) for x, y in zip(a, b))
    return mpmath.inf if err == 0 else mpmath.log10(ref / err)


@pytest.mark.parametrize("L,M", [(0, 3), (2, 2), (3, 5), (7, 4), (10, 10)])
def test_exp_exact_matches_closed_form(L, M):
    c = [Fraction(1, math.factorial(k)) for k in range(L + M + 1)]
    r = pade(c, L, M, dps=30)
    p, q = exp_pade_closed_form(L, M)
    assert isinstance(r, PadeApprox) and r.exact and r.method == "exact"
    assert list(r.p) == p and list(r.q) == q
    assert (r.L, r.M, r.defect) == (L, M, 0)


@pytest.mark.parametrize("L,M,dps", [(4, 4, 30), (12, 10, 50), (20, 20, 60), (6, 9, 40)])
def test_exp_inexact_matches_closed_form(L, M, dps):
    # input carries dps+60 digits; the request is dps digits in p and q
    with workdps(dps + 60):
        c = [1 / mpmath.factorial(k) for k in range(L + M + 1)]
    r = pade(c, L, M, dps=dps)
    assert r.method == "fraction" and r.digits >= dps
    p, q = exp_pade_closed_form(L, M)
    with workdps(dps + 80):
        assert digits_agree(r.p, p) >= dps - 1
        assert digits_agree(r.q, q) >= dps - 1


def test_claimed_digits_are_earned_on_log_series():
    # -log(1-x)/x = sum x^k/(k+1); the reference is the exact Padé of the
    # rounded (dyadic) input, computed in rational arithmetic
    N, dps = 30, 40
    with workdps(80):
        cm = [mpmath.mpf(1) / (k + 1) for k in range(2 * N + 1)]
    exact_in = [mpf_to_fraction(x) for x in cm]
    ref = pade(exact_in, N, N, dps)
    r = pade(cm, N, N, dps)
    with workdps(400):
        got = min(digits_agree(r.p, ref.p), digits_agree(r.q, ref.q))
    assert r.digits >= dps
    assert got >= r.digits - 2      # ball bound is rigorous up to rounding of the report


@pytest.mark.parametrize("seed", [1, 2, 3])
def test_random_series_agrees_with_mpmath_pade(seed):
    rng = random.Random(seed)
    L, M, dps = 8, 7, 40
    with workdps(dps + 60):
        c = [mpmath.mpf(rng.uniform(-1, 1)) for _ in range(L + M + 1)]
        p_ref, q_ref = mpmath.pade(c, L, M)    # at dps+60 digits: far more accurate than needed
    r = pade(c, L, M, dps=dps)
    with workdps(dps + 60):
        assert digits_agree(r.q, q_ref) >= dps - 2
        assert digits_agree(r.p, p_ref) >= dps - 2


def test_complex_series_agrees_with_mpmath_pade():
    rng = random.Random(7)
    L, M, dps = 6, 6, 30
    with workdps(dps + 60):
        c = [mpmath.mpc(rng.uniform(-1, 1), rng.uniform(-1, 1)) for _ in range(L + M + 1)]
        p_ref, q_ref = mpmath.pade(c, L, M)
    r = pade(c, L, M, dps=dps)
    with workdps(dps + 60):
        assert digits_agree(r.q, q_ref) >= dps - 2
        assert digits_agree(r.p, p_ref) >= dps - 2


def rational_series(num, den, n):
    """Taylor coefficients of num/den (exact), den[0] != 0."""
    out = []
    for k in range(n):
        s = Fraction(num[k]) if k < len(num) else Fraction(0)
        for j in range(1, min(k, len(den) - 1) + 1):
            s -= den[j] * out[k - j]
        out.append(s / den[0])
    return out


def test_robust_reduction_exact_rational():
    # (1 + 2x) / (1 - x/3 + x^2/5): type [1/2]; ask for [5/5] (GGT 2013)
    num, den = [1, 2], [1, Fraction(-1, 3), Fraction(1, 5)]
    c = rational_series(num, den, 11)
    r = pade(c, 5, 5, dps=30)
    assert (r.L, r.M) == (1, 2) and r.defect == 3
    assert list(r.p) == [1, 2] and list(r.q) == den


def test_robust_reduction_inexact_rational():
    num, den = [1, 2], [1, Fraction(-1, 3), Fraction(1, 5)]
    c = rational_series(num, den, 13)
    with workdps(60):
        cm = [frac_to_mp(x) for x in c]
    r = pade(cm, 6, 6, dps=40, input_digits=55)
    assert (r.L, r.M) == (1, 2)
    with workdps(60):
        assert digits_agree(r.q, den) >= 40
        assert digits_agree(r.p, num) >= 40


def test_svd_construction_reduces_degree():
    num, den = [1, 2], [1, Fraction(-1, 3), Fraction(1, 5)]
    c = rational_series(num, den, 9)
    with workdps(50):
        cm = [frac_to_mp(x) for x in c]
    r = pade(cm, 4, 4, dps=30, input_digits=45, method="svd")
    assert r.method == "svd" and (r.L, r.M) == (1, 2)
    with workdps(50):
        assert digits_agree(r.q, den) >= 30


def test_even_series_block_structure():
    # cos x = sum (-1)^k x^(2k)/(2k)!: every other coefficient vanishes, so the
    # table has 2x2 blocks; [5/4] equals [4/4] (Baker & Graves-Morris ch. 2)
    with workdps(80):
        c = [mpmath.mpf(0) if k % 2 else (-1) ** (k // 2) / mpmath.factorial(k)
             for k in range(12)]
        p_ref, q_ref = mpmath.pade(c[:9], 4, 4)
    r = pade(c, 5, 4, dps=40)
    with workdps(80):
        assert digits_agree(r.q, q_ref) >= 40
        assert digits_agree(r.p, p_ref) >= 40
    assert r.L == 4 and r.M == 4


def test_evaluation_poles_residues_geometric():
    # 1/((1-x)(1-x/2)) has simple poles at 1 and 2 with residues 2 and -2
    # (partial fractions: 2/(1-x) - 1/(1-x/2); residue of 1/(1-x/2) at 2 is -2)
    c = [2 - Fraction(1, 2 ** k) for k in range(6)]
    with workdps(50):
        cm = [frac_to_mp(x) for x in c]
    r = pade(cm, 2, 2, dps=30)
    assert r.M == 2 and r.L == 0
    poles = sorted(r.poles(), key=lambda t: abs(t[0]))
    assert abs(poles[0][0] - 1) < mpmath.mpf(10) ** -28
    assert abs(poles[1][0] - 2) < mpmath.mpf(10) ** -28
    res = sorted(r.residues(), key=lambda t: abs(t[0]))
    assert abs(res[0][1] - (-2)) < mpmath.mpf(10) ** -28      # d/dx of 2/(1-x): res -2
    assert abs(res[1][1] - 2) < mpmath.mpf(10) ** -28
    with workdps(40):
        v = r(mpmath.mpf("0.5"))
        assert abs(v - 1 / (mpmath.mpf("0.5") * mpmath.mpf("0.75"))) < mpmath.mpf(10) ** -28


def test_table_matches_single_approximants():
    with workdps(80):
        c = [mpmath.mpf((-1) ** k) / (k + 1) ** 2 * (k + 3) for k in range(25)]
    t = pade_table(c, dps=30, offsets=(-2, -1, 0, 1, 2), min_order=10)
    keys = list(t)
    assert keys[0][0] + keys[0][1] == 24
    assert all(sum(a) >= sum(b) for a, b in zip(keys, keys[1:]))     # highest first
    assert all(k[0] + k[1] >= 10 and abs(k[0] - k[1]) <= 2 for k in keys)
    exact = [Fraction((-1) ** k * (k + 3), (k + 1) ** 2) for k in range(25)]
    for (L, M), r in t.items():
        ref = pade(exact, L, M, dps=30)
        with workdps(120):
            assert digits_agree(r.q, ref.q) >= 28, (L, M)
            assert digits_agree(r.p, ref.p) >= 28, (L, M)


def test_fp_agrees_with_scipy():
    scipy_interpolate = pytest.importorskip("scipy.interpolate")
    c = [1.0 / math.factorial(k) for k in range(9)]
    p_s, q_s = scipy_interpolate.pade(c, 4, 4)      # scipy returns poly1d high->low, q(0)=1
    r = pade_fp(c, 4, 4)
    assert max(abs(a - b) for a, b in zip(r.q, list(q_s.coeffs[::-1]))) < 1e-12
    assert max(abs(a - b) for a, b in zip(r.p, list(p_s.coeffs[::-1]))) < 1e-12


def test_guard_plan_and_errors():
    assert guard_digits_for_pade(201, 300) > guard_digits_for_pade(101, 300)
    with pytest.raises(ValueError, match="needs 7 coefficients"):
        pade([1, 2, 3], 3, 3, dps=20)
    with pytest.raises(ValueError, match="unknown method"):
        pade([1, 2, 3], 1, 1, dps=20, method="magic")


def test_zero_approximant_when_leading_terms_vanish():
    r = pade([0, 0, 0, 1, 1, 1], 2, 3, dps=20)
    assert r.p == (0,) and r.q == (1,)


@pytest.mark.parametrize("N,din", [(10, 40), (20, 40)])
def test_input_digits_estimate_is_honest_and_sharp(N, din):
    # input rounded to din digits; the truth is the exact Padé of the exact series,
    # so the true error is the input's own error propagated through the problem
    exact = pade([Fraction((-1) ** k, k + 1) for k in range(2 * N + 1)], N, N, 30)
    with workdps(din):
        c = [mpmath.mpf((-1) ** k) / (k + 1) for k in range(2 * N + 1)]
    r = pade(c, N, N, 30, input_digits=din)
    with workdps(300):
        true = digits_agree(r.q, exact.q)
    assert r.digits <= true + 0.5          # honest
    assert r.digits >= true - 4            # sharp


def test_odd_series_table_matches_exact_blocks():
    # sin x: c_0 = 0 and every other coefficient vanishes (2x2 blocks, Baker and
    # Graves-Morris ch. 2); mpmath.pade fails on these singular blocks, so the
    # reference is the exact rational construction on the exact coefficients
    se = [Fraction(0) if k % 2 == 0 else Fraction((-1) ** (k // 2), math.factorial(k))
          for k in range(17)]
    with workdps(60):
        s = [frac_to_mp(x) for x in se]
    t = pade_table(s, 30, min_order=8)
    for (L, M), r in t.items():
        e = pade(se, L, M, 30)
        assert (r.L, r.M) == (e.L, e.M), (L, M)
        with workdps(80):
            assert digits_agree(r.q, e.q) >= 30 and digits_agree(r.p, e.p) >= 30


def test_complex_table_against_mpmath():
    with workdps(60):
        z = [mpmath.mpc(1, 1) ** k / (k + 1) for k in range(17)]
    t = pade_table(z, 30, min_order=14)
    for (L, M), r in t.items():
        with workdps(60):
            p_ref, q_ref = mpmath.pade(z[:L + M + 1], L, M)
            assert digits_agree(r.q, q_ref) >= 30, (L, M)
            assert digits_agree(r.p, p_ref) >= 30, (L, M)


def test_block_in_recursion_falls_back_to_ball_lu():
    # c_1 = 0 makes the very first step of the continued fraction singular while the
    # Toeplitz systems stay regular; reference: mpmath.pade (dense LU) at high precision
    with workdps(80):
        c = [mpmath.mpf(1), mpmath.mpf(0)] + [mpmath.mpf(1) / (k + 1) for k in range(2, 13)]
        p_ref, q_ref = mpmath.pade(c, 6, 6)
    r = pade(c, 6, 6, dps=40)
    assert r.method == "lu" and r.digits >= 40
    with workdps(80):
        assert digits_agree(r.q, q_ref) >= 40 and digits_agree(r.p, p_ref) >= 40
    t = pade_table(c, dps=30, offsets=(0,), min_order=10)
    assert {a.method for a in t.values()} == {"lu"}


def _test_series(kind, n, dps, seed):
    """n coefficients at dps digits: log(1+x)/x or exp(x) (closed forms), or
    seeded random numbers in [-1, 1]."""
    rng = random.Random(seed)
    with workdps(dps):
        if kind == "log":
            return [mpmath.mpf((-1) ** k) / (k + 1) for k in range(n)]
        if kind == "exp":
            return [1 / mpmath.factorial(k) for k in range(n)]
        return [mpmath.mpf(rng.uniform(-1, 1)) for _ in range(n)]


def _mpmath_reference(c, N, dps, extra):
    """[N/N] by mpmath.pade (dense LU) at dps + extra digits, checked against a
    second run at dps + extra + 40: returns (p, q, digits the two agree to)."""
    with workdps(dps + extra):
        p1, q1 = mpmath.pade(c, N, N)
    with workdps(dps + extra + 40):
        p2, q2 = mpmath.pade(c, N, N)
        agree = min(digits_agree(p1, p2), digits_agree(q1, q2))
    return p2, q2, agree


@pytest.mark.parametrize("kind,N,dps", [("log", 20, 30), ("log", 24, 60), ("random", 20, 40),
                                        ("exp", 22, 50)])
def test_scheduled_recursion_claims_no_more_than_mpmath_confirms(kind, N, dps):
    # N large enough that the recursion's precision schedule is active (the
    # working precision falls from the plan to dps + _FINAL_MARGIN over the
    # steps). Reference: mpmath.pade (dense LU) at many more digits, itself
    # confirmed by a run at 40 more digits. Series: log(1+x)/x and exp(x)
    # (closed-form coefficients), and seeded random coefficients in [-1, 1].
    from resum._kernels import flint_bridge as fb
    from resum._kernels.pade import _FINAL_MARGIN
    c = _test_series(kind, 2 * N + 1, dps + 20, seed=11)
    r = pade(c, N, N, dps)
    assert r.method == "fraction"
    assert r.diagnostics["prec_bits"] > fb.prec_for_dps(dps + _FINAL_MARGIN)   # schedule active
    p_ref, q_ref, agree = _mpmath_reference(c, N, dps, 3 * N + 60)
    assert agree >= r.digits + 5          # the reference resolves the claim
    with workdps(dps + 3 * N + 100):
        got = min(digits_agree(r.p, p_ref), digits_agree(r.q, q_ref))
    assert r.digits >= dps
    assert got >= r.digits - 2            # claimed <= measured (up to the report's rounding)


@pytest.mark.parametrize("kind,N,dps", [("log", 12, 30), ("log", 24, 60), ("exp", 16, 40),
                                        ("random", 14, 40)])
def test_rerun_check_claims_no_more_than_mpmath_confirms(kind, N, dps):
    # check='rerun' (MPFR recursion run at two precisions) against mpmath.pade
    # (dense LU) at 3N + 60 more digits, itself confirmed by a run at 40 more.
    # Series: log(1+x)/x and exp(x) (closed-form coefficients), and seeded
    # random coefficients in [-1, 1].
    c = _test_series(kind, 2 * N + 1, dps + 20, seed=5)
    r = pade(c, N, N, dps, check="rerun")
    assert r.method == "fraction_rerun"
    assert r.digits >= dps
    assert r.digits <= r.diagnostics["rerun"]["agree_digits"] - 1
    p_ref, q_ref, agree = _mpmath_reference(c, N, dps, 3 * N + 60)
    assert agree >= r.digits + 5          # the reference resolves the claim
    with workdps(dps + 3 * N + 100):
        got = min(digits_agree(r.p, p_ref), digits_agree(r.q, q_ref))
    assert got >= r.digits                # claimed <= measured


def test_rerun_check_complex_and_off_diagonal():
    # complex coefficients (MPFR mpc lists) and L != M (including L < M, which
    # goes through the reciprocal series); reference: mpmath.pade at 80 digits
    rng = random.Random(8)
    with workdps(50):
        c = [mpmath.mpc(rng.uniform(-1, 1), rng.uniform(-1, 1)) for _ in range(17)]
    for L, M in ((9, 7), (6, 10)):
        r = pade(c, L, M, 30, check="rerun")
        assert r.method == "fraction_rerun" and r.digits >= 30
        with workdps(80):
            p_ref, q_ref = mpmath.pade(c[:L + M + 1], L, M)
            assert digits_agree(r.q, q_ref) >= r.digits and digits_agree(r.p, p_ref) >= r.digits


@pytest.mark.parametrize("check", ["rerun", "residual"])
def test_check_singular_block_falls_back_to_ball_lu(check):
    # the same c_1 = 0 series as above: the recursion stops at its first step
    # and the certified ball LU takes over; reference: mpmath.pade at 80 digits
    with workdps(80):
        c = [mpmath.mpf(1), mpmath.mpf(0)] + [mpmath.mpf(1) / (k + 1) for k in range(2, 13)]
        p_ref, q_ref = mpmath.pade(c, 6, 6)
    r = pade(c, 6, 6, dps=40, check=check)
    assert r.method == "lu" and r.digits >= 40
    with workdps(80):
        assert digits_agree(r.q, q_ref) >= 40 and digits_agree(r.p, p_ref) >= 40
    with pytest.raises(ValueError):
        pade(c, 6, 6, dps=40, check="radius")


@pytest.mark.parametrize("kind,N,L,dps", [("log", 30, 30, 30), ("log", 40, 40, 100),
                                          ("exp", 15, 25, 30), ("random", 18, 22, 40),
                                          ("random", 20, 20, 100)])
def test_residual_check_estimate_is_honest_and_sharp(kind, N, L, dps):
    # check='residual' (midpoint recursion, error from the Toeplitz residual
    # through the Gohberg-Semencul inverse) against the *exact* Padé approximant
    # of the same rounded input (every mpf coefficient turned into its exact
    # Fraction; resum's exact path, itself checked against the closed form for
    # exp above). Series: log(1+x)/x and exp(x) (closed-form coefficients) and
    # seeded random coefficients in [-1, 1]. The estimate must not exceed the
    # measured digits, and (it is the error itself, less one digit) must not
    # undershoot them by more than 3.
    c = _test_series(kind, L + N + 1, dps + 20, seed=21)
    r = pade(c, L, N, dps, check="residual")
    assert r.method == "fraction_residual"
    assert r.digits >= dps
    ex = pade([mpf_to_fraction(x) for x in c], L, N, dps)
    assert ex.method == "exact"
    with workdps(dps + 200):
        got = min(digits_agree(r.p, ex.p), digits_agree(r.q, ex.q))
    assert r.digits <= got <= r.digits + 3


def test_residual_check_complex_and_lower_diagonal():
    # complex coefficients (acb midpoints); L < M goes to the ball recursion
    # (the residual check needs L >= M). References: mpmath.pade at 80 digits.
    rng = random.Random(9)
    with workdps(50):
        c = [mpmath.mpc(rng.uniform(-1, 1), rng.uniform(-1, 1)) for _ in range(17)]
    for (L, M), method in (((9, 7), "fraction_residual"), ((6, 10), "fraction")):
        r = pade(c, L, M, 30, check="residual")
        assert r.method == method and r.digits >= 30
        with workdps(80):
            p_ref, q_ref = mpmath.pade(c[:L + M + 1], L, M)
            assert digits_agree(r.q, q_ref) >= r.digits and digits_agree(r.p, p_ref) >= r.digits


def test_residual_check_input_sensitivity():
    # input_digits: the rerun with the input moved at its 25th digit uses the
    # same midpoint recursion; log(1+x)/x at [20/20] loses about 1.5 digits
    # per unit of M to the Toeplitz system's conditioning (Beckermann, Numer.
    # Math. 85 (2000) 553), so 25-digit input leaves well under 25 digits
    c = _test_series("log", 41, 60, seed=0)
    r = pade(c, 20, 20, 40, check="residual", input_digits=25)
    rb = pade(c, 20, 20, 40, input_digits=25)
    d_res = r.diagnostics["input_sensitivity_digits"]
    d_ball = rb.diagnostics["input_sensitivity_digits"]
    assert r.digits == pytest.approx(d_res) and d_res < 10
    assert abs(d_res - d_ball) < 1.5
