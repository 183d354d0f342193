"""Linear solves against closed forms and mpmath.

- inverse of the Hilbert matrix has integer entries with a closed form
  (M.-D. Choi, "Tricks or treats with the Hilbert matrix", Amer. Math.
  Monthly 90 (1983) 301-312): (H^-1)_{ij} = (-1)^{i+j} (i+j+1)
  C(n+i, n-j-1) C(n+j, n-i-1) C(i+j, i)^2 (0-based);
- mpmath.lu_solve and mpmath.qr_solve as reference solvers.
"""
import random
from fractions import Fraction
from math import comb

import mpmath
import pytest

from resum._kernels.linalg import lstsq, solve
from resum.context import workdps


def hilbert_inverse(n):
    return [[(-1) ** (i + j) * (i + j + 1) * comb(n + i, n - j - 1) * comb(n + j, n - i - 1)
             * comb(i + j, i) ** 2 for j in range(n)] for i in range(n)]


def test_exact_hilbert_solve_matches_closed_form_inverse():
    n = 8
    H = [[Fraction(1, i + j + 1) for j in range(n)] for i in range(n)]
    b = [1] + [0] * (n - 1)
    s = solve(H, b, dps=30)
    assert s.exact and s.success
    assert s.x == [Fraction(row[0]) for row in hilbert_inverse(n)]


def test_ball_hilbert_solve_and_condition():
    n, dps = 10, 40
    with workdps(dps + 40):
        H = [[mpmath.mpf(1) / (i + j + 1) for j in range(n)] for i in range(n)]
    s = solve(H, [1] + [0] * (n - 1), dps=dps)
    ref = [row[0] for row in hilbert_inverse(n)]
    with workdps(dps + 40):
        # H itself is rounded at dps+40 digits; the solve loses up to ~cond (3.5e13) and more
        # for the smallest components
        assert max(abs(x - r) / abs(r) for x, r in zip(s.x, ref)) < mpmath.mpf(10) ** -(dps + 10)
    # infinity-norm condition number of Hilbert(10) is about 3.5e13 (Todd 1954, from memory)
    assert 1e13 < float(s.cond) < 1e14


def test_complex_solve_against_mpmath():
    rng = random.Random(3)
    n = 6
    with workdps(60):
        A = [[mpmath.mpc(rng.random(), rng.random()) for _ in range(n)] for _ in range(n)]
        b = [mpmath.mpc(rng.random(), rng.random()) for _ in range(n)]
        ref = mpmath.lu_solve(mpmath.matrix(A), mpmath.matrix(b))
    s = solve(A, b, dps=40)
    with workdps(60):
        assert max(abs(s.x[i] - ref[i]) for i in range(n)) < mpmath.mpf(10) ** -40


def test_singular_matrix_reports_failure():
    s = solve([[1, 2], [2, 4]], [1, 1], dps=20)
    assert not s.success and "singular" in s.message
    with workdps(30):
        A = [[mpmath.mpf(1), mpmath.mpf(2)], [mpmath.mpf(2), mpmath.mpf(4)]]
    s = solve(A, [1, 1], dps=20, max_extra_bits=128)
    assert not s.success


def test_lstsq_against_mpmath_qr_solve():
    rng = random.Random(5)
    m, n, dps = 12, 4, 40
    with workdps(80):
        A = [[mpmath.mpf(rng.uniform(-1, 1)) for _ in range(n)] for _ in range(m)]
        b = [mpmath.mpf(rng.uniform(-1, 1)) for _ in range(m)]
        ref, res = mpmath.qr_solve(mpmath.matrix(A), mpmath.matrix(b))
    s = lstsq(A, b, dps=dps)
    assert s.success
    with workdps(80):
        assert max(abs(s.x[i] - ref[i]) for i in range(n)) < mpmath.mpf(10) ** -dps
        assert abs(s.residual - res) < mpmath.mpf(10) ** -dps


def test_shape_errors():
    with pytest.raises(ValueError, match="square"):
        solve([[1, 2, 3], [4, 5, 6]], [1, 2], dps=20)
    with pytest.raises(ValueError, match="at least as many rows"):
        lstsq([[1, 2, 3]], [1], dps=20)
