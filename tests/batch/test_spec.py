"""Validation of family specs: every mistake is a one-line InputError naming the key."""
import textwrap

import mpmath
import pytest

from resum.batch import load_spec, parse_spec
from resum.errors import InputError

SRC = "tests.batch.family_sources:binomial"

GOOD = f"""
[study]
name = "demo"
source = "{SRC}"
dps = 30

[fixed]
orders = 20

[axes]
radius = {{ range = {{ start = 1, stop = "pi/2", num = 3 }} }}
exponent = {{ values = ["1/2", 2] }}

[tasks.coefficients]
at = [0.25, "1/3"]
"""


def parse(text):
    return parse_spec(textwrap.dedent(text), path="spec.toml")


def test_good_spec_grid_and_values():
    spec = parse(GOOD)
    assert spec.n_points == 6
    pts = spec.points()
    # product order: the last axis runs fastest
    assert [p.axis_index for p in pts[:2]] == [{"radius": 0, "exponent": 0},
                                              {"radius": 0, "exponent": 1}]
    # the range end is pi/2 to the study's digits (mpmath.pi, reference library)
    stop = pts[-1].params["radius"]
    with mpmath.workdps(40):
        assert abs(stop - mpmath.pi / 2) < mpmath.mpf(10) ** -35
        mid = pts[2].params["radius"]
        assert abs(mid - (1 + mpmath.pi / 2) / 2) < mpmath.mpf(10) ** -35
    assert spec.fixed == {"orders": 20}
    assert spec.tasks["coefficients"]["at"][1] == pytest.approx(1 / 3)


def test_zipped_axes():
    text = GOOD.replace('exponent = { values = ["1/2", 2] }', 'exponent = { values = [1, 2, 3] }')
    text += '\n[grid]\ncombine = [["radius", "exponent"]]\n'
    spec = parse(text)
    assert spec.n_points == 3
    assert [p.params["exponent"] for p in spec.points()] == [1, 2, 3]


def test_zipped_axes_may_repeat_a_value_but_not_a_point():
    # zipped axes walk together: only their combined tuples name a point, so one of them may
    # repeat a value (common practice, no source)
    text = GOOD.replace('exponent = { values = ["1/2", 2] }', 'exponent = { values = [1, 1, 2] }')
    text += '\n[grid]\ncombine = [["radius", "exponent"]]\n'
    spec = parse(text)
    assert [p.params["exponent"] for p in spec.points()] == [1, 1, 2]
    same = text.replace('range = { start = 1, stop = "pi/2", num = 3 }', 'values = [1, 1, 2]')
    with pytest.raises(InputError) as err:
        parse(same)
    msg = str(err.value)
    assert "grid.combine" in msg and "radius=1, exponent=1" in msg and "\n" not in msg
    # a plain axis still may not repeat a value
    with pytest.raises(InputError, match="axes.exponent: the axis repeats a value"):
        parse(GOOD.replace('["1/2", 2]', '[2, 2]'))


@pytest.mark.parametrize("table, value, field", [
    ("fixed", "dps = 20", "fixed.dps"),
    ("axes", "dps = { values = [40, 20] }", "axes.dps"),
])
def test_source_digits_below_the_study_dps_are_refused(table, value, field):
    # a series generated at 20 digits cannot support a study at 30; resum evaluate --dps
    # refuses the same request (DEVELOPERS.md, precision rules)
    axes = "angle = { values = [0.1, 0.2] }"
    text = f"""
    [study]
    name = "b"
    source = "bes"
    dps = 30
    [fixed]
    loops = 20
    {value if table == "fixed" else ""}
    [axes]
    {axes}
    {value if table == "axes" else ""}
    [tasks.analyze]
    """
    with pytest.raises(InputError) as err:
        parse(text)
    msg = str(err.value)
    assert field in msg and "only 20 digits" in msg and "study.dps = 30" in msg
    assert "at most 20" in msg and "\n" not in msg
    # as many digits as the study, or more, is fine
    spec = parse(text.replace("20]", "30]").replace("dps = 20", "dps = 30"))
    assert spec.dps == 30


