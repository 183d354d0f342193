"""Tests of the quartic anharmonic oscillator source (resum.sources.oscillator).

Normalisation. Bender and Wu (Phys. Rev. 184 (1969) 1231; Phys. Rev. D 7 (1973) 1620)
treat H_BW = p^2 + x^2/4 + g x^4/4. With x = y / sqrt(2) our H = p^2 + x^2 + g x^4 becomes
2 (p_y^2 + y^2/4 + (g/2) y^4/4), so E_ours(g) = 2 E_BW(g/2) and the coefficients
convert as E_ours,k = 2^(1-k) E_BW,k.
"""
from fractions import Fraction

import mpmath
import pytest

from resum.context import Context, workdps
from resum.errors import InputError
from resum.sources import oscillator as osc


def test_first_coefficients_bender_wu_table():
    # Bender-Wu ground state of H_BW (from memory of their table):
    # 1/2, 3/4, -21/8, 333/16, -30885/128, 916731/256
    bw = [Fraction(1, 2), Fraction(3, 4), Fraction(-21, 8), Fraction(333, 16),
          Fraction(-30885, 128), Fraction(916731, 256)]
    ours = osc.rs_coefficients(0, 6)
    assert ours == [Fraction(2, 2 ** k) * b for k, b in enumerate(bw)]


def test_excited_levels_low_orders():
    # first order: <n|x^4|n> = 3 (2 n^2 + 2 n + 1) / 4 for p^2 + x^2 (common practice, no source);
    # second order: -(34 n^3 + 51 n^2 + 59 n + 21)/16 (Bender-Wu 1969 in our normalisation, from memory)
    for n in range(5):
        e = osc.rs_coefficients(n, 3)
        assert e[0] == 2 * n + 1
        assert e[1] == Fraction(3 * (2 * n * n + 2 * n + 1), 4)
        assert e[2] == Fraction(-(34 * n ** 3 + 51 * n ** 2 + 59 * n + 21), 16)


def _large_order_ratio(E, n):
    # Bender-Wu (Phys. Rev. D 7 (1973) 1620): E_BW,n ~ (-1)^(n+1) sqrt(6)/pi^(3/2) 3^n Gamma(n + 1/2);
    # converted: E_ours,n ~ 2^(1-n) times that.
    with workdps(40):
        lead = (2 * (-1) ** (n + 1) * mpmath.sqrt(6) / mpmath.pi ** 1.5
                * (mpmath.mpf(3) / 2) ** n * mpmath.gamma(n + mpmath.mpf(1) / 2))
        return mpmath.mpf(E[n].numerator) / E[n].denominator / lead


def test_large_order_growth_120():
    E = osc.rs_coefficients(0, 121)
    r = _large_order_ratio(E, 120)
    # the ratio approaches 1 with a 1/n correction; allow 2/n
    assert abs(r - 1) < mpmath.mpf(2) / 120


@pytest.mark.slow
def test_large_order_growth_300():
    E = osc.rs_coefficients(0, 301)
    r300, r150 = _large_order_ratio(E, 300), _large_order_ratio(E, 150)
    assert abs(r300 - 1) < mpmath.mpf(2) / 300
    # a 1/n correction halves from n = 150 to n = 300
    assert 0.4 < abs(r300 - 1) / abs(r150 - 1) < 0.6


def test_energy_g1_hioe_montroll():
    # Hioe and Montroll, J. Math. Phys. 16 (1975) 1945: E_0(g=1) = 1.392351641530291855657507876609934
    r = osc.energy(1, 0, Context(dps=34))
    assert r.success, r.message
    with workdps(45):
        ref = mpmath.mpf("1.392351641530291855657507876609934")
        assert abs(r.value.value - ref) < mpmath.mpf(10) ** -33
        assert r.value.lower - mpmath.mpf(10) ** -33 <= ref <= r.value.upper + mpmath.mpf(10) ** -33


def test_energy_at_large_g_strong_coupling_constant():
    # E_0(g) = c g^(1/3) + c' g^(-1/3) + ... at large g, c = 1.0603620904 for p^2 + x^2 + g x^4
    # (the pure quartic p^2 + x^4 ground state, from memory); g up to 1e8 is the documented range,
    # and g = 1e6 used to fail in the frequency root-finder. Eliminating c' between g = 1e6
    # and g = 1e8 leaves an O(g^(-4/3)) remainder, below 1e-8 here.
    rs = {}
    for g in (10 ** 6, 10 ** 8):
        r = osc.energy(g, 0, Context(dps=20))
        assert r.success, r.message
        rs[g] = r.value.value / mpmath.cbrt(g)
    t = mpmath.mpf(100) ** (mpmath.mpf(2) / 3)        # (1e8 / 1e6)^(2/3)
    c = (t * rs[10 ** 8] - rs[10 ** 6]) / (t - 1)
    assert abs(c - mpmath.mpf("1.0603620904")) < mpmath.mpf("1e-8")


def test_energy_small_g_matches_series():
    # at g = 0.005 the optimally truncated series is accurate to ~exp(-1/(3g)) ~ 1e-29;
    # compare to 20 digits for the ground state and the first two excited levels
    g = mpmath.mpf("0.005")
    for n in (0, 1, 2):
        E = osc.rs_coefficients(n, 30)
        r = osc.energy(g, n, Context(dps=22))
        assert r.success, r.message
        with workdps(40):
            s = mpmath.fsum(mpmath.mpf(c.numerator) / c.denominator * g ** k for k, c in enumerate(E))
            assert abs(s - r.value.value) < abs(s) * mpmath.mpf(10) ** -20


def test_result_round_trip():
    r = osc.energy("1/2", 1, Context(dps=15))
    d = r.to_dict()
    r2 = osc.EnergyResult.from_dict(d)
    assert r2.state == 1 and r2.success
    assert abs(r2.value.value - r.value.value) < mpmath.mpf(10) ** -14


def test_bad_input():
    with pytest.raises(InputError, match="state"):
        osc.rs_coefficients(-1, 3)
    with pytest.raises(InputError, match="orders"):
        osc.series(0, 0)
    with pytest.raises(InputError, match="g"):
        osc.energy(-1, 0)
