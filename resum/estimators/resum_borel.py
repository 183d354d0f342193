"""Borel-Padé and Borel-conformal-Padé summation, with lateral sums.

Steps, for a series ``sum c_n x^n`` with factorially growing coefficients:

1. Borel-Le Roy transform ``B(t) = sum c_n t^n / Gamma(n + 1 + b)``.
2. Continue ``B`` beyond its disk: near-diagonal Padé approximants in ``t``
   (``borel-pade``) or, after a conformal map of the Borel plane cut from its
   nearest singularity (``borel-conformal-pade``), Padé in the disk variable
   ``w``.
3. Laplace integral ``f(x) = int_0^inf exp(-u) u^b B(x u) du`` at working
   precision (tanh-sinh quadrature, path split at the scale of the nearest
   Borel singularity).

An approximant is dropped at a point when one of its poles (with a residue
that matters at this precision) lies within ``path_tol`` (relative) of the
integration path before the exponential has killed the integrand. A pole on
the path that is one half of a Froissart doublet (a zero within
:func:`resum.estimators.pade_sing.doublet_tolerance` of it) whose contribution
is within ``_DOUBLET_SLACK`` of the noise of the digits asked for is cancelled
against its zero instead; the approximant is integrated without the pair and
its error grows by an estimate of the pair's principal-value contribution
(:func:`_doublet_bound`). Inexact input makes such pairs (noise in the last
digits of the Borel transform); dropping every approximant that carries one
left too few to form a band.

When the approximants have a stable pole on the integration ray itself (a
singularity of ``B`` on the positive axis: the series is not Borel
summable), the integral is done along two rays turned by ``+-theta`` (no
approximant pole between them and the axis). These are the lateral sums
``S+`` and ``S-``. The reported value is their average and the imaginary
part ``(S+ - S-)/(2i)`` is reported as the ambiguity, to be compared with
``exp(-A/x)`` for a singularity at ``t = A``.

>>> import mpmath
>>> from resum.context import workdps
>>> with workdps(30):
...     c = [(-1) ** n * mpmath.factorial(n) for n in range(24)]      # Euler series
...     out, _ = borel_evaluate(c, [mpmath.mpf(1)], 30)
...     truth = mpmath.e * mpmath.e1(1)          # e^{1/x} E_1(1/x)/x at x = 1
...     ok = out[0].re.contains(truth)
>>> ok, out[0].re.digits() > 20
(True, True)

Notes
-----
The band is the spread of the stable approximants (see
:func:`resum.estimators.resum_band.band_from_candidates`), never smaller than
the quadrature error estimate. It is an estimate, not a bound.

References
----------
.. [1] J. Zinn-Justin, *Quantum Field Theory and Critical Phenomena* (Oxford),
   chapter "Divergence of perturbation theory and summation methods".
.. [2] O. Costin and G. V. Dunne, "Conformal and uniformizing maps in Borel
   analysis", Eur. Phys. J. Spec. Top. 230 (2021) 2679, arXiv:2108.01145.
.. [3] C. M. Bender and S. A. Orszag, *Advanced Mathematical Methods for
   Scientists and Engineers*, McGraw-Hill (1978), section 8.2 (Borel summation,
   Stieltjes series).
"""
from __future__ import annotations

import math
from typing import Optional, Sequence

import flint
import mpmath
import numpy as np

from .._kernels.flint_bridge import flint_prec
from ..transforms._arb import acb_to_mp, arb_to_mp, to_acb
from ..transforms.borel import borel_coefficients, laplace
from ..transforms.conformal import ConformalMap, RayMap
from .pade_sing import doublet_tolerance
from .resum_band import (PointOutcome, Rational, band_from_candidates, candidate_orders, fast_evaluator,
                         rational_fit)
from .resum_conformal import mapped_coefficients

__all__ = ["borel_evaluate", "borel_plane_poles"]


