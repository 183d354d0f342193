"""Natural-boundary probe: do the Padé poles and zeros crowd along a circle?

A function with a natural boundary on ``|x| = R`` (the partition generating
function ``prod_k 1/(1 - x^k)``, lacunary series such as ``sum_n x^(2^n)``)
has no isolated singularities for the poles of its Padé approximants to
converge to. The poles and zeros of the near-diagonal approximants instead
spread along the whole circle, more of them as the order grows, none of them
stable from one order to the next. Estimators that look for stable clusters
then lock onto whichever of those points happen to recur, and report them as
singularities inside the disk.

:func:`probe_natural_boundary` reads four near-diagonal approximants (total
orders about ``n``, ``0.85 n``, ``0.7 n`` and ``0.55 n``) and says a natural
boundary is suspected when, at the highest of them and at two of the other
three (:data:`MIN_CROWD_ORDERS`),

* most of the poles and zeros (:data:`RING_FRACTION`) lie within a ring
  ``|x|/R in [1/(1 + RING_WIDTH), 1 + RING_WIDTH]`` around their median
  modulus ``R``;
* the poles in the ring cover the circle (largest empty arc at most
  :data:`MAX_GAP_DEG` degrees) at distinct angles (:data:`DISTINCT_FRACTION`:
  poles lined up on a few rays, as Padé approximants model branch cuts, share
  their angles);

and moreover the number of ring points grows with the order (at least
:data:`GROWTH_SHARE` of proportional growth), at least :data:`MIN_RING_POLES`
poles lie in the ring at the top order, most ring poles of the top order are
not found again at the next order (stable poles are true poles), and no pole
clearly inside the ring is found again at every order (a stable isolated point
inside would be a singularity nearer than the circle).

>>> from resum.context import Context
>>> p = [1] + [0] * 99                  # partitions: prod_k 1/(1 - x^k), 100 terms
>>> for k in range(1, 100):
...     for n in range(k, 100):
...         p[n] += p[n - k]
>>> import mpmath
>>> with Context(dps=60).working():
...     out = probe_natural_boundary([mpmath.mpf(v) for v in p], 60, 60)
>>> out["suspected"], out["radius"].contains(1)
(True, True)

Notes
-----
This is an estimate from the geometry of the approximants' poles, not a proof:
a function with more poles or branch points on one circle than the orders can
resolve could look the same (not measured; ``1/(1 - x^60) + 1/(2 - x)`` from 100
exact terms gives no verdict, its table being degenerate); adding terms tells them apart.
The radius band holds the middle 80 % of the ring points' moduli at the top
order and twice the change of the median modulus across the orders.

Applicability: series of at least :data:`MIN_ORDER` + 1 usable terms whose
near-diagonal Padé tables are not degenerate (an exact rational function with a
handful of poles makes them degenerate: no verdict, as it has no boundary).

References
----------
E. B. Saff and V. Totik / H. Stahl: poles of Padé approximants accumulate on
the boundary of the maximal domain of single-valued continuation (Stahl,
J. Approx. Theory 91 (1997) 139, from memory).
P. Flajolet and R. Sedgewick, *Analytic Combinatorics*, Cambridge (2009),
Ch. VIII (the partition function; natural boundary on the unit circle; from
memory).
"""
from __future__ import annotations

import mpmath

from ..results import Estimate, point_text
from ..uncertainty.ensemble import SAFETY
from .pade_sing import pade_ensemble

__all__ = ["probe_natural_boundary", "MIN_ORDER"]

#: lowest top total order L + M at which the probe gives a verdict (fewer poles
#: cannot show a crowd against a handful of true singularities)
MIN_ORDER = 40
#: relative half-width of the ring around the median modulus
RING_WIDTH = mpmath.mpf("0.12")
#: share of all poles and zeros that must lie in the ring, at every order
RING_FRACTION = 0.75
#: largest empty arc (degrees) between ring poles, at every order
MAX_GAP_DEG = 60
#: ring poles at distinct angles (1 degree apart) over ring poles, at every order
DISTINCT_FRACTION = 0.7
#: ring poles at the top order
MIN_RING_POLES = 16
#: the count of ring points must grow at least this share of proportionally to the order
GROWTH_SHARE = 0.6
#: ring poles of the top order found again at the next order (relative distance
#: :data:`STABLE_REL`) may be at most this share
MAX_STABLE_SHARE = 0.5
STABLE_REL = mpmath.mpf("0.001")
#: a pole clearly inside the ring is 'found again' when the other orders have one this close
INNER_STABLE_REL = mpmath.mpf("0.01")
#: total orders of the approximants, as shares of the highest one
ORDER_SHARES = (1.0, 0.85, 0.7, 0.55)
#: approximants (the highest among them) that must show the crowd: one approximant of a
#: natural-boundary series now and then cancels most of its poles against zeros (Froissart
#: doublets, left out; measured: the partition function from 108 terms, [27/26])
MIN_CROWD_ORDERS = 3


