"""All roots of a polynomial with a precise midpoint, fast: double-precision starting values,
Aberth sweeps whose Newton quotients come from FLINT at moderate precision, Newton steps at
rising precision, and an inclusion test that proves each root isolated.

``refined_roots(poly, prec, tol)`` returns a list of ``acb`` balls, one per root of the
polynomial whose coefficients are the midpoints of ``poly``'s (as ``acb_poly.roots`` does with
an exact polynomial), each of radius at most ``tol`` (absolute, as for ``acb_poly.roots``), or
None when any stage fails (clustered or multiple roots, a starting value that does not
converge): the caller then uses ``acb_poly.roots``, which isolates from scratch. Where only the inclusion
discs come out too wide (the roots converged, but ``|p(z_i)|`` is rounding at the bits used and
clustered roots magnify it), Newton steps at more bits and a new test come first
(:data:`INCLUSION_RETRIES`).

Why: on the Padé denominators of the conformal-Padé tables (degree about 100, coefficients at
640 bits, roots to 2^-629), ``acb_poly.roots`` took 85-130 ms per polynomial and root finding was
about 70 % of an ``evaluate`` of a 200-term series at ten points; this takes 53-65 ms (the
roots there need about 1300 bits to be pinned down), and to 2^-250 about 45-50 ms against 60.
The estimators' Padé poles, which are only compared with a tolerance of 1 % of the point, are
asked to 30 digits. On the far worse conditioned denominators of log(1+x)/x (studies/performance,
roots table) it is no faster than Arb at degree 25-50, and at degree 100 it gives up after about
0.15 s (Arb then takes 0.35 s). Together: that ``evaluate`` 5.1 s instead of 8.4 s on one
core (studies/performance/README.md, "Roots for the estimators").

How the result is checked. With ``z_1 .. z_n`` distinct and the Weierstrass corrections
``W_i = p(z_i) / (a_n prod_(j != i) (z_i - z_j))``, the roots of ``p`` are the eigenvalues of
``diag(z) - W 1^T``; by Gerschgorin's theorem every root lies in a disc ``|z - z_i| <= n |W_i|``
and a disc disjoint from the others holds exactly one (B. T. Smith, "Error bounds for zeros of
a polynomial based upon Gerschgorin's theorems", J. ACM 17 (1970) 661-674; from memory). ``p(z_i)``
is a FLINT ball (its upper end is used); the product is taken in doubles from the roots'
double values, which the test requires to be separated by at least 1e-10 of their size, and the
radius is doubled for the rounding of that product.
"""
from __future__ import annotations

import math
from typing import Optional

import flint
import numpy as np

__all__ = ["refined_roots", "roots"]

#: Aberth sweeps before giving up (degree 100 needed 11-34 on the
#: conformal-Padé denominators measured) ...
MAX_SWEEPS = 50
#: ... unless roots are still settling: the sweeps go on (up to :data:`MAX_SWEEPS_SETTLING`)
#: while some root stopped moving in the last :data:`STALL_SWEEPS` sweeps. On the Padé
#: denominators of a 200-term series with a branch point (poles crowding along its cut, the
#: double-precision seeds poor) 80 sweeps were needed: 0.27 s against 0.14 s wasted plus 0.35 s
#: for ``acb_poly.roots``, at degree 100 and 730 bits
MAX_SWEEPS_SETTLING = 200
STALL_SWEEPS = 25
#: relative size of an Aberth correction below which a root stops moving (double precision)
SWEEP_TOL = 1e-13
#: bits of the Aberth stage (the Newton quotients only need a few correct digits)
SWEEP_BITS = 128
#: rounds of Newton steps at more bits when the inclusion discs come out wider than the
#: tolerance (or touch) before the caller's fallback isolates from scratch
INCLUSION_RETRIES = 2


def _to_complex(x) -> complex:
    """An acb's midpoint as a Python complex (inf or 0 outside the double range)."""
    return complex(float(x.real.mid()), float(x.imag.mid()))


def _clear(q) -> bool:
    """A Newton quotient whose rounding (its radius) is at most an eighth of its size; otherwise
    it is mostly rounding and no step is taken on it."""
    size = abs(q)
    return size.rad() <= size.mid() / 8


