"""`resum evaluate --goal D`: a series written by `resum generate` is regenerated with the terms
its convergence projects until every band supports D digits. Truth at angle 0:
F_0(g) = (2/pi^2) log cosh(2 pi g) (Belitsky and Korchemsky, arXiv:1907.13131; the sources tests
check it order by order), evaluated by mpmath."""
import json

import mpmath
import pytest

from resum.cli import main


def _holds_closed_form(doc, g, rel=None):
    """The first value of ``doc``: its band holds (2/pi^2) log cosh(2 pi g) (mpmath, 60 digits)
    and, with ``rel``, the value is within that relative error of it."""
    with mpmath.workdps(60):
        truth = 2 / mpmath.pi ** 2 * mpmath.log(mpmath.cosh(2 * mpmath.pi * g))
        v = doc["values"][0]
        assert mpmath.mpf(v["lo"]) <= truth <= mpmath.mpf(v["hi"])
        if rel is not None:
            assert abs(mpmath.mpf(v["value"]) / truth - 1) < mpmath.mpf(rel)


def test_goal_regenerates_and_reaches_the_digits(tmp_path, capsys):
    f = tmp_path / "a0.json"
    assert main(["generate", "bes", "--angle", "0", "--loops", "30", "--dps", "45", "-o", str(f)]) == 0
    capsys.readouterr()
    code = main(["evaluate", str(f), "--at", "2", "--goal", "14", "--no-verify", "--json"])
    doc = json.loads(capsys.readouterr().out)
    assert code == 0
    search = doc["order_search"]
    assert search["reached"] is True and search["rounds"][0]["terms"] == 31
    assert float(search["rounds"][0]["min_digits"]) < 14 <= float(doc["values"][0]["digits"])
    _holds_closed_form(doc, 2, rel="1e-14")


def test_goal_needs_a_series_from_a_source(tmp_path, capsys):
    f = tmp_path / "s.txt"
    f.write_text("\n".join(str(k + 1) for k in range(20)) + "\n")       # 1/(1-x)^2
    assert main(["evaluate", str(f), "--at", "2", "--goal", "10"]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and "--goal" in err[0] and "resum generate" in err[0]


def test_goal_option_values_are_checked(tmp_path, capsys):
    f = tmp_path / "a0.json"
    assert main(["generate", "bes", "--angle", "0", "--loops", "20", "-o", str(f)]) == 0
    capsys.readouterr()
    for extra, words in ((["--goal", "0"], "--goal"), (["--goal", "ten"], "--goal"),
                         (["--max-terms", "50"], "give --goal"),
                         (["--goal", "10", "--max-terms", "5"], "at least the 21")):
        assert main(["evaluate", str(f), "--at", "1", *extra]) == 2
        err = capsys.readouterr().err
        assert words in err and "Traceback" not in err


@pytest.mark.parametrize("cap, rounds", [(40, 2), (36, 1)])
def test_goal_not_reached_is_a_warning_and_exit_code_1(tmp_path, capsys, cap, rounds):
    # angle 0, 30 loops, g = 8 asked to 20 digits with at most 40 terms: out of reach; the value
    # is still reported with its honest band (truth: the closed form above, mpmath). With at
    # most 36, the 5 more terms allowed are too few for a round that the projection says cannot
    # reach the goal: one evaluation, and the reason given
    f = tmp_path / "a0.json"
    assert main(["generate", "bes", "--angle", "0", "--loops", "30", "--dps", "40", "-o", str(f)]) == 0
    capsys.readouterr()
    code = main(["evaluate", str(f), "--at", "8", "--goal", "20", "--max-terms", str(cap), "--no-verify", "--json"])
    doc = json.loads(capsys.readouterr().out)
    assert code == 1
    search = doc["order_search"]
    assert search["reached"] is False and len(search["rounds"]) == rounds
    assert any(w.startswith("--goal: 20 digits not reached") for w in doc["warnings"])
    assert ("would not reach it" in search["note"]) == (rounds == 1)
    _holds_closed_form(doc, 8)


def test_goal_raises_the_digits_where_the_rounding_sets_the_band(tmp_path, capsys):
    # 40 loops at 20 digits: at g = 1 the rounding of the coefficients, amplified by the
    # resummation, leaves about 4 digits; --goal regenerates with more digits (not first more
    # loops), and the digits a round reached are kept when a later round adds loops
    f = tmp_path / "a0.json"
    assert main(["generate", "bes", "--angle", "0", "--loops", "40", "--dps", "20", "-o", str(f)]) == 0
    capsys.readouterr()
    code = main(["evaluate", str(f), "--at", "1", "--goal", "14", "--json"])
    doc = json.loads(capsys.readouterr().out)
    assert code == 0
    rounds = doc["order_search"]["rounds"]
    assert rounds[0]["terms"] == 41 and rounds[0]["digits"] == 20
    assert rounds[1]["terms"] == 41 and rounds[1]["digits"] > 20        # more digits, same loops
    assert all(b["digits"] >= a["digits"] for a, b in zip(rounds, rounds[1:]))
    assert doc["order_search"]["reached"] is True
    _holds_closed_form(doc, 1, rel="1e-14")


def test_goal_beyond_the_files_digits_names_the_command_that_gives_them(tmp_path, capsys):
    # a file of 20-digit coefficients caps the digits worked to at 20: --goal 25 is refused in one
    # line that spells out the 'resum generate' call giving enough digits; that call, then the
    # same --goal, reaches 25 digits (truth: the closed form above, mpmath)
    f = tmp_path / "a0.json"
    assert main(["generate", "bes", "--angle", "0", "--loops", "40", "--dps", "20", "-o", str(f)]) == 0
    capsys.readouterr()
    assert main(["evaluate", str(f), "--at", "1", "--goal", "25"]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and "Traceback" not in err[0]
    cmd = err[0].split("'resum generate ")[1].split("'")[0].split()
    assert cmd[:5] == ["bes", "--angle", "0", "--loops", "40"] and cmd[5] == "--dps" and int(cmd[6]) >= 35
    g = tmp_path / "a0b.json"
    assert main(["generate", *cmd[:-1], str(g)]) == 0
    capsys.readouterr()
    assert main(["evaluate", str(g), "--at", "1", "--goal", "25", "--json"]) == 0
    doc = json.loads(capsys.readouterr().out)
    _holds_closed_form(doc, 1)
    assert float(doc["values"][0]["digits"]) >= 25

