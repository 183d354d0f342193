"""Re-expansion of a series in a new variable (conformal maps) to a requested accuracy.

``compose_to_digits(a, b, n, dps)`` returns the first ``n`` coefficients of
``a(b(w))`` (``b(0) = 0``), each known to ``dps`` significant digits, by
composing in Arb ball arithmetic and raising the precision until the ball
radii show it. This is the precision plan for conformal re-expansions:

* the coefficients of ``a(b(w))`` are sums of terms ``a_k [w^m] b(w)^k``
  that can be much larger than the sum (alternating terms cancel), so the
  digits lost are about ``log10(majorant_m / |result_m|)``, where the
  majorant is the same composition with all coefficients replaced by their
  absolute values (:func:`cancellation_digits` computes this estimate);
* the first run uses ``dps + 10 + max(cancellation estimate)`` digits; if the
  ball radii show fewer than ``dps`` digits in some coefficient, the
  precision is raised by the shortfall and the composition repeated.

>>> import mpmath
>>> from fractions import Fraction
>>> # x = 4w/(1+w)^2 maps the plane cut along [1, inf) onto the unit disc;
>>> # 1/(1-x) = (1+w)^2/(1-w)^2 has coefficients 1, 4, 8, 12, ... in w
>>> b = [0] + [4 * (-1) ** (k - 1) * k for k in range(1, 12)]      # 4w/(1+w)^2
>>> r = compose_to_digits([1] * 12, b, 8, dps=30)
>>> [int(x) for x in r.coefficients], r.digits >= 30
([1, 4, 8, 12, 16, 20, 24, 28], True)

Notes
-----
How to read the error: ``digits`` is the smallest number of correct
significant digits over the returned coefficients, from the ball radii
(rigorous for the input as given, treating the given coefficients as exact).
A coefficient whose true value is zero can never show relative digits; a
coefficient smaller than ``10**-dps`` times the largest one is judged
against that floor instead (``diagnostics['floor']``).

Applicability: any outer series ``a`` and inner ``b`` with ``b(0) = 0``
(int, Fraction, mpf, mpc). Exact input gives exact output (FLINT ``fmpq``).

References
----------
F. Johansson, "A fast algorithm for reversion of power series", Math. Comp.
84 (2015) 475-484 (composition in FLINT/Arb).
J. C. Le Guillou and J. Zinn-Justin, "Critical exponents from field theory",
Phys. Rev. B 21 (1980) 3976 (conformal mapping of perturbative series).
"""
from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Optional

import flint

from . import flint_bridge as fb

__all__ = ["Reexpansion", "compose_to_digits", "cancellation_digits"]


@dataclass(frozen=True)
class Reexpansion:
    """Coefficients of ``a(b(w))`` with their accuracy.

    Attributes
    ----------
    coefficients : list
        Fractions (exact input) or mpf/mpc.
    digits : float
        Smallest correct significant digits over the coefficients.
    prec_bits : int
        Precision of the final run.
    exact : bool
    diagnostics : dict
    """

    coefficients: list
    digits: float
    prec_bits: int
    exact: bool
    diagnostics: dict = field(default_factory=dict)


class _Cap:
    def __init__(self, n):
        self.n = n

    def __enter__(self):
        self.old = flint.ctx.cap
        flint.ctx.cap = max(int(self.n), 1)

    def __exit__(self, *exc):
        flint.ctx.cap = self.old
        return False


def _log2_abs(x):
    m, e = x.man_exp()
    m = int(m)
    return -math.inf if m == 0 else abs(m).bit_length() + int(e)


