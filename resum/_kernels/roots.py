"""Polynomial roots with certified isolation (python-flint complex balls).

``poly_roots(coeffs, dps)`` returns every root of the polynomial
``coeffs[0] + coeffs[1] x + ... `` (coefficients low to high) as pairs
``(root, radius)``: ``root`` is an mpc and ``radius`` an mpf such that, for
the polynomial whose coefficients are exactly the given numbers, the true
root lies within ``radius`` of ``root``.

>>> from fractions import Fraction
>>> r = poly_roots([-2, 0, 1], dps=30)          # x^2 - 2
>>> [mpmath.nstr(z.real, 25) for z, rad in r]
['1.414213562373095048801689', '-1.414213562373095048801689']
>>> all(rad < mpmath.mpf(10)**-30 for z, rad in r)
True

Notes
-----
How to read the radius. Isolation and refinement are done by Arb
(``acb_poly.roots``), which proves that each returned disc contains exactly
one root of the midpoint polynomial; the precision is raised until each root
is known to ``dps`` significant digits (or ``maxprec`` bits are reached, in
which case :attr:`RootsResult.resolved` says which roots fell short).
When ``input_digits`` is given the coefficients are only known to that many
digits; the radius then also includes the first-order sensitivity estimate
``10**-input_digits * sum_k |c_k| |r|^k / |p'(r)|`` (Wilkinson's condition
number of a simple root), which is an estimate, not a bound. Exact input
(int/Fraction) is first split into square-free factors, so multiple roots are
returned with their multiplicity and radius 0 is never claimed for an
irrational root.

Applicability: any degree; clustered or multiple roots of inexact input
cannot be isolated (the routine then falls back to mpmath's Durand-Kerner
iteration at working precision and reports those roots as not certified).

References
----------
F. Johansson, "Arb: efficient arbitrary-precision midpoint-radius interval
arithmetic", IEEE Trans. Computers 66 (2017) 1281.
J. H. Wilkinson, *Rounding Errors in Algebraic Processes*, Prentice-Hall
(1963), ch. 2 (condition of polynomial roots).
"""
from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Optional

import flint
import mpmath
import numpy as np

from . import flint_bridge as fb

__all__ = ["RootsResult", "poly_roots", "poly_roots_full", "poly_roots_fp"]


@dataclass(frozen=True)
class RootsResult:
    """All roots of a polynomial with their radii.

    Attributes
    ----------
    roots : list of mpc
        Sorted by modulus, then by argument.
    radii : list of mpf
        Radius around each root (see module Notes).
    certified : list of bool
        True where Arb proved the isolation (midpoint polynomial).
    resolved : list of bool
        True where ``radius <= 10**-dps * max(|root|, tiny)``.
    multiplicity : list of int
    success : bool
        All roots certified and resolved.
    message : str
    prec_bits : int
        Highest precision used.
    """

    roots: list
    radii: list
    certified: list
    resolved: list
    multiplicity: list
    success: bool
    message: str
    prec_bits: int
    diagnostics: dict = field(default_factory=dict)

    def pairs(self):
        return list(zip(self.roots, self.radii))


def _strip(coeffs):
    c = list(coeffs)
    while c and c[-1] == 0:
        c.pop()
    v = 0
    while v < len(c) and c[v] == 0:
        v += 1
    return c, v


def _sort_key(z):
    return (float(abs(z)), float(mpmath.arg(z)) if z != 0 else 0.0)


