"""Result types shared by every method.

Everything a method returns is a frozen dataclass built from these pieces:

* :class:`Estimate` -- a value with an (asymmetric) band ``[lower, upper]``.
  The band is an *estimate* of the uncertainty obtained from the spread of
  stable approximations (across orders, precisions, methods); it is not a
  proof. ``str()`` prints only the digits the band supports.
* :class:`Status` -- why a method succeeded or failed.
* :class:`Singularity` -- location (real and imaginary parts, each an
  Estimate), kind and exponent.
* :class:`Provenance` -- method, options, number of terms, digits, version and
  a hash of the input.

All numbers are serialised as decimal strings by :meth:`to_dict` so a JSON
round trip loses no digit.

>>> e = Estimate(mpf("0.2500003"), mpf("0.2499990"), mpf("0.2500010"))
>>> str(e)
'0.2500003(13)'
>>> e.contains(0.25)
True
"""
from __future__ import annotations

import enum
import math
import re
from dataclasses import dataclass, field
from typing import Any, Optional

import mpmath
from mpmath import mpf

from ._version import __version__
from .context import workdps, workprec

__all__ = [
    "Estimate", "Status", "Singularity", "Provenance", "MethodResult",
    "num_to_str", "str_to_num", "format_value_error",
]


# ----------------------------------------------------------------------------
# numbers <-> decimal strings
# ----------------------------------------------------------------------------

def point_label(text: str) -> str:
    """A point as written in JSON documents and summary columns: a whole number without its
    ``.0`` (``"3.0"`` -> ``"3"``, ``"1.0e+40"`` -> ``"1e+40"``), anything else unchanged (so
    records written before whole numbers were echoed this way land in the same column)."""
    text = str(text)
    m = re.fullmatch(r"(-?\d+)\.0+((?:e[-+]?\d+)?)", text)
    return m.group(1) + m.group(2) if m else text


def point_text(z, digits: int = 10) -> str:
    """A point as people read it and as ``--at`` takes it: ``2.5``, ``0.3*I``, ``1.0e-6 + 0.3*I``
    (mpmath writes a complex number as ``(0.0 + 0.3j)``)."""
    if isinstance(z, (mpmath.mpc, complex)):
        re_, im = mpmath.mpf(z.real), mpmath.mpf(z.imag)
        if im == 0:
            return mpmath.nstr(re_, digits)
        imt = f"{mpmath.nstr(abs(im), digits)}*I"
        if re_ == 0:
            return imt if im > 0 else "-" + imt
        return f"{mpmath.nstr(re_, digits)} {'+' if im > 0 else '-'} {imt}"
    return mpmath.nstr(z, digits)


def row_point(row: dict) -> str:
    """The point of a JSON value row (``at``, and ``at_im`` for a complex point) as one label,
    e.g. ``"3"`` or ``"3+2i"``."""
    at = point_label(row["at"])
    im = row.get("at_im")
    if im is None:
        return at
    im = point_label(im)
    return f"{at}{'' if im.startswith('-') else '+'}{im}i"


def num_to_str(x, dps: Optional[int] = None) -> str:
    """Decimal string of a number without losing digits.

    ints and Fractions are written exactly (``"44/45"``); mpf with all the
    digits of their binary precision unless ``dps`` is given.
    """
    from fractions import Fraction
    if isinstance(x, bool):
        raise TypeError("booleans are not numbers here")
    if isinstance(x, int):
        return str(x)
    if isinstance(x, Fraction):
        return str(x.numerator) if x.denominator == 1 else f"{x.numerator}/{x.denominator}"
    if isinstance(x, float):
        return repr(x)
    if isinstance(x, mpmath.mpc) or isinstance(x, complex):
        if isinstance(x, complex):       # mpc(mpc) would round to the working precision
            x = mpmath.mpc(x)
        re, im = num_to_str(x.real, dps), num_to_str(x.imag, dps)
        sign = "-" if im.startswith("-") else "+"
        return f"{re}{sign}{im.lstrip('-')}j"
    if isinstance(x, mpmath.mpf):
        if not mpmath.isfinite(x):
            return "nan" if mpmath.isnan(x) else ("inf" if x > 0 else "-inf")
        if x == 0:
            return "0"
        if dps is None:
            dps = int(_prec_of(x) * 0.30103) + 1
        return mpmath.nstr(x, dps, strip_zeros=True, min_fixed=-5, max_fixed=dps + 1)
    return str(x)


