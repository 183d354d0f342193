"""Polynomial roots against closed forms and reference libraries.

- Chebyshev T_n and U_n roots: cos((2k-1) pi / (2n)) and cos(k pi / (n+1))
  (Abramowitz and Stegun, Handbook of Mathematical Functions, 22.16.4-5);
- Legendre P_n roots: checked with mpmath.legendre (value ~ 0 and a sign
  change across the returned root) and with mpmath.polyroots;
- numpy.polynomial for the double-precision path.
"""
from fractions import Fraction

import mpmath
import numpy as np
import pytest

from resum._kernels.roots import poly_roots, poly_roots_fp, poly_roots_full
from resum.context import workdps


def chebyshev_t_coeffs(n):
    # T_0 = 1, T_1 = x, T_{k+1} = 2x T_k - T_{k-1}; coefficients low to high (exact)
    a, b = [1], [0, 1]
    for _ in range(n - 1):
        c = [0] + [2 * x for x in b]
        for i, x in enumerate(a):
            c[i] -= x
        a, b = b, c
    return b if n >= 1 else a


def chebyshev_u_coeffs(n):
    a, b = [1], [0, 2]
    for _ in range(n - 1):
        c = [0] + [2 * x for x in b]
        for i, x in enumerate(a):
            c[i] -= x
        a, b = b, c
    return b


def legendre_coeffs(n):
    # (k+1) P_{k+1} = (2k+1) x P_k - k P_{k-1} (A&S 22.7.10), exact
    a, b = [Fraction(1)], [Fraction(0), Fraction(1)]
    for k in range(1, n):
        c = [Fraction(0)] + [Fraction(2 * k + 1, k + 1) * x for x in b]
        for i, x in enumerate(a):
            c[i] -= Fraction(k, k + 1) * x
        a, b = b, c
    return b


@pytest.mark.parametrize("n,dps", [(5, 30), (17, 60), (40, 100)])
def test_chebyshev_t_roots_closed_form(n, dps):
    roots = poly_roots(chebyshev_t_coeffs(n), dps)
    assert len(roots) == n
    with workdps(dps + 20):
        ref = sorted(mpmath.cos((2 * k - 1) * mpmath.pi / (2 * n)) for k in range(1, n + 1))
        got = sorted(z.real for z, _ in roots)
        for z, rad in roots:
            assert abs(z.imag) <= rad + mpmath.mpf(10) ** (-dps - 5)
        for g, r, (z, rad) in zip(got, ref, sorted(roots, key=lambda t: t[0].real)):
            assert abs(g - r) <= max(rad, mpmath.mpf(10) ** (-dps)) * max(1, abs(r))
            assert abs(g - r) <= mpmath.mpf(10) ** (-dps) * max(abs(r), mpmath.mpf(10) ** -5)


def test_chebyshev_u_roots_closed_form():
    n, dps = 12, 50
    res = poly_roots_full(chebyshev_u_coeffs(n), dps)
    assert res.success and all(res.certified)
    with workdps(dps + 20):
        ref = sorted(mpmath.cos(k * mpmath.pi / (n + 1)) for k in range(1, n + 1))
        got = sorted(z.real for z in res.roots)
        assert max(abs(a - b) for a, b in zip(got, ref)) < mpmath.mpf(10) ** (-dps)


def test_legendre_roots_against_mpmath():
    n, dps = 20, 60
    roots = poly_roots(legendre_coeffs(n), dps)
    assert len(roots) == n
    with workdps(dps + 30):
        for z, rad in roots:
            x = z.real
            h = max(rad, mpmath.mpf(10) ** (-dps)) * 2
            assert mpmath.legendre(n, x - h) * mpmath.legendre(n, x + h) < 0
        ref = sorted(mpmath.re(r) for r in mpmath.polyroots(
            [mpmath.mpf(c.numerator) / c.denominator for c in reversed(legendre_coeffs(n))],
            maxsteps=200, extraprec=200))
        got = sorted(z.real for z, _ in roots)
        assert max(abs(a - b) for a, b in zip(got, ref)) < mpmath.mpf(10) ** (-dps + 2)


def test_inexact_coefficients_agree_with_mpmath_polyroots():
    with workdps(80):
        c = [mpmath.mpf(1) / (k + 1) ** 2 for k in range(15)]
        ref = mpmath.polyroots(list(reversed(c)), maxsteps=300, extraprec=300)
    roots = poly_roots(c, 50)
    with workdps(80):
        for r in ref:
            best = min(abs(z - r) for z, _ in roots)
            assert best < mpmath.mpf(10) ** -48


def test_multiple_roots_exact_and_input_digits():
    res = poly_roots_full([-4, 12, -13, 6, -1][::-1][::-1], 30)   # (x-1)^2 (x-2)^2 * (-1)
    assert sorted(res.multiplicity) == [2, 2]
    with workdps(40):
        assert abs(res.roots[0] - 1) < mpmath.mpf(10) ** -30
        assert abs(res.roots[1] - 2) < mpmath.mpf(10) ** -30
    # input known to 20 digits: radius reflects the sensitivity (simple roots 1, 2, 3)
    with workdps(40):
        c = [mpmath.mpf(-6), mpmath.mpf(11), mpmath.mpf(-6), mpmath.mpf(1)]
    r = poly_roots_full(c, 30, input_digits=20)
    assert all(rad > mpmath.mpf(10) ** -21 for rad in r.radii)
    assert not r.success                       # cannot claim 30 digits from 20-digit input


def test_fp_path_against_numpy():
    c = chebyshev_t_coeffs(9)
    got = sorted(z.real for z, _ in poly_roots_fp(c))
    ref = sorted(np.cos((2 * np.arange(1, 10) - 1) * np.pi / 18))
    assert max(abs(a - b) for a, b in zip(got, ref)) < 1e-13


def test_zero_polynomial_rejected():
    with pytest.raises(ValueError, match="zero polynomial"):
        poly_roots([0, 0], 20)
