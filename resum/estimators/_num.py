"""Private numeric helpers shared by the singularity estimators.

Linear solves, polynomial roots and Padé denominators at an explicit number
of decimal digits, done in ball arithmetic (python-flint) for speed. Every
function takes ``dps`` and restores flint's working precision on exit, so no
global state leaks. Inputs and outputs are mpmath numbers.

These helpers return ``None`` (never a wrong number) when a system is
singular or a ball is too wide to say anything at the requested precision.

>>> import mpmath
>>> from resum.context import workdps
>>> with workdps(30):
...     r = poly_roots([mpmath.mpf(2), mpmath.mpf(-3), mpmath.mpf(1)], 30)   # 2 - 3x + x^2
>>> sorted(round(float(z.real), 12) for z in r)
[1.0, 2.0]
"""
from __future__ import annotations

import math
import random

from typing import Optional

import flint
import mpmath

from .._kernels.aberth import roots as ball_roots
from .._kernels.flint_bridge import flint_dps
from .._kernels.hermite import two_run_error
from ..context import workdps

__all__ = ["flint_dps", "solve", "poly_roots", "pade_coeffs", "polyval", "polyval_many", "polyder",
           "nearest_distances"]


def _is_complex(xs) -> bool:
    return any(isinstance(x, mpmath.mpc) and x.imag != 0 for x in xs)


def _to_arb(x):
    if isinstance(x, mpmath.mpc):
        return flint.acb(flint.arb(x.real), flint.arb(x.imag))
    return flint.arb(mpmath.mpf(x))


def _from_ball(b):
    if isinstance(b, flint.acb):
        re, im = mpmath.mpf(b.real.mid()), mpmath.mpf(b.imag.mid())
        return mpmath.mpc(re, im)
    return mpmath.mpf(b.mid())


def _rel_rad(b) -> float:
    """Relative radius of a ball (inf when the ball contains zero widely)."""
    if isinstance(b, flint.acb):
        r = float(b.real.rad()) + float(b.imag.rad())
        m = abs(complex(float(b.real.mid()), float(b.imag.mid())))
    else:
        r = float(b.rad())
        m = abs(float(b.mid()))
    if m == 0:
        return 0.0 if r == 0 else float("inf")
    return r / m


def _to_balls(values, cplx):
    """Entries as arb/acb, converting each distinct mpmath object once.

    The matrices of the estimators are Toeplitz-like: the same coefficient
    object appears in many entries, and converting it is what costs.
    """
    cache = {}      # id -> (ball, value); holding the value keeps its id from being reused
    out = []
    for v in values:
        hit = cache.get(id(v))
        if hit is None:
            if cplx:
                z = mpmath.mpc(v)
                ball = flint.acb(z.real, z.imag)
            else:
                ball = flint.arb(mpmath.mpf(v))
            hit = cache[id(v)] = (ball, v)
        out.append(hit[0])
    return out


def lu_solve(A, b):
    """``mpmath.lu_solve`` that reports a singular system as ``ZeroDivisionError``.

    mpmath's pivot search can fail on a singular matrix with an internal
    ``TypeError`` (an all-zero column leaves no pivot) instead of its own
    ``ZeroDivisionError``; callers catch the latter.
    """
    try:
        return mpmath.lu_solve(A, b)
    except TypeError as e:
        raise ZeroDivisionError(f"singular linear system ({e})") from None


#: above this many unknowns :func:`solve` estimates the error instead of certifying it
CERTIFIED_MAX = 120


