"""Reading and writing series files (three formats of our own).

JSON series document (``.json``)::

    {"variable": "x", "coefficients": ["1", "1/2", "pi^2/6", "0.3333333333333333333"]}

optional keys: ``format`` ("resum-series/1"), ``name``, ``description``,
``start`` (power of the first coefficient, default 0), ``coupling`` (for
example ``"x = g^2"`` or ``{"symbol": "g", "power": 2, "scale": "1"}``),
``digits`` (digits every inexact coefficient carries; overrides what the
literals show), ``exact`` (true: decimal literals are exact values),
``provenance`` (object), ``metadata`` (free-form object, kept). Any other key
is refused. Coefficients are strings (expressions allowed) or JSON integers;
JSON numbers with a fraction or exponent are read from their text; with at
most 17 significant digits (a double's shortest text) they carry double
precision (``DOUBLE_DIGITS``), unless ``digits`` is declared.

CSV (``.csv``)::

    # name: demo
    # coupling: x = g^2
    order,coefficient
    0,1
    1,-1/3

orders ascending, missing orders are zero.

Plain text (any other extension)::

    # comments start with '#'
    variable: x
    coupling: x = g^2
    1
    -4/3*pi^2

``key: value`` header lines (the same keys as JSON, scalars only) before the
first coefficient, then one coefficient per line.

Every reader raises :class:`resum.errors.InputError` naming the file and the
line or field. Writers write atomically (temporary file, then rename) and
keep every digit: exact numbers as integers or ``p/q``, inexact ones with the
digits the series carries.
"""
from __future__ import annotations

import errno
import json
import os
import re
import secrets
import stat
from fractions import Fraction
from pathlib import Path
from typing import Optional


from ..context import DEFAULT, Context
from ..errors import InputError, InputTypeError
from ..results import num_to_str
from .core import Coupling, Series
from .expr import decimal_to_int, evaluate_expression, exact_to_text

__all__ = ["read_series", "write_series", "series_from_dict", "series_to_dict",
           "parse_coupling", "atomic_write_text", "clean_temp_files", "temp_target", "TEMP_NAME", "FORMAT_TAG",
           "MAX_TERMS"]

FORMAT_TAG = "resum-series/1"
MAX_TERMS = 100000
MAX_FILE_BYTES = 200 * 1024 * 1024
MAX_DIGITS = 100000          # digits a file may declare its coefficients carry
MAX_COUPLING_POWER = 100     # x = g^p with 1 <= p <= this
_JSON_KEYS = {"format", "name", "description", "variable", "start", "coupling", "digits",
              "exact", "coefficients", "provenance", "metadata"}
_HEADER_KEYS = {"format", "name", "description", "variable", "start", "coupling", "digits", "exact",
                "provenance"}


# ---------------------------------------------------------------- helpers

def parse_coupling(text: str, variable: str = "x") -> Coupling:
    """Parse ``"x = g^2"``, ``"g^2"``, ``"x = 4*g^2"`` or ``"x = g^2/16"``."""
    t = text.replace(" ", "")
    if "=" in t:
        lhs, t = t.split("=", 1)
        if lhs != variable:
            raise InputError(f"coupling {text!r} must relate the variable {variable!r} "
                             f"(write '{variable} = g^2')")
    m = re.fullmatch(r"(?:(?P<pre>[^A-Za-z_]+)\*)?(?P<sym>[A-Za-z_]\w*)(?:(?:\^|\*\*)(?P<pow>\d+))?"
                     r"(?:/(?P<div>[^A-Za-z_]+))?", t)
    if not m:
        raise InputError(f"cannot read coupling {text!r}; write it like 'x = g^2' or 'x = 4*g^2'")
    scale = Fraction(1)
    if m.group("pre"):
        scale *= _exact_scale(m.group("pre"), text)
    if m.group("div"):
        scale /= _exact_scale(m.group("div"), text)
    scale = int(scale) if scale.denominator == 1 else scale
    return Coupling(symbol=m.group("sym"), power=_coupling_power(m.group("pow") or 1, text),
                    scale=scale)