def _isolate(poly_acb, dps, start_prec, maxprec):
    """Roots of an acb_poly (square-free midpoint) refined to dps relative
    digits; returns (list of acb, prec used, all_resolved)."""
    prec = start_prec
    tol_rel = mpmath.mpf(10) ** (-dps)
    while True:
        with fb.flint_prec(prec):
            p = flint.acb_poly([flint.acb(c) for c in poly_acb.coeffs()])
            try:
                rts = p.roots(maxprec=max(prec, 4 * prec))
                mags = [abs(fb.acb_to_mpc(r)) - fb.acb_rad(r) for r in rts]
                low = min([m for m in mags if m > 0] or [mpmath.mpf(1)])
                tol = float(tol_rel * low / 100) if tol_rel * low / 100 > 1e-300 else None
                if tol is not None:
                    rts = p.roots(tol=tol, maxprec=max(prec, 4 * prec))
                else:  # below double range: refine by raising precision only
                    rts = p.roots(tol=flint.arb(tol_rel * low / 100), maxprec=max(prec, 4 * prec))
            except ValueError:
                rts = None
        if rts is not None:
            ok = True
            for r in rts:
                rad = fb.acb_rad(r)
                mag = abs(fb.acb_to_mpc(r))
                if mag == 0 or rad > tol_rel * mag:
                    ok = False
                    break
            if ok or prec >= maxprec:
                return rts, prec, ok
        elif prec >= maxprec:
            return None, prec, False
        prec = min(2 * prec, maxprec)


def poly_roots_full(coeffs, dps: int, *, input_digits: Optional[float] = None,
                    maxprec: Optional[int] = None) -> RootsResult:
    """All roots of a polynomial (coefficients low to high) to ``dps`` digits.

    Parameters
    ----------
    coeffs : list
        int, Fraction, float, mpf or mpc coefficients, low to high.
    dps : int
        Significant decimal digits wanted in each root.
    input_digits : float, optional
        Digits the (inexact) coefficients carry; adds the first-order input
        sensitivity to each radius.
    maxprec : int, optional
        Cap on the working precision in bits (default ``8 * bits(dps) + 256``).

    Returns
    -------
    RootsResult

    Examples
    --------
    >>> res = poly_roots_full([1, -2, 1], dps=20)        # (x - 1)^2
    >>> res.multiplicity, res.success
    ([2], True)
    """
    c, v = _strip(coeffs)
    if not c:
        raise ValueError("the zero polynomial has no well-defined roots")
    start = fb.prec_for_dps(dps) + 32
    maxprec = maxprec or 8 * start + 256
    roots, radii, cert, mult = [], [], [], []
    if v:
        roots.append(mpmath.mpc(0))
        radii.append(mpmath.mpf(0))
        cert.append(True)
        mult.append(v)
    c = c[v:]
    used = start
    msg = []
    if len(c) > 1:
        if all(fb.is_exact(x) for x in c):
            P = flint.fmpq_poly([fb.to_fmpq(x) for x in c])
            _, factors = P.factor_squarefree()
            for f, e in factors:
                fz = f.numer() if hasattr(f, "numer") else f
                with fb.flint_prec(start):
                    pa = flint.acb_poly([flint.acb(flint.arb(x)) for x in fz.coeffs()])
                rts, pr, ok = _isolate(pa, dps, start, maxprec)
                used = max(used, pr)
                if rts is None:  # cannot happen for exact square-free input
                    raise ArithmeticError("root isolation failed for an exact square-free factor")
                for r in rts:
                    roots.append(fb.acb_to_mpc(r))
                    radii.append(fb.acb_rad(r))
                    cert.append(True)
                    mult.append(int(e))
        else:
            pa = flint.acb_poly([fb.to_acb(x) for x in c])
            rts, pr, ok = _isolate(pa, dps, start, maxprec)
            used = max(used, pr)
            if rts is not None:
                for r in rts:
                    roots.append(fb.acb_to_mpc(r))
                    radii.append(fb.acb_rad(r))
                    cert.append(True)
                    mult.append(1)
            else:
                msg.append("isolation failed (clustered or multiple roots); "
                           "used Durand-Kerner iteration, radii are estimates")
                wd = int(used / 3.33)
                with mpmath.workdps(wd):
                    hi = [mpmath.mpmathify(x) for x in reversed(c)]
                    try:
                        rs, err = mpmath.polyroots(hi, maxsteps=400, extraprec=wd, error=True)
                        errs = [mpmath.mpf(err) * max(1, abs(r)) for r in rs]
                    except mpmath.libmp.NoConvergence:
                        # a multiple root (the rounded (1 - x)^3 of a Padé denominator): the
                        # iteration stalls; double-precision roots, whose error for a cluster
                        # of m roots is about (1e-16)^(1/m), with a radius that covers m <= 4
                        import numpy as np
                        rs = [mpmath.mpc(complex(z)) for z in
                              np.roots([complex(mpmath.mpc(x)) for x in hi])]
                        errs = [mpmath.mpf("1e-3") * max(1, abs(r)) for r in rs]
                        msg.append("the iteration did not converge (multiple roots): roots from double "
                                   "precision, radii rough")
                for r, e in zip(rs, errs):
                    roots.append(mpmath.mpc(r))
                    radii.append(e)
                    cert.append(False)
                    mult.append(1)
            if input_digits is not None:
                eps = mpmath.mpf(10) ** (-input_digits)
                d = [k * c[k] for k in range(1, len(c))]
                for i, r in enumerate(roots):
                    if r == 0 and v:
                        continue
                    num = sum(abs(mpmath.mpmathify(ck)) * abs(r) ** k for k, ck in enumerate(c))
                    der = abs(mpmath.polyval(list(reversed(d)), r))
                    radii[i] = radii[i] + (eps * num / der if der else mpmath.inf)
    order = sorted(range(len(roots)), key=lambda i: _sort_key(roots[i]))
    roots = [roots[i] for i in order]
    radii = [radii[i] for i in order]
    cert = [cert[i] for i in order]
    mult = [mult[i] for i in order]
    tol = mpmath.mpf(10) ** (-dps)
    resolved = [bool(rad <= tol * abs(r)) or (r == 0 and rad == 0) for r, rad in zip(roots, radii)]
    success = all(cert) and all(resolved)
    if not all(resolved):
        msg.append(f"{resolved.count(False)} root(s) known to fewer than {dps} digits")
    return RootsResult(roots, radii, cert, resolved, mult, success,
                       "; ".join(msg) or "all roots isolated and refined", used)


