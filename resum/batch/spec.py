"""Family specs: a declarative TOML file naming a parameter grid and its tasks.

A family is one series source evaluated on a grid of its parameters; at
every grid point the same tasks run (analysis, evaluation at given
couplings, a strong-coupling probe, ground truth where the source has it).
The spec is validated completely before any work starts; every mistake
raises :class:`resum.errors.InputError` with a one-line message naming the
key, and the file and line where it can be found.

Layout (all tables but ``[study]``, ``[axes]`` and ``[tasks]`` optional)::

    [study]
    name = "bes-angles"            # letters, digits, - and _
    description = "radius against the deformation angle"
    source = "bes"                 # a key of resum.sources.SOURCES
    dps = 40                       # working precision (decimal digits)
    plot_against = "angle"         # axis on the x axis of the family plots

    [fixed]                        # source parameters that do not vary
    loops = 60

    [axes]                         # source parameters that do
    angle = { range = { start = 0, stop = "pi/2", num = 25 } }
    state = { values = [0, 1, 2] }

    [grid]                         # optional; default: product of all axes
    combine = ["angle", ["state", "coupling"]]   # inner lists are zipped

    [tasks.coefficients]           # partial sums and a plain ratio estimate
    at = [0.1, 0.2]
    [tasks.analyze]
    methods = ["ratio", "pade"]    # optional; default: the analysis default
    [tasks.evaluate]
    at = [1, 2, "sqrt(2)"]
    method = "auto"
    [tasks.strong]                 # options of the strong-coupling probe
    [tasks.truth]                  # finite-coupling ground truth
    at = [1, 2]

Numbers may be written as TOML numbers or as expression strings (``"pi/2"``,
``"3/4"``, ``"sqrt(2)"``), evaluated by
:func:`resum.series.expr.evaluate_expression` at the study's ``dps``.

>>> spec = parse_spec('''
... [study]
... name = "demo"
... source = "geometric"
... [axes]
... ratio = { range = { start = 1, stop = 2, num = 3 } }
... [tasks.coefficients]
... ''', sources={"geometric": {"params": [{"name": "ratio", "type": "float", "default": 1},
...                                          {"name": "orders", "type": "int", "default": 20}]}})
>>> [p.label() for p in spec.points()]
['ratio=1', 'ratio=1.5', 'ratio=2']
"""
from __future__ import annotations

import hashlib
import json
import math
import re
from dataclasses import dataclass, field
from fractions import Fraction
from typing import Mapping, Optional

import mpmath

from ..context import Context, workdps
from ..errors import InputError

try:  # Python 3.11+
    import tomllib
except ModuleNotFoundError:  # pragma: no cover - Python 3.10
    import tomli as tomllib  # type: ignore[no-redef]

__all__ = ["FamilySpec", "Axis", "Point", "load_spec", "parse_spec", "resolve_source", "SPEC_FORMAT",
           "MAX_POINTS"]

SPEC_FORMAT = "resum-family/1"
MAX_POINTS = 100000
_NAME = re.compile(r"^[A-Za-z][A-Za-z0-9_\-]*$")

_TOP_KEYS = {"study", "fixed", "axes", "grid", "tasks"}
_STUDY_KEYS = {"name": str, "description": str, "source": str, "dps": int,
               "plot_against": str}
_AXIS_KEYS = {"values", "range"}
_RANGE_KEYS = {"start", "stop", "num", "spacing"}
_GRID_KEYS = {"combine"}


# ----------------------------------------------------------------------------
# source parameter descriptions (the registry is written elsewhere; accept
# objects with attributes or plain dicts)
# ----------------------------------------------------------------------------

def _get(obj, key, default=None):
    if isinstance(obj, Mapping):
        return obj.get(key, default)
    return getattr(obj, key, default)


def _type_name(t) -> str:
    if isinstance(t, str):
        return {"integer": "int", "real": "float", "number": "float", "string": "str",
                "boolean": "bool"}.get(t, t)
    if isinstance(t, type):
        return {int: "int", float: "float", str: "str", bool: "bool"}.get(t, t.__name__)
    return str(t)