def _coupling_power(p, text):
    if isinstance(p, bool):
        raise InputError(f"coupling {text!r}: the power must be a whole number, not {p!r}")
    try:
        p = int(p)
    except (TypeError, ValueError):
        raise InputError(f"coupling {text!r}: the power must be a whole number, got {p!r}") from None
    if not 1 <= p <= MAX_COUPLING_POWER:
        raise InputError(f"coupling {text!r}: the power must be between 1 and {MAX_COUPLING_POWER}, "
                         f"got {p}")
    return p


def _exact_scale(s, text):
    v = evaluate_expression(s, 30)
    if not v.exact or v.value == 0:
        raise InputError(f"coupling {text!r}: the scale must be a non-zero rational number")
    return Fraction(v.value)


def _coupling_from_json(obj, variable, where):
    if obj is None:
        return None
    if isinstance(obj, str):
        try:
            return parse_coupling(obj, variable)
        except InputError as e:
            raise e.at(where)
    if isinstance(obj, dict):
        extra = set(obj) - {"symbol", "power", "scale"}
        if extra:
            raise InputError(f"unknown key {sorted(extra)[0]!r}; allowed: symbol, power, scale", where=where)
        try:
            scale = _exact_scale(str(obj.get("scale", "1")), str(obj))
            scale = int(scale) if scale.denominator == 1 else scale
            power = _coupling_power(obj.get("power", 1), str(obj))
            return Coupling(symbol=str(obj.get("symbol", "g")), power=power, scale=scale)
        except InputError as e:
            raise e.at(where) from None
        except (TypeError, ValueError) as e:
            raise InputError(str(e), where=where) from None
    raise InputError("must be a string like 'x = g^2' or an object {symbol, power, scale}", where=where)


def _parse_coefficient(text, where, dps, exact_decimals):
    if text is None:
        raise InputError("coefficient missing (null); give its value as a string such as \"1/3\" "
                         "(\"0\" if it vanishes)", where=where)
    if isinstance(text, bool) or not isinstance(text, (str, int)):
        # name the JSON type the user wrote, not Python's
        kind = {list: "a list", dict: "an object", bool: "true/false"}.get(type(text), type(text).__name__)
        raise InputError(f"coefficient must be a string or an integer, got {kind}; write it as a string "
                         "such as \"1/3\"", where=where)
    if isinstance(text, int):
        return text, None
    t = text.strip()
    if not t:
        raise InputError("coefficient missing (empty); give its value (0 if it vanishes)", where=where)
    low = t.lower()
    if low in ("nan", "+nan", "-nan", "inf", "+inf", "-inf", "infinity", "-infinity"):
        raise InputError(f"coefficient {t!r} is not finite; give a finite number", where=where)
    if exact_decimals and re.fullmatch(r"[-+]?(\d+\.?\d*|\.\d+)([eEdD][-+]?\d+)?", t):
        try:
            return _exact_decimal(t), None
        except InputError as e:
            raise e.at(where) from None
    try:
        v = evaluate_expression(t, dps)
    except InputError as e:
        raise e.at(where) from None
    return v.value, v.digits


def _parse_dps(declared, ctx):
    """Digits to parse at: the working digits, or more if the file declares more.

    An unreadable or out-of-range declaration is refused later, by :func:`_build`.
    """
    try:
        d = int(declared) if declared is not None and not isinstance(declared, bool) else None
    except (TypeError, ValueError):
        d = None
    if d is None or not 1 <= d <= MAX_DIGITS:
        return ctx.work_dps
    return max(ctx.work_dps, d + 10)


def _exact_decimal(t):
    m = re.fullmatch(r"([-+]?)(\d*)\.?(\d*)(?:[eEdD]([-+]?\d+))?", t, re.ASCII)
    exp = int(m.group(4) or 0) - len(m.group(3))
    if abs(exp) > MAX_DIGITS:
        raise InputError(f"exponent of {t[:40]!r} too large for an exact value (limit {MAX_DIGITS})")
    mant = decimal_to_int(m.group(1) + ((m.group(2) + m.group(3)) or "0"))
    v = Fraction(mant) * Fraction(10) ** exp
    return int(v) if v.denominator == 1 else v


