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

from typing import Optional, Sequence

import mpmath

from ..results import Estimate

__all__ = ["optimal_truncation", "partial_sums", "polynomial_degree"]


def partial_sums(c: Sequence, x) -> list:
    """Partial sums ``S_n = sum_{k<n} c_k x^k`` for ``n = 1 .. len(c)``."""
    out, s, xp = [], 0, 1
    for ck in c:
        s = s + ck * xp
        xp = xp * x
        out.append(s)
    return out


def polynomial_degree(coefficients) -> Optional[int]:
    """Degree of the series read as an exact polynomial, or ``None``.

    The coefficients (from ``x^0``) are taken to be those of a polynomial
    when they vanish exactly (zero, not merely small) from some power ``k + 1``
    to the last term given, and those known zeros are at least as many as
    the polynomial's own terms (``k + 1``) and at least 4: a series known to
    twice the degree that stops there. Common practice, no source. An
    all-zero series has degree 0.

    >>> polynomial_degree([1, 2, 3, 0, 0, 0, 0]), polynomial_degree([1, 2, 3, 0, 0])
    (2, None)
    """
    c = list(coefficients)
    nz = [k for k, v in enumerate(c) if v != 0]
    k = nz[-1] if nz else 0
    zeros = len(c) - 1 - k
    if zeros >= max(4, k + 1):
        return k
    return None


def optimal_truncation(c: Sequence, x, dps: int, digits: Optional[float] = None) -> dict:
    """Sum up to the smallest term; the band is +- the smallest term.

    Parameters
    ----------
    c : coefficients from ``x^0`` (mpmath numbers or exact)
    x : point (real or complex)
    dps : digits to work at (the caller enters a matching working precision)
    digits : digits the coefficients carry (``None``: exact, rounded at
        ``dps``); ``10^-digits`` times the sum of the moduli of the terms
        summed bounds the band from below

    Returns
    -------
    dict with ``value`` (Estimate of the real part), ``imag`` (Estimate or
    None), ``n_terms`` (terms summed), ``smallest_term`` (the modulus of the term
    the band stands for; 0 for an exact polynomial),
    ``reached`` (False when the terms were still decreasing at the last
    order, so the error is the last term and the series may not have reached
    its best), and ``how``.

    Notes
    -----
    The band is the modulus of the smallest term (common practice, no
    source). Only non-zero terms compete: a term that vanishes exactly (odd
    terms of an even function, leading zeros, the gaps of a series in x^m)
    is no estimate of the error, and a stop there leaves out the next
    non-zero term. An exact polynomial (:func:`polynomial_degree`) is summed
    whole, with the band of the input's precision alone. When the first
    non-zero term is already the smallest (the terms grow from the start,
    beyond the radius of convergence), nothing is summed: the baseline then
    says no more than the size of that term.
    """
    x = mpmath.mpmathify(x)
    terms = []
    xp = mpmath.mpf(1)
    for ck in c:
        terms.append(mpmath.mpmathify(ck) * xp)
        xp *= x
    mods = [abs(t) for t in terms]
    n = len(terms)
    nz = [k for k in range(n) if mods[k] != 0]
    deg = polynomial_degree(c)
    if deg is not None or not nz:
        # every term after the degree is exactly zero: the sum is exact
        stop, small, reached = (deg + 1 if nz else n), mpmath.mpf(0), True
        how = "exact polynomial: all its terms summed; band from the input's precision"
    else:
        kmin = min(nz, key=lambda k: (mods[k], -k))      # ties: the later term
        reached = kmin not in nz[-2:]
        if not reached:
            stop, small = n, mods[nz[-1]]
            how = "terms still decreasing at the last order: all terms summed; band = +- the last term"
        else:
            stop, small = kmin, mods[kmin]
            how = ("sum up to the smallest term; band = +- that term" if kmin > nz[0] else
                   "terms growing from the first non-zero one: nothing summed; band = +- that term")
    s = sum(terms[:stop], mpmath.mpf(0))
    # the input's own precision (or, for exact coefficients, the rounding of the sum)
    err = max(small, sum(mods[:stop], mpmath.mpf(0)) * mpmath.mpf(10) ** (
        -mpmath.mpf(digits) if digits is not None else 1 - dps))
    re, im = mpmath.re(s), mpmath.im(s)
    est = Estimate(re, re - err, re + err)
    imag = Estimate(im, im - err, im + err) if isinstance(s, mpmath.mpc) else None
    return {"value": est, "imag": imag, "n_terms": stop, "smallest_term": small, "reached": reached,
            "how": how}
