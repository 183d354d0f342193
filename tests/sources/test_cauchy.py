"""Taylor coefficients of callables by the Cauchy integral (resum.sources.cauchy)."""
import mpmath
import pytest

from resum.context import Context, workdps
from resum.errors import InputError
from resum.sources.cauchy import fft, taylor_coefficients


def _check(res, exact, digits):
    with workdps(60):
        for j, (c, ref) in enumerate(zip(res.coefficients, exact)):
            tol = abs(ref) * mpmath.mpf(10) ** -digits if ref else mpmath.mpf(10) ** -digits
            assert abs(c.value - ref) <= tol, j                  # enough digits
            assert abs(c.value - ref) <= c.error + tol / 1000, j  # honest band
            assert abs(res.imag[j].value) <= res.imag[j].error + tol


def test_log1p():
    # log(1 + x) = sum_{j>=1} (-1)^(j+1) x^j / j (common practice, no source)
    res = taylor_coefficients(lambda x: mpmath.log(1 + x), 40, Context(dps=30))
    assert res.success, res.message
    with workdps(60):
        exact = [mpmath.mpf(0)] + [mpmath.mpf((-1) ** (j + 1)) / j for j in range(1, 40)]
    _check(res, exact, 30)
    assert res.is_real
    s = res.series()
    assert s.digits >= 30 and s.coefficients[0] == 0
    import json
    from resum.sources.cauchy import TaylorResult
    with workdps(60):
        back = TaylorResult.from_dict(json.loads(json.dumps(res.to_dict())))
        assert len(back.coefficients) == 40
        assert abs(back.coefficients[7].value - res.coefficients[7].value) <= res.coefficients[7].error


def test_central_binomial():
    # 1/sqrt(1 - 4x) = sum_j binomial(2j, j) x^j (common practice, no source); radius 1/4
    res = taylor_coefficients(lambda x: 1 / mpmath.sqrt(1 - 4 * x), 50, Context(dps=30))
    assert res.success, res.message
    with workdps(60):
        exact = [mpmath.binomial(2 * j, j) for j in range(50)]
    _check(res, exact, 30)
    assert max(res.accepted_radii) < 0.25


def test_circle_beyond_a_branch_cut_is_rejected():
    # 1/sqrt(1 - 3x): radius 1/3; the circle |x| = 1/2 crosses the cut and must be refused
    res = taylor_coefficients(lambda x: 1 / mpmath.sqrt(1 - 3 * x), 30, Context(dps=25))
    assert res.success, res.message
    assert max(res.accepted_radii) < mpmath.mpf(1) / 3
    with workdps(60):
        exact = [mpmath.binomial(2 * j, j) * (mpmath.mpf(3) / 4) ** j for j in range(30)]
    _check(res, exact, 25)


def test_fft_against_plain_dft():
    with workdps(30):
        v = [mpmath.mpc(j * j - 3, j) for j in range(8)]
        out = fft(v)
        for k in range(8):
            ref = mpmath.fsum(v[m] * mpmath.expjpi(-2 * mpmath.mpf(m * k) / 8) for m in range(8))
            assert abs(out[k] - ref) < mpmath.mpf(10) ** -25


def test_bad_input():
    with pytest.raises(InputError, match="callable"):
        taylor_coefficients(3, 5)
    with pytest.raises(InputError, match="points"):
        taylor_coefficients(mpmath.exp, 5, points=12)
