"""The text report of evaluate: the conformal map in words, not as a raw dict."""
import math
from fractions import Fraction

import mpmath

from resum import Series
from resum.context import Context
from resum.report.evaluation_text import describe_map, render_evaluation
from resum.resummation import evaluate
from tests.known_series import binomial_series


def test_ray_map_in_words_with_twelve_digits():
    x0 = "-1.00002309505835963665553700021"
    expected = mpmath.nstr(mpmath.mpf(x0), 12)          # mpmath's rounding to 12 digits
    assert expected == "-1.00002309506"
    assert describe_map({"kind": "ray", "x0": x0}) == f"one cut from x0 = {expected} radially to infinity"
    assert describe_map({"kind": "ray", "x0": x0}, "t").startswith("one cut from t0 = -1.00002309506 ")


def test_arc_map_in_words():
    text = describe_map({"kind": "arc", "s1": "0.25", "s2": "-1.5000000000000000000001"})
    assert text == "one cut joining 0.25 and -1.5 through the far side"


def test_report_has_no_raw_map_dict():
    res = evaluate(binomial_series(Fraction(-1, 3), 30), ["2"], Context(dps=20), method="conformal-pade",
                   verify=False, singularities=[mpmath.mpf("-1.0000000000001")])
    text = render_evaluation(res)
    assert "{'kind'" not in text and "'x0'" not in text
    # the map is said once, in words, on the method line
    assert text.count("one cut from x0 = -1.0 radially to infinity") == 1


def test_borel_plane_map_is_named_as_such():
    # Euler's series sum (-1)^k k! x^k: Borel transform 1/(1 + t), singular at t = -1
    # (common practice, no source)
    s = Series([(-1) ** k * math.factorial(k) for k in range(24)], name="euler")
    res = evaluate(s, ["1/2"], Context(dps=15), method="borel-conformal-pade", verify=False)
    text = render_evaluation(res)
    assert "conformal map of the Borel plane: one cut from t0 = -1.0 radially to infinity" in text
    assert "{'kind'" not in text


def test_complex_point_shows_its_imaginary_part_in_the_value():
    # log(1 + z)/z at z = 3 + 2i (mpmath.log, principal branch; the cut of the series is
    # (-inf, -1]): the imaginary part belongs to the value, not to a lateral-sum ambiguity
    s = Series([Fraction((-1) ** k, k + 1) for k in range(40)])
    res = evaluate(s, ["3+2*I"], Context(dps=20))
    p = res.points[0]
    with mpmath.workdps(40):
        z = mpmath.mpc(3, 2)
        truth = mpmath.log(1 + z) / z
        assert p.value.contains(truth.real) and p.imag.contains(truth.imag)
    text = render_evaluation(res)
    row = next(line for line in text.splitlines() if line.startswith("3.0 + 2.0*I"))
    assert " - i*0.1234453420424" in row            # Im = -0.12344534204242866498...
    assert "lateral" not in text


def test_pair_map_in_words():
    # the words of the report match the map's own description (PairMap.describe)
    from resum.transforms.conformal import ConformalMap, PairMap
    m = PairMap(mpmath.mpc("0.5", "0.8660254037844386467637231707529"))
    d = m.to_dict()
    assert ConformalMap.from_dict(d) == PairMap(mpmath.mpmathify(d["s"]))
    assert describe_map(d) == m.describe()
    assert describe_map(d).endswith("along Re x = 0.5 to infinity")


def test_baseline_column_says_none_when_the_terms_grow_from_the_first():
    # log(1+x)/x = sum (-1)^k x^k/(k+1) at x = 3: |x^k/(k+1)| grows from k = 0 (common practice,
    # no source), so optimal truncation sums nothing; the column must not print 0 +- 1 as a value
    s = Series([Fraction((-1) ** k, k + 1) for k in range(30)])
    res = evaluate(s, ["3", "1/2"], Context(dps=15), method="pade", verify=False)
    rows = [ln for ln in render_evaluation(res).splitlines() if ln.startswith(("3", "0.5"))]
    assert "none (terms grow)" in rows[0] and "none" not in rows[1]
