"""Helpers for python-flint ball arithmetic used by the sources.

python-flint keeps its working precision in the global ``flint.ctx.prec``.
:func:`flint_prec` (from ``resum._kernels.flint_bridge``) sets it for the span of a block and restores it, exactly
as :func:`resum.context.workdps` does for mpmath, so nothing leaks between
calls. Nothing else in resum.sources touches ``flint.ctx``.
"""
from __future__ import annotations

import flint
import mpmath

from .._kernels.flint_bridge import flint_prec  # the one place that sets flint.ctx.prec

__all__ = ["flint_prec", "arb_from_mpf", "arb_to_mpf", "arb_rad_to_mpf", "acb_from_mpc"]


def arb_from_mpf(x, rad=0) -> "flint.arb":
    """The exact binary value of an mpf (or int) as an arb ball of radius ``rad``."""
    if isinstance(x, int):
        return flint.arb(x, rad) if rad else flint.arb(x)
    if not isinstance(x, mpmath.mpf):
        x = mpmath.mpf(x)          # floats convert exactly
    sign, man, exp, _ = x._mpf_    # no re-rounding to mpmath's current precision
    man = int(man)
    mid = (-man if sign else man, int(exp)) if man else (0, 0)
    if rad:
        r = rad if isinstance(rad, mpmath.mpf) else mpmath.mpf(rad)
        _, rm, re_, _ = r._mpf_
        # round the radius up by one unit of its mantissa so it stays an upper bound
        return flint.arb(mid, (int(rm) + 1, int(re_)))
    v = flint.arb(mid)
    return v


def acb_from_mpc(z, rad=0) -> "flint.acb":
    z = mpmath.mpc(z)
    return flint.acb(arb_from_mpf(z.real, rad), arb_from_mpf(z.imag, rad))


def arb_to_mpf(x: "flint.arb"):
    """Midpoint of an arb as an mpf (exact; rounded to mpmath's working precision)."""
    m, e = x.mid().man_exp()
    return mpmath.ldexp(mpmath.mpf(int(m)), int(e))


def arb_rad_to_mpf(x: "flint.arb"):
    """Radius of an arb as an mpf (rounded up by at most one ulp of mpmath's precision)."""
    m, e = x.rad().man_exp()
    r = mpmath.ldexp(mpmath.mpf(int(m)), int(e))
    return r * (1 + mpmath.eps) if r else r