def test_digest_ignores_comments_and_layout():
    a = parse(GOOD)
    b = parse("# a comment\n" + GOOD.replace("dps = 30", "dps   =   30   # digits"))
    c = parse(GOOD.replace("dps = 30", "dps = 31"))
    assert a.digest == b.digest != c.digest


@pytest.mark.parametrize("edit, words", [
    (("[fixed]", "[fixd]"), ["fixd", "unknown table"]),
    (("dps = 30", "dps = 30\ncolour = 1"), ["study.colour", "unknown key"]),
    (("dps = 30", 'dps = "thirty"'), ["study.dps", "expected int"]),
    (("dps = 30", "dps = 3"), ["study.dps", "out of range"]),
    ((f'source = "{SRC}"', 'source = "nowhere"'), ["study.source", "unknown source"]),
    (("orders = 20", "orderz = 20"), ["fixed.orderz", "unknown key", "orders"]),
    (("orders = 20", "orders = 2.5"), ["fixed.orders", "integer"]),
    (("num = 3", "number = 3"), ["axes.radius.range", "number"]),
    (('["1/2", 2]', '["1/2", "foo(2)"]'), ["axes.exponent.values", "foo"]),
    (('["1/2", 2]', '["1/2", "1/2"]'), ["axes.exponent", "repeats"]),
    (("[tasks.coefficients]", "[tasks.coefficient]"), ["tasks.coefficient", "unknown key"]),
    (("at = [0.25", "when = [0.25"), ["tasks.coefficients.when", "unknown option"]),
    (("at = [0.25", "tail = 2\nat = [0.25"), ["tasks.coefficients", "tail"]),
    (("[fixed]\norders = 20", "[fixed]\norders = 20\nradius = 1"), ["axes.radius", "both fixed"]),
])
def test_bad_specs_name_the_key(edit, words):
    text = GOOD.replace(*edit)
    assert text != GOOD
    with pytest.raises(InputError) as err:
        parse(text)
    msg = str(err.value)
    assert "\n" not in msg
    assert msg.startswith("spec.toml:")
    for w in words:
        assert w in msg, msg


def test_error_gives_the_line():
    text = textwrap.dedent(GOOD).replace("orders = 20", "orderz = 20")
    line = text.splitlines().index("orderz = 20") + 1
    with pytest.raises(InputError, match=rf"^spec.toml:{line}: fixed.orderz"):
        parse_spec(text, path="spec.toml")


def test_toml_syntax_error_has_line(tmp_path):
    p = tmp_path / "bad.toml"
    p.write_text(GOOD.replace("dps = 30", "dps = = 30"))
    with pytest.raises(InputError, match=r"bad.toml:5: TOML syntax error: .*line 5, column 7"):
        load_spec(p)


def test_json_spec_is_told_specs_are_toml(tmp_path):
    p = tmp_path / "spec.json"
    p.write_text('{"study": {"name": "x", "source": "bes"}}')
    with pytest.raises(InputError, match=r"spec.json: a family spec is a TOML file"):
        load_spec(p)


def test_grid_errors():
    with pytest.raises(InputError, match="grid.combine.*not combined"):
        parse(GOOD + '\n[grid]\ncombine = ["radius"]\n')
    with pytest.raises(InputError, match="grid.combine.*same length"):
        parse(GOOD + '\n[grid]\ncombine = [["radius", "exponent"]]\n')
    with pytest.raises(InputError, match="grid.combine.*not an axis"):
        parse(GOOD + '\n[grid]\ncombine = ["radius", "exponent", "colour"]\n')


def test_missing_tables_and_file(tmp_path):
    with pytest.raises(InputError, match=r"\[tasks\]"):
        parse(GOOD.split("[tasks.coefficients]")[0])
    with pytest.raises(InputError, match=r"\[axes\]"):
        parse(GOOD.replace("[axes]", "[fixed2]").split("[fixed2]")[0] + "[tasks.coefficients]\n")
    with pytest.raises(InputError, match="cannot read the spec"):
        load_spec(tmp_path / "missing.toml")


