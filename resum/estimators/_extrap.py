"""Extrapolation of sequences in 1/n (Neville tables) with a data-chosen order.

>>> import mpmath
>>> from resum.context import workdps
>>> with workdps(30):
...     ns = list(range(10, 30))
...     a = [1 + mpmath.mpf(3) / n - mpmath.mpf(2) / n**2 for n in ns]
...     v, w, k, _ = extrapolate(ns, a, eps=mpmath.mpf(10)**-30)
>>> (mpmath.nstr(v, 15), k <= 3, w < 1e-20)
('1.0', True, True)

Notes
-----
``a_n = a + b_1/n + ... + b_k/n^k + ...``: column ``k`` of the table fits a
degree-k polynomial in ``h = 1/n`` through ``k+1`` consecutive points and
evaluates it at ``h = 0``. The order used is the column whose last few
entries (the highest orders) agree best, counting the amplification of the
coefficient noise (the Lebesgue constant of the extrapolation weights) as
part of the spread. The returned half-width is the safety factor times the
largest of: the spread of those entries, the change to the neighbouring
columns (one order up and down), and the noise floor. It is an estimate, not a bound.

References
----------
C. M. Bender and S. A. Orszag, *Advanced Mathematical Methods for Scientists
and Engineers*, McGraw-Hill (1978), sec. 8.1 (Richardson extrapolation).
A. J. Guttmann, in *Phase Transitions and Critical Phenomena* vol. 13,
Academic Press (1989) (ratio method, linear intercepts, Neville tables).
"""
from __future__ import annotations

import mpmath

from ..uncertainty.ensemble import SAFETY

__all__ = ["neville_table", "extrapolate"]


def neville_table(ns, vals, kmax):
    """``T[k][j]``: value at 1/n = 0 of the degree-k fit through points j..j+k."""
    h = [mpmath.mpf(1) / n for n in ns]
    T = [list(vals)]
    for k in range(1, kmax + 1):
        prev = T[-1]
        row = []
        for j in range(len(prev) - 1):
            row.append((h[j + k] * prev[j] - h[j] * prev[j + 1]) / (h[j + k] - h[j]))
        if not row:
            break
        T.append(row)
    return T


def _lebesgue(ns):
    """Sum of |Lagrange weights at h = 0| for nodes 1/n."""
    h = [mpmath.mpf(1) / n for n in ns]
    tot = mpmath.mpf(0)
    for i in range(len(h)):
        w = mpmath.mpf(1)
        for m in range(len(h)):
            if m != i:
                w *= h[m] / (h[m] - h[i])
        tot += abs(w)
    return tot


def extrapolate(ns, vals, eps, kmax=None, window=4, safety=SAFETY, noise=None):
    """Extrapolate ``vals`` (indexed by ``ns``) to n = infinity.

    Parameters
    ----------
    ns : increasing list of int
    vals : list of mpf or mpc
    eps : mpf
        Relative noise of each value (from the coefficient digits).
    kmax : int, optional
        Highest column tried (default ``min(12, len(ns) - window)``).
    window : int
        Number of last entries of a column compared to judge its stability.
    noise : list of mpf, optional
        Absolute noise of each value (overrides ``eps``).

    Returns
    -------
    (value, half_width, k, info)
        ``info`` holds the per-column spreads and last entries.
    """
    n = len(ns)
    if n < window + 1:
        window = max(2, n - 1)
    if kmax is None:
        kmax = min(12, n - window)
    kmax = max(0, min(kmax, n - window))
    T = neville_table(ns, vals, kmax)
    scale = max(abs(v) for v in vals[-window:]) or mpmath.mpf(1)
    base_noise = eps * scale if noise is None else max(noise[-window:])
    cols = []
    for k, col in enumerate(T):
        if len(col) < window:
            break
        last = col[-window:]
        spread = max(abs(a - b) for a in last for b in last)
        lam = _lebesgue(ns[-(k + 1):])
        floor = lam * base_noise
        cols.append({"k": k, "last": col[-1], "spread": spread, "floor": floor,
                     "score": max(spread, floor)})
    best = min(cols, key=lambda d: (d["score"], d["k"]))
    k = best["k"]
    nxt = cols[k + 1]["last"] if k + 1 < len(cols) else None
    diffs = [best["spread"], best["floor"]]
    # the neighbouring orders must agree too: their change is part of the band
    # (a neighbour far less converged than the chosen order is not part of the plateau)
    for j in (k + 1, k - 1):
        if 0 <= j < len(cols) and cols[j]["score"] <= 100 * best["score"]:
            diffs.append(abs(cols[j]["last"] - best["last"]))
    if nxt is not None and len(diffs) == 2:
        diffs.append(abs(nxt - best["last"]))
    half = safety * max(diffs)
    info = {"columns": [{"k": c["k"], "last": c["last"], "spread": c["spread"], "floor": c["floor"]}
                        for c in cols], "chosen_k": k}
    return best["last"], half, k, info