def source_params(source) -> dict:
    """``{name: (type_name, default)}`` of a source's parameters."""
    out = {}
    for p in _get(source, "params", ()) or ():
        if isinstance(p, (tuple, list)):
            name, typ, default = p[0], p[1], (p[2] if len(p) > 2 else None)
        else:
            name, typ, default = _get(p, "name"), _get(p, "type", "float"), _get(p, "default")
        out[str(name)] = (_type_name(typ), default)
    return out


def source_choices(source) -> dict:
    """``{name: choices}`` of the parameters that take only listed values."""
    out = {}
    for p in _get(source, "params", ()) or ():
        if not isinstance(p, (tuple, list)) and _get(p, "choices"):
            out[str(_get(p, "name"))] = tuple(_get(p, "choices"))
    return out


def source_text_params(source) -> set:
    """Names of the ``float`` parameters whose build() takes an expression text (``takes_text``)."""
    return {str(_get(p, "name")) for p in _get(source, "params", ()) or ()
            if not isinstance(p, (tuple, list)) and _get(p, "takes_text", False)}


def source_limits(source) -> dict:
    """``{name: (minimum, maximum)}`` of the parameters with a lower or upper limit
    (inclusive; None where there is none)."""
    out = {}
    for p in _get(source, "params", ()) or ():
        if isinstance(p, (tuple, list)):
            continue
        lo, hi = _get(p, "minimum"), _get(p, "maximum")
        if lo is not None or hi is not None:
            out[str(_get(p, "name"))] = (lo, hi)
    return out


def _registry(sources=None) -> Mapping:
    if sources is not None:
        return sources
    try:
        from ..sources import SOURCES
    except ImportError:  # pragma: no cover - sources not installed
        return {}
    return SOURCES


def resolve_source(name: str, sources=None):
    """The source called ``name``: a key of ``resum.sources.SOURCES`` or
    ``"package.module:object"`` naming a source of your own (an object or dict
    with ``params`` and ``build(ctx, **params) -> Series``). Returns None when
    there is no such source."""
    return _find_source(name, sources)[0]


def _find_source(name: str, sources=None):
    """``(source, None)``, or ``(None, why)`` with why a phrase saying what was missing
    ("" for a name that is neither registered nor of the form ``package.module:object``)."""
    reg = _registry(sources)
    if name in reg:
        return reg[name], None
    if ":" in name:
        import importlib
        mod, _, attr = name.partition(":")
        dotted = r"[A-Za-z_]\w*(\.[A-Za-z_]\w*)*"
        if not (re.fullmatch(dotted, mod) and re.fullmatch(dotted, attr)):
            return None, ""  # ':' or '.mod:x': import_module raises ValueError / TypeError
        try:
            obj = importlib.import_module(mod)
        except ImportError as e:
            return None, f"cannot import module {mod!r} ({e})"
        except Exception as e:      # the user's module failed while it was imported
            return None, f"importing module {mod!r} raised {type(e).__name__}: {_first_line(e)}"
        try:
            for part in attr.split("."):
                obj = getattr(obj, part)
        except AttributeError:
            return None, f"module {mod!r} has no {attr!r}"
        if callable(_get(obj, "build")):
            return obj, None
        return None, f"{name!r} has no build(ctx, **params)"
    return None, ""


def _first_line(e) -> str:
    return (str(e).strip().splitlines() or [""])[0][:200]


# ----------------------------------------------------------------------------
# values
# ----------------------------------------------------------------------------

def _number(raw, dps: int, where: str):
    """A TOML number or expression string -> int / Fraction / mpf."""
    if isinstance(raw, bool):
        raise InputError("expected a number, got a boolean", where=where)
    if isinstance(raw, int):
        return raw
    if isinstance(raw, float):
        if not math.isfinite(raw):
            raise InputError("expected a finite number", where=where)
        # a TOML float is a decimal literal: keep the digits it was written with
        return _expr(repr(raw), dps, where)
    if isinstance(raw, str):
        return _expr(raw, dps, where)
    raise InputError(f"expected a number or an expression string, got {type(raw).__name__}",
                     where=where)


