"""Public API, JSON round trip, input errors and the command line."""
import re
from fractions import Fraction
import json
import math

import mpmath
import pytest

from resum.cli import main
from resum.context import Context, workdps
from resum.errors import InputError
from resum.resummation import METHODS, EvaluationResult, evaluate
from resum.series import Series


def _euler(n=24):
    return Series([(-1) ** k * math.factorial(k) for k in range(n)])


def test_unknown_method_lists_the_valid_ones():
    with pytest.raises(InputError) as exc:
        evaluate(_euler(), ["1"], method="magic")
    for m in METHODS:
        assert m in str(exc.value)
    assert "\n" not in str(exc.value)


@pytest.mark.parametrize("points", [[], ["1/0"], ["abc"], [float("nan")]])
def test_bad_points_are_input_errors(points):
    with pytest.raises(InputError):
        evaluate(_euler(), points)


def test_too_few_terms():
    with pytest.raises(InputError):
        evaluate(Series([1, 1, 1]), ["0.5"])


def test_round_trip_and_contract():
    # log(1+x)/x at x = 3 (outside the disk): truth log(4)/3 from mpmath
    with workdps(50):
        cs = [mpmath.mpf(-1) ** n / (n + 1) for n in range(40)]
    s = Series(cs, digits=45)
    r = evaluate(s, ["3", "1/2"], Context(dps=20), method="pade")
    with workdps(40):
        assert r.points[0].value.contains(mpmath.log(4) / 3)
        assert r.points[1].value.contains(mpmath.log(mpmath.mpf(3) / 2) * 2)
    d = json.loads(json.dumps(r.to_dict()))
    r2 = EvaluationResult.from_dict(d)
    with workdps(40):
        # written with the digits the band supports plus three: equal to well inside the band
        assert abs(r2.points[0].value.value - r.points[0].value.value) < r.points[0].value.error / 100
        assert r2.points[0].value.contains(mpmath.log(4) / 3)
    assert r2.to_dict()["points"][0]["value"] == d["points"][0]["value"]
    cd = r.contract_dict()
    assert set(cd) == {"values", "warnings", "plan", "bands", "how"}
    assert cd["plan"]["method"] == "pade" and cd["plan"]["map"] is None
    assert "not a proof" in cd["bands"] and "median of the three highest-order" in cd["how"]
    for row in cd["values"]:
        assert set(row) - {"terms_needed", "message", "variant"} == {"at", "value", "lo", "hi", "method", "digits",
                                                                    "status", "text", "truncation"}
        assert all(isinstance(v, str) for k, v in row.items() if k != "truncation")
        t = row["truncation"]           # the optimal-truncation baseline: decimal strings too
        assert t is None or all(isinstance(t[k], str) for k in ("value", "lo", "hi", "text", "terms"))
        assert mpmath.mpf(row["lo"]) <= mpmath.mpf(row["value"]) <= mpmath.mpf(row["hi"])
    # the value(error) text: the digits the band supports, and it still holds the truth
    with workdps(40):
        m = re.fullmatch(r"(-?\d+\.(\d+))\((\d+)\)", cd["values"][0]["text"])
        assert m, cd["values"][0]["text"]
        err = mpmath.mpf(m.group(3)) * mpmath.mpf(10) ** -len(m.group(2))
        assert abs(mpmath.mpf(m.group(1)) - mpmath.log(4) / 3) <= err
    assert cd["values"][1]["at"].startswith("0.5")


def test_coupling_points_are_in_g():
    # f(x) = 1/(1+x) with x = g^2: evaluating at g = 2 means x = 4 -> 1/5 (exact rational function)
    s = Series([(-1) ** n for n in range(20)], coupling=__import__("resum").Coupling("g", 2, 1))
    r = evaluate(s, ["2"], Context(dps=20), method="pade", verify=False)
    with workdps(40):
        assert r.points[0].value.contains(mpmath.mpf(1) / 5)
        assert r.points[0].x == 4
    assert r.contract_dict()["values"][0]["at"].startswith("2")


def test_partial_sum_inside_the_disk():
    # geometric series at x = 0.1: 1/(1 - x) (common practice, no source)
    s = Series([1] * 60)
    r = evaluate(s, ["0.1"], Context(dps=20), method="partial-sum", verify=False)
    with workdps(40):
        assert r.points[0].value.contains(mpmath.mpf(10) / 9)
        assert r.points[0].value.digits() >= 19