def _prec_of(x: mpmath.mpf) -> int:
    # the precision a number carries is the current working precision at
    # which it is printed; mpf do not store it, so use the mantissa size or
    # the working precision, whichever is larger.
    man = x._mpf_[1]
    return max(int(man).bit_length(), mpmath.mp.prec)


def str_to_num(s: str):
    """Inverse of :func:`num_to_str` at the current working precision."""
    from fractions import Fraction
    s = s.strip()
    if s.endswith("j"):
        # mpmathify reads "a+bj" at the working precision (mpmath.mpc(text) does not parse it)
        return mpmath.mpmathify(s.replace(" ", ""))
    try:
        return int(s)
    except ValueError:
        pass
    if "/" in s:
        return Fraction(s)
    return mpmath.mpf(s)


# ----------------------------------------------------------------------------
# value(error) formatting: one rounding rule for value and band
# ----------------------------------------------------------------------------

def held_digits(x) -> int:
    """Significant decimal digits an mpf stands for: all digits of its exact decimal expansion
    when that is short (0.25, 0.375, 3), otherwise the digits its binary mantissa holds (1/3 made
    at 185 bits: 56, not the 61 printed before, whose tail was the expansion of its rounding)."""
    if not isinstance(x, mpmath.mpf) or x == 0 or not mpmath.isfinite(x):
        return 1
    _, man, exp, bc = x._mpf_
    held = int(bc * 0.30103) + 1
    if exp >= 0:
        n = len(str(int(man) << exp).rstrip("0")) if exp < 4000 else held + 10
    elif bc * 0.30103 + (-exp) * 0.69897 <= held + 4:
        n = len(str(int(man) * 5 ** (-exp)).rstrip("0"))    # the exact decimal digits of man 2^exp
    else:
        n = held + 10
    return n if n <= held + 3 else held


def sig_text(x, n: int) -> str:
    """``x`` to ``n`` significant digits, and no more shown: ``mpmath.nstr`` writes 28.1 to two
    digits as ``28.0`` and 11 as ``11.0`` (three digits shown, the last one never computed), and
    a Python float whole (``nstr(15/19, 3)`` is ``0.7894736842105263``). Here they are ``28``,
    ``11`` and ``0.789``; ``1.0`` (two digits of 1) and ``1.2e+5`` stay as they are.

    >>> sig_text(28.1, 2), sig_text(11, 2), sig_text(0.0, 2), sig_text(1, 2), sig_text(15/19, 3)
    ('28', '11', '0', '1.0', '0.789')
    """
    if isinstance(x, (int, float)) and not isinstance(x, bool):
        x = mpmath.mpf(x)          # exact for int and float; nstr prints a float whole
    text = mpmath.nstr(x, n)
    if text.endswith(".0") and "e" not in text:
        whole = text[:-2].lstrip("-").lstrip("0")
        if not whole or len(whole) >= n:
            return "0" if not whole else text[:-2]
    return text


def band_digits(x, half, most: int = 15) -> int:
    """Significant digits of ``x`` that a half-width ``half`` supports, for :func:`sig_text`: the
    last digit shown sits at the decimal place of the half-width's leading digit (``0.6667`` with
    ``half = 2e-3`` gives 3: ``0.667``), at least 1 and at most ``most``.

    >>> band_digits(mpf(2)/3, mpf("2e-3")), band_digits(123.4, 2), band_digits(1, 5)
    (3, 3, 1)
    """
    x, half = abs(mpf(x)), abs(mpf(half))
    if x == 0 or not mpmath.isfinite(x):
        return 1
    if half == 0 or not mpmath.isfinite(half):
        return most if half == 0 else 1
    n = int(mpmath.floor(mpmath.log10(x))) - int(mpmath.floor(mpmath.log10(half))) + 1
    return max(1, min(most, n))


