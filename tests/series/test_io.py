"""File formats: round trips without losing a digit, and one-line errors for bad input."""
import json
from fractions import Fraction

import mpmath
import pytest

from resum import Context, Coupling, Series
from resum.context import workdps
from resum.errors import InputError
from resum.series.io import read_series, series_from_dict, series_to_dict, write_series

FORMATS = ["json", "csv", "txt"]


@pytest.mark.parametrize("ext", FORMATS)
def test_exact_roundtrip(tmp_path, ext):
    # coefficients of the cusp series prefactors (Beisert-Eden-Staudacher, hep-th/0610251): rationals
    s = Series([0, 4, Fraction(-4, 3), Fraction(44, 45), 10 ** 40 + 1, Fraction(-73, 630)],
               name="rationals", coupling=Coupling("g", 2, 1), start=0)
    p = write_series(s, tmp_path / f"s.{ext}")
    t = read_series(p)
    assert t.is_exact and t.coefficients == s.coefficients
    assert t.coupling == s.coupling and t.name == "rationals"


@pytest.mark.parametrize("ext", FORMATS)
def test_500_digit_roundtrip(tmp_path, ext):
    # reference values: mpmath zeta at 520 digits
    with workdps(520):
        cs = [mpmath.zeta(k) * (-1) ** k / k for k in range(2, 22)]
        s = Series(cs, digits=500, start=2)
    p = write_series(s, tmp_path / f"s.{ext}")
    t = read_series(p, Context(dps=30))
    assert t.digits == 500 and t.start == 2
    with workdps(520):
        for a, b in zip(cs, t.coefficients):
            assert abs(a - b) <= mpmath.mpf(10) ** -499 * abs(a)
    # written again, the coefficients are identical text (no digit lost or invented)
    assert series_to_dict(t)["coefficients"] == series_to_dict(s)["coefficients"]


def test_minimal_json_and_expressions(tmp_path):
    p = tmp_path / "m.json"
    p.write_text(json.dumps({"variable": "x", "coefficients": ["1", "1/2", "pi^2/6", 3]}))
    s = read_series(p, Context(dps=40))
    assert s.coefficients[:2] == (1, Fraction(1, 2)) and s.coefficients[3] == 3
    with workdps(60):
        assert abs(s.coefficients[2] - mpmath.pi ** 2 / 6) < mpmath.mpf(10) ** -50


def test_json_floats_keep_their_text(tmp_path):
    p = tmp_path / "f.json"
    p.write_text('{"coefficients": [1, 0.12345678901234567890123456789]}')
    s = read_series(p)
    assert s.digits == 29


def test_text_header_and_comments(tmp_path):
    p = tmp_path / "h.txt"
    p.write_text("# a comment\nname: demo\ncoupling: x = 4*g^2\n1   # constant\n-1/3\n\n2.5\n")
    s = read_series(p)
    assert s.name == "demo" and s.coupling == Coupling("g", 2, 4) and s.n_terms == 3
    assert s.digits == 2


def test_csv_missing_orders_are_zero(tmp_path):
    p = tmp_path / "c.csv"
    p.write_text("order,coefficient\n1,1\n3,1/3\n")
    s = read_series(p)
    assert s.start == 1 and s.coefficients == (1, 0, Fraction(1, 3))


BAD = [
    ("bad.json", '{"coefficients": [1, 2', "malformed JSON"),
    ("key.json", '{"coefficients": ["1"], "colour": "red"}', "unknown key 'colour'"),
    ("type.json", '{"coefficients": "1, 2"}', "coefficients"),
    ("elem.json", '{"coefficients": ["1", [2]]}', "coefficients[1]"),
    ("nan.json", '{"coefficients": ["1", "nan"]}', "not finite"),
    ("inf.json", '{"coefficients": [1, Infinity]}', "not a finite number"),
    ("empty.json", '{"coefficients": []}', "no coefficients"),
    ("zero.txt", "0\n0\n0\n", "every coefficient is zero"),
    ("expr.txt", "1\n__import__('os')\n", "line 2"),
    ("name.txt", "1\nfoo(3)\n", "unknown name 'foo'"),
    ("hdr.txt", "colour: red\n1\n", "unknown header key"),
    ("late.txt", "1\nname: x\n", "header line"),
    ("cols.csv", "0,1\n1,2,3\n", "line 2"),
    ("order.csv", "1,1\n0,1\n", "orders must increase"),
    ("var.json", '{"variable": "g^2", "coefficients": ["1"]}', "variable"),
    ("coup.json", '{"coefficients": ["1"], "coupling": "x = g^2.5"}', "coupling"),
]


@pytest.mark.parametrize("fname, text, needle", BAD)
def test_bad_input_one_line_error(tmp_path, fname, text, needle):
    p = tmp_path / fname
    p.write_text(text)
    with pytest.raises(InputError) as e:
        read_series(p)
    msg = str(e.value)
    assert needle in msg and fname in msg and "\n" not in msg


def test_non_utf8_and_missing_file(tmp_path):
    p = tmp_path / "latin.txt"
    p.write_bytes("1\n0.5 # caf\xe9\n".encode("latin-1"))
    with pytest.raises(InputError, match="not UTF-8"):
        read_series(p)
    with pytest.raises(InputError, match="file not found"):
        read_series(tmp_path / "nope.json")


def test_failed_write_leaves_nothing(tmp_path):
    class Boom(Series):
        pass
    s = Series([1, 2, 3])
    target = tmp_path / "out.json"
    target.write_text("old")
    import resum.series.io as io
    real = io.json.dumps
    io.json.dumps = lambda *a, **k: (_ for _ in ()).throw(RuntimeError("disk full"))
    try:
        with pytest.raises(RuntimeError):
            write_series(s, target)
    finally:
        io.json.dumps = real
    assert target.read_text() == "old"
    assert [f.name for f in tmp_path.iterdir()] == ["out.json"]


def test_dict_interface():
    s = series_from_dict({"coefficients": ["1", "-1/2"], "exact": True})
    assert s.coefficients == (1, Fraction(-1, 2))
