"""The text report of evaluate: the conformal map in words, not as a raw dict."""
import math
from fractions import Fraction

import mpmath

from resum import Series
from resum.context import Context
from resum.report.evaluation_text import describe_map, render_evaluation
from resum.resummation import evaluate


def test_ray_map_in_words_with_twelve_digits():
    x0 = "-1.00002309505835963665553700021"
    expected = mpmath.nstr(mpmath.mpf(x0), 12)          # mpmath's rounding to 12 digits
    assert expected == "-1.00002309506"
    assert describe_map({"kind": "ray", "x0": x0}) == f"one cut from x0 = {expected} radially to infinity"
    assert describe_map({"kind": "ray", "x0": x0}, "t").startswith("one cut from t0 = -1.00002309506 ")


def test_arc_map_in_words():
    text = describe_map({"kind": "arc", "s1": "0.25", "s2": "-1.5000000000000000000001"})
    assert text == "one cut joining 0.25 and -1.5 through the far side"


def _binomial(p, n):
    # (1 + x)^p = sum binom(p, k) x^k, one cut (-inf, -1] (common practice, no source)
    c = [Fraction(1)]
    for k in range(1, n):
        c.append(c[-1] * (p - (k - 1)) / k)
    return Series(c, name="binomial")


def test_report_has_no_raw_map_dict():
    res = evaluate(_binomial(Fraction(-1, 3), 30), ["2"], Context(dps=20), method="conformal-pade",
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
