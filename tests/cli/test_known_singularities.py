"""What the user knows, given on the command line: singular points to build the conformal map from
(``--singularity``), the Borel transform's singular points (``--borel-singularity``) and the
Borel-Le Roy parameter (``--borel-b``), in ``evaluate``, ``strong`` and the family spec's tasks.

The CLI runs in process via main(argv)."""
import json
from fractions import Fraction

import mpmath
import pytest

from resum.cli import main
from resum.context import workdps
from resum.series.core import Series
from resum.series.io import write_series
from tests.known_series import binomial_series


def _run(capsys, argv):
    code = main(argv)
    out = capsys.readouterr()
    return code, out.out, out.err


def test_given_singular_point_builds_the_map(tmp_path, capsys):
    """log(1 + x)/x from 40 exact terms at x = 3, mapped from the branch point -1 given by hand:
    the plan says the map came from the point given, and the band holds log(4)/3 (closed form,
    mpmath) with at least 25 digits (30 measured)."""
    f = write_series(Series([Fraction((-1) ** n, n + 1) for n in range(40)]), tmp_path / "log.json")
    code, out, _ = _run(capsys, ["evaluate", str(f), "--at", "3", "--method", "conformal-pade",
                                 "--singularity", "-1", "--json"])
    doc = json.loads(out)
    assert code == 0
    assert doc["plan"]["method"] == "conformal-pade"
    assert doc["plan"]["map"] == {"kind": "ray", "x0": "-1.0"}
    assert "singular points given" in doc["plan"]["why"]
    row = doc["values"][0]
    with workdps(50):
        truth = mpmath.log(4) / 3
        assert mpmath.mpf(row["lo"]) <= truth <= mpmath.mpf(row["hi"])
    assert float(row["digits"]) >= 25


def test_given_conjugate_pair_builds_the_pair_map(tmp_path, capsys):
    """(1 + x^2)^(-1/2) (branch points +-i) from 60 exact terms at x = 3: the pair given as
    expressions gives the map joining them through infinity; truth 1/sqrt(10) (closed form,
    mpmath) in the band, at least 10 digits."""
    c = []
    for b in binomial_series(Fraction(-1, 2), 30).coefficients:
        c += [b, 0]                      # in x^2
    f = write_series(Series(c), tmp_path / "pair.json")
    code, out, _ = _run(capsys, ["evaluate", str(f), "--at", "3", "--method", "conformal-pade",
                                 "--singularity", "I", "--singularity", "-sqrt(-1)", "--json", "--no-verify"])
    doc = json.loads(out)
    assert code == 0
    assert doc["plan"]["map"]["kind"] == "arc"
    row = doc["values"][0]
    with workdps(50):
        truth = 1 / mpmath.sqrt(10)
        assert mpmath.mpf(row["lo"]) <= truth <= mpmath.mpf(row["hi"])
    assert float(row["digits"]) >= 10


def test_borel_le_roy_parameter_is_used(tmp_path, capsys):
    """Euler's series sum (-1)^n n! x^n from 30 exact terms at x = 1/2 by Borel-Padé with b = 1
    (the Borel-Le Roy transform is then log(1 + t)/t, no longer rational): the plan records b,
    and the band holds the Borel sum e^(1/x) E1(1/x)/x (a classic closed form, from memory;
    E1 from mpmath) with at least 8 digits (13 measured)."""
    c = [(-1) ** n * mpmath.factorial(n) for n in range(30)]
    f = write_series(Series([int(v) for v in c]), tmp_path / "euler.json")
    code, out, _ = _run(capsys, ["evaluate", str(f), "--at", "1/2", "--method", "borel-pade",
                                 "--borel-b", "1", "--json"])
    doc = json.loads(out)
    assert code == 0
    assert mpmath.mpf(doc["plan"]["borel_b"]) == 1 and "b = 1" in doc["plan"]["why"]
    row = doc["values"][0]
    with workdps(50):
        truth = mpmath.exp(2) * mpmath.e1(2) * 2
        assert mpmath.mpf(row["lo"]) <= truth <= mpmath.mpf(row["hi"])
    assert float(row["digits"]) >= 8


def test_given_borel_singularity_maps_the_borel_plane(tmp_path, capsys):
    """Euler's series sum (-1)^n n! x^n (Borel transform 1/(1 + t)) from 30 exact terms with the
    Borel-plane point t = -1 given: the Borel plane is mapped from it, and the value at x = 1/2
    holds e^(1/x) E1(1/x)/x (classic closed form, from memory; E1 from mpmath). The same series
    with all signs positive and t = 1 given (on the Laplace ray): no map, lateral sums, whose
    average is e^(-1/x) Ei(1/x)/x and whose ambiguity is pi e^(-1/x)/x (mpmath's ei; the
    principal value and the half-residue of 1/(1 - t), from memory)."""
    f = write_series(Series([(-1) ** n * int(mpmath.factorial(n)) for n in range(30)]), tmp_path / "e.json")
    code, out, _ = _run(capsys, ["evaluate", str(f), "--at", "1/2", "--method", "borel-conformal-pade",
                                 "--borel-singularity", "-1", "--json", "--no-verify"])
    doc = json.loads(out)
    assert code == 0 and doc["plan"]["map"] == {"kind": "ray", "x0": "-1.0"}
    assert "Borel singular points given" in doc["plan"]["why"]
    row = doc["values"][0]
    with workdps(50):
        assert mpmath.mpf(row["lo"]) <= 2 * mpmath.exp(2) * mpmath.e1(2) <= mpmath.mpf(row["hi"])
    g = write_series(Series([int(mpmath.factorial(n)) for n in range(30)]), tmp_path / "p.json")
    code, out, _ = _run(capsys, ["evaluate", str(g), "--at", "1/4", "--borel-singularity", "1", "--json",
                                 "--no-verify"])
    doc = json.loads(out)
    assert code == 0 and doc["plan"]["method"] == "borel-pade" and "lateral sums" in doc["plan"]["why"]
    row = doc["values"][0]
    with workdps(50):
        x = mpmath.mpf(1) / 4
        assert mpmath.mpf(row["lo"]) <= mpmath.exp(-1 / x) * mpmath.ei(1 / x) / x <= mpmath.mpf(row["hi"])
        assert mpmath.mpf(row["im_lo"]) <= mpmath.pi * mpmath.exp(-1 / x) / x <= mpmath.mpf(row["im_hi"])


