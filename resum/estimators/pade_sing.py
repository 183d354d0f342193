"""Padé family: singularities from the poles of a near-diagonal Padé table.

>>> import mpmath
>>> from resum.series import Series
>>> from resum.context import Context
>>> from fractions import Fraction
>>> s = Series([Fraction(1, 2 ** n) + (-1) ** n for n in range(30)])   # 1/(1-x/2) + 1/(1+x)
>>> r = estimate_pade(s, Context(dps=30))
>>> r.radius.contains(1), [x.kind for x in r.singularities]
(True, ['pole', 'pole'])

Notes
-----
The table holds the approximants ``[L/M]`` with ``L + M`` from the highest
order the series allows downwards and ``|L - M| <= 1``. For each
approximant: poles (roots of the denominator), zeros (roots of the
numerator) and residues. A pole with a zero closer than a tolerance tied to
the coefficient digits, or with a negligible residue, is a Froissart doublet
(spurious) and is removed. Poles that recur in at least half of the
approximants form stable clusters; each cluster is one singularity. A
cluster is a ``pole`` when its residue is stable and no poles and zeros
line up beyond it; it is a ``branch`` point when they do (the Padé
approximant models a cut by interlacing poles and zeros, and the branch
point is the end of that accumulation). Bands: safety factor (2) times the
spread of the cluster members across the table; for a branch point the
band also covers the spacing between the first points of the accumulation,
since the end of a cut is resolved only to that spacing.

Applicability: meromorphic functions (poles) to many digits; algebraic or
logarithmic branch points only roughly (use the Dlog-Padé or differential
approximants for those). The radius is the modulus of the nearest stable
singularity.

References
----------
G. A. Baker and P. Graves-Morris, *Padé Approximants*, 2nd ed., Cambridge
(1996) (Padé table, Froissart doublets).
H. Stahl, J. Approx. Theory 91 (1997) 139 (poles and zeros accumulating on
the cuts of minimal capacity).
J. Gilewicz and M. Pindor, J. Comput. Appl. Math. 87 (1997) 199 (Froissart
doublets from noisy coefficients).
"""
from __future__ import annotations

import mpmath

from ..results import Estimate, Singularity, Status
from ..uncertainty.ensemble import SAFETY, cluster_points, robust_center
from ._common import classify_kind, complex_exponent_note, failed, finish, prepare
from ._num import nearest_distances, pade_coeffs, poly_roots, polyder, polyval_many, root_digits
from .ratio import classify_growth

__all__ = ["estimate_pade", "pade_ensemble", "table_orders", "clusters_to_singularities"]


def table_orders(n_coeffs: int, count: int = 10, min_total: int = 4):
    """Near-diagonal orders (L, M), highest total order first."""
    out = []
    top = n_coeffs - 1
    t = top
    while len(out) < count and t >= min_total:
        M = t // 2
        for MM in ([M, M + 1] if t % 2 else [M, M - 1, M + 1]):
            L = t - MM
            if L >= 0 and MM >= 1 and len(out) < count:
                out.append((L, MM))
        t -= 1
    return out


def _level_orders(t):
    """[L/M] with L + M = t and |L - M| <= 1 (and the next pair): most diagonal first."""
    M = t // 2
    cand = [M, M + 1, M - 1] if t % 2 == 0 else [M, M + 1, M - 1, M + 2]
    return [(t - m, m) for m in cand if m >= 1 and t - m >= 0]


def doublet_tolerance(digits: int):
    """Relative pole-zero distance below which a pair is a Froissart doublet."""
    return mpmath.mpf(10) ** (-min(8, max(3, digits / 4)))


