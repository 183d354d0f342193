"""Printing an estimate whose value is zero and whose band is tiny (the real part of a
singularity on the imaginary axis, for example atan(x)/x at x = +-i)."""
import random

import mpmath

from resum.context import workdps
from resum.results import Estimate


def test_zero_with_a_tiny_band_prints_the_band_not_fifty_zeros():
    # the band's ends must still be read back from the text (common practice, no source)
    with workdps(60):
        e = Estimate(0, -mpmath.mpf("1.2e-49"), mpmath.mpf("3.5e-49"))
        text = str(e)
        assert len(text) < 30, text
        assert text.startswith("0 [")
        lo, hi = (mpmath.mpf(t) for t in text[3:-1].split(","))
        assert lo <= -mpmath.mpf("1.1e-49") and hi >= mpmath.mpf("3.4e-49")


def test_an_exact_zero_prints_as_0():
    # the imaginary part of a point on the real axis: "0", not "0.0", which reads as a rounded
    # value with one decimal (common practice, no source); an exact 1 keeps its form
    assert str(Estimate.exact(mpmath.mpf(0))) == "0"
    assert str(Estimate.exact(mpmath.mpf(1))) == "1.0"


def test_zero_with_a_band_above_1e_5_keeps_value_error_form():
    # 0.000(3) is short and readable: the value(error) form stays (common practice, no source)
    with workdps(30):
        assert str(Estimate(0, -mpmath.mpf("0.0003"), mpmath.mpf("0.0003"))) == "0.0000(3)"


def test_large_values_print_as_mantissa_and_exponent():
    # a band of 1e7 on a value of 1e11 printed an integer with all its zeros, and a band of 1e300
    # at zero a 300-digit integer (common practice, no source)
    with workdps(30):
        # the error counts from the printed value 1.23457e11: the lower end 1.2344679e11 lies
        # 10.2 units of 1e6 below it, so (11), not (10), which would stop at 1.23447e11
        assert str(Estimate(123456789012, 123456789012 - 10 ** 7, 123456789012 + 10 ** 7)) == "1.23457(11)e11"
        text = str(Estimate(0, -mpmath.mpf("1e300"), mpmath.mpf("1e300")))
        assert text.startswith("0 [") and len(text) < 30


def test_value_deep_inside_a_band_around_zero_prints_as_zero():
    # an exponent 0 known to 27 digits carried the value -1.5e-45 into the text: digits far below
    # the band are not earned; rounded to the band's scale the value is 0 (common practice, no
    # source). A value comparable to its band keeps two digits.
    with workdps(60):
        assert str(Estimate(mpmath.mpf("-1.5e-45"), mpmath.mpf("-1e-27"), mpmath.mpf("1e-27"))) \
            == "0 [-1.0e-27, 1.0e-27]"
        assert str(Estimate(mpmath.mpf("0.5"), mpmath.mpf("-0.3"), mpmath.mpf("1.4"))).startswith("0.5 [")


def test_points_are_written_as_the_input_grammar_reads_them():
    # "0.3*I" and "1.0e-6 + 0.3*I" are what --at accepts; "(0.0 + 0.3j)" is not
    from resum.results import point_text
    from resum.resummation import parse_points
    with workdps(30):
        for z in (mpmath.mpc(0, "0.3"), mpmath.mpc("1e-6", "0.3"), mpmath.mpc(2, -1), mpmath.mpf("2.5")):
            text = point_text(z)
            assert "j" not in text
            back = parse_points([text], 30)[0]
            assert abs(back - z) <= abs(z) * mpmath.mpf(10) ** -9, (text, back)
        assert point_text(mpmath.mpc(0, "0.3")) == "0.3*I"
        assert point_text(mpmath.mpc(2, -1)) == "2.0 - 1.0*I"


def test_band_ends_are_written_rounded_outward():
    # rounded to nearest, the written upper end of a band reaching pi/2 + 1.3e-23 came out below
    # pi/2 + 1.3e-23 and, in one analysis, below pi/2 itself (common practice, no source:
    # outward rounding of interval ends)
    with workdps(60):
        for lo, hi in ((mpmath.pi / 2 - mpmath.mpf("1e-19"), mpmath.pi / 2 + mpmath.mpf("1.3e-23")),
                       (mpmath.mpf("-3.00000123456789"), mpmath.mpf("-2.99999987654321")),
                       (mpmath.mpf("0.12344"), mpmath.mpf("0.12346"))):
            e = Estimate((lo + hi) / 2, lo, hi)
            d = e.to_dict()
            assert mpmath.mpf(d["lo"]) <= lo and mpmath.mpf(d["hi"]) >= hi, d


def test_band_given_upper_end_first_is_the_same_band():
    # [2, 0] around 1 is the band [0, 2]; it used to collapse to the bare value 1, printed as
    # if exact (common practice, no source)
    e = Estimate(1, 2, 0)
    assert (e.lower, e.upper) == (0, 2)
    assert e.contains("0.5") and not e.contains(3)