def _angles_deg(points):
    return sorted(float(mpmath.degrees(mpmath.arg(z))) % 360.0 for z in points)


def _max_gap(angles):
    if not angles:
        return 360.0
    gaps = [b - a for a, b in zip(angles, angles[1:])] + [angles[0] + 360.0 - angles[-1]]
    return max(gaps)


def _distinct(angles, tol=1.0):
    if not angles:
        return 0
    n, last = 1, angles[0]
    for a in angles[1:]:
        if a - last > tol:
            n += 1
            last = a
    if n > 1 and angles[0] + 360.0 - angles[-1] <= tol:
        n -= 1
    return n


def _median(xs):
    xs = sorted(xs)
    m = len(xs) // 2
    return xs[m] if len(xs) % 2 else (xs[m - 1] + xs[m]) / 2


def _quantile(xs, q):
    xs = sorted(xs)
    i = min(len(xs) - 1, max(0, int(round(q * (len(xs) - 1)))))
    return xs[i]


def _approximant(c, t, dps, digits, tries=4):
    """The diagonal approximant of the highest total order from ``t`` down (``tries`` orders)
    that solves to the working precision (or None)."""
    for tt in range(t, max(t - tries, 3), -1):
        ens, _ = pade_ensemble(c, dps, digits, orders=[(tt - tt // 2, tt // 2)])
        if ens:
            return ens[0]
    return None


def _ring_stats(app):
    poles = [z for z, _ in app["poles"]]
    pts = poles + list(app["zeros"])
    pts = [z for z in pts if z != 0]
    if not poles or not pts:
        return None
    R = _median([abs(z) for z in pts])
    lo, hi = R / (1 + RING_WIDTH), R * (1 + RING_WIDTH)
    ring = [z for z in pts if lo <= abs(z) <= hi]
    ring_poles = [z for z in poles if lo <= abs(z) <= hi]
    ang = _angles_deg(ring_poles)
    return {"L": app["L"], "M": app["M"], "R": R, "points": len(pts), "ring": len(ring),
            "ring_poles": len(ring_poles), "ring_fraction": len(ring) / len(pts),
            "max_gap_deg": _max_gap(ang), "distinct_angles": _distinct(ang),
            "moduli": [abs(z) for z in ring], "poles": poles, "ring_pole_list": ring_poles,
            "inner_poles": [z for z in poles if abs(z) < lo]}


def _crowd_fault(st):
    """Why one approximant's poles and zeros do not crowd along a circle (None if they do)."""
    tag = f"[{st['L']}/{st['M']}]"
    if st["ring_fraction"] < RING_FRACTION:
        return f"{tag}: only {st['ring']} of {st['points']} poles and zeros near one circle"
    if st["max_gap_deg"] > MAX_GAP_DEG:
        return f"{tag}: the poles near the circle leave an arc of {st['max_gap_deg']:.0f} deg empty"
    if st["distinct_angles"] < DISTINCT_FRACTION * st["ring_poles"]:
        return f"{tag}: the poles near the circle line up at {st['distinct_angles']} angles"
    return None


def probe_natural_boundary(c, dps: int, digits: int, top=None) -> dict:
    """Whether the poles and zeros of near-diagonal Padé approximants crowd along a circle.

    Parameters
    ----------
    c : list of mpf or mpc
        Coefficients, low to high (as :func:`resum.estimators._common.prepare` gives them).
    dps : int
        Working digits for the approximants.
    digits : int
        Digits the coefficients carry (sets the Froissart-doublet tolerance).
    top : dict, optional
        The highest near-diagonal approximant already computed (keys ``L, M, poles`` as
        ``(z, residue)`` pairs, ``zeros``), as :func:`resum.estimators.pade_sing.pade_ensemble`
        gives it; computed here otherwise.

    Returns
    -------
    dict
        ``suspected`` (bool), ``radius`` (:class:`Estimate` of the circle's radius, or
        None), ``reason`` (one line: why or why not), ``orders`` (per approximant: L, M,
        median modulus R, points, ring points, ring poles, largest empty arc, distinct
        angles), ``how``.
    """
    top_app = top
    top = len(c) - 1 if top is None else top["L"] + top["M"]
    out = {"suspected": False, "radius": None, "orders": [], "reason": "",
           "how": (f"near-diagonal Padé approximants at total orders {', '.join(str(s) for s in ORDER_SHARES)} "
                   f"x the highest: share of poles and zeros within {float(RING_WIDTH):.0%} of their median "
                   f"modulus >= {RING_FRACTION}, largest empty arc between those poles <= {MAX_GAP_DEG} deg, "
                   f"distinct angles >= {DISTINCT_FRACTION}, >= {MIN_RING_POLES} ring poles, count growing with "
                   f"the order, ring poles unstable across orders, no stable pole inside; radius band: "
                   f"10-90 % quantiles of the ring moduli and {SAFETY} x the change of the median across orders")}
    if top < MIN_ORDER:
        out["reason"] = f"highest Padé order {top} too low (the probe needs L + M >= {MIN_ORDER})"
        return out
    stats = []
    for share in ORDER_SHARES:
        if share == ORDER_SHARES[0] and top_app is not None:
            app = top_app
        else:
            app = _approximant(c, int(top * share), dps, digits)
        if app is None:
            out["reason"] = (f"no near-diagonal Padé approximant of total order {int(top * share)} or a little below "
                             "solves to the working precision")
            return out
        st = _ring_stats(app)
        if st is None:
            out["reason"] = f"the [{app['L']}/{app['M']}] approximant has no poles"
            return out
        stats.append(st)
        if len(stats) == 1 and (_crowd_fault(st) or st["ring_poles"] < MIN_RING_POLES):
            # the highest order shows no crowd: no verdict, whatever the lower ones show, so they
            # are not computed (the common case: a series with a few singularities or cuts)
            break
    out["orders"] = [{k: (float(v) if isinstance(v, mpmath.mpf) else v) for k, v in st.items()
                      if k not in ("moduli", "poles", "ring_pole_list", "inner_poles")} for st in stats]
    if len(stats) == 1:
        st = stats[0]
        out["reason"] = _crowd_fault(st) or f"only {st['ring_poles']} poles near the circle"
        return out

    faults = [_crowd_fault(st) for st in stats]
    crowd = [st for st, f in zip(stats, faults) if f is None]
    t0, t1 = stats[0], stats[1]
    why = []
    if faults[0] is not None:
        why.append(faults[0])
    elif len(crowd) < MIN_CROWD_ORDERS:
        why.append("; ".join(f for f in faults if f is not None))
    tl = crowd[-1] if crowd else stats[-1]
    if not why and t0["ring_poles"] < MIN_RING_POLES:
        why.append(f"only {t0['ring_poles']} poles near the circle")
    if not why:
        order_ratio = (t0["L"] + t0["M"]) / (tl["L"] + tl["M"])
        if t0["ring"] < tl["ring"] * (1 + GROWTH_SHARE * (order_ratio - 1)):
            why.append(f"the count near the circle does not grow with the order ({tl['ring']} -> {t0['ring']})")
    if not why:
        stable = [z for z in t0["ring_pole_list"]
                  if any(abs(w - z) <= STABLE_REL * abs(z) for w in t1["poles"])]
        if len(stable) > MAX_STABLE_SHARE * len(t0["ring_pole_list"]):
            why.append(f"{len(stable)} of {len(t0['ring_pole_list'])} poles near the circle are stable "
                       "across orders (true poles)")
    if not why:
        inner = [z for z in t0["inner_poles"]
                 if all(any(abs(w - z) <= INNER_STABLE_REL * abs(z) for w in st["poles"]) for st in stats[1:])]
        if inner:
            why.append(f"stable poles inside the circle at {', '.join(point_text(z, 6) for z in inner[:4])}")
    if why:
        out["reason"] = "; ".join(why)
        return out
    R = t0["R"]
    lo, hi = _quantile(t0["moduli"], 0.1), _quantile(t0["moduli"], 0.9)
    drift = SAFETY * max(abs(st["R"] - R) for st in crowd)
    out["suspected"] = True
    out["radius"] = Estimate(R, min(lo, R - drift), max(hi, R + drift))
    out["reason"] = (f"{t0['ring']} of {t0['points']} poles and zeros of [{t0['L']}/{t0['M']}] lie near |x| = "
                     f"{out['radius']} (largest empty arc {t0['max_gap_deg']:.0f} deg), "
                     f"{tl['ring']} of [{tl['L']}/{tl['M']}]; none stable inside")
    return out
