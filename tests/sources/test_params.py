"""Every source reads its numeric arguments the same way (resum.sources._params).

The values compared are each source's own closed form at one point, given in five
spellings; the reference is the same function at the Fraction (exact input).
"""
from fractions import Fraction

import mpmath
import pytest

from resum.context import Context
from resum.errors import InputError
from resum.sources import bes, catalan, euler, oscillator, phi4
from resum.sources._params import number, whole

CTX = Context(dps=20)

# (parameter name, function of one number) for each source's numeric argument
READERS = [
    ("g", lambda v: phi4.closed_form(v, CTX)),
    ("g", lambda v: phi4.value(v, CTX).value),
    ("x", lambda v: catalan.closed_form(v, CTX)),
    ("x", lambda v: euler.borel_sum(v, CTX).value),
    ("g", lambda v: oscillator.energy(v, 0, CTX).value.value),
    ("angle", lambda v: bes.parse_angle(v, 20)),
    ("g", lambda v: bes._parse_coupling(v, 20)),
]
SPELLINGS = [Fraction(1, 5), 0.2, "0.2", "1/5", "2/(5*2)"]


@pytest.mark.parametrize("name, read", READERS)
def test_same_forms_same_value(name, read):
    ref = read(Fraction(1, 5))
    for v in SPELLINGS:
        assert abs(read(v) - ref) <= abs(ref) * mpmath.mpf(10) ** -15, v    # 0.2 as a float: 1e-17 off
    # an expression of the project's parser, evaluated at the working digits
    with mpmath.workdps(30):
        assert abs(read("pi/16") - read(mpmath.pi / 16)) <= abs(ref) * mpmath.mpf(10) ** -18


@pytest.mark.parametrize("name, read", READERS)
@pytest.mark.parametrize("bad, needle", [(True, "expected a number, got True"),
                                         ([1], "expected a number, got [1]"),
                                         ("pi/", "ends too early"),
                                         ("abc", "unknown name 'abc'"),
                                         (float("inf"), "must be finite, got inf")])
def test_same_one_line_errors_naming_the_parameter(name, read, bad, needle):
    with pytest.raises(InputError) as err:
        read(bad)
    msg = str(err.value)
    assert msg.startswith(f"{name}: ") and needle in msg and "\n" not in msg


def test_real_and_whole():
    assert number("1 + 0*I", "angle", 20, real=True) == 1
    with pytest.raises(InputError, match=r"^angle: must be real, got 1 \+ I$"):
        number("1 + I", "angle", 20, real=True)
    assert whole(3, "orders", 1, 5) == 3 and whole(-1, "sign", choices=(1, -1)) == -1
    for bad, msg in [(0, "orders: expected a whole number >= 1, got 0"),
                     (2.0, "orders: expected a whole number >= 1, got 2.0"),
                     (True, "orders: expected a whole number >= 1, got True"),
                     (6, "orders: at most 5, got 6")]:
        with pytest.raises(InputError) as err:
            whole(bad, "orders", 1, 5, why="cost")
        assert str(err.value) == msg + " (cost)"
    with pytest.raises(InputError, match=r"^sign: must be 1 or -1, got True$"):
        euler.coefficients(3, True)
