"""The :class:`Series` object: an immutable truncated power series.

Coefficients are stored low to high, exactly when they are exact (``int`` or
``fractions.Fraction``) and otherwise as mpmath numbers together with the
number of decimal digits they carry (``digits``). ``coefficients[k]``
multiplies ``x**(start + k)``.

>>> s = Series([1, 1, 1, 1, 1], variable="x")     # 1/(1-x) to 5 terms
>>> s.rescale(2).coefficients
(1, 2, 4, 8, 16)
>>> (s * s).coefficients
(1, 2, 3, 4, 5)
>>> s.reciprocal().coefficients
(1, -1, 0, 0, 0)
"""
from __future__ import annotations

import hashlib
import json
import math
import numbers
from dataclasses import dataclass, field, replace
from fractions import Fraction
from typing import Iterable, Mapping, Optional

import mpmath

from .._kernels import series_ops as ops
from ..context import DEFAULT, Context
from ..errors import InputError, InputTypeError

__all__ = ["Series", "Coupling", "is_exact_number"]


def is_exact_number(c) -> bool:
    return isinstance(c, (int, Fraction)) and not isinstance(c, bool)


def _check_number(c, k):
    if isinstance(c, str):
        raise InputTypeError(f"coefficient {k} is the text {c!r}, not a number; pass int, Fraction, "
                             "float or mpmath numbers, or read texts (decimals, expressions) with "
                             "resum.series.io.series_from_dict({'coefficients': [...]}), which keeps "
                             "the digits each carries", where="coefficients")
    if isinstance(c, bool) or not isinstance(c, (numbers.Number, mpmath.mpf, mpmath.mpc)):
        raise InputTypeError(f"coefficient {k} is not a number: {c!r}", where="coefficients")
    if isinstance(c, numbers.Integral) and not isinstance(c, int):
        c = int(c)           # numpy integers are exact too
    if isinstance(c, Fraction) and c.denominator == 1:
        c = int(c)
    if isinstance(c, float):
        c = mpmath.mpf(c)
    if isinstance(c, complex):
        c = mpmath.mpc(c)
    if isinstance(c, (mpmath.mpf, mpmath.mpc)) and not mpmath.isfinite(c):
        raise InputError(f"coefficient {k} is not finite ({c}); give a finite number")
    return c


@dataclass(frozen=True)
class Coupling:
    """Relation ``x = scale * symbol**power`` between the expansion variable
    ``x`` and the physical coupling the user thinks in (for example ``g`` with
    ``x = g^2``)."""

    symbol: str = "g"
    power: int = 1
    scale: object = 1

    def __post_init__(self):
        if not isinstance(self.power, int) or self.power < 1:
            raise ValueError("coupling power must be a positive integer")
        if not self.symbol.isidentifier():
            raise ValueError(f"coupling symbol {self.symbol!r} is not a name")

    def to_variable(self, g):
        """x for a coupling value g."""
        return self.scale * mpmath.mpmathify(g) ** self.power

    def from_variable(self, x):
        """The principal coupling value g for a variable value x."""
        v = mpmath.mpmathify(x) / self.scale
        if self.power == 1:
            return v
        r = mpmath.root(v, self.power)
        return r.real if isinstance(r, mpmath.mpc) and r.imag == 0 else r

    def describe(self, variable: str = "x") -> str:
        sc = "" if self.scale == 1 else f"{self.scale}*"
        pw = "" if self.power == 1 else f"^{self.power}"
        return f"{variable} = {sc}{self.symbol}{pw}"

    def to_dict(self) -> dict:
        from ..results import num_to_str
        return {"symbol": self.symbol, "power": self.power, "scale": num_to_str(self.scale)}


