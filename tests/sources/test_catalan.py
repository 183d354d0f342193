"""Catalan numbers' generating function against mpmath's binomial and hypergeometric functions.

Facts used (common practice, no source): c_n = binomial(2n, n)/(n + 1);
f(x) = sum c_n x^n = (1 - sqrt(1 - 4x))/(2x) = 2F1(1/2, 1; 2; 4x), with the principal branch
continuing it beyond the radius 1/4 (cut along [1/4, oo) in x, i.e. [1, oo) in 2F1's argument);
f solves x f^2 - f + 1 = 0.
"""
import json

import mpmath
import pytest

from resum.cli import main
from resum.context import Context, workdps
from resum.errors import InputError
from resum.sources import SOURCES, catalan, rebuilder_from_provenance


def test_coefficients_are_central_binomials_over_n_plus_1():
    cs = catalan.coefficients(300)
    assert len(cs) == 300 and all(isinstance(c, int) for c in cs)
    with workdps(250):                      # binomial(598, 299) has 179 digits: all of them exact
        for n, c in enumerate(cs):
            ref = mpmath.binomial(2 * n, n) / (n + 1)      # mpmath.binomial
            assert c == int(mpmath.nint(ref)) and abs(ref - c) < mpmath.mpf(10) ** -50


@pytest.mark.parametrize("x", ["-1", "-3", "-40", "0.3+2j", "-0.5-0.5j", "1+1j", "2", "1"])
def test_closed_form_beyond_the_radius_is_the_principal_branch(x):
    # |x| > 1/4 everywhere: the series diverges; 2F1(1/2, 1; 2; 4x) by mpmath.hyp2f1 (principal
    # branch, cut [1, oo) in its argument), also on the cut (x = 1, 2)
    v = catalan.closed_form(x, Context(dps=30))
    with workdps(50):
        xx = mpmath.mpmathify(x)
        ref = mpmath.hyp2f1(mpmath.mpf(1) / 2, 1, 2, 4 * xx)
        assert abs(v - ref) < abs(ref) * mpmath.mpf(10) ** -28
        assert abs(xx * ref ** 2 - ref + 1) < mpmath.mpf(10) ** -40      # x f^2 - f + 1 = 0
        # the other root of that quadratic, (1 + sqrt(1 - 4x))/(2x), is not the one given
        other = (1 + mpmath.sqrt(1 - 4 * xx)) / (2 * xx)
        assert abs(v - other) > mpmath.mpf(10) ** -3


def test_closed_form_at_real_points_matches_the_first_form():
    # (1 - sqrt(1 - 4x))/(2x) written out with mpmath.sqrt; f(-1) = (sqrt(5) - 1)/2
    with workdps(40):
        for x in ("-1", "-0.1", "0.2", "0.25"):
            xx = mpmath.mpf(x)
            ref = (1 - mpmath.sqrt(1 - 4 * xx)) / (2 * xx)
            assert abs(catalan.closed_form(x, Context(dps=30)) - ref) < mpmath.mpf(10) ** -28
        assert abs(catalan.closed_form(-1, Context(dps=30)) - (mpmath.sqrt(5) - 1) / 2) < mpmath.mpf(10) ** -28
    assert catalan.closed_form(0, Context(dps=30)) == 1                  # c_0


def test_partial_sums_inside_the_radius_converge_to_the_closed_form():
    # the coefficients and the evaluator describe the same function: at x = 0.1 the terms fall
    # like 0.4^n n^(-3/2), so 120 terms leave less than 1e-50
    cs = catalan.coefficients(120)
    with workdps(60):
        x = mpmath.mpf("0.1")
        s = mpmath.fsum(c * x ** n for n, c in enumerate(cs))
        ref = mpmath.hyp2f1(mpmath.mpf(1) / 2, 1, 2, 4 * x)                  # mpmath.hyp2f1
        assert abs(s - ref) < mpmath.mpf(10) ** -48


def test_value_band_and_refusals():
    for x in ("-1", "-7", "0.2"):
        e = catalan.value(x, Context(dps=25))
        with workdps(50):
            ref = mpmath.hyp2f1(mpmath.mpf(1) / 2, 1, 2, 4 * mpmath.mpf(x))       # mpmath.hyp2f1
            assert e.lower <= ref <= e.upper
            assert e.upper - e.lower < abs(ref) * mpmath.mpf(10) ** -24
    for bad in ("0.25", "1", "1+1j", True, "pi"):
        with pytest.raises(InputError, match="x"):
            catalan.value(bad)
    with pytest.raises(InputError, match="orders"):
        catalan.coefficients(0)


