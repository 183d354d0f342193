"""Exact integrals of rational approximants (the derivative variant of conformal-Padé).

Reference: mpmath.quad on the same rational function (tanh-sinh quadrature at 60 digits).
"""
import random

import mpmath
import pytest

from resum.context import workdps
from resum.estimators.resum_band import Rational, RationalIntegrator, rational_integral


def _random_rational(rng, L, M, cplx=False):
    def num():
        v = mpmath.mpf(rng.uniform(-1, 1))
        return mpmath.mpc(v, rng.uniform(-1, 1)) if cplx else v
    return Rational(tuple(num() for _ in range(L + 1)), (mpmath.mpf(1),) + tuple(num() for _ in range(M)), L, M)


@pytest.mark.parametrize("gamma", [0, 1, 2, 3])
@pytest.mark.parametrize("seed", [1, 2, 3])
def test_partial_fractions_match_quadrature(seed, gamma):
    rng = random.Random(seed)
    with workdps(60):
        r = _random_rational(rng, rng.randint(0, 7), rng.randint(1, 7), cplx=seed == 3)
        for w in (mpmath.mpf("0.6"), mpmath.mpc("0.5", "-0.3")):
            v = rational_integral(r, w, 60, rim=1, gamma=gamma)
            assert v is not None
            ref = mpmath.quad(lambda s: w * r(s * w) / (1 - s * w) ** gamma, mpmath.linspace(0, 1, 30))
            assert abs(v - ref) <= mpmath.mpf(10) ** -55 * max(1, abs(ref))


def test_pole_on_the_path():
    # 1/(1 - t/0.3): a pole with residue -0.3 at t = 0.3 lies on [0, 0.6]: no value there
    with workdps(40):
        r = Rational((mpmath.mpf(1),), (mpmath.mpf(1), -1 / mpmath.mpf("0.3")), 0, 1)
        integ = RationalIntegrator(r, 40)
        assert integ(mpmath.mpf("0.6")) is None
        ref = -mpmath.mpf("0.3") * mpmath.log(1 - mpmath.mpf("0.2") / mpmath.mpf("0.3"))
        assert abs(integ(mpmath.mpf("0.2")) - ref) < mpmath.mpf(10) ** -38


def test_spurious_pair_on_the_path_is_left_out():
    # 1/(1 - t) plus a pole-zero pair at 0.3 whose residue is 1e-60 (below the 40 digits
    # asked): the pair is left out and the value is that of 1/(1 - t), -log(1 - 0.6)
    with workdps(80):
        eps = mpmath.mpf(10) ** -60
        p = (mpmath.mpf(1), -1 / mpmath.mpf("0.3") + eps)            # (1 - t/0.3 + eps t)
        q = (mpmath.mpf(1), -1 - 1 / mpmath.mpf("0.3"), 1 / mpmath.mpf("0.3"))   # (1 - t)(1 - t/0.3)
        r = Rational(p, q, 1, 2)
        v = rational_integral(r, mpmath.mpf("0.6"), 40)
        assert v is not None and abs(v + mpmath.log(mpmath.mpf("0.4"))) < mpmath.mpf(10) ** -38


def test_derivative_variant_beyond_the_radius():
    # f = log(1+x) + sqrt(1+x/3), 60 Taylor coefficients (mpmath.taylor), cuts from -1 and -3:
    # at x = 50 conformal-Padé of f itself gives ~14 digits, the derivative variant ~22
    # (reference: mpmath at 80 digits)
    from resum.context import Context
    from resum.resummation import evaluate
    from resum.series import Series
    f = lambda x: mpmath.log(1 + x) + mpmath.sqrt(1 + x / 3)      # noqa: E731
    with workdps(80):
        c = mpmath.taylor(f, 0, 59)
    r = evaluate(Series(c, digits=75), ["50"], Context(dps=30))
    p = r.points[0]
    assert p.method == "conformal-pade" and p.diagnostics["variant"] == "derivative"
    with workdps(80):
        truth = f(mpmath.mpf(50))
        assert p.value.contains(truth)
        err = abs(p.value.value - truth) / truth
        assert err < mpmath.mpf(10) ** -20
        assert p.value.error <= 1000 * abs(p.value.value - truth)
