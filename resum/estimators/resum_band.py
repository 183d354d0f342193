"""Rational approximants and bands shared by the resummation methods.

A resummation method produces a family of *candidates*: one approximant per
(number of terms used, Padé orders), each giving a value at every requested
point or ``None`` where it was rejected (a pole too close to the point or to
the integration path, a singular linear system, a failed integral).
:func:`band_from_candidates` turns the candidates at one point into an
:class:`~resum.results.Estimate`:

* the *stable core* is the set of surviving candidates whose distance from
  the median is at most ``outlier`` times the median distance (this drops
  Froissart doublets and other isolated failures);
* the value is the median of the three core candidates that use the most
  terms;
* the band is the largest distance from that value of the ``spread`` core
  candidates using the most terms, times ``safety``, and never less than the numerical floor (integration
  error, input digits, working precision) passed in.

The band is therefore the spread of the last few orders of a converging
sequence of approximants: an estimate of the error of the lower orders used,
so for a converging sequence it is larger than the error of the value. It is
not a bound: a sequence that converges to a wrong value (a cut the
approximants cannot see) would give a narrow wrong band; the verification
rerun at higher precision and the comparison between methods guard against
that.

>>> import mpmath
>>> from resum.context import workdps
>>> with workdps(30):
...     r = rational_fit([1 / mpmath.factorial(k) for k in range(21)], 10, 10, 30)   # exp
...     err = abs(r(1) - mpmath.e)
>>> err < 1e-24
True
"""
from __future__ import annotations

from dataclasses import dataclass, field
from typing import Optional, Sequence

import flint
import mpmath

from ..results import Estimate
from ..transforms._arb import acb_to_mp, arb_to_mp, flint_precision, to_acb, to_arb

__all__ = ["Rational", "rational_fit", "Candidate", "band_from_candidates", "candidate_orders"]


@dataclass(frozen=True)
class Rational:
    """``P(z)/Q(z)`` with ``Q(0) = 1``; coefficients low to high (mpmath numbers)."""

    p: tuple
    q: tuple
    L: int
    M: int

    def __call__(self, z):
        return _horner(self.p, z) / _horner(self.q, z)

    def den(self, z):
        return _horner(self.q, z)

    def poles(self, dps: int) -> list:
        """Roots of ``Q`` (complex mpmath numbers); [] when ``M = 0``."""
        q = list(self.q)
        while len(q) > 1 and q[-1] == 0:
            q.pop()
        if len(q) <= 1:
            return []
        return _roots(q, dps)

    def zeros(self, dps: int) -> list:
        p = list(self.p)
        while len(p) > 1 and p[-1] == 0:
            p.pop()
        if len(p) <= 1:
            return []
        return _roots(p, dps)


def _horner(cs, z):
    acc = 0
    for c in reversed(cs):
        acc = acc * z + c
    return acc


def _roots(cs, dps):
    with flint_precision(dps):
        if any(isinstance(c, mpmath.mpc) for c in cs):
            poly = flint.acb_poly([to_acb(c) for c in cs])
        else:
            poly = flint.acb_poly([flint.acb(to_arb(c)) for c in cs])
        try:
            rts = poly.roots()
        except Exception:  # noqa: BLE001 - flint gives up on badly conditioned input
            rts = None
    if rts is not None:
        return [acb_to_mp(r) for r in rts]
    try:
        return list(mpmath.polyroots(list(reversed(cs)), maxsteps=200, extraprec=4 * dps))
    except mpmath.libmp.NoConvergence:
        return []


def rational_fit(c: Sequence, L: int, M: int, dps: int, reduce: bool = True) -> Optional[Rational]:
    """The [L/M] Padé approximant of the series ``c`` (needs ``L + M + 1`` terms).

    Solves the Toeplitz system for ``Q`` at ``dps`` digits (python-flint,
    approximate LU) and forms ``P = (c Q) mod z^(L+1)``. When the system is
    singular at this precision (a degenerate table entry, e.g. an exactly
    rational function) and ``reduce`` is true, the denominator degree is
    lowered step by step (``[L+1/M-1]``, ...), keeping the number of terms
    used; returns ``None`` if nothing works.
    """
    r = _rational_fit(c, L, M, dps)
    while r is None and reduce and M > 0:
        L, M = L + 1, M - 1
        r = _rational_fit(c, L, M, dps)
    return r


def _rational_fit(c, L, M, dps):
    c = list(c)
    if len(c) < L + M + 1:
        raise ValueError(f"[{L}/{M}] needs {L + M + 1} terms, got {len(c)}")
    cplx = any(isinstance(v, (mpmath.mpc, complex)) for v in c)
    conv = to_acb if cplx else to_arb
    back = acb_to_mp if cplx else arb_to_mp
    q = [mpmath.mpf(1)]
    if M > 0:
        with flint_precision(dps):
            cc = [conv(v) for v in c[: L + M + 1]]
            get = lambda k: cc[k] if k >= 0 else 0  # noqa: E731
            rows = [[get(L + i - j) for j in range(1, M + 1)] for i in range(1, M + 1)]
            rhs = [[-get(L + i)] for i in range(1, M + 1)]
            mat = flint.acb_mat if cplx else flint.arb_mat
            try:
                sol = mat(rows).solve(mat(rhs), algorithm="approx")
            except (ZeroDivisionError, ValueError):
                return None
            qs = [back(sol[i, 0]) for i in range(M)]
        if any(not mpmath.isfinite(v) for v in qs):
            return None
        q = [mpmath.mpf(1)] + qs
    cm = [mpmath.mpmathify(v) if not isinstance(v, (mpmath.mpf, mpmath.mpc)) else v for v in c]
    p = []
    for k in range(L + 1):
        s = 0
        for j in range(0, min(k, M) + 1):
            s += q[j] * cm[k - j]
        p.append(s)
    return Rational(tuple(p), tuple(q), L, M)