@dataclass(frozen=True, eq=False)
class Series:
    """A truncated power series ``sum_k coefficients[k] * x**(start + k)``.

    Parameters
    ----------
    coefficients : sequence of numbers
        Low to high. ``int``/``Fraction`` are exact; floats are converted to
        mpf (carrying 15 digits); mpf/mpc carry ``digits``.
    variable : str
        Name of the expansion variable.
    start : int
        Power of the first coefficient (default 0).
    digits : int or None
        Decimal digits each inexact coefficient is known to. ``None`` means the
        series is exact (or, for mpf input, that the caller vouches for the
        working precision at construction time).
    coupling : Coupling, str or None
        How the variable relates to the physical coupling (a text such as
        ``"x = g^2"`` is read as in series files).
    name, description : str
    provenance : mapping
        Where the series came from (source, parameters, file).

    Notes
    -----
    Series are immutable; every operation returns a new Series. Operations
    on inexact series run at the working precision of the context passed
    (default :data:`resum.context.DEFAULT`), and the result carries
    ``min(digits)`` of its inputs.
    """

    coefficients: tuple
    variable: str = "x"
    start: int = 0
    digits: Optional[int] = None
    coupling: Optional[Coupling] = None
    name: str = ""
    description: str = ""
    provenance: Mapping = field(default_factory=dict)

    def __post_init__(self):
        raw = self.coefficients
        if isinstance(raw, (str, bytes, Mapping)) or not isinstance(raw, Iterable):
            raise InputTypeError(f"expected a sequence of numbers (low to high), got "
                                 f"{type(raw).__name__}", where="coefficients")
        raw = tuple(raw)     # a generator is read once
        floats = any(isinstance(c, float) for c in raw)    # before they become mpf
        cs = tuple(_check_number(c, k) for k, c in enumerate(raw))
        object.__setattr__(self, "coefficients", cs)
        object.__setattr__(self, "provenance", dict(self.provenance))
        if not isinstance(self.variable, str) or not self.variable.isidentifier():
            raise InputError(f"must be a name such as 'x' or 'g2', got {self.variable!r}", where="variable")
        if isinstance(self.start, bool) or not isinstance(self.start, int):
            raise InputTypeError(f"must be an integer, got {self.start!r}", where="start")
        if isinstance(self.coupling, str):
            # the text form a series file uses ("x = g^2"); kept as a string, in_coupling() and
            # evaluate() would fail far from here
            from .io import parse_coupling
            object.__setattr__(self, "coupling", parse_coupling(self.coupling, self.variable))
        elif self.coupling is not None and not isinstance(self.coupling, Coupling):
            raise InputError(f"coupling: expected a Coupling or a text such as "
                             f"'{self.variable} = g^2', got {self.coupling!r}")
        if self.digits is not None and (isinstance(self.digits, bool) or not isinstance(self.digits, int)
                                        or self.digits < 1):
            raise InputError(f"digits must be a whole number >= 1, got {self.digits!r}")
        if self.digits is None and not all(is_exact_number(c) for c in cs):
            inferred = 15 if floats else mpmath.mp.dps
            object.__setattr__(self, "digits", int(inferred))

    # ------------------------------------------------------------------ basics
    def __len__(self):
        return len(self.coefficients)

    @property
    def n_terms(self) -> int:
        return len(self.coefficients)

    @property
    def is_exact(self) -> bool:
        return all(is_exact_number(c) for c in self.coefficients)

    @property
    def is_real(self) -> bool:
        return not any(isinstance(c, mpmath.mpc) and c.imag != 0 for c in self.coefficients)

    @property
    def order(self) -> int:
        """Highest power present (``start + n_terms - 1``)."""
        return self.start + self.n_terms - 1

    def _new(self, coefficients, **kw) -> "Series":
        return replace(self, coefficients=tuple(coefficients), **kw)

    def dense(self, ctx: Optional[Context] = None, n: Optional[int] = None) -> list:
        """Coefficients of x^0, x^1, ... as mpmath numbers at ``ctx`` precision.

        Raises ValueError for a series with negative powers.
        """
        ctx = ctx or DEFAULT
        if self.start < 0:
            raise ValueError(f"series starts at {self.variable}^{self.start}; dense() needs start >= 0")
        with ctx.working():
            out = [mpmath.mpf(0)] * self.start + [_to_mp(c) for c in self.coefficients]
        return out if n is None else out[:n]

    def exact_dense(self) -> list:
        """Exact coefficients from x^0 (ints and Fractions); raises if inexact."""
        if not self.is_exact:
            raise ValueError("series is not exact")
        if self.start < 0:
            raise ValueError("dense coefficients need start >= 0")
        return [0] * self.start + list(self.coefficients)

    def _dense_native(self):
        """Coefficients from x^0 in their own number types (exact stays exact)."""
        if self.start < 0:
            raise ValueError(f"operation needs a power series (start >= 0), got start={self.start}")
        return [0] * self.start + list(self.coefficients)

    def _from_native(self, cs, digits=None, **kw) -> "Series":
        cs = list(cs)
        st = 0
        return replace(self, coefficients=tuple(cs), start=st,
                       digits=self.digits if digits is None else digits, **kw)

    def input_hash(self) -> str:
        """SHA-256 of the canonical coefficient strings, variable and start."""
        from ..results import num_to_str
        from .expr import exact_to_text      # exact numbers of any length (str() stops at 4300 digits)
        payload = json.dumps([self.variable, self.start, [exact_to_text(c) if is_exact_number(c) else num_to_str(c)
                                                          for c in self.coefficients]])
        return hashlib.sha256(payload.encode()).hexdigest()[:16]

    def __repr__(self):
        head = ", ".join(_short_exact(c) if is_exact_number(c) else mpmath.nstr(c, 8)
                         for c in self.coefficients[:4])
        more = ", ..." if self.n_terms > 4 else ""
        kind = "exact" if self.is_exact else f"{self.digits} digits"
        return f"Series([{head}{more}], n_terms={self.n_terms}, start={self.start}, {kind})"

    def leading_nonzero(self) -> int:
        """Index (in coefficients) of the first non-zero coefficient, or -1."""
        for k, c in enumerate(self.coefficients):
            if c != 0:
                return k
        return -1

    def is_zero(self) -> bool:
        return self.leading_nonzero() < 0

    def evaluate_partial(self, x, n: Optional[int] = None, ctx: Optional[Context] = None):
        """Partial sum of the first ``n`` terms at ``x``."""
        with _working(ctx, self.digits):
            x = mpmath.mpmathify(x)
            s = 0
            for k, c in enumerate(self.coefficients[: self.n_terms if n is None else n]):
                s += _to_mp(c) * x ** (self.start + k)
            return +s

    # -------------------------------------------------------- variable changes
    def truncate(self, n: int) -> "Series":
        """Keep the first ``n`` coefficients."""
        if n < 0:
            raise ValueError("n must be >= 0")
        return self._new(self.coefficients[:n])

    def rescale(self, c, ctx: Optional[Context] = None) -> "Series":
        """Substitute x -> c x."""
        if is_exact_number(c) and c == 1:
            return self
        with _working(ctx, self.digits):
            # an exact factor stays exact for negative powers too (int ** -1 would be a float)
            cc = Fraction(c) if is_exact_number(c) else mpmath.mpmathify(c)
            return self._new([a * cc ** (self.start + k) for k, a in enumerate(self.coefficients)])

    def substitute_power(self, k: int) -> "Series":
        """Substitute x -> x^k (k a positive integer)."""
        if not isinstance(k, int) or k < 1:
            raise ValueError("k must be a positive integer")
        out = []
        for i, a in enumerate(self.coefficients):
            out.append(a)
            if i < self.n_terms - 1:
                out.extend([0] * (k - 1))
        return self._new(out, start=self.start * k)

    def in_coupling(self) -> "Series":
        """The same series written in the physical coupling (x = scale g^p)."""
        if self.coupling is None:
            return self
        s = self.rescale(self.coupling.scale).substitute_power(self.coupling.power)
        return replace(s, variable=self.coupling.symbol, coupling=None)

    def shift(self, m: int) -> "Series":
        """Multiply by x^m."""
        return self._new(self.coefficients, start=self.start + m)

    # ---------------------------------------------------------------- algebra
    def __add__(self, other):
        if not isinstance(other, Series):
            other = _check_number(other, "scalar")
            if self.start > 0:
                return replace(self, coefficients=(other,) + (0,) * (self.start - 1) + self.coefficients,
                               start=0)
            k = -self.start
            if k >= self.n_terms:
                return self
            cs = list(self.coefficients)
            old = cs[k]
            with _working(None, self.digits):
                cs[k] = old + other
            if self.digits is not None and not is_exact_number(old) and old != 0:
                return replace(self._new(cs), digits=_digits_left(self.digits, _cancellation(
                    abs(old) + abs(other), cs[k])))
            return self._new(cs)
        if other.variable != self.variable:
            raise ValueError(f"variables differ: {self.variable} and {other.variable}")
        lo = min(self.start, other.start)
        hi = min(self.order, other.order)
        d = _min_digits(self.digits, other.digits)
        out = []
        loss = 0.0
        with _working(None, d):
            for p in range(lo, hi + 1):
                v = 0
                size = 0
                for s_ in (self, other):
                    k = p - s_.start
                    if 0 <= k < s_.n_terms:
                        c = s_.coefficients[k]
                        v = v + c
                        if s_.digits is not None and not is_exact_number(c):
                            size = size + abs(c)
                out.append(v)
                loss = max(loss, _cancellation(size, v))
        return replace(self, coefficients=tuple(out), start=lo, digits=_digits_left(d, loss))

    __radd__ = __add__

    def __neg__(self):
        # at the series' own precision: -c on an mpf rounds to mpmath's ambient precision
        with _working(None, self.digits):
            return self._new([-c for c in self.coefficients])

    def __sub__(self, other):
        return self + (-other)

    def __rsub__(self, other):
        return (-self) + other

    def __mul__(self, other):
        if not isinstance(other, Series):
            other = _check_number(other, "scalar")
            with _working(None, self.digits):
                return self._new([c * other for c in self.coefficients])
        if other.variable != self.variable:
            raise ValueError(f"variables differ: {self.variable} and {other.variable}")
        d = _min_digits(self.digits, other.digits)
        lo = self.start + other.start
        a = self.coefficients
        m = min(self.n_terms, other.n_terms)
        with _working(None, d):
            out = ops.mul(list(a), list(other.coefficients), m)
        return replace(self, coefficients=tuple(out), start=lo, digits=d)

    __rmul__ = __mul__

    def reciprocal(self, ctx: Optional[Context] = None) -> "Series":
        """1/f; a leading power x^k becomes x^-k."""
        k0 = self.leading_nonzero()
        if k0 < 0:
            raise ZeroDivisionError("reciprocal of a zero series")
        a = list(self.coefficients[k0:])
        with _working(ctx, self.digits):
            out = ops.reciprocal(a, len(a))
        return replace(self, coefficients=tuple(out), start=-(self.start + k0))

    def __truediv__(self, other):
        if isinstance(other, Series):
            return self * other.reciprocal()
        other = _check_number(other, "scalar")
        if other == 0:
            raise InputError("division of a series by zero")
        # at the series' own precision, as in __mul__: c / other on an mpf rounds to mpmath's
        # ambient precision
        with _working(None, self.digits):
            if is_exact_number(other):
                return self._new([c / Fraction(other) if is_exact_number(c) else c / other
                                  for c in self.coefficients])
            return self._new([c / other for c in self.coefficients])

    def __rtruediv__(self, other):
        """``c / f``: a number times the reciprocal (``1 / Series([1, -1])`` is 1/(1-x))."""
        if isinstance(other, Series):
            return NotImplemented
        return self.reciprocal() * _check_number(other, "scalar")

    def compose(self, inner: "Series", ctx: Optional[Context] = None) -> "Series":
        """f(inner(x)); ``inner`` must vanish at x = 0."""
        b = inner._dense_native()
        m = inner.start + inner.leading_nonzero()       # inner = O(x^m)
        # f_j inner^j with the inner series known to x^N_i: its error enters at N_i + 1 + (j - 1) m
        # (j >= 1), and f's own truncation at (N_f + 1) m
        n = min(inner.order, (self.order + 1) * max(m, 1) - 1) + 1
        with _working(ctx, _min_digits(self.digits, inner.digits)):
            out = ops.compose(self._dense_native(), b, n)
        return replace(self._from_native(out, digits=_min_digits(self.digits, inner.digits)),
                       variable=inner.variable)

    def log(self, ctx: Optional[Context] = None) -> "Series":
        """log f (needs f(0) != 0)."""
        if not self.coefficients:
            raise InputError("log of an empty series")
        a = self._dense_native()
        with _working(ctx, self.digits):
            out = ops.log(a, len(a))
        d = self.digits if a[0] == 1 or not is_exact_number(a[0]) else (self.digits or (ctx or DEFAULT).dps)
        return self._from_native(out, digits=d)

    def exp(self, ctx: Optional[Context] = None) -> "Series":
        if not self.coefficients:
            raise InputError("exp of an empty series")
        a = self._dense_native()
        with _working(ctx, self.digits):
            out = ops.exp(a, len(a))
        d = self.digits if a[0] == 0 or not is_exact_number(a[0]) else (self.digits or (ctx or DEFAULT).dps)
        return self._from_native(out, digits=d)

    def derivative(self) -> "Series":
        """d/dx."""
        with _working(None, self.digits):
            out = [(self.start + k) * c for k, c in enumerate(self.coefficients)]
        if self.start == 0:
            return self._new(out[1:], start=0)
        return self._new(out, start=self.start - 1)

    def log_derivative(self, ctx: Optional[Context] = None) -> "Series":
        """f'/f as a power series (the leading power k contributes k/x)."""
        k0 = self.leading_nonzero()
        if k0 < 0:
            raise ZeroDivisionError("log-derivative of a zero series")
        core = self._new(self.coefficients[k0:], start=0)
        d = core.derivative()
        n = core.n_terms - 1
        with _working(ctx, self.digits):
            out = ops.div(list(d.coefficients), list(core.coefficients), n)
        lead = self.start + k0
        if lead:
            return replace(self, coefficients=tuple([lead] + list(out)), start=-1)
        return self._from_native(out)

    def borel(self, b=0, ctx: Optional[Context] = None) -> "Series":
        """Borel-Le Roy transform: c_n -> c_n / Gamma(n + 1 + b) (b = 0 is Borel)."""
        ctx = ctx or DEFAULT
        try:
            bf = mpmath.mpmathify(b)
        except (TypeError, ValueError):
            raise InputError(f"b: expected a number, got {b!r}") from None
        if isinstance(bf, mpmath.mpc) or not mpmath.isfinite(bf):
            raise InputError(f"b: expected a finite real number, got {b!r}")
        if bf <= -1 and bf != int(bf):
            raise InputError(f"b = {b}: Gamma(n + 1 + b) changes sign between the poles; choose b > -1")
        a = self._dense_native()
        if is_exact_number(b) and Fraction(b).denominator == 1:
            b = int(b)
            if b < 0 and any(a[n] != 0 for n in range(min(len(a), -b))):
                raise ValueError("Gamma(n+1+b) has poles for these n; choose b > -1")
            with _working(ctx, self.digits):      # mpf / int rounds to the ambient precision
                out = [(Fraction(c) / math.factorial(n + b) if is_exact_number(c) else c / math.factorial(n + b))
                       if n + b >= 0 else 0 for n, c in enumerate(a)]
            return self._from_native(out, name=self.name, provenance={**self.provenance, "borel_b": b})
        with _working(ctx, self.digits):
            out = [_to_mp(c) / mpmath.gamma(n + 1 + mpmath.mpmathify(b)) for n, c in enumerate(a)]
        return self._from_native(out, digits=self.digits or ctx.dps,
                                 provenance={**self.provenance, "borel_b": str(b)})


