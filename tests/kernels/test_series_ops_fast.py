"""FLINT fast paths of series arithmetic against the plain loops and mpmath.

References: mpmath.taylor (general-purpose library) for exp(sin x),
log(1 + x + x^2) and tan x = sin x / cos x; the plain O(n^2) loops in
series_ops (the same recurrences, exact for int/Fraction).
"""
import random
from fractions import Fraction

import mpmath
import pytest

from resum._kernels import series_ops as ops
from resum.context import workdps


@pytest.fixture
def plain(monkeypatch):
    def run(fn, *args):
        monkeypatch.setattr(ops, "FAST_MIN_TERMS", 10 ** 9)
        try:
            return fn(*args)
        finally:
            monkeypatch.setattr(ops, "FAST_MIN_TERMS", 8)
    return run


def rand_exact(rng, n, first=None):
    out = [Fraction(rng.randint(-9, 9), rng.randint(1, 9)) for _ in range(n)]
    if first is not None:
        out[0] = first
    return out


def test_exact_fast_paths_equal_plain_loops(plain):
    rng = random.Random(11)
    n = 25
    a = rand_exact(rng, n, first=Fraction(1))
    b = rand_exact(rng, n, first=Fraction(0))
    assert ops.mul(a, b, n) == plain(ops.mul, a, b, n)
    assert ops.reciprocal(a, n) == plain(ops.reciprocal, a, n)
    assert ops.compose(a, b, n) == plain(ops.compose, a, b, n)
    assert ops.log(a, n) == plain(ops.log, a, n)
    assert ops.exp(b, n) == plain(ops.exp, b, n)
    assert all(isinstance(x, (int, Fraction)) for x in ops.exp(b, n))


def test_inexact_fast_paths_agree_with_plain_loops(plain):
    rng = random.Random(12)
    n = 30
    with workdps(50):
        a = [mpmath.mpf(1)] + [mpmath.mpf(rng.uniform(-1, 1)) for _ in range(n - 1)]
        b = [mpmath.mpf(0)] + [mpmath.mpf(rng.uniform(-1, 1)) for _ in range(n - 1)]
        for f, args in [(ops.mul, (a, b, n)), (ops.reciprocal, (a, n)), (ops.compose, (a, b, n)),
                        (ops.log, (a, n)), (ops.exp, (b, n))]:
            fast, slow = f(*args), plain(f, *args)
            scale = max(abs(x) for x in slow)
            assert max(abs(x - y) for x, y in zip(fast, slow)) < mpmath.mpf(10) ** -44 * scale


def test_against_mpmath_taylor():
    n = 20
    with workdps(40):
        sinx = mpmath.taylor(mpmath.sin, 0, n - 1)
        cosx = mpmath.taylor(mpmath.cos, 0, n - 1)
        ref = mpmath.taylor(lambda x: mpmath.exp(mpmath.sin(x)), 0, n - 1)
        got = ops.exp(sinx, n)
        assert max(abs(x - y) for x, y in zip(got, ref)) < mpmath.mpf(10) ** -30
        ref = mpmath.taylor(mpmath.tan, 0, n - 1)
        got = ops.div(sinx, cosx, n)
        assert max(abs(x - y) for x, y in zip(got, ref)) < mpmath.mpf(10) ** -30
        ref = mpmath.taylor(lambda x: mpmath.log(1 + x + x * x), 0, n - 1)
        got = ops.log([mpmath.mpf(1), mpmath.mpf(1), mpmath.mpf(1)], n)
        assert max(abs(x - y) for x, y in zip(got, ref)) < mpmath.mpf(10) ** -30


def test_complex_fast_path():
    n = 12
    with workdps(40):
        a = [mpmath.mpc(1, 1)] + [mpmath.mpc(0.5, -0.25)] * (n - 1)
        r = ops.reciprocal(a, n)
        one = ops.mul(a, r, n)
        assert abs(one[0] - 1) < mpmath.mpf(10) ** -35
        assert max(abs(x) for x in one[1:]) < mpmath.mpf(10) ** -35


def test_log_of_negative_constant_uses_plain_path():
    n = 10
    with workdps(30):
        got = ops.log([mpmath.mpf(-2)] + [mpmath.mpf(1)] * (n - 1), n)
        assert abs(got[0] - mpmath.log(-2)) < mpmath.mpf(10) ** -25