def test_cli_text_json_and_exit_codes(tmp_path, capsys):
    f = tmp_path / "euler.txt"
    f.write_text("\n".join(str((-1) ** n * math.factorial(n)) for n in range(24)) + "\n")
    ref = tmp_path / "ref.txt"
    with workdps(40):
        v = mpmath.e * mpmath.e1(1)          # Euler sum at x = 1 (mpmath exponential integral)
        ref.write_text(f"# at value\n1 {mpmath.nstr(v, 30)}\n")
    assert main(["evaluate", str(f), "--at", "1", "--reference", str(ref), "--no-verify",
                 "--dps", "20"]) == 0
    out = capsys.readouterr().out
    assert "optimal truncation" in out and "inside the band" in out and "What the band means" in out
    assert main(["evaluate", str(f), "--at", "1", "--at", "1/2", "--json", "--no-verify", "--dps", "20"]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert [r["method"] for r in doc["values"]] == ["borel-ode"] * 2     # exact Euler series: its Borel
    # transform 1/(1+t) obeys a first-order equation, which auto follows
    assert main(["evaluate", str(f), "--at", "1", "--method", "nope"]) == 2
    assert "nope" in capsys.readouterr().err
    assert main(["evaluate", str(f), "--at", "x+"]) == 2


def test_cli_plot(tmp_path, capsys):
    pytest.importorskip("matplotlib")
    f = tmp_path / "euler.txt"
    f.write_text("\n".join(str((-1) ** n * math.factorial(n)) for n in range(20)) + "\n")
    out = tmp_path / "plots"
    assert main(["evaluate", str(f), "--at", "0.5", "--at", "1", "--no-verify", "--dps", "15",
                 "--plot", str(out), "--curve", "3"]) == 0
    assert (out / "evaluation.png").exists() and (out / "borel_plane.png").exists()
    assert "resummed curve at 3 points" in capsys.readouterr().err
    # the curve belongs to the figure; its count is a whole number
    assert main(["evaluate", str(f), "--at", "1", "--curve", "3"]) == 2
    assert "--curve" in capsys.readouterr().err
    assert main(["evaluate", str(f), "--at", "1", "--curve", "-1", "--plot", str(out)]) == 2
    assert "whole number" in capsys.readouterr().err


def test_plan_analysis_reused_for_the_same_series(monkeypatch):
    """A second evaluate of the same (immutable) Series at the same digits plans from the same
    analysis instead of running it again; another Series object gets its own. The values are
    log(1+x)/x (mpmath log1p) within their bands either way (common practice, no source)."""
    import resum.analysis as A
    from fractions import Fraction
    calls = []
    real = A.analyze

    def counting(*a, **k):
        calls.append(1)
        return real(*a, **k)
    monkeypatch.setattr(A, "analyze", counting)
    s = Series([Fraction((-1) ** k, k + 1) for k in range(30)])
    ctx = Context(dps=15)
    r1 = evaluate(s, ["2"], ctx, verify=False)
    r2 = evaluate(s, ["3"], ctx, verify=False)
    assert len(calls) == 1
    evaluate(Series([Fraction((-1) ** k, k + 1) for k in range(30)]), ["3"], ctx, verify=False)
    assert len(calls) == 2
    with workdps(30):
        for r, x in ((r1, 2), (r2, 3)):
            assert r.points[0].value.contains(mpmath.log1p(x) / x)


def test_digits_asked_beyond_the_coefficients_are_lowered_with_a_warning():
    # geometric series 1/(1 - x) (common practice, no source) with coefficients declared to 10
    # digits, 30 asked: the command line refuses this; from Python the digits are lowered and
    # the result says so
    r = evaluate(Series([mpmath.mpf(1)] * 20, digits=10), ["0.5"], Context(dps=30))
    assert any("30 digits asked, but the coefficients carry 10" in w for w in r.warnings)
    assert r.points[0].value.contains(2) and r.points[0].value.digits() <= 11


def test_round_trip_at_a_complex_point():
    # a complex point was written as "2.0+1.0j" and from_dict handed that text to mpmath.mpc,
    # which cannot parse it (ValueError). log(1+x)/x at x = 2 + i from mpmath.log (reference
    # library); the branch cut of log(1+x) is x < -1, far from the point
    with workdps(50):
        cs = [mpmath.mpf(-1) ** n / (n + 1) for n in range(40)]
    s = Series(cs, digits=45)
    r = evaluate(s, ["2+1*I"], Context(dps=20), method="pade", verify=False)
    r2 = EvaluationResult.from_dict(json.loads(json.dumps(r.to_dict())))
    assert isinstance(r2.points[0].at, mpmath.mpc) and r2.points[0].at == mpmath.mpc(2, 1)
    with workdps(40):
        x = mpmath.mpc(2, 1)
        truth = mpmath.log(1 + x) / x
        assert r2.points[0].value.contains(truth.real)
        assert r2.points[0].imag.contains(truth.imag)
    assert r2.to_dict() == r.to_dict()


def test_a_refusal_is_worded_in_the_series_variable():
    # sec(v) (mpmath's Taylor coefficients; poles at +-pi/2, common practice, no source) from 60
    # terms at v = 50: beyond the poles the approximants resolve. The message used to say
    # "|x| < ..." for a series in v
    import mpmath
    from resum import Context, Series, evaluate
    with mpmath.workdps(40):
        c = [(+x if k % 2 == 0 else 0) for k, x in enumerate(mpmath.taylor(mpmath.sec, 0, 59))]
    r = evaluate(Series(c, variable="v", digits=30), ["50"], Context(dps=20))
    p = r.points[0]
    assert not p.success and p.value is None
    assert p.message.startswith("v = 50") and "|v| <" in p.message and "|x|" not in p.message
    assert "|v| <" in r.diagnostics["why"] and "|x|" not in r.diagnostics["why"]


def test_rational_points_keep_every_digit():
    """A point given as a rational ("1/3" or Fraction(1, 3)) is rounded at the working precision,
    not at mpmath's ambient 15 digits (which moved it by 1e-17 and the value out of its band):
    log(1+x)/x from 40 exact terms at x = 1/3 holds 3 log(4/3) (closed form, mpmath) within a
    band of 30 digits."""
    s = Series([Fraction((-1) ** n, n + 1) for n in range(40)])
    r = evaluate(s, ["1/3", Fraction(1, 3)], Context(dps=30), method="pade", verify=False)
    with workdps(50):
        truth = 3 * mpmath.log(mpmath.mpf(4) / 3)
        for p in r.points:
            assert abs(p.at - mpmath.mpf(1) / 3) < mpmath.mpf(10) ** -45
            assert p.value.contains(truth)
            assert p.value.error < mpmath.mpf(10) ** -28
