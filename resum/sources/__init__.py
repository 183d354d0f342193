"""Series sources: generators of long perturbative series with known answers.

``SOURCES`` maps a name to a :class:`SourceSpec` (``name``, ``help``,
``params``, ``build(ctx, **params) -> Series`` and, where the source knows its
finite-coupling values, ``truth(ctx, points, **params) -> [Estimate]``).
``resum generate NAME`` and family studies use this registry.

>>> sorted(SOURCES)
['bes', 'catalan', 'euler', 'oscillator', 'phi4']
>>> s = SOURCES["phi4"].build(Context(dps=20), orders=3)
>>> [str(c) for c in s.coefficients]
['1', '-3/4', '105/32']

Sources
-------
bes
    Angle-deformed BES kernel quantity ``F_a(g)`` in ``x = g^2``
    (:mod:`resum.sources.bes`); ``truth`` at couplings ``g``.
oscillator
    Rayleigh-Schrodinger series of the quartic anharmonic oscillator
    ``p^2 + x^2 + g x^4`` (:mod:`resum.sources.oscillator`); ``truth`` by
    diagonalisation at couplings ``g``.
phi4
    Zero-dimensional ``phi^4`` integral (:mod:`resum.sources.phi4`);
    ``truth`` from its Bessel-function closed form.
euler
    Euler's series ``sum (sign)^n n! x^n`` (:mod:`resum.sources.euler`);
    ``truth`` (the Borel sum) for the alternating one.
catalan
    Generating function of the Catalan numbers ``(1 - sqrt(1 - 4x))/(2x)``
    (:mod:`resum.sources.catalan`): convergent, radius ``1/4``, square-root
    branch point; ``truth`` from the closed form at real ``x < 1/4``.

Any analytic callable: :func:`resum.sources.cauchy.taylor_coefficients`.
"""
from __future__ import annotations

from dataclasses import dataclass
from typing import Any, Callable, Optional, Sequence

from ..context import DEFAULT, Context
from ..errors import InputError

__all__ = ["SOURCES", "SourceSpec", "Param", "get_source"]


@dataclass(frozen=True)
class Param:
    """One source parameter: ``type`` is ``"int"``, ``"float"`` (a number or
    an expression such as ``"pi/3"``), ``"str"`` or ``"bool"``.

    ``choices`` lists the only values allowed; ``minimum`` and ``maximum``
    (inclusive, None: no limit) bound a numeric one. ``resum generate`` and
    family specs refuse a value outside them before any work starts.

    >>> Param("loops", "int", 60, "loops", minimum=1).check(-3)
    Traceback (most recent call last):
    ...
    resum.errors.InputError: loops: must be at least 1, got -3
    """

    name: str
    type: str
    default: Any
    help: str
    choices: Optional[tuple] = None
    minimum: Any = None
    maximum: Any = None
    #: a ``float`` parameter whose build() evaluates an expression text itself: a family grid
    #: given by expressions (``stop = "pi/2"``) hands it the text of each point
    #: (``"5/24*(pi/2)"``), so the value is exact at the source's own precision
    takes_text: bool = False

    def check(self, value, where: Optional[str] = None):
        """``value`` if this parameter accepts it; else an InputError naming
        ``where`` (default: the parameter's name). None (the default) passes."""
        where = where or self.name
        if value is None or self.type not in ("int", "float") or isinstance(value, (str, bool)):
            return value
        if self.choices and value not in self.choices:
            raise InputError(f"choose from {', '.join(str(c) for c in self.choices)}, got {value}",
                             where=where)
        try:
            low = self.minimum is not None and value < self.minimum
            high = self.maximum is not None and value > self.maximum
        except TypeError:                      # a complex number
            raise InputError(f"must be a real number, got {value}", where=where) from None
        if low:
            raise InputError(f"must be at least {self.minimum}, got {value}", where=where)
        if high:
            raise InputError(f"must be at most {self.maximum}, got {value}", where=where)
        return value