def poly_roots(coeffs, dps: int, *, input_digits: Optional[float] = None,
               maxprec: Optional[int] = None):
    """All roots as a list of ``(mpc root, mpf radius)``, repeated by
    multiplicity; see :func:`poly_roots_full` for parameters and for which
    roots were resolved.

    Examples
    --------
    >>> [(z == 0, rad == 0) for z, rad in poly_roots([0, 0, 3], 10)]
    [(True, True), (True, True)]
    """
    res = poly_roots_full(coeffs, dps, input_digits=input_digits, maxprec=maxprec)
    out = []
    for r, rad, m in zip(res.roots, res.radii, res.multiplicity):
        out.extend([(r, rad)] * m)
    return out


def poly_roots_fp(coeffs):
    """Double-precision roots (companion-matrix eigenvalues) with a one-step
    Newton error estimate ``|p(r) / p'(r)|`` for each root.

    Returns a list of ``(complex root, float error estimate)``. Fast and
    uncertified; use for scans.

    Examples
    --------
    >>> [(round(z.real, 12), e < 1e-12) for z, e in poly_roots_fp([-6, 11, -6, 1])]
    [(1.0, True), (2.0, True), (3.0, True)]
    """
    c = [complex(x) for x in coeffs]
    while c and c[-1] == 0:
        c.pop()
    if not c:
        raise ValueError("the zero polynomial has no well-defined roots")
    rts = np.polynomial.polynomial.polyroots(c) if len(c) > 1 else np.array([])
    P = np.polynomial.Polynomial(c)
    dP = P.deriv()
    out = []
    for r in rts:
        d = dP(r)
        err = abs(P(r) / d) if d != 0 else math.inf
        out.append((complex(r), float(err)))
    out.sort(key=lambda t: (abs(t[0]), math.atan2(t[0].imag, t[0].real)))
    return out
