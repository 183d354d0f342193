r"""The quartic anharmonic oscillator :math:`H = p^2 + x^2 + g x^4`.

Weak coupling
-------------
Rayleigh-Schrodinger coefficients ``E_k`` of ``E_n(g) = sum_k E_k g^k`` for
the level ``n`` by the recursion of Bender and Wu (Phys. Rev. 184 (1969)
1231; Phys. Rev. D 7 (1973) 1620), written for our normalisation. Put
``psi = e^{-x^2/2} phi`` with ``phi = sum_k g^k phi_k``,
``phi_k = sum_j A_{k,j} x^j``. Then ``-phi'' + 2 x phi' + g x^4 phi = (E - 1) phi``
and, order by order,

.. math::

   2 (j - n) A_{k,j} = (j+2)(j+1) A_{k,j+2} - A_{k-1,j-4} + \sum_{l=1}^{k} E_l A_{k-l,j},

with ``A_{k,n} = delta_{k0}`` fixing the normalisation. The equation at
``j = n`` gives ``E_k = A_{k-1,n-4} - (n+2)(n+1) A_{k,n+2}``; ``phi_0`` is the
Hermite polynomial with leading coefficient 1. Everything is exact
(python-flint ``fmpq``/``fmpq_poly``): ``E_k`` are rationals (for the ground
state dyadic: ``1, 3/4, -21/16, 333/64, ...``).

Finite coupling
---------------
:func:`energy` diagonalises ``H`` in the eigenbasis of ``p^2 + w^2 x^2``
(one parity sector, ``x = (a + a^+)/sqrt(2w)``); the basis frequency ``w``
solves ``w^3 - w - 3g = 0`` (the minimum of the ground-state expectation
value) and is raised slowly with the basis size. The eigenvalue is refined to
the working precision by inverse iteration with banded LU solves; the basis
size is increased until two sizes agree. Rayleigh-Ritz values decrease
monotonically with the basis, so the larger basis gives an upper bound.
"""
from __future__ import annotations

import math
from dataclasses import dataclass, field
from fractions import Fraction
from typing import Optional

import flint
import mpmath
import numpy as np

from ..context import DEFAULT, Context, workdps
from ..errors import InputError
from ..progress import report
from ..results import Estimate, Provenance, Status, num_to_str
from ..results import longest_number
from ..series.core import Series
from ._params import number, whole

__all__ = ["rs_coefficients", "series", "energy", "EnergyResult", "MAX_ORDERS"]

MAX_ORDERS = 3000


#: highest level offered: the recursion's table grows with the level (state 10^6 never returned)
MAX_STATE = 200


def _check(state, orders):
    whole(state, "state", 0, MAX_STATE)
    whole(orders, "orders", 1, MAX_ORDERS)


