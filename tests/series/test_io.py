"""File formats: round trips without losing a digit, and one-line errors for bad input."""
import json
import os
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



@pytest.mark.parametrize("ext", FORMATS)
def test_complex_coefficients_keep_their_digits(tmp_path, ext):
    # (1 - x/(1+i))^(-1/3) = sum binom(-1/3, k) (-x/(1+i))^k (closed form, common practice, no
    # source), 40 digits made under mpmath's default 15: the complex coefficients were written
    # rounded to a double (0.16666666666666665741...), the real ones kept every digit
    z = mpmath.mpc(1, 1)
    with workdps(60):
        cs = [mpmath.binomial(-mpmath.mpf(1) / 3, k) * (-1 / z) ** k for k in range(12)]
        s = Series([+c for c in cs], digits=40)
    t = read_series(write_series(s, tmp_path / f"s.{ext}"))
    with workdps(60):
        for a, b in zip(cs, t.coefficients):
            assert abs(a - mpmath.mpc(b)) <= mpmath.mpf(10) ** -39 * abs(a)

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


def _log1p_over_x(n):
    # log(1+x)/x = sum (-1)^k x^k/(k+1) (common practice, no source), as Python floats
    return [(-1) ** k / (k + 1) for k in range(n)]


def test_json_numbers_are_doubles(tmp_path):
    # json.dump writes Python floats as their shortest text (0.5, -1.0, 0.3333333333333333): a
    # double carries 15.95 digits whatever that text shows (IEEE 754 binary64, 53-bit significand;
    # common practice, no source)
    p = tmp_path / "f.json"
    p.write_text(json.dumps({"variable": "x", "coefficients": _log1p_over_x(20)}))
    s = read_series(p)
    assert s.digits == 15
    assert s.coefficients[1] == mpmath.mpf("-0.5")
    with workdps(40):
        assert abs(s.coefficients[2] - mpmath.mpf(1) / 3) < mpmath.mpf(10) ** -16
    # the same numbers as strings keep the digits their text shows; a declaration wins
    p.write_text(json.dumps({"coefficients": [repr(c) for c in _log1p_over_x(20)]}))
    assert read_series(p).digits == 1
    p.write_text(json.dumps({"digits": 16, "coefficients": _log1p_over_x(20)}))
    assert read_series(p).digits == 16
    p.write_text(json.dumps({"exact": True, "coefficients": _log1p_over_x(4)}))
    assert read_series(p).coefficients[1] == Fraction(-1, 2)


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
    # a bare constant is named with its line (a name string holding the word does not count)
    ("nanline.json", '{"name": "NaN",\n "coefficients": [1,\n  NaN]}', "line 3: NaN is not a finite"),
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
    # found by adversarial QA: each of these used to end in a traceback, a hang or silent acceptance
    ("gap.csv", "order,coefficient\n0,1\n1000000000000,1\n", "at most 100000 terms"),
    ("start.csv", "# start: abc\norder,coefficient\n0,1\n", "start must be an integer"),
    ("quote.csv", 'order,coefficient\n0,1\n1,"2\n', "line 3"),
    ("late.csv", "order,coefficient\n0,1\n# digits: 40\n1,2\n", "line 3: header line 'digits'"),
    ("fmt.txt", "format: other/9\n1\n2\n", "format 'other/9'"),
    ("pow0.txt", "coupling: x = g^0\n1\n2\n", "power must be between 1 and"),
    ("powbig.txt", "coupling: x = g^99999999999\n1\n2\n", "power must be between 1 and"),
    ("pow0.json", '{"coefficients": ["1"], "coupling": {"power": 0}}', "power must be between 1 and"),
    ("startbig.txt", "start: 99999999999999999999\n1\n2\n", "start"),
    ("startbool.json", '{"coefficients": ["1"], "start": true}', "start must be an integer"),
    ("digbig.txt", "digits: 99999999999\n1.0\n2\n", "digits must be a whole number"),
    ("digbool.json", '{"coefficients": ["1.0"], "digits": true}', "digits must be a whole number"),
    ("exactexp.txt", "exact: true\n1\n1e100000000\n", "line 3"),
    ("longint.json", '{"coefficients": [' + "9" * 30000 + ']}', "at most 20000"),
    ("twice.txt", "variable: x\nvariable: y\n1\n2\n", "given twice"),
    ("prov.txt", "provenance: [1, 2]\n1\n2\n", "provenance must be a JSON object"),
    # a key twice: json.loads keeps the last one silently; too deep: RecursionError traceback
    ("dupkey.json", '{"coefficients": ["1", "2", "3"], "coefficients": ["1"]}', "'coefficients' given twice"),
    ("deep.json", '{"coefficients": ' + "[" * 100000 + "]" * 100000 + "}", "nested too deeply"),
    ("deepprov.txt", "provenance: " + "[" * 100000 + "]" * 100000 + "\n1\n2\n", "provenance must be a JSON object"),
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


