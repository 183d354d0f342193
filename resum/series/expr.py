"""A small, safe parser for coefficient expressions.

Grammar (our own; no ``eval``, no attribute access, bounded size)::

    expr   := term (("+" | "-") term)*
    term   := unary (("*" | "/") unary)*
    unary  := ("+" | "-") unary | power
    power  := atom (("^" | "**") unary)?
    atom   := number | constant | function "(" expr ")" | "(" expr ")"

numbers: ``3``, ``44/45`` (as ``44 / 45``), ``-1.25``, ``6.02e23``, ``2.5j``
(imaginary), ``1.0D-05`` (Fortran's exponent letter), ``1.23*^-5`` and precision
marks as computer-algebra output writes them (``0.5`30``: 30 significant digits;
``1.5``20``: 20 digits after the point; ``0.1``` alone: a double); constants: ``pi``, ``catalan``, ``euler_gamma``, ``I`` (the
imaginary unit); functions: ``zeta``, ``log``, ``sqrt``, ``exp``, ``sin``,
``cos``, ``gamma``.

Integers and ratios of integers stay exact (``fractions.Fraction``); anything
else is evaluated with mpmath at the requested digits. A decimal literal
carries the significant digits it was written with; that count is reported
so that callers can refuse input less precise than the question needs.

>>> evaluate_expression("44/45").value
Fraction(44, 45)
>>> v = evaluate_expression("-8*(73/630*pi^6 + 4*zeta(3)^2)", dps=25)
>>> v.exact, mpmath.nstr(v.value, 20)
(False, '-937.43062784825374188')
"""
from __future__ import annotations

import re
from dataclasses import dataclass
from fractions import Fraction
from typing import Optional

import mpmath

from ..context import workdps
from ..errors import InputError

__all__ = ["evaluate_expression", "ExprValue", "MAX_LENGTH", "decimal_to_int", "int_to_decimal",
           "exact_to_text"]

MAX_LENGTH = 20000      # characters in one expression
MAX_DEPTH = 60          # nesting of parentheses / unary operators
MAX_INT_EXPONENT = 4096
MAX_ZETA_ARG = 100000
MAX_EXACT_BITS = 1 << 20   # size of an exact intermediate (about 315 000 decimal digits)
MAX_ARG_MAG = 4096         # |argument| of exp, sin, cos, gamma, zeta below 2^4096 (about 10^1233)
_SHOW = 60                 # characters of an expression quoted in a message

#: one number literal: mantissa, an optional precision mark (`p: p significant digits; ``a:
#: a digits after the decimal point; a lone `: a double, 15 digits), an optional exponent
#: (e, or the d of Fortran double-precision constants, or *^ as computer-algebra output
#: writes it) and an optional j for an imaginary number; the tokenizer reads numbers with it
_LITERAL_RE = (r"(?P<mant>\d+\.?\d*|\.\d+)(?P<mark>`{1,2})?(?P<prec>\d+\.?\d*|\.\d+)?"
               r"(?:(?:[eEdD]|\*\^)(?P<exp>[+-]?\d+))?(?P<imag>[jJ])?")
_LITERAL = re.compile(_LITERAL_RE, re.ASCII)

_TOKEN = re.compile(r"""
    (?P<num>{lit})
  | (?P<name>[A-Za-z_][A-Za-z_0-9]*)
  | (?P<op>\*\*|[-+*/^(),])
  | (?P<ws>\s+)
""".format(lit=_LITERAL_RE), re.VERBOSE | re.ASCII)

_CONSTANTS = {
    "pi": lambda: mpmath.pi,
    "catalan": lambda: mpmath.catalan,
    "euler_gamma": lambda: mpmath.euler,
    "I": lambda: mpmath.mpc(0, 1),
}
_FUNCTIONS = {
    "zeta": mpmath.zeta, "log": mpmath.log, "sqrt": mpmath.sqrt, "exp": mpmath.exp,
    "sin": mpmath.sin, "cos": mpmath.cos, "gamma": mpmath.gamma,
}
# every name an expression may use (constants and functions)
NAMES = frozenset(_CONSTANTS) | frozenset(_FUNCTIONS)


@dataclass(frozen=True)
class ExprValue:
    """Parsed value.

    ``value`` is an int/Fraction when ``exact``; otherwise an mpf/mpc.
    ``digits`` is the number of significant digits carried by the least
    precise decimal literal used (None if none was used; then the value is
    as accurate as the working precision).
    """

    value: object
    exact: bool
    digits: Optional[int]


