"""High-precision linear solves and least squares (exact or ball arithmetic).

``solve(A, b, dps)`` and ``lstsq(A, b, dps)`` take matrices as lists of rows
and right-hand sides as lists. Exact input (``int``/``Fraction`` everywhere)
is solved exactly with FLINT's rational matrices; anything else is solved in
Arb ball arithmetic (python-flint ``arb_mat``/``acb_mat``) with guard bits, so
the rounding error of the solve is bounded rigorously.

>>> from fractions import Fraction
>>> s = solve([[2, 1], [1, 3]], [3, 5], dps=30)
>>> s.x, s.exact
([Fraction(4, 5), Fraction(7, 5)], True)
>>> from mpmath import mpf
>>> s = solve([[mpf(2), 1], [1, 3]], [3, 5], dps=30)
>>> s.success, mpmath.nstr(s.x[0], 20), s.error < mpf(10)**-30
(True, '0.8', True)

Notes
-----
How to read the error: ``error`` is an upper bound on the largest absolute
error of a solution component. It has two parts:

* the rounding error of the solve, which Arb bounds rigorously (the midpoints
  of the input are treated as exact), and
* when ``input_digits`` is given, a first-order estimate of the effect of
  input errors of relative size ``10**-input_digits``:
  ``cond * 10**-input_digits * max|x|`` (not a rigorous bound).

``cond`` is the infinity-norm condition number ``||A|| ||A^-1||`` (for least
squares, of the normal matrix's square root, ``sqrt(cond(A^H A))``), computed
from a ball inverse; it is an estimate good to a few percent.

Applicability: square non-singular systems (``solve``) and full-column-rank
overdetermined systems (``lstsq``). Numerically singular matrices return
``success=False`` with a reason, never a silent wrong number.

References
----------
N. J. Higham, *Accuracy and Stability of Numerical Algorithms*, 2nd ed.,
SIAM (2002), ch. 7 (condition numbers) and ch. 20 (least squares, normal
equations and iterative refinement).
F. Johansson, "Arb: efficient arbitrary-precision midpoint-radius interval
arithmetic", IEEE Trans. Computers 66 (2017) 1281.
"""
from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any, Optional

import flint
import mpmath

from . import flint_bridge as fb
from ..context import workdps

__all__ = ["LinearSolution", "solve", "lstsq", "to_ball_matrix"]


@dataclass(frozen=True)
class LinearSolution:
    """Solution of a linear system or least-squares problem.

    Attributes
    ----------
    x : list
        Solution (Fractions when exact, mpf/mpc otherwise).
    error : mpf
        Bound on the largest absolute error of a component (see module Notes).
    cond : mpf or None
        Condition number estimate (infinity norm); None when not computed.
    residual : mpf or None
        Euclidean norm of ``b - A x`` (least squares only).
    exact : bool
        True when solved in exact rational arithmetic.
    success : bool
    message : str
    dps : int
        Working decimal digits used.
    """

    x: list
    error: Any
    cond: Any = None
    residual: Any = None
    exact: bool = False
    success: bool = True
    message: str = ""
    dps: int = 0
    diagnostics: dict = field(default_factory=dict)


def _shape(A):
    m = len(A)
    if m == 0:
        raise ValueError("matrix has no rows")
    n = len(A[0])
    if any(len(r) != n for r in A):
        raise ValueError("matrix rows have different lengths")
    return m, n


def to_ball_matrix(A, complex_=False):
    """List of rows -> arb_mat / acb_mat (exact conversion of mpf entries;
    rationals rounded at the current flint precision)."""
    m, n = _shape(A)
    conv = fb.to_acb if complex_ else fb.to_arb
    cls = flint.acb_mat if complex_ else flint.arb_mat
    return cls(m, n, [conv(x) for row in A for x in row])


def _col(b, complex_):
    conv = fb.to_acb if complex_ else fb.to_arb
    cls = flint.acb_mat if complex_ else flint.arb_mat
    return cls(len(b), 1, [conv(x) for x in b])


def _to_mp(z, complex_):
    return fb.acb_to_mpc(z) if complex_ else fb.arb_to_mpf(z)


def _rad(z, complex_):
    return fb.acb_rad(z) if complex_ else fb.arb_rad(z)


