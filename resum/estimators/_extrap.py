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
columns (one order up and down), the noise floor, and what is left of a steady
movement of the columns with the order beyond the chosen one (:func:`column_tail`:
a correction that is not an integer power of ``1/n``, which no column removes).
It is an estimate, not a bound.

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

__all__ = ["neville_table", "extrapolate", "column_tail"]


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
    # columns still moving steadily towards a limit: the chosen one is not that limit
    # (``settled_half``: the band without it, for callers that compare two tables' settled values)
    tail = column_tail(cols, k)
    settled = safety * max(diffs)
    half = max(settled, safety * tail)
    info = {"columns": [{"k": c["k"], "last": c["last"], "spread": c["spread"], "floor": c["floor"]}
                        for c in cols], "chosen_k": k, "column_tail": tail, "settled_half": settled}
    return best["last"], half, k, info


#: fewest consecutive steps between columns (ending at the top of the table) that must move one
#: way, each smaller than the one before, before their trend is extrapolated beyond the top
#: (common practice, no source)
TAIL_STEPS = 3


def column_tail(cols, k):
    """What is left of a steady movement of the Neville columns' last entries beyond column ``k``.

    ``cols`` are the columns of :func:`extrapolate` (``"last"``: the entry from the last
    points, ``"floor"``: its noise floor). When a sequence carries a correction that is not an
    integer power of ``h = 1/n`` (``h^p``, ``p`` not an integer: a confluent singular term,
    ``c_n ~ mu^n n^g (1 + a n^-Delta + ...)`` with ``Delta`` not an integer), no column removes
    it. A degree-``k`` polynomial through points near ``h`` leaves of it about
    ``binomial(p, k + 1) h^p``, which falls only like a power of ``k``, ``k^-(p+1)``: the last
    entries of columns ``k = 1, 2, ...`` then creep one way with steps ``d_k`` that shrink like a
    power of ``k`` (by 0.8 per column at k = 12, measured on the angle-deformed kernel family
    from 36 loops), not geometrically. The spread within one column and the change to the
    neighbouring column see only one step; the rest of the movement is the bias of column ``k``.

    Two parts, in the direction the columns move:

    * the movement seen above ``k``: when every step from column ``k`` to the top of the table
      goes the same way, exceeds its noise floor and is smaller than the one before,
      ``|last_top - last_k|`` (a column chosen for the agreement of its own entries while every
      higher order moves off one way, converging, is not a plateau). Where the columns above
      alternate, noise takes over, or the steps grow (the higher orders diverge: a correction
      of alternating sign from a competing singularity at ``-x_c`` is amplified by every
      order), this part is 0 and so is the next;
    * the rest beyond the top, where the last ``TAIL_STEPS`` steps ending at the top column (not
      counting the step out of column 0, which removes the ``1/n`` term itself) all go that
      way, each exceeds its noise floor and each is smaller than the one before: ``s`` is read
      (``d_j ~ j^-s``: ``s = log(d_i/d_j) / log(j/i)``) from the first and last of those steps
      and from the last two, keeping the smaller (the slower fall: a few columns are not yet
      in the asymptotic regime, and their local slope scatters), at least 2 (the slowest fall a
      correction ``h^p`` with ``p > 0`` gives, ``p -> 0``), and the power law is summed beyond
      the top column ``J``: ``d_J J^s (J + 1/2)^(1-s) / (s - 1)`` (the sum as an integral from
      ``J + 1/2``; at most about ``J d_J``). Steps that shrink geometrically, as integer powers
      of ``1/n`` give, make ``s`` large and this part a small fraction of ``d_J``.

    References: the remainder of polynomial extrapolation is ``f^(k+1)(xi)/(k+1)! prod (0 - h_j)``
    (Bender and Orszag, sec. 8.1, Richardson extrapolation), which for ``f = h^p`` is
    ``binomial(p, k+1) xi^(p-k-1) prod h_j``; the power law in ``k`` and the sum of its tail
    are worked out here (common practice, no source).
    """
    top = len(cols) - 1
    if not 0 <= k <= top:
        return 0
    last = [c["last"] for c in cols]

    def step(j):
        return last[j] - last[j - 1], max(cols[j]["floor"], cols[j - 1]["floor"])

    def one_way(ds):
        # real and imaginary parts each keep one sign (or stay 0) along ds
        for part in (mpmath.re, mpmath.im):
            vals = [part(d) for d in ds]
            if all(v == 0 for v in vals):
                continue
            if any(v == 0 or (v > 0) != (vals[0] > 0) for v in vals):
                return False
        return True

    up = [step(j) for j in range(k + 1, top + 1)]
    if any(abs(d) <= fl for d, fl in up) or not one_way([d for d, _ in up]) \
            or any(abs(b[0]) >= abs(a[0]) for a, b in zip(up, up[1:])):
        return 0
    seen = abs(last[top] - last[k])
    j0 = top - TAIL_STEPS + 1
    if j0 < 2:
        return seen
    run = [step(j) for j in range(j0, top + 1)]
    mags = [abs(d) for d, _ in run]
    if any(abs(d) <= fl for d, fl in run) or not one_way([d for d, _ in run] + [d for d, _ in up]) \
            or any(b >= a for a, b in zip(mags, mags[1:])):
        return seen
    d = mags[-1]
    s = min(mpmath.log(mags[0] / d) / mpmath.log(mpmath.mpf(top) / j0),
            mpmath.log(mags[-2] / d) / mpmath.log(mpmath.mpf(top) / (top - 1)))
    s = max(s, mpmath.mpf(2))
    return seen + d * mpmath.mpf(top) ** s * (top + mpmath.mpf(1) / 2) ** (1 - s) / (s - 1)
