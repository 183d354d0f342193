"""Files as a user writes them by hand: a missing coefficient or a header without its colon is a
one-line error that says what to write (exit code 2, nothing on stdout); figure names need no
quoting in a shell; at a complex point the JSON `digits` is the number the text report prints.
The CLI runs in process via main(argv)."""
import json
import math
from pathlib import Path

import mpmath
import pytest

from resum.cli import main
from resum.context import workdps


def _refused(argv, capsys, *needles):
    code = main(argv)
    out, err = capsys.readouterr()
    assert code == 2, err
    assert out == ""
    lines = err.strip().splitlines()
    assert len(lines) == 1, err
    for needle in needles:
        assert needle in lines[0], lines[0]
    return lines[0]


def _catalan_lines(n=12):
    # Catalan numbers binomial(2k, k)/(k + 1) (common practice, no source)
    return [str(math.comb(2 * k, k) // (k + 1)) for k in range(n)]


@pytest.mark.parametrize("name, text, needles", [
    # JSON null where a coefficient should be: the index, and what to write instead
    ("gap.json", lambda c: json.dumps({"variable": "x", "coefficients": c[:3] + [None] + c[4:]}),
     ("gap.json: coefficients[3]", "missing (null)", '"0" if it vanishes')),
    # a list where a coefficient should be: the JSON type's name, not Python's
    ("list.json", lambda c: json.dumps({"variable": "x", "coefficients": c[:2] + [[c[2]]] + c[3:]}),
     ("list.json: coefficients[2]", "got a list")),
    # a CSV row with its coefficient left empty
    ("gap.csv", lambda c: "order,coefficient\n" + "".join(
        f"{k},{'' if k == 5 else v}\n" for k, v in enumerate(c)),
     ("gap.csv: line 7", "missing (empty)", "0 if it vanishes")),
    # a plain-text header written without its colon
    ("nocolon.txt", lambda c: "variable v\n" + "\n".join(c) + "\n",
     ("nocolon.txt: line 1", "no ':'", "'variable: value'")),
    ("equals.txt", lambda c: "name: cat\nvariable = v\n" + "\n".join(c) + "\n",
     ("equals.txt: line 2", "'variable: value'")),
])
def test_missing_coefficient_or_colon_says_what_to_write(tmp_path, capsys, name, text, needles):
    p = tmp_path / name
    p.write_text(text(_catalan_lines()))
    line = _refused(["analyze", str(p), "--no-verify"], capsys, *needles)
    assert "NoneType" not in line and "empty expression" not in line


def test_empty_point_says_what_to_give(tmp_path, capsys):
    p = tmp_path / "cat.txt"
    p.write_text("\n".join(_catalan_lines(30)) + "\n")
    _refused(["evaluate", str(p), "--at", ""], capsys, "--at", "give a number or an expression")


def test_figure_names_need_no_quoting(tmp_path, capsys):
    # Ising susceptibility, 27 exact terms (tests/data; Sykes, Gaunt, Roberts, Wyles,
    # J. Phys. A 5 (1972) 624), under a name with a space and parentheses
    src = json.loads((Path(__file__).parents[1] / "data" / "ising_sq_susceptibility_hightemp.json").read_text())
    p = tmp_path / "chi.txt"
    p.write_text("name: ising chi (v=tanh K)\nvariable: v\n" + "\n".join(src["coefficients"]) + "\n")
    figs = tmp_path / "figs"
    code = main(["analyze", str(p), "--no-verify", "--plot", str(figs)])
    capsys.readouterr()
    assert code == 0
    names = sorted(f.name for f in figs.iterdir())
    assert names and all(n.startswith("ising_chi_v_tanh_K_") for n in names), names
    assert all(c.isalnum() or c in "._+-" for n in names for c in n), names


def test_complex_point_digits_agree_between_text_and_json(tmp_path, capsys):
    # sum_n zeta(n+2) x^n = (-psi(1 - x) - euler_gamma)/x: the Taylor series of the digamma
    # function (Abramowitz and Stegun 6.3.14), evaluated by mpmath as the truth
    p = tmp_path / "zeta.txt"
    p.write_text("variable: x\npi^2/6\n" + "".join(f"zeta({n})\n" for n in range(3, 42)))
    assert main(["evaluate", str(p), "--at", "3+2*I", "--json", "--no-verify"]) == 0
    row = json.loads(capsys.readouterr().out)["values"][0]
    assert main(["evaluate", str(p), "--at", "3+2*I", "--no-verify"]) == 0
    text = capsys.readouterr().out
    table_row = next(l for l in text.splitlines() if l.startswith("3.0 + 2.0*I"))
    assert row["digits"] in table_row.split(), (row["digits"], table_row)
    with workdps(40):
        x = mpmath.mpc(3, 2)
        truth = (-mpmath.digamma(1 - x) - mpmath.euler) / x
        re_lo, re_hi = mpmath.mpf(row["lo"]), mpmath.mpf(row["hi"])
        im_lo, im_hi = mpmath.mpf(row["im_lo"]), mpmath.mpf(row["im_hi"])
        assert re_lo <= truth.real <= re_hi and im_lo <= truth.imag <= im_hi
        # the digits are those of the band relative to the modulus, not of the real part alone
        err = max(re_hi - re_lo, im_hi - im_lo) / 2
        assert abs(float(row["digits"]) - float(mpmath.log10(abs(truth) / err))) < 0.15
        assert float(row["digits"]) > float(mpmath.log10(abs(truth.real) / err)) + 1


@pytest.mark.parametrize("cmd", [["analyze"], ["evaluate", "--at", "0.1"], ["strong"]])
def test_unknown_option_is_worded_by_its_command(tmp_path, capsys, cmd):
    # the error points at the help that lists this command's options, not the top-level one
    p = tmp_path / "cat.txt"
    p.write_text("\n".join(_catalan_lines(30)) + "\n")
    line = _refused([cmd[0], str(p), *cmd[1:], "--frobnicate"], capsys,
                    f"resum {cmd[0]}: error:", "--frobnicate", f"'resum {cmd[0]} --help'")
    assert "'resum --help'" not in line


def test_point_on_a_cut_is_named_in_the_files_variable(tmp_path, capsys):
    # Ising susceptibility in v = tanh K (tests/data; Sykes, Gaunt, Roberts, Wyles, J. Phys. A 5
    # (1972) 624): its branch point v_c = sqrt(2) - 1 (Kramers and Wannier, Phys. Rev. 60 (1941)
    # 252) puts v = 1/2 on the cut along the real axis
    src = json.loads((Path(__file__).parents[1] / "data" / "ising_sq_susceptibility_hightemp.json").read_text())
    p = tmp_path / "chi.txt"
    p.write_text("variable: v\n" + "\n".join(src["coefficients"]) + "\n")
    assert main(["evaluate", str(p), "--at", "1/2", "--at", "0.2", "--no-verify", "--json"]) == 1
    doc = json.loads(capsys.readouterr().out)
    on_cut = [w for w in doc["warnings"] if "lies on the cut" in w]
    assert on_cut and all(w.startswith("at 0.5: v = 0.5 ") for w in on_cut), doc["warnings"]


def _value_error(text):
    """value(error) text -> (value, error) as mpf; None for the bracket form of wide bands."""
    import re
    import mpmath
    m = re.fullmatch(r"(-?\d+)(?:\.(\d+))?\((\d+)\)", text)
    if m is None:
        return None
    decimals = len(m.group(2) or "")
    return (mpmath.mpf(m.group(1) + ("." + m.group(2) if m.group(2) else "")),
            mpmath.mpf(m.group(3)) * mpmath.mpf(10) ** -decimals)


def test_analyze_json_says_which_digits_are_earned(tmp_path, capsys):
    # Ising susceptibility, 27 exact terms (tests/data; Sykes, Gaunt, Roberts, Wyles, J. Phys. A 5
    # (1972) 624): v_c = sqrt(2) - 1 (Kramers and Wannier 1941), theta = -7/4 (Wu, McCoy, Tracy,
    # Barouch, PRB 13 (1976) 316). The JSON document gives each band also as value(error) text in
    # the digits it supports (its decimal strings carry three guard digits), and says what a band is
    import mpmath
    src = json.loads((Path(__file__).parents[1] / "data" / "ising_sq_susceptibility_hightemp.json").read_text())
    p = tmp_path / "chi.txt"
    p.write_text("variable: v\n" + "\n".join(src["coefficients"]) + "\n")
    assert main(["analyze", str(p), "--no-verify", "--json"]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert "not a proof" in doc["bands"] and "guard digits" in doc["bands"] and doc["how"]
    vc = mpmath.sqrt(2) - 1
    s = min(doc["singularities"], key=lambda d: abs(mpmath.mpf(d["re"]) - vc))
    v, e = _value_error(s["re_text"])
    assert abs(v - vc) <= e
    # fewer decimals than the decimal string, which carries the guard digits
    assert len(s["re_text"].split("(")[0].split(".")[1]) < len(s["re"].split(".")[1])
    v, e = _value_error(s["exponent_text"])
    assert abs(v + mpmath.mpf(7) / 4) <= e
    v, e = _value_error(doc["radius_text"])
    assert abs(v - vc) <= e
