"""The JSON contract of `resum analyze` / `resum evaluate`, on files in all three formats,
and one-line errors with exit code 2 for bad input. The CLI runs in process via main(argv)."""
import json
import math
from fractions import Fraction

import mpmath
import pytest

from resum import Series
from resum.cli import main
from resum.context import workdps
from resum.series.io import write_series

FORMATS = ["json", "csv", "txt"]


def catalan_series(n=40):
    # generating function of the Catalan numbers, (1 - sqrt(1-4x))/(2x): radius 1/4,
    # square-root branch point, exponent 1/2 (common practice, no source)
    return Series([Fraction(math.comb(2 * k, k), k + 1) for k in range(n)], name="catalan")


def run_json(argv, capsys):
    code = main(argv)
    out = capsys.readouterr().out
    return code, json.loads(out)


def _is_decimal(s):
    assert isinstance(s, str)
    mpmath.mpf(s)
    return True


@pytest.mark.parametrize("ext", FORMATS)
def test_analyze_contract(tmp_path, capsys, ext):
    p = write_series(catalan_series(), tmp_path / f"cat.{ext}")
    code, doc = run_json(["analyze", str(p), "--json", "--no-verify"], capsys)
    assert code in (0, 1)
    r = doc["radius"]
    assert all(_is_decimal(r[k]) for k in ("value", "lo", "hi"))
    assert mpmath.mpf(r["lo"]) <= mpmath.mpf("0.25") <= mpmath.mpf(r["hi"])
    assert mpmath.mpf(r["hi"]) - mpmath.mpf(r["lo"]) < 1e-4
    assert isinstance(doc["warnings"], list)
    near = min(doc["singularities"], key=lambda s: abs(mpmath.mpc(mpmath.mpf(s["re"]), mpmath.mpf(s["im"]))))
    assert _is_decimal(near["re"]) and _is_decimal(near["im"])
    assert abs(mpmath.mpf(near["re"]) - mpmath.mpf("0.25")) < 1e-4
    assert near["kind"] in ("pole", "branch", "log", "essential", "branch-log", "unknown")
    if near["exponent"] is not None:
        e = near["exponent"]
        assert mpmath.mpf(e["lo"]) - 1e-9 <= mpmath.mpf("0.5") <= mpmath.mpf(e["hi"]) + 1e-9


@pytest.mark.parametrize("ext", FORMATS)
def test_evaluate_contract(tmp_path, capsys, ext):
    p = write_series(catalan_series(), tmp_path / f"cat.{ext}")
    code, doc = run_json(["evaluate", str(p), "--at", "0.1", "--at", "1/8", "--json", "--no-verify"],
                         capsys)
    assert code in (0, 1)
    assert isinstance(doc["warnings"], list) and len(doc["values"]) == 2
    with workdps(50):
        for v, x in zip(doc["values"], (mpmath.mpf(1) / 10, mpmath.mpf(1) / 8)):
            for k in ("at", "value", "lo", "hi", "method"):
                assert isinstance(v[k], str)
            truth = (1 - mpmath.sqrt(1 - 4 * x)) / (2 * x)   # closed form of the Catalan g.f.
            assert mpmath.mpf(v["lo"]) <= truth <= mpmath.mpf(v["hi"])
            assert mpmath.mpf(v["hi"]) - mpmath.mpf(v["lo"]) < mpmath.mpf(10) ** -10
            assert abs(mpmath.mpf(v["at"]) - x) < mpmath.mpf(10) ** -25


def test_evaluate_complex_point_is_written_as_two_decimals(tmp_path, capsys):
    # at a complex point "at" is the real part and "at_im" the imaginary part, as "value"/"im"
    p = write_series(catalan_series(), tmp_path / "cat.json")
    code, doc = run_json(["evaluate", str(p), "--at", "0.1+0.05*I", "--at", "0.1", "--json", "--no-verify"],
                         capsys)
    assert code in (0, 1)
    cplx, real = doc["values"]
    assert _is_decimal(cplx["at"]) and _is_decimal(cplx["at_im"]) and "at_im" not in real
    with workdps(50):
        x = mpmath.mpc(mpmath.mpf(cplx["at"]), mpmath.mpf(cplx["at_im"]))
        assert abs(x - mpmath.mpc("0.1", "0.05")) < mpmath.mpf(10) ** -25
        truth = (1 - mpmath.sqrt(1 - 4 * x)) / (2 * x)   # closed form of the Catalan g.f.
        assert mpmath.mpf(cplx["lo"]) <= truth.real <= mpmath.mpf(cplx["hi"])
        assert mpmath.mpf(cplx["im_lo"]) <= truth.imag <= mpmath.mpf(cplx["im_hi"])