def _long_exact_series():
    # 2000! and 1/3000!: more digits than Python's str()/int() convert at once (4300)
    import math
    return Series([math.factorial(2000), -1, Fraction(1, math.factorial(3000)), 7], name="long")


@pytest.mark.parametrize("ext", FORMATS)
def test_long_exact_integers_roundtrip(tmp_path, ext):
    s = _long_exact_series()
    p = write_series(s, tmp_path / f"long.{ext}")
    t = read_series(p)
    assert t.is_exact and t.coefficients == s.coefficients
    assert t.input_hash() == s.input_hash()
    assert "exact" in repr(t)


def test_long_json_integer_literal(tmp_path):
    import math
    n = math.factorial(2000)
    hi, lo = divmod(n, 10 ** 3000)        # decimal text from two halves within str()'s limit
    p = tmp_path / "big.json"
    p.write_text('{"coefficients": [' + str(hi) + str(lo).rjust(3000, "0") + ', 1]}')
    assert read_series(p).coefficients == (n, 1)


@pytest.mark.parametrize("target, needle", [
    ("folder", "is a folder"),            # the output is an existing folder
    ("nowhere/out.json", "folder does not exist"),
    ("afile/out.json", "is not a folder"),
    ("", "empty output file name"),
])
def test_write_errors_are_input_errors(tmp_path, target, needle):
    (tmp_path / "folder").mkdir()
    (tmp_path / "afile").write_text("x")
    before = sorted(f.name for f in tmp_path.iterdir())
    path = str(tmp_path / target) if target else ""
    with pytest.raises(InputError, match=needle) as e:
        write_series(Series([1, 2]), path)
    assert "\n" not in str(e.value)
    assert sorted(f.name for f in tmp_path.iterdir()) == before
    assert list((tmp_path / "folder").iterdir()) == []


def test_write_refuses_to_replace_a_special_file(tmp_path):
    # a named pipe stands in for a device such as /dev/full: renaming over it would replace it
    import os
    import stat
    if not hasattr(os, "mkfifo"):
        pytest.skip("no named pipes here")
    fifo = tmp_path / "pipe.json"
    os.mkfifo(fifo)
    with pytest.raises(InputError, match="not a regular file"):
        write_series(Series([1, 2]), fifo)
    assert stat.S_ISFIFO(os.stat(fifo).st_mode)
    assert [f.name for f in tmp_path.iterdir()] == ["pipe.json"]


def test_dict_interface():
    s = series_from_dict({"coefficients": ["1", "-1/2"], "exact": True})
    assert s.coefficients == (1, Fraction(-1, 2))


def _with_umask(mask, fn):
    import os
    old = os.umask(mask)
    try:
        return fn()
    finally:
        os.umask(old)