def test_band_from_decimal_texts_keeps_their_digits_at_low_ambient_precision():
    # 30-digit texts read at mpmath's default 15 digits used to round to one number: a zero-width
    # band printed with 56 digits (common practice, no source)
    assert mpmath.mp.dps == 15
    e = Estimate("0.123456789012345678901234567890", "0.123456789012345678901234567880",
                 "0.123456789012345678901234567900")
    assert e.lower < e.value < e.upper
    with workdps(40):
        assert abs(e.value - mpmath.mpf("0.123456789012345678901234567890")) < mpmath.mpf(10) ** -32
    assert str(e).startswith("0.1234567890123456789012345678")


def test_exact_estimate_prints_only_the_digits_its_number_holds():
    # 1/3 rounded to 53 bits holds about 16 decimal digits; the rest of its binary expansion
    # (0.3333333333333333148...) are not digits of 1/3 (mpmath reference at 60 digits)
    with workdps(15):
        e = Estimate.exact(mpmath.mpf(1) / 3)
    text = str(e)
    digits = text.replace("0.", "", 1)
    assert len(digits) <= 17, text
    with workdps(60):
        unit = mpmath.mpf(10) ** -len(digits)
        assert abs(mpmath.mpf(text) - mpmath.mpf(1) / 3) <= unit


def test_singularity_dict_round_trip_is_stable():
    # a wide band whose outward-rounded ends give one digit less on reading: "re" went 2.004 -> 2.0
    import json
    from resum.results import Singularity
    with workdps(30):
        s = Singularity(Estimate(mpmath.mpf("2.00381550669039"), mpmath.mpf("1.80343395602135"),
                                 mpmath.mpf("2.20419705735943")), Estimate.exact(0), "branch")
    d = json.loads(json.dumps(s.to_dict()))
    back = Singularity.from_dict(d).to_dict()
    assert back == d
    assert d["re"] == d["re_band"]["value"]


def test_strong_coupling_result_dict_round_trip_keeps_couplings():
    # couplings such as 6.01 came back as 6.0099999999999997868 (read at 15 digits, written at 20)
    import json
    from resum.estimators.strong_coupling import StrongCouplingResult
    from resum.results import Status
    with workdps(30):
        r = StrongCouplingResult(False, Status.TOO_FEW_TERMS, "", "g", (mpmath.mpf("6.01"), mpmath.mpf("8.01")),
                                 (None, None), mpmath.mpf("6.01"), None, "", ())
    text = json.dumps(r.to_dict())
    back = StrongCouplingResult.from_dict(json.loads(text))
    assert json.dumps(back.to_dict()) == text
    assert json.loads(text)["couplings"] == ["6.01", "8.01"]


def test_printed_band_covers_the_whole_band():
    # the value(error) text is a band of its own: value as printed +- error in units of the last
    # digit. It must contain the band it stands for, also after the value is rounded
    # (common practice, no source): 1.0449 in [1.0049, 1.0849] printed as 1.04(4) stopped at 1.08.
    assert str(Estimate("1.0449", "1.0049", "1.0849")) == "1.04(5)"
    rng = random.Random(7)
    with workdps(30):
        for _ in range(2000):
            v = mpmath.mpf(rng.uniform(-10, 10))
            lo = v - mpmath.mpf(10) ** rng.uniform(-8, 0) * rng.random()
            hi = v + mpmath.mpf(10) ** rng.uniform(-8, 0) * rng.random()
            text = str(Estimate(v, lo, hi))
            if "[" in text or "e" in text:
                continue
            num, err = text[:-1].split("(")
            dec = len(num.split(".")[1]) if "." in num else 0
            e = mpmath.mpf(err) / mpmath.mpf(10) ** dec
            tiny = mpmath.mpf(10) ** -25
            assert mpmath.mpf(num) - e <= lo + tiny and mpmath.mpf(num) + e >= hi - tiny, (text, lo, hi)


def test_exact_values_print_their_short_expansions_and_no_rounding_tail():
    # an exact (zero-width) estimate prints the number it holds (common practice, no source):
    # a short dyadic expansion in full (0.25, not 0.3), a long one to the digits its mantissa
    # holds, so that 1/3 made at 55 digits shows only correct digits of 1/3
    for v, text in (("0.25", "0.25"), ("0.375", "0.375"), ("-2.5", "-2.5"), ("12345.678", "12345.678")):
        e = Estimate.exact(mpmath.mpf(v))
        assert str(e) == text and e.to_dict()["value"] == text
    with workdps(55):
        third = mpmath.mpf(1) / 3
    for text in (str(Estimate.exact(third)), Estimate.exact(third).to_dict()["value"]):
        digits = text.split(".")[1]
        assert 50 <= len(digits) <= 58 and set(digits[:-1]) == {"3"}
