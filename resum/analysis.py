"""One verdict on a series: radius, leading singularities, growth, with bands.

:func:`analyze` runs the applicable singularity estimators, reconciles them
and checks the outcome by rerunning with fewer terms and at higher
precision.

>>> from resum.series import Series
>>> c = [1]
>>> for n in range(1, 40):            # (1 - 4x)^(-1/2): c_n = binomial(2n, n)
...     c.append(c[-1] * 2 * (2 * n - 1) // n)
>>> res = analyze(Series(c))
>>> res.radius.contains(0.25), res.singularities[0].exponent.contains(-0.5)
(True, True)
>>> {"radius", "singularities", "warnings"} <= set(res.contract_dict())
True

Notes
-----
How to read the bands. Each estimator builds its band from the spread of
its stable estimates across orders (Neville columns, neighbouring Padé or
differential approximants) times a safety factor of 2. Across methods the
narrowest band is kept, widened to at least a tenth of the next narrowest
band (one method's approximants can share one bias, so most of the claimed
sharpness must be confirmed by a second method) and until it touches the band
of every other method that found the same point (a warning says so when
they did not overlap). A point from a differential equation the series obeys
exactly (verified on every coefficient beyond those it was fitted to) is taken
as that equation gives it. Verification then reruns the contributing methods with
about 10 % fewer terms and at higher working precision (for inexact input:
with the coefficients perturbed at the level of their last digit); the
band is widened to cover 3 times the fewer-terms change and 2 times the
precision change, and the digits that agree are
recorded in ``diagnostics["verification"]``. Points that one method alone
finds are screened: dropped (with a warning naming them) when they lie well
inside the radius the coefficients' growth implies, when their centre lies
beyond a point two methods confirm, or when the rerun at higher precision
(perturbed input) does not find them again (rounding noise in the
coefficients makes differential approximants place spurious points on the
circle of convergence). A band is an estimate of the
error, not a proof; it can miss when every method shares one systematic
bias, which the fewer-terms rerun is there to expose.

Applicability: finite radius (algebraic, logarithmic, pole singularities,
conjugate pairs, several singularities), factorial divergence (Borel-plane
singularity ``A`` and exponent ``b`` of ``c_n ~ S A^-n Gamma(n+b)``), and
entire-like growth (reported, without singularities).
"""
from __future__ import annotations

import math
import time
from dataclasses import dataclass, field, replace
from typing import Optional

import mpmath

from ._version import __version__
from .context import DEFAULT, Context, checked_context
from .errors import InputError, check_flag
from .estimators import METHODS, get_method, validate_methods  # noqa: F401  (METHODS re-exported)
from .estimators._common import MIN_TERMS, classify_kind, prepare
from .estimators.cut_scan import CutPoint
from .series.core import Series
from .results import (JSON_BAND_NOTE, Estimate, MethodResult, Provenance, Singularity, Status, _jsonable,
                      band_digits, point_text, sig_text)
from .uncertainty.ensemble import SAFETY, digits_agree, modulus_band

__all__ = ["AnalysisResult", "analyze", "default_context"]

#: the change seen when ~10 % of the terms are dropped, times this factor, is
#: taken as a lower bound on the truncation error (an error falling like 1/n^3
#: changes by about a third of itself over the last 10 % of the terms)
FEWER_TERMS_FACTOR = 3


# ---------------------------------------------------------------------------
# result type
# ---------------------------------------------------------------------------

@dataclass(frozen=True)
class AnalysisResult:
    """The reconciled outcome of :func:`analyze`.

    Attributes
    ----------
    success : bool
        True when a radius (or a factorial-growth verdict) was found.
    status : Status
    message : str
    radius : Estimate or None
        Radius of convergence in the series' variable (0 for factorial growth,
        inf for entire-like series).
    singularities : tuple of Singularity
        Leading singularities, nearest first.
    growth : str
        ``"finite radius"``, ``"factorial"`` or ``"entire-like"``.
    borel_singularity, borel_exponent : Estimate or None
        ``A`` and ``b`` of ``c_n ~ S A^-n Gamma(n+b)`` for factorial growth.
    natural_boundary : Estimate or None
        Radius ``R`` of a circle ``|x| = R`` along which the poles and zeros of the Padé
        approximants crowd (a natural boundary is suspected there: an estimate, not a
        proof; see :mod:`resum.estimators.boundary`); then ``radius`` is this band and no
        singularity is reported. None otherwise.
    methods : dict
        Method name -> :class:`MethodResult`.
    warnings : tuple of str
    diagnostics : dict
        ``how`` (how the bands were made), ``verification`` (digits agreeing
        with the reruns), ``combined`` (which method supplied what).
    provenance : Provenance
    """

    success: bool
    status: Status
    message: str = ""
    radius: Optional[Estimate] = None
    singularities: tuple = ()
    growth: str = ""
    borel_singularity: Optional[Estimate] = None
    borel_exponent: Optional[Estimate] = None
    methods: dict = field(default_factory=dict)
    warnings: tuple = ()
    diagnostics: dict = field(default_factory=dict)
    provenance: Optional[Provenance] = None
    natural_boundary: Optional[Estimate] = None
    beyond: tuple = ()

    def to_dict(self) -> dict:
        est = lambda e: None if e is None else e.to_dict()  # noqa: E731
        return {"success": self.success, "status": self.status.value, "message": self.message,
                "radius": est(self.radius), "singularities": [s.to_dict() for s in self.singularities],
                "growth": self.growth, "borel_singularity": est(self.borel_singularity),
                "borel_exponent": est(self.borel_exponent),
                "methods": {k: v.to_dict() for k, v in self.methods.items()},
                "warnings": list(self.warnings), "diagnostics": _jsonable(self.diagnostics),
                "provenance": None if self.provenance is None else self.provenance.to_dict(),
                "natural_boundary": est(self.natural_boundary),
                "beyond": [p.to_dict() for p in self.beyond]}

    @classmethod
    def from_dict(cls, d: dict) -> "AnalysisResult":
        est = lambda k: None if d.get(k) is None else Estimate.from_dict(d[k])  # noqa: E731
        return cls(bool(d["success"]), Status(d["status"]), d.get("message", ""), est("radius"),
                   tuple(Singularity.from_dict(s) for s in d.get("singularities", [])),
                   d.get("growth", ""), est("borel_singularity"), est("borel_exponent"),
                   {k: MethodResult.from_dict(v) for k, v in d.get("methods", {}).items()},
                   tuple(d.get("warnings", [])), dict(d.get("diagnostics", {})),
                   None if d.get("provenance") is None else Provenance.from_dict(d["provenance"]),
                   est("natural_boundary"), tuple(CutPoint.from_dict(p) for p in d.get("beyond", [])))

    def contract_dict(self) -> dict:
        """The stable JSON contract: radius, singularities, warnings (plus extra keys).

        ``{"radius": {"value", "lo", "hi"}, "singularities": [{"re", "im",
        "exponent": {"value", "lo", "hi"} or None, "kind"}], "warnings": [...]}``;
        numbers are decimal strings in the series' variable. Extra keys:
        ``growth``, ``status``, ``borel`` (A, b, gamma_multiple m and stride for
        factorial growth c_n ~ S A^-n Gamma(m n + b)), ``methods`` (each estimator's status,
        message, radius as {"value", "lo", "hi"} and as value(error) text ``radius_text``), ``equation`` (a linear differential
        equation the series obeys exactly, when one was found), ``natural_boundary`` (when one is
        suspected: ``{"radius": {"value", "lo", "hi"}, "radius_text", "evidence"}``, the circle
        along which the Padé poles and zeros crowd; ``radius`` is then the same band and
        ``singularities`` is empty).
        """
        if self.radius is None:
            rad = {"value": "nan", "lo": "nan", "hi": "nan"}
        else:
            rad = self.radius.to_dict()
        sings = []
        for s in self.singularities:
            d = s.to_dict()
            sings.append({"re": d["re"], "im": d["im"], "exponent": d["exponent"], "kind": s.kind,
                          "re_band": d["re_band"], "im_band": d["im_band"], "method": s.method})
        out = {"radius": rad, "singularities": sings, "warnings": list(self.warnings),
               "growth": self.growth, "status": self.status.value}
        # the earned digits as value(error) texts, and what a band is (the text report's last lines)
        out["radius_text"] = None if self.radius is None else str(Estimate.from_dict(rad))
        for s, d in zip(self.singularities, sings):
            d["re_text"] = str(Estimate.from_dict(d["re_band"]))
            d["im_text"] = str(Estimate.from_dict(d["im_band"]))
            d["exponent_text"] = None if d["exponent"] is None else str(Estimate.from_dict(d["exponent"]))
        out["bands"] = JSON_BAND_NOTE
        out["how"] = str((self.diagnostics or {}).get("how", ""))
        if self.borel_singularity is not None:
            lo = self.methods.get("large-order")
            ld = (lo.diagnostics or {}) if lo is not None else {}
            out["borel"] = {"A": self.borel_singularity.to_dict(),
                            "b": None if self.borel_exponent is None else self.borel_exponent.to_dict(),
                            # c_n ~ S A^-n Gamma(m n + b), in u = x^stride when stride > 1
                            "gamma_multiple": str(int(ld.get("gamma_multiple", 1))),
                            "stride": str(int(ld.get("stride", 1)))}
        # each method's own verdict (as in the text report's method table): the radius as
        # {"value", "lo", "hi"} decimal strings, and as value(error) text of that written band
        # (its ends rounded outward), so that the two say the same and survive a round trip
        out["methods"] = {}
        for k, m in self.methods.items():
            rd = None if m.radius is None else m.radius.to_dict()
            out["methods"][k] = {"status": m.status.value, "message": m.message, "radius": rd,
                                 "radius_text": None if rd is None else str(Estimate.from_dict(rd))}
        eq = [m.diagnostics.get("equation") for m in self.methods.values()
              if (m.diagnostics or {}).get("exact_equation") and m.diagnostics.get("equation")]
        if eq:
            out["equation"] = str(eq[0])
        if self.beyond:
            out["beyond"] = [p.to_dict() for p in self.beyond]
        if self.natural_boundary is not None:
            nb = self.natural_boundary.to_dict()
            out["natural_boundary"] = {"radius": nb, "radius_text": str(Estimate.from_dict(nb)),
                                       "evidence": str((self.diagnostics.get("natural_boundary") or {})
                                                       .get("reason", ""))}
        return out