def _build(coeffs, digits_list, meta, where_of, ctx):
    if not coeffs:
        raise InputError("no coefficients; a series needs at least one", where=where_of(None))
    if len(coeffs) > MAX_TERMS:
        raise InputError(f"more than {MAX_TERMS} coefficients", where=where_of(None))
    variable = meta.get("variable", "x")
    if not isinstance(variable, str) or not variable.isidentifier():
        raise InputError(f"variable {variable!r} is not a name (use letters, digits, '_')",
                         where=where_of("variable"))
    fmt = meta.get("format", FORMAT_TAG)
    if fmt != FORMAT_TAG:
        raise InputError(f"format {fmt!r} is not {FORMAT_TAG!r}", where=where_of("format"))
    start = meta.get("start", 0)
    try:
        if isinstance(start, bool):
            raise ValueError
        start = int(start)
    except (TypeError, ValueError):
        raise InputError(f"start must be an integer, got {start!r}", where=where_of("start")) from None
    if abs(start) > MAX_TERMS:
        raise InputError(f"start {start} is out of range (|start| <= {MAX_TERMS})", where=where_of("start"))
    coupling = _coupling_from_json(meta.get("coupling"), variable, where_of("coupling"))
    digits = meta.get("digits")
    inexact_digits = [d for d in digits_list if d is not None]
    any_inexact = any(not isinstance(c, (int, Fraction)) for c in coeffs)
    if digits is not None:
        try:
            if isinstance(digits, bool):
                raise ValueError
            digits = int(digits)
            if not 1 <= digits <= MAX_DIGITS:
                raise ValueError
        except (TypeError, ValueError):
            raise InputError(f"digits must be a whole number from 1 to {MAX_DIGITS}, got "
                             f"{meta.get('digits')!r}", where=where_of("digits")) from None
    elif any_inexact:
        # literals carry what they show; expressions carry the working precision
        digits = min(inexact_digits) if inexact_digits else ctx.work_dps
        if not inexact_digits:
            digits = ctx.work_dps
    if not any_inexact:
        digits = None
    try:
        with ctx.working():
            s = Series(tuple(coeffs), variable=variable, start=start, digits=digits, coupling=coupling,
                       name=str(meta.get("name", "")), description=str(meta.get("description", "")),
                       provenance=dict(meta.get("provenance", {}) or {}))
    except (TypeError, ValueError) as e:
        raise InputError(str(e).split("\n", 1)[0], where=where_of(None)) from None
    if s.is_zero():
        raise InputError("every coefficient is zero; nothing to analyse", where=where_of("coefficients"))
    if "metadata" in meta:
        s = Series(s.coefficients, s.variable, s.start, s.digits, s.coupling, s.name, s.description,
                   {**s.provenance, "metadata": meta["metadata"]})
    if meta.get("digits") is not None and s.digits is not None:
        # the declaration, not a literal, sets what the series carries: say where it sits
        s = Series(s.coefficients, s.variable, s.start, s.digits, s.coupling, s.name, s.description,
                   {**s.provenance, _DECLARED_KEY: where_of("digits")})
    return s


def _least_precise(digits_list):
    best = None
    for i, d in enumerate(digits_list):
        if d is not None and (best is None or d < digits_list[best]):
            best = i
    return best


# ---------------------------------------------------------------- readers

def series_from_dict(doc: dict, ctx: Optional[Context] = None, where: str = "") -> Series:
    """Build a Series from a JSON series document (already parsed)."""
    ctx = ctx or DEFAULT
    if not isinstance(doc, dict):
        raise InputError("a series document must be a JSON object", where=where)
    extra = set(doc) - _JSON_KEYS
    if extra:
        k = sorted(extra)[0]
        raise InputError(f"unknown key {k!r}; allowed keys: {', '.join(sorted(_JSON_KEYS))} "
                         f"(put free-form information under 'metadata')", where=where)
    if "coefficients" not in doc:
        raise InputError("missing key 'coefficients'", where=where)
    fmt = doc.get("format", FORMAT_TAG)
    if fmt != FORMAT_TAG:
        raise InputError(f"format {fmt!r} is not {FORMAT_TAG!r}", where=_w(where, "format"))
    cs = doc["coefficients"]
    if not isinstance(cs, list):
        raise InputError("must be a list of strings", where=_w(where, "coefficients"))
    exact_dec = doc.get("exact", False)
    if not isinstance(exact_dec, bool):
        raise InputError("must be true or false", where=_w(where, "exact"))
    for key in ("name", "description", "variable"):
        if key in doc and not isinstance(doc[key], str):
            raise InputError("must be a string", where=_w(where, key))
    if "provenance" in doc and not isinstance(doc["provenance"], dict):
        raise InputError("must be an object", where=_w(where, "provenance"))
    coeffs, digs = [], []
    dps = _parse_dps(doc.get("digits"), ctx)
    first_double = None
    for k, c in enumerate(cs):
        double = isinstance(c, _JsonFloat)
        v, d = _parse_coefficient(str(c) if double else c, _w(where, f"coefficients[{k}]"), dps, exact_dec)
        if double and d is not None and d <= 17:
            # a JSON number with a fraction or exponent, short enough to be a double's shortest
            # text, is a double, whatever that text shows ("0.5": one digit as a string, a
            # double's digits as a number); a longer one was written with its digits on purpose
            d = DOUBLE_DIGITS
            first_double = k if first_double is None else first_double
        coeffs.append(v)
        digs.append(d)
    s = _build(coeffs, digs, doc, lambda key: _w(where, key or "coefficients"), ctx)
    s = _keep_where(s, digs, lambda i: _w(where, f"coefficients[{i}]"))
    if first_double is not None and s.digits == DOUBLE_DIGITS and "digits" not in doc:
        s = Series(s.coefficients, s.variable, s.start, s.digits, s.coupling, s.name, s.description,
                   {**s.provenance, _DOUBLE_KEY: _w(where, f"coefficients[{first_double}]")})
    return s


