"""Two-point approximants: the weak-coupling series at w = 0 and known strong-coupling terms at
w = 1 (resum.estimators.resum_twopoint, the variant "two-point" of conformal-Padé).

Test function: F(g) = (2/pi^2) log cosh(2 pi g), a series in x = g^2 whose coefficients follow
from the Taylor series of log cosh through Bernoulli numbers (common practice, no source), with
branch points at x = -(2k+1)^2/16 on the negative axis and the strong-coupling form
F = (4/pi) g - 2 log 2/pi^2 + (2/pi^2) log(1 + exp(-4 pi g)) (every power of 1/g after the
constant vanishes). Truth: the closed form through mpmath. (This is the a = 0 member of the
kernel family, Belitsky and Korchemsky, arXiv:1907.13131.)
"""
import json

import mpmath
import pytest
from mpmath import mpf

from resum.cli import main
from resum.context import Context, workdps
from resum.errors import InputError
from resum.resummation import evaluate
from resum.series import Series
from resum.series.io import write_series

N = 60
STRONG = {"1": "4/pi", "0": "-2*log(2)/pi^2", "-1": "0", "-2": "0"}


def _logcosh_series():
    with workdps(120):
        c = [mpf(0)] + [2 / mpmath.pi ** 2 * 2 ** (2 * n) * (2 ** (2 * n) - 1) * mpmath.bernoulli(2 * n)
                        * (4 * mpmath.pi ** 2) ** n / (2 * n * mpmath.factorial(2 * n)) for n in range(1, N)]
        return Series(c, digits=110, coupling="x = g^2")


def _truth(g):
    with workdps(50):
        return 2 / mpmath.pi ** 2 * mpmath.log(mpmath.cosh(2 * mpmath.pi * mpf(g)))


def _digits(est, truth):
    with workdps(50):
        return float(-mpmath.log10(abs(est.value - truth) / truth))


def test_strong_terms_extend_the_reach():
    """At g = 20 (|w| = 0.975) the 60-term series alone gives about 5 digits; with the four
    strong-coupling terms known the two-point variant is kept and gives at least 10 (11.7
    measured), its band holding the truth; at g = 0.5 nothing changes."""
    s = _logcosh_series()
    plain = evaluate(s, ["0.5", "20"], Context(dps=30))
    two = evaluate(s, ["0.5", "20"], Context(dps=30), strong_terms=STRONG)
    for r in (plain, two):
        for p, g in zip(r.points, ("0.5", "20")):
            assert p.value.contains(_truth(g))
    assert two.points[0].value.value == plain.points[0].value.value
    p = two.points[1]
    assert p.diagnostics["variant"] == "two-point"
    assert _digits(p.value, _truth(20)) >= 10
    assert _digits(p.value, _truth(20)) >= _digits(plain.points[1].value, _truth(20)) + 4
    assert "two-point approximants" in two.provenance.options["why"]


@pytest.mark.parametrize("terms, words", [
    ({"1": "4/pi", "-1": "0"}, "consecutive"),
    ({"1/3": "1"}, "multiple of 1/2"),
    ({"1": "1+I"}, "real"),
])
def test_bad_strong_terms_are_refused(terms, words):
    with pytest.raises(InputError, match=words):
        evaluate(_logcosh_series(), ["20"], Context(dps=20), strong_terms=terms, verify=False)


def test_strong_terms_on_the_command_line(tmp_path, capsys):
    """--strong-term LABEL=VALUE (labels in the file's coupling): the JSON row names the
    two-point variant and its band holds the truth; a label in another variable or a gap in the
    powers is a one-line input error naming the option."""
    f = write_series(_logcosh_series(), tmp_path / "lc.json")
    args = ["evaluate", str(f), "--at", "20", "--json"]
    terms = [a for k, v in STRONG.items() for a in ("--strong-term", f"g^{k}={v}")]
    assert main(args + terms) == 0
    row = json.loads(capsys.readouterr().out)["values"][0]
    assert row["variant"] == "two-point"
    with workdps(50):
        assert mpf(row["lo"]) <= _truth(20) <= mpf(row["hi"])
    for bad, where in ((["--strong-term", "x^1=2"], "--strong-term"),
                       (["--strong-term", "g^1=4/pi", "--strong-term", "g^-1=0"], "--strong-term"),
                       (["--strong-term", "g^1=zz"], "--strong-term g^1")):
        assert main(args + bad) == 2
        err = capsys.readouterr().err
        assert len(err.strip().splitlines()) == 1 and where in err and "Traceback" not in err


