"""Negative numbers and expressions as option values: '--at -1/2' is a value, '--foo' an error.

The CLI runs in process via main(argv)."""
import json
from fractions import Fraction

import mpmath
import pytest

from resum.cli import build_parser, main
from resum.context import workdps
from resum.series.io import write_series
from tests.known_series import binomial_series


@pytest.mark.parametrize("text", ["-1/2", "-(1/3)", "-.5", "-sqrt(2)/4", "-pi/8", "-log(2)/2",
                                  "-zeta(3)/4", "-catalan/2", "-euler_gamma", "-2", "-0.5"])
def test_negative_expression_is_an_option_value(text):
    args = build_parser().parse_args(["evaluate", "f.json", "--at", text, "--at", "1"])
    assert args.at == [text, "1"]


def test_negative_values_of_other_options():
    p = build_parser()
    assert p.parse_args(["evaluate", "f.json", "--at", "1", "--large-power", "-1/3"]).large_power == "-1/3"
    assert p.parse_args(["strong", "f.json", "--power", "-1/2", "--at", "-sqrt(3)"]).power == "-1/2"
    assert p.parse_args(["generate", "bes", "--angle", "-pi/3", "-o", "x.json"]).angle == "-pi/3"


@pytest.mark.parametrize("argv", [["--at", "1", "--foo"], ["--at", "--foo"], ["--at", "-pizza"],
                                  ["--at", "1", "-x"]])
def test_unknown_options_stay_errors(tmp_path, capsys, argv):
    f = write_series(binomial_series(Fraction(-1, 3), 30), tmp_path / "b.json")
    assert main(["evaluate", str(f)] + argv) == 2
    err = capsys.readouterr().err
    assert len(err.strip().splitlines()) == 1 and "Traceback" not in err


def test_evaluate_at_negative_expressions(tmp_path, capsys):
    f = write_series(binomial_series(Fraction(-1, 3), 30), tmp_path / "b.json")
    code = main(["evaluate", str(f), "--at", "-1/2", "--at", "-sqrt(2)/4", "--large-power", "-1/3",
                 "--json", "--no-verify"])
    doc = json.loads(capsys.readouterr().out)
    assert code == 0
    with workdps(50):
        for row, x in zip(doc["values"], (-mpmath.mpf(1) / 2, -mpmath.sqrt(2) / 4)):
            truth = (1 + x) ** (-mpmath.mpf(1) / 3)        # closed form, mpmath
            assert abs(mpmath.mpf(row["at"]) - x) < mpmath.mpf(10) ** -25
            assert mpmath.mpf(row["lo"]) <= truth <= mpmath.mpf(row["hi"])
            assert mpmath.mpf(row["hi"]) - mpmath.mpf(row["lo"]) < mpmath.mpf(10) ** -10
