"""Borel sums from the differential equation the Borel transform obeys exactly (method ``borel-ode``).

A factorially divergent series whose coefficients obey a linear recurrence (Euler's series
``sum (-1)^n n! x^n``, Stieltjes series, the zero-dimensional ``phi^4`` integral) has a Borel
transform ``B(t) = sum c_n t^n / n!`` that obeys a linear differential equation with polynomial
coefficients and a *regular* singular point (or none) at the origin. Where the equation is
found and checked on every coefficient (:func:`resum.estimators.resum_ode.find_equation`),
``B`` is known along any ray that stays off the zeros of the equation's leading coefficient:

1. ``B`` is followed by Taylor steps from inside its disk along the ray ``t = x u``, ``u > 0``
   (each step at most half the distance to the nearest zero; the local series of every step is
   kept, so ``B`` can be read anywhere on the ray);
2. the Laplace integral ``f(x) = int_0^inf exp(-u) B(x u) du`` is done by tanh-sinh quadrature
   (:func:`resum.transforms.borel.laplace`) at the working precision;
3. when a zero of the leading coefficient lies on the ray (a singularity of ``B`` there: the
   series is not Borel summable at this ``x``), the integral is done along two rays turned by
   ``+-theta`` (no other zero between them and the ray): the lateral sums ``S+`` and ``S-``;
   the value is their mean, the imaginary part ``(S+ - S-)/(2i)`` the ambiguity.

The band: everything is rerun with 20 more digits and from the series with five fewer terms; the
band is 10 times the larger change plus the quadrature's error estimate (an estimate, not a
proof). Common practice (Borel summation; analytic continuation by Taylor steps), no source;
see J. Zinn-Justin, *Quantum Field Theory and Critical Phenomena* (Oxford), chapter on the
divergence of perturbation theory, for Borel-Laplace summation.
"""
from __future__ import annotations

import bisect

import flint
import mpmath

from .._kernels.flint_bridge import acb_to_mpc, flint_prec, to_acb
from ..results import Estimate
from ..transforms.borel import borel_coefficients, laplace
from .resum_band import PointOutcome
from .resum_ode import SAFETY, _prepare, _start, _walk

__all__ = ["borel_ode_evaluate"]

#: a zero of the leading coefficient within this angle (radians) of the ray lies on it
ON_RAY = mpmath.mpf(10) ** -8


class _RayFunction:
    """``B`` along the straight line from 0 to ``end``: the series near 0, then the local Taylor
    series of each step (``B(z + tau h) = sum b_n tau^n``, ``0 <= tau <= 1``)."""

    def __init__(self, eq, c, end, dps: int, n_terms: int):
        K, Q, P, roots = eq
        self.dps = dps
        self.bits = mpmath.mp.prec
        with mpmath.workdps(dps):
            end = mpmath.mpmathify(end)
            self.c = [mpmath.mpmathify(v) for v in c[:n_terms]]
            z, vals = _start(roots, self.c, K, end, dps, n_terms)
            self.r0 = abs(z)
            steps = []
            _walk(Q, P, K, roots, z, end, vals, mpmath.mpf(10) ** (-dps), record=steps)
            self.starts = [abs(zi) for zi, _, _ in steps]
            self.lengths = [abs(h) for _, h, _ in steps]
            with flint_prec(self.bits + 20):
                self.polys = [flint.acb_poly(b) for _, _, b in steps]

    def __call__(self, t):
        r = abs(t)
        if r <= self.r0 or not self.starts:
            return mpmath.polyval(self.c[::-1], t)
        i = max(0, bisect.bisect_right(self.starts, r) - 1)
        tau = min(mpmath.mpf(1), (r - self.starts[i]) / self.lengths[i])
        with flint_prec(self.bits + 20):
            v = acb_to_mpc(self.polys[i](to_acb(tau)).mid())
        return mpmath.mpf(v.real) if v.imag == 0 else v


def _laplace_ode(eq, c, x, theta, dps: int, n_terms: int):
    """``(value, quadrature error)`` of the Laplace integral along ``t = x u e^(i theta)``."""
    with mpmath.workdps(dps):
        x = mpmath.mpmathify(x)
        theta = mpmath.mpf(theta)
        s_max = ((dps + 5) * mpmath.log(10) + 10) / mpmath.cos(theta)
        end = x * mpmath.expj(theta) * s_max
        F = _RayFunction(eq, c, end, dps, n_terms)
        roots = eq[3]
        dist0 = min((abs(r) for r in roots if r != 0), default=abs(x))
        return laplace(F, x, 0, dps, theta=theta, scale=dist0 / abs(x), s_max=s_max)