def test_truth_task_needs_an_evaluator():
    with pytest.raises(InputError, match="no finite-coupling evaluator"):
        parse(GOOD + "\n[tasks.truth]\nat = [1]\n")


@pytest.mark.parametrize("extra, words", [
    ('\n[tasks.analyze]\nmethods = ["nonsense"]\n', ["tasks.analyze", "nonsense"]),
    ('\n[tasks.evaluate]\nat = [1]\nmethod = "guess"\n', ["tasks.evaluate", "unknown method", "guess"]),
    ('\n[tasks.evaluate]\nmethod = "pade"\n', ["tasks.evaluate", "needs option 'at'"]),
    ('\n[tasks.strong]\nn_terms_fit = [0]\n', ["tasks.strong", "positive integers"]),
    ('\n[tasks.strong]\nspacing = 0\n', ["tasks.strong", "spacing", "above 0"]),
    ('\n[tasks.strong]\nspacing = "-2/3"\n', ["tasks.strong", "spacing", "above 0"]),
    ('\n[tasks.strong]\nspacing = "abc"\n', ["tasks.strong", "spacing:", "'abc'", "or 'auto'"]),
    ('\n[tasks.strong]\nexponential = "often"\n', ["tasks.strong", "exponential", "auto, always, never",
                                                     "'often'"]),
])
def test_unknown_methods_and_missing_options(extra, words):
    with pytest.raises(InputError) as err:
        parse(GOOD + extra)
    for w in words:
        assert w in str(err.value), str(err.value)
    assert "spacing[0]" not in str(err.value)       # one value, not a list (common practice, no source)


@pytest.mark.parametrize("value", ['"auto"', '"2/3"', "0.5", "2"])
def test_strong_spacing_in_a_spec_takes_what_the_probe_takes(value):
    # 'auto' (the probe's automatic choice) was refused as an unknown name
    spec = parse(GOOD + f"\n[tasks.strong]\nspacing = {value}\n")
    assert str(spec.tasks["strong"]["spacing"]) == value.strip('"')


def test_a_huge_range_is_refused_before_its_values_are_built():
    from resum.batch.spec import MAX_POINTS
    text = GOOD.replace("num = 3", f"num = {MAX_POINTS + 1}")
    with pytest.raises(InputError) as err:
        parse(text)
    msg = str(err.value)
    assert "axes.radius.range" in msg and "num" in msg and "split the family" in msg, msg


@pytest.mark.parametrize("where, words", [
    ("[fixed]\nsign = 2\n[axes]\norders = { values = [10, 20] }\n", ["fixed.sign", "2", "-1, 1"]),
    ("[axes]\nsign = { values = [-1, 1, 0] }\n", ["axes.sign.values[2]", "0", "-1, 1"]),
])
def test_parameters_with_listed_choices(where, words):
    # the euler source's sign takes only -1 or 1 (its registered choices)
    text = f'[study]\nname = "e"\nsource = "euler"\n{where}[tasks.coefficients]\n'
    with pytest.raises(InputError) as err:
        parse(text)
    for w in words:
        assert w in str(err.value), str(err.value)
    ok = parse('[study]\nname = "e"\nsource = "euler"\n[axes]\nsign = { values = [-1, 1] }\n'
               "[tasks.coefficients]\n")
    assert [p.params["sign"] for p in ok.points()] == [-1, 1]