def test_evaluate_at_in_coupling(tmp_path, capsys):
    # declared coupling x = g^2: --at takes g
    p = tmp_path / "c.txt"
    p.write_text("coupling: x = g^2\n" + "\n".join(str((-1) ** k) for k in range(30)) + "\n")
    code, doc = run_json(["evaluate", str(p), "--at", "0.5", "--json", "--no-verify"], capsys)
    v = doc["values"][0]
    with workdps(50):
        truth = 1 / (1 + mpmath.mpf(1) / 4)     # 1/(1+x) at x = g^2 = 1/4 (geometric series)
        assert mpmath.mpf(v["lo"]) <= truth <= mpmath.mpf(v["hi"])


BAD_FILES = [
    ("malformed.json", '{"coefficients": ["1",', "malformed JSON"),
    ("unknown.json", '{"coefficients": ["1", "2"], "oops": 1}', "unknown key"),
    ("wrongtype.json", '{"coefficients": {"a": 1}}', "coefficients"),
    ("nan.txt", "1\nnan\n3\n", "not finite"),
    ("zero.csv", "0,0\n1,0\n", "every coefficient is zero"),
    ("refused.txt", "1\nexec(1)\n", "unknown name"),
    ("short.txt", "1\n", "at least"),
]


@pytest.mark.parametrize("cmd", ["analyze", "evaluate"])
@pytest.mark.parametrize("fname, text, needle", BAD_FILES)
def test_bad_input_exit_2_one_line(tmp_path, capsys, cmd, fname, text, needle):
    p = tmp_path / fname
    p.write_text(text)
    argv = [cmd, str(p), "--json"] + (["--at", "0.1"] if cmd == "evaluate" else [])
    assert main(argv) == 2
    cap = capsys.readouterr()
    lines = cap.err.strip().splitlines()
    assert len(lines) == 1 and needle in lines[0] and fname in lines[0]
    assert "Traceback" not in cap.err
    # under --json stdout holds one JSON document, on errors too: the error with the same line
    doc = json.loads(cap.out)
    assert list(doc) == ["error"] and doc["error"]["exit_code"] == "2"
    assert lines[0].endswith(doc["error"]["message"]) and fname in doc["error"]["where"]


@pytest.mark.parametrize("argv,where", [
    (["analyze", "--json"], "FILE"),                                        # FILE missing (argparse)
    (["evaluate", "x.json", "--json", "--at", "1", "--bogus"], "--bogus"),  # unknown option
    (["tour", "--json"], "--json"),                                         # a command without --json
    (["evaluate", "x.json", "--json", "--at", "1", "--method", "nope"], "--method"),
    (["analyze", "x.json", "--json", "--dps", "abc"], "--dps"),
    (["scan", "missing-spec.toml", "-o", "out", "--json"], "missing-spec.toml"),
])
def test_usage_errors_under_json_are_one_json_document(tmp_path, capsys, monkeypatch, argv, where):
    monkeypatch.chdir(tmp_path)
    assert main(argv) == 2
    cap = capsys.readouterr()
    doc = json.loads(cap.out)              # exactly one document, nothing else
    assert doc["error"]["exit_code"] == "2" and doc["error"]["message"]
    # "where" names the option or file (it was empty for the parser's own errors)
    assert where in doc["error"]["where"], doc["error"]
    assert len(cap.err.strip().splitlines()) == 1 and doc["error"]["message"] in cap.err
    assert not (tmp_path / "out").exists()


def test_non_utf8_and_precision_too_low(tmp_path, capsys):
    p = tmp_path / "latin1.txt"
    p.write_bytes(b"1\n2\n\xe93\n")
    assert main(["analyze", str(p)]) == 2
    assert "UTF-8" in capsys.readouterr().err
    q = tmp_path / "short_digits.txt"
    q.write_text("\n".join(["0.3333333333"] * 20) + "\n")
    assert main(["analyze", str(q), "--dps", "30"]) == 2
    err = capsys.readouterr().err
    assert "only 10 digits" in err and "line 1" in err