@dataclass(frozen=True)
class SourceSpec:
    name: str
    help: str
    params: tuple
    build: Callable
    truth: Optional[Callable] = None
    truth_help: str = ""
    #: (parameter, offset): the series built has ``value + offset`` coefficients, so a family
    #: task that needs more terms (``evaluate`` with ``goal_digits``) can ask for them
    length: Optional[tuple] = None
    #: ``params -> digits``: the coefficients' digits ``resum generate`` (without ``--dps``) and
    #: family points (no ``dps`` in the spec) ask for; None: the working precision. For sources
    #: whose resummation needs more digits than the working precision as the series grows.
    default_digits: Optional[Callable] = None

    def __post_init__(self):
        # every call of build: unknown parameters, values outside their parameter's limits and
        # a context beyond MAX_DPS are input errors (a build function need not check them again)
        raw, names, src, check = self.build, {p.name for p in self.params}, self.name, self.check

        def build(ctx: Optional[Context] = None, **params):
            unknown = [k for k in params if k not in names]
            if unknown:
                raise InputError(f"source {src!r} has no parameter {unknown[0]!r}; known: "
                                 f"{', '.join(sorted(names))}")
            check(**params)
            if ctx is not None and ctx.dps > MAX_DPS:
                raise InputError(f"dps: {ctx.dps} digits asked; at most {MAX_DPS}")
            return raw(ctx, **params)
        build.__doc__ = raw.__doc__
        object.__setattr__(self, "build", build)

    def check(self, **params) -> dict:
        """``params`` if every value lies within its parameter's limits (see
        :meth:`Param.check`); unknown names are left to ``build``."""
        known = {p.name: p for p in self.params}
        for k, v in params.items():
            if k in known:
                known[k].check(v)
        return params

    def param(self, name: str) -> Param:
        for p in self.params:
            if p.name == name:
                return p
        raise InputError(f"source {self.name!r} has no parameter {name!r}; known: "
                         f"{', '.join(p.name for p in self.params)}")


# limits of the build functions, kept here so that reading the registry imports
# no numerics (tests check them against resum.sources.bes / oscillator)
BES_MAX_LOOPS = 400          # resum.sources.bes.MAX_LOOPS: cost grows like loops^4
OSC_MAX_ORDERS = 3000        # resum.sources.oscillator.MAX_ORDERS
MAX_DPS = 5000               # as for a family spec's study.dps
MIN_DPS = 5                  # resum.context.Context refuses fewer digits
MAX_ORDERS = 100000          # resum.series.io.MAX_TERMS: a longer series file cannot be read back
# the exact sources write every digit, and the readers take files up to 200 MiB
# (resum.series.io.MAX_FILE_BYTES): Euler's n! make about 160 MiB at 10000 orders (the sum of
# log10 k! for k < 10000), phi^4's rationals 173 MiB at 8000 (measured: 181074332 bytes, 41 s);
# 100000 orders would be some 20 GB, built in memory first
EULER_MAX_ORDERS = 10000
PHI4_MAX_ORDERS = 8000
CATALAN_MAX_ORDERS = 20000


def _ctx_with(ctx: Optional[Context], dps: Optional[int]) -> Context:
    ctx = ctx or DEFAULT
    if dps is None:
        return ctx
    from ._params import whole
    return ctx.with_dps(whole(dps, "dps", MIN_DPS))


# ----------------------------------------------------------------------------- bes

def _bes_build(ctx: Optional[Context] = None, angle="pi/4", loops: int = 60,
               dps: Optional[int] = None, exact: bool = False):
    from .bes import weak_coupling_series
    return weak_coupling_series(angle, loops, _ctx_with(ctx, dps), exact=bool(exact))


def bes_default_digits(loops) -> int:
    """Coefficient digits ``resum generate bes`` writes when no ``--dps`` is given:
    ``max(30, loops + 10)``. Measured (``resum evaluate`` at g = 1, 5, 20, 30 digits asked, a =
    pi/4 and 3 pi/8): the digits reached stop growing with the coefficients' digits at about 60
    for 60 loops, 80-100 for 100 loops and 130 for 150 loops; at 30 digits, 100 loops reached
    10 digits at g = 1 instead of 27-30. Generating 200 loops at 210 digits takes about 12 s."""
    return max(DEFAULT.dps, int(loops if loops is not None else 60) + 10)