class _JsonFloat(str):
    """A JSON number with a fraction or exponent, kept as its text."""


#: digits a JSON number that is not an integer carries: it is an IEEE double (53 bits, 15.95
#: digits), and its shortest text may sit up to half a unit in the last place from it, so 15
#: digits are sure (common practice, no source)
DOUBLE_DIGITS = 15


def _w(where, key):
    return f"{where}: {key}" if where else key


_WHERE_KEY = "least_precise_at"      # provenance key; not written back to files
_DOUBLE_KEY = "json_doubles_at"       # where the first JSON number read as a double sits; not written back
_DECLARED_KEY = "digits_declared_at"   # where a 'digits' declaration sets the digits; not written back


def _keep_where(series, digs, loc):
    """The series with the place of its least precise coefficient noted in its provenance."""
    i = _least_precise(digs)
    if i is None or series.digits is None or digs[i] != series.digits:
        # (a 'digits:' declaration, not this literal, sets what the series carries)
        return series
    return Series(series.coefficients, series.variable, series.start, series.digits, series.coupling,
                  series.name, series.description, {**series.provenance, _WHERE_KEY: loc(i)})


def least_precise_location(series) -> Optional[str]:
    """Where the least precise coefficient of a series read from a file sits (file and line/field)."""
    return series.provenance.get(_WHERE_KEY)


def declared_digits_location(series) -> Optional[str]:
    """Where the file's 'digits' declaration sits (file and field or header), when that
    declaration sets the digits of a series read from a file; else None."""
    return series.provenance.get(_DECLARED_KEY)


def double_location(series) -> Optional[str]:
    """Where the first coefficient written as a JSON number (read as a double) sits, when such
    numbers set the digits of a series read from a JSON file; else None."""
    return series.provenance.get(_DOUBLE_KEY)


def _read_text_file(path: Path) -> str:
    try:
        size = path.stat().st_size
    except FileNotFoundError:
        raise InputError("file not found", where=str(path)) from None
    except OSError as e:
        raise InputError(f"cannot read file ({e.strerror})", where=str(path)) from None
    if path.is_dir():
        raise InputError("is a directory, not a series file", where=str(path))
    too_big = InputError(f"file larger than {MAX_FILE_BYTES // 2**20} MiB", where=str(path))
    if size > MAX_FILE_BYTES:
        raise too_big
    try:
        # bounded: a device or pipe (/dev/zero, /dev/stdin) reports size 0 and may never end
        with open(path, "rb") as fh:
            raw = fh.read(MAX_FILE_BYTES + 1)
    except OSError as e:
        raise InputError(f"cannot read file ({e.strerror})", where=str(path)) from None
    if len(raw) > MAX_FILE_BYTES:
        raise too_big
    try:
        return raw.decode("utf-8-sig")
    except UnicodeDecodeError as e:
        raise InputError(f"not UTF-8 text (bad byte at offset {e.start}); save the file as UTF-8",
                         where=str(path)) from None