def format_value_error(value, lower, upper, max_digits: int = 60) -> str:
    """Format ``value`` with the digits supported by the band ``[lower, upper]``.

    The error is the larger half-distance to the band ends, rounded to one
    (or two, if its first digit is 1) significant figures; the value is
    rounded to the same decimal place: ``0.250000(1)``. A zero-width band
    prints ``max_digits`` digits (see below). A band wider than the value prints the
    value with two digits and the band explicitly, a value less than a tenth of
    its band's half-width as ``0`` and the band, and so does a zero whose band
    is narrower than 1e-5: ``0 [-1.2e-49, 1.2e-49]``. A zero-width band prints at most
    ``max_digits`` digits and no more than the value's binary mantissa holds.
    """
    value, lower, upper = mpf(value), mpf(lower), mpf(upper)
    err = max(abs(upper - value), abs(value - lower))
    if not mpmath.isfinite(value):
        return num_to_str(value)
    if err == 0:
        if value == 0:
            return "0"             # an exact zero (the imaginary part of a real point), not 0.0
        # no more digits than the binary number holds: 1/3 made at 53 bits would otherwise print
        # 54 digits, 38 of them the expansion of its rounding error
        return mpmath.nstr(value, max(1, min(max_digits, held_digits(value))))
    if not mpmath.isfinite(err):
        return f"{sig_text(value, 3)} (band unbounded)"
    e10 = int(mpmath.floor(mpmath.log10(err)))
    lead = int(err / mpf(10) ** e10)
    ndig_err = 2 if lead == 1 else 1
    place = e10 - ndig_err + 1            # decimal exponent of last printed digit
    if value != 0 and abs(value) * 10 < err:
        # the value is far inside a band around zero: its own digits mean nothing (an exponent
        # 0 to 27 digits printed as -1.5e-45 [-1.0e-27, 1.0e-27]); rounded to the band's scale it is 0
        return f"0 [{sig_text(lower, 2)}, {sig_text(upper, 2)}]"
    if value != 0 and abs(value) < err:
        return f"{sig_text(value, 2)} [{sig_text(lower, 2)}, {sig_text(upper, 2)}]"
    if value == 0 and err < mpf(10) ** -5:
        # a zero with a tiny band (the real part of a point on the imaginary axis) would
        # otherwise print as 0.000...0(12) with as many zeros as the band is small
        return f"0 [{sig_text(lower, 2)}, {sig_text(upper, 2)}]"
    if place >= 6:
        # a large value: mantissa(error)eN instead of an integer with dozens of zeros
        if value == 0:
            return f"0 [{sig_text(lower, 2)}, {sig_text(upper, 2)}]"
        e = int(mpmath.floor(mpmath.log10(abs(value))))
        sc = mpf(10) ** e
        return f"{format_value_error(value / sc, lower / sc, upper / sc, max_digits)}e{e}"
    def units(rounded):
        # the error in units of the last printed digit, measured from the value as printed, so
        # that the printed band covers the whole band (1.0449 in [1.0049, 1.0849] is 1.04(5),
        # not 1.04(4), which would stop at 1.08); less a hair: a band scaled by a power of ten
        # is not exact in binary, and 10.0000001 units must print as 10, not 11
        e = max(upper - rounded, rounded - lower)
        return int(mpmath.ceil(e / mpf(10) ** place * (1 - mpf(10) ** (10 - mpmath.mp.dps))))
    if place >= 0:
        v = int(mpmath.nint(value / mpf(10) ** place)) * 10 ** place
        return f"{v}({units(mpf(v)) * 10 ** place})"
    decimals = -place
    scaled = mpmath.nint(value * mpf(10) ** decimals)
    err_units = units(scaled / mpf(10) ** decimals)
    sign = "-" if scaled < 0 else ""
    digits = str(abs(int(scaled))).rjust(decimals + 1, "0")
    txt = f"{sign}{digits[:-decimals]}.{digits[-decimals:]}"
    if value != 0 and abs(value) >= mpf(10) ** 6 or (value != 0 and abs(value) < mpf(10) ** -5):
        # switch to scientific notation for very large/small numbers
        ex = int(mpmath.floor(mpmath.log10(abs(value))))
        return format_value_error(value / mpf(10) ** ex, lower / mpf(10) ** ex,
                                  upper / mpf(10) ** ex, max_digits) + f"e{ex}"
    return f"{txt}({err_units})"


# ----------------------------------------------------------------------------
# Estimate
# ----------------------------------------------------------------------------

_VALUE_ERROR = re.compile(r"\s*([+-]?)(\d*)(?:\.(\d*))?\((\d+)\)(?:[eE]([+-]?\d+))?\s*", re.ASCII)


def parse_value_error(text: str, dps: int = 30):
    """The band written as value(error), the notation :class:`Estimate` prints (``2.000(10)``:
    2.000 +- 0.010; ``-1.2345(10)e-7``), as an Estimate; None when ``text`` is not in it."""
    m = _VALUE_ERROR.fullmatch(text) if isinstance(text, str) else None
    if m is None:
        return None
    sign, whole, frac, err, exp = m.groups()
    frac = frac or ""
    if not whole + frac:
        return None
    e10 = int(exp or 0) - len(frac)
    with mpmath.workdps(max(dps, len(whole) + len(frac) + 10)):
        v = mpmath.mpf(int(sign + whole + frac)) * mpmath.mpf(10) ** e10
        u = mpmath.mpf(int(err)) * mpmath.mpf(10) ** e10
        return Estimate(v, v - u, v + u)


