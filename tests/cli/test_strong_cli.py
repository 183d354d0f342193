"""`resum strong`: the fitted strong-coupling coefficients of F_0(g) = (2/pi^2) log cosh(2 pi g)
(closed form at angle 0: Belitsky and Korchemsky, arXiv:1907.13131, normalisation from memory;
the sources tests check it order by order) are 4/pi and -2 log 2/pi^2."""
import json

import mpmath

from resum.cli import main
from resum.context import workdps


def test_strong_json_recovers_closed_form(tmp_path, capsys):
    f = tmp_path / "a0.json"
    assert main(["generate", "bes", "--angle", "0", "--loops", "80", "--dps", "50", "-o", str(f)]) == 0
    capsys.readouterr()
    code = main(["strong", str(f), "--json", "--expect", "g^1=4/pi"])
    doc = json.loads(capsys.readouterr().out)
    assert code == 0 and doc["success"]
    coef = dict((k, v) for k, v in doc["coefficients"])
    with workdps(30):
        for label, truth, width in (("g^1", 4 / mpmath.pi, 1e-3), ("g^0", -2 * mpmath.log(2) / mpmath.pi ** 2, 0.05)):
            lo, hi = mpmath.mpf(coef[label]["lo"]), mpmath.mpf(coef[label]["hi"])
            assert lo <= truth <= hi and hi - lo < width


def test_strong_bad_expect_is_input_error(tmp_path, capsys):
    f = tmp_path / "s.txt"
    f.write_text("\n".join(str((-1) ** k) for k in range(20)) + "\n")
    assert main(["strong", str(f), "--expect", "nonsense"]) == 2
    assert "LABEL=VALUE" in capsys.readouterr().err


def test_strong_max_band_lets_less_sharp_values_in(tmp_path, capsys):
    # 40-digit coefficients at a = pi/4 (the cusp anomalous dimension, F ~ 2g - 3 ln2/(2 pi) + ...:
    # Frolov and Tseytlin, hep-th/0204226): with the default 1e-4 relative band only couplings up
    # to g = 4 are sharp enough; --max-band 1e-3 admits larger ones, and the leading coefficient 2
    # stays in its band
    f = tmp_path / "a4.json"
    assert main(["generate", "bes", "--angle", "pi/4", "--loops", "60", "--dps", "40", "-o", str(f)]) == 0
    capsys.readouterr()
    main(["strong", str(f), "--json"])
    tight = json.loads(capsys.readouterr().out)
    code = main(["strong", str(f), "--json", "--max-band", "1e-3"])
    doc = json.loads(capsys.readouterr().out)
    assert code == 0 and doc["success"], doc["message"]
    with workdps(30):
        assert mpmath.mpf(doc["trusted_up_to"]) > mpmath.mpf(tight["trusted_up_to"])
        lead = dict((k, v) for k, v in doc["coefficients"])["g^1"]
        assert mpmath.mpf(lead["lo"]) <= 2 <= mpmath.mpf(lead["hi"])
    assert main(["strong", str(f), "--max-band", "2"]) == 2
    err = capsys.readouterr().err
    assert "--max-band" in err and "between 0 and 1" in err and len(err.strip().splitlines()) == 1


def test_strong_text_names_an_exact_power_as_its_fraction(tmp_path, capsys):
    """(1 + x)^(1/3) = x^(1/3) + x^(-2/3)/3 + ... at large x (binomial series in 1/x, common
    practice, no source): the text report names the power 1/3 as such, rounded or given, not as
    0.3333...3335033, and the leading coefficient's band holds 1."""
    with workdps(40):
        cs = [mpmath.nstr(mpmath.binomial(mpmath.mpf(1) / 3, k), 35) for k in range(40)]
    f = tmp_path / "cbrt.json"
    f.write_text(json.dumps({"variable": "x", "coefficients": cs, "digits": 30}))
    for extra in ([], ["--power", "1/3"]):
        capsys.readouterr()
        assert main(["strong", str(f), "--dps", "20", *extra, "--expect", "x^1/3=1"]) == 0
        out = capsys.readouterr().out
        assert "leading power p = 1/3 " in out, out
        assert "x^(1/3)" in out and "expected 1.0: inside the band" in out, out