def test_points_not_used_are_said(tmp_path, capsys):
    """A factorially divergent series is resummed in its Borel plane: singular points given for
    the variable's plane are not used, and a warning says so (as does b for a convergent one)."""
    c = [(-1) ** n * mpmath.factorial(n) for n in range(30)]
    f = write_series(Series([int(v) for v in c]), tmp_path / "euler.json")
    code, out, _ = _run(capsys, ["evaluate", str(f), "--at", "1/2", "--method", "borel-pade",
                                 "--singularity", "-1", "--json", "--no-verify"])
    assert code == 0 and any("singular points given are not used" in w for w in json.loads(out)["warnings"])
    g = write_series(Series([Fraction((-1) ** n, n + 1) for n in range(40)]), tmp_path / "log.json")
    code, out, _ = _run(capsys, ["evaluate", str(g), "--at", "3", "--method", "pade", "--borel-b", "1/2",
                                 "--json", "--no-verify"])
    assert code == 0 and any("Borel-Le Roy parameter b = 0.5 is not used" in w
                             for w in json.loads(out)["warnings"])


def test_strong_takes_the_singular_points(tmp_path, capsys):
    """sqrt(1 + x) = x^(1/2) (1 + 1/(2x) + ...) (closed form) from 40 exact terms, conformal-Padé
    from the branch point given: the probe's coefficients hold 1 and 1/2."""
    f = write_series(binomial_series(Fraction(1, 2), 40), tmp_path / "sq.json")
    code, out, _ = _run(capsys, ["strong", str(f), "--method", "conformal-pade", "--singularity", "-1",
                                 "--no-verify", "--json"])
    doc = json.loads(out)
    assert code == 0 and doc["diagnostics"]["resummation_method"] == "conformal-pade"
    coef = dict(doc["coefficients"])
    for label, truth in (("x^1/2", 1), ("x^-1/2", mpmath.mpf(1) / 2)):
        assert mpmath.mpf(coef[label]["lo"]) <= truth <= mpmath.mpf(coef[label]["hi"])


@pytest.mark.parametrize("cmd, argv, where", [
    ("evaluate", ["--singularity", "0"], "--singularity 0"),
    ("evaluate", ["--singularity", "zz"], "--singularity zz"),
    ("evaluate", ["--singularity", "nan"], "--singularity nan"),
    ("evaluate", ["--singularity", "-1", "--singularity", "-1.0"], "--singularity -1.0"),
    ("evaluate", ["--borel-b", "-1"], "--borel-b"),
    ("evaluate", ["--borel-singularity", "0"], "--borel-singularity 0"),
    ("evaluate", ["--borel-b", "1+I"], "--borel-b"),
    ("strong", ["--singularity", "0"], "--singularity 0"),
])
def test_bad_values_are_one_line_errors(tmp_path, capsys, cmd, argv, where):
    f = write_series(binomial_series(Fraction(1, 2), 30), tmp_path / "b.json")
    at = ["--at", "1"] if cmd == "evaluate" else []
    code, out, err = _run(capsys, [cmd, str(f)] + at + argv)
    assert code == 2 and out == ""
    assert len(err.strip().splitlines()) == 1 and "Traceback" not in err
    assert where in err


def test_family_spec_takes_them_and_checks_them_first(tmp_path, capsys):
    """The spec's evaluate task: singularities (expressions, complex allowed) and borel_b are
    checked before any work, naming the key; a valid one reaches the plan of every point."""
    spec = tmp_path / "s.toml"
    body = ('[study]\nname = "t"\nsource = "catalan"\ndps = 30\n[axes]\norders = { values = [30, 40] }\n'
            '[tasks.evaluate]\nat = [-1]\nmethod = "conformal-pade"\n')
    spec.write_text(body + 'singularities = ["1/4", 0.25]\n')
    code, _, err = _run(capsys, ["scan", str(spec), "-o", str(tmp_path / "o1"), "--jobs", "1"])
    assert code == 2 and "singularities[1]" in err and "given twice" in err
    assert not (tmp_path / "o1" / "points").exists()
    spec.write_text(body + 'singularities = ["1/4"]\nborel_b = -3\n')
    code, _, err = _run(capsys, ["scan", str(spec), "-o", str(tmp_path / "o2"), "--jobs", "1"])
    assert code == 2 and "borel_b" in err
    spec.write_text(body + 'singularities = ["1/4"]\n')
    code, _, err = _run(capsys, ["scan", str(spec), "-o", str(tmp_path / "o3"), "--jobs", "1"])
    assert code == 0, err
    for p in sorted((tmp_path / "o3" / "points").glob("*.json")):
        ev = json.loads(p.read_text())["tasks"]["evaluate"]
        # Catalan's generating function (1 - sqrt(1 - 4x))/(2x) at x = -1: (sqrt(5) - 1)/2
        row = ev["values"][0]
        with workdps(40):
            assert mpmath.mpf(row["lo"]) <= (mpmath.sqrt(5) - 1) / 2 <= mpmath.mpf(row["hi"])