def _bes_truth(ctx: Context, points: Sequence, angle="pi/4", dps: Optional[int] = None, **_):
    from .bes import finite_coupling
    out = []
    for g in points:
        r = finite_coupling(g, angle, _ctx_with(ctx, dps))
        out.append(r.value if r.success else None)
    return out


# ---------------------------------------------------------------------- oscillator

def _osc_build(ctx: Optional[Context] = None, state: int = 0, orders: int = 100):
    from .oscillator import series
    return series(state, orders)


def _osc_truth(ctx: Context, points: Sequence, state: int = 0, **_):
    from .oscillator import energy
    out = []
    for g in points:
        r = energy(g, state, ctx)
        out.append(r.value if r.success else None)
    return out


# ----------------------------------------------------------------------------- phi4

def _phi4_build(ctx: Optional[Context] = None, orders: int = 60):
    from .phi4 import series
    return series(orders)


def _phi4_truth(ctx: Context, points: Sequence, **_):
    from .phi4 import value
    return [value(g, ctx) for g in points]


# ---------------------------------------------------------------------------- euler

def _euler_build(ctx: Optional[Context] = None, orders: int = 50, sign: int = -1):
    from .euler import series
    return series(orders, sign)


def _euler_truth(ctx: Context, points: Sequence, sign: int = -1, **_):
    from .euler import truth
    return truth(ctx, points, sign=sign)


# -------------------------------------------------------------------------- catalan

def _catalan_build(ctx: Optional[Context] = None, orders: int = 60):
    from .catalan import series
    return series(orders)


def _catalan_truth(ctx: Context, points: Sequence, **_):
    from .catalan import truth
    return truth(ctx, points)


SOURCES = {
    "bes": SourceSpec(
        "bes", "angle-deformed BES kernel quantity F_a(g) = 4 g^2 [(1+K(a))^-1]_11, "
               "series in x = g^2 (a = pi/4: cusp anomalous dimension)",
        (Param("angle", "float", "pi/4", "deformation angle a in radians (a number or an "
                                         "expression such as pi/3)", takes_text=True),
         Param("loops", "int", 60, "number of loops: highest power g^(2 loops)",
               minimum=1, maximum=BES_MAX_LOOPS),
         Param("dps", "int", None, "correct significant digits of every coefficient "
                                   "(default: the working precision; resum generate: "
                                   "max(30, loops + 10), which long series need for "
                                   "their resummation)",
               minimum=MIN_DPS, maximum=MAX_DPS),
         Param("exact", "bool", False, "also store the exact coefficients (pi, zeta values) in "
                                       "the provenance")),
        _bes_build, _bes_truth, "F_a(g) at couplings g by a truncated matrix and quadrature",
        ("loops", 1), lambda kw: bes_default_digits(kw.get("loops"))),
    "oscillator": SourceSpec(
        "oscillator", "energy levels of p^2 + x^2 + g x^4 as exact Rayleigh-Schrodinger series in g",
        (Param("state", "int", 0, "level: 0 ground state, 1 first excited, ...", minimum=0,
               maximum=200),
         Param("orders", "int", 100, "number of coefficients (g^0 .. g^(orders-1)); the exact "
                                     "recursion's cost grows about like orders^4: 300 orders take "
                                     "about 8 s, 400 about 35 s",
               minimum=1, maximum=OSC_MAX_ORDERS)),
        _osc_build, _osc_truth, "energy at couplings g by diagonalisation in an oscillator basis",
        ("orders", 0)),
    "phi4": SourceSpec(
        "phi4", "zero-dimensional phi^4 integral Z(g) = (2 pi)^(-1/2) Int exp(-x^2/2 - g x^4/4) dx",
        (Param("orders", "int", 60, "number of coefficients (g^0 .. g^(orders-1))",
               minimum=1, maximum=PHI4_MAX_ORDERS),),
        _phi4_build, _phi4_truth, "Z(g) from its modified-Bessel closed form", ("orders", 0)),
    "euler": SourceSpec(
        "euler", "Euler's series sum (sign)^n n! x^n",
        (Param("orders", "int", 50, "number of coefficients", minimum=1, maximum=EULER_MAX_ORDERS),
         Param("sign", "int", -1, "-1: alternating (Borel summable), 1: same sign", (-1, 1))),
        _euler_build, _euler_truth, "Borel sum e^(1/x) E_1(1/x)/x (alternating series only)",
        ("orders", 0)),
    "catalan": SourceSpec(
        "catalan", "Catalan numbers' generating function (1 - sqrt(1 - 4x))/(2x): radius 1/4, "
                   "square-root branch point",
        (Param("orders", "int", 60, "number of coefficients (x^0 .. x^(orders-1))",
               minimum=1, maximum=CATALAN_MAX_ORDERS),),
        _catalan_build, _catalan_truth, "the closed form at real x < 1/4 (principal square root)",
        ("orders", 0)),
}