def _seeds(mids) -> Optional[np.ndarray]:
    """Double-precision roots of the polynomial with acb coefficients ``mids`` (low to high),
    after ``z -> 2^e z`` balancing the lowest and the highest coefficient."""
    n = len(mids) - 1
    mags = []
    for c in mids:
        a = abs(c)
        mags.append(None if a == 0 else float(a.log().mid()) / math.log(2))
    if mags[0] is None or mags[n] is None:
        return None
    e = int(round((mags[0] - mags[n]) / n))
    top = int(math.ceil(max(m - e * k for k, m in enumerate(mags) if m is not None)))
    arr = []
    for k in range(n, -1, -1):
        c = mids[k]
        if c == 0:
            arr.append(0j)
            continue
        s = flint.arb(2) ** (e * k - top)
        arr.append(_to_complex(c * s))
    arr = np.array(arr, dtype=complex)
    if not np.all(np.isfinite(arr)) or arr[0] == 0:
        return None
    try:
        g = np.roots(arr)
    except (ValueError, np.linalg.LinAlgError):
        return None
    g = g * 2.0 ** e
    if len(g) != n or not np.all(np.isfinite(g)):
        return None
    return g


def _aberth(mid, dmid, zc: np.ndarray, bits: int, top: int):
    """Aberth-Ehrlich sweeps from ``zc`` with Newton quotients at ``bits`` (raised, up to
    ``top``, while a quotient is mostly rounding: the coefficients of a Padé denominator can
    cancel by hundreds of digits); a root stops moving once its correction is below
    :data:`SWEEP_TOL` of it (the others keep using its value). Returns ``(roots, bits)``, or
    ``(None, bits)``."""
    active = np.arange(len(zc))
    last_settled, sweep = 0, 0
    while sweep < MAX_SWEEPS or (sweep < MAX_SWEEPS_SETTLING and sweep - last_settled < STALL_SWEEPS):
        sweep += 1
        flint.ctx.prec = bits
        z = [flint.acb(complex(zc[i])) for i in active]
        pv = mid.evaluate(z, algorithm="iter")
        dv = dmid.evaluate(z, algorithm="iter")
        quot = [a / b for a, b in zip(pv, dv)]
        # mostly rounding, and not already below the size at which a root stops moving
        if any(not _clear(q)
               and not (abs(q).mid() + abs(q).rad() <= SWEEP_TOL * abs(zi).mid())
               for q, zi in zip(quot, z)):
            if bits >= top:
                return None, bits
            bits = min(top, 2 * bits)
            continue
        N = np.array([_to_complex(q) for q in quot])
        d = zc[active][:, None] - zc[None, :]
        d[np.arange(len(active)), active] = np.inf
        with np.errstate(divide="ignore", invalid="ignore"):
            w = N / (1 - N * np.sum(1.0 / d, axis=1))
        if not np.all(np.isfinite(w)):
            return None, bits
        zc[active] = zc[active] - w
        if not np.all(np.isfinite(zc[active])):
            return None, bits
        with np.errstate(over="ignore"):        # a huge step is simply still moving
            rel = np.abs(w) / np.maximum(np.abs(zc[active]), 1e-300)
        moving = active[rel >= SWEEP_TOL]
        if len(moving) < len(active):
            last_settled = sweep
        active = moving
        if len(active) == 0:
            return zc, bits
    return None, bits


def _warm_seeds(mid, dmid, cold: np.ndarray, seeds, prec: int) -> np.ndarray:
    """Starting values from the roots of a neighbouring polynomial (``seeds``, complex): all of
    them when there are as many as roots; when fewer, completed by the double-precision seeds
    farthest from them; when more, those with the smallest Newton step on ``mid`` kept."""
    n = len(cold)
    warm = np.array([complex(v) for v in seeds], dtype=complex)
    warm = warm[np.isfinite(warm)]
    if len(warm) > n:
        old = flint.ctx.prec
        flint.ctx.prec = min(prec, SWEEP_BITS)
        try:
            pts = [flint.acb(complex(v)) for v in warm]
            steps = []
            vals = mid.evaluate(pts, algorithm="iter")
            ders = dmid.evaluate(pts, algorithm="iter")
            for v, a, b in zip(warm, vals, ders):
                try:
                    steps.append(abs(_to_complex(a / b)) / max(abs(v), 1e-300))
                except ZeroDivisionError:
                    steps.append(math.inf)
        finally:
            flint.ctx.prec = old
        warm = warm[np.argsort(np.nan_to_num(np.array(steps), nan=math.inf))[:n]]
    elif len(warm) < n:
        far = np.min(np.abs(cold[:, None] - warm[None, :]), axis=1) if len(warm) else np.zeros(n)
        warm = np.concatenate([warm, cold[np.argsort(-far)[:n - len(warm)]]])
    # Aberth needs distinct starting values
    d = np.abs(warm[:, None] - warm[None, :])
    np.fill_diagonal(d, np.inf)
    return cold if np.any(d <= 1e-12 * np.maximum(np.abs(warm)[:, None], 1e-300)) else warm