def _inf_norm_rows(M, complex_):
    """Infinity norm (upper bound, as mpf) of a ball matrix."""
    best = mpmath.mpf(0)
    for i in range(M.nrows()):
        s = mpmath.mpf(0)
        for j in range(M.ncols()):
            z = M[i, j]
            s += abs(_to_mp(z, complex_)) + _rad(z, complex_)
        best = max(best, s)
    return best


def _exact_solve(A, b, dps):
    m, n = _shape(A)
    Aq = flint.fmpq_mat(m, n, [fb.to_fmpq(x) for row in A for x in row])
    bq = flint.fmpq_mat(m, 1, [fb.to_fmpq(x) for x in b])
    try:
        xq = Aq.solve(bq)
    except ZeroDivisionError:
        return LinearSolution([], mpmath.inf, None, None, True, False,
                              "matrix is exactly singular", dps)
    x = [fb.fmpq_to_fraction(xq[i, 0]) for i in range(n)]
    return LinearSolution(x, mpmath.mpf(0), None, None, True, True, "exact rational solve", dps)


def solve(A, b, dps: int, *, input_digits: Optional[float] = None, want_cond: bool = True,
          max_extra_bits: int = 2048) -> LinearSolution:
    """Solve the square system ``A x = b`` at ``dps`` working digits.

    Parameters
    ----------
    A : list of lists
        n x n matrix (int, Fraction, float, mpf, mpc entries).
    b : list
        Right-hand side of length n.
    dps : int
        Decimal digits wanted in the solution; the solve uses guard bits and
        raises its precision (up to ``max_extra_bits`` more) until the
        rigorous rounding bound is below ``10**-dps`` relative to ``max|x|``.
    input_digits : float, optional
        Correct significant digits the entries of ``A`` and ``b`` carry;
        adds the first-order input-error term to ``error``.
    want_cond : bool
        Compute the condition number from a ball inverse (costs about one
        more solve).

    Returns
    -------
    LinearSolution

    Examples
    --------
    >>> from mpmath import mpf
    >>> H = [[mpf(1) / (i + j + 1) for j in range(6)] for i in range(6)]
    >>> s = solve(H, [1] * 6, dps=40)
    >>> s.success, int(mpmath.log10(s.cond))   # Hilbert(6): cond_inf = 2.9e7
    (True, 7)
    """
    if len(A) != len(b):
        raise ValueError(f"matrix has {len(A)} rows but right-hand side has {len(b)} entries")
    m, n = _shape(A)
    if m != n:
        raise ValueError(f"solve needs a square matrix, got {m} x {n}; use lstsq")
    allv = [x for row in A for x in row] + list(b)
    if all(fb.is_exact(x) for x in allv):
        return _exact_solve(A, b, dps)
    cplx = fb.is_complex_list(allv)
    target = mpmath.mpf(10) ** (-dps)
    prec = fb.prec_for_dps(dps) + 32
    extra = 0
    while True:
        with fb.flint_prec(prec + extra):
            Ab = to_ball_matrix(A, cplx)
            bb = _col(b, cplx)
            try:
                xb = Ab.solve(bb)
            except ZeroDivisionError:
                xb = None
            if xb is not None:
                x = [_to_mp(xb[i, 0], cplx) for i in range(n)]
                err = max(_rad(xb[i, 0], cplx) for i in range(n))
                xmax = max(abs(v) for v in x) or mpmath.mpf(1)
                if err <= target * xmax or extra >= max_extra_bits:
                    cond = None
                    if want_cond:
                        try:
                            Ai = Ab.inv()
                            cond = _inf_norm_rows(Ab, cplx) * _inf_norm_rows(Ai, cplx)
                        except ZeroDivisionError:
                            cond = mpmath.inf
                    break
            elif extra >= max_extra_bits:
                return LinearSolution([], mpmath.inf, mpmath.inf, None, False, False,
                                      f"matrix numerically singular at {prec + extra} bits",
                                      dps)
        extra = max(64, 2 * extra)
    total = err
    if input_digits is not None and cond is not None:
        total = err + cond * mpmath.mpf(10) ** (-input_digits) * xmax
    ok = err <= target * xmax
    msg = "ball solve" + (f" (+{extra} bits)" if extra else "")
    if not ok:
        msg += f"; rounding error {mpmath.nstr(err, 3)} above the requested 10^-{dps}"
    return LinearSolution(x, total, cond, None, False, bool(ok), msg, dps,
                          {"prec_bits": prec + extra, "rounding_error": err})


