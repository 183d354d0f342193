"""Essential-singularity probe: a ``1/sqrt(n)`` term in the coefficient ratios.

Near an algebraic or logarithmic singularity ``x_c`` the ratios of successive
coefficients go like ``r_n = c_n / c_(n-1) = (1/x_c) (1 + a/n + ...)``: the
correction is a series in ``1/n`` (logarithms add ``1/(n log n)`` terms), and a
confluent term with an exponent shifted by ``d`` enters at ``n^(-1-d)``.
Near an essential singularity of the type ``exp(A / (1 - x/x_c))`` the
coefficients grow like ``x_c^-n exp(beta sqrt(n)) n^p`` (saddle point), and the
ratios carry a ``beta / (2 sqrt(n))`` term that no algebraic singularity gives.

:func:`probe_essential` fits ``r_n = A_0 + A_1 n^(-1/2) + ... + A_(K-1) n^(-(K-1)/2)``
over the upper part of the series (several windows and ``K``) and reads
``beta = 2 A_1 / A_0``. It calls the point essential when every fit gives
``beta >= BETA_MIN`` and the fits agree to :data:`BETA_AGREE`; algebraic and
logarithmic points give ``beta`` near 0 (measured: below 0.03 for log(1 + x)/x,
below 1e-6 for (1 - x)^(-1/3), (1 - x)^(1/2), log(1 - x), from 120 terms).

>>> import mpmath
>>> from math import comb, factorial
>>> from fractions import Fraction
>>> c = [1] + [sum(Fraction(comb(n - 1, k - 1), factorial(k)) for k in range(1, n + 1))
...            for n in range(1, 80)]          # exp(x/(1 - x))
>>> with mpmath.workdps(40):
...     out = probe_essential([mpmath.mpf(v.numerator) / v.denominator for v in c])
>>> out["essential"], out["beta"].contains(2)
(True, True)

Notes
-----
An estimate, not a proof: it tests one family of essential singularities
(growth ``exp(beta sqrt(n))``, as from ``exp(A/(1 - x/x_c))``); stronger ones
(``exp(A/(1 - x)^2)``: ``exp(n^(2/3))``) also give a large ``A_1`` but a
``beta`` that drifts with the window, and are then left undetermined. The
band of ``beta`` and of ``x_c = 1/A_0`` is twice the spread over the fits.

Applicability: one dominant real singularity (ratios of one sign that settle),
at least :data:`MIN_TERMS` terms, none zero in the upper two thirds.

References
----------
P. Flajolet and R. Sedgewick, *Analytic Combinatorics*, Cambridge (2009),
Ch. VIII (saddle-point asymptotics of ``exp(x/(1 - x))``: ``c_n ~ e^(2 sqrt(n))
n^(-3/4) e^(-1/2) / (2 sqrt(pi))``; from memory).
"""
from __future__ import annotations

import mpmath

from ..results import Estimate, sig_text
from ..uncertainty.ensemble import SAFETY

__all__ = ["probe_essential", "BETA_MIN", "MIN_TERMS"]

#: fewest terms the probe reads
MIN_TERMS = 30
#: smallest ``beta`` (every fit) for an essential verdict
BETA_MIN = mpmath.mpf("0.2")
#: largest relative spread of ``beta`` over the fits for an essential verdict
BETA_AGREE = mpmath.mpf("0.25")
#: numbers of fitted terms K
FIT_TERMS = (3, 4, 5, 6)


def _fit(r, ns, K):
    rows = [[mpmath.mpf(n) ** (-mpmath.mpf(k) / 2) for k in range(K)] for n in ns]
    A = mpmath.matrix(rows)
    b = mpmath.matrix([r[n] for n in ns])
    if len(ns) == K:
        return mpmath.lu_solve(A, b)
    return mpmath.qr_solve(A, b)[0]


def probe_essential(c) -> dict:
    """Whether the ratios of ``c`` carry a ``1/sqrt(n)`` term (growth ``exp(beta sqrt(n))``).

    Parameters
    ----------
    c : list of mpf
        Coefficients low to high (at the caller's working precision).

    Returns
    -------
    dict
        ``essential`` (bool), ``beta`` and ``location`` (:class:`Estimate` of ``beta`` and of
        ``x_c = 1/A_0``, or None), ``fits`` (per fit: K, first n, beta, x_c), ``reason``.
    """
    N = len(c)
    out = {"essential": False, "beta": None, "location": None, "fits": [], "reason": ""}
    if N < MIN_TERMS:
        out["reason"] = f"too few terms ({N}; the probe needs {MIN_TERMS})"
        return out
    first = N // 3
    if any(v == 0 for v in c[first - 1:]):
        out["reason"] = "zero coefficients in the upper two thirds"
        return out
    r = {n: c[n] / c[n - 1] for n in range(first, N)}
    if any(isinstance(v, mpmath.mpc) and v.imag != 0 for v in r.values()):
        out["reason"] = "complex coefficients"
        return out
    r = {n: mpmath.re(v) for n, v in r.items()}
    if len({mpmath.sign(v) for v in r.values()}) != 1:
        out["reason"] = "the ratios change sign (no single dominant real singularity)"
        return out
    fits = []
    for K in FIT_TERMS:
        for ns in (list(range(first, N)), list(range(N // 2, N)), list(range(N - K, N))):
            a = _fit(r, ns, K)
            if a[0] == 0:
                continue
            fits.append({"K": K, "from": ns[0], "beta": 2 * a[1] / a[0], "x_c": 1 / a[0]})
    out["fits"] = [{k: (float(v) if isinstance(v, mpmath.mpf) else v) for k, v in f.items()} for f in fits]
    if not fits:
        out["reason"] = "no fit"
        return out
    betas = sorted(f["beta"] for f in fits)
    med = betas[len(betas) // 2]
    spread = max(abs(b - med) for b in betas)
    xs = [f["x_c"] for f in fits]
    xmed = sorted(xs)[len(xs) // 2]
    xspread = max(abs(x - xmed) for x in xs)
    out["beta"] = Estimate(med, med - SAFETY * spread, med + SAFETY * spread)
    out["location"] = Estimate(xmed, xmed - SAFETY * xspread, xmed + SAFETY * xspread)
    if betas[0] < BETA_MIN:
        out["reason"] = (f"no 1/sqrt(n) term in the ratios: beta = {out['beta']} "
                         f"(smallest fit {sig_text(betas[0], 3)}; an algebraic or logarithmic point gives 0)")
        return out
    if spread > BETA_AGREE * abs(med):
        out["reason"] = (f"the 1/sqrt(n) term of the ratios drifts between fits (beta {sig_text(betas[0], 3)} "
                         f"to {sig_text(betas[-1], 3)}): not exp(beta sqrt(n)) growth")
        return out
    out["essential"] = True
    out["reason"] = (f"the ratios c_n/c_(n-1) carry a 1/sqrt(n) term: c_n ~ x_c^-n exp(beta sqrt(n)) "
                     f"with beta = {out['beta']} ({len(fits)} fits), which no algebraic or logarithmic "
                     "singularity gives")
    return out
