"""What the text reports print: no digit that was not computed or that the band does not support.

The rule checked throughout: a number rounded to n significant figures is written with n
significant figures, no more (common practice, no source). Python's own ``format(x, '.ng')``
is the outside reference for that rounding.
"""
import re
from fractions import Fraction

import mpmath
import pytest

from resum import Series
from resum.analysis import analyze
from resum.context import Context, workdps
from resum.report.analysis_text import render_analysis
from resum.report.evaluation_text import render_evaluation
from resum.results import Estimate, format_value_error, sig_text
from resum.resummation import evaluate
from tests.known_series import binomial_series


@pytest.mark.parametrize("x, n", [(28.1, 2), (48.8, 2), (11.0, 2), (99.0, 2), (123.4, 3), (6.13, 2),
                                  (0.0039, 2), (-28.1, 2), (9.96, 2), (15 / 19, 3), (26 / 30, 3)])
def test_sig_text_matches_python_rounding(x, n):
    # Python's general format rounds to n significant figures and writes no more
    assert sig_text(x, n) == format(x, f".{n}g")


def test_band_ends_show_no_uncomputed_digit():
    # a band wider than its value prints the value with two digits and the ends explicitly;
    # the ends to two significant figures: 11 and 99, not 11.0 and 99.0
    text = format_value_error(1, 0, 11)
    assert text.endswith(f"[0, {format(11.0, '.2g')}]"), text
    text = format_value_error(mpmath.mpf("0.5"), -1, 99)
    assert "99.0" not in text and text.endswith(f", {format(99.0, '.2g')}]"), text


def test_verification_never_claims_more_digits_than_the_run_worked_with():
    # log(1 + x)/x = sum (-1)^n x^n/(n + 1): radius 1 (common practice, no source). At 20 digits
    # the rerun at 40 agreed to about 35 digits; two runs cannot confirm digits beyond the 20
    # the first one computed with (common practice, no source)
    s = Series([Fraction((-1) ** n, n + 1) for n in range(40)])
    r = analyze(s, Context(dps=20))
    assert r.radius.contains(1)
    text = render_analysis(r)
    block = text.split("verification (digits agreeing with the reruns):")[1].split("\n\n")[0]
    for line in block.strip().splitlines():
        tail = line.split("radius ")[1]
        if tail.startswith("all"):
            assert tail in ("all", "all 20 working digits"), line
        else:
            assert float(tail) <= 20, line


def test_rim_threshold_is_printed_to_three_digits():
    # (1 + x)^(-1/2) from 30 terms through the auto plan: the large-x power is read from the
    # series and divided out from |w| >= 1 - 4/30 (the plan's rule); printed as Python rounds
    # 26/30 to three significant figures, not as a float with 16 digits
    s = binomial_series(Fraction(-1, 2), 30)
    res = evaluate(s, ["3"], Context(dps=12), verify=False)
    with workdps(30):
        truth = 1 / mpmath.sqrt(4)     # (1 + 3)^(-1/2)
    assert res.points[0].value.contains(truth)
    text = render_evaluation(res)
    thresholds = re.findall(r"\|w\| >= ([0-9.]+)", text)
    assert format(26 / 30, ".3g") in thresholds, thresholds
    assert all(len(t.replace("0.", "", 1)) <= 3 for t in thresholds), thresholds


def test_strong_power_source_prints_the_log_derivative_with_its_band():
    # the closed form (2/pi^2) log cosh(2 pi g) grows like 4 g/pi: leading power 1 (the a = 0
    # kernel quantity; see tests/resummation/test_strong.py for the source). The power read from
    # the values is printed as value(error) whose band holds 1, with one or two error digits
    from resum.estimators.strong_coupling import probe_strong_coupling
    from resum.sources.bes import weak_coupling_series
    s = weak_coupling_series("0", 20, Context(dps=40))
    gs = [2, 3, 4, 6, 8, 10]
    with workdps(30):
        vals = []
        for g in gs:
            v = 2 / mpmath.pi ** 2 * mpmath.log(mpmath.cosh(2 * mpmath.pi * g))
            vals.append(Estimate(v, v - mpmath.mpf(10) ** -20, v + mpmath.mpf(10) ** -20))
    r = probe_strong_coupling(s, couplings=gs, ctx=Context(dps=30), values=vals)
    m = re.search(r"log-derivative (-?\d+)\.(\d+)\((\d+)\)", r.power_source)
    assert m, r.power_source
    whole, decimals, err = m.groups()
    assert 1 <= len(err) <= 2
    unit = mpmath.mpf(10) ** -len(decimals)
    value = mpmath.mpf(f"{whole}.{decimals}")
    assert value - int(err) * unit <= 1 <= value + int(err) * unit, r.power_source