#: Digits of the Laplace integrals beyond the digits reported (``target_digits``).
QUAD_MARGIN = 15


def _seg_dist(p, a, b):
    ab = b - a
    if ab == 0:
        return abs(p - a)
    tt = mpmath.re((p - a) * mpmath.conj(ab)) / abs(ab) ** 2
    tt = min(max(tt, 0), 1)
    return abs(p - (a + tt * ab))


#: safety factor on the principal-value estimate of a cancelled pair's contribution
#: (:func:`_doublet_bound`; covers the pair's shape away from its pole and complex poles)
_DOUBLET_SAFETY = 10
#: a pair is cancelled when that estimate is within this factor of the input's noise level (the
#: rerun with the input moved by a unit in its last digit makes pairs ten times stronger than
#: rounding does); its estimate joins the approximant's error
_DOUBLET_SLACK = 100


def _divide_root(a, root):
    """``a(w) / (1 - w/root)`` for a polynomial ``a`` (low to high) with a root near ``root``."""
    hi = list(reversed(a))
    out = [hi[0]]
    for coef in hi[1:-1]:
        out.append(coef + root * out[-1])
    return [-root * v for v in reversed(out)]


def _on_axis(z, dps):
    """Whether ``z`` is real to half the working digits (a root of a real polynomial)."""
    return abs(mpmath.im(z)) <= mpmath.mpf(10) ** (-(dps // 2)) * abs(z)


def _real_if(z, real, dps):
    return mpmath.re(z) if real and _on_axis(z, dps) else z


def _is_real(r):
    return not any(isinstance(v, mpmath.mpc) for v in r.p + r.q)


def _without_doublets(r, pairs, dps):
    """The rational ``r`` with each (pole, zero) pair in ``pairs`` cancelled, ``Q(0) = 1`` kept."""
    real = _is_real(r)
    p, q = list(r.p), list(r.q)
    for pole, zero in pairs:
        pole, zero = _real_if(pole, real, dps), _real_if(zero, real, dps)
        q, p = _divide_root(q, pole), _divide_root(p, zero)
    q0 = q[0]
    return Rational(tuple(v / q0 for v in p), tuple(v / q0 for v in q), len(p) - 1, len(q) - 1)


def _doublet_zero(r, pole, dps, tol, zeros_cache):
    """The zero of ``r`` within ``tol`` (relative) of ``pole``, or ``None``."""
    if r.L < 1:
        return None
    if "z" not in zeros_cache:
        zeros_cache["z"] = r.zeros(dps)
    near = [z for z in zeros_cache["z"] if abs(z - pole) < tol * abs(pole)]
    if not near:
        return None
    z = min(near, key=lambda z: abs(z - pole))
    if _is_real(r) and _on_axis(pole, dps) and not _on_axis(z, dps):
        return None         # a real pole must pair with a real zero for the cancellation to stay real
    return z


def borel_plane_poles(r, dps: int, cmap: Optional[ConformalMap] = None):
    """Poles of a Borel-plane approximant with residues, as ``(pole_in_its_variable, residue)``.
    The residues ``P(p) / Q'(p)`` are evaluated by FLINT at the working precision plus 16 bits
    (the midpoints; the same numbers as mpmath's Horner sums to that precision)."""
    poles = r.poles(dps)
    if not poles:
        return []
    with flint_prec(mpmath.mp.prec + 16):
        P = flint.acb_poly([to_acb(v) for v in r.p])
        dQ = flint.acb_poly([to_acb(v) for v in r.q]).derivative()
        out = []
        for p in poles:
            pb = to_acb(p)
            d = dQ(pb)
            if d.is_zero():
                out.append((p, mpmath.inf))
                continue
            out.append((p, acb_to_mp(P(pb) / d)))
    return out


def _ray_integrand(r, cmap, alpha, rim):
    """``t -> r(w(t)) / (1 - w/rim)^alpha`` for the one-cut map, all in FLINT at the current
    mpmath precision plus 16 bits (one conversion in and one out per call; the same numbers as
    the map and :func:`~resum.estimators.resum_band.fast_evaluator` composed in mpmath, several
    times faster: the Laplace integrals call it about a thousand times per approximant)."""
    x0 = mpmath.mpmathify(cmap.x0)
    sg = cmap._sign()
    real = (not isinstance(x0, mpmath.mpc) and not isinstance(sg, mpmath.mpc)
            and not any(isinstance(v, mpmath.mpc) for v in r.p + r.q)
            and not isinstance(mpmath.mpmathify(alpha or 0), mpmath.mpc))
    made = {}

    def setup(bits):
        with flint_prec(bits):
            P = flint.acb_poly([to_acb(v) for v in r.p])
            Q = flint.acb_poly([to_acb(v) for v in r.q])
            inv, sgb = 1 / to_acb(x0), to_acb(sg)
            rimb = None if not alpha else to_acb(rim)
            alb = None if not alpha else to_acb(alpha)
        made[bits] = (P, Q, inv, sgb, rimb, alb)
        return made[bits]

    def F(t):
        bits = mpmath.mp.prec + 16
        P, Q, inv, sgb, rimb, alb = made.get(bits) or setup(bits)
        old = flint.ctx.prec
        flint.ctx.prec = bits
        try:
            tb = to_acb(t)
            sq = (1 - tb * inv).sqrt()
            w = sgb * (sq - 1) / (sq + 1)
            v = P(w) / Q(w)
            if alb is not None:
                v = v / (1 - w / rimb) ** alb
        finally:
            flint.ctx.prec = old
        if real and not isinstance(t, mpmath.mpc) and w.imag.is_zero():
            return arb_to_mp(v.real)
        return acb_to_mp(v)
    return F


def _near_segments(p, pts, tol):
    """Indices ``k`` of the path segments ``pts[k] -> pts[k+1]`` that may pass within ``tol`` of
    ``p``, in order: a double-precision prefilter (segments farther than ``1.5 tol`` are skipped)
    for the exact test of :func:`_seg_dist`; all of them when a number leaves double range."""
    try:
        z = complex(p)
        a = np.array([complex(v) for v in pts[:-1]])
        b = np.array([complex(v) for v in pts[1:]])
        t = float(tol)
    except (OverflowError, ValueError):
        return range(len(pts) - 1)
    if not (np.isfinite(z) and np.all(np.isfinite(a)) and np.all(np.isfinite(b)) and math.isfinite(t)):
        return range(len(pts) - 1)
    ab = b - a
    den = np.abs(ab) ** 2
    with np.errstate(invalid="ignore", divide="ignore"):
        tt = np.where(den > 0, ((z - a) * np.conj(ab)).real / np.where(den > 0, den, 1), 0.0)
    tt = np.clip(tt, 0.0, 1.0)
    dist = np.abs(z - (a + tt * ab))
    return [int(k) for k in np.nonzero(dist <= 1.5 * t + 1e-300)[0]]


def borel_evaluate(c: Sequence, xs: Sequence, dps: int, *, b=0, cmap: Optional[ConformalMap] = None,
                   alpha=None, n_orders: int = 7, offsets: Sequence[int] = (0,), lateral="auto",
                   path_tol=mpmath.mpf("0.002"), safety=4, quad_dps: Optional[int] = None,
                   target_digits: Optional[int] = None):
    """Borel(-Le Roy)-Padé sums with bands at the points ``xs``.

    Parameters
    ----------
    c : coefficients from x^0
    xs : points (non-zero)
    dps : working digits for the approximants
    b : Borel-Le Roy parameter (> -1)
    cmap : conformal map of the Borel plane (``None``: plain Padé in ``t``)
    alpha : optional rim-factor exponent for the mapped transform
    lateral : ``"auto"`` (lateral sums when a stable pole sits on the ray),
        ``"always"`` or ``"never"``
    quad_dps : digits for the Laplace integrals (default ``dps``)
    target_digits : digits the caller reports; a pole of an approximant counts (on the
        integration path, on the ray, for the Borel scale) only if its residue exceeds
        ``10^-(target_digits + 10)`` of the transform's size (default: ``10^-quad_dps``).
        Without it, a rerun at higher precision lost every approximant of a degenerate
        table (a rational Borel transform, 1/(1+t)^3) to pole-zero pairs with residues near
        1e-50 on the path, and the point was marked unstable.

    Returns
    -------
    (outcomes, diagnostics) as for :func:`resum.estimators.resum_pade.pade_evaluate`;
    for lateral sums ``outcome.im`` is the ambiguity ``(S+ - S-)/(2i)`` and
    ``outcome.info`` holds ``S_plus``/``S_minus``.
    """
    qd = dps if quad_dps is None else quad_dps
    if target_digits is not None:
        # the integrals need the digits reported (at most what the input carries) plus guards,
        # not the working precision of a short input's rerun (16-digit input: 31 digits asked
        # at ctx.dps = 16, 36 by the rerun)
        qd = min(qd, int(target_digits) + QUAD_MARGIN)
    d = borel_coefficients(c, b)
    var = "t"
    if cmap is not None:
        d = mapped_coefficients(d, cmap, dps, alpha)
        var = "w"
    N = len(d)
    orders = candidate_orders(N, n_orders, offsets)
    fits = []
    for n, L, M in orders:
        r = rational_fit(d[:n], L, M, dps)
        fits.append(r)
    good = [(o, r) for o, r in zip(orders, fits) if r is not None]
    if not good:
        fail = PointOutcome(None, None, False, "every Padé system of the Borel transform is singular", {})
        return [fail for _ in xs], {"orders": [list(o) for o in orders]}
    polelists = [borel_plane_poles(r, dps) if r is not None and r.M > 0 else [] for r in fits]
    scale_ref = abs(mpmath.mpmathify(fits[0].p[0])) + 1 if fits[0] is not None else 1
    tiny = mpmath.mpf(10) ** (-(qd if target_digits is None else min(qd, int(target_digits) + 10))) * scale_ref

    def to_t(p):
        return cmap.x_of_w(p) if cmap is not None else p

    # the Borel singularity scale: nearest branch point of the map or nearest pole
    if cmap is not None:
        A = min(abs(z) for z in cmap.branch_points())
    else:
        top = [p for p, res in polelists[0] if abs(res) > tiny] if polelists[0] else []
        A = min((abs(p) for p in top), default=mpmath.mpf(1))

    rim = cmap.rim_point() if cmap is not None else None
    # Froissart doublets on the path: cancelled when their contribution is within _DOUBLET_SLACK
    # of the noise of the digits asked for
    asked_digits = qd if target_digits is None else min(qd, int(target_digits))
    asked, pair_tol = mpmath.mpf(10) ** (-asked_digits), doublet_tolerance(asked_digits)
    zeros_of = [{} for _ in fits]

    w_of_t = cmap.w_of_x_at(dps) if cmap is not None else None

    def make_F(r):
        if isinstance(cmap, RayMap):
            return _ray_integrand(r, cmap, alpha, rim)
        r = fast_evaluator(r)
        if cmap is None:
            return r
        if alpha is None or alpha == 0:
            return lambda t: r(w_of_t(t))

        def F(t):
            w = w_of_t(t)
            return r(w) / (1 - w / rim) ** alpha
        return F

    outs = []
    diag = {"orders": [list(o) for o in orders], "borel_b": str(b), "variable": var,
            "borel_scale": mpmath.nstr(A, 12), "map": None if cmap is None else cmap.to_dict()}
    for x in xs:
        x = mpmath.mpmathify(x)
        if x == 0:
            outs.append(PointOutcome(None, None, False, "the Borel sum needs x != 0", {}))
            continue
        direc = x / abs(x)
        s_max = (qd + 5) * mpmath.log(10) + 10
        # is there a stable pole on the ray (lateral case)?
        on_ray = []
        if cmap is None and polelists[0]:
            for p, res in polelists[0]:
                if abs(res) > tiny and abs(mpmath.arg(p / direc)) < mpmath.mpf("1e-3"):
                    on_ray.append(p)
        use_lateral = lateral == "always" or (lateral == "auto" and bool(on_ray))
        if use_lateral and cmap is not None:
            outs.append(PointOutcome(None, None, False, "lateral sums need method borel-pade "
                                     "(the conformal map of the Borel plane cuts the ray)", {}))
            continue
        thetas = [mpmath.mpf(0)]
        if use_lateral:
            offaxis = []
            for p, res in polelists[0]:
                a = abs(mpmath.arg(p / direc))
                if abs(res) > tiny and mpmath.mpf("1e-3") <= a < mpmath.pi / 4:
                    offaxis.append(a)
            th = min([mpmath.pi / 8] + [a / 2 for a in offaxis])
            thetas = [th, -th]
        vals = {th: [None] * len(orders) for th in thetas}
        errs = {th: [mpmath.mpf(0)] * len(orders) for th in thetas}
        dropped, cancelled = [], []
        for i, ((n, L, M), r) in enumerate(zip(orders, fits)):
            if r is None:
                continue
            F = make_F(r)
            for th in thetas:
                e = mpmath.expj(th)
                # the path in the approximant's variable, sampled
                ss = [mpmath.mpf(0)] + [A / abs(x) * mpmath.mpf(2) ** k for k in range(-12, 200)
                                        if A / abs(x) * mpmath.mpf(2) ** k < s_max] + [s_max]
                path = [to_t_inv(x * s * e, cmap) for s in ss]
                bad, pairs, pair_err = None, [], mpmath.mpf(0)
                for p, res in polelists[i]:
                    if abs(res) <= tiny:
                        continue
                    ptol = path_tol * max(abs(p), mpmath.mpf(10) ** -8)
                    for k in _near_segments(p, path, ptol):
                        dist = _seg_dist(p, path[k], path[k + 1])
                        if dist < ptol:
                            weight = mpmath.exp(-ss[k] * mpmath.cos(th))
                            if weight * abs(res) > tiny:
                                bound = _doublet_bound(p, res, x, b, cmap)
                                z = None
                                if bound is not None and bound <= _DOUBLET_SLACK * asked * scale_ref:
                                    z = _doublet_zero(r, p, dps, pair_tol, zeros_of[i])
                                if z is None:
                                    bad = p
                                else:
                                    pairs.append((p, z))
                                    pair_err += bound
                            break
                    if bad is not None:
                        break
                if bad is not None:
                    dropped.append(f"[{L}/{M}] theta={mpmath.nstr(th, 4)}: pole at {var} = "
                                   f"{mpmath.nstr(bad, 8)} on the path")
                    continue
                Fi = F
                if pairs:
                    Fi = make_F(_without_doublets(r, pairs, dps))
                    cancelled.append(f"[{L}/{M}] theta={mpmath.nstr(th, 4)}: "
                                     + ", ".join(f"{var} = {mpmath.nstr(p, 8)}" for p, _ in pairs))
                try:
                    v, err = laplace(Fi, x, b, qd, theta=th, scale=A / abs(x), s_max=s_max)
                except (ZeroDivisionError, ValueError) as exc:
                    dropped.append(f"[{L}/{M}]: integral failed ({exc})")
                    continue
                if not mpmath.isfinite(abs(v)):
                    continue
                vals[th][i] = v
                errs[th][i] = err + pair_err
        ns = [o[0] for o in orders]
        info = {"dropped": dropped, "doublets_cancelled": cancelled, "orders": [f"[{L}/{M}]" for _, L, M in orders], "lateral": use_lateral}
        if not use_lateral:
            vv = vals[thetas[0]]
            fl = max(errs[thetas[0]])
            re, im, binfo = band_from_candidates(vv, ns, floor=fl, safety=safety, nearest_far=True)
            info.update(binfo)
            info["values"] = [None if v is None else mpmath.nstr(v, 25) for v in vv]
            if re is None:
                outs.append(PointOutcome(None, None, False, binfo.get("how", ""), info))
            else:
                outs.append(PointOutcome(re, im, True, "", info))
            continue
        tp, tm = thetas
        avg, amb = [], []
        for i in range(len(orders)):
            sp, sm = vals[tp][i], vals[tm][i]
            if sp is None or sm is None:
                avg.append(None)
                amb.append(None)
            else:
                avg.append((sp + sm) / 2)
                amb.append((sp - sm) / (2j))
        fl = max(max(errs[tp]), max(errs[tm]))
        re, _, binfo = band_from_candidates([None if v is None else mpmath.re(v) for v in avg], ns,
                                            floor=fl, safety=safety, nearest_far=True)
        am, _, ainfo = band_from_candidates([None if v is None else mpmath.re(v) for v in amb], ns,
                                            floor=fl, safety=safety, nearest_far=True)
        info.update(binfo)
        info["theta"] = mpmath.nstr(tp, 8)
        Apos = None
        if on_ray:
            Apos = min(on_ray, key=abs)
            if abs(mpmath.im(Apos)) <= mpmath.mpf("1e-10") * abs(Apos):
                Apos = mpmath.re(Apos)
        info["ray_singularity"] = None if Apos is None else mpmath.nstr(Apos, 15)
        if on_ray:
            info["exp(-A/x)"] = mpmath.nstr(mpmath.exp(-Apos / x), 15)
        k = next((i for i in range(len(orders)) if vals[tp][i] is not None and vals[tm][i] is not None), None)
        if k is not None:
            info["S_plus"] = mpmath.nstr(vals[tp][k], 25)
            info["S_minus"] = mpmath.nstr(vals[tm][k], 25)
        if re is None or am is None:
            outs.append(PointOutcome(None, None, False, (binfo if re is None else ainfo).get("how", ""), info))
        else:
            outs.append(PointOutcome(re, am, True, "", info))
    return outs, diag


def _doublet_bound(p, res, x, b, cmap):
    """Estimate (with ``_DOUBLET_SAFETY``) of what cancelling a doublet changes in the Laplace
    integral, or ``None`` where the map's derivative is unusable. The pair adds about
    ``res_t/(t - t_p)`` near its pole (``res_t`` the residue in ``t``, ``t_p`` the pole), and
    ``|PV int_0^inf e^-s/(s - s_p) ds| = |e^-s_p Ei(s_p)|`` with ``s_p = t_p/x`` (real ``s_p``;
    ``|s_p|`` otherwise, and ``(1 + |s_p|)^|b|`` for the Borel-Le Roy weight). Note that the
    integral falls off like ``1/s_p``, not like the exponential at the pole."""
    if cmap is None:
        res_t, t_p = abs(res), p
    else:
        h = abs(p) * mpmath.mpf(10) ** (-(mpmath.mp.dps // 3))
        dt = (cmap.x_of_w(p + h) - cmap.x_of_w(p - h)) / (2 * h)     # dt/dw at the pole
        if not mpmath.isfinite(abs(dt)):
            return None
        res_t, t_p = abs(res) * abs(dt), cmap.x_of_w(p)
    sp = abs(t_p) / abs(x)
    if sp == 0:
        return None
    J = abs(mpmath.exp(-sp) * mpmath.ei(sp)) * (1 + sp) ** abs(mpmath.mpmathify(b))
    return _DOUBLET_SAFETY * res_t * J / abs(x)


def to_t_inv(t, cmap):
    """The point of the approximant's variable for Borel-plane point ``t``."""
    return t if cmap is None else cmap.w_of_x(t)