@pytest.mark.parametrize("ext,field", [("json", "digits"), ("csv", "digits"), ("txt", "digits")])
def test_precision_above_a_digits_declaration_names_the_declaration(tmp_path, capsys, ext, field):
    # a file that declares 'digits: 20' and is asked for 30: the one-line error points at the
    # declaration and does not advise declaring more digits than the file says it carries
    # (common practice, no source)
    with workdps(30):
        s = Series([mpmath.mpf(1) / (k + 3) for k in range(20)], digits=20, name="decl")
    p = write_series(s, tmp_path / f"decl.{ext}")
    assert main(["analyze", str(p), "--dps", "30"]) == 2
    cap = capsys.readouterr()
    lines = cap.err.strip().splitlines()
    assert cap.out == "" and len(lines) == 1 and "Traceback" not in cap.err
    assert f"decl.{ext}: {field}:" in lines[0]
    assert "declares 20 digits" in lines[0] and "at most 20" in lines[0]
    assert "declare 'digits" not in lines[0]


def test_unknown_option_and_method(tmp_path, capsys):
    p = write_series(catalan_series(), tmp_path / "c.json")
    assert main(["analyze", str(p), "--frobnicate"]) == 2
    assert main(["evaluate", str(p), "--at", "0.1", "--method", "no-such-method"]) == 2
    err = capsys.readouterr().err
    assert "no-such-method" in err and "Traceback" not in err


def test_too_few_terms_for_methods(tmp_path, capsys):
    p = tmp_path / "three.txt"
    p.write_text("1\n1\n1\n")
    code = main(["analyze", str(p), "--json"])
    assert code in (1, 2)
    cap = capsys.readouterr()
    if code == 1:
        doc = json.loads(cap.out)
        assert any("term" in w for w in doc["warnings"])


def test_evaluate_json_says_why_a_point_failed(tmp_path, capsys):
    # (1 + x)^(-1/3) has its branch point at x = -1 and its cut along x < -1 (common practice,
    # no source): x = -2 lies on it and cannot be given one value. The failed point is "nan" in
    # the JSON document; the reason must be in its warnings (and on stderr), not only in the
    # text report.
    c, b = [], Fraction(1)
    for k in range(30):
        c.append(b)
        b = b * (Fraction(-1, 3) - k) / (k + 1)
    p = write_series(Series(c, name="cube-root"), tmp_path / "cbrt.json")
    code = main(["evaluate", str(p), "--at", "-2", "--at", "1", "--json", "--no-verify"])
    cap = capsys.readouterr()
    doc = json.loads(cap.out)
    assert code == 1
    bad, good = doc["values"]
    assert bad["value"] == "nan"
    assert any(w.startswith("at -2") and "cut" in w for w in doc["warnings"])
    assert "cut" in cap.err
    with workdps(40):
        truth = mpmath.mpf(2) ** (-mpmath.mpf(1) / 3)          # mpmath reference
        assert mpmath.mpf(good["lo"]) <= truth <= mpmath.mpf(good["hi"])


def test_short_decimals_cap_precision_and_say_so(tmp_path, capsys):
    # 1/sqrt(1 + x) written with short decimals ("-0.5" carries one significant digit): the
    # default run must say which coefficient caps its precision and how to declare it exact;
    # with exact: true the value at x = 2 reaches the default 30 digits (mpmath reference)
    with workdps(40):
        coeffs = [mpmath.nstr(mpmath.binomial(-0.5, k), 40) for k in range(40)]
        truth = 1 / mpmath.sqrt(3)
    p = tmp_path / "short.json"
    p.write_text(json.dumps({"variable": "x", "coefficients": coeffs}))
    code = main(["evaluate", str(p), "--at", "2", "--json", "--no-verify"])
    err = capsys.readouterr().err
    assert code in (0, 1)
    assert "coefficients[1]" in err and "1 significant digit" in err and "exact" in err
    assert main(["analyze", str(p), "--dps", "20"]) == 2
    err = capsys.readouterr().err
    assert "--dps to at most" not in err                  # 1 digit: below the smallest --dps
    assert "exact: true" in err and len(err.strip().splitlines()) == 1
    q = tmp_path / "exact.json"
    q.write_text(json.dumps({"variable": "x", "coefficients": coeffs, "exact": True}))
    code, doc = run_json(["evaluate", str(q), "--at", "2", "--json", "--no-verify"], capsys)
    v = doc["values"][0]
    with workdps(40):
        assert mpmath.mpf(v["lo"]) <= truth <= mpmath.mpf(v["hi"])
        assert mpmath.mpf(v["hi"]) - mpmath.mpf(v["lo"]) < mpmath.mpf(10) ** -25