def read_series(path, ctx: Optional[Context] = None, fmt: Optional[str] = None) -> Series:
    """Read a series file (JSON, CSV or plain text, chosen by extension or ``fmt``)."""
    if not isinstance(path, (str, os.PathLike)):
        raise InputTypeError(f"expected a file name (str or pathlib.Path), got {type(path).__name__}",
                             where="path")
    ctx = ctx or DEFAULT
    path = Path(path)
    text = _read_text_file(path)
    fmt = fmt or _guess_format(path, text)
    if fmt == "json":
        try:
            doc = json.loads(text, parse_float=_JsonFloat, parse_int=_json_int,
                             parse_constant=_refuse_constant, object_pairs_hook=_unique_keys)
        except json.JSONDecodeError as e:
            raise InputError(f"line {e.lineno}: malformed JSON ({e.msg})", where=str(path)) from None
        except RecursionError:
            raise InputError("malformed JSON (nested too deeply); a series document is an object "
                             "with a list of coefficients", where=str(path)) from None
        except _BareConstant as e:
            raise InputError(f"line {_bare_token_line(text, e.name)}: {e.bare}", where=str(path)) from None
        except InputError as e:
            raise e.at(str(path)) from None
        s = series_from_dict(doc, ctx, where=str(path))
    elif fmt == "csv":
        s = _read_csv(text, str(path), ctx)
    elif fmt == "text":
        s = _read_plain(text, str(path), ctx)
    else:
        raise InputError(f"unknown format {fmt!r}; use json, csv or text", where=str(path))
    prov = dict(s.provenance)
    prov.setdefault("file", path.name)
    out = Series(s.coefficients, s.variable, s.start, s.digits, s.coupling, s.name or path.stem,
                 s.description, prov)
    return out


def _json_int(text):
    if len(text) > 20000:      # as for an expression (resum.series.expr.MAX_LENGTH)
        raise InputError(f"integer with {len(text)} digits; at most 20000")
    return decimal_to_int(text)


def _unique_keys(pairs):
    """A JSON object as a dict, refusing a key given twice (json keeps the last one silently)."""
    out = {}
    for k, v in pairs:
        if k in out:
            raise InputError(f"key {k!r} given twice in one object; keep one")
        out[k] = v
    return out


class _BareConstant(InputError):
    """A bare NaN / Infinity / -Infinity in a JSON document (Python's reader takes them)."""

    def __init__(self, name):
        super().__init__(f"{name} is not a finite number; give finite coefficients")
        self.name = name


def _refuse_constant(name):
    raise _BareConstant(name)


def _bare_token_line(text: str, name: str) -> int:
    """Line of the first ``name`` outside a JSON string (1 if not found): the reader's hook for
    constants is not told where it is."""
    in_str = esc = False
    for i, ch in enumerate(text):
        if in_str:
            if esc:
                esc = False
            elif ch == "\\":
                esc = True
            elif ch == '"':
                in_str = False
        elif ch == '"':
            in_str = True
        elif text.startswith(name, i):
            return text.count("\n", 0, i) + 1
    return 1


def _guess_format(path: Path, text: str) -> str:
    ext = path.suffix.lower()
    if ext == ".json":
        return "json"
    if ext == ".csv":
        return "csv"
    if text.lstrip().startswith("{"):
        return "json"
    # the CSV header row (after any '# key: value' lines) is no line of the text format: a CSV
    # file saved under another extension is read as CSV, not refused at its header
    for line in text.splitlines():
        line = line.strip()
        if line and not line.startswith("#"):
            return "csv" if line.replace(" ", "").lower() == "order,coefficient" else "text"
    return "text"


def _header_line(line, meta, where):
    key, _, value = line.partition(":")
    key = key.strip()
    if key not in _HEADER_KEYS:
        raise InputError(f"unknown header key {key!r}; allowed: {', '.join(sorted(_HEADER_KEYS))}",
                         where=where)
    value = value.strip()
    if key in meta:
        raise InputError(f"header key {key!r} given twice; keep one", where=where)
    if key == "exact":
        if value.lower() not in ("true", "false", "yes", "no"):
            raise InputError("exact must be true or false", where=where)
        value = value.lower() in ("true", "yes")
    if key == "provenance":
        try:
            value = json.loads(value)
        except (ValueError, RecursionError):
            value = None
        if not isinstance(value, dict):
            raise InputError("provenance must be a JSON object on one line, e.g. {\"source\": \"bes\"}",
                             where=where)
    meta[key] = value