def candidate_orders(n_terms: int, n_orders: int = 8, offsets: Sequence[int] = (0,),
                     min_terms: int = 3) -> list:
    """(n_used, L, M) for the top ``n_orders`` term counts, near-diagonal.

    For each number of terms ``n`` from ``n_terms`` down, ``L + M = n - 1``
    with ``M = (n - 1 - d) // 2`` for each offset ``d = L - M`` (approximately)
    in ``offsets``; the default alternates [k/k] and [k+1/k] as ``n`` steps.
    """
    out = []
    for n in range(n_terms, max(min_terms, n_terms - n_orders + 1) - 1, -1):
        for d in offsets:
            M = (n - 1 - d) // 2
            L = n - 1 - M
            if M < 0 or L < 0:
                continue
            out.append((n, L, M))
    return out


@dataclass
class Candidate:
    """One approximant's values at the points (``None`` where rejected)."""

    label: str
    n_used: int
    values: list
    rejected: list = field(default_factory=list)   # reason per point or ""
    errors: list = field(default_factory=list)     # numerical floor per point (e.g. quadrature error)


def _med(xs):
    xs = sorted(xs)
    k = len(xs)
    return xs[k // 2] if k % 2 else (xs[k // 2 - 1] + xs[k // 2]) / 2


def band_from_candidates(vals: Sequence, n_used: Sequence[int], *, floor=0, safety=2,
                         outlier=20, min_core=3, spread=4):
    """Estimate (real numbers) or pair of Estimates (complex) from candidate values.

    Returns ``(estimate_re, estimate_im_or_None, info)``; ``info`` holds the
    core size, the dropped candidates and the text ``how``. ``estimate_re`` is
    ``None`` when fewer than ``min_core`` candidates survive.
    """
    pairs = [(n, v) for n, v in zip(n_used, vals) if v is not None and mpmath.isfinite(abs(v))]
    info = {"n_candidates": len(vals), "n_finite": len(pairs)}
    if len(pairs) < min_core:
        info["how"] = f"only {len(pairs)} usable approximants (need {min_core})"
        return None, None, info
    cplx = any(isinstance(v, mpmath.mpc) and v.imag != 0 for _, v in pairs)
    re_med = _med([mpmath.re(v) for _, v in pairs])
    im_med = _med([mpmath.im(v) for _, v in pairs]) if cplx else 0
    center = mpmath.mpc(re_med, im_med)
    dist = [abs(v - center) for _, v in pairs]
    md = _med(dist)
    scale = max(md, abs(center) * mpmath.mpf(10) ** (-mpmath.mp.dps + 3))
    core = [(n, v) for (n, v), d in zip(pairs, dist) if d <= outlier * scale]
    info["n_core"] = len(core)
    info["n_dropped_outliers"] = len(pairs) - len(core)
    if len(core) < min_core:
        info["how"] = f"approximants scatter: only {len(core)} agree (need {min_core})"
        return None, None, info
    core.sort(key=lambda t: -t[0])
    top = [v for _, v in core[:3]]
    vre = _med([mpmath.re(v) for v in top])
    vim = _med([mpmath.im(v) for v in top]) if cplx else None
    # never claim more than the working precision supports
    fl = max(mpmath.mpf(floor), abs(mpmath.mpc(vre, vim or 0)) * mpmath.mpf(10) ** (3 - mpmath.mp.dps))
    near = core[:max(spread, 3)]
    wre = max([abs(mpmath.re(v) - vre) for _, v in near] + [0]) * safety
    wre = max(wre, fl)
    est_re = Estimate(vre, vre - wre, vre + wre)
    est_im = None
    if cplx:
        wim = max([abs(mpmath.im(v) - vim) for _, v in near] + [0]) * safety
        wim = max(wim, fl)
        est_im = Estimate(vim, vim - wim, vim + wim)
    info["how"] = (f"value: median of the 3 highest-order of {len(core)} mutually agreeing approximants; "
                   f"band: {safety} x the largest deviation of the {len(near)} highest-order ones "
                   "from it, at least the numerical floor")
    return est_re, est_im, info


@dataclass
class PointOutcome:
    """One method's verdict at one point (internal; wrapped by resum.resummation)."""

    re: Optional[Estimate]
    im: Optional[Estimate]
    ok: bool
    reason: str = ""
    info: dict = field(default_factory=dict)


def outcomes_from_table(table, n_used, *, floors=None, safety=2, min_core=3):
    """Band every point of a candidate table ``table[point][candidate]``."""
    out = []
    for j, vals in enumerate(table):
        fl = 0 if floors is None else floors[j]
        re, im, info = band_from_candidates(vals, n_used, floor=fl, safety=safety, min_core=min_core)
        if re is None:
            out.append(PointOutcome(None, None, False, info.get("how", "no stable approximants"), info))
        else:
            out.append(PointOutcome(re, im, True, "", info))
    return out