def cancellation_digits(a, b, n: int) -> list:
    """Estimated digits lost to cancellation in each coefficient of a(b(w)):
    ``log10(majorant_m / |(a o b)_m|)``, computed in 128-bit balls (an
    estimate, for planning precision; ``inf`` where the coefficient is 0)."""
    with fb.flint_prec(128), _Cap(n):
        cplx = fb.is_complex_list(list(a) + list(b))
        S = flint.acb_series if cplx else flint.arb_series
        conv = fb.to_acb if cplx else fb.to_arb
        A = S([conv(x) for x in a[:n]], prec=n)
        B = S([conv(x) for x in b[:n]], prec=n)
        Aa = flint.arb_series([abs(conv(x)) for x in a[:n]], prec=n)
        Ba = flint.arb_series([abs(conv(x)) for x in b[:n]], prec=n)
        R = A(B).coeffs()
        Rm = Aa(Ba).coeffs()
    out = []
    for m in range(n):
        maj = Rm[m] if m < len(Rm) else flint.arb(0)
        r = R[m] if m < len(R) else flint.arb(0)
        mag = abs(r.mid()) if not cplx else abs(r).mid()
        lm = _log2_abs(maj.mid())
        lr = _log2_abs(mag if isinstance(mag, flint.arf) else flint.arb(mag).mid())
        out.append(math.inf if lr == -math.inf else max(0.0, (lm - lr) * 0.30103))
    return out


def compose_to_digits(a, b, n: int, dps: int, *, max_prec_bits: Optional[int] = None) -> Reexpansion:
    """First ``n`` coefficients of ``a(b(w))`` to ``dps`` significant digits.

    Parameters
    ----------
    a, b : sequences
        Outer and inner series, low to high; ``b[0]`` must be 0.
    n : int
        Number of output coefficients.
    dps : int
        Significant digits wanted in every coefficient.
    max_prec_bits : int, optional
        Cap on the precision (default ``16 * bits(dps) + 4096``).

    Returns
    -------
    Reexpansion
    """
    if not b or b[0] != 0:
        raise ValueError("composition a(b(w)) needs b(0) = 0")
    if n < 1:
        raise ValueError("n must be positive")
    a = list(a[:n])
    b = list(b[:n])
    if all(fb.is_exact(x) for x in a + b):
        with _Cap(n):
            r = flint.fmpq_series([fb.to_fmpq(x) for x in a], prec=n)(
                flint.fmpq_series([fb.to_fmpq(x) for x in b], prec=n))
            co = [fb.fmpq_to_fraction(x) for x in r.coeffs()]
        co = (co + [0] * n)[:n]
        return Reexpansion(co, math.inf, 0, True, {})
    cplx = fb.is_complex_list(a + b)
    loss = [d for d in cancellation_digits(a, b, n) if math.isfinite(d)]
    plan = max(loss) if loss else 0.0
    prec = fb.prec_for_dps(dps + 10 + plan)
    maxp = max_prec_bits or 16 * fb.prec_for_dps(dps) + 4096
    S = flint.acb_series if cplx else flint.arb_series
    conv = fb.to_acb if cplx else fb.to_arb
    while True:
        with fb.flint_prec(prec), _Cap(n):
            A = S([conv(x) for x in a], prec=n)
            B = S([conv(x) for x in b], prec=n)
            R = list(A(B).coeffs())
            Z = flint.acb(0) if cplx else flint.arb(0)
            R = (R + [Z] * n)[:n]
            parts = [(x.real, x.imag) if cplx else (x,) for x in R]
            big = max(_log2_abs(p.mid()) for ps in parts for p in ps)
            floor = big - fb.prec_for_dps(dps)
            worst = math.inf
            for ps in parts:
                mag = max(_log2_abs(p.mid()) for p in ps)
                rad = max(_log2_abs(p.rad()) for p in ps)
                if rad == -math.inf:
                    continue
                ref = max(mag, floor)
                worst = min(worst, max(0.0, (ref - rad - 2) * 0.30103))
            conv_back = fb.acb_to_mpc if cplx else fb.arb_to_mpf
            co = [conv_back(x) for x in R]
        if worst >= dps or prec >= maxp:
            return Reexpansion(co, worst, prec, False,
                               {"planned_loss_digits": plan, "floor_log2": floor})
        prec = min(maxp, prec + int(3.3219 * (1.1 * (dps - worst) + 10)))