@pytest.mark.parametrize("source, where, words", [
    ("bes", "[fixed]\nloops = -3\n[axes]\nangle = { values = [0, 1] }\n", ["fixed.loops", "-3", "1"]),
    ("bes", "[fixed]\ndps = 3\n[axes]\nangle = { values = [0, 1] }\n", ["fixed.dps", "3", "5"]),
    ("bes", "[axes]\nloops = { range = { start = 0, stop = 10, num = 3 } }\n",
     ["axes.loops.range", "0", "at least 1"]),
    ("oscillator", "[fixed]\nstate = -1\n[axes]\norders = { values = [10, 20] }\n",
     ["fixed.state", "-1", "0"]),
    ("oscillator", "[fixed]\norders = 5000\n[axes]\nstate = { values = [0, 1] }\n",
     ["fixed.orders", "5000", "3000"]),
    ("oscillator", "[axes]\norders = { values = [10, -1] }\n", ["axes.orders.values[1]", "-1", "1"]),
    ("phi4", "[axes]\norders = { values = [0, 10] }\n", ["axes.orders.values[0]", "0", "1"]),
    ("euler", "[fixed]\norders = 0\n[axes]\nsign = { values = [-1, 1] }\n", ["fixed.orders", "0", "1"]),
])
def test_parameters_out_of_their_range_are_refused(source, where, words):
    # refused while the spec is read, naming the field, instead of failing every point later
    text = f'[study]\nname = "r"\nsource = "{source}"\n{where}[tasks.coefficients]\n'
    with pytest.raises(InputError) as err:
        parse(text)
    msg = str(err.value)
    assert "\n" not in msg
    for w in words:
        assert w in msg, msg


def test_limits_of_a_source_of_your_own():
    reg = {"mine": {"params": [{"name": "n", "type": "int", "default": 3, "minimum": 2,
                                "maximum": 4}]}}
    text = '[study]\nname = "m"\nsource = "mine"\n[axes]\nn = { values = [%s] }\n[tasks.coefficients]\n'
    assert [p.params["n"] for p in parse_spec(text % "2, 3, 4", sources=reg).points()] == [2, 3, 4]
    for bad, word in (("1", "at least 2"), ("5", "at most 4")):
        with pytest.raises(InputError, match=word):
            parse_spec(text % bad, sources=reg)


def test_expression_values_carry_the_largest_precision_a_point_asks_for():
    # pi/8 (mpmath at 80 digits): evaluated at the study's 30 digits, a point computed at
    # dps = 60 would have used an angle wrong from its 30th digit
    sp = parse_spec("[study]\nname = \"t\"\nsource = \"bes\"\ndps = 30\n[fixed]\nloops = 10\ndps = 60\n"
                    "[axes]\nangle = [\"pi/8\"]\n[tasks.analyze]\n")
    with mpmath.workdps(80):
        assert abs(sp.axes[0].values[0] - mpmath.pi / 8) < mpmath.mpf(10) ** -65


def test_expression_grid_points_reach_a_text_taking_source_exactly():
    # a range written with expressions hands the bes source (whose angle takes a text) the
    # text of each point; at a = pi/2 the kernel K(a) = 2 cos(a) [...] vanishes, so F = 4 g^2
    # exactly (the definition of the family; common practice, no source). The rounded value
    # pi/2 (mpf) left terms of size cos(a)^2 ~ 1e-100 in every coefficient.
    sp = parse_spec("[study]\nname = \"t\"\nsource = \"bes\"\ndps = 30\n[fixed]\nloops = 6\n"
                    "[axes]\nangle = { range = { start = 0, stop = \"pi/2\", num = 5 } }\n"
                    "[tasks.analyze]\n")
    assert sp.axes[0].texts == ("0", "1/4*(pi/2)", "1/2*(pi/2)", "3/4*(pi/2)", "pi/2")
    pts = sp.points()
    kw = sp.source_kwargs(pts[-1])
    assert kw["angle"] == "pi/2"
    from resum.sources import SOURCES
    series = SOURCES["bes"].build(sp.context, **kw)
    assert [float(c) for c in series.coefficients] == [0, 4, 0, 0, 0, 0, 0]
    assert all(c == 0 for c in series.coefficients[2:])
    # the numeric values (records, plots) are unchanged: the middle point is pi/4 to 30 digits
    # (mpmath.pi, reference library), and its series starts 4 g^2 - (4/3) pi^2 g^4 (Beisert,
    # Eden, Staudacher, J. Stat. Mech. (2007) P01021)
    with mpmath.workdps(40):
        assert abs(pts[2].params["angle"] - mpmath.pi / 4) < mpmath.mpf(10) ** -35
        mid = SOURCES["bes"].build(sp.context, **sp.source_kwargs(pts[2]))
        assert abs(mid.coefficients[2] + 4 * mpmath.pi ** 2 / 3) < mpmath.mpf(10) ** -25