@dataclass(frozen=True)
class Estimate:
    """A real value with a band ``lower <= value <= upper``.

    Notes
    -----
    The band is built by the method that made the estimate (see its
    ``how`` text, recorded in the result's diagnostics); in resum it comes from
    the spread of stable approximations across orders, precisions and
    methods, widened by a safety factor. It is meant to contain the truth, but
    it is not a rigorous bound.
    """

    value: Any
    lower: Any
    upper: Any

    def __post_init__(self):
        for f in ("value", "lower", "upper"):
            object.__setattr__(self, f, _real(getattr(self, f)))
        if self.lower > self.upper:
            # ends given the other way round (a band negated end by end, say): the same band;
            # the hull below would otherwise shrink it to the bare value
            lo, hi = self.upper, self.lower
            object.__setattr__(self, "lower", lo)
            object.__setattr__(self, "upper", hi)
        if self.lower > self.value or self.upper < self.value:
            lo, hi = min(self.lower, self.value), max(self.upper, self.value)
            object.__setattr__(self, "lower", lo)
            object.__setattr__(self, "upper", hi)

    @classmethod
    def from_spread(cls, value, samples, safety: float = 1.0, floor=0) -> "Estimate":
        """Band from ``value`` and the spread of ``samples`` around it."""
        value = mpf(value)
        samples = [mpf(s) for s in samples] or [value]
        lo = min(samples + [value])
        hi = max(samples + [value])
        w = max(value - lo, hi - value, mpf(floor)) * mpf(safety)
        return cls(value, value - w, value + w)

    @classmethod
    def exact(cls, value) -> "Estimate":
        return cls(value, value, value)

    def _prec(self):
        """Bits that hold value, lower and upper and their differences exactly enough,
        whatever mpmath's working precision is at the time of the call."""
        return _span_prec(self.value, self.lower, self.upper)

    @property
    def error(self):
        """Half-width that encloses the band symmetrically."""
        with workprec(self._prec()):
            return max(self.upper - self.value, self.value - self.lower)

    @property
    def width(self):
        with workprec(self._prec()):
            return self.upper - self.lower

    def contains(self, x) -> bool:
        x = _real(x)
        return bool(self.lower <= x <= self.upper)

    def digits(self) -> float:
        """Significant decimal digits supported by the band (relative)."""
        err = self.error
        if err == 0:
            return math.inf
        if self.value == 0:
            return 0.0
        return max(0.0, float(-mpmath.log10(err / abs(self.value))))

    def __str__(self):
        with workprec(self._prec()):
            return format_value_error(self.value, self.lower, self.upper)

    def __float__(self):
        return float(self.value)

    def to_dict(self) -> dict:
        texts = self.__dict__.get("_texts")
        if texts is not None:
            return dict(texts)
        with workprec(self._prec()):
            dps = _dps_for_band(self)
            return {"value": num_to_str(self.value, dps), "lo": _end_to_str(self.lower, dps, up=False),
                    "hi": _end_to_str(self.upper, dps, up=True)}

    @classmethod
    def from_dict(cls, d: dict) -> "Estimate":
        texts = [str(d[k]) for k in ("value", "lo", "hi")]
        with workdps(max(len(t) for t in texts) + 10):
            e = cls(*(mpf(t) for t in texts))
            same = e.value == mpf(texts[0]) and e.lower == mpf(texts[1]) and e.upper == mpf(texts[2])
        # written back as read: the digits written depend on the band's width, which rounding
        # to those digits can move across a whole digit (one Estimate in seven, measured), so a
        # read-write cycle would otherwise drop a digit
        if same:
            object.__setattr__(e, "_texts", {"value": texts[0], "lo": texts[1], "hi": texts[2]})
        return e


def _real(x):
    """An mpf from int, Fraction, float, str or mpf (Fractions at working precision, a str with
    all its digits)."""
    from fractions import Fraction
    if isinstance(x, Fraction):
        return mpf(x.numerator) / x.denominator
    if isinstance(x, mpf):
        return x            # already a number: keep all its digits (mpf() would round it)
    if isinstance(x, str):
        # a decimal text keeps the digits it was written with, whatever the ambient precision
        with workdps(max(mpmath.mp.dps, sum(ch.isdigit() for ch in x) + 5)):
            return mpf(x)
    return mpf(x)