def _expr(text: str, dps: int, where: str):
    from ..series.expr import evaluate_expression
    try:
        v = evaluate_expression(text, dps=dps).value
    except InputError as exc:
        raise exc.at(where) from None
    if isinstance(v, mpmath.mpc):
        raise InputError(f"{text!r} is complex; parameters must be real", where=where)
    return v


def _coerce(value, typ: str, where: str, dps: int = 30):
    """Convert a parsed number to the source parameter's type."""
    if typ == "int":
        if isinstance(value, Fraction) and value.denominator == 1:
            value = int(value)
        if isinstance(value, mpmath.mpf) and value == mpmath.nint(value):
            value = int(mpmath.nint(value))
        if not isinstance(value, int):
            raise InputError(f"expected an integer, got {value}", where=where)
        return value
    if typ == "float":
        # ints stay ints; ratios become mpf (mantissa at the working digits of the parse)
        if isinstance(value, Fraction):
            with workdps(dps + 10):
                return mpmath.mpf(value.numerator) / value.denominator
        return value
    raise InputError(f"parameter of type {typ} cannot take the number {value}", where=where)


def _param_value(raw, typ: str, dps: int, where: str):
    if typ == "str":
        if not isinstance(raw, str):
            raise InputError(f"expected a string, got {type(raw).__name__}", where=where)
        return raw
    if typ == "bool":
        if not isinstance(raw, bool):
            raise InputError(f"expected true or false, got {raw!r}", where=where)
        return raw
    return _coerce(_number(raw, dps, where), typ, where, dps)


def value_text(v) -> str:
    """Short canonical text of a parameter value (used in records and labels)."""
    from ..results import num_to_str
    if isinstance(v, (bool, str)):
        return str(v).lower() if isinstance(v, bool) else v
    if isinstance(v, (int, Fraction)):
        return num_to_str(v)
    with workdps(20):
        return mpmath.nstr(v, 15, strip_zeros=True)


def value_json(v, dps: int):
    """Full-precision JSON form of a parameter value."""
    from ..results import num_to_str
    if isinstance(v, (bool, str)):
        return v
    if isinstance(v, (int, Fraction)):
        return num_to_str(v)
    with workdps(dps):
        return num_to_str(v, dps)


# ----------------------------------------------------------------------------
# spec objects
# ----------------------------------------------------------------------------

@dataclass(frozen=True)
class Axis:
    """One varying source parameter: its name and the values it takes."""

    name: str
    values: tuple
    #: expression text per value (None where there is none), for a parameter that takes it:
    #: ``"pi/2"`` reaches the source as that text, not as its rounded value
    texts: tuple = ()

    def __len__(self):
        return len(self.values)


@dataclass(frozen=True)
class Point:
    """One grid point: its index, its axis indices and parameter values."""

    index: int
    params: Mapping           # varying parameters only, in axis order
    axis_index: Mapping       # axis name -> position along that axis

    @property
    def key(self) -> str:
        return f"p{self.index:05d}"

    def label(self) -> str:
        return ", ".join(f"{k}={value_text(v)}" for k, v in self.params.items())