def test_sources_without_text_parameters_get_numbers():
    # the test source's float parameters do not declare takes_text: they get the values
    spec = parse(GOOD)
    kw = spec.source_kwargs(spec.points()[-1])
    assert not isinstance(kw["radius"], str) and not isinstance(kw["exponent"], str)
    assert spec.axes[0].texts == ()


def test_byte_order_mark_and_crlf_are_read_like_plain_utf8(tmp_path):
    # the UTF-8 byte-order mark EF BB BF (Unicode Standard, section 23.8 "Byte Order Mark")
    # is written by some Windows editors; CRLF line ends are valid TOML (TOML 1.0, "Spec":
    # "Newline means LF (0x0A) or CRLF (0x0D 0x0A)")
    plain = tmp_path / "plain.toml"
    plain.write_text(textwrap.dedent(GOOD))
    marked = tmp_path / "bom.toml"
    marked.write_bytes(b"\xef\xbb\xbf" + textwrap.dedent(GOOD).replace("\n", "\r\n").encode())
    assert load_spec(marked).digest == load_spec(plain).digest


def test_nesting_too_deep_for_the_toml_reader_is_an_input_error(tmp_path):
    # tomllib recurses per nested array: 100000 levels ended in a RecursionError traceback
    p = tmp_path / "deep.toml"
    p.write_text("a = " + "[" * 100000 + "]" * 100000 + "\n")
    with pytest.raises(InputError, match=r"deep.toml: TOML nested too deeply"):
        load_spec(p)


@pytest.mark.skipif(not __import__("os").path.exists("/dev/zero"), reason="needs /dev/zero")
def test_a_spec_device_without_end_is_read_bounded(monkeypatch):
    import resum.batch.spec as spec_module
    monkeypatch.setattr(spec_module, "MAX_SPEC_BYTES", 4096)
    with pytest.raises(InputError, match=r"/dev/zero: the spec is larger than"):
        load_spec("/dev/zero")


@pytest.mark.parametrize("name", [":", ".relative:x", "mod:", ":obj", "a b:c"])
def test_source_names_that_are_no_module_path_are_unknown_sources(name):
    # ':' reached importlib.import_module(''), whose ValueError was a traceback
    with pytest.raises(InputError, match="study.source: unknown source"):
        parse(GOOD.replace(f'source = "{SRC}"', f'source = "{name}"'))


@pytest.mark.parametrize("name, says", [
    ("tests.batch.no_such_module:x", "cannot import module 'tests.batch.no_such_module'"),
    ("tests.batch.family_sources:no_such_object", "module 'tests.batch.family_sources' has no"),
    ("tests.batch.family_sources:Fraction", "has no build(ctx, **params)"),
    ("resum_audit_broken_source:family", "importing module 'resum_audit_broken_source' raised "
                                         "RuntimeError: fails on import"),
])
def test_a_source_of_your_own_that_cannot_be_used_says_why(name, says, tmp_path, monkeypatch):
    # each was "unknown source ...; (or 'package.module:object' ...)", which the user had
    # written, and an error raised while the module was imported was a traceback
    # (common practice, no source)
    (tmp_path / "resum_audit_broken_source.py").write_text('raise RuntimeError("fails on import")\n')
    monkeypatch.syspath_prepend(str(tmp_path))
    with pytest.raises(InputError) as err:
        parse(GOOD.replace(f'source = "{SRC}"', f'source = "{name}"'))
    assert str(err.value).startswith("spec.toml:4: study.source: ")
    assert says in str(err.value) and "\n" not in str(err.value)
