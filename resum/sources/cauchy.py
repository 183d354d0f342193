r"""Taylor coefficients of any analytic callable by the Cauchy integral.

For ``f`` analytic in ``|x| < R``,
``a_j = (1/(2 pi i)) \oint f(x) x^(-j-1) dx``; on the circle ``|x| = r`` with
``N`` equally spaced points this is the discrete Fourier transform
``a_j ~ (1/N) sum_m f(r w^m) w^(-m j) / r^j`` (``w = e^(2 pi i / N)``), whose
error is the aliasing ``a_{j+N} r^N + a_{j+2N} r^(2N) + ...`` plus rounding
``~ eps max|f| / r^j``.

How the radius is chosen. Circles ``r = r_max, r_max/2, r_max/4, ...`` are
tried from the smallest up. On each, the coefficients are computed with
``N`` and ``2N`` points (the ``N`` points are a subset, so this costs ``2N``
evaluations); the difference estimates the aliasing of the ``N``-point
result and therefore bounds that of the ``2N``-point one. A circle is
accepted only while its coefficients agree with those of the previous,
smaller circle within their errors: Taylor coefficients do not depend on the
radius, while a circle beyond the nearest singularity gives Laurent
coefficients of an annulus (or noise across a cut) that disagree. Each
coefficient is then taken from the accepted circle with the smallest error
estimate.

>>> r = taylor_coefficients(lambda x: mpmath.exp(x), 6, Context(dps=20))
>>> [mpmath.nstr(e.value, 8) for e in r.coefficients]
['1.0', '1.0', '0.5', '0.16666667', '0.041666667', '0.0083333333']
"""
from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Callable, Optional

import mpmath

from ..context import DEFAULT, Context, workdps
from ..errors import InputError
from ..results import Estimate, Status, num_to_str
from ..results import longest_number
from ..series.core import Series
from ._params import number, whole

__all__ = ["taylor_coefficients", "TaylorResult", "fft"]


