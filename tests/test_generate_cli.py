"""The ``resum generate`` subcommand, run in process through ``resum.cli.main``."""
import json

import mpmath
import pytest

from resum.cli import main
from resum.context import workdps


def test_bes_fixed_invocation(tmp_path):
    out = tmp_path / "cusp.json"
    rc = main(["generate", "bes", "--angle", "pi/4", "--loops", "5", "--dps", "40", "-o", str(out)])
    assert rc == 0
    doc = json.loads(out.read_text())
    cs = doc["coefficients"]
    assert len(cs) == 6 and cs[0] == "0"
    assert doc["variable"] == "x"
    assert "g" in doc["coupling"] and "2" in doc["coupling"]
    # cusp anomalous dimension, Beisert-Eden-Staudacher hep-th/0610251 (f = 2F):
    # F = 4 g^2 - 4/3 pi^2 g^4 + 44/45 pi^4 g^6 - 8 (73/630 pi^6 + 4 zeta(3)^2) g^8 + ...
    with workdps(60):
        pi, z3 = mpmath.pi, mpmath.zeta(3)
        ref = [4, -mpmath.mpf(4) / 3 * pi ** 2, mpmath.mpf(44) / 45 * pi ** 4,
               -8 * (mpmath.mpf(73) / 630 * pi ** 6 + 4 * z3 ** 2)]
        for k, r in enumerate(ref, start=1):
            v = mpmath.mpf(cs[k])
            assert abs(v - r) <= abs(r) * mpmath.mpf(10) ** -39
            # written with the digits asked, not more
            digits = len(cs[k].lstrip("-").replace(".", "").lstrip("0").split("e")[0])
            assert digits <= 40
    assert doc["provenance"]["loops"] == 5


def test_angle_as_decimal_and_zero_angle(tmp_path):
    out = tmp_path / "a0.json"
    assert main(["generate", "bes", "--angle", "0", "--loops", "3", "--dps", "20", "-o", str(out)]) == 0
    cs = json.loads(out.read_text())["coefficients"]
    # (2/pi^2) log cosh(2 pi g) = 4 g^2 - 8/3 pi^2 g^4 + ... (Belitsky-Korchemsky arXiv:1907.13131)
    with workdps(30):
        assert abs(mpmath.mpf(cs[2]) + mpmath.mpf(8) / 3 * mpmath.pi ** 2) < mpmath.mpf(10) ** -18


def test_oscillator_and_phi4_exact(tmp_path):
    out = tmp_path / "osc.json"
    assert main(["generate", "oscillator", "--state", "0", "--orders", "4", "-o", str(out)]) == 0
    # Bender-Wu, Phys. Rev. 184 (1969) 1231, converted to H = p^2 + x^2 + g x^4 (see tests/sources)
    assert json.loads(out.read_text())["coefficients"] == ["1", "3/4", "-21/16", "333/64"]
    out = tmp_path / "phi4.txt"
    assert main(["generate", "phi4", "--orders", "3", "-o", str(out)]) == 0
    # <x^4> = 3 under the unit Gaussian: Z = 1 - (3/4) g + (105/32) g^2 (common practice, no source)
    text = out.read_text()
    assert "-3/4" in text and "105/32" in text


def test_bad_input_is_one_line_exit_2(tmp_path, capsys):
    out = tmp_path / "x.json"
    assert main(["generate", "bes", "--angle", "pie/3", "--loops", "5", "-o", str(out)]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and "--angle" in err[0]
    assert not out.exists()
    assert main(["generate", "bes", "--loops", "0", "-o", str(out)]) == 2
    assert main(["generate", "euler", "--sign", "2", "-o", str(out)]) == 2


def test_missing_or_unknown_source(capsys):
    assert main(["generate"]) == 2
    assert "name a source" in capsys.readouterr().err
    assert main(["generate", "nope", "-o", "x.json"]) == 2


def test_exact_flag_stores_exact_forms(tmp_path):
    out = tmp_path / "cusp.json"
    assert main(["generate", "bes", "--angle", "pi/4", "--loops", "4", "--dps", "25", "--exact",
                 "-o", str(out)]) == 0
    prov = json.loads(out.read_text())["provenance"]
    # Beisert-Eden-Staudacher hep-th/0610251, four loops: -8 (73/630 pi^6 + 4 zeta(3)^2)
    assert prov["exact_coefficients"][4] == "-292/315*pi^6 - 32*zeta(3)^2"
    assert prov["exact_cos2"] == "1/2"


@pytest.mark.parametrize("args, option, bound", [
    (["bes", "--loops", "-3"], "--loops", "1"),
    (["bes", "--loops", "0"], "--loops", "1"),
    (["bes", "--loops", "401"], "--loops", "400"),
    (["bes", "--dps", "4"], "--dps", "5"),
    (["bes", "--dps", "100000"], "--dps", "5000"),
    (["oscillator", "--state", "-1"], "--state", "0"),
    (["oscillator", "--orders", "0"], "--orders", "1"),
    (["oscillator", "--orders", "3001"], "--orders", "3000"),
    (["phi4", "--orders", "-2"], "--orders", "1"),
    (["phi4", "--orders", "8001"], "--orders", "8000"),
    (["euler", "--orders", "0"], "--orders", "1"),
    (["catalan", "--orders", "0"], "--orders", "1"),
    (["catalan", "--orders", "20001"], "--orders", "20000"),
])
def test_out_of_range_parameters_name_the_option(tmp_path, capsys, args, option, bound):
    # the limits each source's build function accepts (bes: 1..400 loops, oscillator:
    # 1..3000 orders); a huge --dps or --orders is refused at once instead of running for hours
    out = tmp_path / "x.json"
    assert main(["generate", *args, "-o", str(out)]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1, err
    assert option in err[0] and bound in err[0] and args[-1] in err[0], err[0]
    assert not out.exists() and list(tmp_path.iterdir()) == []


def test_parameter_limits_are_declared_for_every_integer_parameter():
    from resum.sources import SOURCES
    for spec in SOURCES.values():
        for p in spec.params:
            if p.type == "int" and not p.choices:
                assert p.minimum is not None, (spec.name, p.name)


def test_help_shows_the_limits(capsys):
    assert main(["generate", "bes", "--help"]) == 0
    out = " ".join(capsys.readouterr().out.split())
    assert "1..400, default 60" in out and "5..5000" in out


def test_bes_default_digits_serve_the_resummation(tmp_path, capsys):
    # without --dps the kernel family is written with max(30, loops + 10) digits: at 30 digits
    # the rounding of 40 loops' coefficients held resum evaluate at g = 1 to 11 digits; with 50,
    # about 23. Truth at a = 0: (2/pi^2) log cosh(2 pi g) (Belitsky-Korchemsky arXiv:1907.13131).
    out = tmp_path / "a0.json"
    assert main(["generate", "bes", "--angle", "0", "--loops", "40", "-o", str(out)]) == 0
    assert "50 digits, the default for this length" in capsys.readouterr().err
    doc = json.loads(out.read_text())
    assert doc["digits"] == 50
    assert main(["evaluate", str(out), "--at", "1", "--json"]) == 0
    row = json.loads(capsys.readouterr().out)["values"][0]
    with workdps(60):
        truth = 2 / mpmath.pi ** 2 * mpmath.log(mpmath.cosh(2 * mpmath.pi))
        assert mpmath.mpf(row["lo"]) <= truth <= mpmath.mpf(row["hi"])
    assert float(row["digits"]) >= 20