def test_registered_source_builds_truth_and_rebuilds_longer():
    spec = SOURCES["catalan"]
    s = spec.build(None, orders=10)
    assert s.n_terms == 10 and s.is_exact
    assert s.provenance["source"] == "catalan" and s.provenance["orders"] == 10
    # the length declaration: what `evaluate --goal` uses to ask for more terms
    longer = rebuilder_from_provenance(s)(25)
    assert longer.n_terms == 25
    with workdps(30):
        assert [int(mpmath.binomial(2 * n, n)) // (n + 1) for n in range(25)] == list(longer.coefficients)
    (t,) = spec.truth(Context(dps=20), ["-2"])
    with workdps(40):
        ref = mpmath.hyp2f1(mpmath.mpf(1) / 2, 1, 2, -8)                          # mpmath.hyp2f1
        assert t.lower <= ref <= t.upper
    with pytest.raises(InputError, match="at most"):
        spec.build(None, orders=spec.param("orders").maximum + 1)


def test_generate_writes_exact_coefficients(tmp_path):
    out = tmp_path / "cat.json"
    assert main(["generate", "catalan", "--orders", "12", "-o", str(out)]) == 0
    doc = json.loads(out.read_text())
    with workdps(30):
        ref = [str(int(mpmath.binomial(2 * n, n)) // (n + 1)) for n in range(12)]   # mpmath.binomial
    assert doc["coefficients"] == ref
    assert doc["provenance"]["source"] == "catalan" and doc["provenance"]["orders"] == 12


def test_resummed_value_beyond_the_radius_from_20_terms(tmp_path):
    # the Pade route past the radius, on the negative axis (the series diverges at x = -3)
    from resum.resummation import evaluate
    s = SOURCES["catalan"].build(None, orders=20)
    r = evaluate(s, ["-3"], Context(dps=30), method="pade")
    p = r.points[0]
    with workdps(50):
        ref = mpmath.hyp2f1(mpmath.mpf(1) / 2, 1, 2, -12)                         # mpmath.hyp2f1
        assert p.value.lower <= ref <= p.value.upper
        assert p.value.upper - p.value.lower < mpmath.mpf(10) ** -2


FAMILY = """
[study]
name = "catalan-orders"
source = "catalan"
dps = 30
[axes]
orders = { values = [16, 30] }
[tasks.evaluate]
at = ["-3"]
method = "pade"
verify = false
goal_digits = 12
max_terms = 90
[tasks.truth]
at = ["-3"]
"""


def test_family_over_orders_regenerates_through_the_length_parameter(tmp_path):
    # a family spec naming the source; the evaluate task's goal rebuilds the series through
    # `orders` (the source's length), and the truth task reads the closed form
    from pathlib import Path
    from resum.batch import SerialRunner, parse_spec, run_family
    run_family(parse_spec(FAMILY, path="spec.toml"), tmp_path / "o", runner=SerialRunner(), quiet=True,
               plots=False)
    recs = [json.loads(p.read_text()) for p in sorted(Path(tmp_path, "o", "points").glob("*.json"))]
    assert [r["status"] for r in recs] == ["ok", "ok"]
    with workdps(50):
        ref = mpmath.hyp2f1(mpmath.mpf(1) / 2, 1, 2, -12)                         # mpmath.hyp2f1
        for r, orders in zip(recs, (16, 30)):
            search = r["tasks"]["evaluate"]["order_search"]
            assert search["rounds"][0]["terms"] == orders and float(search["rounds"][0]["min_digits"]) < 12
            assert search["reached"] is True and orders < search["terms_used"] <= 90
            v = r["tasks"]["evaluate"]["values"][0]
            assert mpmath.mpf(v["lo"]) <= ref <= mpmath.mpf(v["hi"]) and float(v["digits"]) >= 12
            t = r["tasks"]["truth"]["values"][0]
            assert abs(mpmath.mpf(t["value"]) - ref) < mpmath.mpf(10) ** -28
