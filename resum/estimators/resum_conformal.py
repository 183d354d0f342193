"""Conformal-map Padé: re-expand in the disk variable, then Padé in it.

The series in ``x`` is re-expanded in ``w`` (``x = x(w)`` maps the unit disk
onto the plane cut along the singularities, see
:mod:`resum.transforms.conformal`), optionally multiplied by
``(1 - w/w_inf)^alpha`` where ``w_inf`` is the image of ``x = infinity`` (this
absorbs a known power behaviour ``x^p`` at large ``x``, ``alpha = 2p`` for a
ray map), and the near-diagonal Padé approximants in ``w`` are evaluated at
``w(x)``. The band is the spread of stable approximants, as for plain Padé.

>>> import mpmath
>>> from resum.context import workdps
>>> from resum.transforms.conformal import RayMap
>>> with workdps(40):
...     c = [mpmath.mpf(-1) ** n / (n + 1) for n in range(40)]     # log(1+x)/x, cut (-inf, -1]
...     out, _ = conformal_evaluate(c, [mpmath.mpf(50)], RayMap(-1), 40)
...     ok = out[0].re.contains(mpmath.log(51) / 50)
>>> ok, out[0].re.digits() > 10
(True, True)

Notes
-----
The re-expansion uses exactly the first ``n`` coefficients for the first
``n`` coefficients in ``w``: no information is added, but every point of
the cut plane now lies inside the disk of convergence. Points on the cut are
refused (``ok = False``).

References
----------
.. [1] R. Seznec and J. Zinn-Justin, J. Math. Phys. 20 (1979) 1398.
.. [2] O. Costin and G. V. Dunne, J. Phys. A 52 (2019) 445205, arXiv:1904.11593
   (conformal map plus Padé: "Padé-conformal" extrapolation).
"""
from __future__ import annotations

from typing import Sequence

import mpmath

from ..results import Estimate, point_text, sig_text
from ..transforms.conformal import ConformalMap, RayMap, StarMap, pull_back, rim_factor
from .resum_band import (PointOutcome, RationalIntegrator, candidate_orders, fit_candidates,
                         outcomes_from_table)
from .resum_pade import pade_evaluate
from .resum_quadratic import quadratic_evaluate

__all__ = ["conformal_evaluate", "derivative_evaluate", "mapped_coefficients", "off_cut_step", "rim_power"]


#: what to do about a point on the cut, appended to the refusal (one line)
ON_CUT_ADVICE = ("; to pick a side of the cut, move the point slightly off it (for example add 1e-6*I "
                 "to a point on a cut along the real axis, 1e-6 to one on a vertical cut), or, if the "
                 "function has no cut there, choose another method with --method")


def _times_rim(cw: Sequence, alpha, rim) -> list:
    """Coefficients of ``(1 - w/rim)^alpha`` times the series ``cw`` (same length)."""
    if alpha is None or alpha == 0:
        return list(cw)
    fac = rim_factor(alpha, len(cw), rim)
    return [sum(fac[k] * cw[m - k] for k in range(m + 1)) for m in range(len(cw))]


def mapped_coefficients(c: Sequence, cmap: ConformalMap, dps: int, alpha=None) -> list:
    """Coefficients in ``w`` of ``(1 - w/w_inf)^alpha f(x(w))``."""
    cw = [mpmath.mpmathify(v) for v in pull_back(c, cmap, dps)]
    return _times_rim(cw, alpha, cmap.rim_point())


#: the large-x power read off at the rim is rounded to k/q with q <= this ...
RIM_POWER_MAX_DEN = 4
#: ... and used only if the middle half of the estimates lies within this of k/q (the
#: estimates creep slowly onto the limit: on the angle-deformed kernel family from 100 loops
#: they sit at 0.4999 (a = pi/8), 0.490 (3 pi/8) and 0.528 (5 pi/12) against the 1/2 that
#: its finite-coupling values show; fractions with q <= 4 are at least 1/12 apart)
RIM_POWER_TOL = 0.04