def fft(values, inverse: bool = False):
    """Radix-2 FFT of a list of mpc (length a power of two) at the current precision.

    ``out[k] = sum_m values[m] exp(-+ 2 pi i m k / N)`` (minus sign unless
    ``inverse``); no normalisation.
    """
    n = len(values)
    if n & (n - 1):
        raise ValueError("length must be a power of two")
    a = list(values)
    j = 0
    for i in range(1, n):            # bit reversal
        bit = n >> 1
        while j & bit:
            j ^= bit
            bit >>= 1
        j |= bit
        if i < j:
            a[i], a[j] = a[j], a[i]
    sign = 1 if inverse else -1
    length = 2
    roots = {}
    while length <= n:
        if length not in roots:
            roots[length] = [mpmath.expjpi(sign * 2 * mpmath.mpf(k) / length) for k in range(length // 2)]
        w = roots[length]
        half = length // 2
        for start in range(0, n, length):
            for k in range(half):
                u = a[start + k]
                v = a[start + k + half] * w[k]
                a[start + k] = u + v
                a[start + k + half] = u - v
        length *= 2
    return a


@dataclass(frozen=True)
class TaylorResult:
    """Taylor coefficients of a callable with per-coefficient errors.

    ``coefficients[j]`` is the real part of ``a_j`` with its band;
    ``imag[j]`` the imaginary part (all within their errors of zero for a
    function real on the real axis, then ``is_real`` is True). ``radius[j]``
    is the circle the coefficient was taken from; ``accepted_radii`` the
    circles that passed the consistency check.

    Notes
    -----
    Band of ``a_j`` = ``|a_j(N) - a_j(2N)|`` (aliasing of the coarser rule,
    an overestimate for the finer one) + ``10 eps max|f| / r^j`` (rounding)
    + disagreement with the next smaller accepted circle, where there is one.
    An estimate, not a bound: aliasing from far-away terms is judged by one
    doubling of the points.
    """

    success: bool
    status: Status
    message: str
    coefficients: tuple
    imag: tuple
    radius: tuple
    accepted_radii: tuple
    points: int
    dps: int
    diagnostics: dict = field(default_factory=dict)

    def to_dict(self) -> dict:
        from ..results import jsonable
        return {"success": self.success, "status": self.status.value, "message": self.message,
                "coefficients": [c.to_dict() for c in self.coefficients],
                "imag": [c.to_dict() for c in self.imag],
                "radius": [num_to_str(r, 10) for r in self.radius],
                "accepted_radii": [num_to_str(r, 10) for r in self.accepted_radii],
                "points": self.points, "dps": self.dps, "diagnostics": jsonable(self.diagnostics)}

    @classmethod
    def from_dict(cls, d: dict) -> "TaylorResult":
        # parse the decimal strings at as many digits as they carry
        with workdps(longest_number(d) + 10):
            return cls._from_dict(d)

    @classmethod
    def _from_dict(cls, d: dict) -> "TaylorResult":
        return cls(bool(d["success"]), Status(d["status"]), d.get("message", ""),
                   tuple(Estimate.from_dict(c) for c in d["coefficients"]),
                   tuple(Estimate.from_dict(c) for c in d["imag"]),
                   tuple(mpmath.mpf(r) for r in d["radius"]),
                   tuple(mpmath.mpf(r) for r in d["accepted_radii"]),
                   int(d["points"]), int(d["dps"]), dict(d.get("diagnostics", {})))

    @property
    def is_real(self) -> bool:
        return all(abs(i.value) <= max(i.error, c.error) for c, i in zip(self.coefficients, self.imag))

    def digits(self) -> int:
        """Smallest number of significant digits over the coefficients not compatible with 0."""
        ds = [c.digits() for c in self.coefficients if abs(c.value) > c.error]
        return int(min(ds)) if ds else 0

    def series(self, variable: str = "x", name: str = "") -> Series:
        """The coefficients as a :class:`Series` carrying ``digits()`` digits
        (coefficients compatible with zero are written as 0)."""
        if not self.is_real:
            raise InputError("the coefficients are complex; Series holds them, but check the "
                             "function is meant to be real on the real axis")
        d = max(1, self.digits())
        cs = [0 if abs(c.value) <= c.error else c.value for c in self.coefficients]
        return Series(cs, variable=variable, digits=d, name=name,
                      provenance={"source": "cauchy", "points": self.points,
                                  "radii": [num_to_str(r, 10) for r in self.accepted_radii],
                                  "dps": self.dps})


def taylor_coefficients(f: Callable, n: int, ctx: Optional[Context] = None,
                        radius=None, max_radius=1, levels: int = 12,
                        points: Optional[int] = None) -> TaylorResult:
    """Taylor coefficients ``a_0 .. a_{n-1}`` of ``f`` at 0.

    Parameters
    ----------
    f : callable
        ``f(x)`` for complex mpmath ``x``, accurate to mpmath's working
        precision when called (it is called inside the working precision).
    n : int
        Number of coefficients.
    ctx : Context
        Digits wanted per coefficient (``ctx.dps``).
    radius : number, optional
        Use only this circle (no search).
    max_radius : number
        Largest circle tried (default 1); the search goes down by halves.
    levels : int
        Number of circles tried.
    points : int, optional
        Points ``N`` of the coarse rule (a power of two; default the smallest
        ``>= 2 n + 16``).

    Returns
    -------
    TaylorResult
        ``success`` is False when no circle gives ``ctx.dps`` digits for every
        coefficient (the result still holds the best values and their bands).

    Applicability: ``f`` analytic in a disk around 0 of radius at least a few
    times ``max_radius / 2^levels``; entire functions and functions with a
    nearest singularity at distance ``R`` both work (for large ``n`` the high
    coefficients come from the largest accepted circle, near ``R/2``).
    """
    ctx = ctx or DEFAULT
    if not callable(f):
        raise InputError("f: expected a callable f(x)")
    whole(n, "n", 1)
    if points is None:
        points = 1 << max(4, math.ceil(math.log2(2 * n + 16)))
    if points & (points - 1) or points < n:
        raise InputError(f"points: must be a power of two >= n, got {points}")
    extra = int(n * math.log10(2)) + 10       # rounding loss on a circle at about R/2
    work = ctx.work_dps + extra
    with workdps(work):
        if radius is not None:
            radii = [number(radius, "radius", real=True)]
        else:
            top = number(max_radius, "max_radius", real=True)
            radii = [top / 2 ** k for k in range(levels - 1, -1, -1)]     # small to large
        accepted = []
        prev = None
        best = [None] * n
        rejected_at = None
        for r in radii:
            try:
                vals, errs, fmax = _on_circle(f, r, n, points)
            except (ZeroDivisionError, ValueError, OverflowError, TypeError) as exc:
                rejected_at = (r, f"f failed on |x| = {mpmath.nstr(r, 5)}: {exc}")
                break
            if not all(mpmath.isfinite(v) for v in vals) or not mpmath.isfinite(fmax):
                rejected_at = (r, "f is not finite on the circle")
                break
            if prev is not None and len(radii) > 1:
                pv, pe = prev
                bad = [j for j in range(n) if abs(vals[j] - pv[j]) > 4 * (errs[j] + pe[j])
                       + mpmath.mpf(10) ** (-work + 5) * (abs(pv[j]) + abs(vals[j]))]
                if bad:
                    rejected_at = (r, f"coefficient {bad[0]} on |x| = {mpmath.nstr(r, 5)} disagrees "
                                      "with the smaller circle (singularity inside or near the circle)")
                    break
                errs = [e + abs(v - p) for e, v, p in zip(errs, vals, pv)]
            accepted.append(r)
            for j in range(n):
                if best[j] is None or errs[j] < best[j][1]:
                    best[j] = (vals[j], errs[j], r)
            prev = (vals, errs)
        if not accepted:
            return TaylorResult(False, Status.FAILED, rejected_at[1] if rejected_at else "no circle",
                                (), (), (), (), points, ctx.dps)
        coeffs, imag, rad = [], [], []
        for v, e, r in best:
            v = mpmath.mpc(v)
            coeffs.append(Estimate(v.real, v.real - e, v.real + e))
            imag.append(Estimate(v.imag, v.imag - e, v.imag + e))
            rad.append(r)
        ok = all(c.error <= mpmath.mpf(10) ** (-ctx.dps) * max(abs(c.value), abs(i.value))
                 or (abs(c.value) <= c.error and abs(i.value) <= i.error and c.error < mpmath.mpf(10) ** (-ctx.dps))
                 for c, i in zip(coeffs, imag))
        msg = (f"{len(accepted)} circles accepted up to |x| = {mpmath.nstr(accepted[-1], 5)}"
               + (f"; stopped: {rejected_at[1]}" if rejected_at else ""))
        if not ok:
            msg = f"not every coefficient reached {ctx.dps} digits; " + msg
        return TaylorResult(ok, Status.CONVERGED if ok else Status.NOT_CONVERGED, msg,
                            tuple(coeffs), tuple(imag), tuple(rad), tuple(accepted), points, ctx.dps,
                            {"work_dps": work, "rejected": None if rejected_at is None
                             else {"radius": rejected_at[0], "reason": rejected_at[1]}})


def _on_circle(f, r, n, N):
    """Coefficients on |x| = r with N and 2N points -> (values from 2N, error estimates, max|f|)."""
    M = 2 * N
    xs = [r * mpmath.expjpi(2 * mpmath.mpf(m) / M) for m in range(M)]
    fv = [mpmath.mpc(f(x)) for x in xs]
    fmax = max(abs(v) for v in fv)
    fine = fft(fv)
    coarse = fft(fv[0::2])
    vals, errs = [], []
    eps = mpmath.eps
    for j in range(n):
        a2 = fine[j] / M / r ** j
        a1 = coarse[j] / N / r ** j
        vals.append(a2)
        errs.append(abs(a1 - a2) + 10 * eps * fmax * math.log2(M) / r ** j)
    return vals, errs, fmax

