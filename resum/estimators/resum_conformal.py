"""Conformal-map Padé: re-expand in the disk variable, then Padé in it.

The series in ``x`` is re-expanded in ``w`` (``x = x(w)`` maps the unit disk
onto the plane cut along the singularities, see
:mod:`resum.transforms.conformal`), optionally multiplied by
``(1 - w/w_inf)^alpha`` where ``w_inf`` is the image of ``x = infinity`` (this
absorbs a known power behaviour ``x^p`` at large ``x``, ``alpha = 2p`` for a
ray map), and the near-diagonal Padé approximants in ``w`` are evaluated at
``w(x)``. The band is the spread of stable approximants, as for plain Padé.

>>> import mpmath
>>> from resum.context import workdps
>>> from resum.transforms.conformal import RayMap
>>> with workdps(40):
...     c = [mpmath.mpf(-1) ** n / (n + 1) for n in range(40)]     # log(1+x)/x, cut (-inf, -1]
...     out, _ = conformal_evaluate(c, [mpmath.mpf(50)], RayMap(-1), 40)
...     ok = out[0].re.contains(mpmath.log(51) / 50)
>>> ok, out[0].re.digits() > 10
(True, True)

Notes
-----
The re-expansion uses exactly the first ``n`` coefficients for the first
``n`` coefficients in ``w``: no information is added, but every point of
the cut plane now lies inside the disk of convergence. Points on the cut are
refused (``ok = False``).

References
----------
.. [1] R. Seznec and J. Zinn-Justin, J. Math. Phys. 20 (1979) 1398.
.. [2] O. Costin and G. V. Dunne, J. Phys. A 52 (2019) 445205, arXiv:1904.11593
   (conformal map plus Padé: "Padé-conformal" extrapolation).
"""
from __future__ import annotations

from typing import Sequence

import mpmath

from ..transforms.conformal import ConformalMap, pull_back, rim_factor
from .resum_band import PointOutcome
from .resum_pade import pade_evaluate

__all__ = ["conformal_evaluate", "mapped_coefficients"]


def mapped_coefficients(c: Sequence, cmap: ConformalMap, dps: int, alpha=None) -> list:
    """Coefficients in ``w`` of ``(1 - w/w_inf)^alpha f(x(w))``."""
    cw = pull_back(c, cmap, dps)
    cw = [mpmath.mpmathify(v) for v in cw]
    if alpha is not None and alpha != 0:
        fac = rim_factor(alpha, len(cw), cmap.rim_point())
        n = len(cw)
        cw = [sum(fac[k] * cw[m - k] for k in range(m + 1)) for m in range(n)]
    return cw


def conformal_evaluate(c: Sequence, xs: Sequence, cmap: ConformalMap, dps: int, *, alpha=None,
                       n_orders: int = 7, offsets: Sequence[int] = (0,), safety=4):
    """Conformal-map Padé values with bands at the points ``xs`` (expansion variable)."""
    cw = mapped_coefficients(c, cmap, dps, alpha)
    ws, bad = [], []
    for x in xs:
        w = cmap.w_of_x(x)
        if abs(w) >= 1 - mpmath.mpf(10) ** -12:
            bad.append(True)
            ws.append(mpmath.mpf(0))
        else:
            bad.append(False)
            ws.append(w)
    rim = cmap.rim_point()

    def post(j, v):
        if alpha is None or alpha == 0:
            return v
        return v / (1 - ws[j] / rim) ** alpha

    outs, diag = pade_evaluate(cw, ws, dps, n_orders=n_orders, offsets=offsets, post=post,
                               safety=safety)
    for j, o in enumerate(outs):
        if bad[j]:
            outs[j] = PointOutcome(None, None, False,
                                   f"x = {mpmath.nstr(xs[j], 10)} lies on the cut of the map "
                                   f"({cmap.describe()})", {})
        else:
            o.info["w"] = mpmath.nstr(ws[j], 20)
    diag = dict(diag, map=cmap.to_dict(), alpha=None if alpha is None else str(alpha))
    return outs, diag