def rim_exponent(cmap: ConformalMap):
    """``a`` with ``x ~ (1 - w/w_inf)^(-a)`` at the rim point of the map (2 for a ray
    map, from the map for a star map), None for maps where it is not worked out."""
    if isinstance(cmap, StarMap):
        return cmap.large_x_exponent()
    if isinstance(cmap, RayMap):
        return 2
    return None


def rim_power(c: Sequence, cmap: ConformalMap, dps: int, n_orders: int = 6):
    """The power ``p`` in ``f ~ C x^p`` at large ``x``, read from the series through the map.

    With ``f(x(w)) = w^k u(w)`` and ``u(0) != 0``, ``f ~ (1 - w/w_inf)^(-a p)`` at the
    rim point means ``h(w) = (w_inf - w) u'(w)/u(w) -> a p`` there (``a`` from
    :func:`rim_exponent`). ``h`` is re-expanded exactly as far as the series goes; its
    near-diagonal Padé approximants of the ``n_orders`` largest term counts (offsets
    -1, 0, 1) are evaluated at ``w_inf``. Returns ``(fraction, median, half_spread)``
    with ``fraction`` the simplest ``k/q`` (``q <= RIM_POWER_MAX_DEN``) within
    :data:`RIM_POWER_TOL` of the middle half of those values, or None when there is no
    such fraction (a logarithm at infinity, values still moving, too few terms).
    An estimate: an approximant evaluated on the rim converges to the limit only if
    the function tends to the pure power there; the caller reports what it used.

    >>> import mpmath
    >>> c = [mpmath.binomial(mpmath.mpf(1) / 3, k) for k in range(40)]   # (1 + x)^(1/3)
    >>> str(rim_power(c, RayMap(-1), 30)[0])
    '1/3'
    """
    from fractions import Fraction
    from .dlog import dlog_series
    from .resum_band import rational_fit
    a = rim_exponent(cmap)
    if a is None or len(c) < 12:
        return None
    with mpmath.workdps(dps):
        cw = [mpmath.mpmathify(v) for v in pull_back([mpmath.mpmathify(v) for v in c], cmap, dps)]
        q = dlog_series(cw)                      # u'/u, leading zeros of the mapped series stripped
        if q is None or len(q) < 11:
            return None
        rim = cmap.rim_point()
        h = [rim * q[0]] + [rim * q[m] - q[m - 1] for m in range(1, len(q))]
        vals = []
        N = len(h)
        for nt in range(N, max(8, N - n_orders) - 1, -1):
            for d in (0, 1, -1):
                M = (nt - 1 - d) // 2
                L = nt - 1 - M
                r = rational_fit(h[:nt], L, M, min(dps, 30), reduce=False)
                if r is None or r.den(rim) == 0:
                    continue
                v = r(rim) / a
                if mpmath.isfinite(v) and abs(mpmath.im(v)) < 1e-6 * (1 + abs(v)):
                    vals.append(mpmath.re(v))
    if len(vals) < 6:
        return None
    vals.sort()
    lo, hi = vals[len(vals) // 4], vals[(3 * len(vals)) // 4]
    med = vals[len(vals) // 2]
    half = (hi - lo) / 2
    if half > RIM_POWER_TOL:
        return None
    for den in range(1, RIM_POWER_MAX_DEN + 1):
        num = int(mpmath.nint(med * den))
        if abs(lo - mpmath.mpf(num) / den) <= RIM_POWER_TOL and abs(hi - mpmath.mpf(num) / den) <= RIM_POWER_TOL:
            return Fraction(num, den), med, half
    return None


def _derivative_gamma(alpha):
    """Rim power for the derivative variant: ``f ~ (1 - w/w_inf)^(-alpha)`` gives
    ``f' ~ (1 - w/w_inf)^(-alpha-1)``; None when that is not a whole power."""
    if alpha is None or alpha == 0:
        return 0
    g = mpmath.mpmathify(alpha) + 1
    if g >= 0 and g == mpmath.nint(g):
        return int(g)
    return None


def derivative_evaluate(cw: Sequence, ws: Sequence, dps: int, *, gamma: int = 0, rim=1,
                        n_orders: int = 7, offsets: Sequence[int] = (0,), safety=4,
                        pole_tol=mpmath.mpf("1e-8")):
    """Values ``f(w) = f(0) + integral_0^w f'`` from Padé approximants to
    ``(1 - w/rim)^gamma f'(w)``, integrated exactly (partial fractions).

    ``cw``: coefficients of ``f`` in ``w``. Candidates and band as in
    :func:`~resum.estimators.resum_pade.pade_evaluate`. The integral of a
    rational function is exact however close a pole passes (ball arithmetic
    reports the digits lost), so only a candidate with a pole within
    ``pole_tol * |w|`` of the path is dropped there; spurious pole-zero pairs
    next to the path, common in these tables, then cost nothing.
    """
    d = _times_rim([(k + 1) * cw[k + 1] for k in range(len(cw) - 1)], gamma, rim)
    orders = candidate_orders(len(d), n_orders, offsets)
    table = [[None] * len(orders) for _ in ws]
    inner = [[None] * len(orders) for _ in ws]
    fits, singular = fit_candidates(d, orders, dps)
    for i, r in fits:
        integ = RationalIntegrator(r, dps, rim=rim, gamma=gamma, pole_tol=pole_tol)
        if not integ.ok:
            continue
        for j, w in enumerate(ws):
            v = integ(w)
            if v is not None:
                table[j][i] = cw[0] + v
                inner[j][i] = integ.inner_terms(w)
    ns = [o[0] + 1 for o in orders]          # terms of f used: one more than of f'
    outs = outcomes_from_table(table, ns, safety=safety)
    for j, o in enumerate(outs):
        o.info["orders"] = [f"[{L}/{M}]'" for _, L, M in orders]
        o.info["values"] = [None if v is None else mpmath.nstr(v, 45) for v in table[j]]
        # poles inside the disk, off the axis, in the approximants that make the value: their
        # terms are an error the spread may not show (the median over the three, as the value)
        top = [t for t, v in zip(inner[j], table[j]) if v is not None and t is not None][:3]
        if o.ok and o.re is not None and top:
            a = sorted(top)[len(top) // 2]
            if a > o.re.error:
                o.info["inner_poles"] = mpmath.nstr(a, 5)
                outs[j] = PointOutcome(Estimate(o.re.value, min(o.re.lower, o.re.value - a),
                                                max(o.re.upper, o.re.value + a)), o.im, o.ok, o.reason, o.info)
    return outs, {"n_singular_systems": singular, "orders": [list(o) for o in orders]}


#: near the rim (where the quadratic variant is tried, ``resummation._near_rim_quadratic``) the
#: chosen variant's band is widened to reach the value of the other whose band is at most this
#: many times wider: there the top approximants of one family can agree with each other and share
#: a bias that the other family's value shows (the kernel family at a = pi/3 from 60 loops,
#: g = 7-10, |w| = 0.93-0.95: derivative variant 1.03-1.07 half-widths from the truth, the
#: quadratic one on the other side with a band 11-14 times wider). Not applied between the direct
#: and derivative variants away from the rim: log(1+x)/x from 30 terms at x = 3 (|w| = 1/3) went
#: from 3 to 24 times its error, no band there having missed
COVER_CENTRE_RATIO = 30

#: variants that use information the others lack (the strong-coupling terms the user gave): where
#: one of them has the narrowest band, the others' values do not widen it
INFORMED = frozenset({"two-point"})

#: ... unless an informed pick lies further than this many half-widths outside another variant's
#: band: then the terms given and the series disagree, and the pick's band covers the other's.
#: Measured on (2/pi^2) log cosh(2 pi sqrt(x)) from 60 terms with 3 terms at infinity, x = 62.5
#: and 6250: right terms put the two-point value 0.1-1.4 half-widths from the others (the
#: derivative variant's own band short there); the leading coefficient 1e-4 too large, 3.7
INFORMED_CONFLICT = 2


def _informed(name, outcome) -> bool:
    """Whether a variant's outcome used the terms at infinity (by its list's name, or, for a
    list of earlier picks, by the variant recorded in it)."""
    return name in INFORMED or outcome.info.get("variant") in INFORMED


def _choose(variants, cover_centres: bool = False):
    """Per point: of the variants ``[(name, outcomes)]`` (an outcome may be None where a
    variant was not run), the one with the narrowest band (the first on a tie), widened to
    cover the band of every other variant whose band does not overlap it; with
    ``cover_centres``, also to reach the value of every other variant whose band is at most
    :data:`COVER_CENTRE_RATIO` times wider. A pick that used the strong-coupling terms
    (:data:`INFORMED`) is widened by the others only where it lies more than
    :data:`INFORMED_CONFLICT` of their half-widths from them (recorded as
    ``strong_terms_conflict``, which the caller turns into a warning)."""
    out = []
    for j in range(len(variants[0][1])):
        good = [(n, o[j]) for n, o in variants
                if o is not None and o[j] is not None and o[j].ok and o[j].re is not None]
        if not good:
            first = variants[0][1][j]
            first.info["variant"] = variants[0][0]
            out.append(first)
            continue
        name, pick = min(good, key=lambda t: t[1].re.error)
        re, im = pick.re, pick.im
        others = {}
        for n, other in good:
            if other is pick:
                continue
            others[n] = mpmath.nstr(other.re.error, 5)
            dv = abs(other.re.value - re.value)
            if _informed(name, pick) and not _informed(n, other) and dv <= INFORMED_CONFLICT * other.re.error:
                # the pick knows what the other does not (terms at infinity): a difference within
                # the other's band (doubled) is the other's error as much as the pick's, and is
                # only recorded; beyond it the terms given and the series disagree, and the rule
                # below covers the other's band
                if dv > re.error:
                    pick.info.setdefault("uninformed_variants_differ", {})[n] = mpmath.nstr(dv, 5)
                continue
            if _informed(name, pick) and not _informed(n, other) and dv > re.error + other.re.error:
                pick.info.setdefault("strong_terms_conflict", {})[n] = mpmath.nstr(dv / other.re.error, 3)
            if dv > re.error + other.re.error:
                # cover the other variant's whole band, not only its value: at a = 3 pi/8, g = 2 of
                # the kernel family from 120 loops the derivative variant settled 1.4e-17 from the
                # truth and the direct one 4e-19 from it on the far side; a band reaching just the
                # direct value missed the truth by 3 %
                h = dv + other.re.error
                re = Estimate(re.value, min(re.lower, re.value - h), max(re.upper, re.value + h))
                pick.info.setdefault("variants_disagree", {})[n] = mpmath.nstr(dv, 5)
            elif cover_centres and dv > re.error and other.re.error <= COVER_CENTRE_RATIO * re.error:
                re = Estimate(re.value, min(re.lower, re.value - dv), max(re.upper, re.value + dv))
                pick.info.setdefault("variant_centre_covered", {})[n] = mpmath.nstr(dv, 5)
            if im is not None and other.im is not None:
                di = abs(other.im.value - im.value)
                if di > im.error + other.im.error:
                    h = di + other.im.error
                    im = Estimate(im.value, min(im.lower, im.value - h), max(im.upper, im.value + h))
        if not _informed(name, pick):
            # an informed variant that lost here may have found the terms given at odds with the
            # series: keep that finding (the caller warns)
            for n, other in good:
                if other is not pick and other.info.get("strong_terms_conflict"):
                    pick.info["strong_terms_conflict"] = other.info["strong_terms_conflict"]
        pick = PointOutcome(re, im, pick.ok, pick.reason, pick.info)
        if others:
            pick.info["other_variant_bands"] = others
        pick.info["variant"] = name
        out.append(pick)
    return out


def _widen_in_rim_layer(o: PointOutcome, w, n_terms: int) -> None:
    """Widen the band of a point closer to the rim ``|w| = 1`` than ``1/n_terms``.

    Approximants built from ``n`` coefficients in ``w`` resolve the function only to a
    distance of about ``1/n`` from the rim, where its singularities sit; inside that layer
    the spread and trend of the approximants understate the error. Measured (40 and 80
    terms of (1+x)^(-1/3), log(1+x)/x, (1+x)^(-2/3) + (1+x/4)^(-1/2), x up to 1e7, map from
    x0 = -1): with ``layer = (1 - |w|) n`` the band/error ratio fell from 1.5 at layer 0.8
    to 0.48 at layer 0.025 (truth outside the band below about 0.25); widening by
    ``1/layer`` restores at least a factor 2 in every case measured (largest ratio 68).
    An empirical rule, recorded in ``info["rim_layer"]``."""
    if not o.ok or o.re is None:
        return
    layer = (1 - abs(w)) * n_terms
    if layer >= 1:
        return
    fac = 1 / max(layer, mpmath.mpf(10) ** -6)

    def wide(e):
        if e is None:
            return None
        h = e.error * fac
        return Estimate(e.value, min(e.lower, e.value - h), max(e.upper, e.value + h))
    o.re, o.im = wide(o.re), wide(o.im)
    o.info["rim_layer"] = {"layer": mpmath.nstr(layer, 3), "factor": mpmath.nstr(fac, 3)}


def _across_cut(cmap, x) -> bool:
    """The map jumps across ``x`` (a point on a cut), as opposed to being continuous there with
    ``|w|`` merely at the rim to the working precision: the images of ``x (1 +- 1e-8 i)``."""
    x = mpmath.mpmathify(x)
    size = abs(x) if x != 0 else 1
    # both across a horizontal and across a vertical cut (a pair of complex cuts runs
    # vertically: 1/(1 + x + x^2)^(1/3) at x = -0.5 + 2i, on the upper cut, was moved along it
    # by an imaginary step and called "at the rim")
    for d in (mpmath.mpc(0, "1e-8") * size, mpmath.mpf("1e-8") * size):
        try:
            up, down = cmap.w_of_x(x + d), cmap.w_of_x(x - d)
        except (ZeroDivisionError, ValueError):
            return True
        if abs(up - down) > mpmath.mpf("1e-4"):
            return True
    return False


def off_cut_step(cmap, x_of, a):
    """The nudge of a point ``a`` (in the user's variable, ``x = x_of(a)``) that takes it off the
    cut of ``cmap``: ``"1e-6*I"`` or ``"1e-6"`` (scaled by ``|a|``), whichever leaves the cut, or
    None. With a coupling (x = g^2, say) the cut in g need not run the way it does in x."""
    size = abs(a) if a != 0 else 1
    for text, d in (("1e-6*I", mpmath.mpc(0, "1e-6")), ("1e-6", mpmath.mpf("1e-6"))):
        try:
            if not _across_cut(cmap, x_of(a + d * size)):
                return text if size == 1 else f"{mpmath.nstr(size * mpmath.mpf('1e-6'), 3)}{text[4:]}"
        except (ZeroDivisionError, ValueError):
            continue
    return None


def twopoint_map(cmap) -> bool:
    """Whether the two-point variant applies to ``cmap``: a ray map whose cut runs along the
    negative real axis (:mod:`resum.estimators.resum_twopoint`)."""
    if not isinstance(cmap, RayMap):
        return False
    x0 = mpmath.mpmathify(cmap.x0)
    return not isinstance(x0, mpmath.mpc) and x0 < 0 and cmap.rim_point() == 1


def conformal_evaluate(c: Sequence, xs: Sequence, cmap: ConformalMap, dps: int, *, alpha=None,
                       n_orders: int = 7, offsets: Sequence[int] = (0,), safety=4,
                       variants: str = "both", target_digits=None, strong_terms=None):
    """Conformal-map Padé values with bands at the points ``xs`` (expansion variable).

    ``variants``: "direct" (Padé of the mapped function), "derivative" (Padé
    of its derivative, integrated from 0, see :func:`derivative_evaluate`),
    "quadratic" (quadratic Hermite-Padé approximants of the mapped function,
    :mod:`resum.estimators.resum_quadratic`; method ``conformal-quadratic``),
    "both" (default: direct and derivative, per point the one with the
    narrower band; where the two bands do not overlap the band is widened to
    cover the other band) or "all" (the three, the same way). With
    ``target_digits``, "both" and "all" run the others only at points where
    the direct band falls short of that many digits.

    Why the derivative: where ``f`` has logarithmic branch points, ``f'`` has
    poles, which rational approximants represent exactly; for a
    ``log cosh``-type function it gains up to 15 digits beyond the radius
    (studies/accuracy/README.md). Where the singularities are
    algebraic it gains or loses about a digit, and the narrower band decides.
    Why the quadratic one: at strong coupling of the angle-deformed BES family
    (branch points accumulating at the image of infinity) it gains up to about
    two digits (studies/accuracy/README.md); it is not in the default because
    elsewhere its narrower bands were not always honest (tests/resummation:
    log(1+x)/x near the rim of the disk).

    ``strong_terms``: terms ``[(power, coefficient)]`` of the large-x expansion that the caller
    knows (powers in ``x``, spaced by 1/2 from the leading one); with a ray map whose cut runs
    along the negative axis, "both" and "all" then also run the two-point approximants
    (:mod:`resum.estimators.resum_twopoint`: the series at ``w = 0``, these terms at ``w = 1``) as
    the variant "two-point", chosen per point like the others.
    """
    if variants not in ("both", "all", "direct", "derivative", "quadratic"):
        raise ValueError(f"variants must be 'both', 'all', 'direct', 'derivative' or 'quadratic', "
                         f"got {variants!r}")
    cf = mapped_coefficients(c, cmap, dps)          # f(x(w)), re-expanded once
    cw = _times_rim(cf, alpha, cmap.rim_point())     # with the rim factor, for the direct variant
    ws, bad = [], []
    for x in xs:
        w = cmap.w_of_x(x)
        if abs(w) >= 1 - mpmath.mpf(10) ** -12:
            bad.append(True)
            ws.append(mpmath.mpf(0))
        else:
            bad.append(False)
            ws.append(w)
    rim = cmap.rim_point()

    def post(j, v):
        if alpha is None or alpha == 0:
            return v
        return v / (1 - ws[j] / rim) ** alpha

    if variants in ("both", "all", "direct"):
        outs, diag = pade_evaluate(cw, ws, dps, n_orders=n_orders, offsets=offsets, post=post,
                                   safety=safety, keep_poles_beyond=1 - mpmath.mpf(10) ** -8)
    else:
        outs, diag = [None] * len(ws), {}
    gamma = _derivative_gamma(alpha)
    need = [not bad[j] for j in range(len(ws))]
    if variants in ("both", "all") and target_digits is not None:
        need = [nd and not (o.ok and o.re is not None and o.re.error <= abs(o.re.value) * mpmath.mpf(10) ** (-target_digits))
                for nd, o in zip(need, outs)]
    idx = [j for j in range(len(ws)) if need[j]]

    def spread(sub):
        full = [None] * len(ws)
        for j, o in zip(idx, sub):
            full[j] = o
        return full
    named = [("direct", outs if variants in ("both", "all", "direct") else None)]
    if variants in ("both", "all", "derivative") and gamma is not None and len(cw) >= 8 and idx:
        # the derivative of f itself (its rim factor is gamma, applied inside)
        dsub, ddiag = derivative_evaluate(cf, [ws[j] for j in idx], dps, gamma=gamma, rim=rim,
                                          n_orders=n_orders, offsets=offsets, safety=safety)
        named.append(("derivative", spread(dsub)))
        diag = dict(diag, derivative=ddiag)
    if variants in ("all", "quadratic") and len(cw) >= 12 and idx:
        # the quadratic systems carry the digits asked plus 20, not the working precision (its
        # guard digits serve the Padé tables): on 150 loops of the kernel family this halves their
        # cost with the same values (studies/pipeline_speed)
        qdps = dps if target_digits is None else min(dps, int(target_digits) + 20)
        qsub, qdiag = quadratic_evaluate(cw, [ws[j] for j in idx], qdps, n_orders=n_orders,
                                         post=lambda i, v: post(idx[i], v), safety=safety)
        named.append(("quadratic", spread(qsub)))
        diag = dict(diag, quadratic=qdiag)
    if strong_terms and variants in ("both", "all") and twopoint_map(cmap) and len(cw) >= 8 and idx:
        from .resum_twopoint import rim_coefficients, shifted_rim_coefficients, twopoint_evaluate
        p0, h1 = rim_coefficients(strong_terms, cmap.x0)
        h1_moved = shifted_rim_coefficients(strong_terms, cmap.x0)
        h0 = _times_rim(cf, 2 * p0, rim)
        # (as for the quadratic systems: the digits asked plus 20 in the unknowns)
        tdps = dps if target_digits is None else min(dps, int(target_digits) + 20)
        tsub, tdiag = twopoint_evaluate(h0, h1, [ws[j] for j in idx], tdps, n_orders=n_orders,
                                        post=lambda i, v: v / (1 - ws[idx[i]] / rim) ** (2 * p0),
                                        safety=safety, h1_moved=h1_moved)
        named.append(("two-point", spread(tsub)))
        diag = dict(diag, two_point=tdiag)
    if variants in ("derivative", "quadratic"):
        named = [(n, o) for n, o in named if n == variants] or [(variants, [None] * len(ws))]
        why = (f"the {variants} variant needs at least {12 if variants == 'quadratic' else 8} terms"
               if len(cw) < (12 if variants == "quadratic" else 8) else "not evaluated")
        named = [(variants, [o if o is not None else PointOutcome(None, None, False, why, {})
                             for o in named[0][1]])]
    outs = _choose(named)
    for j, o in enumerate(outs):
        if bad[j] and not _across_cut(cmap, xs[j]):
            # |w| = 1 to the tolerance, yet the map is continuous here: a point so far out that
            # its image sits on the rim (log(1 + x) at x = 1e30 with the cut on the negative axis)
            outs[j] = PointOutcome(None, None, False,
                                   f"x = {point_text(xs[j])} maps to the rim of the disk (1 - |w| = "
                                   f"{sig_text(1 - abs(cmap.w_of_x(xs[j])), 3)}), too close for approximants in w; "
                                   "a smaller point, or the strong-coupling probe (resum strong) for the "
                                   "growth there", {})
        elif bad[j]:
            outs[j] = PointOutcome(None, None, False,
                                   f"x = {point_text(xs[j])} lies on the cut of the map "
                                   f"({cmap.describe()}){ON_CUT_ADVICE}",
                                   {"cut_map": cmap})
        else:
            _widen_in_rim_layer(o, ws[j], len(cw))
            o.info["w"] = mpmath.nstr(ws[j], 20)
    diag = dict(diag, map=cmap.to_dict(), alpha=None if alpha is None else str(alpha))
    return outs, diag
