"""Evaluate a series beyond its radius and at strong coupling: :func:`evaluate`.

``evaluate(series, points)`` returns an :class:`EvaluationResult` with, per
point, a resummed value with a band, the method used, a status, and the
optimal-truncation baseline beside it.

Methods (exact registry keys, see :data:`METHODS`):

``partial-sum``
    plain partial sums (inside the disk of convergence only);
``pade``
    near-diagonal Padé approximants in the expansion variable;
``conformal-pade``
    conformal map of the cut plane onto the disk, re-expansion, Padé in the
    disk variable (map from the given singularities, the analysis, or the
    approximants' poles);
``conformal-quadratic``
    the same map and re-expansion, then quadratic (Hermite-Padé) approximants
    ``P + Q f + R f^2 = 0`` in the disk variable
    (:mod:`resum.estimators.resum_quadratic`); never chosen by ``auto``;
``borel-pade``
    Borel(-Le Roy) transform, Padé in the Borel plane, Laplace integral;
    lateral sums when a singularity sits on the integration ray;
``borel-conformal-pade``
    Borel transform, conformal map of the Borel plane cut from its nearest
    singularity, Padé in the disk variable, Laplace integral;
``ode``
    the linear differential equation with polynomial coefficients that the series
    obeys exactly (order 1 or 2, checked on every coefficient beyond those fitted),
    followed by Taylor steps along the straight line from 0 (exact-equation series only;
    :mod:`resum.estimators.resum_ode`);
``auto``
    factorial growth -> Borel methods (conformal when the nearest Borel
    singularity is off the positive axis), finite radius -> conformal-Padé
    when a map can be chosen, else Padé; points well inside the disk ->
    partial sums.

What a band means: the value is the median of the three highest-order
approximants; the band is 4 x the larger of their spread and the error at
the full order extrapolated from how fast the lower orders approach the
value (inflated by the scatter of that convergence), never narrower than the
quadrature error, the working precision and the digits asked for; with ``verify=True`` (default) the whole
computation is rerun at higher precision (with inexact coefficients moved
by 10^-digits relative, up to a unit in their last digit) and with fewer terms, and the band is
widened to cover the reruns. It is an estimate of the error, not a proof.

>>> from resum.series import Series
>>> s = Series([(-1) ** n * __import__("math").factorial(n) for n in range(30)])   # Euler series
>>> r = evaluate(s, ["0.5"], method="borel-pade", verify=False)
>>> import mpmath
>>> from resum.context import workdps
>>> with workdps(50):
...     truth = 2 * mpmath.e ** 2 * mpmath.e1(2)          # e^{1/x} E_1(1/x)/x, x = 1/2
...     ok = r.points[0].value.contains(truth)
>>> ok, r.points[0].value.digits() > 25
(True, True)
"""
from __future__ import annotations

import math
import time
from dataclasses import dataclass, field, replace
from fractions import Fraction
from typing import Any, Optional

import mpmath

from .context import Context, checked_context
from .errors import InputError, check_flag
from .results import Estimate, Provenance, Status, num_to_str, jsonable, point_label, point_text, sig_text
from .series.core import Series
from .estimators.resum_band import PointOutcome, rational_fit, supports_no_digit as _supports_no_digit
from .estimators.resum_truncation import optimal_truncation, polynomial_degree
from .estimators._common import first_term_scale
from .estimators.resum_ode import equation_shape
from .transforms.conformal import ConformalMap, PairMap, RayMap, StarMap, choose_map, crosses_pair_cut

__all__ = ["METHODS", "evaluate", "EvaluationResult", "PointResult", "Baseline",
           "probe_strong_coupling", "parse_points", "polynomial_degree", "evaluate_with_goal",
           "terms_for_digits"]

METHODS = ("auto", "partial-sum", "pade", "conformal-pade", "conformal-quadratic", "borel-pade",
           "borel-conformal-pade", "ode", "borel-ode")
#: the methods that map the cut plane onto a disk (same plan, different approximants there)
_CONFORMAL = ("conformal-pade", "conformal-quadratic")


# ---------------------------------------------------------------------------- results
@dataclass(frozen=True)
class Baseline:
    """Optimal truncation at one point: sum up to the smallest term, band +- that term."""

    value: Estimate
    imag: Optional[Estimate]
    n_terms: int
    smallest_term: Any
    reached: bool
    how: str

    @property
    def empty(self) -> bool:
        """Nothing was summed: the terms grow from the first (the reports say "none")."""
        return self.n_terms == 0 or (self.value.value == 0 and self.value.error > 0)

    def to_dict(self) -> dict:
        return {"value": self.value.to_dict(), "imag": None if self.imag is None else self.imag.to_dict(),
                "n_terms": self.n_terms, "smallest_term": num_to_str(mpmath.mpf(self.smallest_term), 20),
                "reached": self.reached, "how": self.how}

    @classmethod
    def from_dict(cls, d: dict) -> "Baseline":
        return cls(Estimate.from_dict(d["value"]), None if d.get("imag") is None else Estimate.from_dict(d["imag"]),
                   int(d["n_terms"]), mpmath.mpf(d["smallest_term"]), bool(d["reached"]), d.get("how", ""))


def _at_fields(at) -> dict:
    """``{"at": ...}`` as decimal strings: a complex point is written as its real part, with
    ``at_im`` beside it (as ``value`` and ``im`` are)."""
    if isinstance(at, (mpmath.mpc, complex)):
        fields = {"at": point_label(num_to_str(mpmath.mpf(at.real), 30))}
        if at.imag != 0:
            fields["at_im"] = point_label(num_to_str(mpmath.mpf(at.imag), 30))
        return fields
    return {"at": point_label(num_to_str(at, 30))}


@dataclass(frozen=True)
class PointResult:
    """The resummed value at one point.

    ``at`` is the point as the user gave it (the coupling ``g`` when the
    series declares one, else the expansion variable); ``x`` is the
    expansion variable. ``value`` is the real part, ``imag`` the imaginary
    part (for lateral sums: the ambiguity ``(S+ - S-)/(2i)``, so the two
    lateral sums are ``value +- i imag``). ``None`` values mean failure; see
    ``status`` and ``message``.
    """

    at: Any
    x: Any
    value: Optional[Estimate]
    imag: Optional[Estimate]
    method: str
    success: bool
    status: Status
    message: str
    baseline: Optional[Baseline]
    diagnostics: dict = field(default_factory=dict)

    @property
    def complex_value(self) -> bool:
        """``imag`` is part of the value (a complex point, or a complex-valued function at a real
        point), not the ambiguity of lateral Borel sums."""
        if isinstance(self.at, mpmath.mpc) and self.at.imag != 0:
            return self.imag is not None
        return self.imag is not None and "S_plus" not in self.diagnostics

    @property
    def digits(self) -> float:
        """Significant digits the band supports: for a complex value relative to its modulus
        (a real part that vanishes has no relative digit of its own), else those of ``value``.
        The text report and the JSON ``digits`` both read this."""
        if self.value is None:
            return 0.0
        if not self.complex_value:
            return self.value.digits()
        err = max(self.value.error, self.imag.error)
        if err == 0:
            return math.inf
        size = abs(mpmath.mpc(self.value.value, self.imag.value))
        return 0.0 if size == 0 else max(0.0, float(mpmath.log10(size / err)))

    def to_dict(self) -> dict:
        return {"at": num_to_str(self.at, 30), "x": num_to_str(self.x, 30),
                "value": None if self.value is None else self.value.to_dict(),
                "imag": None if self.imag is None else self.imag.to_dict(),
                "method": self.method, "success": self.success, "status": self.status.value,
                "message": self.message,
                "baseline": None if self.baseline is None else self.baseline.to_dict(),
                "diagnostics": jsonable(self.diagnostics)}

    @classmethod
    def from_dict(cls, d: dict) -> "PointResult":
        est = lambda k: None if d.get(k) is None else Estimate.from_dict(d[k])  # noqa: E731
        return cls(_num(d["at"]), _num(d["x"]), est("value"), est("imag"), d["method"], bool(d["success"]), Status(d["status"]),
                   d.get("message", ""), None if d.get("baseline") is None else Baseline.from_dict(d["baseline"]),
                   dict(d.get("diagnostics", {})))


@dataclass(frozen=True)
class EvaluationResult:
    """What :func:`evaluate` returns: one :class:`PointResult` per point."""

    points: tuple
    method: str
    success: bool
    status: Status
    message: str = ""
    warnings: tuple = ()
    variable: str = "x"
    coupling: Optional[str] = None
    diagnostics: dict = field(default_factory=dict)
    provenance: Optional[Provenance] = None
    at_symbol: str = "x"

    def to_dict(self) -> dict:
        """Everything, numbers as decimal strings (written at the result's working precision)."""
        with _wd((self.provenance.dps if self.provenance else 50) + 10):
            return self._to_dict()

    def _to_dict(self) -> dict:
        return {"points": [p.to_dict() for p in self.points], "method": self.method,
                "success": self.success, "status": self.status.value, "message": self.message,
                "warnings": list(self.warnings), "variable": self.variable, "coupling": self.coupling,
                "at_symbol": self.at_symbol,
                "diagnostics": jsonable(self.diagnostics),
                "provenance": None if self.provenance is None else self.provenance.to_dict()}

    @classmethod
    def from_dict(cls, d: dict) -> "EvaluationResult":
        # parse the decimal strings at (at least) the precision they were written with
        dps = int((d.get("provenance") or {}).get("dps", 50)) + 10
        longest = max([len(v) for p in d["points"] for v in _strings(p)] + [0])
        with _wd(max(dps, longest + 5)):
            return cls._from_dict(d)

    @classmethod
    def _from_dict(cls, d: dict) -> "EvaluationResult":
        return cls(tuple(PointResult.from_dict(p) for p in d["points"]), d["method"], bool(d["success"]),
                   Status(d["status"]), d.get("message", ""), tuple(d.get("warnings", [])),
                   d.get("variable", "x"), d.get("coupling"), dict(d.get("diagnostics", {})),
                   None if d.get("provenance") is None else Provenance.from_dict(d["provenance"]),
                   d.get("at_symbol", d.get("variable", "x")))

    def contract_dict(self) -> dict:
        """The small, stable JSON document: values with bands as decimal strings.

        ``{"values": [{"at", "value", "lo", "hi", "method", "digits"} (+ "im", "im_lo", "im_hi",
        "terms_needed" or "digits_needed")], "warnings": [...]}``; a failed point has
        ``value``/``lo``/``hi`` = ``"nan"`` and ``message`` says why; every point has ``status``
        (as in the text report). ``digits``: the significant digits the band supports; where the
        band falls short of the digits asked, ``terms_needed``: the projected number of terms for
        them (see ``_reach``), or, where the digits the coefficients carry set the band,
        ``digits_needed``: the coefficient digits suggested instead (see ``_input_limit``).
        Every row also has ``truncation``, the optimal-truncation baseline beside the resummed
        value (see :func:`_truncation_fields`; null where the terms grow from the first), and,
        where a method chose among variants of its approximants, ``variant`` (the one kept).
        ``plan``: the method chosen for the points, why (and from what: the analysis, or the
        singular points given), the conformal map (``kind`` and its points, or null) and the
        Borel-Le Roy parameter.
        """
        with _wd((self.provenance.dps if self.provenance else 50) + 10):
            return self._contract()

    def _contract(self) -> dict:
        vals = []
        for p in self.points:
            at = _at_fields(p.at)
            if p.value is None:
                row = {**at, "value": "nan", "lo": "nan", "hi": "nan",
                       "method": p.method, "status": p.status.value, "message": p.message}
            else:
                e = p.value.to_dict()
                row = {**at, "value": e["value"], "lo": e["lo"], "hi": e["hi"], "method": p.method,
                       "text": str(Estimate.from_dict(e))}
                if p.imag is not None:
                    i = p.imag.to_dict()
                    row.update({"im": i["value"], "im_lo": i["lo"], "im_hi": i["hi"],
                                "im_text": str(Estimate.from_dict(i))})
                d = p.digits
                row["digits"] = "inf" if not math.isfinite(d) else f"{d:.1f}"
                row["status"] = p.status.value
                if p.message:
                    row["message"] = p.message
                variant = p.diagnostics.get("variant")
                if variant:
                    row["variant"] = variant
                reach = p.diagnostics.get("reach")
                lim = input_limit_short(p)
                if lim:
                    row["digits_needed"] = str(lim["digits_suggested"])
                elif reach and reach.get("terms_needed"):
                    row["terms_needed"] = str(reach["terms_needed"])
            row["truncation"] = _truncation_fields(p.baseline)
            vals.append(row)
        from .report.evaluation_text import band_meanings
        from .results import JSON_BAND_NOTE
        opts = self.provenance.options if self.provenance else {}
        plan = {"method": self.provenance.method if self.provenance else self.method,
                "why": opts.get("why"), "map": opts.get("map"), "borel_b": opts.get("borel_b")}
        return {"values": vals, "warnings": list(self.warnings), "plan": plan, "bands": JSON_BAND_NOTE,
                "how": "\n\n".join(band_meanings(self))}


def _truncation_fields(b: Optional[Baseline]) -> Optional[dict]:
    """The optimal-truncation baseline of one point for the JSON contract: ``{"value", "lo", "hi",
    "text", "terms", "reached"}`` (decimal strings; ``terms`` the number of terms summed), or None
    where there is none: no baseline, or the terms grow from the first (nothing is summed; the
    text report says "none (terms grow)")."""
    if b is None or b.empty:
        return None
    e = b.value.to_dict()
    out = {"value": e["value"], "lo": e["lo"], "hi": e["hi"], "text": str(Estimate.from_dict(e)),
           "terms": str(b.n_terms), "reached": b.reached}
    if b.imag is not None:
        i = b.imag.to_dict()
        out.update({"im": i["value"], "im_lo": i["lo"], "im_hi": i["hi"]})
    return out


def _strings(obj):
    if isinstance(obj, str):
        yield obj
    elif isinstance(obj, dict):
        for v in obj.values():
            yield from _strings(v)
    elif isinstance(obj, (list, tuple)):
        for v in obj:
            yield from _strings(v)