def test_evaluate_echoes_whole_numbers_as_given(tmp_path, capsys):
    # 1/(1 + x) = sum (-x)^k (geometric series, common practice, no source); Padé is exact here
    p = tmp_path / "geo.txt"
    p.write_text("\n".join(str((-1) ** k) for k in range(20)) + "\n")
    pts = ["3", "-2/4", "1e6", "sqrt(2)", "7/7"]
    argv = ["evaluate", str(p), "--method", "pade", "--json", "--no-verify"]
    for t in pts:
        argv += ["--at", t]
    code, doc = run_json(argv, capsys)
    ats = [v["at"] for v in doc["values"]]
    assert ats[0] == "3" and ats[2] == "1000000" and ats[4] == "1"
    assert ats[1] == "-0.5"
    with workdps(50):
        assert abs(mpmath.mpf(ats[3]) - mpmath.sqrt(2)) < mpmath.mpf(10) ** -28   # 30 digits kept (mpmath)
        for v, x in zip(doc["values"], (3, -0.5, 10 ** 6, mpmath.sqrt(2), 1)):
            truth = 1 / (1 + mpmath.mpf(x))
            assert mpmath.mpf(v["lo"]) <= truth <= mpmath.mpf(v["hi"])


def test_json_numbers_evaluate_at_double_precision(tmp_path, capsys):
    # log(1+x)/x as written by json.dump of Python floats (sum (-1)^k x^k/(k+1), common practice,
    # no source): the doubles' digits, not the one digit of "0.5", limit the value and the
    # optimal-truncation baseline beside it; one note says so (mpmath log as reference)
    p = tmp_path / "floats.json"
    p.write_text(json.dumps({"variable": "x", "coefficients": [(-1) ** k / (k + 1) for k in range(40)]}))
    code = main(["evaluate", str(p), "--at", "0.5", "--no-verify"])
    out, err = capsys.readouterr()
    assert code == 0
    assert err.count("note:") == 1 and "JSON numbers are read as doubles (15 significant digits)" in err
    row = next(line for line in out.splitlines() if line.startswith("0.5 "))
    value, digits, base = row.split()[1:4]
    assert float(digits) >= 13
    with workdps(30):
        truth = mpmath.log(mpmath.mpf("1.5")) / mpmath.mpf("0.5")
        for txt in (value, base):
            v, e = txt.rstrip(")").split("(")
            ulp = mpmath.mpf(10) ** -len(v.split(".")[1])
            assert abs(mpmath.mpf(v) - truth) <= int(e) * ulp
            assert int(e) * ulp < mpmath.mpf(10) ** -12      # 1 digit would be a band of 0.1


def test_evaluate_json_carries_the_optimal_truncation_baseline(tmp_path, capsys):
    # Euler's series sum (-1)^n n! x^n at x = 0.1: optimal truncation stops near n = 1/x = 10 and
    # its error is about the smallest term, sqrt(2 pi / x) e^(-1/x) ~ 3.6e-4 (common practice, no
    # source); the function is e^(1/x) E1(1/x) / x (truth: mpmath.e1). At x = 2 the terms grow
    # from the first and there is no baseline (null).
    s = Series([(-1) ** k * math.factorial(k) for k in range(30)], name="euler")
    p = write_series(s, tmp_path / "euler.json")
    code, doc = run_json(["evaluate", str(p), "--at", "0.1", "--at", "2", "--json", "--no-verify"], capsys)
    assert code in (0, 1)
    near, far = doc["values"]
    t = near["truncation"]
    assert t is not None and set(t) >= {"value", "lo", "hi", "text", "terms", "reached"}
    with workdps(40):
        x = mpmath.mpf(1) / 10
        truth = mpmath.exp(1 / x) * mpmath.e1(1 / x) / x
        assert mpmath.mpf(t["lo"]) <= truth <= mpmath.mpf(t["hi"])
        assert 9 <= int(t["terms"]) <= 12
        assert mpmath.mpf("1e-4") < mpmath.mpf(t["hi"]) - mpmath.mpf(t["lo"]) < mpmath.mpf("2e-3")
        # the resummed band is far narrower than the baseline's, and holds the same truth
        assert mpmath.mpf(near["lo"]) <= truth <= mpmath.mpf(near["hi"])
        assert mpmath.mpf(near["hi"]) - mpmath.mpf(near["lo"]) < mpmath.mpf("1e-10")
    assert far["truncation"] is None
