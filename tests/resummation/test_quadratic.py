"""Quadratic (Hermite-Padé) approximants: the construction, and method conformal-quadratic
against closed forms evaluated by mpmath."""
import json
from fractions import Fraction

import mpmath
import pytest

from resum import Series
from resum.cli import main
from resum.context import Context, workdps
from resum.estimators.resum_quadratic import quadratic_degrees, quadratic_fit
from resum.resummation import evaluate
from resum.series.io import write_series


def _binomial_series(a, n):
    """(1 + x)^a = sum binom(a, k) x^k, exact (binomial theorem; common practice, no source)."""
    out, b = [], Fraction(1)
    for k in range(n):
        out.append(b)
        b = b * (a - k) / (k + 1)
    return out


def test_exact_for_a_quadratic_irrationality():
    # y = sqrt(1 + w) - 1 obeys y^2 + 2 y - w = 0 exactly (Shafer, SIAM J. Numer. Anal. 11 (1974)
    # 447: a quadratic approximant of degrees >= those of the relation reproduces it); its value
    # at w = 8, far outside the disk |w| < 1 of the series, is 2
    c = _binomial_series(Fraction(1, 2), 12)
    c[0] = 0
    with workdps(40):
        r = quadratic_fit([mpmath.mpf(v.numerator) / v.denominator for v in c], 1, 1, 1, 40)
        assert r is not None
        assert mpmath.almosteq(r(mpmath.mpf(8)), 2, mpmath.mpf(10) ** -35)
        # the relation itself, normalised to Q(0) = 1: P = -w/2, R = 1/2
        assert mpmath.almosteq(r.P[1], mpmath.mpf(-1) / 2, mpmath.mpf(10) ** -35)
        assert mpmath.almosteq(r.R[0], mpmath.mpf(1) / 2, mpmath.mpf(10) ** -35)
        # the other root of the relation is -1 - sqrt(1 + w): never taken on the branch from 0
        assert mpmath.almosteq(r(mpmath.mpf(-0.5)), mpmath.sqrt(mpmath.mpf(0.5)) - 1, mpmath.mpf(10) ** -35)


def test_degrees_use_every_coefficient():
    for n in range(5, 40):
        l, m, k = quadratic_degrees(n)
        assert l + m + k + 2 == n and max(l, m, k) - min(l, m, k) <= 1
    assert quadratic_degrees(4) is None


@pytest.mark.parametrize("x, min_digits, min_claimed", [(30, 14, 12), (1000, 6, 6)])
def test_cube_root_beyond_the_radius(x, min_digits, min_claimed):
    # (1 + x)^(-1/3) from 30 exact terms (radius 1, branch point at -1); truth from mpmath.
    # Measured: 15.5 digits (12.9 claimed) at x = 30 and 6.7 (6.4) at x = 1000; conformal-pade
    # on the same series: 12.2 (11.2) and 5.0 (4.7)
    s = Series(_binomial_series(Fraction(-1, 3), 30))
    r = evaluate(s, [x], Context(dps=30), method="conformal-quadratic")
    p = r.points[0]
    assert p.method == "conformal-quadratic" and p.diagnostics["variant"] == "quadratic"
    with workdps(60):
        truth = mpmath.mpf(1 + x) ** (mpmath.mpf(-1) / 3)
        err = abs(p.value.value - truth)
        assert p.value.contains(truth)
        assert -mpmath.log10(err / truth) >= min_digits
        assert p.value.digits() >= min_claimed              # and the band says so


def test_cli_method_and_json(tmp_path, capsys):
    p = write_series(Series(_binomial_series(Fraction(-1, 3), 24), name="cube root"), tmp_path / "c.json")
    code = main(["evaluate", str(p), "--at", "10", "--method", "conformal-quadratic", "--json", "--no-verify"])
    doc = json.loads(capsys.readouterr().out)
    assert code == 0
    pt = doc["values"][0]
    assert pt["method"] == "conformal-quadratic"
    with workdps(40):
        truth = mpmath.mpf(11) ** (mpmath.mpf(-1) / 3)
        assert mpmath.mpf(pt["lo"]) <= truth <= mpmath.mpf(pt["hi"])


def test_too_few_terms_is_a_clear_refusal():
    s = Series(_binomial_series(Fraction(-1, 3), 10))
    r = evaluate(s, [5], Context(dps=15), method="conformal-quadratic", verify=False)
    p = r.points[0]
    assert not p.success and "at least 12 terms" in p.message