_HEADER_RE = re.compile(r"^\s*([A-Za-z_]\w*)\s*:(.*)$")


def _read_plain(text, fname, ctx):
    meta, coeffs, digs, lines = {}, [], [], []
    for lineno, raw in enumerate(text.splitlines(), 1):
        line = raw.split("#", 1)[0].strip()
        if not line:
            continue
        m = _HEADER_RE.match(line)
        if m and not coeffs:
            _header_line(line, meta, f"{fname}: line {lineno}")
            continue
        if m:
            raise InputError(f"header line {m.group(1)!r} after the first coefficient; "
                             "put 'key: value' lines at the top", where=f"{fname}: line {lineno}")
        try:
            v, d = _parse_coefficient(line, f"{fname}: line {lineno}", _parse_dps(meta.get("digits"), ctx),
                                      meta.get("exact", False))
        except InputError as e:
            word = line.split()[0] if line.split() else ""
            if not coeffs and word in _HEADER_KEYS:
                # 'variable x' or 'variable = x': a header line without its colon
                raise InputError(f"{word!r} reads as a header key but the line has no ':'; write "
                                 f"'{word}: value'", where=f"{fname}: line {lineno}") from None
            raise e
        coeffs.append(v)
        digs.append(d)
        lines.append(lineno)
    s = _build(coeffs, digs, meta, lambda key: fname if key is None else f"{fname}: {key}", ctx)
    return _keep_where(s, digs, lambda i: f"{fname}: line {lines[i]}")


def _read_csv(text, fname, ctx):
    import csv
    import io
    meta, pairs, header_seen = {}, [], False
    body = []
    for lineno, raw in enumerate(text.splitlines(), 1):
        s = raw.strip()
        if not s:
            continue
        if s.startswith("#"):
            inner = s[1:].strip()
            m = _HEADER_RE.match(inner)
            if m and body:
                raise InputError(f"header line {m.group(1)!r} after the first row; put '# key: value' "
                                 "lines at the top", where=f"{fname}: line {lineno}")
            if m:
                _header_line(inner, meta, f"{fname}: line {lineno}")
            continue
        body.append((lineno, raw))
    last = None
    for lineno, raw in body:
        try:
            row = next(csv.reader(io.StringIO(raw), strict=True))
        except (csv.Error, StopIteration) as e:
            raise InputError(f"malformed CSV row ({e}); write 'order,coefficient'",
                             where=f"{fname}: line {lineno}") from None
        if raw.count('"') % 2:
            raise InputError("unbalanced quote; write 'order,coefficient'", where=f"{fname}: line {lineno}")
        row = [c.strip() for c in row]
        if not header_seen and not pairs and row and row[0].lower() in ("order", "n", "k", "power"):
            header_seen = True
            continue
        if len(row) != 2:
            raise InputError(f"expected 2 columns (order, coefficient), found {len(row)}",
                             where=f"{fname}: line {lineno}")
        try:
            order = int(row[0])
        except ValueError:
            raise InputError(f"order {row[0]!r} is not an integer", where=f"{fname}: line {lineno}") from None
        if last is not None and order <= last:
            raise InputError(f"orders must increase (order {order} after {last})",
                             where=f"{fname}: line {lineno}")
        if pairs and order - pairs[0][0] >= MAX_TERMS:
            raise InputError(f"order {order} is {order - pairs[0][0]} past the first order {pairs[0][0]}; "
                             f"a series holds at most {MAX_TERMS} terms", where=f"{fname}: line {lineno}")
        last = order
        v, d = _parse_coefficient(row[1], f"{fname}: line {lineno}", _parse_dps(meta.get("digits"), ctx),
                                  meta.get("exact", False))
        pairs.append((order, v, d, lineno))
    if not pairs:
        raise InputError("no coefficients; a series needs at least one", where=fname)
    start = pairs[0][0]
    if "start" in meta:
        try:
            declared = int(meta["start"])
        except ValueError:
            raise InputError(f"start must be an integer, got {meta['start']!r}", where=f"{fname}: start") from None
        if declared != start:
            raise InputError(f"header start {declared} disagrees with the first order {start}; "
                             "drop the header line or fix it", where=fname)
    meta["start"] = start
    n = pairs[-1][0] - start + 1
    coeffs, digs, lines = [0] * n, [None] * n, [0] * n
    for order, v, d, lineno in pairs:
        coeffs[order - start] = v
        digs[order - start] = d
        lines[order - start] = lineno
    s = _build(coeffs, digs, meta, lambda key: fname if key is None else f"{fname}: {key}", ctx)
    return _keep_where(s, digs, lambda i: f"{fname}: line {lines[i]}")