@dataclass(frozen=True)
class FamilySpec:
    """A validated family spec.

    Attributes
    ----------
    name, description, source : str
    dps : int
        Working precision for every task (decimal digits).
    fixed : dict
        Source parameters that do not vary (already converted).
    axes : tuple of Axis
    combine : tuple
        Entries of the product; each a tuple of axis names zipped together.
    tasks : dict
        ``{task name: options}`` in the order written; options validated.
    raw : dict
        The parsed TOML, kept to ship the spec to workers and to compare
        with an earlier run (:attr:`digest`).
    text : str
        The file's text (copied into the output folder).
    """

    name: str
    description: str
    source: str
    dps: int
    fixed: Mapping
    axes: tuple
    combine: tuple
    tasks: Mapping
    plot_against: str
    raw: Mapping = field(repr=False)
    text: str = field(default="", repr=False)
    path: str = ""
    fixed_texts: Mapping = field(default_factory=dict)

    @property
    def digest(self) -> str:
        """SHA-256 of the canonical parsed spec (comments and layout do not count)."""
        return spec_digest(self.raw)

    @property
    def context(self) -> Context:
        return Context(dps=self.dps)

    def axis(self, name: str) -> Axis:
        for a in self.axes:
            if a.name == name:
                return a
        raise KeyError(name)

    @property
    def n_points(self) -> int:
        n = 1
        for group in self.combine:
            n *= len(self.axis(group[0]))
        return n

    def points(self) -> list:
        """All grid points, in a fixed order (last combine entry fastest)."""
        return [self.point(i) for i in range(self.n_points)]

    def point(self, index: int) -> Point:
        if not 0 <= index < self.n_points:
            raise IndexError(index)
        sizes = [len(self.axis(g[0])) for g in self.combine]
        pos = []
        rest = index
        for s in reversed(sizes):
            pos.append(rest % s)
            rest //= s
        pos.reverse()
        where = {}
        for group, k in zip(self.combine, pos):
            for name in group:
                where[name] = k
        params = {a.name: a.values[where[a.name]] for a in self.axes}
        return Point(index, params, {a.name: where[a.name] for a in self.axes})

    def source_kwargs(self, point: Point) -> dict:
        """Keyword arguments for the source's ``build`` at ``point``."""
        kw = dict(self.fixed)
        kw.update(self.fixed_texts)
        kw.update(point.params)
        for a in self.axes:
            t = a.texts[point.axis_index[a.name]] if a.texts else None
            if t is not None:
                kw[a.name] = t
        return kw


def spec_digest(raw: Mapping) -> str:
    payload = json.dumps(raw, sort_keys=True, default=str, separators=(",", ":"))
    return hashlib.sha256(payload.encode()).hexdigest()


# ----------------------------------------------------------------------------
# reading and validating
# ----------------------------------------------------------------------------

#: Largest spec file read (a spec is a few tables; long value lists belong in ranges).
MAX_SPEC_BYTES = 16 * 2**20


def load_spec(path, sources=None) -> FamilySpec:
    """Read and validate a family spec file.

    Raises
    ------
    InputError
        for a missing/unreadable file, TOML syntax errors (with the line and
        column tomllib reports) and every semantic mistake (with the key and
        the line it is on).
    """
    path = str(path)
    try:
        with open(path, "rb") as fh:
            data = fh.read(MAX_SPEC_BYTES + 1)     # bounded: /dev/zero or a pipe may never end
    except OSError as exc:
        raise InputError(f"cannot read the spec: {exc.strerror}", where=path) from None
    if len(data) > MAX_SPEC_BYTES:
        raise InputError(f"the spec is larger than {MAX_SPEC_BYTES // 2**20} MiB; a spec is a few "
                         "tables (see studies/*/spec.toml)", where=path)
    try:
        # a byte-order mark (as some Windows editors write) is not part of the TOML text
        text = data.decode("utf-8-sig")
    except UnicodeDecodeError:
        raise InputError("the spec is not UTF-8 text", where=path) from None
    return parse_spec(text, path=path, sources=sources)


def _dps_hint(raw) -> int:
    """The largest whole number given for a parameter named ``dps`` (fixed or on an axis), or 0."""
    best = 0

    def walk(v):
        nonlocal best
        if isinstance(v, int) and not isinstance(v, bool):
            best = max(best, v)
        elif isinstance(v, list):
            for x in v:
                walk(x)
        elif isinstance(v, dict):
            for x in v.values():
                walk(x)
    for table in ("fixed", "axes"):
        t = raw.get(table)
        if isinstance(t, dict) and "dps" in t:
            walk(t["dps"])
    return min(best, 5000)


def parse_spec(text: str, path: str = "<spec>", sources=None) -> FamilySpec:
    """Validate spec ``text`` (see the module docstring for the layout)."""
    try:
        raw = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        m = re.search(r"at line (\d+)", str(exc))
        where = f"{path}:{m.group(1)}" if m else path
        if text.lstrip().startswith(("{", "[{")) or str(path).lower().endswith(".json"):
            raise InputError("a family spec is a TOML file (see studies/*/spec.toml), not JSON; write "
                             "it as [study], [axes], [tasks.NAME] tables", where=path) from None
        raise InputError(f"TOML syntax error: {exc}", where=where) from None
    except RecursionError:
        raise InputError("TOML nested too deeply; a spec is a few flat tables (see "
                         "studies/*/spec.toml)", where=path) from None
    v = _Validator(raw, text, path, sources)
    return v.run()