def longest_number(obj) -> int:
    """Most digits in any decimal string inside a JSON-like object (at least 15)."""
    best = 15
    if isinstance(obj, dict):
        for v in obj.values():
            best = max(best, longest_number(v))
    elif isinstance(obj, (list, tuple)):
        for v in obj:
            best = max(best, longest_number(v))
    elif isinstance(obj, str):
        best = max(best, sum(ch.isdigit() for ch in obj))
    return best


def _span_prec(*xs) -> int:
    """Precision (bits) at which the given mpf and their differences are represented exactly."""
    tops, bottoms = [], []
    for x in xs:
        if not isinstance(x, mpmath.mpf) or not mpmath.isfinite(x) or x == 0:
            continue
        sign, man, exp, bc = x._mpf_
        tops.append(exp + bc)
        bottoms.append(exp)
    if not tops:
        return mpmath.mp.prec
    return int(min(max(mpmath.mp.prec, max(tops) - min(bottoms) + 20), 200000))


def _end_to_str(x, dps: int, up: bool) -> str:
    """A band end written with ``dps`` digits, rounded outward (``hi`` up, ``lo`` down): rounded
    to nearest, the upper end of the radius of tan x + (1 - x/2)^(-1/2) came out
    1.5707963267948966192313, just below pi/2 = 1.57079632679489661923132..., which the band held."""
    x = mpmath.mpmathify(x)
    text = num_to_str(x, dps)
    if not mpmath.isfinite(x) or x == 0:
        return text
    with workprec(max(_prec_of(x), 64) + 20):
        step = mpmath.mpf(10) ** (int(mpmath.floor(mpmath.log10(abs(x)))) - dps + 1)
        y = x
        for _ in range(3):
            v = mpmath.mpf(text)
            if (v >= x) if up else (v <= x):
                return text
            y = y + step / 2 if up else y - step / 2
            text = num_to_str(y, dps)
    return text


#: What the decimal strings of a JSON band say (the ``bands`` note of the JSON documents).
JSON_BAND_NOTE = ("Each band {lo, hi} is an estimate of where the true value lies, made as 'how' says; "
                  "it is not a proof. 'value' is written with the digits the band supports plus three "
                  "guard digits; the *_text fields give value(error), only the digits the band supports.")


def _dps_for_band(e: Estimate) -> int:
    """Digits to write: those supported by the band plus three guard digits."""
    if e.error == 0 and e.value != 0:
        return max(3, held_digits(e.value))      # an exact value: the digits its number holds
    if e.error == 0 or e.value == 0:
        return max(3, int(mpmath.mp.dps))
    d = e.digits()
    return int(min(max(d + 3, 3), int(e._prec() * 0.30103) + 5))


# ----------------------------------------------------------------------------
# Status, Singularity, Provenance
# ----------------------------------------------------------------------------

class Status(str, enum.Enum):
    """Outcome of a method. ``success`` is True only for CONVERGED."""

    CONVERGED = "converged"
    NOT_CONVERGED = "not converged"
    UNSTABLE_PRECISION = "unstable in precision"
    UNSTABLE_ORDER = "unstable in order"
    SPURIOUS_POLES = "spurious poles"
    TOO_FEW_TERMS = "too few terms"
    NOT_APPLICABLE = "not applicable"
    DISAGREE = "methods disagree"
    FAILED = "failed"


KINDS = ("pole", "branch", "log", "essential", "branch-log", "unknown")