# ---------------------------------------------------------------- writers

def _coef_text(c, digits):
    if isinstance(c, (int, Fraction)):
        return exact_to_text(c)
    return num_to_str(c, digits)


def series_to_dict(series: Series) -> dict:
    """The JSON series document for ``series`` (every digit kept)."""
    d = {"format": FORMAT_TAG}
    if series.name:
        d["name"] = series.name
    if series.description:
        d["description"] = series.description
    d["variable"] = series.variable
    if series.start:
        d["start"] = series.start
    if series.coupling is not None:
        d["coupling"] = series.coupling.describe(series.variable)
    if series.digits is not None:
        d["digits"] = series.digits
    prov = {k: v for k, v in series.provenance.items() if k not in ("metadata", _WHERE_KEY, _DOUBLE_KEY,
                                                                   _DECLARED_KEY)}
    if prov:
        from ..results import jsonable
        d["provenance"] = jsonable(prov)
    if "metadata" in series.provenance:
        d["metadata"] = series.provenance["metadata"]
    d["coefficients"] = [_coef_text(c, series.digits) for c in series.coefficients]
    return d


# temporary files of atomic writes: ".<target name>.<8 characters>.tmp" beside the target
_TEMP_CHARS = "abcdefghijklmnopqrstuvwxyz0123456789_"
TEMP_NAME = re.compile(r"^\..+\.[a-z0-9_]{8}\.tmp$")


def _open_temp(folder: Path, name: str):
    """Create a new temporary file for ``name`` in ``folder``: ``(fd, path)``.

    Created like ``open(path, "w")`` creates a file (mode 0666 minus the
    umask, and any default ACL of the folder), not private like
    :func:`tempfile.mkstemp`, so the renamed file is readable by whoever may
    read the folder's other files.
    """
    flags = os.O_WRONLY | os.O_CREAT | os.O_EXCL | getattr(os, "O_CLOEXEC", 0) \
        | getattr(os, "O_BINARY", 0)
    for _ in range(100):
        tag = "".join(secrets.choice(_TEMP_CHARS) for _ in range(8))
        tmp = folder / f".{name}.{tag}.tmp"
        try:
            return os.open(tmp, flags, 0o666), tmp
        except FileExistsError:
            continue
    raise FileExistsError(errno.EEXIST, "no free temporary file name", str(folder))


def temp_target(name: str) -> Optional[str]:
    """The file name an atomic write's temporary file ``name`` stood for, or None
    when ``name`` is not of our pattern (``.<target>.<8 characters>.tmp``)."""
    if not TEMP_NAME.match(name):
        return None
    return name[1:-len(".tmp")].rsplit(".", 1)[0]


def clean_temp_files(folder, targets=None) -> int:
    """Remove leftover temporary files of interrupted atomic writes in ``folder``
    (only names of our own pattern, see :func:`atomic_write_text`; with
    ``targets``, a function of the target file name, only those it accepts).
    Returns how many were removed."""
    n = 0
    try:
        entries = list(Path(folder).iterdir())
    except OSError:
        return 0
    for p in entries:
        target = temp_target(p.name)
        if target is None or (targets is not None and not targets(target)):
            continue
        if p.is_file() and not p.is_symlink():
            try:
                p.unlink()
                n += 1
            except OSError:
                pass
    return n