# ---------------------------------------------------------------------------
# precision
# ---------------------------------------------------------------------------

def default_context(series) -> Context:
    """Working precision used when none is given.

    Exact series: ``max(30, n_terms // 2 + 10)`` digits (Padé and
    differential approximants of order ~n/2 lose digits roughly in proportion
    to the order). Inexact series: the digits they carry (at least 10).
    """
    if series.digits is None:
        return Context(dps=max(DEFAULT.dps, series.n_terms // 2 + 10))
    return Context(dps=max(10, min(series.digits, 2 * series.n_terms + 30)))


# ---------------------------------------------------------------------------
# running and reconciling
# ---------------------------------------------------------------------------

def _one(name, series, ctx):
    """One estimator's result (its own numerical failures become a failed result)."""
    f = get_method(name)
    t0 = time.perf_counter()
    try:
        r = f(series, ctx)
    except InputError as exc:
        r = MethodResult(name, False, Status.TOO_FEW_TERMS, str(exc))
    except (ZeroDivisionError, ValueError, ArithmeticError, mpmath.libmp.NoConvergence) as exc:
        r = MethodResult(name, False, Status.FAILED, f"numerical failure: {exc}")
    d = dict(r.diagnostics)
    d["seconds"] = round(time.perf_counter() - t0, 3)
    return replace(r, diagnostics=d)


#: estimators in decreasing order of cost on long series (started first when they run
#: side by side, see :mod:`resum.parallel`)
_HEAVY_FIRST = ("diff-approx2", "diff-approx", "dlog", "pade")


def _run(series, ctx, names, progress=None, label="run"):
    """Every estimator in ``names`` on ``series``; side by side in worker processes for
    long series on a machine with several cores (:mod:`resum.parallel`), same results.
    ``progress`` (optional) hears the stage ``label`` start and end."""
    from .parallel import jobs_for, run_tasks
    names = list(names)
    jobs = jobs_for(series.n_terms, sum(1 for n in names if n in _HEAVY_FIRST))
    say = progress or (lambda msg: None)
    t0 = time.perf_counter()
    say(f"{label}: {len(names)} estimators on {series.n_terms} terms" + (f", {jobs} processes" if jobs > 1 else ""))
    out = None
    if jobs > 1:
        order = sorted(names, key=lambda n: _HEAVY_FIRST.index(n) if n in _HEAVY_FIRST else len(_HEAVY_FIRST))
        res = run_tasks(_one, [(n, series, ctx) for n in order], jobs)
        if res is not None:
            got = dict(zip(order, res))
            out = {n: got[n] for n in names}
    if out is None:
        out = {name: _one(name, series, ctx) for name in names}
    say(f"{label} done ({time.perf_counter() - t0:.1f} s)")
    return out


def _task(kind, args):
    """One job of :func:`_run_stages` (module level, so worker processes can run it)."""
    return _one(*args) if kind == "estimator" else _scan_beyond(*args)


def _run_stages(stages, progress=None, scan=None):
    """The estimators of several runs (``[(series, ctx, names, label)]``, the verification
    reruns) side by side in one set of worker processes, the longest jobs first, and, with
    ``scan = ((c, x0, k), dps, digits)``, the scan of the cut beside them. Returns (one dict of
    results per run, the scan's points or None). Same results as one :func:`_run` per stage;
    measured on the 200-loop kernel series at 210 digits with two processes: the reruns and the
    scan 14.8 s, where one after the other they cost about 18 s (the two reruns' slowest
    estimators, 6.6 and 8.6 s, then the 3.1 s scan)."""
    from .parallel import jobs_for, run_tasks
    say = progress or (lambda msg: None)
    jobs = jobs_for(max((st[0].n_terms for st in stages), default=0),
                    sum(1 for st in stages for n in st[2] if n in _HEAVY_FIRST) + (scan is not None))
    if jobs < 2:
        outs = [_run(s2, c2, names, progress, label) for s2, c2, names, label in stages]
        pts = None if scan is None else _scan_beyond(*scan[0], scan[1], scan[2])
        return outs, pts
    t0 = time.perf_counter()
    say(f"{', '.join(st[3] for st in stages)}: {sum(len(st[2]) for st in stages)} estimators"
        + (" and the scan of the cut" if scan is not None else "") + f", {jobs} processes")
    # the heavy estimators first, each with the longer series first (their cost grows with it)
    jobs_list = [("estimator", (n, s2, c2), i, n)
                 for i, (s2, c2, names, _) in enumerate(stages) for n in names]
    rank = {n: k for k, n in enumerate(_HEAVY_FIRST)}
    jobs_list.sort(key=lambda t: (rank.get(t[3], len(_HEAVY_FIRST)), -t[1][1].n_terms))
    if scan is not None:
        heavy = sum(1 for t in jobs_list if t[3] in rank)
        jobs_list.insert(heavy, ("scan", (*scan[0], scan[1], scan[2]), -1, ""))
    res = run_tasks(_task, [(t[0], t[1]) for t in jobs_list], jobs)
    if res is None:
        outs = [{name: _one(name, s2, c2) for name in names} for s2, c2, names, _ in stages]
        pts = None if scan is None else _scan_beyond(*scan[0], scan[1], scan[2])
    else:
        got = {(t[2], t[3]): r for t, r in zip(jobs_list, res)}
        outs = [{name: got[(i, name)] for name in names} for i, (_, _, names, _) in enumerate(stages)]
        pts = got.get((-1, "")) if scan is not None else None
    say(f"verification done ({time.perf_counter() - t0:.1f} s)")
    return outs, pts


def _err(s: Singularity):
    return max(s.re.error, s.im.error)


def _overlap(a: Estimate, b: Estimate) -> bool:
    return not (a.upper < b.lower or b.upper < a.lower)


def _touch(a: Estimate, b: Estimate) -> Estimate:
    """Widen ``a`` (keeping its centre) until it overlaps ``b``."""
    if _overlap(a, b):
        return a
    if b.upper < a.lower:
        w = a.value - b.upper
    else:
        w = b.lower - a.value
    w = max(w, a.error)
    return Estimate(a.value, a.value - w, a.value + w)


def _group(sings, rel=0.01):
    """Group singularities from different methods by location."""
    groups = []
    for s in sorted(sings, key=lambda s: abs(s.location)):
        z = s.location
        for g in groups:
            z0 = g[0].location
            tol = max(rel * abs(z0), 3 * (_err(s) + _err(g[0])))
            tol = min(tol, 0.1 * abs(z0)) if z0 != 0 else tol
            if abs(z - z0) <= tol and all(x.method != s.method for x in g):
                g.append(s)
                break
        else:
            groups.append([s])
    return groups


def _location_reliable(s):
    """Plain Padé resolves a branch point only to the spacing of its poles on the cut."""
    return not (s.method == "pade" and s.kind != "pole")


def _exponent_reliable(s):
    """Dlog residues at a point where the approximants line up poles on a cut are biased
    (additive background or confluent terms)."""
    return "line up" not in (s.note or "")


#: a band is trusted to be at most this many times sharper than the next method's band
#: for the same point (one method's approximants can share one bias; a second method
#: must confirm most of the sharpness)
CONFIRM_RATIO = 10


def _confirm(e: Estimate, width_next) -> Estimate:
    """Widen ``e`` to at least ``width_next / CONFIRM_RATIO`` (half-widths)."""
    w = width_next / CONFIRM_RATIO
    if w <= e.error:
        return e
    return Estimate(e.value, min(e.lower, e.value - w), max(e.upper, e.value + w))


def _combine_group(g, warnings, exact=frozenset()):
    rel = [s for s in g if _location_reliable(s)] or g
    best = min(rel, key=_err)
    re, im = best.re, best.im
    ex = [s for s in g if s.method in exact]
    if ex:
        # an equation the series obeys exactly, checked on every coefficient given beyond those
        # it was fitted to: its point and exponent need no confirmation, and approximate methods
        # that miss its band are biased (confluent terms, background), not evidence against it
        e = min(ex, key=_err)
        kind = classify_kind(e.exponent) if e.exponent is not None else e.kind
        if e.kind == "branch-log" and kind == "branch":
            kind = "branch-log"          # the equation's indicial roots say so (a double root)
        note = (f"location and exponent from {e.method} (an equation the series obeys exactly); "
                f"found by {', '.join(s.method for s in g)}")
        return Singularity(e.re, e.im, kind, e.exponent, e.method, note), [s.method for s in g]
    # a resolution band (Dlog-Padé poles lining up on a cut) cannot confirm or refute sharpness
    others = sorted(_err(s) for s in rel if s is not best and _exponent_reliable(s))
    if others:
        re, im = _confirm(re, others[0]), _confirm(im, others[0]) if im.error > 0 or best.im.value != 0 \
            else im
    disagree = []
    for s in g:
        if s is best or not _location_reliable(s):
            continue
        if not (_overlap(re, s.re) and _overlap(im, s.im)):
            disagree.append(s.method)
            re, im = _touch(re, s.re), _touch(im, s.im)
    exps = [s for s in g if s.exponent is not None and s.kind != "unknown"]
    theta, theta_from = None, None
    if exps:
        eb = min([s for s in exps if _exponent_reliable(s)] or exps, key=lambda s: s.exponent.error)
        theta, theta_from = eb.exponent, eb.method
        ex_others = sorted(s.exponent.error for s in exps if s is not eb and _exponent_reliable(s))
        if ex_others:
            theta = _confirm(theta, ex_others[0])
        for s in exps:
            if s is not eb and _exponent_reliable(s) and not _overlap(theta, s.exponent):
                disagree.append(f"{s.method} (exponent)")
                theta = _touch(theta, s.exponent)
        # two disjoint exponents at one point: the smaller one dominates the large-order
        # growth (c_n ~ n^(-theta-1) x_c^-n), the larger is likely a subleading term that one
        # method locked onto; the value follows the smaller, the band still covers both
        rel_exps = [s for s in exps if _exponent_reliable(s)] or exps
        low = min(rel_exps, key=lambda s: s.exponent.value)
        if low is not eb and not _overlap(eb.exponent, low.exponent):
            warnings.append(f"two exponents at {point_text(mpmath.mpc(best.re.value, best.im.value), 8)}: "
                            f"{low.exponent} ({low.method}) and {eb.exponent} ({eb.method}); the smaller "
                            "dominates the growth of the coefficients and is reported, the larger may be "
                            "a subleading singular term; the band covers both")
            theta = Estimate(low.exponent.value, min(theta.lower, low.exponent.lower),
                             max(theta.upper, low.exponent.upper))
            theta_from = low.method
        if "exponent still drifting" in (eb.note or ""):
            warnings.append(f"the exponent near {point_text(mpmath.mpc(best.re.value, best.im.value), 8)} "
                            f"({eb.method}) still drifts with the number of terms without slowing down: its "
                            "band assumes the drift slows; more terms would tell")
    kind = classify_kind(theta) if theta is not None else best.kind
    if theta is None and best.kind == "branch":
        kind = "branch"
    loc = mpmath.mpc(re.value, im.value)
    if disagree:
        warnings.append(f"methods disagree near {point_text(loc, 8)}: {', '.join(disagree)} outside the band "
                        f"of {best.method}; band widened to reach them")
    note = f"location from {best.method}" + (f", exponent from {theta_from}" if theta_from else "") + \
        f"; found by {', '.join(s.method for s in g)}"
    return Singularity(re, im, kind, theta, best.method, note), [s.method for s in g]


def _drop_inside_growth_radius(combined, ok, warnings):
    """Drop points that sit well inside the radius the growth of the coefficients implies
    (root test, ratios): a singularity there would make the coefficients grow faster than
    they do. Kept if nothing else remains."""
    top = _growth_floor(ok)
    if top is None or len(combined) < 2:
        return combined
    floor = top * mpmath.mpf("0.97")   # 3 % inside: c_n would grow (1.03)^n faster
    kept = [(s, f) for s, f in combined if not abs(s.location) + _err(s) < floor]
    if not kept:
        return combined
    gone = [(s, f) for s, f in combined if (s, f) not in kept]
    if gone:
        warnings.append(f"discarded {_points_by(gone)}: inside the radius {sig_text(top, 3)} implied by "
                        "the growth of the coefficients")
    return kept


#: a point seen by one method only is dropped before grouping when its whole band lies this
#: far inside the growth-rate radius (see :func:`_screen_lone_inner_points`)
LONE_INNER_MARGIN = mpmath.mpf("0.01")


#: with a sharp growth-rate radius, a lone point whose centre lies this far inside is dropped
#: (or 3 x the growth band's relative half-width, if larger)
LONE_CENTRE_MARGIN = mpmath.mpf("0.005")


def _growth_sharpness(ok):
    """Smallest relative half-width of the growth-rate radius bands (ratio, root test), or None."""
    rels = [ok[k].radius.error / ok[k].radius.value for k in ("ratio", "root-test")
            if k in ok and ok[k].radius is not None and mpmath.isfinite(ok[k].radius.upper)
            and ok[k].radius.value > 0]
    return min(rels) if rels else None


def _growth_floor(ok):
    """Largest lower end of the growth-rate radius bands (root test, ratio), or None."""
    bounds = [ok[k].radius.lower for k in ("root-test", "ratio")
              if k in ok and ok[k].radius is not None and mpmath.isfinite(ok[k].radius.lower)]
    return max(bounds) if bounds else None


def _screen_lone_inner_points(sings, ok, warnings):
    """Drop, before grouping, points that one method alone puts inside the growth radius.

    A differential approximant often has a few zeros of ``Q_K`` just inside a branch point
    (in about half of the ensemble), while the ratios converge to the branch point itself. If
    such a point were real with an amplitude that matters, the ratios could not converge
    to the farther point; if it is not dropped before grouping, it can join (and widen) the
    group of the true point. A point is kept when a second method also finds a point inside
    the growth radius near it.
    """
    floor = _growth_floor(ok)
    if floor is None:
        return sings
    rel = _growth_sharpness(ok)
    centre = None
    if rel is not None and rel < mpmath.mpf("0.01"):
        # a scattered ensemble gives a wide band that can reach out to the radius: when the
        # growth rate pins the radius to better than 1 %, the point itself (not its band's far
        # end) must lie inside by LONE_CENTRE_MARGIN (measured: with 79 terms of
        # log(1+x)/x/sqrt(1+x/3) a pair 3.4 % inside, with 80 terms of
        # sqrt(1+x) + (1+x/2)^(-1/3) a pair 1 % inside, each from differential approximants
        # alone while the ratios pinned the radius to 1e-10; the map was lost both times)
        centre = floor * (1 - max(LONE_CENTRE_MARGIN, 3 * rel))
    floor = floor * (1 - LONE_INNER_MARGIN)
    inner = [s for s in sings if abs(s.location) + _err(s) < floor
             or (centre is not None and abs(s.location) < centre)]
    drop = []
    for s in inner:
        # two vague points do not confirm each other by their overlapping bands (measured:
        # x/(e^x - 1), 60 terms: Padé and dlog each put a point at ~1e-32 with bands of +-19
        # while the root test pinned the radius 2 pi to 6 digits; the radius read 1.5e-32)
        confirmed = any(o.method != s.method and _err(s) + _err(o) < floor / 2
                        and abs(o.location - s.location) <= max(
                            mpmath.mpf("0.01") * abs(s.location), _err(s) + _err(o)) for o in inner)
        if not confirmed:
            drop.append(s)
    if not drop or len(drop) == len(sings):
        return sings
    warnings.append(f"discarded {_points_by([(s, [s.method]) for s in drop])}, "
                    f"{'each ' if len(drop) > 1 else ''}seen by one method only: "
                    f"inside the radius {sig_text(floor / (1 - LONE_INNER_MARGIN), 3)} implied by the "
                    "growth of the coefficients")
    return [s for s in sings if not any(s is d for d in drop)]


#: a lone point whose modulus band is this many times wider than that of the confirmed
#: nearest singularity, and reaches its circle, is not reported (see _drop_lone_outer_points)
LONE_VAGUE_RATIO = 100


def _drop_lone_outer_points(lead, warnings):
    """Among the candidates for the nearest singularities, drop a point that one method
    alone finds and whose centre lies beyond a point that two or more methods confirm.

    Such a point cannot be the nearest (the confirmed one is nearer), and no second
    method sees it: differential approximants in particular put zeros of ``Q_K`` just
    outside a branch point (measured: the 60-loop angle-deformed kernel series at
    ``a = 5 pi/12``, a lone point at ``x = -0.0652`` beside the confirmed ``-1/16``; with
    30-digit coefficients at ``a = 0.3``, two conjugate pairs at ``|x| = 0.064-0.067``, gone
    at 120 loops). Kept in the candidates it would widen the radius band to reach it and
    be listed as a leading singularity. It is named in a warning instead."""
    confirmed = [s for s, f in lead if not _single_source(s, f)]
    if not confirmed:
        return lead
    edge_band = min((modulus_band(s.re, s.im) for s in confirmed), key=lambda b: b.upper)
    edge = edge_band.upper
    floor = min(modulus_band(s.re, s.im).lower for s in confirmed)

    def unseen_on_circle(s):
        # a vague point whose band reaches the circle of a sharp confirmed one: the methods that
        # see that circle sharply would see this point too (measured: loggamma(1 + x), 80 terms,
        # a zero of Q_1 at 0.997(12) beside the log point at -1 that four methods put at
        # -1 to 20 digits; kept, it cut the positive axis and every point x > 1 was refused)
        mb = modulus_band(s.re, s.im)
        return mb.upper >= floor and mb.upper - mb.lower > LONE_VAGUE_RATIO * (edge - floor)

    lone = [(s, f) for s, f in lead if _single_source(s, f)
            and (abs(s.location) > edge or unseen_on_circle(s))]
    if lone:
        warnings.append(f"not reported: {_points_by(lone)}, each seen by one method only, not nearer than the "
                        f"nearest singularity two or more methods confirm (radius {edge_band})")
    return [t for t in lead if t not in lone]


def _points_by(pairs):
    """'a point at z (method)' or 'points at z1 (m1), z2 (m2), ...' for warnings."""
    items = [f"{_location_text(s)} ({' + '.join(f)})" for s, f in pairs]
    return ("a point at " if len(items) == 1 else "points at ") + ", ".join(items)


def _location_text(s, most: int = 6) -> str:
    """A singularity's location for warnings: each part as value(error) when its band supports
    fewer than ``most`` digits, else to ``most`` digits, written as ``point_text`` writes a point
    (``0.79(3) - 0.66(2)*I``)."""
    def part(e):
        if e.error > 0 and band_digits(e.value, e.error, most + 1) <= most:
            return str(e)
        return sig_text(e.value, most)
    if s.im.value == 0:
        return part(s.re)
    im = f"{part(Estimate(abs(s.im.value), abs(s.im.value) - s.im.error, abs(s.im.value) + s.im.error))}*I"
    if s.re.value == 0:
        return im if s.im.value > 0 else "-" + im
    return f"{part(s.re)} {'+' if s.im.value > 0 else '-'} {im}"


def _growth_class(series):
    """'finite radius', 'entire-like' or 'factorial' from the coefficients' growth."""
    from .estimators.ratio import classify_growth
    try:
        prep = prepare(series, None)
        with prep.ctx.working():
            return classify_growth(prep.c)[0]
    except Exception:  # noqa: BLE001 - a class the estimators could not read: no override
        return None


def _reconcile(series, results, warnings):
    ok = {k: r for k, r in results.items() if r.success}
    growth = "finite radius"
    lo = results.get("large-order")
    if "large-order" in ok:
        growth = "factorial"
    elif lo is not None and (lo.diagnostics or {}).get("factorial"):
        # the coefficients grow factorially, but c_n ~ S A^-n Gamma(n + b) does not fit them
        # (for example a complex pair of Borel singularities, or Gamma(2n) growth in u = x^2)
        growth = "factorial"
    elif any(r.growth == "entire-like" for r in ok.values()):
        growth = "entire-like"
    elif ok and set(ok) <= {"pade"} and _growth_class(series) == "entire-like":
        # Padé alone: an entire function's approximants have poles that move off to infinity
        # with the order (measured: 1/Gamma(1 + x), 41 terms: a pair at |x| = 7.8 reported as
        # the radius, while every other method said entire-like)
        growth = "entire-like"
        if ok["pade"].singularities:
            warnings.append("not reported: " + _points_by([(sg, ["pade"]) for sg in ok["pade"].singularities[:4]])
                            + ", seen by Padé alone, while the coefficients decay faster than any power "
                            "(entire-like): poles of the approximants of an entire function move off to "
                            "infinity as the order grows")
    out = {"growth": growth, "radius": None, "singularities": (), "borel": None, "borel_b": None,
           "combined": {}}
    if growth == "factorial":
        if "large-order" not in ok:
            out["radius"] = Estimate.exact(0)
            warnings.append("factorial growth (kappa = " + sig_text(lo.diagnostics["kappa"], 3)
                            + "), but the Borel-plane singularity was not located (" + lo.message
                            + "): the coefficients do not follow one S A^-n Gamma(n + b) (a complex pair, "
                            "alternating patterns, or Gamma(k n) growth); radius 0")
            out["combined"] = {"radius": "large-order"}
            return out
        r = ok["large-order"]
        out.update(radius=r.radius, borel=r.borel_singularity, borel_b=r.borel_exponent)
        out["combined"] = {"borel": "large-order"}
        return out
    if growth == "entire-like":
        out["radius"] = Estimate(mpmath.inf, mpmath.inf, mpmath.inf)
        return out
    sings = [s for k, r in ok.items() for s in r.singularities]
    if not sings:
        if "root-test" in ok:
            out["radius"] = ok["root-test"].radius
            out["combined"] = {"radius": "root-test"}
            warnings.append("only the root test gave an estimate: radius without singularities")
        return out
    sings = _screen_lone_inner_points(sings, ok, warnings)
    groups = _group(sings)
    combined = []
    # a differential approximant that reproduces every coefficient given (the series obeys its
    # equation exactly) locates its points without a second method's confirmation
    exact = {k for k, r in ok.items() if (r.diagnostics or {}).get("exact_equation")}
    for g in groups:
        s, found_by = _combine_group(g, warnings, exact)
        combined.append((s, found_by))
    combined = _drop_inside_growth_radius(combined, ok, warnings)
    # leading singularities: those within 10 % of the nearest (both members of a pair,
    # a competing point on the other side), then anything found by two methods or more
    rmin = min(abs(s.location) for s, _ in combined)
    lead = [(s, f) for s, f in combined if abs(s.location) <= rmin * 1.1 + _err(s)]
    lead = _drop_lone_outer_points(lead, warnings)
    nearest_methods = max((len(f) for s, f in lead), default=0)
    rest = [(s, f) for s, f in combined if (s, f) not in lead and (len(f) >= 2 or exact.intersection(f))]
    chosen = lead + rest
    if len(chosen) > 1:
        # a point seen only by a method that cannot locate it well (plain Padé at a branch
        # point) is dropped when better-supported points exist
        chosen = [(s, f) for s, f in chosen if not (len(f) == 1 and not _location_reliable(s))] or chosen
        lead = [t for t in lead if t in chosen] or chosen[:1]
    if nearest_methods == 1 and len(ok) > 1:
        warnings.append("the nearest singularity was found by one method only; treat it with care")
    out["singularities"] = tuple(s for s, _ in chosen)
    rad = radius_band([s for s, _ in lead])
    out["radius"] = rad
    out["combined"] = {"singularities": [{"location": s.location, "found_by": f,
                                          "used": [m for m in f if m in (s.note or "").split("; found by")[0]]}
                                         for s, f in chosen]}
    rt = ok.get("root-test")
    if rt is not None and rt.radius is not None and not _overlap(rt.radius, rad):
        warnings.append(f"root test radius {rt.radius} does not overlap {rad}")
    return out


def radius_band(sings) -> Estimate:
    """Band for the radius ``min |s|`` over singularities with bands.

    Every point whose modulus band reaches below the upper end of the nearest
    one's could be the nearest: the radius lies between the smallest lower end
    and the smallest upper end of their modulus bands (each point found is an
    upper bound on the radius; any of them may set the lower one). The value is
    the modulus of the nearest centre. With two points at the same distance
    (``x_c`` and ``-x_c``) the radius is thus bounded above by the sharper of
    the two and below by the wider one, instead of taking both ends from
    whichever centre happens to lie nearer.
    """
    bands = [(abs(s.location), modulus_band(s.re, s.im)) for s in sings]
    v, near = min(bands, key=lambda t: t[0])
    contenders = [b for _, b in bands if b.lower <= near.upper]
    lo = max(min(b.lower for b in contenders), 0)      # a modulus: never below 0
    hi = min(b.upper for b in contenders)
    return Estimate(v, min(lo, v), max(hi, v))


def _perturbed(series, seed=12345):
    """The series with each inexact coefficient moved by ~ one unit in its last digit."""
    import random
    rnd = random.Random(seed)
    eps = mpmath.mpf(10) ** (-series.digits)
    cs = [c if isinstance(c, int) else c * (1 + eps * (2 * rnd.random() - 1)) for c in series.coefficients]
    return replace(series, coefficients=tuple(cs))


def _widen(e: Estimate, other: Optional[Estimate], factor=1):
    if e is None or other is None:
        return e
    d = abs(other.value - e.value) * factor
    if d <= e.error:
        return e
    return Estimate(e.value, min(e.lower, e.value - d), max(e.upper, e.value + d))


def _match(s, others):
    if not others:
        return None
    m = min(others, key=lambda o: abs(o.location - s.location))
    if abs(m.location - s.location) > 0.05 * abs(s.location) + 3 * _err(s):
        return None
    return m


def _found_by(rec):
    """Methods behind each singularity of a _reconcile record (same order)."""
    return [c["found_by"] for c in rec["combined"].get("singularities", [])]


def _single_source(s, found_by):
    """Seen by one method only, and not from an equation the series obeys exactly."""
    return len(found_by) == 1 and "obeys exactly" not in (s.note or "")


#: methods that fit the same kind of equation to the same coefficients: rounding noise puts
#: their spurious points in the same places, so together they count as one for the artifact screen
_DA_FAMILY = frozenset({"diff-approx", "diff-approx2"})


def _noise_prone(s, found_by):
    """:func:`_single_source` with the differential approximants counted as one method (first
    and second order agree on the zeros that rounding noise makes: (1 - 3x/5)^(1/2) from 80
    terms rounded to 16 digits had three such points at |x| = 1.69-1.73, exponent 0 to 1e-5,
    found by both)."""
    return _single_source(s, {"diff-approx" if m in _DA_FAMILY else m for m in found_by})


def _found_again(s, again):
    """Whether a rerun has a point within the larger of the two bands of ``s``: a singular
    point moves by far less than its band when the last digit of the input moves, a point
    placed by rounding noise lands elsewhere on the circle (the looser :func:`_match`, 5 %
    plus three bands, lets one noise point stand for another)."""
    return any(abs(m.location - s.location) <= max(_err(s), _err(m)) for m in again)


def _drop_precision_artifacts(sings, found_by, rerun, key, warnings):
    """Drop points that one method alone finds and that the rerun at higher precision (or with
    the input moved in its last digit) does not find again. Returns (kept points, indices of
    the dropped ones).

    Rounding the coefficients adds a small random series whose radius is the function's own;
    differential approximants fitted to it put zeros of ``Q_K`` on or just inside the circle
    of convergence (local exponent 0: the approximant is regular there), at places that move
    when the last digit moves. Measured: ``(1 + x)^(1/3) (1 - x/3)^(2/3)`` and four similar
    products from 50-70 terms rounded to 30 digits, each with one to three such pairs at
    ``|x| = 0.99-1.00``, none of them found again by the perturbed rerun, while ``-1`` was
    found again to 30 digits every time. A point two methods confirm is kept even when the
    rerun misses it (a far singularity can be missed), and at least one point always stays."""
    if len(sings) < 2 or len(found_by) != len(sings):
        return sings, []
    again = list(rerun["singularities"])
    drop = [i for i, s in enumerate(sings) if _noise_prone(s, found_by[i]) and not _found_again(s, again)]
    if not drop or len(drop) == len(sings):
        return sings, []
    kept = [s for i, s in enumerate(sings) if i not in drop]
    warnings.append(f"not reported: {_points_by([(sings[i], found_by[i]) for i in drop])}, each seen by "
                    f"one method (or the differential approximants) only and not found again by the rerun "
                    f"with {key.replace('_', ' ')}: artifacts of the coefficients' last digits")
    return kept, drop


def _screen_artifacts(series, ctx, base, warnings, progress=None):
    """Without verification: the precision-artifact screen alone, and only when it has work.

    When points that one method alone finds are among those reported, that method (only)
    is rerun with the input moved in its last digit (exact input: at higher precision), and
    the points it does not find again are dropped as in the verification
    (:func:`_drop_precision_artifacts`). The resummation plan runs the analysis this way:
    a map built on such a point (a conjugate pair on the circle of convergence) costs it about
    ten digits (measured: (1 + x)^(1/2) (1 - 2x/3)^(-3/10) from 50 terms at 30 digits,
    13 digits at x = -0.5 + 1.5 i through the spurious pair's map)."""
    sings = list(base["singularities"])
    found_by = _found_by(base)
    if base["growth"] != "finite radius" or len(sings) < 2 or len(found_by) != len(sings):
        return base
    lone = sorted({m for i, s in enumerate(sings) if _noise_prone(s, found_by[i]) for m in found_by[i]})
    if not lone:
        return base
    key, s2, c2 = _precision_rerun(series, ctx)
    res2 = _run(s2, c2, lone, progress, "artifact screen, " + ", ".join(lone))
    again = {"singularities": [x for r in res2.values() if r.success for x in r.singularities]}
    kept, dropped = _drop_precision_artifacts(sings, found_by, again, key, warnings)
    if not dropped:
        return base
    return dict(base, singularities=tuple(kept), radius=radius_band(kept),
                combined=_without(base["combined"], dropped))


def _precision_rerun(series, ctx):
    """(key, series, context) of the rerun that moves the input's precision: exact input at
    higher working precision, inexact input with each coefficient moved in its last digit."""
    if series.digits is None:
        return "higher_precision", series, ctx.higher()
    return "perturbed_input", _perturbed(series), ctx


def _without(combined, dropped):
    """The ``combined`` record of a reconciliation without the singularities at ``dropped``."""
    out = dict(combined)
    out["singularities"] = [c for i, c in enumerate(combined.get("singularities", [])) if i not in dropped]
    return out


def _rerun_radius(r2, sings):
    """A rerun's radius, without the points that it alone finds from one method (its own
    precision artifacts, see :func:`_drop_precision_artifacts`)."""
    if r2["radius"] is None or r2["growth"] != "finite radius" or not r2["singularities"]:
        return r2["radius"]
    fb = _found_by(r2)
    if len(fb) != len(r2["singularities"]):
        return r2["radius"]
    keep = [m for m, f in zip(r2["singularities"], fb)
            if not (_noise_prone(m, f) and _match(m, sings) is None)]
    return radius_band(keep) if keep else r2["radius"]


def _verify(series, ctx, names, base, warnings, progress=None):
    """Reruns with fewer terms and at higher precision; widen bands to cover them."""
    info = {}
    reruns = {}
    n = series.n_terms
    drop = max(2, n // 10)
    if n - drop >= MIN_TERMS + 4:
        short = series.truncate(n - drop)
        reruns["fewer_terms"] = (short, ctx, FEWER_TERMS_FACTOR)
    pkey, ps, pc = _precision_rerun(series, ctx)
    reruns[pkey] = (ps, pc, SAFETY)
    rad, sings = base["radius"], list(base["singularities"])
    borel, borel_b = base["borel"], base["borel_b"]
    # the reruns' estimators and the scan of the cut (from the main run's points) side by side
    scan = _beyond_input(series, base["growth"], base["singularities"], None)
    stages = [(s2, c2, names, "verification, " + key.replace("_", " "))
              for key, (s2, c2, _) in reruns.items()]
    outs, pts = _run_stages(stages, progress, None if scan is None else (scan, ctx.dps, series.digits))
    done = {key: _reconcile(s2, res2, []) for (key, (s2, _, _)), res2 in zip(reruns.items(), outs)}
    early = None if scan is None or pts is None else (scan[1], scan[2], pts)
    combined = base["combined"]
    if base["growth"] == "finite radius":
        sings, dropped = _drop_precision_artifacts(sings, _found_by(base), done[pkey], pkey, warnings)
        if dropped:
            rad = radius_band(sings)
            combined = _without(combined, dropped)
    for key, (s2, c2, factor) in reruns.items():
        r2 = done[key]
        entry = {"n_terms": s2.n_terms, "dps": c2.dps}
        r2_rad = _rerun_radius(r2, sings)
        if rad is not None and r2_rad is not None and mpmath.isfinite(rad.value):
            entry["radius_digits_agree"] = digits_agree(rad.value, r2_rad.value)
            rad_w = _widen(rad, r2_rad, factor)
            if rad_w is not rad:
                entry["radius_widened"] = True
            rad = rad_w
        if borel is not None and r2["borel"] is not None:
            entry["borel_digits_agree"] = digits_agree(borel.value, r2["borel"].value)
            borel = _widen(borel, r2["borel"], factor)
            if borel_b is not None and r2["borel_b"] is not None:
                entry["borel_exponent_digits_agree"] = digits_agree(borel_b.value, r2["borel_b"].value)
                borel_b = _widen(borel_b, r2["borel_b"], factor)
        new = []
        per = []
        for s in sings:
            m = _match(s, list(r2["singularities"]))
            if m is None:
                per.append({"location": s.location, "matched": False})
                new.append(s)
                continue
            re, im = _widen(s.re, m.re, factor), _widen(s.im, m.im, factor)
            ex = s.exponent
            d = {"location": s.location, "matched": True,
                 "location_digits_agree": digits_agree(s.location, m.location)}
            if ex is not None and m.exponent is not None:
                d["exponent_digits_agree"] = digits_agree(ex.value, m.exponent.value)
                ex = _widen(ex, m.exponent, factor)
            per.append(d)
            k2 = classify_kind(ex) if ex is not None else s.kind
            new.append(replace(s, re=re, im=im, exponent=ex,
                               kind="branch-log" if s.kind == "branch-log" and k2 == "branch" else k2))
        sings = new
        entry["singularities"] = per
        if r2["growth"] != base["growth"]:
            warnings.append(f"growth verdict changes with {key.replace('_', ' ')}: "
                            f"{base['growth']} -> {r2['growth']}")
        info[key] = entry
    # the radius follows the nearest (widened) singularity
    if sings and base["growth"] == "finite radius":
        rb = radius_band(sings)
        rad = Estimate(rad.value, min(rad.lower, rb.lower), max(rad.upper, rb.upper)) if rad else rb
    hp = info.get("higher_precision") or info.get("perturbed_input")
    if hp is not None and "radius_digits_agree" in hp and rad is not None and rad.error > 0:
        need = rad.digits()
        if hp["radius_digits_agree"] + 0.5 < min(need, ctx.dps):
            warnings.append(f"precision limits the result: the radius agrees to "
                            f"{hp['radius_digits_agree']:.1f} digits between reruns; raise the precision "
                            "or give more digits")
    return {"radius": rad, "singularities": tuple(sings), "borel": borel, "borel_b": borel_b,
            "combined": combined}, info, early


def _boundary_probe(series, ctx, results=None, prep=None):
    """The natural-boundary probe (:mod:`resum.estimators.boundary`) on ``series``, its radius
    in the series' variable; None when it does not apply.

    With the main run's ``results``: skipped when a method found a linear differential equation
    the series obeys exactly (its solutions have finitely many singular points), and run only
    when the highest near-diagonal approximant of the Padé estimator has at least
    ``MIN_RING_POLES`` poles (reused as the probe's top order: a table of a rational function
    with a handful of poles is degenerate, and solving it again would cost seconds)."""
    from .estimators._common import lift_radius
    from .estimators.boundary import MIN_ORDER, MIN_RING_POLES, probe_natural_boundary
    top = None
    if results is not None:
        if any(r.success and (r.diagnostics or {}).get("exact_equation") for r in results.values()):
            return None
        pade = results.get("pade")
        if pade is not None:
            apps = [a for a in (pade.diagnostics or {}).get("approximants", [])
                    if abs(a["L"] - a["M"]) <= 1 and a["L"] + a["M"] >= MIN_ORDER]
            if not apps:
                return None
            a = max(apps, key=lambda a: (a["L"] + a["M"], -abs(a["L"] - a["M"])))
            if len(a["poles"]) < MIN_RING_POLES:
                return None
            top = {"L": a["L"], "M": a["M"], "poles": [(z, None) for z in a["poles"]], "zeros": list(a["zeros"])}
    try:
        prep = prep or prepare(series, ctx)
        with prep.ctx.working():
            out = probe_natural_boundary(prep.c, prep.dps, prep.digits, top=top)
    except (InputError, ZeroDivisionError, ValueError, ArithmeticError) as exc:
        return {"suspected": False, "radius": None, "reason": f"probe failed: {exc}", "orders": []}
    if out["radius"] is not None:
        out["radius"] = lift_radius(out["radius"], prep.stride)
    if prep.stride > 1:
        out["reason"] += f" (in u = x^{prep.stride})"
    return out


def _mark_essential(series, ctx, sings, radius, prep=None):
    """Singularities of undetermined kind, real and nearest, whose coefficient ratios carry a
    ``1/sqrt(n)`` term (:mod:`resum.estimators.essential`) become kind ``essential`` (no
    exponent; location band unchanged). Returns (singularities, probe record or None)."""
    from .estimators.essential import probe_essential
    cand = [i for i, s in enumerate(sings) if s.exponent is None and s.kind == "unknown"
            and s.im.value == 0 and radius is not None and abs(s.location) <= radius.upper]
    if not cand:
        return sings, None
    try:
        prep = prep or prepare(series, ctx)
    except InputError:
        return sings, None
    if prep.stride != 1 or prep.is_complex:
        return sings, None
    with prep.ctx.working():
        out = probe_essential(prep.c)
    rec = {k: v for k, v in out.items() if k not in ("beta", "location")}
    rec["beta"] = None if out["beta"] is None else out["beta"].to_dict()
    if not out["essential"]:
        return sings, rec
    loc = out["location"]
    new = list(sings)
    for i in cand:
        s = sings[i]
        if _overlap(s.re, loc):
            note = (s.note + "; " if s.note else "") + \
                f"essential: c_n ~ x_c^-n exp(beta sqrt(n)), beta = {out['beta']} (1/sqrt(n) term of the ratios)"
            new[i] = replace(s, kind="essential", note=note)
    return new, rec


def _boundary_verdict(series, ctx, base, probe, verify, progress=None):
    """The verdict when a natural boundary is suspected: the probe's band as the radius (widened
    by its reruns with fewer terms and at higher precision), no singularities (the points the
    estimators found are where the approximants' crowd happened to recur), one warning."""
    say = progress or (lambda msg: None)
    rad = probe["radius"]
    info = {}
    warnings = []
    if verify:
        n = series.n_terms
        drop = max(2, n // 10)
        reruns = {}
        if n - drop >= MIN_TERMS + 4:
            reruns["fewer_terms"] = (series.truncate(n - drop), ctx, FEWER_TERMS_FACTOR)
        pkey, ps, pc = _precision_rerun(series, ctx)
        reruns[pkey] = (ps, pc, SAFETY)
        for key, (s2, c2, factor) in reruns.items():
            say(f"verification, natural-boundary probe, {key.replace('_', ' ')}")
            with c2.working():
                p2 = _boundary_probe(s2, c2)
            entry = {"n_terms": s2.n_terms, "dps": c2.dps,
                     "natural_boundary": bool(p2 is not None and p2["suspected"])}
            if p2 is not None and p2["radius"] is not None:
                entry["radius_digits_agree"] = digits_agree(rad.value, p2["radius"].value)
                rad = _widen(rad, p2["radius"], factor)
            else:
                warnings.append(f"the rerun with {key.replace('_', ' ')} does not see the crowd of poles "
                                f"({(p2 or {}).get('reason', 'probe not applicable')}): the natural boundary "
                                "rests on the full series alone")
            info[key] = entry
    pts = list(base["singularities"])
    var = series.variable
    text = (f"natural boundary suspected at |{var}| ~ {rad} [{mpmath.nstr(rad.lower, 3)}, "
            f"{mpmath.nstr(rad.upper, 3)}]: {probe['reason']}; an estimate from the approximants' poles, "
            "not a proof")
    if pts:
        text += (f"; not reported as singularities: {_points_by([(s, [s.method]) for s in pts[:6]])}"
                 + (f" and {len(pts) - 6} more" if len(pts) > 6 else "")
                 + " (points of that crowd that recur across orders, not isolated singularities)")
    return {"radius": rad, "singularities": (), "borel": None, "borel_b": None,
            "combined": {"radius": "natural-boundary probe"}}, info, [text] + warnings


def analyze(series, ctx: Optional[Context] = None, methods=None, verify: bool = True,
            progress=None) -> AnalysisResult:
    """Radius, leading singularities and growth type of a power series, with bands.

    Parameters
    ----------
    series : Series
        Power series in its expansion variable (``start >= 0``).
    ctx : Context, optional
        Working precision (default :func:`default_context`).
    methods : list of str, optional
        Registry names (see :data:`resum.estimators.METHODS`); default all.
    verify : bool
        Rerun with fewer terms and at higher precision (or perturbed input)
        and widen the bands to cover what changes.
    progress : callable, optional
        Called with a one-line message as each stage starts and ends (the
        command line prints them on stderr).

    Returns
    -------
    AnalysisResult
        See the module Notes on how to read its bands; ``diagnostics["how"]``
        repeats it for the result at hand.
    """
    if not isinstance(series, Series):
        raise InputError(f"expected a resum.Series, got {type(series).__name__}; build one with "
                         "Series([c0, c1, ...])", where="series")
    names = validate_methods(methods)
    verify = check_flag(verify, "verify")
    ctx = default_context(series) if ctx is None else checked_context(ctx)
    prep = prepare(series, ctx)          # input errors surface here
    with ctx.working():
        result, early = _analyze(series, ctx, names, verify, prep, progress)
        beyond = _beyond(series, ctx, result, progress, early)
        if beyond:
            result = replace(result, beyond=tuple(beyond))
    if series.digits is not None and series.digits < ctx.dps:
        # the command line refuses this (--dps above the digits the file carries); from Python the
        # analysis runs with its noise floors at the series' digits, and says so
        result = replace(result, warnings=(f"{ctx.dps} digits asked, but the coefficients carry "
                                           f"{series.digits}: the analysis treats them as known to "
                                           f"{series.digits} digit{'s' if series.digits != 1 else ''} "
                                           "(give them with more, or "
                                           "Series(..., digits=N) if they are known better)",)
                         + tuple(result.warnings))
    return result


#: the scan of the cut beyond the nearest singularity needs at least this many terms
BEYOND_MIN_TERMS = 30


def _beyond_input(series, growth, sings, boundary):
    """What the scan of the cut needs, ``(c, x0, k)``, or None when it does not apply (see
    :func:`_beyond`)."""
    if growth != "finite radius" or not sings or boundary is not None:
        return None
    c = list(series.coefficients)
    if series.start != 0 or any(isinstance(v, mpmath.mpc) and mpmath.im(v) != 0 for v in c):
        return None
    # a series in powers of x^k (every k-th coefficient non-zero) is scanned in u = x^k, where
    # its k-fold symmetric singular points are one
    k = 0
    for j, v in enumerate(c):
        if j and v != 0:
            k = math.gcd(k, j)
    k = max(k, 1)
    c = c[::k]
    if len(c) < BEYOND_MIN_TERMS:
        return None
    us = [mpmath.mpmathify(s.location) ** k for s in sings]
    x0 = mpmath.re(us[0])
    if x0 == 0:
        return None
    for z in us:
        if abs(mpmath.im(z)) > 1e-8 * abs(z) or mpmath.sign(mpmath.re(z)) != mpmath.sign(x0):
            return None               # another point off the ray: the map from x0 alone is not valid
    return c, x0, k


def _scan_beyond(c, x0, k, dps, digits) -> list:
    """The scan itself (``[]`` when it fails)."""
    from .estimators.cut_scan import scan_cut
    try:
        # (30 digits place the poles and zeros far more finely than any band this scan reports)
        pts = scan_cut(c, x0, min(dps, 30), input_digits=digits)
    except (ValueError, ArithmeticError, ZeroDivisionError):
        return []
    return [replace(p, power=k) for p in pts] if k > 1 else pts


def _beyond(series, ctx, result, progress=None, early=None) -> list:
    """Singular points further along the cut of the nearest singularity
    (:mod:`resum.estimators.cut_scan`), when that singularity is real and every one reported lies
    on its ray, the series real and long enough; ``[]`` otherwise (and when the scan fails).
    ``early``: ``(x0, k, points)`` of a scan already run beside the verification reruns from the
    main run's points; used when the verdict kept the same nearest point."""
    got = _beyond_input(series, result.growth, result.singularities, result.natural_boundary)
    if got is None:
        return []
    c, x0, k = got
    if early is not None and early[0] == x0 and early[1] == k:
        pts = early[2]
    else:
        if progress:
            progress(f"scanning the cut from {point_text(x0, 8)} for singular points beyond it")
        pts = _scan_beyond(c, x0, k, ctx.dps, series.digits)
    if progress:
        progress(f"cut scanned: {len(pts)} point(s) beyond the nearest")
    return pts


def _warn_complex_exponents(sings, results, warnings):
    """A warning for each reported point without an exponent where an estimator found a complex
    one (complex coefficients: the bands hold real exponents only)."""
    for s in sings:
        if s.exponent is not None:
            continue
        for r in results.values():
            hit = [t for t in (r.singularities or ()) if "complex exponent" in (t.note or "")
                   and abs(t.location - s.location) <= 0.01 * max(abs(s.location), mpmath.mpf(10) ** -30)]
            if hit:
                note = hit[0].note[hit[0].note.index("complex exponent"):]
                warnings.append(f"at {point_text(s.location, 8)} ({r.method}): {note}")
                break


def _analyze(series, ctx, names, verify, prep, progress=None):
    """(AnalysisResult, early scan of the cut or None: see :func:`_beyond`)."""
    t0 = time.perf_counter()
    early = None
    results = _run(series, ctx, names, progress, "main run")
    warnings = []
    base = _reconcile(series, results, warnings)
    probe = _boundary_probe(series, ctx, results, prep) if base["growth"] == "finite radius" else None
    boundary = None
    if probe is not None and probe["suspected"]:
        # the estimators' points and the warnings about them are superseded by the probe
        final, verification, warnings = _boundary_verdict(series, ctx, base, probe, verify, progress)
        boundary = final["radius"]
    elif not verify:
        base = _screen_artifacts(series, ctx, base, warnings, progress)
    if boundary is None:
        verification = {}
        final = dict(base)
    if boundary is None and verify and base["radius"] is not None:
        # rerun only the methods whose estimates made it into the verdict
        used = {s.method for s in base["singularities"]}
        used |= {m for c in base["combined"].get("singularities", []) for m in c.get("used", [])}
        used |= {v for v in base["combined"].values() if isinstance(v, str)}
        contributing = [k for k, r in results.items() if r.success and k in used] or \
            [k for k, r in results.items() if r.success]
        # the growth-rate bounds (cheap) always rerun: they screen points inside the radius
        contributing += [k for k in ("root-test", "ratio")
                         if k in results and results[k].success and k not in contributing]
        final_v, verification, early = _verify(series, ctx, contributing, base, warnings, progress)
        final.update(final_v)
    growth = base["growth"]
    essential = None
    if boundary is None and growth == "finite radius" and final["singularities"]:
        sings, essential = _mark_essential(series, ctx, list(final["singularities"]), final["radius"], prep)
        final["singularities"] = tuple(sings)
    rad = final["radius"]
    if rad is not None and rad.lower < 0:
        final["radius"] = Estimate(rad.value, 0, rad.upper)     # widened by reruns: a modulus stays >= 0
    n_ok = sum(1 for r in results.values() if r.success)
    if final["radius"] is None:
        status, success = Status.NOT_CONVERGED, False
        msg = "no estimator converged; " + "; ".join(f"{k}: {r.message}" for k, r in results.items()
                                                    if r.message)
    else:
        success = True
        status = Status.CONVERGED
        msg = f"{n_ok} of {len(results)} methods converged"
        if n_ok == 0 and growth == "factorial":
            msg = "factorial growth, radius 0; no method located the Borel-plane singularity"
        if boundary is not None:
            msg += "; natural boundary suspected"
        if any(w.startswith("methods disagree") for w in warnings):
            status = Status.DISAGREE
        if any(w.startswith("precision limits") for w in warnings):
            status = Status.UNSTABLE_PRECISION
    if prep.n_terms < 20:
        warnings.append(f"only {prep.n_terms} terms: estimates are rough")
    how = ("Each method's band: safety factor " f"{SAFETY}" " x spread of its stable estimates across orders "
           "(see each method's 'how'). Combined: the narrowest band among methods finding the same point, "
           f"widened to at least 1/{CONFIRM_RATIO} of the next narrowest and to touch every other method's band "
           "(a point from a differential equation the series obeys exactly, checked on every coefficient "
           "beyond those fitted, is taken as that equation gives it). ")
    if verification:
        how += ("Verification: reran with fewer terms"
                + (" and at higher precision" if series.digits is None else " and with input perturbed in the last digit")
                + "; bands widened to cover the changes (x" f"{FEWER_TERMS_FACTOR}" " the fewer-terms change, x"
                f"{SAFETY}" " the precision change).")
    if boundary is not None:
        how += (" Natural boundary: " + probe["how"] + "; reruns with fewer terms and at higher precision "
                "widen the band as above.")
    diag = {"how": how, "verification": verification, "combined": final["combined"],
            "seconds": round(time.perf_counter() - t0, 3), "dps": ctx.dps, "n_terms": series.n_terms,
            "variable": series.variable}
    if series.coupling is not None:
        diag["coupling"] = series.coupling.describe(series.variable)
    if probe is not None:
        diag["natural_boundary"] = {k: v for k, v in probe.items() if k != "radius"}
    if essential is not None:
        diag["essential"] = essential
    _warn_complex_exponents(final["singularities"], results, warnings)
    prov = Provenance("analyze", {"methods": names, "verify": verify}, series.n_terms, ctx.dps,
                      series.input_hash(), __version__)
    return AnalysisResult(success=success, status=status, message=msg, radius=final["radius"],
                          singularities=tuple(final["singularities"]), growth=growth,
                          borel_singularity=final["borel"], borel_exponent=final["borel_b"],
                          methods=results, warnings=tuple(warnings), diagnostics=diag, provenance=prov,
                          natural_boundary=boundary), early
