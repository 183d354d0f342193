"""Log-derivative (Dlog) Padé: singular points and exponents of algebraic and
logarithmic singularities.

>>> import mpmath
>>> from resum.series import Series
>>> from resum.context import Context
>>> c = [1]
>>> for n in range(1, 40):            # (1 - 4x)^(-1/2): c_n = binomial(2n, n)
...     c.append(c[-1] * 2 * (2 * n - 1) // n)
>>> r = estimate_dlog(Series(c), Context(dps=40))
>>> s = r.singularities[0]
>>> s.re.contains(0.25), s.exponent.contains(-0.5), s.kind
(True, True, 'branch')

Notes
-----
If ``f ~ A (1 - x/x_c)^theta`` then ``f'/f ~ theta/(x - x_c)``: a simple pole at
``x_c`` with residue ``theta``. Padé approximants to ``f'/f`` therefore
locate algebraic singularities and give their exponents directly (exactly
for a pure power). A logarithm has no such form, so the same is done for
the first and second derivative of ``f`` (``f^(d) ~ (1 - x/x_c)^(theta - d)``):
``f = log(1 - x/x_c)`` gives residue ``-1`` for ``d = 1`` and thus
``theta = 0`` of kind ``log``; a weak singularity on an analytic background
(``theta > 0``) becomes dominant after differentiating. The derivative order
whose leading singularity is the most stable across the Padé table is
reported; the others are kept in the diagnostics. Poles with positive
integer residue are zeros of ``f^(d)``, not singularities, and are dropped.

Bands: safety factor (2) times the spread of locations and residues over
the stable cluster of approximants (see :mod:`resum.estimators.pade_sing`).

Applicability: isolated algebraic or logarithmic singularities. Confluent
corrections ``(1 - x/x_c)^(theta + Delta)`` and additive analytic
backgrounds bias the residues; use differential approximants there.

References
----------
G. A. Baker, *Essentials of Padé Approximants*, Academic Press (1975)
(Dlog Padé method).
A. J. Guttmann, in *Phase Transitions and Critical Phenomena* vol. 13,
Academic Press (1989).
"""
from __future__ import annotations

import math

import mpmath

from .._kernels import series_ops as ops
from ..results import Status
from ..uncertainty.ensemble import SAFETY
from ._common import failed, finish, prepare
from .pade_sing import approximant_table, clusters_to_singularities, pade_ensemble
from .ratio import classify_growth

__all__ = ["estimate_dlog", "dlog_series"]


def dlog_series(c, d=0):
    """Coefficients of ``h'/h`` with ``h = x^-m f^(d)`` (``m`` leading zeros stripped)."""
    h = [c[n + d] * mpmath.mpf(math.factorial(n + d) // math.factorial(n)) for n in range(len(c) - d)]
    m = 0
    while m < len(h) and h[m] == 0:
        m += 1
    h = h[m:]
    if len(h) < 4:
        return None
    return ops.div(ops.derivative(h), h, len(h) - 1)


def estimate_dlog(series, ctx=None, derivatives=(0, 1, 2), count=8):
    """Singularities and exponents from Padé approximants to ``f^(d)'/f^(d)``.

    Parameters
    ----------
    series : Series
    ctx : Context, optional
    derivatives : tuple of int
        Derivative orders ``d`` tried.
    count : int
        Approximants per table.
    """
    method = "dlog"
    prep = prepare(series, ctx)
    with prep.ctx.working():
        c = prep.c
        growth, kappa = classify_growth(c)
        if growth == "factorial":
            return failed(method, Status.NOT_APPLICABLE, "factorially divergent series: radius 0", prep)
        if growth == "entire-like":
            return failed(method, Status.NOT_APPLICABLE, "coefficients decay faster than any power: "
                          "entire-like, no finite singular point", prep)
        runs = []
        for d in derivatives:
            g = dlog_series(c, d)
            if g is None or len(g) < 6:
                continue
            ens, skipped = pade_ensemble(g, prep.dps, prep.digits, count=count)
            if len(ens) < 3:
                runs.append({"d": d, "sings": [], "skipped": skipped, "ens": ens})
                continue
            sings, info = clusters_to_singularities(ens, method, prep.eps, residue_is_exponent=True,
                                                    exponent_shift=d,
                                                    real_series=not prep.is_complex)
            kept = []
            for s in sings:
                if s.exponent is None:
                    kept.append(s)
                    continue
                res = s.exponent.value - d
                nres = int(mpmath.nint(res))
                if nres >= 0 and abs(res - nres) < max(s.exponent.error, mpmath.mpf(10) ** -3) * 2:
                    continue      # zero of f^(d) (or no residue): not a singularity of f
                kept.append(s)
            score = None
            if kept:
                s0 = kept[0]
                rel = max(s0.re.error, s0.im.error) / abs(s0.location)
                # an exponent-less (cut) leading point is worth little; prefer lower d slightly
                score = (rel + (s0.exponent.error * rel if s0.exponent is not None else 1)) * (1 + d / 100)
            runs.append({"d": d, "sings": kept, "score": score, "ens": ens, "skipped": skipped, **info})
        good = [r for r in runs if r.get("score") is not None]
        if not good:
            return failed(method, Status.NOT_CONVERGED,
                          "no stable pole with a non-trivial residue in the Dlog-Padé tables", prep,
                          {"derivatives_tried": [r["d"] for r in runs]})
        # prefer the lowest derivative unless a higher one is clearly sharper
        best = min(good, key=lambda r: r["score"])
        how = (f"Padé approximants to f^(d)'/f^(d) for d in {list(derivatives)}; d = {best['d']} chosen as "
               "the most stable; exponent = residue + d; band = "
               f"{SAFETY} x spread of locations and residues across the {len(best['ens'])} approximants.")
        diag = {"how": how, "derivative": best["d"], "approximants": approximant_table(best["ens"]),
                "by_derivative": [{"d": r["d"], "score": r.get("score"),
                                   "singularities": [s.to_dict() for s in r["sings"]]} for r in runs],
                "clusters": best.get("clusters", [])}
        return finish(method, prep, best["sings"], diagnostics=diag, derivative=best["d"])