def refined_roots(poly, prec: int, tol, seeds=None) -> Optional[list]:
    """Every root of the midpoint polynomial of ``poly`` (an ``acb_poly`` of degree >= 1) as an
    ``acb`` ball of radius at most ``tol`` (``tol`` a float or an ``arb``),
    computed at ``prec`` bits; None when the fast path cannot prove it (see the module
    docstring). ``seeds``: roots of a neighbouring polynomial (for example the next Padé
    approximant of a table), used as starting values of the sweeps: on the denominators of a
    200-term series' Padé table the sweeps then took 0.02-0.08 s instead of 0.2-0.3 s (degree 100,
    730 bits); a failure from them is retried from the usual seeds."""
    coeffs = poly.coeffs()
    n = len(coeffs) - 1
    if n < 1:
        return []
    old = flint.ctx.prec
    try:
        flint.ctx.prec = prec
        mids = [c.mid() for c in coeffs]
        if mids[0] == 0 or mids[n] == 0:
            return None
        mid = flint.acb_poly(mids)
        dmid = mid.derivative()
        cold = _seeds(mids)
        if cold is None:
            return None
        zc = None
        if seeds is not None and len(seeds):
            zc, bits = _aberth(mid, dmid, _warm_seeds(mid, dmid, cold.copy(), seeds, prec),
                               min(prec, SWEEP_BITS), prec)
        if zc is None:
            zc, bits = _aberth(mid, dmid, cold, min(prec, SWEEP_BITS), prec)
        if zc is None:
            return None
        # separated in doubles (the product below is taken there)
        d = np.abs(zc[:, None] - zc[None, :])
        size = np.maximum(np.abs(zc)[:, None], np.abs(zc)[None, :])
        np.fill_diagonal(d, np.inf)
        if np.any(d <= 1e-10 * size):
            return None
        # Newton steps at rising precision (quadratic convergence from double accuracy), up to
        # the bits the tolerance needs; above them while a step's own rounding (its radius) is
        # larger than the tolerance allows: an ill-conditioned root is rounding noise there.
        # At most 4 prec bits, as acb_poly.roots allows itself.
        z = [flint.acb(complex(v)) for v in zc]
        lim = tol if isinstance(tol, flint.arb) else flint.arb(tol)
        want = lim / (8 * n)
        need = int(-float((want.mid()).log()) / math.log(2)) + 20 if want > 0 else prec
        need, top = min(max(need, 64), 4 * prec), 4 * prec
        bits = max(bits // 2, 40)      # the Aberth stage's bits gave quotients with digits to spare
        for _ in range(INCLUSION_RETRIES + 1):
            got = _newton(mid, dmid, z, bits, need, top, want)
            if got is None:
                return None
            bits, need = got
            res = _inclusion(mid, z, n, bits + 64, abs(mids[n]), lim)
            if isinstance(res, list):
                return res
            # the discs are too wide for the tolerance (or touch): |p(z_i)| is rounding at these
            # bits, and clustered roots multiply it by the product over their neighbours. More
            # bits shrink it; the roots are already close, so one or two Newton steps at the
            # higher precision suffice (on the 200-loop kernel series' Pade denominators, roots
            # to 1e-225: 16 of 128 calls, which went to acb_poly.roots at about 0.1 s each)
            if res is None or need >= top:
                return None
            need = min(top, need + int(res) + 64)
        return None
    finally:
        flint.ctx.prec = old


def _newton(mid, dmid, z, bits, need, top, want):
    """Newton steps on every root in ``z`` (updated in place) at rising precision, up to
    ``need`` bits (raised, up to ``top``, while a step is mostly rounding). Returns the final
    ``(bits, need)``, or None."""
    n = len(z)
    active = list(range(n))
    prev = {}                       # the size of each root's last step
    for _ in range(60):
        bits = min(need, 2 * bits + 20) if bits < need else bits
        flint.ctx.prec = bits
        pts = [z[i] for i in active]
        pv = mid.evaluate(pts, algorithm="iter")
        dv = dmid.evaluate(pts, algorithm="iter")
        still, noisy = [], False
        for i, a, b in zip(active, pv, dv):
            try:
                si = a / b
            except ZeroDivisionError:
                return None
            size = abs(si)
            clear = _clear(si)
            if clear:                            # a step that is mostly rounding is not taken
                z[i] = (z[i] - si).mid()
            # quadratic convergence: the step after this one would be about K size^2, with
            # K = size / (last size)^2; when that is far below the tolerance, at the full
            # bits, the root is done without one more evaluation (the inclusion test below
            # checks it; measured on Padé denominators of degree 100 at 730 bits: three
            # evaluations instead of four)
            last = prev.get(i)
            prev[i] = size.mid()
            done_early = (clear and bits >= need and last is not None and last > 0
                          and size.mid() ** 3 <= want * last ** 2 / 1024)
            if not done_early and (bits < need or size.mid() + size.rad() > want):
                still.append(i)
                noisy = noisy or size.rad() > want / 2
        active = still
        if not active:
            return bits, need
        if bits >= need and noisy:
            if need >= top:
                return None
            need = min(top, 2 * need)
    return None


def _inclusion(mid, z, n, prec, lc, lim):
    """The inclusion test of the module docstring at ``prec`` bits: the roots as balls of
    radius at most ``lim`` (a list), or, when a disc is wider than ``lim`` or two discs
    touch, the bits by which the widest disc misses (a float; None when the roots met or a
    value is not finite)."""
    # the inclusion test above the precision the steps needed (its rounding enters the radii)
    # inclusion discs |z - z_i| <= n |W_i|, doubled for the double-precision product
    flint.ctx.prec = prec
    pv = mid.evaluate(z, algorithm="iter")
    zc = np.array([_to_complex(v) for v in z])
    sep = np.abs(zc[:, None] - zc[None, :])
    np.fill_diagonal(sep, 1.0)
    with np.errstate(divide="ignore", invalid="ignore"):   # roots that met: -inf, refused below
        logprod = np.sum(np.log(sep), axis=1)
    if not np.all(np.isfinite(logprod)):
        return None
    out = []
    rads = []
    wide = 0.0
    for zi, v, lp in zip(z, pv, logprod):
        a = abs(v)
        up = a.mid() + a.rad()
        r = 2 * n * up / lc * flint.arb(-float(lp)).exp()
        r = r.mid() + r.rad()
        if not r <= lim:
            if not (r.is_finite() and r > 0):
                return None
            wide = max(wide, float((r / lim).log()) / math.log(2))
        rads.append(float(r) if r > 0 else 0.0)
        out.append((zi, r))
    if wide > 0:
        return wide
    rr = np.array(rads)
    np.fill_diagonal(sep, np.inf)
    touch = sep <= 2 * (rr[:, None] + rr[None, :])
    if np.any(touch):
        # by how much the discs would have to shrink for the closest pair to part
        with np.errstate(divide="ignore"):
            ratio = np.max(np.where(touch, 2 * (rr[:, None] + rr[None, :]) / sep, 0))
        return max(1.0, math.log2(ratio)) if np.isfinite(ratio) else None
    return [flint.acb(flint.arb(zi.real.mid(), r), flint.arb(zi.imag.mid(), r)) for zi, r in out]


def roots(poly, prec: int, tol, maxprec: int, seeds=None) -> list:
    """The roots of ``poly``'s midpoint polynomial as balls of radius at most ``tol``: by
    :func:`refined_roots` (``seeds``: starting values, see there), else by
    ``acb_poly.roots(tol, maxprec)`` (which raises ValueError when it cannot isolate them, as
    for multiple roots)."""
    out = refined_roots(poly, prec, tol, seeds)
    return out if out is not None else poly.roots(tol=tol, maxprec=maxprec)