@pytest.mark.parametrize("mask", [0o022, 0o002, 0o077])
def test_written_files_get_the_modes_open_would_give(tmp_path, mask):
    # a new file gets 0666 minus the umask, as open(path, "w") gives it (POSIX creat();
    # common practice, no source), not the 0600 of a private temporary file
    import os
    import stat
    from resum.series.io import atomic_write_text
    plain = tmp_path / "plain.txt"
    _with_umask(mask, lambda: open(plain, "w").close())
    want = 0o666 & ~mask
    assert stat.S_IMODE(os.stat(plain).st_mode) == want
    p = tmp_path / "s.json"
    _with_umask(mask, lambda: write_series(Series([1, 2]), p))
    assert stat.S_IMODE(os.stat(p).st_mode) == want
    _with_umask(mask, lambda: atomic_write_text(tmp_path / "note.txt", "hi\n"))
    assert stat.S_IMODE(os.stat(tmp_path / "note.txt").st_mode) == want
    assert sorted(f.name for f in tmp_path.iterdir()) == ["note.txt", "plain.txt", "s.json"]


def test_rewriting_keeps_the_mode_of_the_file_replaced(tmp_path):
    import os
    import stat
    p = tmp_path / "s.json"
    p.write_text("old")
    os.chmod(p, 0o640)
    _with_umask(0o077, lambda: write_series(Series([1, 2]), p))
    assert stat.S_IMODE(os.stat(p).st_mode) == 0o640
    assert read_series(p).coefficients == (1, 2)


@pytest.mark.parametrize("ext", ["csv", "txt"])
def test_description_and_provenance_survive_csv_and_text(tmp_path, ext):
    # a generated file records where it came from in every format (common practice, no source)
    s = Series([1, Fraction(1, 2), Fraction(1, 3)], name="demo", description="a test series, x < 1",
               provenance={"source": "demo", "orders": 3, "note": "fraction: 1/3"})
    t = read_series(write_series(s, tmp_path / f"s.{ext}"))
    assert t.description == s.description
    assert {k: t.provenance[k] for k in ("source", "orders", "note")} == dict(s.provenance)


@pytest.mark.skipif(not os.path.exists("/dev/zero"), reason="needs /dev/zero")
def test_a_device_without_end_is_read_bounded(monkeypatch):
    # /dev/zero reports size 0 and never ends: it used to be read until memory ran out
    import resum.series.io as io
    monkeypatch.setattr(io, "MAX_FILE_BYTES", 4096)
    with pytest.raises(InputError, match=r"/dev/zero: file larger than"):
        read_series("/dev/zero")


@pytest.mark.parametrize("name", ["c.txt", "c.dat", "c"])
def test_csv_content_under_another_extension_is_read_as_csv(tmp_path, name):
    # it was read as the text format and refused at its header ("unknown name 'order'")
    p = tmp_path / name
    p.write_text("# name: cc\nOrder, Coefficient\n0,1\n1,1/2\n3,5\n")
    s = read_series(p)
    assert s.coefficients == (1, Fraction(1, 2), 0, 5) and s.name == "cc"


def test_marked_numbers_set_the_digits_carried(tmp_path):
    # coefficients as computer-algebra output marks them (`40: 40 significant digits; syntax
    # from memory) carry the digits their marks declare, not the digits they show
    p = tmp_path / "marked.txt"
    p.write_text("1`40\n-0.5`40\n0.333333333333333333333333333333333333333333`40*^-1\n")
    s = read_series(p, Context(dps=30))
    assert s.digits == 40 and s.n_terms == 3
    with workdps(60):
        assert abs(s.coefficients[2] - mpmath.mpf(1) / 30) < mpmath.mpf(10) ** -42
    # a Fortran double-precision constant (d exponent) in a CSV row
    q = tmp_path / "fortran.csv"
    q.write_text("order,coefficient\n0,1.0D0\n1,-2.5D-01\n")
    t = read_series(q)
    assert t.digits == 2 and t.coefficients[1] == mpmath.mpf("-0.25")