def _num(s: str):
    from .results import str_to_num
    v = str_to_num(s)
    return v if isinstance(v, (mpmath.mpf, mpmath.mpc)) else mpmath.mpmathify(v)


# ---------------------------------------------------------------------------- inputs
def parse_points(points, dps: int) -> list:
    """Numbers or strings (decimals or expressions such as ``"sqrt(2)/4"``) to mpmath numbers,
    rounded at ``dps`` digits (a rational such as ``1/3`` is exact until then: rounded at the
    ambient 15 digits it would move the point by 1e-17 relative)."""
    if isinstance(points, (str, int, float)) or not hasattr(points, "__iter__"):
        points = [points]
    with mpmath.workdps(dps):
        return _parse_points(points, dps)


def _parse_points(points, dps: int) -> list:
    out = []
    for k, p in enumerate(points):
        if isinstance(p, str):
            txt = p.strip()
            try:
                from .series.expr import evaluate_expression
                v = evaluate_expression(txt, dps).value     # decimals are taken as exact points
                v = _to_mp(v)
            except InputError as exc:
                raise exc.at(f"point {k + 1}") from None
            except ImportError:  # pragma: no cover - parser always present in a full checkout
                try:
                    v = mpmath.mpmathify(txt)
                except (ValueError, TypeError):
                    raise InputError(f"cannot read point {txt!r}; give a decimal number",
                                     where=f"point {k + 1}") from None
        elif isinstance(p, bool):
            raise InputError("a point must be a number, not a boolean", where=f"point {k + 1}")
        else:
            try:
                v = _to_mp(p)
            except (TypeError, ValueError):
                raise InputError(f"point {p!r} is not a number", where=f"point {k + 1}") from None
        if not mpmath.isfinite(abs(v)):
            raise InputError(f"point {p!r} is not finite", where=f"point {k + 1}")
        out.append(v)
    if not out:
        raise InputError("no evaluation point given; pass at least one point")
    return out


def singular_points(points, dps: int, name=None) -> list:
    """Singular points a user gives to build the map from (numbers or expression strings,
    complex allowed) as mpmath numbers; each refused unless finite, other than 0 (the expansion
    point, where the function is regular) and given once, the error naming it by ``name(k)``
    (default ``"point k+1"``; the command line names the option and its text instead)."""
    name = name or (lambda k: f"point {k + 1}")
    tol = mpmath.mpf(10) ** (10 - dps)
    out = []
    for k, p in enumerate(points):
        try:
            z = parse_points([p], dps)[0]
        except InputError as exc:
            raise InputError(exc.bare, where=name(k)) from None
        if z == 0:
            raise InputError("a singular point must be other than 0: the series is expanded about 0, "
                             "where the function is regular", where=name(k))
        if any(mpmath.almosteq(z, u, rel_eps=tol) for u in out):
            raise InputError(f"the singular point {mpmath.nstr(z, 12)} is given twice; give each point "
                             "once", where=name(k))
        out.append(z)
    if not out:
        raise InputError("no singular point given; pass at least one", where=name(0))
    return out


def borel_parameter(b, dps: int):
    """The Borel-Le Roy parameter ``b`` (a number or an expression string) as an mpf; refused
    unless real and above -1 (``Gamma(n + 1 + b)`` has poles otherwise)."""
    v = parse_points([b], dps)[0]
    if isinstance(v, mpmath.mpc) or v <= -1:
        raise InputError(f"the Borel-Le Roy parameter must be a real number above -1 (Gamma(n + 1 + b) "
                         f"has poles otherwise), got {b!r}")
    return v


def spaced_points(a, b, n: int, geometric: bool = False) -> list:
    """``n >= 2`` points from ``a`` to ``b``, both ends exactly: evenly spaced, or geometric
    (``a``, ``b`` real and positive) at the working precision."""
    if geometric:
        r = (b / a) ** (mpmath.mpf(1) / (n - 1))
        return [a] + [a * r ** k for k in range(1, n - 1)] + [b]
    return [a + (b - a) * mpmath.mpf(k) / (n - 1) for k in range(n - 1)] + [b]


def _to_mp(v):
    from fractions import Fraction
    if isinstance(v, Fraction):
        return mpmath.mpf(v.numerator) / v.denominator
    return mpmath.mpmathify(v)


def _check_method(method: str) -> str:
    if method not in METHODS:
        raise InputError(f"unknown method {method!r}; choose one of: {', '.join(METHODS)}",
                         where="method")
    return method