def solve(rows, rhs, dps: int):
    """Solve the square system ``rows @ x = rhs`` at ``dps`` digits.

    Returns ``(x, rel_err)`` with ``x`` a list of mpmath numbers and
    ``rel_err`` an estimate of the largest relative error of the solution's
    entries for data carrying ``dps`` digits (a measure of how many digits
    survive the elimination), or ``None`` when the matrix is singular at this
    precision (no digit survives normwise; an entry that is zero in truth has a
    large relative error and is not a reason: callers test such fits by their
    residual).

    Up to :data:`CERTIFIED_MAX` unknowns: FLINT's certified solve
    (``arb_mat.solve``, preconditioned), ``rel_err`` the largest relative ball
    radius, ``None`` when it cannot certify the system. Above: two approximate
    LU solves in FLINT (midpoints, partial pivoting) at ``dps + 10`` digits,
    the second of the system whose data (each distinct coefficient object
    once, so a Toeplitz-like matrix keeps its structure) are moved by one unit
    in their ``dps``-th digit, with signs from a fixed pseudo-random
    sequence; ``|x1_i - x2_i| / |x1_i|`` is the estimate (the condition number times the data's last digit, plus the
    two runs' rounding, ten digits below it). A matrix that is singular in
    exact arithmetic (a series obeying a lower-order equation exactly) is
    regular once rounded, and its two solutions then differ completely.
    Why two ways: at 200 unknowns and 220 digits the certified solve takes
    1.1 s against 0.5 s, and it was 60 % of ``analyze`` on a 200-term series
    at 210 digits (the differential approximants solve ~50 such systems); its
    radii can also be far too pessimistic (a 185 x 185 system at 225 digits:
    relative radius 1e9, actual error 5e-94 against its own solve at 300 and
    400 digits). Two cheaper estimates were tried and dropped: one step of
    iterative refinement and a rerun at higher precision on the same data;
    both stay small on a matrix that is singular before rounding. An
    estimate, not a bound: the estimators only use it to drop approximants
    that kept fewer than a third of the digits. Used for every size, it let
    in second-order approximants of 60-term kernel series at 40 digits that
    the certified radii had kept out, whose exponents (2.45(3) at a = 7 pi/24)
    then contradicted the ratios (studies/bes_angles: four angles "methods
    disagree" instead of none); below :data:`CERTIFIED_MAX` the certified
    solve stays, and the studies' series (up to 120 terms) are analysed as
    before. The differential approximants above that size now go to
    :func:`resum._kernels.hermite.hermite_pade` first (the same forms from their structure, 6-11x
    faster at 170-199 unknowns) and come here only when it keeps too few digits.
    """
    n = len(rows)
    if n > CERTIFIED_MAX:
        return _solve_estimated(rows, rhs, dps)
    flat = [v for r in rows for v in r]
    cplx = _is_complex(flat) or _is_complex(rhs)
    with workdps(dps + 10), flint_dps(dps + 10):
        if cplx:
            A = flint.acb_mat(n, n, _to_balls(flat, True))
            b = flint.acb_mat(n, 1, _to_balls(rhs, True))
        else:
            A = flint.arb_mat(n, n, _to_balls(flat, False))
            b = flint.arb_mat(n, 1, _to_balls(rhs, False))
        try:
            x = A.solve(b)
        except ZeroDivisionError:
            return None
        entries = [x[i, 0] for i in range(n)]
        out = [_from_ball(e) for e in entries]
        err = max((_rel_rad(e) for e in entries if _from_ball(e) != 0), default=0.0)
    return out, err


def _solve_estimated(rows, rhs, dps: int):
    """:func:`solve` above :data:`CERTIFIED_MAX` unknowns (see there)."""
    n = len(rows)
    flat = [v for r in rows for v in r]
    cplx = _is_complex(flat) or _is_complex(rhs)
    with workdps(dps + 10), flint_dps(dps + 10):
        mat = flint.acb_mat if cplx else flint.arb_mat
        # _to_balls converts each distinct coefficient object once and hands back the same ball
        # for it everywhere: each distinct ball is moved once, in order of first appearance
        balls = _to_balls(flat + list(rhs), cplx)
        rng = random.Random(len(flat))
        step = flint.arb(10) ** (-int(dps))
        moved = {}
        for bl in balls:
            if id(bl) not in moved:
                moved[id(bl)] = bl * (1 + step if rng.random() < 0.5 else 1 - step)
        shifted = [moved[id(bl)] for bl in balls]
        nn = n * n
        try:
            x1 = mat(n, n, balls[:nn]).solve(mat(n, 1, balls[nn:]), algorithm="approx")
            x2 = mat(n, n, shifted[:nn]).solve(mat(n, 1, shifted[nn:]), algorithm="approx")
        except ZeroDivisionError:
            return None
        v1 = [_from_ball(x1[i, 0]) for i in range(n)]
        v2 = [_from_ball(x2[i, 0]) for i in range(n)]
        if not all(mpmath.isfinite(abs(v)) for v in v1 + v2):
            return None
        err = two_run_error(v1, v2)
    return None if err is None else (v1, err)


def polyval(p, x):
    """Evaluate a polynomial given low to high at ``x`` (Horner)."""
    s = 0
    for c in reversed(p):
        s = s * x + c
    return s


def polyval_many(p, xs, dps: int):
    """Values of the polynomial ``p`` (low to high) at each of ``xs``, as mpmath numbers.

    One conversion of ``p`` to a flint polynomial, then each point evaluated in C at
    ``dps + 10`` digits (the midpoint of the ball is returned); much faster than
    :func:`polyval` on many points. An empty polynomial is 0 everywhere.
    """
    if not p:
        return [mpmath.mpf(0) for _ in xs]
    with workdps(dps + 10), flint_dps(dps + 10):
        poly = flint.acb_poly([_to_arb(mpmath.mpmathify(c)) for c in p])
        out = []
        for x in xs:
            v = poly(_to_arb(mpmath.mpc(x)))
            out.append(mpmath.mpc(mpmath.mpf(v.real.mid()), mpmath.mpf(v.imag.mid())))
    return out


