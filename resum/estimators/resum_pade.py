"""Padé evaluation of a series at points inside and outside its disk of convergence.

The value at ``x`` is taken from the near-diagonal approximants ``[L/M]``
built from the last few term counts (``n_terms``, ``n_terms - 1``, ...);
approximants with a pole within ``pole_tol * |x|`` of the point are dropped
(a Froissart doublet or a genuine singularity sitting on the point), and the
band is the spread of the stable rest (see
:func:`resum.estimators.resum_band.band_from_candidates`).

>>> import mpmath
>>> from resum.context import workdps
>>> with workdps(40):
...     c = [mpmath.mpf(-1) ** n / (n + 1) for n in range(40)]      # log(1+x)/x
...     out, diag = pade_evaluate(c, [mpmath.mpf(3)], 40)
...     ok = out[0].re.contains(mpmath.log(4) / 3)
>>> ok, out[0].re.digits() > 15
(True, True)

Notes
-----
The band estimates the error from the disagreement of approximants of
neighbouring orders; it is not a bound. Outside the disk the Padé sequence
converges (in capacity) to a function with the approximants' poles tracing
the cuts; points on or next to a cut are rejected rather than guessed.

Applicability
-------------
Meromorphic functions and functions with a few cuts; slow for functions with
a natural boundary; for factorially divergent series use the Borel methods.

References
----------
.. [1] G. A. Baker Jr. and P. Graves-Morris, *Padé Approximants*, 2nd ed.,
   Cambridge University Press (1996), chapters 1-2 and 6 (convergence, defects).
.. [2] J. Gilewicz and M. Pindor, "Padé approximants and noise: a case of
   geometric series", J. Comput. Appl. Math. 87 (1997) 199 (Froissart doublets).
"""
from __future__ import annotations

from typing import Callable, Optional, Sequence

import flint
import mpmath

from ..transforms._arb import flint_precision, to_acb
from .resum_band import candidate_orders, fit_candidates, outcomes_from_table, supports_no_digit
from ..results import sig_text

__all__ = ["pade_evaluate", "partial_sum_evaluate"]


def pade_evaluate(c: Sequence, zs: Sequence, dps: int, *, n_orders: int = 7,
                  offsets: Sequence[int] = (0,), pole_tol=mpmath.mpf("0.01"),
                  post: Optional[Callable] = None, safety=4, keep_poles_beyond=None):
    """Padé values with bands at the points ``zs`` (in the variable of ``c``).

    Parameters
    ----------
    c : coefficients from z^0 (mpmath numbers at working precision, or exact)
    zs : evaluation points
    dps : digits for the linear algebra (the caller's working precision)
    n_orders : how many lower term counts are used to extrapolate the band
        (see :func:`~resum.estimators.resum_band.candidate_orders`)
    offsets : approximate ``L - M`` offsets tried per term count
    pole_tol : an approximant is dropped at ``z`` if a pole lies within ``pole_tol * |z|``
    post : optional ``post(j, value)`` applied to each candidate value at point ``j``
        (used to undo a prefactor), before the band is formed
    keep_poles_beyond : optional radius; poles at or beyond it never cause a rejection
        (the disk variable of a conformal map: the function may have genuine poles on the
        rim, e.g. ``sqrt(1 + x)`` at ``w = 1``, and a point near the rim must not lose every
        approximant to them)

    Returns
    -------
    (outcomes, diagnostics): one :class:`~resum.estimators.resum_band.PointOutcome`
    per point; diagnostics hold the table of candidate values per order.
    """
    N = len(c)
    orders = candidate_orders(N, n_orders, offsets)
    table = [[None] * len(orders) for _ in zs]
    dropped = [[] for _ in zs]
    fits, singular = fit_candidates(c, orders, dps)
    tols = [pole_tol * max(abs(z), mpmath.mpf(10) ** -10) for z in zs]
    for i, r in fits:
        L, M = orders[i][1], orders[i][2]
        # the roots of Q only where the disk tests cannot tell (most approximants have no
        # pole near any point, and the roots cost more than the rest of the evaluation)
        counts = _pole_counts(r.q, zs, tols, dps) if M > 0 else [0] * len(zs)
        inside = [c is not None and c > 0 and (keep_poles_beyond is None
                                               or abs(z) + t < keep_poles_beyond)
                  for c, z, t in zip(counts, zs, tols)]
        undecided = any(c is None or (c > 0 and not ok) for c, ok in zip(counts, inside))
        # (to 30 digits: they are compared with a tolerance of pole_tol * |z| and shown with 8;
        # the coefficients keep all dps digits, since the roots are ill-conditioned)
        poles = r.poles(dps, tol_digits=min(dps, 30)) if undecided else []
        for j, z in enumerate(zs):
            tol = tols[j]
            if inside[j]:
                dropped[j].append(f"[{L}/{M}]: at least {counts[j]} pole(s) within {sig_text(tol, 3)} of "
                                  "the point (Pellet's test)")
                continue
            near = [p for p in poles if abs(p - z) < tol
                    and not (keep_poles_beyond is not None and abs(p) >= keep_poles_beyond)]
            if near:
                dropped[j].append(f"[{L}/{M}]: pole at {mpmath.nstr(near[0], 8)}")
                continue
            v = r(z)
            table[j][i] = post(j, v) if post else v
    ns = [o[0] for o in orders]
    outs = outcomes_from_table(table, ns, safety=safety)
    _mark_cut_points(fits, zs, outs, dps, keep_poles_beyond)
    for j, o in enumerate(outs):
        o.info["dropped_for_poles"] = dropped[j]
        o.info["orders"] = [f"[{L}/{M}]" for _, L, M in orders]
        o.info["values"] = [None if v is None else mpmath.nstr(v, 45) for v in table[j]]
    return outs, {"n_singular_systems": singular, "orders": [list(o) for o in orders]}