# ---------------------------------------------------------------------------- growth probes
def _growth(c) -> dict:
    """Quick growth probe (own, cheap): factorial vs geometric from the ratios.

    Fits ``|c_n / c_{n-1}| = a n + r`` over the last half of the non-zero
    coefficients; factorial growth when the term ``a n`` dominates ``r``
    (common practice, no source). Returns ``{"factorial": bool, "a", "r"}``.
    """
    idx = [k for k, v in enumerate(c) if v != 0]
    pairs = []
    for i in range(1, len(idx)):
        k0, k1 = idx[i - 1], idx[i]
        step = k1 - k0
        rr = abs(c[k1] / c[k0]) ** (mpmath.mpf(1) / step)
        pairs.append((mpmath.mpf(k1), rr))
    if len(pairs) < 6:
        return {"factorial": False, "a": 0, "r": 0}
    half = pairs[len(pairs) // 2:]
    n = [p[0] for p in half]
    y = [p[1] for p in half]
    m = len(n)
    sn, sy = sum(n), sum(y)
    snn = sum(v * v for v in n)
    sny = sum(a * b for a, b in zip(n, y))
    den = m * snn - sn * sn
    a = (m * sny - sn * sy) / den if den != 0 else mpmath.mpf(0)
    r = (sy - a * sn) / m
    nmax = n[-1]
    fact = a > 0 and a * nmax > 2 * abs(r) and a * nmax > mpmath.mpf("0.5") * max(y)
    return {"factorial": bool(fact), "a": a, "r": r}


def _nearest_singularity(d):
    """Nearest singularity of the function with Taylor coefficients ``d`` (own quick probe).

    Real singularity: when the ratios ``d_{n-1}/d_n`` of the last coefficients
    keep one sign, fit ``A (1 + beta/n + gamma/n^2)`` to them (ratio method,
    common practice, no source). Otherwise the nearest pole (with a residue
    that matters) of the top near-diagonal Padé approximant. ``None`` if
    neither works.
    """
    nz = [(k, v) for k, v in enumerate(d) if v != 0]
    if len(nz) < 8:
        return None
    consecutive = all(nz[i][0] == i + nz[0][0] for i in range(len(nz)))
    if consecutive:
        tail = [(nz[i][0], nz[i - 1][1] / nz[i][1]) for i in range(max(1, len(nz) - 24), len(nz))]
        sg = [mpmath.sign(mpmath.re(r)) for _, r in tail]
        if all(isinstance(r, mpmath.mpf) or mpmath.im(r) == 0 for _, r in tail) and len(set(sg)) == 1:
            # least squares for r_n = A + B/n + C/n^2
            rows = [[mpmath.mpf(1), mpmath.mpf(1) / n, mpmath.mpf(1) / n ** 2] for n, _ in tail]
            rhs = [mpmath.re(r) for _, r in tail]
            try:
                from .estimators._num import lu_solve
                sol = lu_solve(mpmath.matrix(rows), mpmath.matrix(rhs))
                return sol[0]
            except ZeroDivisionError:
                pass
    n = len(d)
    M = (n - 1) // 2
    r = rational_fit(d, n - 1 - M, M, mpmath.mp.dps)
    if r is None or M == 0:
        return None
    from .estimators.resum_borel import borel_plane_poles
    scale = max(abs(v) for v in r.p) if r.p else 1
    poles = [p for p, res in borel_plane_poles(r, mpmath.mp.dps)
             if abs(res) > mpmath.mpf(10) ** (-mpmath.mp.dps // 2) * scale]
    if not poles:
        return None
    z = min(poles, key=abs)
    if abs(mpmath.im(z)) < mpmath.mpf("1e-8") * abs(z):
        z = mpmath.re(z)
    return z


def _borel_singularity(c, b=0):
    """Nearest singularity of the Borel transform (see :func:`_nearest_singularity`)."""
    from .transforms.borel import borel_coefficients
    return _nearest_singularity(borel_coefficients(c, b))


def _series_singularities(c):
    """The nearest singularity of the series (and its conjugate if complex), for choosing a map."""
    z = _nearest_singularity(c)
    if z is None:
        return []
    if isinstance(z, mpmath.mpc):
        return [z, mpmath.conj(z)]
    return [z]


#: estimators the plan runs: enough to find the growth, the nearest singularities
#: (real, conjugate pairs, a second one on the other side) and the Borel-plane
#: distance; Dlog-Padé and second-order differential approximants add exponents
#: and confluent structure, which the plan does not use, at about 3/4 of the cost
PLAN_METHODS = ("ratio", "root-test", "conjugate-pair", "large-order", "pade", "diff-approx")


def _analysis(series, ctx):
    """The singularity analysis used to plan the method and map (None if it fails).

    Run without its verification reruns (they only widen bands and add
    warnings, never move a location) and with :data:`PLAN_METHODS`: the plan
    uses locations and the growth verdict alone. Points one method alone finds
    are still rerun with the input moved in its last digit, and dropped if
    they move (rounding artifacts on the circle of convergence would otherwise
    choose a pair map; see ``analysis._screen_artifacts``). On log(1+x)/x with 200 terms
    this takes 4 s instead of 31 s for the full verified analysis."""
    try:
        from .analysis import analyze  # noqa: WPS433
    except ImportError:
        return None
    global _LAST_PLAN_ANALYSIS
    key = (ctx.dps, ctx.work_dps)
    last = _LAST_PLAN_ANALYSIS          # one tuple, read once: threads replace it whole
    if last is not None and last[0] is series and last[1] == key:
        # the same (immutable) series and digits as the call before: the same analysis (the
        # command line's figure evaluates a second time, on the curve's points)
        return last[2]
    try:
        an = analyze(series, ctx, methods=list(PLAN_METHODS), verify=False)
    except InputError:
        raise
    except Exception:  # noqa: BLE001 - the analysis is an aid; evaluation goes on without it
        return None
    _LAST_PLAN_ANALYSIS = (series, key, an)
    return an


#: The last plan analysis: (series, (dps, work_dps), result) or None (one entry; see _analysis).
_LAST_PLAN_ANALYSIS = None


# ---------------------------------------------------------------------------- core
@dataclass(frozen=True)
class _Plan:
    method: str
    cmap: Optional[ConformalMap] = None
    borel_b: Any = 0
    alpha: Any = None
    lateral: str = "auto"
    why: str = ""
    singularities: tuple = ()      # the points the map was chosen from (conformal plans)
    fallback: Optional["_Plan"] = None   # for points this plan cannot reach (ode)
    input_digits: Optional[int] = None   # digits the inexact coefficients carry (ode: equation test; borel: noise)
    coefficients_at: Any = None          # exact input: d -> coefficients at d digits (ode's refit)
    equation_shape: Any = None           # the equation's shape as the plan found it (ode, borel-ode)
    alpha_from_w: Any = None             # alpha read from the series: used only where |w| >= this
    reach: Any = None                    # pade for poles: |x| below which the poles are resolved
    boundary: Any = None                 # pade inside a suspected natural boundary: its radius band
    strong_terms: Any = None             # conformal: large-x terms [(power in x, coefficient)] for two-point


def _strong_in_x(terms, cpl, dps):
    """Strong-coupling terms ``{power: coefficient}`` in the points' variable (the coupling
    ``g`` when ``x = scale g^k`` is declared) as ``[(power in x, coefficient)]``, checked
    (:func:`~resum.estimators.resum_twopoint.check_strong_terms`); None for none."""
    if not terms:
        return None
    from .estimators.resum_twopoint import check_strong_terms
    out = []
    with mpmath.workdps(dps):
        for P, b in (terms.items() if isinstance(terms, dict) else terms):
            P = parse_points([P], dps)[0]
            b = strong_coefficient(b, dps)
            u = b.error if isinstance(b, Estimate) else mpmath.mpf(0)
            b = _to_mp(b.value if isinstance(b, Estimate) else b)
            if cpl is None:
                out.append((P, b, u))
            else:               # g^P = (x/scale)^(P/k)
                k = mpmath.mpf(cpl.power)
                f = mpmath.mpmathify(cpl.scale) ** (-P / k)
                out.append((P / k, b * f, u * abs(f)))
        return check_strong_terms(out)


def strong_coefficient(b, dps: int, names=None):
    """A known strong-coupling coefficient as a number (exact: an integer, fraction, expression
    without decimals, mpf) or an :class:`Estimate` (uncertain): text in the value(error) notation
    resum prints (``2.000(10)``, ``-1.2345(10)e-7``) is that band; an expression with a decimal
    carries half a unit in the last of the digits its least precise decimal shows, relative to
    its size; a float is a double (15 digits). ``names`` binds a family's parameters. Real values only;
    InputError otherwise."""
    from .results import parse_value_error
    from .series.expr import evaluate_expression
    if isinstance(b, Estimate):
        return b
    if isinstance(b, bool):
        raise InputError("a strong-coupling coefficient must be a number, not true/false")
    if isinstance(b, float):
        # a double: 15 significant digits, as a JSON number among a file's coefficients
        if not math.isfinite(b):
            raise InputError(f"a strong-coupling coefficient must be finite, got {b!r}")
        v = mpmath.mpf(b)
        u = abs(v) * mpmath.mpf(10) ** -15 / 2
        return Estimate(v, v - u, v + u) if u else v
    if not isinstance(b, str):
        v = mpmath.mpmathify(b) if not isinstance(b, (int, Fraction)) else b
    else:
        band = parse_value_error(b, dps)
        if band is not None:
            return band
        e = evaluate_expression(b.strip(), dps, names=names)
        v = e.value
        if e.digits is not None and not e.exact:
            v = _to_mp(v)
            if isinstance(v, mpmath.mpc):
                raise InputError(f"a strong-coupling coefficient must be real, got {b.strip()!r}")
            u = abs(v) * mpmath.mpf(10) ** (1 - e.digits) / 2
            return Estimate(v, v - u, v + u)
    if isinstance(v, mpmath.mpc):
        raise InputError(f"a strong-coupling coefficient must be real, got {b!r}")
    return v


def _on_laplace_ray(t) -> bool:
    """``t`` lies on the positive real axis of the Borel plane (to 1e-6 relative), the path of
    the Laplace integral: a map from it would cut the path, lateral sums go round it."""
    return mpmath.re(t) > 0 and abs(mpmath.im(t)) < 1e-6 * abs(t)


def _plan(method, c, xs, series, ctx, *, cmap, singularities, borel_b, borel_map, alpha,
          lateral, large_x_power, use_analysis, warnings, analysis=None, borel_singularities=None,
          strong_terms=None) -> _Plan:
    """Choose the method and its parameters (map, Borel parameter)."""
    an = None
    deg = polynomial_degree(c)
    if deg is not None and method in ("auto", "partial-sum"):
        # a polynomial is its own resummation (and its own strong-coupling expansion)
        return _Plan("partial-sum", why=f"exact polynomial of degree {deg} in {series.variable}: "
                                        f"the coefficients vanish from the next power through the last term given")
    g = _growth(c)
    if use_analysis and (method == "auto" or (method in _CONFORMAL and cmap is None and not singularities)):
        # (conformal-Padé asked for without a map: the map comes from the analysis, as for auto)
        an = analysis if analysis is not None else _analysis(series, ctx)
    factorial = g["factorial"]
    if an is not None and getattr(an, "growth", ""):
        factorial = an.growth == "factorial"
    b = borel_b
    if method == "borel-ode":
        return _Plan("borel-ode", why="requested: the differential equation the Borel transform obeys exactly, "
                                      "followed along the Laplace ray", input_digits=series.digits,
                     coefficients_at=_exact_source(series))
    if method in ("borel-pade", "borel-conformal-pade") or (method == "auto" and factorial):
        if singularities and cmap is None:
            warnings.append("the singular points given are not used: the series is resummed in its Borel "
                            "plane (its coefficients grow factorially), whose map comes from the Borel "
                            "transform's nearest singularity")
        if b is None:
            # b = 0 by default: with a conformal map of the Borel plane the exponent of the Borel
            # singularity matters little (measured on the oscillator; b = 1/2 gave the same digits)
            b = 0
        tm = borel_map
        A = None
        in_u = False
        given = ""
        if borel_singularities and (tm is None or tm == "auto"):
            pts = [mpmath.mpmathify(t) for t in borel_singularities]
            on_ray = [t for t in pts if _on_laplace_ray(t)]
            tm = None if on_ray else choose_map(pts)
            given = "; Borel singular points given: t = " + ", ".join(point_text(t, 12) for t in pts) + (
                " (on the Laplace ray: no map of the Borel plane, lateral sums)" if on_ray else "")
        elif tm is None or tm == "auto":
            lo = getattr(an, "methods", {}).get("large-order") if an is not None else None
            in_u = lo is not None and (lo.diagnostics or {}).get("stride", 1) > 1
            if an is not None and getattr(an, "borel_singularity", None) is not None and not in_u:
                A = an.borel_singularity.value
            else:
                # (the analysis' A of a series in u = x^k refers to u; the Borel plane here is x's)
                A = _borel_singularity(c, b)
            tm = None
            if A is not None and not _on_laplace_ray(A):
                tm = RayMap(A)
        if method == "auto":
            m = "borel-conformal-pade" if tm is not None else "borel-pade"
        else:
            m = method
        if m == "borel-conformal-pade" and tm is None:
            raise InputError("borel-conformal-pade needs a map of the Borel plane: no singularity off the "
                             "positive axis was found" + (" among those given" if given else "") +
                             "; give its singular points off that axis (--borel-singularity T) or use "
                             "borel-pade", where="method")
        if m == "borel-pade":
            tm = None
        why = ("factorial growth" if factorial else "requested") + (
            f"; nearest Borel singularity t = {_a_text(None if in_u else an, A)}" if A is not None else "") + given + (
            f"; Borel-Le Roy transform with b = {mpmath.nstr(b, 8)}" if b != 0 else "")
        plan = _Plan(m, tm, b, alpha, lateral, why, input_digits=series.digits)
        eq = (_follow_borel_equation(series, c, ctx)
              if method == "auto" and (b is None or b == 0) and lateral == "auto" else None)
        if eq is not None:
            # the Borel transform obeys a linear differential equation exactly: follow it along the
            # Laplace ray (exact up to rounding and quadrature) instead of approximating it
            return _Plan("borel-ode", why="factorial growth; the Borel transform obeys a linear differential "
                                          "equation exactly (checked on every coefficient), followed along the "
                                          f"Laplace ray; points it cannot reach: {m} ({why})", fallback=plan,
                         input_digits=series.digits, coefficients_at=_exact_source(series),
                         equation_shape=equation_shape(eq))
        return plan
    # convergent family
    if borel_singularities:
        warnings.append("the Borel-plane singular points given are not used: the series is resummed "
                        "without a Borel transform (its coefficients do not grow factorially)")
    if borel_b is not None and borel_b != 0:
        warnings.append(f"the Borel-Le Roy parameter b = {mpmath.nstr(borel_b, 8)} is not used: the series is "
                        "resummed without a Borel transform (its coefficients do not grow factorially)")
    if method == "partial-sum":
        return _Plan("partial-sum", why="requested")
    if method == "ode":
        return _Plan("ode", why="requested: the differential equation the series obeys exactly, continued "
                                "along the straight line from 0", input_digits=series.digits,
                     coefficients_at=_exact_source(series))
    if method == "pade":
        return _Plan("pade", why="requested")
    radius = None
    radius_text = None          # the radius as the plan's note prints it
    sings = list(singularities) if singularities else None
    if cmap is None and sings is None and an is not None and getattr(an, "singularities", ()):
        sings = list(an.singularities)
    if an is not None and getattr(an, "radius", None) is not None:
        radius = an.radius.value
        radius_text = str(an.radius)
    probed = cmap is None and sings is None and method in ("auto",) + _CONFORMAL
    if probed:
        sings = _series_singularities(c)
    if radius is None and sings:
        z = sings[0]
        radius = abs(z.location if hasattr(z, "location") else z)
        # a singularity of the analysis with its band; a point the caller gave as given; the
        # quick probe's pole has no band
        if hasattr(z, "re") and hasattr(z, "im"):
            from .uncertainty.ensemble import modulus_band
            radius_text = str(modulus_band(z.re, z.im))
        elif probed:
            radius_text = f"about {sig_text(radius, 3)} (rough)"
        else:
            radius_text = mpmath.nstr(radius, 8)
    if sings:
        sings = _cut_first(sings)
    chosen = cmap if cmap is not None else (choose_map(sings) if sings else None)
    given = " (given)" if cmap is not None else (" (from the singular points given)" if singularities else "")
    nb = getattr(an, "natural_boundary", None) if an is not None else None
    if method == "auto" and nb is not None and cmap is None and not singularities:
        # the approximants' poles crowd along a circle: the series defines the function inside it
        # only (no continuation to map); Padé approximants inside, no value beyond the circle
        return _Plan("pade", why=f"natural boundary suspected at |{series.variable}| ~ {nb} (the analysis: "
                                 "the approximants' poles and zeros crowd along that circle); no continuation "
                                 "beyond it to map, Padé approximants inside", reach=nb.lower, boundary=nb)
    if method == "auto":
        if radius is not None and all(abs(x) < radius / 4 for x in xs):
            plan = _Plan("partial-sum", why=f"all points inside a quarter of the radius {radius_text}")
            if mpmath.isinf(radius) and not _partial_sums_settle(c, xs):
                # an entire function far out (exp(-x) from 60 terms at x = 30: the terms peak at
                # 1e12 and the last is 1e6): partial sums cannot settle, an exact equation can
                eq = _follow_equation(series, c, ctx, an)
                if eq is not None:
                    return _Plan("ode", why="entire-like series, partial sums cannot settle at every point; "
                                            "the series obeys a linear differential equation exactly (checked on "
                                            "every coefficient), followed along the straight line from 0",
                                 fallback=plan, input_digits=series.digits,
                                 coefficients_at=_exact_source(series), equation_shape=equation_shape(eq))
            return plan
        if cmap is None and _only_poles(sings):
            # a meromorphic function (as far as the analysis sees): Padé approximants represent
            # poles exactly, and a conformal map would cut the plane where the function has none
            locs = ", ".join(point_text(s.location, 8) for s in sings)
            only = all(s.kind == "pole" for s in sings)
            # (poles pile up at an essential point without settling, yet the values converge
            # around it: the poles' reach says nothing there)
            reach = _resolved_pole_radius(c, ctx.work_dps) if only else None
            what = "poles" if only else "poles or essential singularities (single-valued)"
            other = _Plan("pade", why=f"finite radius; the singularities found are {what} ({locs}): "
                                      "Padé approximants represent them, no cut is needed"
                                      + ("" if reach is None else
                                         f"; their poles are resolved for |x| < {sig_text(reach, 4)}"),
                          reach=reach)
        elif chosen is not None:
            a, note, from_w = _rim_alpha(chosen, alpha, large_x_power, c, ctx, series.digits)
            st, st_note = _strong_for(chosen, strong_terms)
            other = _Plan("conformal-pade", chosen, alpha=a, alpha_from_w=from_w,
                          why=f"finite radius; map{given}: {chosen.describe()}{note}{st_note}",
                          singularities=_locations(sings), strong_terms=st)
        else:
            other = _Plan("pade", why="finite radius; no map could be chosen")
        eq = _follow_equation(series, c, ctx, an)
        if eq is not None:
            # the series obeys a linear differential equation exactly: following it is exact up to
            # rounding, where approximants only converge; points it cannot reach (a zero of the
            # leading coefficient on the line) get the other plan
            return _Plan("ode", why="the series obeys a linear differential equation exactly (checked on every "
                                    "coefficient); followed along the straight line from 0; points it cannot "
                                    f"reach: {other.method} ({other.why})",
                         fallback=other, input_digits=series.digits, coefficients_at=_exact_source(series),
                         equation_shape=equation_shape(eq))
        return other
    if chosen is None:
        raise InputError(f"{method} needs singularities to build a map and the analysis found none "
                         "(a factorially divergent or entire-like series has no finite ones): use "
                         "the default method, a Borel method or pade, or give the singular points "
                         "(--singularity X; from Python, evaluate(..., singularities=[...]) or cmap=...)",
                         where="method")
    a, note, from_w = _rim_alpha(chosen, alpha, large_x_power, c, ctx, series.digits)
    st, st_note = _strong_for(chosen, strong_terms) if method == "conformal-pade" else (None, "")
    return _Plan(method, chosen, alpha=a, alpha_from_w=from_w,
                 why=f"map{given}: {chosen.describe()}{note}{st_note}",
                 singularities=_locations(sings), strong_terms=st)


def _strong_for(cmap, strong_terms):
    """``(terms, note)``: the large-x terms for the two-point variant where ``cmap`` admits it
    (a ray map cut along the negative axis), else ``(None, "")``."""
    from .estimators.resum_conformal import twopoint_map
    if not strong_terms or not twopoint_map(cmap):
        return None, ""
    return strong_terms, (f"; with {len(strong_terms)} strong-coupling term(s) given, two-point approximants "
                          "(the series at w = 0, those terms at w = 1) compete per point")


def _partial_sums_settle(c, xs) -> bool:
    """Whether the last term is far below the largest at every point (1e-20 of it)."""
    for x in xs:
        ax = abs(mpmath.mpmathify(x))
        terms = [abs(v) * ax ** k for k, v in enumerate(c) if v != 0]
        if terms and terms[-1] > mpmath.mpf("1e-20") * max(terms):      # the last non-zero term
            return False
    return True


def _resolved_pole_radius(c, dps):
    """|x| up to which the poles of the top near-diagonal Padé approximant are confirmed (to
    1e-6, relative) by those of the approximant with two terms fewer, or None if all are.

    Inside the disk holding the poles they have captured, the approximants of a meromorphic
    function converge (de Montessus de Ballore's theorem; G. A. Baker and P. Graves-Morris,
    Padé Approximants, 2nd ed., CUP 1996, sec. 6.2, from memory); beyond the first pole they do
    not confirm, their values are extrapolation that can agree across orders and still be wrong
    (sec x from 60 terms at x = 50: every approximant near 0, truth 1.036). Poles with a residue
    below 1e-(dps/2) of the largest are pole-zero pairs of the rounding and are skipped."""
    from .estimators.resum_borel import borel_plane_poles
    n = len(c)
    fits = []
    for m in (n, n - 2):
        M = (m - 1) // 2
        r = rational_fit(c[:m], m - 1 - M, M, dps)
        if r is None or r.M == 0:
            return None
        fits.append(borel_plane_poles(r, dps))
    top, other = fits
    big = max((abs(res) for _, res in top if mpmath.isfinite(res)), default=0)
    floor = big * mpmath.mpf(10) ** (-(dps // 2))
    for p, res in sorted(top, key=lambda t: abs(t[0])):
        if mpmath.isfinite(res) and abs(res) <= floor:
            continue
        if not any(abs(q - p) <= mpmath.mpf("1e-6") * abs(p) for q, _ in other):
            return abs(p)
    return None


def _a_text(an, A) -> str:
    """The Borel singularity for the plan's note: with its band when the analysis gave one,
    else to 6 digits (the quick probe's pole of a Padé approximant; not a measured accuracy)."""
    est = getattr(an, "borel_singularity", None) if an is not None else None
    if est is not None:
        return str(est)
    return mpmath.nstr(A, 6) + " (rough)"


def _is_clear_pole(s) -> bool:
    """The analysis calls ``s`` a pole and its exponent band is a negative integer to within
    :data:`POLE_EXPONENT_BAND`."""
    e = getattr(s, "exponent", None)
    return (getattr(s, "kind", None) == "pole" and e is not None and e.error <= POLE_EXPONENT_BAND
            and any(e.contains(-k) for k in (1, 2, 3)))


def _cut_first(sings) -> list:
    """The points a map should cut from: ``sings`` without the clear poles
    (:func:`_is_clear_pole`) when other singular points remain, so that
    :func:`~resum.transforms.conformal.choose_map` cuts from a branch point and the approximants
    in the mapped variable keep the poles as poles.
    A map from a pole cuts the plane where the function has none: sqrt(1 + x)/(2 - e^x) from 80
    terms at 50 digits, pole at log 2 and branch point -1, got a cut from log 2 to +infinity and no
    value at x = 1, 1.5, 3, where the map from -1 gives 28-45 digits. Unchanged when every point
    is a clear pole, or none is."""
    poles = [z for z in sings if _is_clear_pole(z)]
    if not poles or len(poles) == len(sings):
        return list(sings)
    return [z for z in sings if not _is_clear_pole(z)]


def _only_poles(sings) -> bool:
    """Every singularity the analysis reported is a pole (kind and exponent band agree) or an
    essential singularity: single-valued either way, so no cut is needed, and diagonal Padé
    approximants converge (in capacity) around isolated singular points of a single-valued function
    (Nuttall and Pommerenke; from memory). Measured: exp(1/(1 - x)) from 60 terms at x = 2 (beyond
    the essential point, where a map from it would cut) the 30 digits asked, by Padé."""
    if not sings or not all(hasattr(s, "kind") for s in sings):
        return False
    for s in sings:
        if s.kind == "essential":
            continue
        e = getattr(s, "exponent", None)
        if s.kind != "pole" or e is None or not any(e.contains(-k) for k in (1, 2, 3)):
            return False
        if e.error > POLE_EXPONENT_BAND:
            return False
    return True


#: The widest exponent band (half-width) :func:`_only_poles` takes for a pole. The analysis'
#: kind ``pole`` only asks that a band up to +-0.2 hold a negative integer, but a pole's exponent
#: is a whole number, and the poles it finds (Padé, differential approximants) come with bands
#: of 1e-14 from 16-digit input; a band like -1.07(11) is what a ratio fit gives for
#: (1 - x)^(-1) sqrt(-log(1 - x)/x) (80 terms, 50 digits: a cut, where Padé failed at every
#: point beyond the radius and a map from x = 1 gave 10-37 digits).
POLE_EXPONENT_BAND = mpmath.mpf("0.01")


def _obeys_equation(an) -> bool:
    """The analysis found that the series obeys a differential equation exactly."""
    m = getattr(an, "methods", {}).get("diff-approx") if an is not None else None
    return bool(m is not None and (getattr(m, "diagnostics", None) or {}).get("exact_equation"))


def _follow_borel_equation(series, c, ctx):
    """Should ``auto`` sum a factorially divergent series through the exact equation of its Borel
    transform (method borel-ode)? Exact input only, with the checks of :func:`_stable_equation`,
    and a regular singular point (or none) at the origin. The equation, or None."""
    from .estimators.resum_ode import _regular_at_origin
    from .transforms.borel import borel_coefficients
    if not series.is_exact:
        return None
    from .estimators._common import _detect_stride
    if _detect_stride([k for k, v in enumerate(c) if v != 0])[0] > 1:
        # a series in x^k (k > 1): its Borel transform in x decays like exp(-t^2) along the ray,
        # which the walk cannot follow against the growing solutions (sum (-1)^n n! x^(2n) at
        # x = 0.5 came out as 1.9e372 [-1e1039, 1e1039]); the Padé route handles it
        return None
    return _stable_equation(series, c, ctx, borel_coefficients, lambda eq: _regular_at_origin(eq[1], eq[0]))


def _exact_source(series):
    """For exact coefficients, a function giving them at any number of digits."""
    if not series.is_exact:
        return None
    return lambda d: series.dense(Context(dps=d, guard=0))


#: coefficients per unknown of the equation before ``auto`` follows it: a meromorphic function
#: with infinitely many poles passes the exact-equation test at a given precision with an
#: equation of high degree (sum x^k/zeta(k+2): 19 unknowns from 60 terms at 30 digits, 37 from
#: 100 terms at 60 digits), true equations of the functions met here have few unknowns
COEFFS_PER_UNKNOWN_EXACT = 3
COEFFS_PER_UNKNOWN_INEXACT = 4


def _unknowns(eq) -> int:
    K, Q, P = eq
    return sum(len(q) for q in Q) + len(P) - 1


def _shape(eq):
    K, Q, P = eq
    return K, tuple(len(q) for q in Q)


def _find(c, d, digits):
    from .estimators.resum_ode import find_equation
    with _wd(d):
        cm = [mpmath.mpmathify(v) for v in c]
        try:
            return find_equation(cm, d, digits)
        except (ValueError, ZeroDivisionError, ArithmeticError):
            return None


def _stable_equation(series, c, ctx, transform=list, accept=None):
    """The equation (or None) that the exact coefficients ``c`` (after ``transform``) obey, of
    order 0 to 2, found at the working digits, with at least 3 coefficients per unknown,
    ``accept``-ed, and found again, of the same shape, by a full search from the coefficients at
    twice the digits (an equation that only fits to the working precision, such as a
    high-degree rational stand-in for a function with infinitely many poles, changes)."""
    d = max(ctx.work_dps, mpmath.mp.dps) + 10       # the evaluation's working digits (long series)
    with _wd(d):
        eq = _find(transform(c), d, d - 10)
    if eq is None or len(c) < COEFFS_PER_UNKNOWN_EXACT * _unknowns(eq) or (accept and not accept(eq)):
        return None
    d2 = 2 * d + 20
    with _wd(d2 + 10):
        eq2 = _find(transform(series.dense(Context(dps=d2, guard=0))), d2, d2 - 10)
    return eq if eq2 is not None and _shape(eq2) == _shape(eq) else None


def _follow_equation(series, c, ctx, an):
    """Should ``auto`` follow the differential equation the series obeys (method ode)? The
    equation, or None.

    Exact input: :func:`_stable_equation` (the plan's analysis searches order 1 only; this
    searches orders 0 to 2). Inexact input: the analysis found the equation, the coefficients
    carry 30 digits or more, and there are at least 4 coefficients per unknown. About a second
    for a long exact series that obeys no equation."""
    if series.is_exact:
        return _stable_equation(series, c, ctx)
    if not _obeys_equation(an) or series.digits is None or series.digits < 30:
        return None
    d = max(ctx.work_dps, mpmath.mp.dps) + 10
    eq = _find(c, d, min(series.digits, d - 10))
    return eq if eq is not None and len(c) >= COEFFS_PER_UNKNOWN_INEXACT * _unknowns(eq) else None


def _locations(sings) -> tuple:
    """Locations (mpc) of singularity objects or numbers."""
    out = []
    for z in sings or ():
        out.append(mpmath.mpc(z.location if hasattr(z, "location") else mpmath.mpmathify(z)))
    return tuple(out)


def branch_note(cmap, singularities, x) -> Optional[str]:
    """Why the value at ``x`` may lie on another branch than the continuation along the
    straight line from 0 (the principal branch of functions with radial cuts), or None.

    Two causes (common practice, no source): the straight line crosses a cut of the map itself
    (only :class:`PairMap`, whose cuts are vertical lines: the value is then the continuation
    around the branch point); or ``x`` lies farther out than a complex singular point the map
    does not remove, on its side of the origin, so that the approximants' own cut through that
    point (which need not be radial) may separate ``x`` from the straight line. (Unmapped real
    points are left alone: the approximants of a real series cut along the real axis.)"""
    x = mpmath.mpc(x)
    if crosses_pair_cut(cmap, x):
        s = mpmath.mpc(cmap.branch_points()[0])
        s = s if s.imag > 0 else mpmath.conj(s)
        return (f"the straight line from 0 to {point_text(x, 8)} crosses a cut of the map (from "
                f"{point_text(s if x.imag > 0 else mpmath.conj(s), 8)} along Re = {mpmath.nstr(s.real, 8)}): "
                "the value is the continuation around that branch point, another branch than along "
                "the straight line")
    mapped = [mpmath.mpc(b) for b in cmap.branch_points()] if cmap is not None else []
    for z in singularities:
        if any(abs(z - b) <= mpmath.mpf(10) ** -6 * abs(b) for b in mapped):
            continue
        if abs(z.imag) <= mpmath.mpf(10) ** -6 * abs(z):
            continue    # a real point: the approximants of a real series cut along the real axis
        if abs(z) < abs(x) and mpmath.re(x * mpmath.conj(z)) > 0:
            return (f"{point_text(x, 8)} lies beyond {point_text(z, 8)}, a singular point the map does not "
                    "remove: the approximants draw their own cut from it, and the value may belong to "
                    "another branch than the continuation along the straight line from 0")
    return None


def _reexpansion_guard(plan, c, series, wd, loss_out=None) -> int:
    """Extra working digits for a conformal plan (of the series, or of its Borel transform):
    the digits the re-expansion in the disk variable loses to cancellation (estimated from the majorant
    series, :func:`resum._kernels.reexpand.cancellation_digits`), but never more than the
    input carries beyond ``wd`` (inexact coefficients cannot give more). ``loss_out`` (a dict)
    receives ``loss``, the largest cancellation before that cap."""
    if plan.fallback is not None:
        plan = plan.fallback          # the points an ode plan cannot reach are re-expanded
    if plan.method not in _CONFORMAL + ("borel-conformal-pade",) or plan.cmap is None:
        return 0
    from ._kernels.reexpand import cancellation_digits
    import math
    n = len(c)
    try:
        if plan.method == "borel-conformal-pade":
            # the map acts on the Borel transform c_k / Gamma(k + 1 + b)
            with _wd(30):
                b = mpmath.mpmathify(plan.borel_b or 0)
                c = [mpmath.mpmathify(v) / mpmath.gamma(k + 1 + b) for k, v in enumerate(c)]
        loss = cancellation_digits(c, plan.cmap.x_series(n, 30), n)
    except (ValueError, TypeError, ArithmeticError):
        return 0
    loss = [d for d in loss if math.isfinite(d)]
    extra = int(math.ceil(max(loss))) if loss else 0
    if loss_out is not None:
        loss_out["loss"] = extra
    if series.digits is not None:
        extra = min(extra, max(0, int(series.digits) + 10 - wd))
    return max(0, extra)


#: A large-x power read from the series (not given) is absorbed only at points this close to
#: the rim of the mapped disk, |w| >= RIM_POWER_FROM_W. Measured on the angle-deformed kernel
#: family from 100 loops (studies/accuracy): absorbing x^(1/2) gains 0.3-0.9 digits at g = 20
#: (|w| = 0.975) at every angle, but at g = 5 (|w| = 0.905) it gains 0.5 digits at a = pi/8,
#: loses 0.8 at 3 pi/8, and at a = 0 with 40 digits asked its band fell short of the closed form
#: by 3x (the approximants settle ~1e-28 from it: the size of the exp(-4 pi g) term they miss).
RIM_POWER_FROM_W = 0.95
#: ... or within RIM_POWER_LAYER / N of the rim, (1 - |w|) N <= RIM_POWER_LAYER: the approximants
#: resolve the growth factor (1 - w)^(-2p) only a few times 1/N away from w = 1. N is the number
#: of terms, but for decimal input at most 2 D + 8 (D the digits the coefficients carry: the
#: near-diagonal approximants that rounding leaves meaningful); this reaches further in than
#: RIM_POWER_FROM_W only for N < 80 or D < 36. Measured on (1 + x)^(1/3) rounded to 16 digits
#: (studies/evaluate_sweep --digits 16): at x = 1000 (|w| = 0.939) every approximant sat 0.01
#: below the truth and the band missed it, from 40 and from 80 terms; with x^(1/3) divided out,
#: 11 and 12 digits, in band
RIM_POWER_LAYER = 4


def _rim_power_from_w(n_terms, digits=None):
    """The ``|w|`` from which a large-x power read from the series is divided out."""
    n = n_terms if digits is None else min(n_terms, 2 * int(digits) + 8)
    return min(RIM_POWER_FROM_W, 1 - RIM_POWER_LAYER / max(n, 1))


def _rim_alpha(cmap, alpha, large_x_power, c, ctx, digits=None):
    """The rim power for a conformal plan, a note for its ``why`` and the ``|w|`` from which
    it applies: from ``alpha`` or ``large_x_power`` when given (everywhere); otherwise the
    large-x power read from the series through the map
    (:func:`~resum.estimators.resum_conformal.rim_power`), when it is clearly a simple
    fraction, at points with ``|w| >= RIM_POWER_FROM_W`` or within ``RIM_POWER_LAYER / N`` of
    the rim (:func:`_rim_power_from_w`; ``digits``: what decimal coefficients carry).
    ``large_x_power = 0`` turns the reading off."""
    if alpha is not None or large_x_power is not None:
        return _alpha_for(cmap, alpha, large_x_power), "", None
    from .estimators.resum_conformal import rim_power
    try:
        got = rim_power(c, cmap, min(ctx.work_dps, 60))
    except (ValueError, ZeroDivisionError, ArithmeticError):
        got = None
    if got is None or got[0] == 0:
        return None, "", None
    p, med, half = got
    from_w = _rim_power_from_w(len(c), digits)
    note = (f"; growth x^({p}) at large x read from the series (the log-derivative through the map gives "
            f"{Estimate(med, med - max(half, mpmath.mpf(10) ** -6), med + max(half, mpmath.mpf(10) ** -6))} "
            "at infinity), divided "
            f"out at points with |w| >= {sig_text(from_w, 3)} and by the quadratic approximants tried from "
            f"|w| >= {QUADRATIC_FROM_W}; give large_x_power (--large-power) to apply a power everywhere, 0 to turn this off")
    return _alpha_for(cmap, None, mpmath.mpf(p.numerator) / p.denominator), note, from_w


def _alpha_for(cmap, alpha, large_x_power):
    if alpha is not None:
        return alpha
    if large_x_power is None:
        return None
    p = mpmath.mpmathify(large_x_power)
    if isinstance(cmap, StarMap):
        return cmap.large_x_exponent() * p
    return 2 * p if isinstance(cmap, RayMap) else p


def _cut_advice_in_coupling(o, a, x, cpl, cut_map):
    """A point on the cut of the map, given in the coupling (x = g^2, say): the advice names
    the nudge of the coupling that leaves the cut (the cut x < 0 is the imaginary g axis, where
    adding 1e-6*I to g stays on it)."""
    from .estimators.resum_conformal import off_cut_step
    step = off_cut_step(cut_map, cpl.to_variable, a)
    if step is None:
        return
    o.reason = (f"{cpl.symbol} = {point_text(a)} (x = {point_text(x)}) lies on the cut of the map "
                f"({cut_map.describe()}); to pick a side of the cut, add {step} to "
                f"{cpl.symbol}, or, if the function has no cut there, choose another method with --method")


def _run_at(plan: _Plan, c, xs, dps, n_orders, quad_dps, target):
    """:func:`_run` at ``dps`` working digits (a task of :func:`evaluate`)."""
    with _wd(dps):
        return _run(plan, c, xs, dps, n_orders, quad_dps, target=target)


def _run(plan: _Plan, c, xs, dps, n_orders, quad_dps=None, target=None):
    from .estimators.resum_borel import borel_evaluate
    from .estimators.resum_pade import pade_evaluate, partial_sum_evaluate
    # the digits a method may ask of the input: the rerun at higher precision asks for more than
    # inexact input carries (ode: the equation test; borel: which pole-zero pairs on the path are
    # noise, see resum_borel)
    digits = target if plan.input_digits is None or target is None else min(target, plan.input_digits)
    if plan.method == "partial-sum":
        return partial_sum_evaluate(c, xs, dps, n_orders=7 if n_orders is None else n_orders)
    if plan.method == "pade":
        inside = [j for j, x in enumerate(xs) if plan.reach is None or abs(x) < plan.reach]
        outs, diag = (pade_evaluate(c, [xs[j] for j in inside], dps, n_orders=7 if n_orders is None else n_orders)
                      if inside else ([], {}))
        if len(inside) == len(xs):
            return outs, diag
        full = [PointOutcome(None, None, False, (
            f"x = {point_text(x, 8)} lies beyond the poles the approximants resolve (|x| < "
            f"{sig_text(plan.reach, 4)}, where the top two orders stop agreeing): their values there are "
            "extrapolation; more terms reach farther") if plan.boundary is None else (
            f"x = {point_text(x, 8)} lies at or beyond the natural boundary suspected at |x| ~ {plan.boundary} "
            f"(from {sig_text(plan.boundary.lower, 4)}): the series defines no value there, so none is "
            "given"), {}) for x in xs]
        for j, o in zip(inside, outs):
            full[j] = o
        return full, diag
    if plan.method in ("ode", "borel-ode"):
        if plan.method == "ode":
            from .estimators.resum_ode import ode_evaluate as run_equation
        else:
            from .estimators.resum_borel_ode import borel_ode_evaluate as run_equation
        at = plan.coefficients_at
        outs, diag = run_equation(c, xs, dps, digits=digits, shape=plan.equation_shape,
                                  coefficients_at=None if at is None else (lambda d: at(d)[:len(c)]))
        # a point beyond a branch point on the line from 0 keeps its refusal: the fallback's map
        # may not cut there, and its number would be neither side's value (exact sqrt(1 + x) +
        # log(1 - x/3) at x = 5 came back as 4.1(15) from a map cut only at -1; truth 2.04 +- pi i)
        miss = [j for j, o in enumerate(outs) if not o.ok and not o.info.get("branch_on_line")]
        if plan.fallback is None or not miss:
            return outs, diag
        # the points the equation cannot reach, by the fallback plan
        o2, d2 = _run(plan.fallback, c, [xs[j] for j in miss], dps, n_orders, quad_dps, target)
        merged = dict(d2)
        if diag.get("equation"):
            merged.update(diag)
        else:
            merged["ode_refused"] = outs[miss[0]].reason
        for j, o in zip(miss, o2):
            o.info["method"] = plan.fallback.method
            o.info["ode_refused"] = outs[j].reason
            outs[j] = o
        return outs, merged
    if plan.method in _CONFORMAL:
        outs, diag = _run_conformal(plan, c, xs, dps, n_orders, target)
        if plan.method == "conformal-pade":
            outs, diag = _near_rim_quadratic(plan, c, xs, outs, diag, dps, n_orders, target)
        return outs, diag
    return borel_evaluate(c, xs, dps, b=plan.borel_b, cmap=plan.cmap, alpha=plan.alpha,
                          n_orders=7 if n_orders is None else n_orders, lateral=plan.lateral,
                          quad_dps=quad_dps, target_digits=digits)


def _run_conformal(plan: _Plan, c, xs, dps, n_orders, target):
    """Conformal plans: one map, or the pair map with radial cuts for points beyond its
    vertical cuts; a power read from the series applied near the rim only."""
    from .estimators.resum_conformal import conformal_evaluate
    if plan.alpha_from_w is not None:
        # the power read from the series applies near the rim only (RIM_POWER_FROM_W)
        near = [j for j, x in enumerate(xs) if abs(plan.cmap.w_of_x(x)) >= plan.alpha_from_w]
        groups = [(near, replace(plan, alpha_from_w=None)),
                  ([j for j in range(len(xs)) if j not in near], replace(plan, alpha=None, alpha_from_w=None))]
        outs, diag = [None] * len(xs), {}
        for idx, sub in groups:
            if not idx:
                continue
            o, d = _run_conformal(sub, c, [xs[j] for j in idx], dps, n_orders, target)
            for j, oj in zip(idx, o):
                oj.info["rim_power_alpha"] = None if sub.alpha is None else mpmath.nstr(sub.alpha, 10)
                outs[j] = oj
            diag = dict(d, **diag)
        return outs, diag
    kw = {"variants": "quadratic" if plan.method == "conformal-quadratic" else "both",
          "strong_terms": plan.strong_terms}
    star, cross = _star_points(plan.cmap, xs)
    if not cross:
        return conformal_evaluate(c, xs, plan.cmap, dps, alpha=plan.alpha,
                                  n_orders=7 if n_orders is None else n_orders, target_digits=target, **kw)
    # points beyond a vertical cut of the pair map: the star map's radial cuts give them the
    # continuation along the straight line from 0; the others keep the pair map (nearer rim)
    rest = [j for j in range(len(xs)) if j not in cross]
    outs = [None] * len(xs)
    diag = {}
    if rest:
        o1, diag = conformal_evaluate(c, [xs[j] for j in rest], plan.cmap, dps, alpha=plan.alpha,
                                      n_orders=7 if n_orders is None else n_orders, target_digits=target, **kw)
        for j, o in zip(rest, o1):
            outs[j] = o
    a_star = None if plan.alpha is None else star.large_x_exponent() * plan.alpha
    o2, d2 = conformal_evaluate(c, [xs[j] for j in cross], star, dps, alpha=a_star,
                                n_orders=7 if n_orders is None else n_orders, target_digits=target, **kw)
    for j, o in zip(cross, o2):
        o.info["map"] = star.to_dict()
        outs[j] = o
    return outs, (diag if rest else dict(d2, map=plan.cmap.to_dict()))


#: With the power at large x known (given, or read from the series), points with
#: |w| >= QUADRATIC_FROM_W whose conformal-Padé band falls short of the digits asked also get
#: the quadratic (Hermite-Padé) approximants, with the power divided out, and the narrower
#: band wins (widened to cover the other band where the two do not overlap, and to reach the
#: other's value where its band is at most 30 times wider, ``COVER_CENTRE_RATIO``). Measured on the
#: angle-deformed kernel family from 100 loops with x^(1/2) given (studies/accuracy): at g = 5
#: (|w| = 0.905) and g = 20 (0.975) the quadratic approximants gain 1-2.3 digits at a = pi/8,
#: pi/4 and 3 pi/8 with bands 9-380 x their error, and lose 13 digits at a = 0, where
#: conformal-Padé's band is the narrower one. Closer in (g = 2, |w| = 0.78) they gained only
#: 0.4-1.1 digits, with bands up to 5800 x their error, and lost 28 at a = 0.
QUADRATIC_FROM_W = 0.9


def _near_rim_quadratic(plan: _Plan, c, xs, outs, diag, dps, n_orders, target):
    """The quadratic variant at the points near the rim that conformal-Padé left short of
    ``target`` digits (:data:`QUADRATIC_FROM_W`); per point the narrower band wins."""
    from .estimators.resum_conformal import _choose, conformal_evaluate
    if plan.alpha is None or plan.alpha == 0 or not isinstance(plan.cmap, (RayMap, StarMap)):
        return outs, diag
    idx = []
    for j, (x, o) in enumerate(zip(xs, outs)):
        if abs(plan.cmap.w_of_x(x)) < QUADRATIC_FROM_W:
            continue
        short = (not o.ok or o.re is None or target is None
                 or o.re.error > abs(o.re.value) * mpmath.mpf(10) ** (-target))
        if short:
            idx.append(j)
    if not idx:
        return outs, diag
    q, qd = conformal_evaluate(c, [xs[j] for j in idx], plan.cmap, dps, alpha=plan.alpha,
                               n_orders=7 if n_orders is None else n_orders, variants="quadratic",
                               target_digits=target)
    before = [outs[j] for j in idx]
    names = [o.info.get("variant") for o in before]
    chosen = _choose([("pade", before), ("quadratic", q)], cover_centres=True)
    outs = list(outs)
    for j, o, name in zip(idx, chosen, names):
        if o.info.get("variant") == "pade":
            o.info["variant"] = name
        else:
            o.info["rim_power_alpha"] = mpmath.nstr(plan.alpha, 10)
        o.info["quadratic_tried"] = True
        outs[j] = o
    return outs, dict(diag, quadratic=qd.get("quadratic", qd))


def _star_points(cmap, xs):
    """(StarMap, indices) of the points whose straight line from 0 crosses a vertical cut of a
    pair map and which the star map of the same pair reaches (inside its disk)."""
    if not isinstance(cmap, PairMap):
        return None, []
    idx = [j for j, x in enumerate(xs) if crosses_pair_cut(cmap, x)]
    if not idx:
        return None, []
    star = StarMap(cmap.s)
    idx = [j for j in idx if abs(star.w_of_x(xs[j])) < 1 - mpmath.mpf(10) ** -12]
    return star, idx


def _perturb(c, digits, seed=20240611, scale=1):
    """Move inexact coefficients by 10^-digits relative, i.e. between a tenth of a unit and one
    unit in their last carried digit (fixed pseudo-random signs).

    One sample of the response to the input's rounding: measured on 60 coefficients of
    (1 + x + x^2)^(-1/3) at 25 digits (method ode, x = 10) it moved the value by 1.5e-25 where
    the rounding itself had moved it by 4.1e-25, and six other sign patterns moved it by 2e-25
    to 1.7e-24. A full unit per coefficient was tried (4 December 2026) and not kept: on
    studies/evaluate_sweep --digits 16 it gave 47 bands wider than 100 x the error instead of
    27, and one band (x = 1000) that missed by 10 % where this one held. Several samples would
    be the fix; each costs a rerun."""
    if digits is None:
        return c
    import random
    rng = random.Random(seed)
    eps = mpmath.mpf(10) ** (-digits) * scale
    return [v * (1 + eps * rng.choice((-1, 1))) for v in c]


#: a precision rerun whose band supports no significant digit and is this many times wider than
#: the point's own is covered whole (exp(-x)/sqrt(1+x) from 80 terms rounded to 16 digits at
#: x = 10: the approximants agreed to 7e-6 around -5e-6, the rerun's band was 4e-3, the truth
#: 1.4e-5: outside; studies/evaluate_sweep --digits 16). Covering every rerun band ten times
#: wider cost 2-3 digits at a dozen points of that sweep whose bands held anyway
RERUN_WIDER = 10


def _cover(est: Optional[Estimate], others) -> Optional[Estimate]:
    """``est`` widened to contain the whole of each band in ``others``."""
    if est is None:
        return None
    lo, hi = est.lower, est.upper
    for o in others:
        if o is not None:
            lo, hi = min(lo, o.lower), max(hi, o.upper)
    return Estimate(est.value, lo, hi)


def _widen(est: Optional[Estimate], others, factor=2) -> Optional[Estimate]:
    if est is None:
        return None
    lo, hi = est.lower, est.upper
    for o in others:
        if o is None:
            continue
        d = abs(o.value - est.value) * factor
        lo, hi = min(lo, est.value - d), max(hi, est.value + d)
    return Estimate(est.value, lo, hi)


def _in_variable(text, var: str):
    """``text`` worded in the series' variable ``var``: the estimators and the plan say
    "x = ..." at the start and "|x|" for a modulus."""
    if var == "x" or not isinstance(text, str):
        return text
    if text.startswith("x = "):
        text = var + text[1:]
    return text.replace("|x|", f"|{var}|")


def evaluate(series: Series, points, ctx: Optional[Context] = None, method: str = "auto",
             verify: bool = True, *, cmap: Optional[ConformalMap] = None, singularities=None,
             borel_b=None, borel_map=None, borel_singularities=None, alpha=None, large_x_power=None,
             strong_terms=None, lateral: str = "auto",
             n_orders: Optional[int] = None, use_analysis: bool = True,
             work_dps: Optional[int] = None, analysis=None, progress=None) -> EvaluationResult:
    """Resummed values of ``series`` at ``points``, with bands.

    Parameters
    ----------
    series : Series
        Coefficients from the expansion variable's power ``start >= 0``.
    points : sequence of numbers or strings
        Where to evaluate: the coupling ``g`` if the series declares one
        (``x = coupling.to_variable(g)``), else the expansion variable.
        Strings may be expressions (``"1/4"``, ``"sqrt(2)"``).
    ctx : Context
        Digits wanted (``ctx.dps``); the work runs at ``work_dps`` (default
        ``ctx.work_dps + n_terms // 2``: Padé systems of long series lose digits).
    method : str
        One of :data:`METHODS`; unknown -> :class:`~resum.errors.InputError`.
    verify : bool
        Rerun at higher precision (inexact coefficients moved by one unit in
        their last digit) and with fewer terms; widen bands to cover the
        reruns; flag points whose reruns disagree.
    cmap : ConformalMap, optional
        The map for ``conformal-pade`` (default: chosen from ``singularities``,
        the analysis, or the approximants' poles).
    singularities : sequence, optional
        Singular points in the expansion variable (numbers or
        :class:`~resum.results.Singularity`) to choose the map from.
    borel_b : number, optional
        Borel-Le Roy parameter (default 0).
    borel_map : ConformalMap or "auto", optional
        Map of the Borel plane for ``borel-conformal-pade``.
    strong_terms : dict, optional
        Terms of the function's expansion at large coupling that are known, ``{power:
        coefficient}`` with powers in the variable of ``points`` (the coupling when the series
        declares one): every term from the leading power down to the last one given, spaced by 1
        in ``g`` for ``x = g^2`` (by 1/2 in ``x``). With a conformal plan whose cut runs along the
        negative axis, two-point approximants match the series at 0 and these terms at infinity,
        as a variant chosen per point by its band (:mod:`resum.estimators.resum_twopoint`).
        A coefficient given as text with a decimal carries the digits it shows, text such as
        ``"2.000(10)"`` that band, a float 15 digits, an :class:`~resum.results.Estimate` its
        band; their uncertainty widens the band (:func:`strong_coefficient`). Integers, fractions, exact expressions and mpf values are taken as exact.
    borel_singularities : sequence, optional
        Singular points of the Borel transform (numbers; the instanton action ``A`` and its
        kin) to map the Borel plane from instead of the one the analysis finds; one on the
        positive axis means no map and lateral sums.
    alpha, large_x_power : number, optional
        Rim factor ``(1 - w/w_inf)^alpha`` in the mapped variable, or the
        expected power ``p`` of ``f ~ x^p`` at large ``x`` from which alpha is set.
        When neither is given, conformal plans read ``p`` from the series itself
        (the log-derivative through the map at the rim point,
        :func:`~resum.estimators.resum_conformal.rim_power`) when it is clearly a
        simple fraction, and use it near the rim only (:func:`_rim_power_from_w`,
        and for the quadratic variant :data:`QUADRATIC_FROM_W`); the plan's
        ``why`` says so. A power that is given applies at every point (and enables
        the quadratic variant near the rim). ``large_x_power=0`` turns both off.
    lateral : {"auto", "always", "never"}
        Lateral Borel sums when a singularity lies on the integration ray.
    n_orders : int, optional
        How many lower term counts (down to about 55% of the terms) are used to
        extrapolate the band (default 7); 0 keeps only the top four.
    analysis : AnalysisResult, optional
        A singularity analysis of this same series (from
        :func:`resum.analysis.analyze`) to plan the method and map from; by
        default ``method="auto"`` runs one (without its verification reruns), and so
        does ``"conformal-pade"`` when neither ``cmap`` nor ``singularities`` is given.
    progress : callable, optional
        Called with a one-line message as each stage starts and ends (the
        command line prints them on stderr).

    Returns
    -------
    EvaluationResult

    Notes
    -----
    Each band is the spread of stable approximants (``diagnostics["how"]``),
    widened by the verification reruns. Optimal truncation is computed at
    every point as a baseline (``PointResult.baseline``).
    """
    t0 = time.time()
    if not isinstance(series, Series):
        raise InputError(f"expected a resum.Series, got {type(series).__name__}; build one with "
                         "Series([c0, c1, ...])", where="series")
    _check_method(method)
    if lateral not in ("auto", "always", "never"):
        raise InputError(f"must be 'auto', 'always' or 'never', got {lateral!r}", where="lateral")
    if n_orders is not None and (isinstance(n_orders, bool) or not isinstance(n_orders, int) or n_orders < 0):
        raise InputError(f"must be a whole number >= 0 (lower term counts for the band), got {n_orders!r}",
                         where="n_orders")
    verify = check_flag(verify, "verify")
    ctx = checked_context(ctx)
    if series.start < 0:
        raise InputError(f"series starts at {series.variable}^{series.start}; multiply by "
                         f"{series.variable}^{-series.start} first", where="series")
    if series.n_terms < 6:
        raise InputError(f"only {series.n_terms} terms; resummation needs at least 6", where="series")
    lowered = None
    if series.digits is not None and series.digits < ctx.dps:
        lowered = ctx.dps
        ctx = ctx.with_dps(max(5, series.digits))
    wd = work_dps or ctx.work_dps + series.n_terms // 2
    at = parse_points(points, wd)
    cpl = series.coupling
    warnings = []
    if lowered is not None:
        # the command line refuses this; from Python the digits asked are lowered, and said so
        warnings.append(f"{lowered} digits asked, but the coefficients carry {series.digits}: values "
                        f"and bands are worked out to at most {ctx.dps} digits")
    with _wd(wd):
        xs = [cpl.to_variable(a) if cpl is not None else a for a in at]
        xs = [mpmath.re(x) if isinstance(x, mpmath.mpc) and x.imag == 0 else x for x in xs]
        c = series.dense(Context(dps=wd, guard=0))
        say = progress or (lambda msg: None)
        t1 = time.time()
        say(f"choosing the method for {series.n_terms} terms")
        plan = _plan(method, c, xs, series, ctx, cmap=cmap, singularities=singularities,
                     borel_b=borel_b, borel_map=borel_map, alpha=alpha, lateral=lateral,
                     large_x_power=large_x_power, use_analysis=use_analysis, warnings=warnings,
                     analysis=analysis, borel_singularities=borel_singularities,
                     strong_terms=_strong_in_x(strong_terms, cpl, wd))
        if strong_terms and not (plan.strong_terms or (plan.fallback is not None and plan.fallback.strong_terms)):
            warnings.append("the strong-coupling terms given are not used: they need the conformal-Padé "
                            "method with one cut along the negative axis (the plan: "
                            f"{plan.method}; {plan.why[:120]})")
        loss = {}
        extra = _reexpansion_guard(plan, c, series, wd, loss) if work_dps is None else 0
        reexp_warning = None    # index of the warning below: dropped if no point used a map
        if series.digits is not None and "loss" in loss and loss["loss"] >= max(series.digits - 10, 5):
            # the mapped coefficients of the top orders keep (almost) none of the input's digits
            left = max(0, series.digits - loss["loss"])
            reexp_warning = len(warnings)
            warnings.append(
                f"the re-expansion in the disk variable cancels about {loss['loss']} digits by the top "
                f"order, leaving {'none' if left == 0 else f'about {left}'} of the {series.digits} the "
                f"coefficients carry: the highest orders add little, and more terms at {series.digits} "
                f"digits would add little more; coefficients with about {loss['loss'] + ctx.dps} digits "
                "would let every term count")
        if extra:
            # precision plan of the conformal re-expansion: its sums cancel about `extra`
            # digits, which the Padé step in the disk variable must not pay for
            wd += extra
            diag_plan = {"reexpansion_guard_digits": extra}
            with _wd(wd):
                c = series.dense(Context(dps=wd, guard=0))
                at = parse_points(points, wd)
                xs = [cpl.to_variable(a) if cpl is not None else a for a in at]
                xs = [mpmath.re(x) if isinstance(x, mpmath.mpc) and x.imag == 0 else x for x in xs]
        else:
            diag_plan = {}
        # the Padé systems need the long working precision; the Laplace integrals only the
        # reported digits plus guards (tanh-sinh converges fast there)
        qd = min(wd, ctx.work_dps + 5)
        # the run itself and, with verify, its reruns at higher precision (input moved in its
        # last digit) and with fewer terms: independent, side by side where resum.parallel allows
        tasks = [(plan, c, xs, wd, n_orders, qd, ctx.dps)]
        if verify:
            hi = ctx.higher()
            wd2 = hi.work_dps + series.n_terms // 2 + extra if work_dps is None else work_dps + 15
            with _wd(wd2):
                c2 = _perturb(series.dense(Context(dps=wd2, guard=0)), series.digits)
            nf = max(6, series.n_terms - max(4, series.n_terms // 10))
            tasks += [(plan, c2, xs, wd2, n_orders, min(wd2, hi.work_dps + 5), hi.dps),
                      (plan, c[:nf], xs, wd, n_orders, qd, ctx.dps)]
        from .parallel import jobs_for, run_tasks
        jobs = jobs_for(series.n_terms, len(tasks))
        say(f"method {plan.method} ({time.time() - t1:.1f} s)")
        t1 = time.time()
        say(f"{plan.method} at {len(xs)} point(s)" + (", with reruns at higher precision and with fewer terms"
                                                     if verify else "")
            + (f", {jobs} processes" if jobs > 1 else ""))
        def run_all(ts):
            # side by side where resum.parallel allows, else one after the other
            got = run_tasks(_run_at, ts, jobs_for(series.n_terms, len(ts)))
            return got if got is not None else [_run_at(*t) for t in ts]
        done = run_all(tasks)
        say(f"{plan.method} done ({time.time() - t1:.1f} s)")
        outs, diag = done[0]
        checks = [[] for _ in xs]
        samples = [[] for _ in xs]      # more roundings of the input, where its digits may set the band
        limits = [None for _ in xs]     # _input_limit of the precision rerun at each point
        if verify:
            o2, o3 = done[1][0], done[2][0]
            for j in range(len(xs)):
                checks[j] = [("higher precision", o2[j]), (f"{nf} terms", o3[j])]
                if series.digits is not None and outs[j].ok and outs[j].re is not None and o2[j] is not None \
                        and o2[j].ok and o2[j].re is not None:
                    limits[j] = _input_limit(outs[j].re, o2[j].re, series.digits, ctx.dps, outs[j].im, o2[j].im)
            flagged = [j for j in range(len(xs)) if limits[j] is not None]
            if flagged:
                # other roundings at the main run's own precision: their moves are the input's
                # alone (the rerun above also changes the working precision)
                say(f"the input's digits may set the band at {len(flagged)} point(s): "
                    f"{INPUT_LIMIT_SAMPLES} more roundings")
                with _wd(wd):
                    inputs = [_perturb(c, series.digits, seed=20240611 + k) for k in range(1, INPUT_LIMIT_SAMPLES + 1)]
                more = [(plan, ck, [xs[j] for j in flagged], wd, INPUT_LIMIT_ORDERS, qd, ctx.dps) for ck in inputs]
                for outs_k, _ in run_all(more):
                    for j, oc in zip(flagged, outs_k):
                        if oc is not None and oc.ok and oc.re is not None:
                            samples[j].append(oc)
        # the digits the input carries (those asked, for exact coefficients): they bound the
        # baseline's band, the agreement asked of the reruns and the digits reported
        d_in = ctx.dps if series.digits is None else min(ctx.dps, series.digits)
        baselines = []
        for x in xs:
            t = optimal_truncation(c, x, wd, digits=d_in)
            baselines.append(Baseline(t["value"], t["imag"], t["n_terms"], t["smallest_term"],
                                      t["reached"], t["how"]))
        pts = []
        n_fail = 0
        real_input = not any(isinstance(v, mpmath.mpc) and v.imag != 0 for v in c)
        for j, (a, x, o) in enumerate(zip(at, xs, outs)):
            cut_map = o.info.pop("cut_map", None)
            if cut_map is not None and cpl is not None:
                _cut_advice_in_coupling(o, a, x, cpl, cut_map)
            elif series.variable != "x" and isinstance(o.reason, str):
                # the estimators word a point as "x = ..." and a radius as "|x| < ...": name the
                # file's variable (v = tanh K)
                o.reason = _in_variable(o.reason, series.variable)
            pdiag = dict(o.info)
            pdiag.pop("method", None)        # a fallback point's method: PointResult.method
            if o.info.get("strong_terms_conflict"):
                names = ", ".join(f"{k} ({v} half-widths)" for k, v in o.info["strong_terms_conflict"].items())
                warnings.append(f"at {point_text(a)}: the two-point value (strong-coupling terms given) lay "
                                f"outside the band of the approximants without them: {names}; its band was "
                                "widened to cover theirs. Check the terms given")
            if o.info.get("rim_layer"):
                rl = o.info["rim_layer"]
                warnings.append(f"at {point_text(a)}: the point lies closer to the rim of the mapped disk "
                                f"than 1/(terms) ((1 - |w|) x terms = {rl['layer']}), where the approximants' "
                                f"spread understates the error; band widened {rl['factor']} x")
            parts = {}      # half-width of the band after each widening step (diagnostics)
            status, success, msg = Status.CONVERGED, True, ""
            re, im = o.re, o.im
            if im is not None and real_input and not isinstance(x, mpmath.mpc) and "S_plus" not in o.info \
                    and re is not None and im.contains(0):
                # a real series at a real point off any lateral sum: an imaginary part that
                # contains 0 is rounding (atan at real points carried "im": "-4.35e-77")
                im = None
            if not o.ok or re is None:
                status, success, msg = Status.NOT_CONVERGED, False, o.reason or "no stable approximants"
                if o.info.get("cut_hint"):
                    msg += "; " + o.info["cut_hint"]
                n_fail += 1
            else:
                agree = {}
                for name, oc in checks[j]:
                    if oc is None or not oc.ok or oc.re is None:
                        agree[name] = "failed"
                        if name == "higher precision":
                            status, success = Status.UNSTABLE_PRECISION, False
                            msg = "the rerun at higher precision failed"
                        continue
                    dev = abs(oc.re.value - re.value)
                    agree[name] = mpmath.nstr(dev, 5)
                    agree[name + " band"] = mpmath.nstr(oc.re.error, 5)
                    # the input's own digits limit agreement too: a perturbation in the last
                    # digit of the coefficients may move the value by that much
                    tol = 100 * max(re.error + oc.re.error, abs(re.value) * mpmath.mpf(10) ** (3 - wd),
                                    abs(re.value) * mpmath.mpf(10) ** (-d_in))
                    if dev > tol:
                        if name == "higher precision":
                            status, success = Status.UNSTABLE_PRECISION, False
                        else:
                            status, success = Status.UNSTABLE_ORDER, False
                        msg = f"the {name} rerun moved the value by {sig_text(dev, 3)}, far outside the band"
                parts["approximants"] = mpmath.nstr(re.error, 5)
                if checks[j]:
                    # the precision rerun widens the band; the fewer-terms rerun only checks it
                    # (its own band must reach the full-order value), and widens when it fails to
                    prec = [oc for name, oc in checks[j] if name == "higher precision" and oc is not None and oc.ok]
                    # (a rerun that used another method than this point, e.g. ode against its
                    # conformal fallback, checks nothing about this point's band)
                    few = [oc for name, oc in checks[j] if name != "higher precision" and oc is not None and oc.ok
                           and oc.info.get("method", plan.method) == o.info.get("method", plan.method)]
                    # an equation followed exactly (ode, borel-ode) has no spread of approximants to
                    # absorb the input's rounding: the one rerun's move is all the band has, and one
                    # sample of a random response needs a wider factor (60 coefficients of
                    # (1 + x + x^2)^(-1/3) at 25 digits, x = 1000: the rounding moved the value 5.5x
                    # more than the rerun did; other sign patterns 1.3-11x)
                    fac = 10 if o.info.get("method", plan.method) in ("ode", "borel-ode") else 2
                    lim = limits[j]     # set only where prec[0] is that precision rerun
                    if lim is not None:
                        first = _move(re, im, prec[0])
                        if samples[j] and max(_move(re, im, oc) for oc in samples[j]) < INPUT_LIMIT_LINEAR * first:
                            # other roundings at the main run's precision hardly move the value: the
                            # rerun's move came from its higher precision, not from the input's digits
                            lim = None
                        else:
                            # the largest move among the roundings sampled, at most INPUT_LIMIT_CAP x the
                            # first one's (at a complex point, or with a lateral sum's imaginary part, a
                            # move is that of the complex value: the rounding moves both parts, and each
                            # part's band is widened by it); the spread of the approximants no longer
                            # absorbs the input's rounding here (see INPUT_LIMIT_WIDEN). Where every
                            # other rounding gave no value, the rerun's move is all that was measured.
                            moves = [_move(re, im, oc) for oc in [prec[0]] + samples[j]]
                            top = min(max(moves), INPUT_LIMIT_CAP * moves[0])
                            moved_re = Estimate.exact(re.value + top)
                            moved_im = None if im is None else Estimate.exact(im.value + top)
                            lim = _input_limit(re, moved_re, series.digits, ctx.dps, im, moved_im) or lim
                            lim["roundings_sampled"] = len(moves)
                            lim["moves"] = [mpmath.nstr(m, 3) for m in moves]
                            prec = [prec[0], replace(prec[0], re=moved_re,
                                                     im=moved_im if im is not None else prec[0].im)]
                            if samples[j]:
                                agree["other roundings"] = mpmath.nstr(max(moves[1:]), 5)
                            else:
                                agree["other roundings"] = "failed"
                                lim["note"] = "the other roundings of the input gave no value"
                                warnings.append(f"at {point_text(a)}: the input rounded otherwise in its "
                                                "last digit gave no value; the band rests on one rounding's move")
                            pdiag["input_limited"] = lim
                            fac = max(fac, INPUT_LIMIT_WIDEN)
                    re = _widen(re, [oc.re for oc in prec], fac)
                    if im is not None:
                        im = _widen(im, [oc.im for oc in prec], fac)
                    # a rerun whose band supports no digit at all (the input moved by a unit in its
                    # last digit scatters the approximants) says that a narrow spread here is luck
                    lost = [oc for oc in prec if oc.re is not None and _supports_no_digit(oc.re, oc.im)
                            and oc.re.error > RERUN_WIDER * re.error]
                    if lost:
                        re = _cover(re, [oc.re for oc in lost])
                        if im is not None:
                            im = _cover(im, [oc.im for oc in lost])
                        warnings.append(f"at {point_text(a)}: the rerun at higher precision (input moved "
                                        "in its last digit) supports no digit here; band widened to cover it")
                    parts["precision rerun"] = mpmath.nstr(re.error, 5)
                    for oc in few:
                        if oc.re is not None and not oc.re.contains(re.value) and success:
                            # the band model fell short with fewer terms by the factor dev / band
                            # (dev: at most the error with fewer terms plus the full-order one);
                            # the full-order band is widened by the same factor, never beyond dev
                            dev = abs(oc.re.value - re.value)
                            short = dev / oc.re.error if oc.re.error > 0 else mpmath.inf
                            w = min(dev, re.error * short)
                            re = Estimate(re.value, min(re.lower, re.value - w), max(re.upper, re.value + w))
                            parts["fewer terms"] = mpmath.nstr(re.error, 5)
                            warnings.append(f"at {point_text(a)}: the band with fewer terms falls short of "
                                            f"the full-order value by a factor {sig_text(short, 3)}; "
                                            "band widened by that factor")
                    pdiag["verification"] = agree
                if not success:
                    n_fail += 1
                    warnings.append(f"at {point_text(a)}: {msg}")
            # never report more digits than the input carries or than were asked for
            if re is not None:
                fl = abs(re.value) * mpmath.mpf(10) ** (-d_in)
                if re.error < fl:
                    re = Estimate(re.value, min(re.lower, re.value - fl), max(re.upper, re.value + fl))
                    parts["digits floor"] = mpmath.nstr(re.error, 5)
                pdiag["band_steps"] = parts
                reach = _reach(o.info, re, d_in, series.n_terms)
                if reach is not None:
                    pdiag["reach"] = reach
                if im is not None:
                    fli = max(abs(im.value), abs(re.value)) * mpmath.mpf(10) ** (-d_in)
                    if im.error < fli:
                        im = Estimate(im.value, min(im.lower, im.value - fli), max(im.upper, im.value + fli))
                zero_scale = first_term_scale(c, x)
                if success and _supports_no_digit(re, im) and _zero_within(re, im, zero_scale):
                    # the function vanishes here (to the band): no relative digit, but an
                    # absolute statement as good as the band; not a failure
                    err = re.error if im is None else max(re.error, im.error)
                    pdiag["absolute"] = {"bound": mpmath.nstr(err, 5), "scale": mpmath.nstr(zero_scale, 5)}
                    pdiag.pop("reach", None)     # a count of terms for relative digits means nothing here
                    warnings.append(f"at {point_text(a)}: the value is zero to within "
                                    f"{sig_text(err, 3)} (absolute; the first term of the series there is "
                                    f"{sig_text(zero_scale, 3)}): the band is an absolute error, it supports "
                                    "no relative digit")
                elif success and _supports_no_digit(re, im):
                    # a band wider than a tenth of the value is no result, however stable the
                    # approximants looked (Padé at (1+x)^(-1/3), x = 1e6: -99 [-500, 300])
                    status, success = Status.NOT_CONVERGED, False
                    # name the band that is wide: at a complex point the test is on the modulus,
                    # and a narrow real band beside a wide imaginary one must not read as the cause
                    band = f"[{sig_text(re.lower, 2)}, {sig_text(re.upper, 2)}]"
                    if im is not None:
                        band += f" + i [{sig_text(im.lower, 2)}, {sig_text(im.upper, 2)}]"
                    msg = f"the band {band} supports no significant digit"
                    msg += (f": {o.info['cut_hint']}" if o.info.get("cut_hint") else
                            " (more terms or another method, --method, may help; if the function vanishes "
                            "near this point, the band is still an absolute error estimate)")
                    n_fail += 1
                    warnings.append(f"at {point_text(a)}: {msg}")
            p_method = o.info.get("method", plan.method)
            p_plan = plan.fallback if p_method != plan.method else plan
            if re is not None and p_method in _CONFORMAL:
                used = p_plan.cmap
                if o.info.get("map", {}).get("kind") == "star":
                    used = StarMap(p_plan.cmap.s)
                    pdiag["map"] = o.info["map"]
                    warnings.append(f"at {point_text(a)}: evaluated with radial cuts from the pair "
                                    f"({used.describe()}): the straight line from 0 crosses the pair map's "
                                    "vertical cut, and this is the continuation along that line")
                note = branch_note(used, p_plan.singularities, x)
                if note:
                    pdiag["branch"] = note
                    warnings.append(f"at {point_text(a)}: {note}")
            if o.info.get("ode_refused") and plan.method in ("ode", "borel-ode"):
                warnings.append(f"at {point_text(a)}: the differential equation was not followed "
                                f"({o.info['ode_refused']}); {p_method} instead")
            if "S_plus" in pdiag and re is not None and im is not None:
                # the lateral sums as the final bands support them (the estimator wrote the median
                # approximant's sums to 25 digits, before any widening)
                pdiag["S_plus"] = f"{re} + i {im}"
                pdiag["S_minus"] = f"{re} - i {im}"
            pts.append(PointResult(a, x, re, im, p_method, success, status, msg, baselines[j], pdiag))
    limited = [p for p in pts if p.diagnostics.get("input_limited") and p.value is not None
               and p.digits < ctx.dps - 0.5]
    if limited:
        lims = [p.diagnostics["input_limited"] for p in limited]
        for lim in lims:
            # the band falls short of the digits asked, and the input's digits are why: the JSON
            # contract's digits_needed and the report's short-band lines read this (also where no
            # projection in terms exists, as for the Borel-plane methods)
            lim["short_of_asked"] = True
        want_digits = max(lim["digits_suggested"] for lim in lims)
        moves = "; ".join(_amplified_text(lim, point_text(p.at)) for p, lim in zip(limited, lims))
        warnings.append(
            f"at {', '.join(point_text(p.at) for p in limited)}: the {series.digits} digits the coefficients carry "
            f"set the band: a rerun with them moved by a unit in their last digit shows their rounding amplified "
            f"{moves}; more terms at {series.digits} digits would not narrow the band; coefficients with at "
            f"least {want_digits} digits would keep the rounding below the {ctx.dps} digits worked to (an estimate: "
            "more digits make more orders usable, and those may amplify more)")
        if reexp_warning is not None and loss.get("loss", 0) + ctx.dps < want_digits:
            warnings[reexp_warning] = warnings[reexp_warning].replace(
                f"coefficients with about {loss['loss'] + ctx.dps} digits would let every term count",
                f"coefficients with at least {want_digits} digits would let every term count (see below)")
    if reexp_warning is not None and not any("conformal" in (p.method or "") for p in pts):
        # every point was solved without the map (an exact equation followed, say): the
        # re-expansion's cancellation did not touch any value reported
        del warnings[reexp_warning]
    if n_fail == 0:
        status, success, message = Status.CONVERGED, True, f"{len(pts)} point(s) evaluated"
    else:
        status = Status.NOT_CONVERGED if n_fail == len(pts) else Status.FAILED
        success = False
        message = f"{n_fail} of {len(pts)} point(s) failed"
    prov = Provenance(method=plan.method, options={
        "requested": method, "why": _in_variable(plan.why, series.variable), "borel_b": str(plan.borel_b),
        "map": None if plan.cmap is None else plan.cmap.to_dict(),
        "alpha": None if plan.alpha is None else str(plan.alpha), "lateral": plan.lateral,
        "n_orders": n_orders, "verify": verify}, n_terms=series.n_terms, dps=wd,
        input_hash=series.input_hash())
    diag = dict(diag, why=_in_variable(plan.why, series.variable), seconds=round(time.time() - t0, 3), reported_dps=ctx.dps, **diag_plan)
    return EvaluationResult(tuple(pts), method, success, status, message, tuple(warnings),
                            series.variable, None if cpl is None else cpl.describe(series.variable),
                            diag, prov, series.variable if cpl is None else cpl.symbol)


#: The digits the coefficients carry limit a point when the rerun with the coefficients moved by a
#: unit in their last digit shows an amplification of that rounding that leaves at most
#: INPUT_LIMIT_MARGIN digits more than the approximants' own band claims (one random move
#: samples the amplification to within about a digit). Measured on the kernel family's 200 loops
#: at a = pi/4 (x = g^2, 30 digits asked): from coefficients with 120 digits the rerun left 10.4
#: and 12.1 digits at g = 5 in two roundings of the same coefficients (bands of 10.1 and 10.2
#: digits), 3.5 at g = 20 (band 5.2); from 200 digits, 20.3 and 11.1, and the bands claimed 14.6
#: and 6.8; more working digits at 120 (work_dps 160, 250) claimed 10.1-10.5 and 4.5-5.2. From
#: 100 loops at 150 digits (a = 3 pi/8, g = 5) it leaves 61 digits: not limited
INPUT_LIMIT_MARGIN = 2
#: where the input's digits set the band, it is widened to INPUT_LIMIT_WIDEN x the largest move
#: among the roundings sampled (1 + INPUT_LIMIT_SAMPLES of them). Measured on log(1+x)/x and
#: (1 + x)^(1/3), 60 and 100 terms at 20-60 digits, x = 50 and 1000 (13-14 points so limited):
#: one sample and 2 x its move left 3 truths outside (the rounding moved the value up to 10 x more
#: than that sample did); with three the actual error was 0.04-2.1 x the largest move, and every
#: truth held
INPUT_LIMIT_WIDEN = 2
#: where the input's digits set the band, this many more roundings (other pseudo-random signs)
#: are sampled at those points, and the largest move widens the band
INPUT_LIMIT_SAMPLES = 2
#: ... but at most INPUT_LIMIT_CAP x the first sample's move: a larger spread says that the
#: method's choices (variant, orders kept) flip under the perturbation, not that the value
#: responds more to the rounding. log(1+x) from 40 terms at 16 digits (studies/evaluate_sweep
#: --digits 16), x = 10 to 1000: the first sample moved the value by 2e-14 to 2e-12, the other two
#: by 1e-9 to 0.013, the actual error was 5e-16 to 2e-13; uncapped, the bands claimed 4-10 digits
#: fewer. log(1+x)/x from 60 terms at 20 digits, x = 1000: moves 5.5e-7, 5.5e-7, 1.0e-5 and an
#: actual error of 5.7e-6, held by the capped move
INPUT_LIMIT_CAP = 10
#: ... and only if those other roundings, run at the main run's own precision, move the value by
#: at least INPUT_LIMIT_LINEAR x the rerun's move (that rerun also raises the working precision).
#: The kernel family at a = 0 from 100 loops (g = 5 and 20) moved by 1e-24 and 9e-8 in the rerun
#: whether its coefficients carried 150 or 300 digits: its higher precision, not the rounding;
#: without this test those bands were widened 10 x for nothing
INPUT_LIMIT_LINEAR = mpmath.mpf("0.1")
#: the other roundings build only the highest orders (the value is the median of the top three)
INPUT_LIMIT_ORDERS = 4


def input_limit_short(p) -> Optional[dict]:
    """A point's ``input_limited`` diagnostics when its band falls short of the digits asked
    because of the input's digits (what the JSON contract's ``digits_needed`` and the report's
    short-band lines read), else None. Records from before ``short_of_asked`` count a point with
    a terms projection (``reach``) as short."""
    lim = p.diagnostics.get("input_limited")
    return lim if lim and lim.get("short_of_asked", bool(p.diagnostics.get("reach"))) else None


def _amplified_text(lim: dict, at: str) -> str:
    """``10^A at X, leaving about L digits`` for the input-limit warning, in whole exponents
    (an amplification below half a digit is none: not ``10^-0``), never more digits left than
    the coefficients carry."""
    a = int(round(lim["amplification_digits"]))
    left = min(int(round(lim["digits_left"])), lim["digits_carried"])
    if a <= 0:
        return f"not at all at {at}, leaving about the {left} digits they carry"
    return f"about 10^{a} at {at}, leaving about {left} digits"


def _digits_for(target: float, amp: float) -> int:
    """Coefficient digits whose rounding, amplified ``10^amp``, stays below ``target`` digits,
    plus margins (the orders that more digits make usable may amplify more)."""
    return int(math.ceil(target + amp)) + INPUT_LIMIT_MARGIN + 3


def _move(re: Estimate, im: Optional[Estimate], oc) -> mpmath.mpf:
    """How far the rerun or sample ``oc`` moved the value ``re`` (+ i ``im``): the modulus of
    the complex move where both carry an imaginary part, else the real part's."""
    d = abs(oc.re.value - re.value)
    if im is not None and oc.im is not None:
        d = mpmath.hypot(d, oc.im.value - im.value)
    return d


def _input_limit(est: Estimate, rerun: Optional[Estimate], digits, asked: int,
                 est_im: Optional[Estimate] = None, rerun_im: Optional[Estimate] = None) -> Optional[dict]:
    """Whether the digits the coefficients carry set the band at a point. ``rerun``: the value
    with the coefficients moved by a unit in their last digit; its move over the value times
    ``10^-digits`` is the amplification of the input's rounding here, and ``digits`` less its
    ``log10`` the digits that rounding leaves. When those are at most :data:`INPUT_LIMIT_MARGIN`
    more than the approximants' own band ``est`` claims: a dict with the move, the amplification
    (in digits), the digits left, and the coefficient digits suggested, enough that the amplified
    rounding stays below the ``asked`` digits, plus :data:`INPUT_LIMIT_MARGIN`. A lower estimate:
    more digits make more orders usable, and those may amplify more. None otherwise.

    With imaginary parts (``est_im`` and ``rerun_im``: a complex point, or the ambiguity of a
    lateral Borel sum) the move, the value and the band are those of the complex number (moduli;
    the band's larger half-width), so a real part near zero does not read as a huge
    amplification, nor a move of the imaginary part alone as none."""
    if rerun is None or est is None or digits is None:
        return None
    cplx = est_im is not None and rerun_im is not None
    size = abs(est.value) if not cplx else mpmath.hypot(est.value, est_im.value)
    if size == 0:
        return None
    dev = abs(rerun.value - est.value)
    if cplx:
        dev = mpmath.hypot(dev, rerun_im.value - est_im.value)
    if dev == 0:
        return None
    err = est.error if not cplx else max(est.error, est_im.error)
    claimed = math.inf if err == 0 else float(mpmath.log10(size / err))
    amp = float(mpmath.log10(dev / size)) + float(digits)
    left = float(digits) - amp
    if left > claimed + INPUT_LIMIT_MARGIN:
        return None
    return {"digits_carried": int(digits), "moved": mpmath.nstr(dev, 3),
            "amplification_digits": round(amp, 1), "digits_left": round(left, 1),
            "digits_suggested": _digits_for(asked, amp)}


#: a band that contains 0 and is this much smaller than the first term of the series at the
#: point says the function vanishes there (common practice, no source)
ZERO_FRACTION = mpmath.mpf("1e-3")


def _zero_within(re: Estimate, im: Optional[Estimate], scale) -> bool:
    """The band contains 0 (both parts) and is narrower than ``ZERO_FRACTION * scale``."""
    err = re.error if im is None else max(re.error, im.error)
    inside = re.contains(0) and (im is None or im.contains(0))
    return bool(inside and scale > 0 and err <= ZERO_FRACTION * scale)


def _reach(info: dict, est: Estimate, asked: int, n_terms: int) -> Optional[dict]:
    """How far more terms would take a point whose band falls short of the digits asked.

    A projection, not a promise: the approximants at this point approached their value
    at ``rate`` digits per added term (the slope of the fit in
    :func:`~resum.estimators.resum_band.band_from_candidates`); carried on linearly, the
    digits asked would need about ``(asked - digits) / rate`` more terms, each carrying
    at least that many digits; if the same fit in ``sqrt(n)`` (sub-geometric convergence)
    projects more terms, that larger number is given. None when the band already supports the digits asked or
    the approximants did not converge steadily; ``terms_needed`` is None beyond 3 x the
    terms at hand."""
    have = est.digits()
    if not math.isfinite(have) or have >= asked - 0.5:
        return None
    need = terms_for_digits(info, have, asked, n_terms)
    if need is None:
        return None
    rate = float(mpmath.mpf(info["decay_digits_per_term"]))
    # beyond 3 x the terms at hand a straight line says little: no number then
    return {"digits": round(have, 1), "digits_per_term": round(rate, 4), "asked_digits": asked,
            "terms_now": n_terms, "terms_needed": need if need <= 3 * n_terms else None,
            "terms_per_digit": math.ceil(1 / rate)}


#: rounds of "project, rebuild, evaluate again" at most; and the margin put on a projection
GOAL_ROUNDS = 3
GOAL_MARGIN = 1.15
#: ... and no round is run that the projection says cannot reach the goal when it would add
#: fewer than 1/GOAL_MIN_STEP of the terms at hand (about 25 %)
GOAL_MIN_STEP = 4


def evaluate_with_goal(series: Series, points, goal_digits: float, rebuild, ctx: Optional[Context] = None,
                       max_terms: Optional[int] = None, **kwargs):
    """:func:`evaluate`, and again with a longer series until every point's band supports
    ``goal_digits`` digits.

    ``rebuild(n) -> Series`` gives the same quantity's series with ``n`` coefficients (a source
    asked for more loops or orders). Where a point falls short, the terms it needs are projected
    from how fast its approximants converged (:func:`terms_for_digits`, times
    :data:`GOAL_MARGIN`); the series is rebuilt with the largest projection and evaluated again,
    at most :data:`GOAL_ROUNDS` times and never beyond ``max_terms`` (default 3 x the terms
    given); a round the projection says cannot reach the goal is skipped when ``max_terms``
    leaves it fewer than a quarter more terms (:data:`GOAL_MIN_STEP`). ``kwargs`` go to
    :func:`evaluate`.

    Where the digits the coefficients carry set a short point's band (``input_limited`` in its
    diagnostics: more terms at those digits would not help) and ``rebuild`` takes a keyword
    ``digits`` (``rebuild.takes_digits`` true, as for :func:`resum.sources.rebuilder`), the
    series is rebuilt with the digits that point's amplification of the rounding asks for the
    goal (plus margins), at the same length when every short point is so limited.

    Returns ``(result, search, series_used)``: the last evaluation, ``search`` =
    ``{"goal_digits", "rounds": [{"terms", "digits", "min_digits"}], "terms_used", "reached",
    "note", "how"}``, and the series that evaluation used. The projection is an estimate; the
    bands reported are those of the last evaluation, made as usual.
    """
    def run(s):
        return evaluate(s, points, ctx, **kwargs)
    res = run(series)
    goal = float(goal_digits)
    n = series.n_terms
    cap = int(max_terms) if max_terms else 3 * n
    rounds = []
    note = ""
    short = []
    for _ in range(GOAL_ROUNDS + 1):
        # a complex value's digits are relative to its modulus (PointResult.digits, as the JSON
        # and the report give them): a real part near zero is not a short point
        digs = [(p, p.digits if p.value is not None else -math.inf) for p in res.points]
        low = min(d for _, d in digs)
        rounds.append({"terms": n, "digits": series.digits,
                       "min_digits": f"{low:.1f}" if math.isfinite(low) else "none"})
        short = [(p, d) for p, d in digs if d < goal - 0.05]
        if not short:
            note = f"every point reached {goal:g} digits"
            break
        if len(rounds) > GOAL_ROUNDS:
            note = f"stopped after {GOAL_ROUNDS} rebuilds"
            break
        digits = _goal_digits(short, goal, series.digits) if getattr(rebuild, "takes_digits", False) else None
        limited = [p for p, _ in short if p.diagnostics.get("input_limited")]
        if digits is not None and len(limited) == len(short):
            # every short point is limited by the input's digits: same length, more digits
            want = n
        else:
            needs = [terms_for_digits(p.diagnostics, d, goal, n) if math.isfinite(d) else None
                     for p, d in short]
            if any(k is None for k in needs):
                note = "a point short of the goal did not converge steadily: no projection"
                break
            if n >= cap:
                note = f"the goal needs more than max_terms = {cap} terms"
                break
            if max(needs) > cap and cap - n < max(4, n // GOAL_MIN_STEP):
                # a last round that, by the same projection, cannot reach the goal and adds few
                # terms costs a whole evaluation for little (kernel family at a = 3 pi/8, g = 20:
                # 285 -> 303 terms took 2 min and its bands came out no narrower)
                note = (f"the goal needs about {max(needs)} terms by the projection, more than "
                        f"max_terms = {cap}; a round with the {cap - n} more terms allowed would not "
                        "reach it")
                break
            want = min(max(int(math.ceil(max(needs) * GOAL_MARGIN)), n + max(4, n // 10)), cap)
        if getattr(rebuild, "takes_digits", False) and series.digits is not None:
            # never fewer digits per term than the series at hand (a round that raised them keeps them)
            digits = max(digits or 0, -(-int(series.digits) * want // n))
        try:
            longer = rebuild(want) if digits is None else rebuild(want, digits=digits)
        except InputError as exc:
            note = f"the source cannot give {want} terms: {exc}"
            break
        n = longer.n_terms
        res = run(longer)
        series = longer
    return res, {"goal_digits": f"{goal:g}", "rounds": rounds, "terms_used": rounds[-1]["terms"],
                 "reached": not short, "note": note,
                 "how": "terms projected from each short point's convergence rate (digits per "
                        f"term, or per sqrt(term) if slower) times {GOAL_MARGIN}, or, where the digits "
                        "the coefficients carry set the band, more digits from how much a rerun with "
                        "the coefficients moved in their last digit moved the value; then checked by "
                        "evaluating again; an estimate, not a promise"}, series


def _goal_digits(short, goal: float, carried) -> Optional[int]:
    """Coefficient digits for the next round of :func:`evaluate_with_goal`: where a short
    point's band is set by the input's digits, enough that its rounding, amplified as the rerun
    measured, stays below the goal (plus margins: the orders that more digits make usable may
    amplify more); at least 1.5 x the digits carried. None when no short point is so limited."""
    amps = [p.diagnostics["input_limited"]["amplification_digits"] for p, _ in short
            if p.diagnostics.get("input_limited")]
    if not amps or carried is None:
        return None
    need = _digits_for(goal, max(amps))
    return max(need, int(math.ceil(1.5 * int(carried))))


def terms_for_digits(info: dict, have: float, goal: float, n_terms: int) -> Optional[int]:
    """Terms a point would need for ``goal`` digits, projected from how fast its approximants
    converged (``info``: a point's diagnostics, with ``decay_digits_per_term`` and
    ``decay_digits_per_sqrt_term`` from
    :func:`~resum.estimators.resum_band.band_from_candidates`): ``(goal - have) / rate`` more
    terms, or the larger number the same fit in ``sqrt(n)`` gives (approximants of functions
    with cuts often converge like ``exp(-c sqrt(n))``). None when the approximants did not
    converge steadily. A projection, not a promise."""
    rate = info.get("decay_digits_per_term")
    if rate is None or not info.get("converging", False):
        return None
    rate = float(mpmath.mpf(rate))
    if rate < 0.002:
        return None
    need = n_terms + math.ceil(max(goal - have, 0) / rate)
    rate2 = info.get("decay_digits_per_sqrt_term")
    if rate2 is not None and float(mpmath.mpf(rate2)) > 0:
        r2 = float(mpmath.mpf(rate2))
        need = max(need, math.ceil((math.sqrt(n_terms) + max(goal - have, 0) / r2) ** 2))
    return need


def _wd(d):
    from .context import workdps
    return workdps(d)


def probe_strong_coupling(*args, **kwargs):
    """See :func:`resum.estimators.strong_coupling.probe_strong_coupling`."""
    from .estimators.strong_coupling import probe_strong_coupling as _p
    return _p(*args, **kwargs)
