"""Natural-boundary and essential-singularity probes on series with known singular structure.

Sources (beside each check): the partition generating function prod_k 1/(1 - x^k) has the
unit circle as a natural boundary (P. Flajolet, E. Fusy, X. Gourdon, D. Panario and
N. Pouyanne, Electron. J. Combin. 13 (2006) R103, introduction); the lacunary series
sum_n x^(2^n) has |x| = 1 as a natural boundary (Hadamard's gap theorem; common practice,
no source); exp(x/(1 - x)) has c_n ~ e^(2 sqrt(n)) n^(-3/4) e^(-1/2) / (2 sqrt(pi)) (saddle
point; P. Flajolet and R. Sedgewick, Analytic Combinatorics, CUP 2009, Ch. VIII; from memory).
"""
from fractions import Fraction
from math import comb, factorial

import mpmath

from resum.estimators.boundary import probe_natural_boundary
from resum.estimators.essential import probe_essential
from tests.known_series import partition_numbers


def _mp(c):
    return [mpmath.mpf(v.numerator) / v.denominator if isinstance(v, Fraction) else mpmath.mpf(v) for v in c]


def _probe(c, dps=70):
    with mpmath.workdps(dps):
        return probe_natural_boundary(_mp(c), dps, dps)


def test_partition_function_crowds_on_unit_circle():
    # natural boundary |x| = 1 (Flajolet, Fusy, Gourdon, Panario, Pouyanne, EJC 13 (2006) R103)
    out = _probe(partition_numbers(120))
    assert out["suspected"], out["reason"]
    assert out["radius"].contains(1)
    assert out["radius"].width < 0.2          # sharp enough to say |x| ~ 1


def test_lacunary_series_crowds_on_unit_circle():
    # sum_n x^(2^n): natural boundary |x| = 1 (Hadamard gap theorem; common practice, no source)
    c = [1 if n > 0 and n & (n - 1) == 0 else 0 for n in range(129)]
    out = _probe(c)
    assert out["suspected"], out["reason"]
    assert out["radius"].contains(1)
    assert out["radius"].width < 0.2


def test_cut_on_a_ray_is_not_a_boundary():
    # log(1 + x)/x: one branch point at -1, cut (-inf, -1]; Padé poles on that ray
    # (common practice, no source)
    out = _probe([Fraction((-1) ** n, n + 1) for n in range(120)])
    assert not out["suspected"]


def test_two_rays_are_not_a_boundary():
    # (1 - x^2)^(1/2) + x/3 (no stride, so the probe sees x itself) has branch points
    # at +-1 and cuts along two rays (common practice, no source)
    c = [Fraction(0)] * 100
    b = Fraction(1)
    for k in range(50):
        c[2 * k] = b
        b = -b * (Fraction(1, 2) - k) / (k + 1)
    c[1] += Fraction(1, 3)
    out = _probe(c)
    assert not out["suspected"]


def test_seven_poles_on_the_circle_are_not_a_boundary():
    # 1/(1 - x^7) + 1/(2 - x), coefficients rounded to 30 digits: seven stable poles on
    # |x| = 1 and one at 2 (common practice, no source); the noise makes Froissart
    # doublets, which the probe leaves out
    with mpmath.workdps(60):
        c = [mpmath.mpf(mpmath.nstr((1 if n % 7 == 0 else 0) + mpmath.mpf(2) ** -(n + 1), 30))
             for n in range(100)]
    with mpmath.workdps(40):
        out = probe_natural_boundary(c, 40, 30)
    assert not out["suspected"]


def test_few_terms_give_no_verdict():
    out = _probe(partition_numbers(30))
    assert not out["suspected"] and "too low" in out["reason"]


def _exp_x_over_1mx(n):
    return [Fraction(1)] + [sum(Fraction(comb(m - 1, k - 1), factorial(k)) for k in range(1, m + 1))
                            for m in range(1, n)]


def test_essential_exp_x_over_one_minus_x():
    # c_n ~ e^(2 sqrt(n)) ...: beta = 2, x_c = 1 (Flajolet & Sedgewick, Ch. VIII; from memory)
    with mpmath.workdps(60):
        out = probe_essential(_mp(_exp_x_over_1mx(100)))
    assert out["essential"], out["reason"]
    assert out["beta"].contains(2) and out["beta"].width < 0.5
    assert out["location"].contains(1) and out["location"].width < 0.01


def _binomial(p, n):
    c = [Fraction(1)]
    for k in range(1, n):
        c.append(c[-1] * (k - 1 - p) / k)           # (1 - x)^p
    return c


def test_algebraic_and_log_points_are_not_essential():
    # (1 - x)^(-1/3), (1 - x)^(1/2), log(1 - x), log(1 + x)/x: algebraic or logarithmic
    # (common practice, no source)
    cases = [_binomial(Fraction(-1, 3), 100), _binomial(Fraction(1, 2), 100),
             [Fraction(0)] + [Fraction(-1, n) for n in range(1, 100)],
             [Fraction((-1) ** n, n + 1) for n in range(100)]]
    with mpmath.workdps(60):
        for c in cases:
            out = probe_essential(_mp(c))
            assert not out["essential"], out["reason"]
            assert out["beta"].contains(0)
