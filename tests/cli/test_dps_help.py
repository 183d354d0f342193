"""The --dps help text says what the commands do without --dps: the digits each run logs on
stderr ("... at N digits") must be the ones its help names (common practice, no source:
a help text describes the program's behaviour)."""
import re
from fractions import Fraction

import pytest

from resum import Series
from resum.cli import main
from resum.series.io import write_series


def _help(command, capsys):
    assert main([command, "--help"]) == 0
    return " ".join(capsys.readouterr().out.split())


def _digits_logged(capsys):
    err = capsys.readouterr().err
    return int(re.search(r" (\d+) digits", err).group(1))


def test_analyze_help_names_the_digits_of_a_file_with_expressions(tmp_path, capsys):
    f = tmp_path / "e.txt"
    f.write_text("".join(f"pi^{k}/{k + 1}\n" for k in range(20)))
    main(["analyze", str(f), "--methods", "ratio", "--no-verify", "--json"])
    n = _digits_logged(capsys)
    text = _help("analyze", capsys)
    assert "at most 30" not in text
    assert f"such as pi or sqrt(2) carry {n}" in text


def test_analyze_help_rule_for_long_exact_series(tmp_path, capsys):
    # 80 exact terms of 1/(1 - x): the help's "terms/2 + 10" gives 50
    f = write_series(Series([Fraction(1)] * 80), tmp_path / "g.json")
    main(["analyze", str(f), "--methods", "ratio", "--no-verify", "--json"])
    assert _digits_logged(capsys) == 80 // 2 + 10
    assert "terms/2 + 10 if more" in _help("analyze", capsys)


@pytest.mark.parametrize("coeffs,expected", [([1] * 30, 30), (["0.5"] + [1] * 29, 5)])
def test_evaluate_help_default(tmp_path, capsys, coeffs, expected):
    # 1/(1 - x) with exact coefficients, then with one written as a 1-digit decimal
    f = tmp_path / "s.txt"
    f.write_text("".join(f"{c}\n" for c in coeffs))
    main(["evaluate", str(f), "--at", "0.1", "--method", "pade", "--no-verify", "--json"])
    assert _digits_logged(capsys) == expected
    text = _help("evaluate", capsys)
    assert "default 30, fewer (at least 5) when the least precise decimal coefficient" in text