def borel_ode_evaluate(c, xs, dps: int, digits=None, coefficients_at=None, shape=None):
    """Borel sums at ``xs`` from the exact equation of the Borel transform of ``c`` (module
    docstring). ``coefficients_at`` is accepted for symmetry with the ``ode`` method and unused;
    ``shape``: the equation's shape if known (:func:`resum.estimators.resum_ode.find_equation`).

    Returns ``(outcomes, diagnostics)`` like the other evaluators."""
    digits = dps if digits is None else digits
    with mpmath.workdps(dps + 10):
        B = borel_coefficients(c)
    K, Q, P, roots, why = _prepare(B, dps, digits, shape)
    if why:
        why = why.replace("the series obeys", "the Borel transform obeys").replace(
            "the equation the series obeys", "the equation the Borel transform obeys")
        return [PointOutcome(None, None, False, why, {}) for _ in xs], {"equation": None}
    from .diffapprox import equation_text
    diag = {"equation": equation_text(Q, P, "t", digits).replace("f'", "B'").replace("] f", "] B"),
            "order": K, "singular_points": [mpmath.nstr(r, 15) for r in roots], "borel_b": "0"}
    eq = (K, Q, P, roots)
    n = len(c)
    outs = []
    for x in xs:
        x = mpmath.mpmathify(x)
        if x == 0:
            outs.append(PointOutcome(None, None, False, "the Borel sum needs x != 0", {}))
            continue
        direc = x / abs(x)
        on = [r for r in roots if r != 0 and abs(mpmath.arg(r / direc)) < ON_RAY]
        thetas = [mpmath.mpf(0)]
        if on:
            others = [abs(mpmath.arg(r / direc)) for r in roots if r != 0 and r not in on]
            th = min([mpmath.pi / 8] + [a / 2 for a in others if a < mpmath.pi / 4])
            thetas = [th, -th]
        sums, errs = [], []
        try:
            for th in thetas:
                v1, e1 = _laplace_ode(eq, B, x, th, dps + 10, n)
                v2, _ = _laplace_ode(eq, B, x, th, dps + 30, n)
                v3, _ = _laplace_ode(eq, B, x, th, dps + 10, max(K + 2, n - 5))
                with mpmath.workdps(dps + 10):
                    dev = max(abs(v1 - v2), abs(v1 - v3))
                    sums.append(v1)
                    errs.append(SAFETY * dev + e1 + abs(v1) * mpmath.mpf(10) ** (-(digits + 5)))
        except (ValueError, ZeroDivisionError) as exc:
            outs.append(PointOutcome(None, None, False, f"the Laplace integral failed ({exc})", {}))
            continue
        with mpmath.workdps(dps + 10):
            err = max(errs)
            info = {"how": "Laplace integral of the Borel transform followed along its exact equation",
                    "lateral": bool(on)}
            if on:
                sp, sm = sums
                avg, amb = (sp + sm) / 2, (sp - sm) / (2j)
                A = min(on, key=abs)
                A = mpmath.re(A) if abs(mpmath.im(A)) <= ON_RAY * abs(A) else A
                info.update({"theta": mpmath.nstr(thetas[0], 8), "ray_singularity": mpmath.nstr(A, 15),
                             "exp(-A/x)": mpmath.nstr(mpmath.exp(-A / x), 15),
                             "S_plus": mpmath.nstr(sp, 25), "S_minus": mpmath.nstr(sm, 25)})
                vr, vi = mpmath.re(avg), mpmath.re(amb)
                outs.append(PointOutcome(Estimate(vr, vr - err, vr + err), Estimate(vi, vi - err, vi + err),
                                         True, "", info))
                continue
            v = sums[0]
            vr, vi = mpmath.re(v), mpmath.im(v)
            re = Estimate(vr, vr - err, vr + err)
            im = Estimate(vi, vi - err, vi + err) if (isinstance(x, mpmath.mpc) or vi != 0) else None
            outs.append(PointOutcome(re, im, True, "", info))
    return outs, diag