def test_family_spec_takes_strong_terms(tmp_path, capsys):
    """The spec's evaluate task takes strong_terms = {"g^1" = ..., "g^0" = ...} (checked before any
    work: a key that is no power is refused, naming it); each point's value at g = 20 then comes
    from the two-point variant and holds the closed form."""
    spec = tmp_path / "s.toml"
    body = ('[study]\nname = "t"\nsource = "bes"\ndps = 30\n[fixed]\nangle = 0\ndps = 60\n'
            '[axes]\nloops = { values = [30, 40] }\n[tasks.evaluate]\nat = [20]\nverify = false\n')
    spec.write_text(body + 'strong_terms = { "g^1" = "4/pi", "gg" = 1 }\n')
    assert main(["scan", str(spec), "-o", str(tmp_path / "bad"), "--jobs", "1"]) == 2
    assert "strong_terms" in capsys.readouterr().err
    spec.write_text(body + 'strong_terms = { "g^1" = "4/pi", "g^0" = "-2*log(2)/pi^2", "g^-1" = 0 }\n')
    assert main(["scan", str(spec), "-o", str(tmp_path / "out"), "--jobs", "1"]) == 0, capsys.readouterr().err
    recs = sorted((tmp_path / "out" / "points").glob("*.json"))
    assert len(recs) == 2
    for p in recs:
        row = json.loads(p.read_text())["tasks"]["evaluate"]["values"][0]
        assert row["variant"] == "two-point"
        with workdps(50):
            assert mpf(row["lo"]) <= _truth(20) <= mpf(row["hi"])


def test_decimal_strong_terms_carry_their_digits():
    """Terms written as decimals carry the digits they show (half a unit in the last one): 4/pi
    and -2 log2/pi^2 to 6 digits move the value at g = 20 by about 1e-6 relative, and the band
    (the same terms moved by that uncertainty) covers it; to 12 digits the band is narrower."""
    s = _logcosh_series()
    t = _truth(20)
    six = evaluate(s, ["20"], Context(dps=30), strong_terms={"1": "1.27324", "0": "-0.140461"}).points[0]
    twelve = evaluate(s, ["20"], Context(dps=30),
                      strong_terms={"1": "1.27323954474", "0": "-0.140460958400"}).points[0]
    for p in (six, twelve):
        assert p.diagnostics["variant"] == "two-point"
        assert p.value.contains(t)
        assert float(p.diagnostics["strong_terms_uncertainty"]) > 0
    u6, u12 = (float(p.diagnostics["strong_terms_uncertainty"]) for p in (six, twelve))
    assert u6 > 1e4 * u12 and six.value.error >= u6 and six.value.error > 5 * twelve.value.error
    assert _digits(six.value, t) < 8              # the terms' digits, not the series', limit it


def test_strong_terms_at_odds_with_the_series_are_flagged():
    """A leading coefficient 1e-4 too large (4/pi * 1.0001, three terms, 60 terms of the series)
    puts the two-point value at g = sqrt(6250) (x = 6250) 3.7 half-widths outside the band of
    the approximants that do not use it: the result says so, and the band kept holds the truth.
    (At g = 20 the wrong term scatters the two-point approximants instead, and their band loses
    to the others'.)"""
    s = _logcosh_series()
    r = evaluate(s, ["sqrt(6250)"], Context(dps=30),
                 strong_terms={"1": "4/pi*10001/10000", "0": "-2*log(2)/pi^2", "-1": "0"})
    with workdps(50):
        assert r.points[0].value.contains(_truth(mpmath.sqrt(6250)))
    assert any("Check the terms given" in w for w in r.warnings)


