"""The LaTeX renderings: value(error) with only the digits a band supports, and the family
summary table (summary.tex) beside summary.csv.

The value(error) notation (error in units of the last digit shown) is common practice, no
source; the checks below read the printed text back and compare it with the band."""
import re

import mpmath
import pytest

from resum.cli import main
from resum.report.latex import estimate_tex, label_tex


def _read_back(tex):
    """(value, error) of ``$v(e)$`` or ``$v(e)\\times 10^{k}$``."""
    m = re.fullmatch(r"\$(-?\d+)(?:\.(\d+))?\((\d+)\)(?:\\times 10\^\{(-?\d+)\})?\$", tex)
    assert m, tex
    dec = m.group(2) or ""
    scale = mpmath.mpf(10) ** (int(m.group(4) or 0) - len(dec))
    return mpmath.mpf(m.group(1) + dec) * scale, int(m.group(3)) * scale


@pytest.mark.parametrize("value, lo, hi", [
    ("0.06250010", "0.0624898", "0.0625103"),
    ("1.23456789e-7", "1.2340e-7", "1.2351e-7"),
    ("-0.330952", "-0.3319", "-0.3300"),
    ("2.406018104123", "2.406018100", "2.406018108"),
    ("123456789.5", "123456780", "123456799"),
])
def test_value_error_claims_no_more_than_the_band(value, lo, hi):
    """The printed error is the band's half-width to within a factor 10 (no digit more than
    the band supports), and the printed value lies within it of the value given."""
    v, e = _read_back(estimate_tex(value, lo, hi))
    with mpmath.workdps(40):
        half = (mpmath.mpf(hi) - mpmath.mpf(lo)) / 2
        assert half / 10 <= e <= 10 * half
        assert abs(v - mpmath.mpf(value)) <= e


def test_labels_and_empty_values():
    assert label_tex("3*pi/8") == "$3\\pi/8$"
    assert label_tex("pi/2") == "$\\pi/2$"
    assert label_tex("ground") == "ground"          # a word stays text
    assert label_tex("a_b") == "a\\_b"
    assert estimate_tex(None) == "" and estimate_tex("nan", "1", "2") == ""
    assert estimate_tex("2", "2", "2") == "$2.0$"


def test_family_run_writes_the_latex_table(tmp_path, capsys):
    """A family run over angles written as expressions: summary.tex has one row per point, the
    angle as the spec wrote it, every band as value(error); the value at g = 1 for a = 0 holds
    (2/pi^2) log cosh(2 pi) (Belitsky and Korchemsky, arXiv:1907.13131; mpmath)."""
    spec = tmp_path / "s.toml"
    spec.write_text('[study]\nname = "demo"\nsource = "bes"\ndps = 30\n[fixed]\nloops = 30\ndps = 50\n'
                    '[axes]\nangle = { values = [0, "pi/8"] }\n'
                    '[tasks.evaluate]\nat = [1]\nverify = false\n')
    assert main(["scan", str(spec), "-o", str(tmp_path / "out"), "--jobs", "1"]) == 0, capsys.readouterr().err
    tex = (tmp_path / "out" / "summary.tex").read_text()
    assert "\\toprule" in tex and "\\bottomrule" in tex and "not a proof" in tex
    rows = [ln for ln in tex.splitlines() if ln.endswith("\\\\") and ln.startswith("$")]
    assert [r.split(" & ")[0] for r in rows] == ["$0$", "$\\pi/8$"]
    v, e = _read_back(rows[0].split(" & ")[1].rstrip(" \\"))
    with mpmath.workdps(40):
        truth = 2 / mpmath.pi ** 2 * mpmath.log(mpmath.cosh(2 * mpmath.pi))
        assert abs(v - truth) <= e