def _show(text: str) -> str:
    """``text`` quoted for a one-line message (long input is cut)."""
    return repr(text if len(text) <= _SHOW else text[:_SHOW - 3] + "...")


_CHUNK = 4000      # digits converted at once (below Python's int/str conversion limit)


def decimal_to_int(digits: str) -> int:
    """``int(digits)`` for a string of ASCII decimal digits of any length.

    Python refuses to convert more than a few thousand digits at once; long
    exact coefficients (high orders of factorially growing series) have more.
    """
    sign = 1
    if digits[:1] in "+-":
        sign, digits = (-1 if digits[0] == "-" else 1), digits[1:]
    if not digits or not digits.isascii() or not digits.isdigit():
        raise ValueError(f"not a decimal integer: {_show(digits)}")
    return sign * _dec_to_int(digits)


def _dec_to_int(d: str) -> int:
    if len(d) <= _CHUNK:
        return int(d)
    k = len(d) // 2
    return _dec_to_int(d[:-k]) * 10 ** k + _dec_to_int(d[-k:])


def int_to_decimal(n: int) -> str:
    """``str(n)`` for an integer of any size (see :func:`decimal_to_int`)."""
    if n < 0:
        return "-" + int_to_decimal(-n)
    if n.bit_length() <= 3 * _CHUNK:
        return str(n)
    k = (n.bit_length() * 30103 // 100000) // 2      # about half the decimal digits
    q, r = divmod(n, 10 ** k)
    return int_to_decimal(q) + int_to_decimal(r).rjust(k, "0")


def exact_to_text(v) -> str:
    """An int or Fraction as ``"n"`` or ``"p/q"``, every digit, any size."""
    if isinstance(v, Fraction):
        if v.denominator == 1:
            return int_to_decimal(v.numerator)
        return f"{int_to_decimal(v.numerator)}/{int_to_decimal(v.denominator)}"
    return int_to_decimal(int(v))


MACHINE_DIGITS = 15        # digits of a number marked with a lone ` (a double)


def _plain(lit: str):
    """``(text, digits)``: a literal rewritten with a plain ``e`` exponent and no mark, and
    the significant digits its precision mark declares (None without a mark)."""
    m = _LITERAL.fullmatch(lit)
    if m is None:                   # not produced by the tokenizer; leave it to mpmath
        return lit, None
    text = m["mant"] + (f"e{m['exp']}" if m["exp"] is not None else "")
    if not m["mark"]:
        return text, None
    if m["prec"] is None:
        if len(m["mark"]) == 2:
            raise InputError(f"the accuracy mark in {lit!r} has no number of digits after it")
        return text, MACHINE_DIGITS
    p = float(m["prec"])
    if len(m["mark"]) == 1:
        return text, max(1, int(p))
    # accuracy: digits after the decimal point, so significant digits = a + log10|x|
    with workdps(30):
        x = abs(mpmath.mpf(text))
        d = p + (float(mpmath.log10(x)) if x else 0)
    return text, max(1, int(d))


def _sig_digits(lit: str) -> int:
    text, marked = _plain(lit.rstrip("jJ"))
    if marked is not None:
        return marked
    mant = re.split(r"[eE]", text)[0].replace(".", "").lstrip("0")
    return max(1, len(mant))


class _Parser:
    def __init__(self, text: str, dps: int, names=None):
        self.text = text
        self.dps = dps
        self.names = names or {}
        self.tokens = []
        pos = 0
        while pos < len(text):
            m = _TOKEN.match(text, pos)
            if not m:
                raise InputError(f"unexpected character {text[pos]!r} at position {pos + 1} in {_show(text)}")
            if m.lastgroup != "ws":
                self.tokens.append((m.lastgroup, m.group(), pos))
            pos = m.end()
        self.i = 0
        self.depth = 0
        self.digits = None

    def peek(self):
        return self.tokens[self.i] if self.i < len(self.tokens) else (None, None, len(self.text))

    def take(self, want=None):
        tok = self.peek()
        if tok[0] is None:
            raise InputError(f"expression {_show(self.text)} ends too early")
        if want is not None and tok[1] != want:
            raise InputError(f"expected {want!r} at position {tok[2] + 1} in {_show(self.text)}")
        self.i += 1
        return tok

    def _enter(self):
        self.depth += 1
        if self.depth > MAX_DEPTH:
            raise InputError(f"expression nested more than {MAX_DEPTH} deep")

    def parse(self):
        if not self.tokens:
            raise InputError("empty expression; give a number or an expression such as pi/3")
        v = self.expr()
        if self.i != len(self.tokens):
            tok = self.peek()
            raise InputError(f"unexpected {_show(tok[1])} at position {tok[2] + 1} in {_show(self.text)}")
        return v

    def expr(self):
        v = self.term()
        while self.peek()[1] in ("+", "-"):
            op = self.take()[1]
            w = self.term()
            v = _bounded(v + w if op == "+" else v - w)
        return v

    def term(self):
        v = self.unary()
        while self.peek()[1] in ("*", "/"):
            op = self.take()[1]
            w = self.unary()
            if op == "*":
                v = _bounded(v * w)
            else:
                if w == 0:
                    raise InputError(f"division by zero in {_show(self.text)}")
                v = _bounded(Fraction(v) / w if isinstance(v, int) and isinstance(w, int) else v / w)
        return v

    def unary(self):
        if self.peek()[1] in ("+", "-"):
            op = self.take()[1]
            self._enter()
            v = self.unary()
            self.depth -= 1
            return -v if op == "-" else v
        return self.power()

    def power(self):
        base = self.atom()
        if self.peek()[1] in ("^", "**"):
            self.take()
            self._enter()
            ex = self.unary()
            self.depth -= 1
            if isinstance(ex, (int, Fraction)) and Fraction(ex).denominator == 1:
                ex = int(ex)
                if abs(ex) > MAX_INT_EXPONENT:
                    raise InputError(f"exponent {ex} too large (limit {MAX_INT_EXPONENT})")
                if isinstance(base, (int, Fraction)):
                    if base == 0 and ex < 0:
                        raise InputError(f"0 to a negative power in {_show(self.text)}")
                    b = Fraction(base)
                    size = max(b.numerator.bit_length(), b.denominator.bit_length()) * abs(ex)
                    if size > MAX_EXACT_BITS:
                        raise InputError(f"exact power in {_show(self.text)} would have about "
                                         f"{size * 30103 // 100000} digits (limit "
                                         f"{MAX_EXACT_BITS * 30103 // 100000}); write a decimal "
                                         f"base (for example 10.0^{ex}) to get a floating value")
                    return b ** ex
                return base ** ex
            b, e = _mp(base), _mp(ex)
            if b != 0 and e != 0 and mpmath.mag(abs(e)) + max(0, mpmath.mag(mpmath.log(abs(b)))) > MAX_ARG_MAG:
                # b^e = exp(e log b): the same limit as for exp
                raise InputError(f"exponent too large in {_show(self.text)} (|exponent * log(base)| "
                                 f"must stay below about 10^{MAX_ARG_MAG * 30103 // 100000})")
            return mpmath.power(b, e)
        return base

    def atom(self):
        kind, text, pos = self.take()
        if kind == "num":
            if text[-1] in "jJ":
                self._note_digits(text)
                return mpmath.mpc(0, self._decimal(_plain(text[:-1])[0]))
            if re.fullmatch(r"\d+", text, re.ASCII):
                return _bounded(decimal_to_int(text))
            self._note_digits(text)
            return self._decimal(_plain(text)[0])
        if kind == "name":
            if text in _CONSTANTS:
                return _CONSTANTS[text]()
            if text in _FUNCTIONS:
                self.take("(")
                self._enter()
                arg = self.expr()
                self.depth -= 1
                self.take(")")
                return self._call(text, arg)
            if text in self.names:
                return self.names[text]
            valid = ", ".join(sorted(self.names) + sorted(_CONSTANTS) + [f + "()" for f in sorted(_FUNCTIONS)])
            raise InputError(f"unknown name {_show(text)} in {_show(self.text)}; known: {valid}")
        if text == "(":
            self._enter()
            v = self.expr()
            self.depth -= 1
            self.take(")")
            return v
        raise InputError(f"unexpected {text!r} at position {pos + 1} in {_show(self.text)}")

    def _decimal(self, text):
        # keep every written digit, however many
        with workdps(max(self.dps, _sig_digits(text) + 10)):
            if len(text) <= _CHUNK:
                return mpmath.mpf(text)
            m = re.fullmatch(r"(\d*)\.?(\d*)(?:[eE]([+-]?\d+))?", text, re.ASCII)
            exp = int(m.group(3) or 0) - len(m.group(2))
            return mpmath.mpf(decimal_to_int(m.group(1) + m.group(2))) * mpmath.mpf(10) ** exp

    def _note_digits(self, text):
        d = _sig_digits(text)
        self.digits = d if self.digits is None else min(self.digits, d)

    def _call(self, name, arg):
        if name == "zeta":
            if arg == 1:
                raise InputError("zeta(1) is infinite")
            if isinstance(arg, (int, Fraction)) and abs(arg) > MAX_ZETA_ARG:
                raise InputError(f"zeta argument too large (limit {MAX_ZETA_ARG})")
        if name in ("exp", "sin", "cos", "gamma", "zeta") and arg != 0 \
                and mpmath.mag(abs(_mp(arg))) > MAX_ARG_MAG:
            # the cost of argument reduction, or the size of the result's exponent, grows with it
            raise InputError(f"{name} argument too large in {_show(self.text)} (limit about "
                             f"10^{MAX_ARG_MAG * 30103 // 100000})")
        if name == "log" and arg == 0:
            raise InputError("log(0) is infinite")
        if name == "sqrt" and isinstance(arg, (int, Fraction)) and arg >= 0:
            r = Fraction(arg)
            import math
            rn, rd = math.isqrt(r.numerator), math.isqrt(r.denominator)
            if rn * rn == r.numerator and rd * rd == r.denominator:
                return Fraction(rn, rd)
        if name == "gamma" and isinstance(arg, int) and arg <= 0:
            raise InputError(f"gamma({arg}) is infinite")
        return _FUNCTIONS[name](_mp(arg))


def _bounded(v):
    """``v``, refused if it is an exact number too large to work with."""
    if isinstance(v, int):
        n = v.bit_length()
    elif isinstance(v, Fraction):
        n = max(v.numerator.bit_length(), v.denominator.bit_length())
    else:
        return v
    if n > MAX_EXACT_BITS:
        raise InputError(f"exact number with about {n * 30103 // 100000} digits (limit "
                         f"{MAX_EXACT_BITS * 30103 // 100000})")
    return v


def _mp(v):
    if isinstance(v, Fraction):
        return mpmath.mpf(v.numerator) / v.denominator
    return mpmath.mpmathify(v)


def evaluate_expression(text: str, dps: int = 30, names=None) -> ExprValue:
    """Evaluate a coefficient expression at ``dps`` working digits.

    ``names`` binds further names to numbers (a family's parameters at one point: an int or
    Fraction stays exact, anything else is a number at the working precision); the built-in
    constants and functions keep their meaning.

    Raises :class:`resum.errors.InputError` with a one-line reason for
    anything it refuses (unknown names, bad syntax, over-long or over-deep
    input, infinite values).
    """
    if not isinstance(text, str):
        raise InputError(f"expected an expression as text, got {type(text).__name__}")
    if len(text) > MAX_LENGTH:
        raise InputError(f"expression longer than {MAX_LENGTH} characters ({len(text)}); "
                         "give a decimal value instead")
    longest = max((_sig_digits(m.group()) for m in re.finditer(r"(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?", text)),
                  default=0)
    work = max(dps, longest) + 10     # arithmetic on long literals keeps all their digits
    with workdps(work):
        bound = {}
        for k, v in (names or {}).items():
            bound[k] = v if isinstance(v, (int, Fraction)) and not isinstance(v, bool) else _mp(v)
        p = _Parser(text, work, bound)
        try:
            v = p.parse()
        except (ZeroDivisionError, OverflowError, ValueError) as exc:
            if isinstance(exc, InputError):
                raise
            raise InputError(f"cannot evaluate {_show(text)}: {str(exc) or 'division by zero'}") from None
        if isinstance(v, Fraction) and v.denominator == 1:
            v = int(v)
        exact = isinstance(v, (int, Fraction)) and p.digits is None
        # (a name bound to a number at the working precision makes the value inexact but carries
        # no digits of its own: the parameter is taken as the point it names)
        if not exact:
            v = _mp(v)
            if isinstance(v, mpmath.mpc) and v.imag == 0:
                v = v.real
            if not mpmath.isfinite(v):
                raise InputError(f"{_show(text)} is not finite")
            if v != 0 and abs(mpmath.mag(v)) > MAX_EXACT_BITS:
                # the same bound as for exact numbers: 1e999999 or exp(1e30) is no perturbative
                # coefficient, and every method would only carry its exponent around
                lim = MAX_EXACT_BITS * 30103 // 100000
                with workdps(30):
                    e10 = int(mpmath.floor(mpmath.log10(abs(v))))
                raise InputError(f"{_show(text)} is about 10^{e10} in size, outside 10^-{lim} .. 10^{lim}; "
                                 "rescale the variable so that the numbers stay inside")
    return ExprValue(v, exact, p.digits)