def test_strong_plot_and_no_verify(tmp_path, capsys, monkeypatch):
    """(1 + x)^(1/3) from 40 terms (binomial series, common practice, no source): --plot writes
    strong.png (f / x^p against x with the fitted form), --no-verify resums each coupling once
    (evaluate called with verify=False), and the leading coefficient still holds 1."""
    import resum.resummation as rs
    calls = []
    real = rs.evaluate

    def spy(*a, **kw):
        calls.append(kw.get("verify", True))
        return real(*a, **kw)
    monkeypatch.setattr(rs, "evaluate", spy)
    with workdps(40):
        cs = [mpmath.nstr(mpmath.binomial(mpmath.mpf(1) / 3, k), 35) for k in range(40)]
    f = tmp_path / "cbrt.json"
    f.write_text(json.dumps({"variable": "x", "coefficients": cs, "digits": 30}))
    figs = tmp_path / "figs"
    assert main(["strong", str(f), "--dps", "20", "--plot", str(figs), "--no-verify", "--json"]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert calls and not any(calls)
    png = figs / "strong.png"
    assert png.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n" and png.stat().st_size > 10000
    lead = dict((k, v) for k, v in doc["coefficients"])["x^1/3"]
    with workdps(30):
        assert mpmath.mpf(lead["lo"]) <= 1 <= mpmath.mpf(lead["hi"])
    # a folder that is a file is refused before any work
    (tmp_path / "file").write_text("x")
    assert main(["strong", str(f), "--plot", str(tmp_path / "file")]) == 2
    assert "--plot" in capsys.readouterr().err


def test_strong_exponential_option(tmp_path, capsys):
    # a bad --exponential stops before any work with one line; 'never' is recorded in the
    # provenance and leaves no exponential in the report (closed form at angle 0, as above)
    f = tmp_path / "a0.json"
    assert main(["generate", "bes", "--angle", "0", "--loops", "40", "--dps", "50", "-o", str(f)]) == 0
    capsys.readouterr()
    assert main(["strong", str(f), "--exponential", "sometimes"]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and "--exponential" in err[0] and "auto, always, never" in err[0]
    for extra in (["--kappa", "-3"], ["--kappa", "pi", "--exponential", "never"], ["--kappa", "x"]):
        assert main(["strong", str(f), *extra]) == 2
        err = capsys.readouterr().err.strip().splitlines()
        assert len(err) == 1 and "--kappa" in err[0] and "Traceback" not in err[0]
    main(["strong", str(f), "--exponential", "never", "--no-verify", "--json"])
    doc = json.loads(capsys.readouterr().out)
    assert doc["provenance"]["options"]["exponential"] == "never"
    assert "exponential" not in doc["diagnostics"]


def test_strong_reports_the_exponential_rate(tmp_path, capsys):
    # resummed values of F_0 at g = 1 ... 3 see (2/pi^2) log(1 + e^(-4 pi g)) beyond the two
    # powers (closed form above): the fit with e^(-kappa g) is kept and its kappa band holds 4 pi
    f = tmp_path / "a0.json"
    assert main(["generate", "bes", "--angle", "0", "--loops", "50", "--dps", "60", "-o", str(f)]) == 0
    capsys.readouterr()
    at = [a for g in ("1", "1.1", "1.2", "1.3", "1.4", "1.5", "1.6", "1.8", "2", "2.5", "3") for a in ("--at", g)]
    assert main(["strong", str(f), *at, "--max-band", "1e-3", "--no-verify", "--json"]) == 0
    doc = json.loads(capsys.readouterr().out)
    kappa = doc["diagnostics"]["exponential"]["kappa"]
    with workdps(30):
        assert mpmath.mpf(kappa["lo"]) <= 4 * mpmath.pi <= mpmath.mpf(kappa["hi"])
        lead = dict(doc["coefficients"])["g^1"]
        assert mpmath.mpf(lead["lo"]) <= 4 / mpmath.pi <= mpmath.mpf(lead["hi"])
    assert main(["strong", str(f), *at, "--max-band", "1e-3", "--no-verify"]) == 0
    out = capsys.readouterr().out
    assert "plus A e^(-kappa g)" in out and "kappa = " in out and " pi " in out