def atomic_write_text(path, text: str) -> None:
    """Write ``text`` to ``path`` atomically (temporary file in the same folder, fsync, rename).

    A new file gets the permissions ``open(path, "w")`` would give it (0666
    minus the umask); a file replaced keeps its permission bits. The
    temporary file is named ``.<name>.<8 characters>.tmp``
    (:data:`TEMP_NAME`); :func:`clean_temp_files` removes those an
    interrupted write left behind.
    """
    path, folder = _output_place(path)
    try:
        old_mode = stat.S_IMODE(os.stat(path).st_mode)
    except OSError:
        old_mode = None
    try:
        fd, tmp = _open_temp(folder, path.name)
    except OSError as e:
        raise InputError(f"cannot write here ({e.strerror}); choose another place for the output",
                         where=str(path)) from None
    try:
        with os.fdopen(fd, "w", encoding="utf-8") as fh:
            fh.write(text)
            fh.flush()
            if old_mode is not None and hasattr(os, "fchmod"):
                os.fchmod(fh.fileno(), old_mode)
            os.fsync(fh.fileno())
        os.replace(tmp, path)
    except BaseException as exc:
        try:
            os.unlink(tmp)
        except OSError:
            pass
        if isinstance(exc, OSError):
            raise InputError(f"cannot write ({exc.strerror or exc}); choose another place for the output",
                             where=str(path)) from None
        raise


def check_output_file(path) -> None:
    """Refuse, before any work, an output ``path`` that :func:`atomic_write_text` could not write:
    an empty name, a missing folder, a folder or device in its place, a folder without write
    permission (tried with a temporary file of the atomic write's pattern, removed at once)."""
    path, folder = _output_place(path)
    try:
        fd, tmp = _open_temp(folder, path.name)
    except OSError as e:
        raise InputError(f"cannot write here ({e.strerror}); choose another place for the output",
                         where=str(path)) from None
    os.close(fd)
    try:
        os.unlink(tmp)
    except OSError:
        pass


def _output_place(path):
    """``(path, folder)`` of an output file, refused (one line) when it cannot be one."""
    if not str(path).strip():
        raise InputError("empty output file name; give a file name", where="output")
    path = Path(path)
    folder = path.parent if str(path.parent) else Path(".")
    if not folder.exists():
        raise InputError("folder does not exist; create it first or choose another place",
                         where=str(folder))
    if not folder.is_dir():
        raise InputError("is not a folder; choose another place for the output", where=str(folder))
    if path.is_dir():
        raise InputError("is a folder; give a file name for the output", where=str(path))
    if path.exists() and not path.is_file():
        # renaming over a device, pipe or socket would replace it with a plain file
        raise InputError("is not a regular file; give a file name for the output", where=str(path))
    return path, folder


def write_series(series: Series, path, fmt: Optional[str] = None) -> Path:
    """Write ``series`` to ``path`` (format from the extension or ``fmt``), atomically."""
    if not isinstance(series, Series):
        raise InputTypeError(f"expected a resum.Series, got {type(series).__name__}; build one with "
                             "Series([c0, c1, ...])", where="series")
    if not isinstance(path, (str, os.PathLike)):
        raise InputTypeError(f"expected a file name (str or pathlib.Path), got {type(path).__name__}",
                             where="path")
    if not str(path).strip():
        raise InputError("empty output file name; give a file name", where="output")
    path = Path(path)
    fmt = fmt or {".json": "json", ".csv": "csv"}.get(path.suffix.lower(), "text")
    if fmt == "json":
        text = json.dumps(series_to_dict(series), indent=1) + "\n"
    elif fmt in ("csv", "text"):
        lines = []
        meta = series_to_dict(series)
        hdr = [(k, meta[k]) for k in ("format", "name", "variable", "coupling", "digits") if k in meta]
        if fmt == "text" and series.start:
            hdr.append(("start", series.start))
        pre = "# " if fmt == "csv" else ""
        desc = series.description.replace("\n", " ").strip()
        if desc and "#" not in desc:
            hdr.insert(1 if hdr and hdr[0][0] == "format" else 0, ("description", desc))
        elif desc:
            lines.append("# " + desc)      # a '#' would end a header line: kept as a comment
        if "provenance" in meta:
            prov = json.dumps(meta["provenance"], separators=(",", ":"))
            if "#" not in prov and "\n" not in prov:
                hdr.append(("provenance", prov))
        for k, v in hdr:
            lines.append(f"{pre}{k}: {v}")
        if fmt == "csv":
            lines.append("order,coefficient")
            for k, c in enumerate(meta["coefficients"]):
                lines.append(f"{series.start + k},{c}")
        else:
            lines.extend(meta["coefficients"])
        text = "\n".join(lines) + "\n"
    else:
        raise InputError(f"unknown format {fmt!r}; use json, csv or text", where=str(path))
    atomic_write_text(path, text)
    return path