def _to_mp(c):
    if isinstance(c, Fraction):
        return mpmath.mpf(c.numerator) / c.denominator
    return mpmath.mpmathify(c)


def _short_exact(c) -> str:
    """An exact number for a repr: in full when short, else its size."""
    big = max(c.numerator.bit_length(), c.denominator.bit_length()) if isinstance(c, Fraction) else c.bit_length()
    if big < 3000:
        return str(c)
    return f"<exact, about {big * 30103 // 100000} digits>"


def _cancellation(size, v) -> float:
    """Decimal digits lost when terms of total size ``size`` (their absolute values) sum to
    ``v``: an inexact coefficient that cancels keeps only what is left of its digits (relative to
    the sum; 1.000000001 - 1 leaves 1 of 10). 0 for no inexact term or an exact zero."""
    if not size or v == 0:
        return 0.0
    return max(0.0, float(mpmath.log10(size / abs(v))))


def _digits_left(d, loss):
    """``d`` digits less a cancellation of ``loss`` digits (at least 1; losses under half a
    digit ignored)."""
    if d is None or loss <= 0.5:
        return d
    return max(1, int(math.floor(d - loss)))


def _min_digits(a, b):
    if a is None:
        return b
    if b is None:
        return a
    return min(a, b)


def _extra(digits, ctx=None):
    """Extra working digits so inexact coefficient arithmetic keeps what it has (relative to
    ``ctx``, default DEFAULT: a context of 10 digits passed explicitly still keeps a 90-digit
    series' digits)."""
    if digits is None:
        return 0
    return max(0, digits - (ctx or DEFAULT).work_dps + 10)


def _working(ctx, digits):
    """``ctx`` (default DEFAULT) entered with the extra digits ``digits`` need."""
    ctx = ctx or DEFAULT
    return ctx.working(_extra(digits, ctx))
