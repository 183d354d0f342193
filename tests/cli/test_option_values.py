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


def test_at_ranges_expand_to_evenly_spaced_or_geometric_points():
    """--at START:STOP:N (both ends included) and START:STOP:N:log (common practice, no
    source); the ends may be expressions and keep every digit; malformed ranges are one-line
    input errors naming the option."""
    from resum.commands._common import expand_points
    from resum.errors import InputError
    with workdps(40):
        pts = expand_points(["-1:1:5", "2"], 40)
        assert [float(p) for p in pts] == [-1.0, -0.5, 0.0, 0.5, 1.0, 2.0]
        pts = expand_points(["1:1000:4:log"], 40)
        assert pts[0] == 1 and pts[-1] == 1000 and abs(pts[1] - 10) < mpmath.mpf(10) ** -35
        pts = expand_points(["pi/4:pi:4"], 40)
        assert abs(pts[0] - mpmath.pi / 4) < mpmath.mpf(10) ** -38 and abs(pts[-1] - mpmath.pi) < mpmath.mpf(10) ** -38
    for bad, needle in (("1:2", "START:STOP:N"), ("1:2:1", "from 2 to"), ("0:1:3:log", "positive"),
                        ("1:2:3:lin", "START:STOP:N"), ("1:zz:3", "zz")):
        with pytest.raises(InputError) as exc:
            expand_points([bad], 30)
        assert needle in str(exc.value) and "--at" in str(exc.value)


def test_at_range_on_the_command_line(tmp_path, capsys):
    """log(1+x)/x from 40 exact terms at three points of a range: each value is mpmath's
    log1p(x)/x within its band (common practice, no source)."""
    f = tmp_path / "log.json"
    f.write_text(json.dumps({"variable": "x",
                             "coefficients": [str(Fraction((-1) ** k, k + 1)) for k in range(40)]}))
    assert main(["evaluate", str(f), "--at", "0.5:2:3", "--json", "--no-verify", "--dps", "15"]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert [r["at"] for r in doc["values"]][0] == "0.5" and len(doc["values"]) == 3
    with workdps(30):
        for r in doc["values"]:
            x = mpmath.mpf(r["at"])
            assert mpmath.mpf(r["lo"]) <= mpmath.log1p(x) / x <= mpmath.mpf(r["hi"])
    assert main(["evaluate", str(f), "--at", "1:2"]) == 2
    assert "--at 1:2" in capsys.readouterr().err


def test_repeated_strong_couplings_and_unreadable_expect_labels_are_one_line_errors(tmp_path, capsys):
    f = write_series(binomial_series(Fraction(1, 2), 30), tmp_path / "b.json")
    for argv in (["--at", "5", "--at", "5", "--at", "6", "--at", "7"], ["--at", "5:5:4"],
                 ["--expect", "g1=2"], ["--expect", "y^1=2"]):
        assert main(["strong", str(f)] + argv) == 2, argv
        err = capsys.readouterr().err
        assert "Traceback" not in err and err.strip().splitlines()[-1].startswith("resum strong: error:")


def test_an_angle_too_large_for_its_cosine_is_an_input_error(tmp_path, capsys):
    assert main(["generate", "bes", "--angle", "1e999", "--loops", "5", "-o", str(tmp_path / "z.json")]) == 2
    err = capsys.readouterr().err
    assert "too large" in err and "Traceback" not in err and not (tmp_path / "z.json").exists()


def test_evaluate_json_has_point_status_and_reference_comparison(tmp_path, capsys):
    # (1 + x)^(1/2) at x = 0.5 (closed form, mpmath); x = -3 lies on the cut from -1
    f = write_series(binomial_series(Fraction(1, 2), 40), tmp_path / "b.json")
    ref = tmp_path / "ref.txt"
    with workdps(60):
        ref.write_text(f"0.5 {mpmath.nstr(mpmath.sqrt(mpmath.mpf(3) / 2), 50)}\n")
    main(["evaluate", str(f), "--at", "0.5", "--at", "-3", "--reference", str(ref), "--json", "--no-verify"])
    doc = json.loads(capsys.readouterr().out)
    good, bad = doc["values"]
    assert good["status"] == "converged" and bad["status"] != "converged" and bad["message"]
    assert doc["reference"][0]["inside"] is True
