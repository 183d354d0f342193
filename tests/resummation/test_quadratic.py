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


def _agree_digits(a, b):
    """Normwise relative digits on which two approximants' coefficients agree."""
    xa, xb = a.P + a.Q + a.R, b.P + b.Q + b.R
    scale = max(abs(v) for v in xa)
    diff = max(abs(u - v) for u, v in zip(xa, xb))
    return float(-mpmath.log10(diff / scale)) if diff else 99.0


@pytest.mark.parametrize("n", [61, 90])
def test_order_basis_agrees_with_the_dense_lu_on_random_series(n):
    # the O(n^2) order-basis recursion against python-flint's dense ball LU (arb_mat.solve) on
    # the same Hermite-Padé system; coefficients random in [-1, 1] times 0.8^k (random seed 5)
    import random
    rng = random.Random(5)
    with workdps(80):
        c = [mpmath.mpf(rng.uniform(-1, 1)) * mpmath.mpf("0.8") ** k for k in range(n)]
        l, m, k = quadratic_degrees(n)
        a = quadratic_fit(c, l, m, k, 40, method="order-basis")
        b = quadratic_fit(c, l, m, k, 40, method="lu")
        assert a is not None and b is not None
        assert a.digits >= 40 and b.digits >= 40
        assert _agree_digits(a, b) >= 39


def test_order_basis_agrees_with_the_dense_lu_on_the_kernel_family():
    # the cusp angle of the BES family (Beisert, Eden, Staudacher, hep-th/0610251), 125 loops
    # at 120 digits, mapped to the disk of its cut (-inf, -1/16] with the growth x^(1/2)
    # divided out: where auto uses the recursion (ORDER_BASIS_FROM terms and more). (From
    # 60-digit coefficients the top approximants of both constructions are degenerate alike:
    # a near-common factor, no value anywhere.)
    from resum.estimators.resum_conformal import mapped_coefficients
    from resum.estimators.resum_quadratic import ORDER_BASIS_FROM
    from resum.sources.bes import weak_coupling_series
    from resum.transforms.conformal import RayMap
    s = weak_coupling_series("pi/4", 125, Context(dps=120))
    with workdps(120):
        cw = mapped_coefficients(s.coefficients, RayMap(mpmath.mpf(-1) / 16), 120, alpha=1)
        n = len(cw)
        assert n >= ORDER_BASIS_FROM
        l, m, k = quadratic_degrees(n)
        a = quadratic_fit(cw, l, m, k, 30)               # auto: the recursion
        b = quadratic_fit(cw, l, m, k, 30, method="lu")
        assert a is not None and b is not None and a.digits >= 30
        assert _agree_digits(a, b) >= 29
        for w in (mpmath.mpf("0.3"), mpmath.mpf("0.6")):
            va, vb = a(w), b(w)
            assert va is not None and vb is not None and abs(va - vb) <= abs(vb) * mpmath.mpf(10) ** -28


def test_unknown_fit_method_is_refused():
    with pytest.raises(ValueError, match="order-basis"):
        quadratic_fit([1, 2, 3, 4, 5], 1, 1, 0, 10, method="svd")