def lstsq(A, b, dps: int, *, input_digits: Optional[float] = None,
          refine: int = 2) -> LinearSolution:
    """Least-squares solution of ``A x ~ b`` (m x n, m >= n, full column rank).

    Solved by the normal equations ``A^H A x = A^H b`` in ball arithmetic at
    about twice the requested precision (the normal matrix squares the
    condition number), followed by ``refine`` steps of refinement on the
    residual ``r = b - A x`` computed at the same precision.

    Returns
    -------
    LinearSolution
        with ``residual`` the Euclidean norm of ``b - A x`` and ``cond`` the
        estimated condition number of ``A`` (square root of that of ``A^H A``).

    Examples
    --------
    >>> from mpmath import mpf
    >>> xs = [mpf(k) / 8 for k in range(8)]                # binary-exact nodes
    >>> A = [[1, x, x * x] for x in xs]
    >>> b = [1 + 2 * x + 3 * x * x for x in xs]          # exact quadratic
    >>> s = lstsq(A, b, dps=50)
    >>> [mpmath.nstr(v, 30) for v in s.x], s.residual < mpf(10)**-45
    (['1.0', '2.0', '3.0'], True)
    """
    if len(A) != len(b):
        raise ValueError(f"matrix has {len(A)} rows but right-hand side has {len(b)} entries")
    m, n = _shape(A)
    if m < n:
        raise ValueError(f"lstsq needs at least as many rows as columns, got {m} x {n}")
    allv = [x for row in A for x in row] + list(b)
    exact = all(fb.is_exact(x) for x in allv)
    cplx = fb.is_complex_list(allv)
    if exact:
        Aq = flint.fmpq_mat(m, n, [fb.to_fmpq(x) for row in A for x in row])
        bq = flint.fmpq_mat(m, 1, [fb.to_fmpq(x) for x in b])
        At = Aq.transpose()
        try:
            xq = (At * Aq).solve(At * bq)
        except ZeroDivisionError:
            return LinearSolution([], mpmath.inf, None, None, True, False,
                                  "matrix is exactly rank deficient", dps)
        x = [fb.fmpq_to_fraction(xq[i, 0]) for i in range(n)]
        r = bq - Aq * xq
        with workdps(dps + 10):
            res = +mpmath.sqrt(sum((mpmath.mpf(int(r[i, 0].p)) / int(r[i, 0].q)) ** 2
                                   for i in range(m)))
        return LinearSolution(x, mpmath.mpf(0), None, res, True, True, "exact normal equations", dps)
    prec = 2 * fb.prec_for_dps(dps) + 64
    with fb.flint_prec(prec):
        Ab = to_ball_matrix(A, cplx)
        bb = _col(b, cplx)
        AH = Ab.transpose()
        if cplx:
            AH = AH.conjugate()
        G = AH * Ab
        try:
            Gi = G.inv()
        except ZeroDivisionError:
            return LinearSolution([], mpmath.inf, mpmath.inf, None, False, False,
                                  "normal matrix numerically singular (A rank deficient?)", dps)
        xb = Gi * (AH * bb)
        # refinement on midpoints: x <- x + G^-1 A^H (b - A x)
        for _ in range(refine):
            xm = xb.mid() if hasattr(xb, "mid") else xb
            r = bb - Ab * xm
            xb = xm + Gi * (AH * r)
        r = bb - Ab * xb
        x = [_to_mp(xb[i, 0], cplx) for i in range(n)]
        err = max(_rad(xb[i, 0], cplx) for i in range(n))
        with workdps(dps + 10):
            res = +mpmath.sqrt(sum(abs(_to_mp(r[i, 0], cplx)) ** 2 for i in range(m)))
        cond = mpmath.sqrt(_inf_norm_rows(G, cplx) * _inf_norm_rows(Gi, cplx))
    xmax = max(abs(v) for v in x) or mpmath.mpf(1)
    total = err
    if input_digits is not None:
        total = err + cond * mpmath.mpf(10) ** (-input_digits) * xmax
    ok = err <= mpmath.mpf(10) ** (-dps) * xmax or input_digits is not None
    msg = "normal equations in ball arithmetic" + ("" if ok else
                                                   "; rounding error above requested digits")
    return LinearSolution(x, total, cond, res, False, bool(ok), msg, dps, {"prec_bits": prec,
                                                                          "rounding_error": err})