def _mark_cut_points(fits, zs, outs, dps, keep_poles_beyond=None):
    """Where the approximants gave no usable value at a real point, say whether the point
    lies among the real poles of the approximant with the most terms: poles on both sides of
    it on the same half-axis, the nearest closer than half the point's distance from 0. That
    is how Padé approximants trace a branch cut (common practice, no source; Baker and
    Graves-Morris ch. 6), where the function's value depends on the side the point is
    approached from. Sets ``info["cut_hint"]`` (a sentence) on those outcomes. The roots are
    computed only when a real point failed (they cost more than the evaluation)."""
    poor = [j for j, (z, o) in enumerate(zip(zs, outs))
            if (not o.ok or o.re is None or supports_no_digit(o.re, o.im))
            and not isinstance(z, mpmath.mpc) and z != 0
            and (keep_poles_beyond is None or abs(z) < keep_poles_beyond)]
    if not poor or not fits:
        return
    r = max(fits, key=lambda f: len(f[1].p) + len(f[1].q))[1]
    if len(r.q) < 3:
        return
    try:
        poles = [complex(p) for p in r.poles(dps, tol_digits=min(dps, 30))]
    except Exception:  # noqa: BLE001 - a hint only; no roots, no hint
        return
    real = [p.real for p in poles if abs(p.imag) <= 1e-8 * max(abs(p), 1e-300)]
    for j in poor:
        z = float(zs[j])
        side = [p for p in real if p * z > 0]
        below = [p for p in side if abs(p) < abs(z)]
        above = [p for p in side if abs(p) > abs(z)]
        if len(below) < 2 or not above:
            continue
        if min(abs(p - z) for p in side) > abs(z) / 2:
            continue
        start = min(below, key=abs)
        outs[j].info["cut_hint"] = (
            f"the approximants' poles line the real axis around x = {mpmath.nstr(zs[j], 6)} (from about "
            f"{start:.4g} outwards, {len(below)} of them between 0 and the point): it most likely lies on a branch "
            "cut, where the value depends on the side; add a small imaginary part (for example 1e-6*I) "
            "to pick one, or try --method conformal-pade")


#: Pellet's test is tried for up to this many roots in a disk
PELLET_MAX = 4


def _pole_counts(q: Sequence, zs: Sequence, tols: Sequence, dps: int) -> list:
    """Per point, what disk tests prove about the roots of ``q`` within ``tols[j]`` of
    ``zs[j]``: 0 (none), a positive ``k`` (at least ``k``: exactly ``k`` when proved for the
    disk itself), or None (the tests cannot tell; the caller computes the roots).

    Pellet's theorem on the shifted polynomial ``q(z + t) = sum a_k t^k``: if
    ``|a_k| rho^k > sum_(j != k) |a_j| rho^j`` then ``q`` has exactly ``k`` roots in
    ``|t| < rho`` (k = 0 is Rouché's test against the constant; M. Marden, *Geometry of
    Polynomials*, AMS 1966, sec. 28, from memory). Tried at ``rho = tol``, then for "none" at
    2 and 4 ``tol`` (no root in a larger disk) and for "some" at ``tol/2`` and ``tol/4`` (roots
    in a smaller one), k up to :data:`PELLET_MAX`. The shift and the sums run in ball
    arithmetic, so every answer is rigorous for the coefficients as given."""
    out = []
    with flint_precision(dps + 10):
        Q = flint.acb_poly([to_acb(v) for v in q])
        for z, tol in zip(zs, tols):
            a = [abs(ak) for ak in Q(flint.acb_poly([to_acb(z), 1])).coeffs()]
            if not a:
                out.append(None)
                continue
            rho = to_acb(tol).real
            found = _pellet(a, rho)
            if found is None:
                for f in (2, 4):
                    if _pellet(a, rho * f, only_zero=True) == 0:
                        found = 0
                        break
            if found is None:
                for f in (2, 4):
                    k = _pellet(a, rho / f)
                    if k:
                        found = k
                        break
            out.append(found)
    return out


def _pellet(a, rho, only_zero=False):
    """The ``k`` (at most :data:`PELLET_MAX`) for which Pellet's inequality holds for the
    moduli ``a`` of the shifted coefficients at radius ``rho``, or None."""
    terms, rk = [], flint.arb(1)
    for ak in a:
        terms.append(ak * rk)
        rk = rk * rho
    total = sum(terms[1:], terms[0])
    for k in range(1 if only_zero else min(PELLET_MAX, len(terms) - 1) + 1):
        if 2 * terms[k] > total:
            return k
    return None


def partial_sum_evaluate(c: Sequence, zs: Sequence, dps: int, *, n_orders: int = 7, safety=4):
    """Partial sums as candidates (for points well inside the disk of convergence)."""
    from .resum_band import PointOutcome, band_from_candidates
    N = len(c)
    outs = []
    for z in zs:
        s, zp, vals = 0, 1, []
        for k in range(N):
            s = s + c[k] * zp
            zp = zp * z
            vals.append(s)
        ns = sorted({o[0] for o in candidate_orders(N, n_orders)}, reverse=True)
        cand = [vals[n - 1] for n in ns]
        tail = abs(c[-1] * z ** (N - 1))
        re, im, info = band_from_candidates(cand, ns, floor=tail, safety=safety)
        if re is None:
            outs.append(PointOutcome(None, None, False, info.get("how", ""), info))
        else:
            outs.append(PointOutcome(re, im, True, "", info))
    return outs, {}
