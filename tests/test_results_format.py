"""Printing an estimate whose value is zero and whose band is tiny (the real part of a
singularity on the imaginary axis, for example atan(x)/x at x = +-i)."""
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


def test_zero_with_a_band_above_1e_5_keeps_value_error_form():
    # 0.000(3) is short and readable: the value(error) form stays (common practice, no source)
    with workdps(30):
        assert str(Estimate(0, -mpmath.mpf("0.0003"), mpmath.mpf("0.0003"))) == "0.0000(3)"


def test_large_values_print_as_mantissa_and_exponent():
    # a band of 1e7 on a value of 1e11 printed an integer with all its zeros, and a band of 1e300
    # at zero a 300-digit integer (common practice, no source)
    with workdps(30):
        assert str(Estimate(123456789012, 123456789012 - 10 ** 7, 123456789012 + 10 ** 7)) == "1.23457(10)e11"
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