def test_family_strong_terms_may_name_the_parameters(tmp_path, capsys):
    """A spec's strong_terms may be expressions in the family's parameters, evaluated per point:
    over the angle a in {0, pi/4} of the kernel family (60 loops), terms that equal the closed
    form's (4/pi, -2 log2/pi^2, 0) at a = 0 and the cusp's published 2, -3 ln2/(2 pi), -K/(8 pi^2)
    at a = pi/4 (Frolov and Tseytlin, hep-th/0204226; Roiban and Tseytlin, arXiv:0709.0681),
    written as lines in a; each point's value at g = 20 is then two-point and holds its truth
    (a = 0: the closed form; a = pi/4: the source's finite-coupling solver, an independent
    computation). A misspelt name is refused before any work, the parameters named."""
    from resum.sources.bes import finite_coupling
    spec = tmp_path / "s.toml"
    body = ('[study]\nname = "t"\nsource = "bes"\ndps = 30\n[fixed]\nloops = 60\ndps = 60\n'
            '[axes]\nangle = { values = [0, "pi/4"] }\n[tasks.evaluate]\nat = [20]\nverify = false\n')
    spec.write_text(body + 'strong_terms = { "g^1" = "4/pi + (2 - 4/pi)*4*angel/pi" }\n')
    assert main(["scan", str(spec), "-o", str(tmp_path / "bad"), "--jobs", "1"]) == 2
    err = capsys.readouterr().err
    assert "angel" in err and "angle" in err
    spec.write_text(body + 'strong_terms = { "g^1" = "4/pi + (2 - 4/pi)*4*angle/pi", '
                           '"g^0" = "-2*log(2)/pi^2 + (2*log(2)/pi^2 - 3*log(2)/(2*pi))*4*angle/pi", '
                           '"g^-1" = "-catalan/(8*pi^2)*4*angle/pi" }\n')
    assert main(["scan", str(spec), "-o", str(tmp_path / "out"), "--jobs", "1"]) == 0, capsys.readouterr().err
    recs = [json.loads(p.read_text()) for p in sorted((tmp_path / "out" / "points").glob("*.json"))]
    assert len(recs) == 2
    with workdps(40):
        truths = {"0": _truth(20), "pi/4": finite_coupling(20, "pi/4", digits=20).value.value}
    for rec in recs:
        a = "0" if mpf(rec["params"]["angle"]) == 0 else "pi/4"
        row = rec["tasks"]["evaluate"]["values"][0]
        assert row["variant"] == "two-point"
        with workdps(40):
            assert mpf(row["lo"]) <= truths[a] <= mpf(row["hi"]), (a, row)


def test_strong_terms_as_value_error(tmp_path, capsys):
    """A term in the value(error) notation resum prints (what `resum strong` reports, e.g. a
    fitted coefficient) is that band: 4/pi and -2 log2/pi^2 given as 1.273240(1) and
    -0.1404610(1) on the command line give a two-point value at g = 20 whose band holds the
    closed form and is at least the change the terms' errors make. (With errors of 5e-4 the
    two-point band is wider than the series' own, and the direct variant is kept.)"""
    from resum.results import Estimate, parse_value_error
    f = write_series(_logcosh_series(), tmp_path / "lc.json")
    assert main(["evaluate", str(f), "--at", "20", "--json", "--strong-term", "g^1=1.273240(1)",
                 "--strong-term", "g^0=-0.1404610(1)"]) == 0
    row = json.loads(capsys.readouterr().out)["values"][0]
    assert row["variant"] == "two-point"
    with workdps(50):
        assert mpf(row["lo"]) <= _truth(20) <= mpf(row["hi"])
        # the terms' errors alone move F(20) = (4/pi) 20 - ... by about 20 * 1e-6 = 2e-5
        assert mpf(row["hi"]) - mpf(row["lo"]) > mpf("2e-5")
    # the notation read back is the band printed (common practice, no source)
    with workdps(30):
        e = Estimate(mpf("-1.23456e-7"), mpf("-1.23466e-7"), mpf("-1.23446e-7"))
        back = parse_value_error(str(e))
        assert back is not None and abs(back.value - e.value) < mpf("1e-20")
        assert abs(back.error - e.error) <= mpf("1e-12")
    assert parse_value_error("1.5") is None and parse_value_error("4/pi") is None
    assert parse_value_error("(3)") is None
    with workdps(30):
        assert abs(parse_value_error("-.5(1)").error - mpf("0.1")) < mpf("1e-25")
