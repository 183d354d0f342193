"""Lossless conversions mpmath <-> python-flint (round trips are exact by
construction: both store binary mantissa-exponent pairs; common practice, no source)."""

import flint
import mpmath
from hypothesis import given, settings, strategies as st

from resum._kernels import flint_bridge as fb
from resum.context import workdps


@settings(max_examples=60, deadline=None)
@given(st.integers(min_value=-(2 ** 400), max_value=2 ** 400), st.integers(-2000, 2000))
def test_mpf_arb_round_trip_exact(man, exp):
    with workdps(200):
        x = mpmath.mpf((man, exp)) if man else mpmath.mpf(0)
    a = fb.mpf_to_arb(x)
    assert a.rad() == 0
    assert fb.arb_to_mpf(a) == x
    assert fb.arb_to_mpf(a)._mpf_ == x._mpf_


@settings(max_examples=40, deadline=None)
@given(st.fractions())
def test_fraction_fmpq_round_trip(q):
    assert fb.fmpq_to_fraction(fb.fraction_to_fmpq(q)) == q


def test_complex_round_trip_keeps_all_bits():
    with workdps(100):
        z = mpmath.mpc(1, 2) / 7
    back = fb.acb_to_mpc(fb.mpc_to_acb(z))
    with workdps(100):
        assert back == z


def test_flint_prec_restores():
    old = flint.ctx.prec
    with fb.flint_prec(1000):
        assert flint.ctx.prec == 1000
    assert flint.ctx.prec == old


def test_arb_rel_digits():
    with fb.flint_prec(200):
        a = flint.arb(1) / 3
    d = fb.arb_rel_digits(a)
    assert 58 < d < 62          # 200 bits ~ 60.2 digits