def default_digits_for(source, kwargs: dict) -> Optional[int]:
    """The coefficient digits ``source`` asks for by default with the parameters ``kwargs``
    (absent ones at their defaults), or None: when it names none (``SourceSpec.default_digits``)
    or ``kwargs`` gives ``dps`` already. Used by ``resum generate`` without ``--dps`` and by
    family runs whose spec gives no ``dps`` for the source."""
    fn = getattr(source, "default_digits", None)
    if fn is None or kwargs.get("dps") is not None:
        return None
    full = {p.name: p.default for p in getattr(source, "params", ())}
    full.update({k: v for k, v in kwargs.items() if v is not None})
    return int(fn(full))


def rebuilder(source, kwargs: dict, n_terms: int, ctx: Optional[Context] = None, build=None,
              digits: Optional[int] = None):
    """``n -> Series``: the series ``build(ctx, **kwargs)`` gave (``n_terms`` coefficients)
    rebuilt with ``n`` coefficients, through the parameter the source names as its length
    (``length = (parameter, offset)``: the series has ``value + offset`` terms); the source's
    ``dps`` parameter (the one in ``kwargs``, or else ``digits``, what the given series carries)
    grows in proportion to the terms (longer series lose more digits when re-expanded: the
    conformal re-expansion of the kernel family's 100 loops cancels about 40); ``rebuild(n,
    digits=D)`` asks for at least D digits (``rebuild.takes_digits`` says whether the source has
    a ``dps`` parameter). None when the source names no length. ``source``: a :class:`SourceSpec`, or
    an object or dict of one's own with ``build`` and optionally ``length`` and ``check``."""
    get = (lambda k: source.get(k)) if isinstance(source, dict) else (lambda k: getattr(source, k, None))
    length = get("length")
    if not length:
        return None
    pname, offset = length
    build = build or get("build")
    check = get("check")
    names = {p[0] if isinstance(p, (tuple, list)) else getattr(p, "name", None) for p in get("params") or ()}
    base = kwargs.get("dps") or (digits if "dps" in names else None)

    def rebuild(n: int, digits: Optional[int] = None):
        k = dict(kwargs)
        k[pname] = int(n) - int(offset)
        if base:
            k["dps"] = max(int(base), -(-int(base) * int(n) // int(n_terms)), int(digits or 0))
        if callable(check):
            check(**k)
        return build(ctx, **k)
    rebuild.takes_digits = bool(base)
    return rebuild


def rebuilder_from_provenance(series, ctx: Optional[Context] = None):
    """:func:`rebuilder` for a series whose provenance names the built-in source that made it
    and its parameters (as ``resum generate`` writes them). Raises InputError when it does not,
    or when that source names no length."""
    prov = dict(getattr(series, "provenance", {}) or {})
    name = prov.get("source")
    if name not in SOURCES:
        raise InputError("the series does not say which built-in source made it (its provenance has no "
                         "'source'); write it with 'resum generate', or give more terms yourself")
    src = SOURCES[name]
    out = rebuilder(src, {p.name: prov[p.name] for p in src.params if p.name in prov}, series.n_terms, ctx,
                    digits=series.digits)
    if out is None:
        raise InputError(f"source {name!r} does not name the parameter that sets its number of terms")
    return out


def get_source(name: str) -> SourceSpec:
    """The registered source ``name``; an unknown name is an input error listing the known ones."""
    try:
        return SOURCES[name]
    except KeyError:
        raise InputError(f"unknown source {name!r}; known: {', '.join(sorted(SOURCES))}") from None
