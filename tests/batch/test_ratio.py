"""The ratio estimate of the coefficients task against known radii.

Honest (the band holds the known value) and sharp (the band is narrow).
"""
import mpmath
import pytest

from resum.batch.tasks import ratio_estimate
from resum.context import Context


def _check(r, key, truth, max_rel):
    e = r[key]
    with mpmath.workdps(60):
        lo, hi = mpmath.mpf(e["lo"]), mpmath.mpf(e["hi"])
        assert lo <= truth <= hi, (e, truth)
        assert (hi - lo) / truth < max_rel


def test_log_cosh_radius():
    # log cosh(2 pi sqrt(x)) has its nearest singularities where cosh vanishes,
    # 2 pi sqrt(x) = i pi/2, i.e. x = -1/16 (closed form, common practice, no source);
    # coefficients from mpmath.taylor (reference library)
    ctx = Context(dps=30)
    with mpmath.workdps(80):
        c = mpmath.taylor(lambda t: mpmath.log(mpmath.cosh(2 * mpmath.pi * t)), 0, 100)
        cx = [c[2 * k] for k in range(50)]          # even function: series in x = t^2
    r = ratio_estimate(cx, ctx)
    assert r["growth"] == "finite radius" and r["status"] == "converged"
    _check(r, "radius", mpmath.mpf(1) / 16, 1e-12)


def test_sqrt_branch_and_spacing():
    # (1 + x^2/4)^(1/2): branch points at x = +-2i, radius 2; only even powers
    # are non-zero, so the ratios are taken two orders apart (binomial series,
    # common practice, no source)
    ctx = Context(dps=30)
    with mpmath.workdps(50):
        c = [0] * 60
        for k in range(30):
            c[2 * k] = mpmath.binomial(mpmath.mpf(1) / 2, k) / mpmath.mpf(4) ** k
    r = ratio_estimate(c, ctx)
    assert r["spacing"] == 2
    _check(r, "radius", mpmath.mpf(2), 1e-6)


def test_oscillator_borel_distance():
    # ground and first excited level of p^2 + x^2 + g x^4: c_n ~ (-1)^(n+1) C (3/2)^n Gamma(n + K + 1/2)
    # (Bender and Wu, Phys. Rev. D 7 (1973) 1620, in this normalisation), so the
    # nearest Borel-plane singularity lies at distance 2/3
    from resum.sources import SOURCES
    ctx = Context(dps=30)
    for state in (0, 1):
        s = SOURCES["oscillator"].build(ctx, state=state, orders=100)
        r = ratio_estimate(s.dense(ctx), ctx)
        assert r["growth"] == "factorial"
        _check(r, "borel_distance", mpmath.mpf(2) / 3, 1e-3)


def test_too_few_terms():
    r = ratio_estimate([1, 2, 3], Context(dps=20))
    assert r["status"] == "too few terms" and r["radius"] is None


@pytest.mark.parametrize("digits", [12, 30])
def test_band_not_narrower_than_the_input_digits(digits):
    # 1/(1 - x/3) rounded to `digits` digits: the band must not claim more
    # (geometric series, common practice, no source)
    ctx = Context(dps=30)
    with mpmath.workdps(digits):
        c = [+(mpmath.mpf(1) / 3 ** n) for n in range(40)]
    r = ratio_estimate(c, ctx, digits=digits)
    e = r["radius"]
    with mpmath.workdps(50):
        half = (mpmath.mpf(e["hi"]) - mpmath.mpf(e["lo"])) / 2
        assert half >= 3 * mpmath.mpf(10) ** (-digits)
        assert mpmath.mpf(e["lo"]) <= 3 <= mpmath.mpf(e["hi"])
