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


_VALUE_ERROR = re.compile(r"(-?\d+)\.(\d+)\((\d{1,2})\)")


def _read_value_error(text):
    """(value, half-width, digits of the error) of a 'v(e)' text: the error counts in units of
    the value's last digit (common practice, no source)."""
    m = _VALUE_ERROR.fullmatch(text)
    assert m, text
    whole, decimals, err = m.groups()
    value = mpmath.mpf(f"{whole}.{decimals}")
    return value, int(err) * mpmath.mpf(10) ** -len(decimals), len(err)


def test_strong_secants_print_with_their_bands():
    # sqrt(1 + g^2) has the log-derivative d log f / d log g = g^2/(1 + g^2) (common practice,
    # no source); each secant between neighbouring couplings is computed here from mpmath's
    # values and must lie in the band the diagnostics print, which carries one or two error
    # digits rather than ten digits of the secant
    from resum.estimators.strong_coupling import probe_strong_coupling
    gs = [2, 3, 4, 6, 8, 10, 12]
    with workdps(30):
        f = [mpmath.sqrt(1 + mpmath.mpf(g) ** 2) for g in gs]
        rel = mpmath.mpf("1e-6")
        vals = [Estimate(v * (1 + rel / 3), v * (1 - rel), v * (1 + rel)) for v in f]
        r = probe_strong_coupling(Series([1] * 8, variable="g"), gs, Context(dps=30), values=vals)
        secants = r.diagnostics["secants"]
        assert len(secants) == len(gs) - 1
        for (g1, v1), (g2, v2), (_, text) in zip(zip(gs, f), zip(gs[1:], f[1:]), secants):
            exact = mpmath.log(v2 / v1) / mpmath.log(mpmath.mpf(g2) / g1)
            value, half, _ = _read_value_error(text)
            assert value - half <= exact <= value + half, (text, exact)


def test_plan_radius_and_rim_power_print_with_their_bands():
    # (1 + x)^(-1/2): radius of convergence 1 and growth x^(-1/2) at large x (common practice,
    # no source). The plan's note prints the radius it compares the points with, and the power
    # read at infinity, as value(error) texts whose bands hold these (before: 8 and 5 digits)
    s = binomial_series(Fraction(-1, 2), 30)
    near = evaluate(s, ["0.1"], Context(dps=12), verify=False)
    note = near.diagnostics["why"]
    m = re.search(r"quarter of the radius (-?\d+\.\d+\(\d+\))", note)
    assert m, note
    value, half, _ = _read_value_error(m.group(1))
    assert value - half <= 1 <= value + half and half > 0, note
    far = evaluate(s, ["3"], Context(dps=12), verify=False)
    note = far.diagnostics["why"]
    m = re.search(r"through the map gives (\S+) at infinity", note)
    assert m, note
    value, half, _ = _read_value_error(m.group(1))
    assert value - half <= mpmath.mpf(-1) / 2 <= value + half, note


def test_points_left_out_print_no_more_digits_than_their_bands():
    # log Gamma(1 + x) = -gamma x + sum_{k>=2} (-1)^k zeta(k) x^k / k converges for |x| < 1, its
    # nearest singularity the log point at x = -1 (Abramowitz & Stegun 6.1.33). Points one method
    # alone sees are named in a warning: each part as value(error) or 'v [lo, hi]' when its band
    # supports fewer than six digits, and the confirmed radius beside them holds 1
    with workdps(60):
        c = [mpmath.mpf(0), -mpmath.euler] + [(-1) ** k * mpmath.zeta(k) / k for k in range(2, 60)]
    r = analyze(Series(c), Context(dps=30))
    assert r.radius.contains(1)
    lone = [w for w in r.warnings if w.startswith("not reported:") and "two or more methods" in w]
    assert lone, r.warnings
    m = re.search(r"\(radius (-?\d+\.\d+\(\d+\))\)$", lone[0])
    value, half, _ = _read_value_error(m.group(1))
    assert value - half <= 1 <= value + half, lone[0]
    body = lone[0].split("not reported: ")[1].split(", each seen")[0]
    for item in re.split(r" \([a-z-]+(?: \+ [a-z-]+)*\),? ?", body.replace("points at ", "").replace("a point at ", "")):
        for part in filter(None, re.split(r" [+-] |\*I", item.strip())):
            if "(" in part:
                _read_value_error(part)
            elif "[" not in part and not part.startswith("["):
                assert len(part.lstrip("-").replace(".", "").lstrip("0")) <= 6, (part, lone[0])