def pade_ensemble(c, dps: int, digits: int, count: int = 10, max_rel_err=None, orders=None):
    """Poles, zeros and residues of a near-diagonal Padé table of ``c``.

    Returns a list of dicts with keys ``L, M, poles, zeros, spurious``
    (``poles``: list of ``(z, residue)`` kept; ``spurious``: removed doublets)
    and ``rel_err`` (relative accuracy of the denominator solve). Approximants
    whose solve lost all digits (``rel_err > max_rel_err``) are skipped.
    """
    tol = doublet_tolerance(digits)
    if max_rel_err is None:
        max_rel_err = 10.0 ** -max(10, digits / 3)   # denominators must keep a third of the digits
    out = []
    skipped = []
    solved = []
    if orders is not None:
        for L, M in orders:
            pq = pade_coeffs(c, L, M, dps)
            if pq is None or pq[2] > max_rel_err:
                skipped.append((L, M))
            else:
                solved.append((L, M, pq))
    else:
        # near-diagonal orders from the top down; a level whose first approximant fails
        # (singular or ill-conditioned) is skipped, the next level is lower by ~7 %
        top = len(c) - 1
        step = max(1, top // 15)
        t = top
        while t >= 4 and len(solved) < count:
            for idx, (L, M) in enumerate(_level_orders(t)):
                if len(solved) >= count:
                    break
                pq = pade_coeffs(c, L, M, dps)
                if pq is None or pq[2] > max_rel_err:
                    skipped.append((L, M))
                    if idx == 0:
                        break
                    continue
                solved.append((L, M, pq))
            t -= step
    if orders is None and len(solved) < 3:
        # degenerate table (for example a rational function of low degree): take
        # the largest denominators that still give a regular system, with the
        # numerator degree as high as the coefficients allow
        top = len(c) - 1
        for t in (top, top - 1, top - 2):
            good = None
            first_err = None
            for M in range(1, min(t, 40)):
                pq = pade_coeffs(c, t - M, M, dps)
                if pq is None or pq[2] > max_rel_err or (
                        first_err is not None and pq[2] > max(first_err, 10.0 ** -(digits / 2)) * 1e6):
                    if good is not None:
                        break
                    continue
                first_err = pq[2] if first_err is None else first_err
                good = (t - M, M, pq)
            if good is not None:
                solved.append(good)
    last_poles = last_zeros = None
    for L, M, pq in solved:
        p, q, err = pq
        # neighbouring approximants share most poles and zeros: theirs start the root finder
        # to the digits the coefficients carry (and a margin), not beyond: the Newton steps at
        # the full working precision were the larger part of root finding on long series
        rd = root_digits(err, dps)
        poles = poly_roots(q, dps, tol_digits=rd, seeds=last_poles)
        zeros = poly_roots(p, dps, tol_digits=rd, seeds=last_zeros)
        last_poles = poles or last_poles
        last_zeros = zeros or last_zeros
        if poles is None or zeros is None:
            skipped.append((L, M))
            continue
        dq = polyder(q)
        keep, spur = [], []
        dists = nearest_distances(poles, zeros)
        dens = polyval_many(dq, poles, dps)
        nums = polyval_many(p, poles, dps)
        # a doublet's residue is tiny against the other residues of the same
        # approximant (each taken relative to its pole's distance, |res|/|z|,
        # which scales like the function under x -> c x). The reference is the
        # largest such residue, so the test does not depend on the radius (a test
        # against max |p_k| called every residue tiny for a radius of 1/16, whose
        # p_k grow like 16^k)
        ress = [num / den if den != 0 else mpmath.inf for den, num in zip(dens, nums)]
        rel = [abs(r) / abs(z) if z != 0 else abs(r) for r, z in zip(ress, poles)]
        ref = max((v for v in rel if mpmath.isfinite(v)), default=mpmath.mpf(0))
        for z, d, res, rr in zip(poles, dists, ress, rel):
            tiny_res = rr < tol * mpmath.mpf(10) ** -2 * ref
            if d < tol * abs(z) or tiny_res:
                spur.append(z)
            else:
                keep.append((z, res))
        # a zero paired with a removed pole is removed too
        zeros_kept = [w for w, dw in zip(zeros, nearest_distances(zeros, spur))
                      if dw >= tol * abs(w)]
        out.append({"L": L, "M": M, "poles": keep, "zeros": zeros_kept, "spurious": spur,
                    "rel_err": err})
    return out, skipped


def _cut_points(app, z0, rel_window=3.0, angle=0.15):
    """Poles and zeros of one approximant lying on a ray beyond ``z0``."""
    a0 = mpmath.arg(z0)
    pts = []
    for w in [p for p, _ in app["poles"]] + list(app["zeros"]):
        if abs(w) <= abs(z0) * (1 + 1e-12) or abs(w) > rel_window * abs(z0):
            continue
        da = abs(mpmath.arg(w / z0)) if z0 != 0 else abs(mpmath.arg(w) - a0)
        if da < angle:
            pts.append(w)
    return sorted(pts, key=abs)


def clusters_to_singularities(ens, method, eps, residue_is_exponent=False, exponent_shift=0, real_series=False,
                              rel_tol=0.02, max_count=6, radius_factor=2.5, detect_cuts=True):
    """Stable pole clusters of a Padé ensemble as :class:`Singularity` objects.

    ``residue_is_exponent``: for Dlog-Padé, the residue of each pole is the
    exponent (``theta = residue + exponent_shift``).
    Returns ``(singularities, info)``.
    """
    groups = [[(z, r) for z, r in app["poles"]] for app in ens]
    clusters = cluster_points(groups, rel_tol=rel_tol, min_fraction=0.5)
    if not clusters:
        return [], {"clusters": []}
    rmin = abs(clusters[0]["center"])
    sings, info = [], []
    cuts = []
    for cl in clusters:
        if abs(cl["center"]) > radius_factor * rmin or len(sings) >= max_count:
            break
        if any(abs(cl["center"]) > abs(z0) and abs(mpmath.arg(cl["center"] / z0)) < 0.15 for z0 in cuts):
            continue          # a point on a cut already found: part of the same branch cut
        zs = [m[1] for m in cl["members"]]
        res = [m[2] for m in cl["members"]]
        center = cl["center"]
        # cut detection: points lined up beyond the centre in most approximants
        cut_counts, spacings = [], []
        for app, (i, z, r) in zip([ens[m[0]] for m in cl["members"]], cl["members"]):
            pts = _cut_points(app, z)
            cut_counts.append(len(pts))
            if pts:
                spacings.append(abs(pts[0] - z))
        on_cut = detect_cuts and robust_center([mpmath.mpf(x) for x in cut_counts]) >= 3
        if on_cut:
            cuts.append(center)
        dev = max(abs(z - center) for z in zs)
        half = SAFETY * dev
        if on_cut and spacings:
            # the end of a cut is resolved only to the spacing of the points on it
            # and the nearest pole approaches the branch point slowly: allow 10 %
            half = max(half, 3 * robust_center(spacings), abs(center) / 10)
        half = max(half, abs(center) * eps * 100)
        im_zero = abs(center.imag) <= half and all(abs(z.imag) <= half for z in zs)
        re = Estimate(center.real, center.real - half, center.real + half)
        if im_zero:
            h = SAFETY * max(abs(z.imag) for z in zs)
            # a real series has real or conjugate singularities: a real cluster sits on the axis
            im = Estimate.exact(0) if (real_series or h < abs(center) * eps * 1000) else Estimate(0, -h, h)
        else:
            im = Estimate(center.imag, center.imag - half, center.imag + half)
        rvals = [mpmath.re(r) for r in res]
        extra_note = ""
        rc = robust_center(rvals)
        rdev = max(abs(x - rc) for x in rvals)
        rel_rdev = rdev / max(abs(rc), mpmath.mpf(10) ** -30)
        if residue_is_exponent and on_cut:
            # the log-derivative itself has a cut here (analytic background, confluent or
            # logarithmic terms): its residues are biased, so no exponent is claimed
            theta, kind, stable = None, "branch", False
        elif residue_is_exponent:
            th = rc + exponent_shift
            theta = Estimate(th, th - SAFETY * rdev, th + SAFETY * rdev)
            theta = Estimate(th, min(theta.lower, th - eps * 1000), max(theta.upper, th + eps * 1000))
            kind = classify_kind(theta)
            stable = rel_rdev < 0.05 or rdev < 0.01
            ivals = [mpmath.im(r) for r in res]
            ic = robust_center(ivals)
            cnote = complex_exponent_note(mpmath.mpc(th, ic), max(theta.error, max(abs(v - ic) for v in ivals)))
            if cnote:
                theta, kind = None, "branch"
                extra_note = cnote
        else:
            # multiplicity: poles of the same approximant that coincide with the member
            mults = []
            split = mpmath.mpf(0)
            dig = -mpmath.log10(eps) if eps > 0 else mpmath.mpf(60)
            for i, z, _ in cl["members"]:
                mtol = max(abs(z), mpmath.mpf(1)) * mpmath.mpf(10) ** -min(6, max(2, dig / 4))
                near = [w for w, _ in ens[i]["poles"] if abs(w - z) <= mtol]
                mults.append(len(near))
                if len(near) > 1:
                    split = max([split] + [abs(w - z) for w in near])
            mult = int(robust_center([mpmath.mpf(m) for m in mults]))
            if mult > 1 and split > 0:
                # a multiple pole splits by about eps^(1/m) in rounding: the location is known no
                # better than the split ((1 - x)^-2, 60 exact terms at 40 digits: the double pole
                # came out at 1 - 3.9e-34 + 1.3e-26 i with a band of 1e-39)
                re = Estimate(re.value, min(re.lower, re.value - split), max(re.upper, re.value + split))
                im = Estimate(im.value, min(im.lower, im.value - split), max(im.upper, im.value + split))
            same_mult = all(m == mult for m in mults)
            if mult == 1:
                stable = rel_rdev < 1e-3 and not on_cut
            else:
                stable = same_mult and not on_cut      # residues of a multiple pole are meaningless
            theta = Estimate(-mult, -mult, -mult) if stable else None
            kind = "pole" if stable else ("branch" if on_cut else "unknown")
        note = f"{len(zs)} of {len(ens)} approximants" + ("; poles and zeros line up beyond it" if on_cut else "")
        if extra_note:
            note += f"; {extra_note}"
        sings.append(Singularity(re, im, kind, theta, method, note))
        info.append({"center": center, "members": len(zs), "fraction": cl["fraction"], "on_cut": on_cut,
                     "residues": rvals, "residue_spread": rdev, "stable_residue": stable})
    # two clusters at (almost) the same point: keep the one most approximants agree on
    keep = []
    for i, s in enumerate(sings):
        dup = False
        for j in list(keep):
            t = sings[j]
            if abs(s.location - t.location) <= 2 * rel_tol * max(abs(t.location), mpmath.mpf(10) ** -30):
                dup = True
                if (info[i]["fraction"], -max(s.re.error, s.im.error)) > \
                        (info[j]["fraction"], -max(t.re.error, t.im.error)):
                    keep[keep.index(j)] = i
                break
        if not dup:
            keep.append(i)
    keep.sort()
    return [sings[i] for i in keep], {"clusters": [info[i] for i in keep]}


def approximant_table(ens):
    """Poles/zeros per approximant for diagnostics and plots."""
    return [{"L": a["L"], "M": a["M"], "poles": [z for z, _ in a["poles"]], "zeros": list(a["zeros"]),
             "spurious": list(a["spurious"]), "rel_err": a["rel_err"]} for a in ens]


def estimate_pade(series, ctx=None, count=10):
    """Singularities and radius from the stable poles of a near-diagonal Padé table.

    See the module Notes for how clusters, kinds and bands are built.
    """
    method = "pade"
    prep = prepare(series, ctx)
    with prep.ctx.working():
        c = prep.c
        growth, kappa = classify_growth(c)
        if growth == "factorial":
            return failed(method, Status.NOT_APPLICABLE, "factorially divergent series: radius 0 "
                          "(analyse its Borel transform instead)", prep)
        ens, skipped = pade_ensemble(c, prep.dps, prep.digits, count=count)
        if len(ens) < 3:
            return failed(method, Status.UNSTABLE_PRECISION,
                          f"only {len(ens)} Padé approximants could be computed to the working precision; "
                          "raise the precision", prep, {"skipped": skipped})
        sings, info = clusters_to_singularities(ens, method, prep.eps, real_series=not prep.is_complex)
        n_spur = sum(len(a["spurious"]) for a in ens)
        diag = {"how": ("Near-diagonal Padé table [L/M] from the highest order down; Froissart doublets "
                        f"removed; poles found in >= half of the {len(ens)} approximants clustered; band = "
                        f"{SAFETY} x spread across the table (for branch points at least the spacing of the "
                        "first points on the cut)."),
                "approximants": approximant_table(ens), "skipped": skipped, "spurious_removed": n_spur,
                **info}
        if not sings:
            if growth == "entire-like":
                return finish(method, prep, [], growth="entire-like", diagnostics=diag,
                              radius_u=Estimate(mpmath.inf, mpmath.inf, mpmath.inf),
                              message="no stable poles: entire-like", )
            return failed(method, Status.NOT_CONVERGED, "no pole recurs across the Padé table", prep, diag)
        return finish(method, prep, sings, diagnostics=diag, count=count)