class _Validator:
    def __init__(self, raw, text, path, registry):
        self.raw, self.text, self.path, self.registry = raw, text, path, registry
        self.lines = text.splitlines()

    # where a key is written, for messages
    def where(self, dotted: str) -> str:
        line = self._line_of(dotted)
        loc = f"{self.path}:{line}" if line else self.path
        return f"{loc}: [{dotted}]" if "." not in dotted else f"{loc}: {dotted}"

    def _line_of(self, dotted: str) -> Optional[int]:
        parts = dotted.split(".")
        last = re.escape(parts[-1])
        tab = re.escape(".".join(parts))
        pats = [re.compile(rf"^\s*\[+\s*{tab}\s*\]+"),
                re.compile(rf"^\s*[\"']?{last}[\"']?\s*="),
                re.compile(rf"[{{,]\s*[\"']?{last}[\"']?\s*=")]
        # prefer a line after the parent table's header
        start = 0
        if len(parts) > 1:
            parent = re.compile(rf"^\s*\[+\s*{re.escape('.'.join(parts[:-1]))}\s*\]+")
            for i, ln in enumerate(self.lines):
                if parent.search(ln):
                    start = i
                    break
            else:
                head = re.compile(rf"^\s*\[+\s*{re.escape(parts[0])}\s*\]+")
                for i, ln in enumerate(self.lines):
                    if head.search(ln):
                        start = i
                        break
        for pat in pats:
            for i in list(range(start, len(self.lines))) + list(range(0, start)):
                if pat.search(self.lines[i]):
                    return i + 1
        return None

    def err(self, dotted: str, message: str) -> InputError:
        return InputError(message, where=self.where(dotted))

    def table(self, obj, dotted: str, allowed, required=()) -> dict:
        if not isinstance(obj, dict):
            raise self.err(dotted, f"expected a table, got {_tname(obj)}")
        for k in obj:
            if k not in allowed:
                raise self.err(f"{dotted}.{k}",
                               f"unknown key {k!r}; allowed here: {', '.join(sorted(allowed))}")
        for k in required:
            if k not in obj:
                raise self.err(dotted, f"missing key {k!r}")
        return obj

    def run(self) -> FamilySpec:
        raw = self.raw
        for k in raw:
            if k not in _TOP_KEYS:
                raise self.err(k, f"unknown table {k!r}; allowed: {', '.join(sorted(_TOP_KEYS))}")
        if "study" not in raw:
            raise InputError("missing the [study] table (name, source, dps)", where=self.path)
        study = self.table(raw["study"], "study", _STUDY_KEYS, required=("name", "source"))
        for k, typ in _STUDY_KEYS.items():
            if k in study and (not isinstance(study[k], typ) or isinstance(study[k], bool)):
                raise self.err(f"study.{k}", f"expected {typ.__name__}, got {_tname(study[k])}")
        name = study["name"]
        if not _NAME.match(name):
            raise self.err("study.name", f"{name!r}: use letters, digits, '-' and '_' only")
        dps = study.get("dps", 30)
        if not 10 <= dps <= 5000:
            raise self.err("study.dps", f"dps={dps} out of range; use 10..5000")
        src_name = study["source"]
        source, why = _find_source(src_name, self.registry)
        if source is None and why:
            raise self.err("study.source", f"{why}; a source of your own is 'package.module:object' "
                           "with params and build(ctx, **params), importable here and by every worker")
        if source is None:
            raise self.err("study.source", f"unknown source {src_name!r}; known: "
                           f"{', '.join(sorted(_registry(self.registry))) or 'none installed'} "
                           "(or 'package.module:object' for a source of your own)")
        params = source_params(source)
        self.choices = source_choices(source)
        self.limits = source_limits(source)

        # parameter values (an expression such as "pi/8") are evaluated at the largest precision
        # any point asks for, plus guard digits: evaluated at the study's dps, an angle used by a
        # point at dps = 35 was wrong from its 30th digit
        vdps = max(dps, _dps_hint(raw)) + 10

        # fixed parameters
        fixed = {}
        fixed_texts = {}
        self.text_params = source_text_params(source)
        fixed_raw = self.table(raw.get("fixed", {}), "fixed", set(params))
        for k, val in fixed_raw.items():
            fixed[k] = self._choice(k, _param_value(val, params[k][0], vdps,
                                                    self.where(f"fixed.{k}")),
                                    self.where(f"fixed.{k}"))
            if k in self.text_params and _is_expression(val):
                fixed_texts[k] = val.strip()

        # axes
        axes_raw = raw.get("axes")
        if not axes_raw:
            raise InputError("missing the [axes] table: give at least one varying parameter",
                             where=self.path)
        axes_raw = self.table(axes_raw, "axes", set(params))
        axes = []
        for k, spec in axes_raw.items():
            if k in fixed:
                raise self.err(f"axes.{k}", f"{k!r} is both fixed and an axis")
            axes.append(self._axis(k, spec, params[k][0], vdps))

        self._carried_digits(dps, fixed, axes, params)

        # grid
        combine = self._combine(raw.get("grid", {}), [a.name for a in axes])
        lengths = {a.name: len(a) for a in axes}
        for g in combine:
            if len({lengths[n] for n in g}) > 1:
                raise self.err("grid.combine", "zipped axes must have the same length: " +
                               ", ".join(f"{n} has {lengths[n]}" for n in g))
        self._distinct(axes, combine, vdps)
        n = 1
        for g in combine:
            n *= len(axes[[a.name for a in axes].index(g[0])])
        if n > MAX_POINTS:
            raise self.err("grid", f"{n} points is more than {MAX_POINTS}; split the family")

        # tasks
        from .tasks import TASKS, validate_task
        tasks_raw = raw.get("tasks")
        if not tasks_raw:
            raise InputError(f"missing the [tasks] table; known tasks: {', '.join(TASKS)}",
                             where=self.path)
        tasks_raw = self.table(tasks_raw, "tasks", set(TASKS))
        tasks = {}
        for k, opts in tasks_raw.items():
            if not isinstance(opts, dict):
                raise self.err(f"tasks.{k}", f"expected a table, got {_tname(opts)}")
            for ok in opts:
                if ok not in TASKS[k].options:
                    raise self.err(f"tasks.{k}.{ok}",
                                   f"unknown option {ok!r} of task {k!r}; allowed: "
                                   f"{', '.join(sorted(TASKS[k].options)) or 'none'}")
            try:
                tasks[k] = validate_task(k, opts, dps, src_name, source,
                                         names={a.name: a.values[0] for a in axes})
            except InputError as exc:
                raise exc.at(self.where(f"tasks.{k}")) from None

        plot_against = study.get("plot_against", axes[0].name)
        if plot_against not in [a.name for a in axes]:
            raise self.err("study.plot_against",
                           f"{plot_against!r} is not an axis; axes: {', '.join(a.name for a in axes)}")
        return FamilySpec(name=name, description=study.get("description", ""), source=src_name,
                          dps=dps, fixed=fixed, axes=tuple(axes), combine=combine, tasks=tasks,
                          plot_against=plot_against, raw=raw, text=self.text, path=self.path,
                          fixed_texts=fixed_texts)

    def _axis(self, name, spec, typ, dps) -> Axis:
        dotted = f"axes.{name}"
        if isinstance(spec, list):
            spec = {"values": spec}
        spec = self.table(spec, dotted, _AXIS_KEYS)
        if len(spec) != 1:
            raise self.err(dotted, "give exactly one of 'values' (a list) or 'range' "
                           "({start, stop, num})")
        if "values" in spec:
            vals = spec["values"]
            if not isinstance(vals, list) or not vals:
                raise self.err(f"{dotted}.values", "expected a non-empty list")
            out = []
            for i, v in enumerate(vals):
                w = self.where(f"{dotted}.values") + f"[{i}]"
                out.append(self._choice(name, _param_value(v, typ, dps, w), w))
            out = tuple(out)
            texts = tuple(v.strip() if _is_expression(v) else None for v in vals)
        else:
            rng = self.table(spec["range"], f"{dotted}.range", _RANGE_KEYS,
                             required=("start", "stop", "num"))
            w = self.where(f"{dotted}.range")
            if typ not in ("int", "float"):
                raise self.err(f"{dotted}.range", f"a range needs a numeric parameter, {name!r} is {typ}")
            num = rng["num"]
            if not isinstance(num, int) or isinstance(num, bool) or num < 1:
                raise self.err(f"{dotted}.range", "num must be a positive integer")
            if num > MAX_POINTS:   # before the values are built: that alone would take hours
                raise self.err(f"{dotted}.range", f"num = {num} is more than {MAX_POINTS} "
                               "points; split the family")
            spacing = rng.get("spacing", "linear")
            if spacing not in ("linear", "log"):
                raise self.err(f"{dotted}.range", f"spacing {spacing!r}: use 'linear' or 'log'")
            a = _number(rng["start"], dps, w + " start")
            b = _number(rng["stop"], dps, w + " stop")
            out = tuple(self._choice(name, _coerce(x, typ, w, dps), w)
                        for x in _linspace(a, b, num, spacing, dps, w))
            texts = ()
            if spacing == "linear" and (_is_expression(rng["start"]) or _is_expression(rng["stop"])):
                texts = _range_texts(rng["start"], rng["stop"], a, num)
        if name not in getattr(self, "text_params", ()) or not any(t is not None for t in texts):
            texts = ()
        return Axis(name, out, texts)

    def _carried_digits(self, dps, fixed, axes, params) -> None:
        """Refuse a source ``dps`` (the digits its coefficients carry) below the study's ``dps``:
        every task would work at digits the series does not have, while the record claims them
        (``resum evaluate --dps`` refuses the same mismatch)."""
        if "dps" not in params:
            return
        where, given = None, []
        if "dps" in fixed:
            where, given = "fixed.dps", [fixed["dps"]]
        for a in axes:
            if a.name == "dps":
                where, given = "axes.dps", list(a.values)
        low = [d for d in given if isinstance(d, int) and not isinstance(d, bool) and d < dps]
        if not low:
            return
        carried = min(low)
        fix = ("raise it to" if where == "fixed.dps" else "give every value") + f" at least {dps}"
        raise self.err(where, f"the series carries only {carried} digits but study.dps = {dps} "
                       f"was asked; {fix}, or lower study.dps to at most {carried}")

    def _distinct(self, axes, combine, dps) -> None:
        """Refuse a grid that would compute the same point twice: a plain axis may not repeat a
        value; axes zipped together may (a state axis [0, 1, 2] beside orders [40, 40, 60]), as
        long as their combined tuples differ."""
        by_name = {a.name: a for a in axes}
        for group in combine:
            rows = list(zip(*(by_name[n].values for n in group)))
            seen = {}
            for i, row in enumerate(rows):
                key = tuple(value_json(v, dps) for v in row)
                if key not in seen:
                    seen[key] = i
                    continue
                if len(group) == 1:
                    raise self.err(f"axes.{group[0]}", "the axis repeats a value "
                                   f"({value_text(row[0])} at positions {seen[key]} and {i})")
                combo = ", ".join(f"{n}={value_text(v)}" for n, v in zip(group, row))
                raise self.err("grid.combine", f"the zipped axes {', '.join(group)} repeat the "
                               f"point ({combo}) at positions {seen[key]} and {i}; change one "
                               "of the values or drop the duplicate")

    def _choice(self, name, value, where):
        """``value`` if the source accepts it for ``name`` (listed choices, minimum, maximum)."""
        ch = getattr(self, "choices", {}).get(name)
        if ch is not None and value not in ch:
            raise InputError(f"{value_text(value)} is not allowed; choose from "
                             f"{', '.join(value_text(c) for c in ch)}", where=where)
        lo, hi = getattr(self, "limits", {}).get(name, (None, None))
        if isinstance(value, (int, float, Fraction, mpmath.mpf)) and not isinstance(value, bool):
            if lo is not None and value < lo:
                raise InputError(f"{name} = {value_text(value)} is too small; it must be at least "
                                 f"{value_text(lo)}", where=where)
            if hi is not None and value > hi:
                raise InputError(f"{name} = {value_text(value)} is too large; it must be at most "
                                 f"{value_text(hi)}", where=where)
        return value

    def _combine(self, grid, names) -> tuple:
        grid = self.table(grid, "grid", _GRID_KEYS)
        if "combine" not in grid:
            return tuple((n,) for n in names)
        comb = grid["combine"]
        if not isinstance(comb, list) or not comb:
            raise self.err("grid.combine", "expected a list of axis names (inner lists are zipped)")
        groups, seen = [], set()
        for entry in comb:
            group = entry if isinstance(entry, list) else [entry]
            if not group or not all(isinstance(g, str) for g in group):
                raise self.err("grid.combine", f"bad entry {entry!r}: use an axis name or a "
                               "list of axis names")
            for g in group:
                if g not in names:
                    raise self.err("grid.combine", f"{g!r} is not an axis; axes: {', '.join(names)}")
                if g in seen:
                    raise self.err("grid.combine", f"axis {g!r} appears twice")
                seen.add(g)
            groups.append(tuple(group))
        missing = [n for n in names if n not in seen]
        if missing:
            raise self.err("grid.combine", f"axes {', '.join(missing)} are not combined; "
                           "list every axis")
        return tuple(groups)


