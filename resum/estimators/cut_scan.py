"""Singular points along a cut beyond the nearest one, read through the conformal map.

A series whose nearest singularity ``x0`` starts a cut along a ray (to infinity) is re-expanded
in ``w`` (the ray map of :mod:`resum.transforms.conformal`, which sends the cut plane onto the
unit disk and the cut onto the unit circle). A singular point further along the cut then sits
on the circle at the angle ``theta`` with ``x = x0 / sin^2(theta/2)``, and the Padé approximants
of the mapped derivative ``d f/d w`` mark it: a pole on the circle where ``f`` has a pole or a
logarithm, a string of poles and zeros running outward from it where ``f`` has an algebraic
branch point (the approximants' way of drawing a cut). This module reports the points where such
a pole or string meets the circle, found in the near-diagonal approximants of three orders.

Band of a location: the approximants' innermost pole or zero lies a distance ``d`` from the
circle (0 for an exact pole of the derivative); the point is taken to lie within 10 d of its
angle (at least 10 times the spread of the three orders' angles, and twice the step from the
innermost element of a string to the next), converted to ``x`` (``dx/x = -cot(theta/2) d theta``);
a point whose band is wider than a quarter of its distance from 0 is not reported. Measured
(tests/estimators/test_cut_scan.py; the rules were set on 452 points of random sums of 3-4
powers (1 + x/b)^nu, b up to 25, from 40, 60 and 100 terms: 2 outside their band, by 3.8 and
4.1 half-widths, one of them two branch points 7 % apart seen as one): the sum over b = 1, 4, 9,
16 with nu = 1/2, 1/3, -1/2, 3/2 gives -4.01(14) from 60 and -4.01(11) from 100 terms, -9 and
-16 unresolved; (2/pi^2) log cosh(2 pi sqrt(x)) from 60 terms gives its logarithmic points
-(2k+1)^2/16 for k = 1 ... 5, the first to 13 digits. It is an estimate read from approximants,
not a proof: points near ``theta = 0`` (far along the cut) crowd together and are not reported
(``theta < 4/n`` for ``n`` terms), and a point whose string starts further than 0.02 from the
circle is left out as unresolved.
"""
from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction
from typing import Optional, Sequence

import mpmath

from ..results import Estimate
from ..transforms.conformal import RayMap, pull_back
from ._num import poly_roots

__all__ = ["CutPoint", "scan_cut", "NEAR_RIM", "BAND_FACTOR"]

#: how close to the circle (in |w|) the innermost pole or zero of a string must come
NEAR_RIM = 0.02
#: digits to which the approximants' poles and zeros are found (their angles and moduli are
#: compared in double precision)
ROOT_DIGITS = 20
#: the band: this many times the innermost element's distance from the circle (or the two
#: orders' difference in angle), in angle
BAND_FACTOR = 10
#: elements within this angle and this radial distance of the innermost one belong to its string
STRING_ANGLE = 0.03
STRING_RADIUS = 0.06
#: ... and lie further from the circle by at least this fraction of their angle from it
OUTWARD = 0.3
#: a point whose band is wider than this fraction of its distance from 0 is not reported
MAX_REL_BAND = 0.25
#: ... and at least this many times the step from a string's innermost element to the next
#: (a strong branch point, f ~ (1 - x/b)^nu with nu < -1, puts that element next to the circle
#: but beside the point)
GAP_FACTOR = 2
#: points within this angle of w = -1 (x within 0.25 % of x0) are x0's own string
X0_ANGLE = 0.1
#: approximants of the mapped derivative compared: the near-diagonal top one and those with
#: 2, 4, ... fewer terms; a point must be found in every one
N_ORDERS = 3


@dataclass(frozen=True)
class CutPoint:
    """A singular point on the cut beyond the nearest one.

    ``x``: location (a band on the cut's ray; real for a cut along the negative axis), of
    ``x^power`` where the series runs in powers of ``x^power`` (only every power-th coefficient
    non-zero: the scan ran in that variable);
    ``kind``: ``"pole or logarithm"`` (an isolated pole of the mapped derivative on the circle)
    or ``"branch point"`` (a string of poles and zeros starting at the circle); ``theta``: its
    angle on the unit circle of ``w``; ``elements``: poles and zeros in its string (highest
    order); ``offset``: distance of the innermost one from the circle."""

    x: Estimate
    kind: str
    theta: float
    elements: int
    offset: float
    power: int = 1

    def to_dict(self) -> dict:
        return {"x": self.x.to_dict(), "x_text": str(self.x), "kind": self.kind, "power": self.power,
                "theta": f"{self.theta:.6g}", "elements": self.elements, "offset": f"{self.offset:.3g}"}

    @classmethod
    def from_dict(cls, d: dict) -> "CutPoint":
        return cls(Estimate.from_dict(d["x"]), str(d["kind"]), float(d["theta"]), int(d["elements"]),
                   float(d["offset"]), int(d.get("power", 1)))