@dataclass(frozen=True)
class Singularity:
    """A singular point ``x_c`` of ``f(x) ~ A (1 - x/x_c)^exponent``.

    ``kind`` is one of ``pole`` (negative integer exponent), ``branch``
    (non-integer exponent), ``log`` (logarithmic; exponent 0 or the power
    multiplying the log), ``essential``, ``branch-log`` or ``unknown``.
    """

    re: Estimate
    im: Estimate
    kind: str = "unknown"
    exponent: Optional[Estimate] = None
    method: str = ""
    note: str = ""

    @property
    def location(self) -> mpmath.mpc:
        return mpmath.mpc(self.re.value, self.im.value)

    @property
    def modulus(self):
        return abs(self.location)

    def to_dict(self) -> dict:
        # "re"/"im" are the band's own value texts: written apart, they were rounded to the digits
        # of the band as read back, which the outward-rounded ends can shift by one (2.004 -> 2.0)
        re_band, im_band = self.re.to_dict(), self.im.to_dict()
        return {"re": re_band["value"], "im": im_band["value"],
                "re_band": re_band, "im_band": im_band,
                "exponent": None if self.exponent is None else self.exponent.to_dict(),
                "kind": self.kind, "method": self.method, "note": self.note}

    @classmethod
    def from_dict(cls, d: dict) -> "Singularity":
        re = Estimate.from_dict(d["re_band"]) if "re_band" in d else Estimate.exact(mpf(d["re"]))
        im = Estimate.from_dict(d["im_band"]) if "im_band" in d else Estimate.exact(mpf(d["im"]))
        ex = None if d.get("exponent") is None else Estimate.from_dict(d["exponent"])
        return cls(re, im, d.get("kind", "unknown"), ex, d.get("method", ""), d.get("note", ""))


@dataclass(frozen=True)
class Provenance:
    method: str
    options: dict = field(default_factory=dict)
    n_terms: int = 0
    dps: int = 0
    input_hash: str = ""
    version: str = __version__

    def to_dict(self) -> dict:
        return {"method": self.method, "options": _jsonable(self.options), "n_terms": self.n_terms,
                "dps": self.dps, "input_hash": self.input_hash, "version": self.version}

    @classmethod
    def from_dict(cls, d: dict) -> "Provenance":
        return cls(d["method"], dict(d.get("options", {})), int(d.get("n_terms", 0)),
                   int(d.get("dps", 0)), d.get("input_hash", ""), d.get("version", __version__))


def _jsonable(obj):
    """Make diagnostics JSON-friendly: numbers become decimal strings."""
    from fractions import Fraction
    if isinstance(obj, dict):
        return {str(k): _jsonable(v) for k, v in obj.items()}
    if isinstance(obj, (list, tuple)):
        return [_jsonable(v) for v in obj]
    if isinstance(obj, (mpmath.mpf, mpmath.mpc, Fraction, complex)):
        return num_to_str(obj, 20)
    if isinstance(obj, float):
        return repr(obj)
    if isinstance(obj, enum.Enum):
        return obj.value
    if hasattr(obj, "to_dict"):
        return obj.to_dict()
    return obj


jsonable = _jsonable


@dataclass(frozen=True)
class MethodResult:
    """What one estimator returns for one series.

    ``radius`` and ``singularities`` are in the series' expansion variable.
    ``growth`` is ``"finite radius"``, ``"entire-like"`` or ``"factorial"``;
    for factorial growth ``borel_singularity`` (A) and ``borel_exponent``
    (b in c_n ~ S A^-n Gamma(n+b)) are set. ``diagnostics`` holds the per-order
    tables and the text ``how`` that says how each band was obtained.
    """

    method: str
    success: bool
    status: Status
    message: str = ""
    radius: Optional[Estimate] = None
    singularities: tuple = ()
    growth: str = ""
    borel_singularity: Optional[Estimate] = None
    borel_exponent: Optional[Estimate] = None
    diagnostics: dict = field(default_factory=dict)
    provenance: Optional[Provenance] = None

    def to_dict(self) -> dict:
        return {
            "method": self.method, "success": self.success, "status": self.status.value,
            "message": self.message,
            "radius": None if self.radius is None else self.radius.to_dict(),
            "singularities": [s.to_dict() for s in self.singularities],
            "growth": self.growth,
            "borel_singularity": None if self.borel_singularity is None else self.borel_singularity.to_dict(),
            "borel_exponent": None if self.borel_exponent is None else self.borel_exponent.to_dict(),
            "diagnostics": _jsonable(self.diagnostics),
            "provenance": None if self.provenance is None else self.provenance.to_dict(),
        }

    @classmethod
    def from_dict(cls, d: dict) -> "MethodResult":
        est = lambda k: None if d.get(k) is None else Estimate.from_dict(d[k])  # noqa: E731
        return cls(d["method"], bool(d["success"]), Status(d["status"]), d.get("message", ""),
                   est("radius"), tuple(Singularity.from_dict(s) for s in d.get("singularities", [])),
                   d.get("growth", ""), est("borel_singularity"), est("borel_exponent"),
                   dict(d.get("diagnostics", {})),
                   None if d.get("provenance") is None else Provenance.from_dict(d["provenance"]))