def _is_expression(raw) -> bool:
    """A TOML string that is not a plain decimal literal (``"pi/2"``, ``"3*pi/8"``)."""
    if not isinstance(raw, str):
        return False
    try:
        Fraction(raw.strip())
        return False
    except ValueError:
        return True


def _range_texts(start, stop, a, num):
    """Expression text of each point of a linear range whose ends are expressions: the ends
    as written, the interior ``start + k/(num-1)*((stop) - (start))`` (``k/(num-1)*(stop)``
    when the start is 0), so every point is exact for a source that evaluates it."""
    s0, s1 = str(start).strip(), str(stop).strip()
    if num == 1:
        return (s0,)
    out = []
    for k in range(num):
        if k == 0:
            out.append(s0)
        elif k == num - 1:
            out.append(s1)
        else:
            f = Fraction(k, num - 1)
            out.append(f"{f}*({s1})" if a == 0 else f"({s0}) + {f}*(({s1}) - ({s0}))")
    return tuple(out)


def _linspace(a, b, num, spacing, dps, where):
    with workdps(dps + 10):
        exact = all(isinstance(x, (int, Fraction)) for x in (a, b)) and spacing == "linear"
        if num == 1:
            return [a]
        if exact:
            step = Fraction(b - a, num - 1) if isinstance(b - a, int) else (Fraction(b) - Fraction(a)) / (num - 1)
            out = [a + k * step for k in range(num)]
            return [int(x) if isinstance(x, Fraction) and x.denominator == 1 else x for x in out]
        fa = mpmath.mpf(a.numerator) / a.denominator if isinstance(a, Fraction) else mpmath.mpf(a)
        fb = mpmath.mpf(b.numerator) / b.denominator if isinstance(b, Fraction) else mpmath.mpf(b)
        if spacing == "log":
            if fa <= 0 or fb <= 0:
                raise InputError("a log range needs positive start and stop", where=where)
            la, lb = mpmath.log(fa), mpmath.log(fb)
            return [mpmath.exp(la + (lb - la) * k / (num - 1)) if 0 < k < num - 1 else (fa if k == 0 else fb)
                    for k in range(num)]
        return [fa + (fb - fa) * k / (num - 1) for k in range(num)]


def _tname(x) -> str:
    return {dict: "a table", list: "a list", str: "a string", bool: "a boolean",
            int: "an integer", float: "a float"}.get(type(x), type(x).__name__)
