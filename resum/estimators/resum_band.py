"""Rational approximants and bands shared by the resummation methods.

A resummation method produces a family of *candidates*: one approximant per
(number of terms used, Padé orders), each giving a value at every requested
point or ``None`` where it was rejected (a pole too close to the point or to
the integration path, a singular linear system, a failed integral).
:func:`band_from_candidates` turns the candidates at one point into an
:class:`~resum.results.Estimate`:

* the value is the median of the three candidates using the most terms;
* the band is ``safety`` times the larger of the spread of the top
  candidates and the error at the full term count extrapolated from how fast
  the lower-order candidates approach the value (see
  :func:`band_from_candidates`); never less than the numerical floor
  (integration error, input digits, working precision).

The band is therefore a model of the convergence of the sequence of
approximants (geometric in the number of terms), not a bound: a sequence that converges to a wrong value (a cut the
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

from .._kernels.aberth import roots as ball_roots
from ..results import Estimate
from ..transforms._arb import acb_to_mp, arb_to_mp, flint_precision, to_acb, to_arb

__all__ = ["Rational", "fast_evaluator", "rational_fit", "rational_integral", "RationalIntegrator", "Candidate",
           "band_from_candidates", "candidate_orders", "fit_candidates"]


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

    def poles(self, dps: int, tol_digits: Optional[int] = None) -> list:
        """Roots of ``Q`` (complex mpmath numbers) from its coefficients at ``dps`` digits, to
        within ``10^-tol_digits`` (default ``dps``); [] when ``M = 0``."""
        q = list(self.q)
        while len(q) > 1 and q[-1] == 0:
            q.pop()
        if len(q) <= 1:
            return []
        return _roots(q, dps, tol_digits)

    def zeros(self, dps: int) -> list:
        p = list(self.p)
        while len(p) > 1 and p[-1] == 0:
            p.pop()
        if len(p) <= 1:
            return []
        return _roots(p, dps)


def fast_evaluator(r: "Rational"):
    """``z -> r(z)`` in FLINT ball arithmetic at the current mpmath precision plus 16 bits
    (the midpoint is returned): the same value as ``r(z)`` to that precision, several times
    faster than mpmath's Horner loop for the degrees of a table (Laplace integrands call
    it thousands of times per approximant)."""
    cplx = any(isinstance(v, mpmath.mpc) for v in r.p + r.q)
    P = flint.acb_poly([to_acb(v) for v in r.p])
    Q = flint.acb_poly([to_acb(v) for v in r.q])

    def ev(z):
        old = flint.ctx.prec
        flint.ctx.prec = mpmath.mp.prec + 16
        try:
            zz = to_acb(z)
            v = P(zz) / Q(zz)
        finally:
            flint.ctx.prec = old
        if not cplx and not isinstance(z, mpmath.mpc):
            return arb_to_mp(v.real)
        return acb_to_mp(v)
    return ev


def _horner(cs, z):
    acc = 0
    for c in reversed(cs):
        acc = acc * z + c
    return acc


def _roots(cs, dps, tol_digits=None):
    """Roots of the polynomial ``cs`` (low to high) to about ``dps`` digits: the estimators'
    one root finder (:func:`resum.estimators._num.poly_roots`: proved refinement or FLINT
    isolation to ``10^-dps``, double-precision roots polished by Newton steps where isolation
    fails at numerically multiple roots), then mpmath.polyroots as the last resort. (Isolation alone,
    used here before, left poles next to a Padé cut wrong by up to 1e-5.)"""
    from ._num import poly_roots
    rts = poly_roots(list(cs), dps, tol_digits)
    if rts is not None:
        return rts
    try:
        return list(mpmath.polyroots(list(reversed(cs)), maxsteps=50, extraprec=2 * dps))
    except mpmath.libmp.NoConvergence:
        return []


class RationalIntegrator:
    """``w -> integral_0^w r(t) (1 - t/rim)^(-gamma) dt`` by partial fractions.

    ``r = P/Q``; ``gamma`` a non-negative integer (a known rim factor taken
    out before the approximant was built). The integral runs along the
    straight segment from 0 to ``w``. With ``D = Q (1 - t/rim)^gamma``:
    the polynomial part of ``P/D`` is integrated exactly, each simple pole
    ``p`` of ``Q`` contributes ``P(p)/D'(p) log(1 - w/p)`` (principal branch:
    continuous along the segment since ``p`` is not on it), and the pole of
    order ``gamma`` at the rim its principal part term by term. Everything
    runs in complex ball arithmetic (FLINT) at ``dps + 20`` digits, so the
    result's radius shows the digits lost to close poles. The roots and
    residues are computed once; each point then costs one logarithm per pole.

    ``ok`` is False (no point can be integrated) when the roots of ``Q``
    cannot be separated at up to four times the precision or a pole sits at
    the rim point. At a point, a pole within ``pole_tol * |w|`` of the
    segment is left out when its term is below the accuracy asked (half of a
    spurious pole-zero pair, with a tiny residue); otherwise, or when fewer
    than ``dps/2`` digits survive, :meth:`__call__` returns None.
    """

    def __init__(self, r: "Rational", dps: int, *, rim=None, gamma: int = 0, pole_tol=mpmath.mpf("0.01")):
        self.dps = int(dps)
        self.gamma = int(gamma)
        self.pole_tol = mpmath.mpf(pole_tol)
        self.ok = True
        with flint_precision(self.dps + 20):
            prec = flint.ctx.prec
            P = list(r.p)
            Q = list(r.q)
            while len(P) > 1 and P[-1] == 0:
                P.pop()
            while len(Q) > 1 and Q[-1] == 0:
                Q.pop()
            self.real = all(mpmath.im(v) == 0 for v in P + Q)
            Pp = flint.acb_poly([to_acb(v) for v in P])
            Qp = flint.acb_poly([to_acb(v) for v in Q])
            Dp = Qp
            self.rim = None
            if self.gamma:
                self.rim = to_acb(mpmath.mpmathify(rim))
                Dp = Qp * flint.acb_poly([1, -1 / self.rim]) ** self.gamma
            poles = []
            if Qp.degree() >= 1:
                try:
                    poles = ball_roots(Qp, prec, flint.arb(2) ** -(prec - 10), 4 * prec)
                except ValueError:
                    self.ok = False
                    return
            dD = Dp.derivative()
            self.poles = poles
            self.poles_mp = [acb_to_mp(p) for p in poles]
            # the distance test of each call in doubles: it only compares with pole_tol * |w|
            self.poles_c = [complex(pm) for pm in self.poles_mp]
            self.residues = [Pp(p) / dD(p) for p in poles]
            self.res_mag = [abs(acb_to_mp(x)) for x in self.residues]
            S, _ = divmod(Pp, Dp)
            self.S_int = S.integral()
            self.principal = []
            if self.gamma:
                if any(abs(pm - mpmath.mpmathify(rim)) < self.pole_tol for pm in self.poles_mp):
                    self.ok = False
                    return
                # P/D = (-rim)^gamma h(t) (t - rim)^(-gamma), h = P/Q analytic at the rim
                rb = self.rim
                hp, hq = [], []
                a, b = Pp, Qp
                fact = 1
                for k in range(self.gamma):
                    hp.append(a(rb) / fact)
                    hq.append(b(rb) / fact)
                    a, b = a.derivative(), b.derivative()
                    fact *= k + 1
                h = []
                for k in range(self.gamma):
                    h.append((hp[k] - sum((h[j] * hq[k - j] for j in range(k)), flint.acb(0))) / hq[0])
                pref = (-rb) ** self.gamma
                self.principal = [(self.gamma - k, pref * h[k]) for k in range(self.gamma)]

    def inner_terms(self, w, margin=0.005, imag_min=0.02):
        """``sum |res log(1 - w/p)|`` over the poles ``p`` strictly inside the unit disk
        (``|p| < 1 - margin``) and off the real axis (``|Im p| > imag_min``): what such poles add
        to the value at ``w``. For a function analytic in the mapped disk they stand for nothing
        it has (a singular point on the rim the approximant does not resolve, drawn as a pole
        with a zero beside it), so their terms measure an error the spread of the approximants
        need not show."""
        if not self.ok:
            return mpmath.mpf(0)
        wm = mpmath.mpmathify(w)
        tot = mpmath.mpf(0)
        for pm, res in zip(self.poles_mp, self.residues):
            if abs(pm) < 1 - margin and abs(mpmath.im(pm)) > imag_min:
                tot += abs(acb_to_mp(res) * mpmath.log(1 - wm / pm))
        return tot

    def __call__(self, w):
        if not self.ok:
            return None
        with flint_precision(self.dps + 20):
            wm = mpmath.mpmathify(w)
            wb = to_acb(wm)
            scale = max(abs(wm), mpmath.mpf(10) ** -10)
            near = float(self.pole_tol * scale)
            wc = complex(wm)
            total = self.S_int(wb)
            left_out = mpmath.mpf(0)     # bound on the left-out terms of poles on the path
            for p, pm, pc, res, mag in zip(self.poles, self.poles_mp, self.poles_c, self.residues, self.res_mag):
                d = _dist_to_segment_c(pc, wc)
                if d < 2 * near and _dist_to_segment(pm, wm) < self.pole_tol * scale:
                    lg = abs(mpmath.log(abs(1 - wm / pm))) if pm != wm else mpmath.inf
                    left_out += mag * (lg + 4)
                    continue
                total += res * (1 - wb / p).log()
            for m, coef in self.principal:
                rb = self.rim
                if m == 1:
                    total += coef * (1 - wb / rb).log()
                else:
                    total += coef * ((wb - rb) ** (1 - m) - (-rb) ** (1 - m)) / (1 - m)
            val = acb_to_mp(total)
            rad = mpmath.mpf(max(total.real.rad(), total.imag.rad())) + left_out
        if not (abs(val) > 0 and rad <= abs(val) * mpmath.mpf(10) ** (-self.dps / 2)):
            if not (val == 0 and rad == 0):
                return None
        if isinstance(val, mpmath.mpc) and mpmath.im(wm) == 0 and self.real:
            val = val.real          # a real rational on a real segment: the imaginary part is rounding
        return val


def rational_integral(r: "Rational", w, dps: int, *, rim=None, gamma: int = 0, pole_tol=mpmath.mpf("0.01")):
    """``integral_0^w r(t) (1 - t/rim)^(-gamma) dt`` or None (see :class:`RationalIntegrator`)."""
    return RationalIntegrator(r, dps, rim=rim, gamma=gamma, pole_tol=pole_tol)(w)


def _dist_to_segment_c(p: complex, w: complex) -> float:
    """:func:`_dist_to_segment` in doubles (a prefilter: the exact test runs within a factor 2)."""
    if w == 0:
        return abs(p)
    t = (p * w.conjugate()).real / abs(w) ** 2
    t = min(max(t, 0.0), 1.0)
    return abs(p - t * w)


def _dist_to_segment(p, w):
    """Distance from ``p`` to the segment from 0 to ``w``."""
    if w == 0:
        return abs(p)
    t = mpmath.re(p * mpmath.conj(w)) / abs(w) ** 2
    t = min(max(t, 0), 1)
    return abs(p - t * w)


def rational_fit(c: Sequence, L: int, M: int, dps: int, reduce: bool = True) -> Optional[Rational]:
    """The [L/M] Padé approximant of the series ``c`` (needs ``L + M + 1`` terms).

    Built by :func:`resum._kernels.pade.pade` (``Q`` and ``P`` to at least
    ``dps`` correct digits for the input as given; degrees lowered by the
    kernel where the table is degenerate). When the construction fails
    (``None``: no usable approximant at this precision) and ``reduce`` is
    true, the denominator degree is
    lowered step by step (``[L+1/M-1]``, ...), keeping the number of terms
    used; returns ``None`` if nothing works.
    """
    r = _rational_fit(c, L, M, dps)
    while r is None and reduce and M > 0:
        L, M = L + 1, M - 1
        r = _rational_fit(c, L, M, dps)
    return r


def _rational_fit(c, L, M, dps):
    # One Padé construction for the project: resum._kernels.pade.pade (continued-fraction
    # recursion in ball arithmetic with guard digits, so p and q carry at least dps correct
    # digits for the input as given; ball LU or the SVD construction at singular blocks,
    # which lowers the degrees when the table is degenerate). Measured on 200-term series at
    # 45 and 120 digits it is 2-4x faster than the approximate LU at dps digits kept below as
    # the fallback, whose coefficients kept only 0-30 digits there.
    c = list(c)
    if len(c) < L + M + 1:
        raise ValueError(f"[{L}/{M}] needs {L + M + 1} terms, got {len(c)}")
    from .._kernels.pade import pade
    with mpmath.workdps(max(int(dps), mpmath.mp.dps)):
        cm = [v if isinstance(v, (mpmath.mpf, mpmath.mpc)) else mpmath.mpmathify(v)
              for v in c[: L + M + 1]]
    try:
        r = pade(cm, L, M, int(dps))
    except (ArithmeticError, ValueError):
        return None
    except Exception:  # noqa: BLE001 - an internal kernel failure: the direct solve instead
        return _rational_fit_lu(c, L, M, dps)
    if r.diagnostics.get("note") == "zero approximant":
        return None
    p = [mpmath.mpmathify(a) for a in r.p]
    q = [mpmath.mpmathify(b) for b in r.q]
    if any(not mpmath.isfinite(v) for v in p + q):
        return None
    if r.defect > 0 and r.method in ("svd", "exact"):
        # degenerate table: the kernel lowered the degrees by rank; report the actual ones
        return Rational(tuple(p), tuple(q), len(p) - 1, len(q) - 1)
    p += [mpmath.mpf(0)] * (L + 1 - len(p))
    q += [mpmath.mpf(0)] * (M + 1 - len(q))
    return Rational(tuple(p), tuple(q), L, M)


def _rational_fit_lu(c, L, M, dps):
    """[L/M] from the Toeplitz system by approximate LU at ``dps`` digits (fallback)."""
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


def fit_candidates(c: Sequence, orders, dps: int):
    """``[(i, Rational)]`` for the ``orders`` (``(n_used, L, M)``) whose approximant of
    ``c[:n_used]`` could be built, and the number that could not."""
    out, singular = [], 0
    for i, (n, L, M) in enumerate(orders):
        r = rational_fit(c[:n], L, M, dps)
        if r is None:
            singular += 1
        else:
            out.append((i, r))
    return out, singular


FAR_FRACTIONS = (0.05, 0.08, 0.12, 0.17, 0.24, 0.33, 0.45)


def candidate_orders(n_terms: int, n_orders: int = 7, offsets: Sequence[int] = (0,),
                     min_terms: int = 3, n_top: int = 4) -> list:
    """(n_used, L, M) for the approximants that enter a value and its band.

    The ``n_top`` largest term counts (``n_terms``, ``n_terms - 1``, ...) give
    the value; ``n_orders`` further ones, spread down to about
    ``0.55 n_terms`` (``n_terms - round(f n_terms)`` for the fractions in
    :data:`FAR_FRACTIONS`), show how fast the approximants converge, from
    which the band is extrapolated. For each term count ``n``,
    ``L + M = n - 1`` with ``M = (n - 1 - d) // 2`` for each offset ``d`` in
    ``offsets`` (near-diagonal).
    """
    ns = list(range(n_terms, max(min_terms, n_terms - n_top + 1) - 1, -1))
    for f in FAR_FRACTIONS[:max(0, n_orders)]:
        n = n_terms - max(n_top, int(round(f * n_terms)))
        if n >= min_terms and n not in ns:
            ns.append(n)
    out = []
    for n in ns:
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


def _line_fit(xs, ys):
    m = len(xs)
    sx, sy = sum(xs), sum(ys)
    sxx = sum(v * v for v in xs)
    sxy = sum(a * b for a, b in zip(xs, ys))
    den = m * sxx - sx * sx
    if den == 0:
        return None
    beta = (m * sxy - sx * sy) / den
    return (sy - beta * sx) / m, beta


def _distinct(pairs, min_core, info):
    """Drop candidates equal (to the working precision) to one with more terms, when enough
    distinct ones remain.

    Approximants of a series in x^2 (or x^k) repeat: [2k+1/2k], [2k+1/2k+1] and [2k+2/2k+1]
    of an odd series are one function. Counted three times, one approximant made the spread of
    the "three highest" zero (measured: Stirling's series of log Gamma, 80 terms, plain Padé at
    x = 1 and 2: bands of 7 and 4 digits that missed the truth by 1.2 and 2 half-widths). A
    sequence that has converged to the working precision keeps its repeats (too few distinct)."""
    if len(pairs) < 2:
        return pairs
    order = sorted(pairs, key=lambda t: -t[0])
    tol = mpmath.mpf(10) ** (5 - mpmath.mp.dps)
    out = [order[0]]
    for n, v in order[1:]:
        if any(abs(v - u) <= tol * max(abs(u), abs(v)) for _, u in out):
            continue
        out.append((n, v))
    if len(out) < min_core or len(out) == len(pairs):
        return pairs
    info["repeats_dropped"] = len(pairs) - len(out)
    return out


def band_from_candidates(vals: Sequence, n_used: Sequence[int], *, floor=0, safety=4,
                         n_top: int = 4, min_core: int = 3, nearest_far: bool = False):
    """Estimate (real numbers) or pair of Estimates (complex) from candidate values.

    Parameters
    ----------
    vals : candidate values (``None`` for rejected ones)
    n_used : terms used by each candidate
    floor : smallest half-width allowed (quadrature error, input digits)
    safety : factor applied to the extrapolated error
    n_top : how many of the highest term counts form the value

    Returns ``(estimate_re, estimate_im_or_None, info)``; ``estimate_re`` is
    ``None`` when fewer than ``min_core`` candidates survive.

    Notes
    -----
    The value is the median of the three surviving candidates with the most
    terms. The band is ``safety`` times the larger of (a) the spread of those
    three around the value (one isolated spike, a
    Froissart doublet, is set aside unless it is the candidate with the most terms) and (b) the error at the full term
    count extrapolated from the lower-order candidates: their distances from
    the value, made monotone (largest distance at or above each term count),
    are fitted by ``log10 d = a + b n`` and by ``log10 d = a' + b' sqrt(n)``
    and the larger of the two lines continued to the full term count is kept
    (geometric and sub-geometric convergence), multiplied by ``10^(1.5 rms)``
    where ``rms`` is the scatter (in decades) of the distances about the
    geometric line (``10^(0.5 rms)`` without ``nearest_far``): approximants converge irregularly.
    When the lower orders do not approach the value
    (``b >= 0``) the band is their largest distance instead and
    ``info["converging"]`` is False. With ``nearest_far`` the extrapolated
    error is at least the distance of the highest lower-order candidate (used
    for Borel sums, whose sequences tend to plateau). The band is at least
    ``floor`` and the working-precision floor.
    """
    pairs = [(n, v) for n, v in zip(n_used, vals) if v is not None and mpmath.isfinite(abs(v))]
    info = {"n_candidates": len(vals), "n_finite": len(pairs)}
    pairs = _distinct(pairs, min_core, info)
    if len(pairs) < min_core:
        info["how"] = f"only {len(pairs)} usable approximants (need {min_core})"
        return None, None, info
    pairs.sort(key=lambda t: -t[0])
    cplx = any(isinstance(v, mpmath.mpc) and v.imag != 0 for _, v in pairs)
    nmax = pairs[0][0]
    tops = [(n, v) for n, v in pairs if n > nmax - n_top]
    far = [(n, v) for n, v in pairs if n <= nmax - n_top]
    if len(tops) < 3:
        tops, far = pairs[:3], pairs[3:]
    head = tops[:3]
    vre = _med([mpmath.re(v) for _, v in head])
    vim = _med([mpmath.im(v) for _, v in head]) if cplx else mpmath.mpf(0)
    center = mpmath.mpc(vre, vim)
    dtop = sorted(abs(v - center) for _, v in head)
    spike = len(dtop) >= 3 and dtop[-1] > 30 * max(dtop[-2], mpmath.mpf(10) ** (-mpmath.mp.dps))
    if spike and max(head, key=lambda t: abs(t[1] - center))[0] == head[0][0]:
        # the odd one out is the approximant with the most terms: the two below it may sit on
        # a plateau it has left (measured: (1+x)^(1/2) + (1+x/2)^(-1/3) from 40 terms at x = 100,
        # the top one 6e-10 from the truth, the other two 4e-9 away and 8e-11 apart); its
        # distance stays in the band
        spike = False
    top_spread = dtop[-2] if spike else dtop[-1]
    info["top_spike_set_aside"] = bool(spike)
    extrap = None
    converging = True
    if len(far) >= 3:
        dist = [(n, abs(v - center)) for n, v in far]
        dist.sort(key=lambda t: t[0])                      # increasing n
        env, run = [], mpmath.mpf(0)
        for n, d in reversed(dist):                        # from high n down: running max
            run = max(run, d)
            env.append((n, run))
        env.reverse()
        pts = [(mpmath.mpf(n), mpmath.log10(d)) for n, d in env if d > 0]
        fit = _line_fit([p[0] for p in pts], [p[1] for p in pts]) if len(pts) >= 3 else None
        # the same in sqrt(n): slower (sub-geometric) convergence, common for
        # approximants of functions with cuts; the larger extrapolation is kept
        fit2 = (_line_fit([mpmath.sqrt(p[0]) for p in pts], [p[1] for p in pts])
                if len(pts) >= 3 else None)
        if fit is not None and fit[1] < 0:
            a, b = fit
            extrap = mpmath.mpf(10) ** (a + b * nmax)
            info["extrapolated_geometric"] = mpmath.nstr(extrap, 5)
            if fit2 is not None:
                e2 = mpmath.mpf(10) ** (fit2[0] + fit2[1] * mpmath.sqrt(nmax))
                info["extrapolated_sqrt"] = mpmath.nstr(e2, 5)
                extrap = max(extrap, e2)
            # approximants converge irregularly (plateaus, jumps): inflate by the scatter of the
            # distances about the fitted line (rms, in decades)
            rms = mpmath.sqrt(sum((y - (a + b * x)) ** 2 for x, y in pts) / len(pts))
            # weight of the scatter: 1/2 for approximant sequences in the expansion (or disk)
            # variable, where the spread of the top candidates already covers the irregular
            # cases; 3/2 for Borel sums (nearest_far), whose sequences plateau. Measured on
            # 41 cases with outside truths (studies/accuracy): with 1/2 the band stayed above
            # 2.7x the actual error everywhere, the largest ratio fell from 893 to ~300
            extrap *= mpmath.mpf(10) ** ((mpmath.mpf(3) / 2 if nearest_far else mpmath.mpf(1) / 2) * rms)
            info["decay_digits_per_term"] = mpmath.nstr(-b, 4)
            if fit2 is not None and fit2[1] < 0:
                info["decay_digits_per_sqrt_term"] = mpmath.nstr(-fit2[1], 4)
            info["fit_scatter_decades"] = mpmath.nstr(rms, 3)
        else:
            converging = False
            extrap = max(d for _, d in dist)
    elif far:
        extrap = max(abs(v - center) for _, v in far)
    if nearest_far and far:
        # conservative variant (Borel sums, whose approximant sequences plateau): the error is
        # taken to be at least the distance of the nearest lower-order candidate
        extrap = max(extrap or 0, abs(far[0][1] - center))
    info["converging"] = converging
    w = max(top_spread, extrap or 0) * safety
    fl = max(mpmath.mpf(floor), abs(center) * mpmath.mpf(10) ** (3 - mpmath.mp.dps))
    w = max(w, fl)
    est_re = Estimate(vre, vre - w, vre + w)
    est_im = Estimate(vim, vim - w, vim + w) if cplx else None
    info["n_top"] = len(tops)
    info["n_far"] = len(far)
    info["top_spread"] = mpmath.nstr(top_spread, 5)
    info["extrapolated_error"] = None if extrap is None else mpmath.nstr(extrap, 5)
    info["how"] = (f"value: median of the 3 highest-order approximants; band: {safety} x the larger of "
                   f"the spread of the {len(tops)} highest and the error extrapolated from {len(far)} "
                   "lower orders (log-linear fit of their distances), at least the numerical floor")
    return est_re, est_im, info


@dataclass
class PointOutcome:
    """One method's verdict at one point (internal; wrapped by resum.resummation)."""

    re: Optional[Estimate]
    im: Optional[Estimate]
    ok: bool
    reason: str = ""
    info: dict = field(default_factory=dict)


def supports_no_digit(re: Estimate, im: Optional[Estimate]) -> bool:
    """True when the band supports less than one significant digit of the value (relative to
    its modulus, so that a value with a tiny real part and a large imaginary part is judged as
    the complex number it is). An exact zero with any band is left alone."""
    size = abs(re.value) if im is None else mpmath.hypot(re.value, im.value)
    err = re.error if im is None else max(re.error, im.error)
    return size != 0 and err * 10 > size


def outcomes_from_table(table, n_used, *, floors=None, safety=4, min_core=3):
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
