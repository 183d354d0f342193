"""The numeric arguments of the sources, read one way for all of them.

:func:`number` reads a coupling, an angle or a point ``x``; :func:`whole` a count
(``orders``, ``loops``, ``state``) or a choice (``sign``). Every source accepts
the same forms and gives the same one-line messages naming the parameter
(:class:`resum.errors.InputError`):

>>> from fractions import Fraction
>>> [mpmath.nstr(number(v, "g", 15), 10) for v in (1, 0.5, Fraction(1, 4), "0.25", "pi/5")]
['1.0', '0.5', '0.25', '0.25', '0.6283185307']
>>> number("pi/", "g", 15)
Traceback (most recent call last):
...
resum.errors.InputError: g: ...
>>> number("1 + I", "angle", 15, real=True)
Traceback (most recent call last):
...
resum.errors.InputError: angle: must be real, got 1 + I
>>> whole(0, "orders", 1)
Traceback (most recent call last):
...
resum.errors.InputError: orders: expected a whole number >= 1, got 0
"""
from __future__ import annotations

from contextlib import nullcontext
from fractions import Fraction
from typing import Optional

import mpmath

from ..context import workdps
from ..errors import InputError

__all__ = ["number", "whole"]


def number(value, name: str, dps: Optional[int] = None, *, real: bool = False):
    """``value`` as a finite mpmath number at ``dps`` digits (default: the working precision).

    Accepted: int, float, Fraction, mpmath and Python complex numbers, and text: a decimal
    (``"0.25"``) or an expression of the project's parser (``"pi/5"``, ``"3/4*(pi/2)"``,
    ``"1 + I/8"``; :func:`resum.series.expr.evaluate_expression`), evaluated at ``dps`` digits.
    A complex value with a zero imaginary part is returned as a real one (mpf); ``real=True``
    refuses any other complex value.
    """
    from ..series.expr import evaluate_expression
    if isinstance(value, bool):
        raise InputError(f"{name}: expected a number, got {value!r}")
    with (workdps(dps) if dps else nullcontext()):
        v = value
        if isinstance(v, str):
            try:
                v = evaluate_expression(v, dps=mpmath.mp.dps).value
            except InputError as exc:
                raise exc.at(name) from None
        if isinstance(v, Fraction):
            v = mpmath.mpf(v.numerator) / v.denominator
        try:
            v = mpmath.mpmathify(v)
        except (TypeError, ValueError):
            raise InputError(f"{name}: expected a number, got {value!r}") from None
        if isinstance(v, mpmath.mpc) and v.imag == 0:
            v = v.real
        if not mpmath.isfinite(v):
            raise InputError(f"{name}: must be finite, got {value}")
        if real and isinstance(v, mpmath.mpc):
            raise InputError(f"{name}: must be real, got {value}")
        return +v


def whole(value, name: str, minimum: Optional[int] = None, maximum: Optional[int] = None, *,
          choices: Optional[tuple] = None, why: str = ""):
    """``value`` if it is an int (not a bool) within ``minimum`` .. ``maximum`` (inclusive, None:
    no limit) or among ``choices``; ``why`` (the reason for a limit) ends the message."""
    tail = f" ({why})" if why else ""
    is_int = isinstance(value, int) and not isinstance(value, bool)
    if choices is not None:
        if not is_int or value not in choices:
            raise InputError(f"{name}: must be {' or '.join(map(str, choices))}, got {value!r}{tail}")
        return value
    if not is_int or (minimum is not None and value < minimum):
        need = "" if minimum is None else f" >= {minimum}"
        raise InputError(f"{name}: expected a whole number{need}, got {value!r}{tail}")
    if maximum is not None and value > maximum:
        raise InputError(f"{name}: at most {maximum}, got {value}{tail}")
    return value
