"""Partial sums and optimal truncation (the baseline beside every resummed value).

Optimal truncation sums an asymptotic series up to (not including) its
smallest term; the size of that smallest term is the customary estimate of
the error (for a Borel-summable series with a singularity at distance A in
the Borel plane it is of order ``exp(-A/|x|)``). For a convergent series
whose terms still decrease at the last available order the sum of all terms
is returned and the last term is the error estimate.

>>> import mpmath
>>> from resum.context import workdps
>>> with workdps(30):
...     c = [(-1) ** n * mpmath.factorial(n) for n in range(30)]     # Euler series
...     t = optimal_truncation(c, mpmath.mpf('0.1'), 30)
>>> t["n_terms"], mpmath.nstr(t["value"].value, 8)
(10, '0.91545632')
"""
from __future__ import annotations

from typing import Sequence

import mpmath

from ..results import Estimate

__all__ = ["optimal_truncation", "partial_sums"]


def partial_sums(c: Sequence, x) -> list:
    """Partial sums ``S_n = sum_{k<n} c_k x^k`` for ``n = 1 .. len(c)``."""
    out, s, xp = [], 0, 1
    for ck in c:
        s = s + ck * xp
        xp = xp * x
        out.append(s)
    return out


def optimal_truncation(c: Sequence, x, dps: int) -> dict:
    """Sum up to the smallest term; the band is +- the smallest term.

    Parameters
    ----------
    c : coefficients from ``x^0`` (mpmath numbers or exact)
    x : point (real or complex)
    dps : digits to work at (the caller enters a matching working precision)

    Returns
    -------
    dict with ``value`` (Estimate of the real part), ``imag`` (Estimate or
    None), ``n_terms`` (terms summed), ``smallest_term`` (its modulus),
    ``reached`` (False when the terms were still decreasing at the last
    order, so the error is the last term and the series may not have reached
    its best), and ``how``.

    Notes
    -----
    The band is the modulus of the smallest term (common practice, no
    source); a term that vanishes (odd terms of an even function, leading
    zeros, the gaps of a series in x^m) takes the size of the next non-zero
    term, the one a stop there leaves out.
    """
    x = mpmath.mpmathify(x)
    terms = []
    xp = mpmath.mpf(1)
    for ck in c:
        terms.append(mpmath.mpmathify(ck) * xp)
        xp *= x
    mods = [abs(t) for t in terms]
    n = len(terms)
    # stopping before a vanishing term (odd terms of an even function, the leading zeros of a
    # series that starts at x^2, the gaps of a series in x^3) leaves out the next non-zero
    # term, so the vanishing term takes that term's size; zeros at the very end take the size
    # of the last non-zero term before them
    sm = list(mods)
    nxt = None
    for k in range(n - 1, -1, -1):
        if mods[k] != 0:
            nxt = mods[k]
        elif nxt is not None:
            sm[k] = nxt
    prev = None
    for k in range(n):
        if mods[k] != 0:
            prev = mods[k]
        elif sm[k] == 0 and prev is not None:
            sm[k] = prev
    kmin = min(range(n), key=lambda k: (sm[k], -k))      # ties: the later term
    reached = kmin < n - 2
    if not reached:
        kmin = n
        err = sm[n - 1]
    else:
        err = sm[kmin]
    s = sum(terms[:kmin], mpmath.mpf(0))
    re, im = mpmath.re(s), mpmath.im(s)
    est = Estimate(re, re - err, re + err)
    imag = Estimate(im, im - err, im + err) if isinstance(s, mpmath.mpc) else None
    how = ("sum up to the smallest term; band = +- that term" if reached else
           "terms still decreasing at the last order: all terms summed; band = +- the last term")
    return {"value": est, "imag": imag, "n_terms": kmin, "smallest_term": err, "reached": reached,
            "how": how}