def rs_coefficients(state: int = 0, orders: int = 100) -> list:
    """Exact coefficients ``E_0 .. E_{orders-1}`` of the level ``state`` (Fractions).

    Examples
    --------
    >>> [str(e) for e in rs_coefficients(0, 5)]
    ['1', '3/4', '-21/16', '333/64', '-30885/1024']
    >>> [str(e) for e in rs_coefficients(1, 3)]
    ['3', '15/4', '-165/16']

    Notes
    -----
    Exact rational arithmetic: there is no rounding error. The cost grows
    like ``orders^3`` operations on numbers of ``orders log(orders)`` digits;
    300 orders of the ground state take about 8 s on a 2-core machine (measured
    4 December 2026; the convolution over earlier orders is most of it).
    """
    _check(state, orders)
    n = state
    # phi_0: Hermite polynomial with A_{0,n} = 1: 2 (j - n) A_j = (j+2)(j+1) A_{j+2}
    a0 = {n: flint.fmpq(1)}
    for j in range(n - 2, -1, -2):
        a0[j] = a0[j + 2] * (j + 2) * (j + 1) / (2 * (j - n))
    # phi_k = P_k / d_k with P_k an integer polynomial: the convolution sum
    # R = -x^4 phi_{k-1} + sum_l E_l phi_{k-l} is then formed over one common
    # denominator D with integer scalars only (no gcd per term)
    p0 = flint.fmpq_poly([a0.get(j, 0) for j in range(n + 1)])
    P, d = [p0.numer()], [int(p0.denom())]
    E = [flint.fmpq(2 * n + 1)]
    Eint = [(2 * n + 1, 1)]
    x4 = flint.fmpz_poly([0, 0, 0, 0, 1])
    for k in range(1, orders):
        report((k / orders) ** 4)        # the cost of order k grows about like k^3
        D = d[k - 1]
        for l in range(1, k):
            D = math.lcm(D, Eint[l][1] * d[k - l])
        R = -(x4 * P[k - 1]) * (D // d[k - 1])
        for l in range(1, k):
            en, ed = Eint[l]
            if en:
                R += P[k - l] * (en * (D // (ed * d[k - l])))
        top = n + 4 * k
        Rc = R.coeffs() + [0] * 8
        Dq = flint.fmpz(D)
        coef = {}
        nxt = flint.fmpq(0)                      # A_{k, j+2}
        for j in range(top, n, -2):              # j > n: downward from the top degree
            nxt = coef[j] = (nxt * ((j + 2) * (j + 1)) + flint.fmpq(Rc[j], Dq)) / (2 * (j - n))
        Ek = -(nxt * ((n + 2) * (n + 1)) + flint.fmpq(Rc[n], Dq))   # A_{0,n} = 1, A_{k,n} = 0
        E.append(Ek)
        Eint.append((int(Ek.p), int(Ek.q)))
        coef[n] = flint.fmpq(0)
        for j in range(n - 2, -1, -2):
            coef[j] = (coef[j + 2] * ((j + 2) * (j + 1)) + flint.fmpq(Rc[j], Dq)
                       + Ek * a0[j]) / (2 * (j - n))
        pk = flint.fmpq_poly([coef.get(j, 0) for j in range(top + 1)])
        P.append(pk.numer())
        d.append(int(pk.denom()))
    return [Fraction(int(e.p), int(e.q)) for e in E]


def series(state: int = 0, orders: int = 100) -> Series:
    """The Rayleigh-Schrodinger series of level ``state`` as an exact :class:`Series` in ``g``."""
    cs = rs_coefficients(state, orders)
    return Series(cs, variable="g", name=f"oscillator(state={state})",
                  description=f"energy of level {state} of H = p^2 + x^2 + g x^4, "
                              f"Rayleigh-Schrodinger series",
                  provenance={"source": "oscillator", "state": state, "orders": orders,
                              "method": "Bender-Wu recursion, exact rationals"})


# ----------------------------------------------------------------------------
# finite coupling
# ----------------------------------------------------------------------------

@dataclass(frozen=True)
class EnergyResult:
    """The energy of one level at one coupling.

    ``value`` has the band ``[E(big) - safety * |E(small) - E(big)|, E(big)]``
    where ``E(big)``, ``E(small)`` are the Rayleigh-Ritz values in the larger
    and the smaller basis (Ritz values only fall as the basis grows, so the
    upper end is a bound up to rounding, which is far below the band).
    ``basis`` is the number of basis states in the level's parity sector.
    """

    g: object
    state: int
    success: bool
    status: Status
    message: str
    value: Optional[Estimate]
    basis: int = 0
    basis_check: int = 0
    frequency: object = None
    digits_agreeing: float = 0.0
    diagnostics: dict = field(default_factory=dict)
    provenance: Optional[Provenance] = None

    def to_dict(self) -> dict:
        from ..results import jsonable
        return {"g": num_to_str(self.g), "state": self.state, "success": self.success,
                "status": self.status.value, "message": self.message,
                "value": None if self.value is None else self.value.to_dict(),
                "basis": self.basis, "basis_check": self.basis_check,
                "frequency": None if self.frequency is None else num_to_str(self.frequency, 20),
                "digits_agreeing": self.digits_agreeing, "diagnostics": jsonable(self.diagnostics),
                "provenance": None if self.provenance is None else self.provenance.to_dict()}

    @classmethod
    def from_dict(cls, d: dict) -> "EnergyResult":
        # parse the decimal strings at as many digits as they carry
        with workdps(longest_number(d) + 10):
            return cls._from_dict(d)

    @classmethod
    def _from_dict(cls, d: dict) -> "EnergyResult":
        from ..results import str_to_num
        return cls(str_to_num(d["g"]), int(d["state"]), bool(d["success"]), Status(d["status"]),
                   d.get("message", ""), None if d.get("value") is None else Estimate.from_dict(d["value"]),
                   int(d.get("basis", 0)), int(d.get("basis_check", 0)),
                   None if d.get("frequency") is None else mpmath.mpf(d["frequency"]),
                   float(d.get("digits_agreeing", 0.0)), dict(d.get("diagnostics", {})),
                   None if d.get("provenance") is None else Provenance.from_dict(d["provenance"]))


def _hamiltonian(g, w, parity: int, size: int):
    """Banded matrix of H in the parity sector: dict (i, j) -> mpf, |i - j| <= 2.

    Sector index i is the oscillator level m = 2 i + parity.
    """
    M = 2 * size + parity + 6
    sq = [mpmath.sqrt(m) for m in range(M + 2)]
    # x = (a + a^+)/sqrt(2 w): <m-1|x|m> = sqrt(m)/sqrt(2w)
    c = 1 / mpmath.sqrt(2 * w)

    def xrow(vec):            # x applied to a vector given as dict m -> value
        out = {}
        for m, v in vec.items():
            if m > 0:
                out[m - 1] = out.get(m - 1, 0) + v * sq[m] * c
            out[m + 1] = out.get(m + 1, 0) + v * sq[m + 1] * c
        return out

    H = {}
    for i in range(size):
        m = 2 * i + parity
        e = {m: mpmath.mpf(1)}
        x1 = xrow(e)
        x2 = xrow(x1)
        x4 = xrow(xrow(x2))
        # p^2 = (w^2 x^2 ... ) use p^2 = H_w - w^2 x^2 with H_w |m> = w (2m + 1) |m>
        col = {}
        for k, v in x2.items():
            col[k] = col.get(k, 0) + (1 - w * w) * v
        col[m] = col.get(m, 0) + w * (2 * m + 1)
        for k, v in x4.items():
            col[k] = col.get(k, 0) + g * v
        for k, v in col.items():
            if (k - parity) % 2 == 0:
                j = (k - parity) // 2
                if j < size:
                    H[(j, i)] = v
    return H


def _banded_solve(H, size, shift, rhs):
    """Solve (H - shift) y = rhs for the pentadiagonal H (dict) by Gaussian
    elimination with partial pivoting (fill stays within 4 super-diagonals)."""
    rows = []
    for i in range(size):
        r = {}
        for j in range(max(0, i - 2), min(size, i + 3)):
            v = H.get((i, j))
            if v is not None:
                r[j] = v
        r[i] = r.get(i, 0) - shift
        rows.append(r)
    b = list(rhs)
    for k in range(size):
        # pivot among rows k..k+2
        best, bi = abs(rows[k].get(k, 0)), k
        for i in range(k + 1, min(size, k + 3)):
            a = abs(rows[i].get(k, 0))
            if a > best:
                best, bi = a, i
        if bi != k:
            rows[k], rows[bi] = rows[bi], rows[k]
            b[k], b[bi] = b[bi], b[k]
        piv = rows[k].get(k, 0)
        if piv == 0:
            piv = mpmath.mpf(10) ** (-(mpmath.mp.dps + 10))
            rows[k][k] = piv
        for i in range(k + 1, min(size, k + 3)):
            f = rows[i].get(k, 0)
            if f == 0:
                continue
            f = f / piv
            for j, v in rows[k].items():
                if j >= k:
                    rows[i][j] = rows[i].get(j, 0) - f * v
            rows[i].pop(k, None)
            b[i] -= f * b[k]
    y = [mpmath.mpf(0)] * size
    for k in range(size - 1, -1, -1):
        s = b[k]
        for j, v in rows[k].items():
            if j > k:
                s -= v * y[j]
        y[k] = s / rows[k][k]
    return y


def _level(H, size, which: int, dps: int):
    """Eigenvalue number ``which`` (0-based, ascending) of the sector matrix, refined."""
    A = np.zeros((size, size))
    for (i, j), v in H.items():
        A[i, j] = float(v)
    vals, vecs = np.linalg.eigh(A)
    lam = mpmath.mpf(vals[which])
    v = [mpmath.mpf(x) for x in vecs[:, which]]
    tol = mpmath.mpf(10) ** (-dps)
    for _ in range(30):
        y = _banded_solve(H, size, lam, v)
        nrm = mpmath.sqrt(mpmath.fsum(t * t for t in y))
        v = [t / nrm for t in y]
        Hv = [mpmath.fsum(H[(i, j)] * v[j] for j in range(max(0, i - 2), min(size, i + 3))
                          if (i, j) in H) for i in range(size)]
        new = mpmath.fsum(a * b for a, b in zip(v, Hv))
        if abs(new - lam) <= tol * abs(new):
            lam = new
            break
        lam = new
    return lam


def energy(g, state: int = 0, ctx: Optional[Context] = None, max_basis: int = 2000) -> EnergyResult:
    """Energy of level ``state`` of ``p^2 + x^2 + g x^4`` at ``g >= 0``.

    Parameters
    ----------
    g : number or str
    state : int
    ctx : Context
        ``ctx.dps`` digits are asked for.
    max_basis : int
        Largest basis (states of the level's parity) tried.

    Returns
    -------
    EnergyResult

    Examples
    --------
    >>> r = energy(1, 0, Context(dps=20))
    >>> r.success, mpmath.nstr(r.value.value, 18)
    (True, '1.39235164153029186')

    Notes
    -----
    The basis grows by half until the Ritz values of two successive bases
    agree to ``dps`` digits (relative); see :class:`EnergyResult` for the
    band. ``success`` is False when ``max_basis`` is reached first.

    References
    ----------
    F. T. Hioe and E. W. Montroll, J. Math. Phys. 16 (1975) 1945 (high
    precision eigenvalues of this Hamiltonian).
    """
    ctx = ctx or DEFAULT
    whole(state, "state", 0)
    whole(max_basis, "max_basis", 24)
    if 2 * (state // 2) + 24 > max_basis:
        raise InputError(f"state {state} needs a basis larger than max_basis = {max_basis}")
    with ctx.working(10):
        gv = number(g, "g", ctx.work_dps + 10)
        if isinstance(gv, mpmath.mpc) or not mpmath.isfinite(gv) or gv < 0 or gv > mpmath.mpf(10) ** 8:
            raise InputError(f"g: the spectrum is computed for real 0 <= g <= 1e8, got {g}")
        parity = state % 2
        which = state // 2
        size = max(24, 2 * which + 24, int(1.2 * ctx.dps) + which)
        prev = None
        history = []
        status, msg = Status.NOT_CONVERGED, ""
        w0 = _frequency(gv)
        while True:
            w = w0 * (mpmath.mpf(size) / 40) ** (mpmath.mpf(1) / 3) if size > 40 else w0
            H = _hamiltonian(gv, w, parity, size)
            lam = _level(H, size, which, ctx.work_dps + 5)
            history.append({"basis": size, "frequency": w, "energy": lam})
            if prev is not None:
                diff = abs(prev - lam)
                if diff <= mpmath.mpf(10) ** (-ctx.dps) * abs(lam) / 10:
                    status, msg = Status.CONVERGED, f"bases {history[-2]['basis']} and {size} agree"
                    break
            if size >= max_basis:
                msg = f"bases up to {max_basis} do not agree to {ctx.dps} digits; raise max_basis"
                break
            prev = lam
            size = min(max_basis, int(size * 1.5))
        diff = abs(history[-2]["energy"] - lam) if len(history) > 1 else abs(lam)
        floor = abs(lam) * mpmath.mpf(10) ** (-(ctx.work_dps))
        band = 3 * diff + floor
        est = Estimate(lam, lam - band, lam + floor)
        agree = float(-mpmath.log10(max(diff, floor) / abs(lam)))
        prov = Provenance("oscillator.energy", {"state": state, "g": num_to_str(gv, 20),
                                                "max_basis": max_basis}, size, ctx.dps)
        return EnergyResult(gv, state, status == Status.CONVERGED, status, msg, est, size,
                            history[-2]["basis"] if len(history) > 1 else 0, w, round(agree, 2),
                            {"history": history, "how": "band = 3 |E(basis) - E(basis_check)| below, "
                                                        "Ritz upper bound above"}, prov)


def _frequency(g):
    """Positive root of w^3 - w - 3 g = 0 (w = 1 at g = 0)."""
    if g == 0:
        return mpmath.mpf(1)
    # start at 1 + (3 g)^(1/3), just above the root (the cubic is positive and convex there), so
    # Newton's steps descend to it monotonically; from 1 + g it ran out of steps at g = 1e6
    return mpmath.findroot(lambda w: w ** 3 - w - 3 * g, 1 + mpmath.cbrt(3 * g))