def _elements(d: Sequence, L: int, M: int, dps: int, input_digits):
    """Poles and zeros ``(theta, |w|, 'P'/'Z')`` of the [L/M] approximant of ``d`` near the
    circle, in the upper half-plane (real input: the others are their conjugates); None when the
    approximant cannot be built."""
    from .._kernels.pade import pade
    try:
        P = pade(list(d), L, M, dps, input_digits=input_digits)
    except (ValueError, ZeroDivisionError, ArithmeticError):
        return None
    # the scan reads each root's angle and modulus in double precision: 20 digits are plenty
    # (the estimators' root finder, refined to them rather than to the working precision: the
    # kernel's isolation to dps digits took 0.47 s per polynomial of a 200-term series)
    out = []
    for kind, coeffs in (("P", P.q), ("Z", P.p)):
        rts = poly_roots(list(coeffs), dps, tol_digits=ROOT_DIGITS) if len(coeffs) > 1 else []
        if rts is None:
            return None
        for z in rts:
            if mpmath.im(z) < 0:
                continue
            r = abs(z)
            if 1 - 4 * NEAR_RIM < r < 1 + 12 * NEAR_RIM:
                out.append((float(mpmath.arg(z)), float(r), kind))
    return out


def _strings(els, theta_min):
    """Per innermost element near the circle (a pole, or a zero with a string behind it):
    ``(theta, offset, kind, n_elements)``."""
    found = []
    near = sorted((e for e in els if abs(e[1] - 1) < NEAR_RIM and abs(e[0]) > theta_min),
                  key=lambda e: abs(e[1] - 1))
    taken = []
    for th, r, k in near:
        if any(abs(th - t) < STRING_ANGLE for t in taken):
            continue                     # part of a string already reported
        # a string runs outward from the circle; the neighbouring points' own poles and zeros,
        # which crowd along it far down the cut, lie beside the element, not behind it
        mates = [e for e in els if (e[0], e[1]) != (th, r) and abs(e[0] - th) < STRING_ANGLE
                 and 0 < abs(e[1] - 1) - abs(r - 1) < STRING_RADIUS
                 and abs(e[1] - 1) - abs(r - 1) > OUTWARD * abs(e[0] - th)]
        if k == "Z" and not mates:
            continue                     # a lone zero of the derivative is no singular point
        taken.append(th)
        # the step to the next element of the string: the approximants' resolution there
        gap = min((abs(e[0] - th) + abs(e[1] - r) for e in mates), default=0.0)
        found.append((th, abs(r - 1), k, 1 + len(mates), gap))
    return found


def scan_cut(coeffs: Sequence, x0, dps: int, *, input_digits: Optional[float] = None) -> list:
    """Singular points on the cut from ``x0`` (the nearest singularity, real and non-zero; the
    cut runs from it away from 0 along the real axis) beyond ``x0`` itself, nearest first, as
    :class:`CutPoint` (see the module notes for how and how well). ``coeffs``: the series in its
    variable, real (at least 16 terms; otherwise, or for complex input, ``[]``)."""
    n = len(coeffs)
    if n < 16:
        return []
    x0 = mpmath.mpmathify(x0) if not isinstance(x0, (int, Fraction)) else x0
    if isinstance(x0, mpmath.mpc) or any(isinstance(mpmath.mpmathify(c), mpmath.mpc)
                                         and mpmath.im(mpmath.mpmathify(c)) != 0 for c in coeffs):
        return []                                # real series with a cut on the real axis only
    cmap = RayMap(x0)
    with mpmath.workdps(dps + 20):
        cw = pull_back(list(coeffs), cmap, dps + 20)
        d = [(k + 1) * cw[k + 1] for k in range(len(cw) - 1)]
    m = len(d) - 1
    orders = [(m - m // 2 - 2 * j, m // 2 - j) for j in range(N_ORDERS)]
    theta_min = max(0.03, 4.0 / n)
    found = []                                   # per order: its strings near the circle
    for L, M in orders:
        els = _elements(d, L, M, dps, input_digits)
        if els is None:
            return []
        found.append(_strings(els, theta_min))
    top = found[0]
    sign = cmap.rim_point()                      # w of x = infinity (1 for a real x0 < 0)
    out = []
    with mpmath.workdps(dps):
        for th, off, k, nel, gap in top:
            if abs(th) > mpmath.pi - max(X0_ANGLE, BAND_FACTOR * off):
                continue                         # x0 itself (w = -sign) and its string
            offs, spread = [off], 0.0
            for low in found[1:]:
                match = [t for t in low if abs(t[0] - th) < max(BAND_FACTOR * max(off, t[1]), 0.005)]
                if not match:
                    break
                t2 = min(match, key=lambda t: abs(t[0] - th))
                offs.append(t2[1])
                spread = max(spread, abs(t2[0] - th))
            if len(offs) < len(found):
                continue                         # not found at every order
            dth = max(BAND_FACTOR * max(max(offs), spread), GAP_FACTOR * gap, 1e-12)
            kind = "pole or logarithm" if (k == "P" and nel == 1 and off < 1e-4) else "branch point"
            xs = [cmap.x_of_w(sign * mpmath.expj(th + s * dth)) for s in (0, -1, 1)]
            vals = [mpmath.re(x) for x in xs]
            x = Estimate(vals[0], min(vals), max(vals))
            if not x.error < MAX_REL_BAND * abs(x.value) or x.contains(mpmath.mpmathify(x0)):
                continue                         # not resolved, or x0 itself
            out.append(CutPoint(x, kind, float(th), nel, float(off)))
    out.sort(key=lambda p: abs(p.x.value))
    return out