def nearest_distances(zs, ws):
    """For each point of ``zs`` the distance to the nearest of ``ws`` (inf if none).

    Computed in double precision with numpy; each distance is then recomputed in
    mpmath from the few candidates within a factor 2 of the double-precision
    minimum (plus a rounding margin), so the result equals the plain mpmath
    minimum. Points outside the double range are handled in mpmath throughout.
    """
    import numpy as np
    if not ws:
        return [mpmath.inf] * len(zs)
    try:
        wa = np.array([complex(w) for w in ws])
        za = np.array([complex(z) for z in zs])
    except OverflowError:
        wa = za = None
    if wa is None or not (np.all(np.isfinite(wa)) and np.all(np.isfinite(za))):
        return [min(abs(z - w) for w in ws) for z in zs]
    dist = np.abs(za[:, None] - wa[None, :])
    scale = np.maximum(np.abs(za)[:, None], np.abs(wa)[None, :])
    out = []
    for i, z in enumerate(zs):
        row = dist[i]
        lim = 2 * row.min() + 1e-12 * scale[i].max()
        cand = np.nonzero(row <= lim)[0]
        out.append(min(abs(z - ws[j]) for j in cand))
    return out


def polyder(p):
    return [k * p[k] for k in range(1, len(p))]


def root_digits(rel_err, dps: int) -> int:
    """Digits to which the roots of a polynomial whose coefficients carry the relative accuracy
    ``rel_err`` are worth refining: those digits plus :data:`ROOT_DIGITS_MARGIN` (a simple root
    moves by about the coefficients' relative change times its condition, and the estimators
    compare roots across approximants far above that level), between 30 and ``dps``.

    >>> root_digits(1e-50, 210), root_digits(1e-5, 210), root_digits(1e-300, 210), root_digits(0.0, 210)
    (75, 30, 210, 210)
    """
    if not rel_err or rel_err <= 0 or not math.isfinite(rel_err):
        return dps
    return int(min(dps, max(30, math.ceil(-math.log10(rel_err)) + ROOT_DIGITS_MARGIN)))


#: digits beyond the coefficients' own accuracy to which :func:`root_digits` refines roots
ROOT_DIGITS_MARGIN = 25


def poly_roots(p, dps: int, tol_digits: Optional[int] = None, seeds=None):
    """All complex roots of the polynomial ``p`` (coefficients low to high).

    ``seeds``: roots of a neighbouring polynomial (the previous approximant of a table), as
    starting values of the fast path; they change its speed, not its result.

    Trailing zero coefficients are dropped and exact zero roots split off.
    The coefficients are taken at ``dps + 10`` digits; the roots are refined to
    within ``10^-tol_digits`` (default ``dps``). First by
    :func:`resum._kernels.aberth.refined_roots` (fast, and proved isolated), then,
    where that fails, by flint's root isolation on the midpoints (an exact
    polynomial), and last by double-precision companion roots polished by Newton
    steps at the working precision when isolation fails (numerically multiple
    roots). Returns a list of mpc (empty for a constant polynomial).
    """
    p = list(p)
    while p and p[-1] == 0:
        p.pop()
    # exact zero roots (low-order zero coefficients) are split off: flint's isolation needs a
    # squarefree polynomial
    z0 = 0
    while z0 < len(p) - 1 and p[z0] == 0:
        z0 += 1
    if z0:
        rest = poly_roots(p[z0:], dps, tol_digits, seeds)
        return None if rest is None else [mpmath.mpc(0)] * z0 + rest
    if len(p) <= 1:
        return []
    with workdps(dps + 10), flint_dps(dps + 10):
        try:
            poly = flint.acb_poly([_to_arb(mpmath.mpmathify(c)) for c in p])
            # an exact polynomial: isolate and refine its roots
            poly = flint.acb_poly([flint.acb(c.real.mid(), c.imag.mid()) for c in poly.coeffs()])
            tol = flint.arb(10) ** (-(dps if tol_digits is None else min(dps, tol_digits)))
            warm = None
            if seeds:
                warm = [complex(z) for z in seeds if z != 0 and mpmath.isfinite(abs(z))]
            rts = ball_roots(poly, flint.ctx.prec, tol, 8 * (dps + 10) * 4, warm)
            return [_from_ball(r) for r in rts]
        except (ValueError, ArithmeticError):
            pass
        # numerically multiple roots: double-precision companion roots polished by Newton
        # steps at the working precision (linear convergence at a multiple root, which is
        # then known only to about half the digits -- such roots are flagged by the callers'
        # clustering, not trusted individually)
        return _newton_polish(p, dps)


def _double_roots(pm):
    """Companion-matrix roots in double precision after the exact rescaling ``z -> 2^e z``
    that balances the lowest non-zero and the highest coefficient (a polynomial whose
    coefficients span hundreds of decades still fits in doubles); None when it does not."""
    import numpy as np
    k0 = next((i for i, v in enumerate(pm) if v != 0), len(pm) - 1)
    n = len(pm) - 1
    with workdps(20):
        e = 0
        if n > k0:
            e = int(mpmath.nint(mpmath.log(abs(pm[k0]) / abs(pm[n]), 2) / (n - k0)))
        scaled = [mpmath.mpc(v) * mpmath.ldexp(1, e * k) for k, v in enumerate(pm)]
        big = max(abs(v) for v in scaled)
        try:
            arr = np.array([complex(v / big) for v in reversed(scaled)], dtype=complex)
            guess = np.roots(arr)
        except (ValueError, np.linalg.LinAlgError, OverflowError):
            return None
    if not np.all(np.isfinite(guess)):
        return None
    return [complex(g) * 2.0 ** e for g in guess]


def _newton_polish(p, dps, steps=60):
    with workdps(dps + 10):
        pm = [mpmath.mpmathify(c) for c in p]
        guess = _double_roots(pm)
        if guess is None:
            return None
        dp = polyder(pm)
        out = []
        tol = mpmath.mpf(10) ** (-dps)
        for g in guess:
            z = mpmath.mpc(complex(g))
            for _ in range(steps):
                d = polyval(dp, z)
                if d == 0:
                    break
                step = polyval(pm, z) / d
                z -= step
                if abs(step) <= tol * max(1, abs(z)):
                    break
            out.append(z)
        return out


def pade_coeffs(c, L: int, M: int, dps: int):
    """Numerator and denominator of the [L/M] Padé approximant of ``c``.

    ``c`` holds at least ``L + M + 1`` coefficients low to high. The
    denominator is normalised by ``q[0] = 1``. Returns ``(p, q, rel_err)`` or
    ``None`` if the Toeplitz system is singular at ``dps`` digits.

    Delegates to :func:`resum._kernels.pade.pade` (continued-fraction
    recursion in ball arithmetic with its own guard digits; ball LU or SVD at
    singular blocks), so the coefficients carry at least ``dps`` correct
    digits for the input as given. ``rel_err`` is ``10**-digits`` of the
    kernel with ``input_digits = dps + 10``: the normwise relative change of
    the coefficients when the input is perturbed at the ``10**-(dps + 10)``
    level (an estimate of the conditioning, as the radius of the former
    ``dps + 10``-digit solve was), or the rigorous rounding bound if larger.
    ``p`` and ``q`` are padded with zeros to ``L + 1`` and ``M + 1`` entries.
    ``None`` when the table is degenerate there (the kernel had to lower the
    degrees by rank: SVD or exact reduction) or the approximant is zero.
    """
    if len(c) < L + M + 1:
        raise ValueError(f"[{L}/{M}] needs {L + M + 1} coefficients, got {len(c)}")
    from .._kernels.pade import pade
    with workdps(dps + 10):
        cm = [v if isinstance(v, (mpmath.mpf, mpmath.mpc)) else mpmath.mpmathify(v)
              for v in c[:L + M + 1]]
    try:
        r = pade(cm, L, M, dps, input_digits=dps + 10)
    except (ArithmeticError, ValueError):
        return None
    except Exception:  # noqa: BLE001 -- an internal kernel failure: use the direct solve instead
        return _pade_by_solve(c, L, M, dps)
    if r.diagnostics.get("note") == "zero approximant":
        return None
    if r.defect > 0 and r.method in ("svd", "exact"):
        return None
    err = 0.0 if not math.isfinite(r.digits) else 10.0 ** (-r.digits)
    with workdps(dps + 10):
        p = [mpmath.mpmathify(a) for a in r.p] + [mpmath.mpf(0)] * (L + 1 - len(r.p))
        q = [mpmath.mpmathify(b) for b in r.q] + [mpmath.mpf(0)] * (M + 1 - len(r.q))
    return p, q, err


def _pade_by_solve(c, L: int, M: int, dps: int):
    """[L/M] from the Toeplitz system solved in ball arithmetic (fallback path)."""
    cc = lambda k: c[k] if k >= 0 else 0  # noqa: E731
    if M == 0:
        q = [mpmath.mpf(1)]
        err = 0.0
    else:
        rows = [[cc(L + i - j) for j in range(1, M + 1)] for i in range(1, M + 1)]
        rhs = [-cc(L + i) for i in range(1, M + 1)]
        sol = solve(rows, rhs, dps)
        if sol is None:
            return None
        qs, err = sol
        q = [mpmath.mpf(1)] + qs
    with workdps(dps + 10):
        p = [sum(q[j] * cc(k - j) for j in range(0, min(k, M) + 1)) for k in range(L + 1)]
    return p, q, err
