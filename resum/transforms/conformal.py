"""Conformal maps of a cut plane onto the unit disk, and series re-expansion.

A function analytic in the plane minus cuts is a function of ``w`` analytic
in the unit disk ``|w| < 1`` once the cut plane is mapped onto the disk with
``x = 0 -> w = 0``. Re-expanding the series in ``w`` moves every singularity
to ``|w| = 1`` and puts every point of the cut plane inside the disk, so the
re-expanded series converges (slowly near the rim) at points far outside the
original disk of convergence.

Two families, both exact rational functions ``x(w)``:

* :class:`RayMap` -- one cut from the branch point ``x0`` radially out to
  infinity (for ``x0 < 0`` the cut ``(-inf, x0]``)::

      w = (sqrt(1 - x/x0) - 1) / (sqrt(1 - x/x0) + 1),   x = -4 x0 w / (1 - w)^2

* :class:`ArcMap` -- two branch points ``s1, s2`` joined by one cut through
  the far side: two real cuts ``(-inf, -a] U [b, inf)`` (``s1 = b, s2 = -a``)
  or a complex-conjugate pair ``s, conj(s)`` joined by a circular arc that
  crosses the real axis at ``|s|^2 / Re s``::

      y = (x - s1)/(x - s2),  y0 = s1/s2,  w = (sqrt(y/y0) - 1)/(sqrt(y/y0) + 1)
      x = 4 s1 w / (y0 (1 + w)^2 - (1 - w)^2)

Orientation: ``w`` is chosen so that ``dx/dw`` at 0 has a positive real part
(small positive ``x`` maps to small positive ``w`` for real data).

>>> import mpmath
>>> from resum.context import workdps
>>> m = RayMap(mpmath.mpf(-1) / 16)
>>> with workdps(30):
...     w = m.w_of_x(1)
...     back = m.x_of_w(w)
>>> mpmath.nstr(w, 12), mpmath.nstr(back, 12)
('0.609611796798', '1.0')

References
----------
.. [1] R. Seznec and J. Zinn-Justin, "Summation of divergent series by order
   dependent mappings", J. Math. Phys. 20 (1979) 1398.
.. [2] I. Caprini and J. Fischer, "Accelerated convergence of perturbative QCD
   by optimal conformal mapping of the Borel plane", Phys. Rev. D 60 (1999) 054014.
.. [3] O. Costin and G. V. Dunne, "Resurgent extrapolation: rebuilding a
   function from asymptotic data. Painleve I", J. Phys. A 52 (2019) 445205,
   arXiv:1904.11593 (conformal maps for Pade in the Borel plane).
"""
from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction
from typing import Sequence

import mpmath

from ..results import point_text
from ._arb import compose_series, rational_series

__all__ = ["ConformalMap", "RayMap", "ArcMap", "PairMap", "StarMap", "choose_map", "crosses_pair_cut",
           "pull_back", "rim_factor"]


def _phase(d):
    """Unit number ``d/|d|``, exactly +-1 for real ``d``."""
    d = mpmath.mpmathify(d)
    if not isinstance(d, mpmath.mpc) or d.imag == 0:
        return 1 if mpmath.re(d) >= 0 else -1
    return d / abs(d)


def _real_if_close(z, dps):
    if isinstance(z, mpmath.mpc) and abs(z.imag) <= mpmath.mpf(10) ** (-dps) * (1 + abs(z.real)):
        return z.real
    return z


def _mp(z):
    z = mpmath.mpmathify(z)
    if isinstance(z, mpmath.mpc) and z.imag == 0:
        return z.real
    return z


class ConformalMap:
    """Base class: a map ``x(w)`` of the unit disk onto a cut plane."""

    kind = "abstract"

    def w_of_x(self, x):  # pragma: no cover - abstract
        raise NotImplementedError

    def w_of_x_at(self, dps: int):
        """``w_of_x`` for many calls at one precision (Laplace integrands): the map's constants
        converted once, at ``dps`` digits. The default is :meth:`w_of_x` itself."""
        return self.w_of_x

    def x_of_w(self, w):  # pragma: no cover - abstract
        raise NotImplementedError

    def x_series(self, n: int, dps: int) -> list:  # pragma: no cover - abstract
        """First ``n`` Taylor coefficients of ``x(w)`` (``x(0) = 0``)."""
        raise NotImplementedError

    def branch_points(self) -> tuple:  # pragma: no cover - abstract
        raise NotImplementedError

    def on_cut(self, x, tol=mpmath.mpf(10) ** -12) -> bool:
        """True when ``x`` lies on (or numerically at) the cut, where the map has no single value."""
        w = self.w_of_x(x)
        return bool(abs(w) >= 1 - tol)

    def describe(self) -> str:  # pragma: no cover - abstract
        raise NotImplementedError

    def to_dict(self) -> dict:  # pragma: no cover - abstract
        raise NotImplementedError

    @staticmethod
    def from_dict(d: dict) -> "ConformalMap":
        if d["kind"] == "ray":
            return RayMap(mpmath.mpmathify(d["x0"]))
        if d["kind"] == "arc":
            return ArcMap(mpmath.mpmathify(d["s1"]), mpmath.mpmathify(d["s2"]))
        if d["kind"] == "pair":
            return PairMap(mpmath.mpmathify(d["s"]))
        if d["kind"] == "star":
            return StarMap(mpmath.mpmathify(d["s"]))
        raise ValueError(f"unknown map kind {d['kind']!r}")


@dataclass(frozen=True)
class RayMap(ConformalMap):
    """One cut from ``x0`` radially to infinity.

    Parameters
    ----------
    x0 : number (real or complex, non-zero)
        The branch point nearest the origin; exact Fractions keep the
        re-expansion exact.
    """

    x0: object
    kind = "ray"

    def __post_init__(self):
        if self.x0 == 0:
            raise ValueError("the branch point of a conformal map cannot be 0")

    def _sign(self):
        return _phase(-4 * _mp(self.x0))        # dx/dw at w = 0

    def w_of_x(self, x):
        x0 = _mp(self.x0)
        s = mpmath.sqrt(1 - mpmath.mpmathify(x) / x0)
        return _mp(self._sign() * (s - 1) / (s + 1))

    def w_of_x_at(self, dps: int):
        with mpmath.workdps(dps):
            inv, sg = 1 / _mp(self.x0), self._sign()

        def w(x):       # the formula of w_of_x, one square root per call
            s = mpmath.sqrt(1 - x * inv)
            return _mp(sg * (s - 1) / (s + 1))
        return w

    def x_of_w(self, w):
        w = mpmath.mpmathify(w) / self._sign()
        return _mp(-4 * _mp(self.x0) * w / (1 - w) ** 2)

    def x_series(self, n: int, dps: int) -> list:
        x0 = self.x0
        sg = self._sign()
        if isinstance(x0, (int, Fraction)) and sg in (1, -1):
            return [0] + [-4 * x0 * k * sg ** k for k in range(1, n)]
        x0 = _mp(x0)
        return [mpmath.mpf(0)] + [_mp(-4 * x0 * k * sg ** (-k)) for k in range(1, n)]

    def branch_points(self) -> tuple:
        return (_mp(self.x0),)

    def rim_point(self):
        """The value of ``w`` that ``x = infinity`` maps to (the unit ``sign``; complex when
        ``x0`` is)."""
        return _mp(self._sign())

    def describe(self) -> str:
        return f"one cut from x0 = {mpmath.nstr(_mp(self.x0), 12)} radially to infinity"

    def to_dict(self) -> dict:
        from ..results import num_to_str
        return {"kind": "ray", "x0": num_to_str(_mp(self.x0), 30)}


@dataclass(frozen=True)
class ArcMap(ConformalMap):
    """Two branch points ``s1, s2`` joined by one cut through the far side.

    ``ArcMap(b, -a)`` with ``a, b > 0`` is the plane with the two real cuts
    ``(-inf, -a]`` and ``[b, inf)``; ``ArcMap(s, conj(s))`` the plane cut along
    the circular arc from ``s`` to ``conj(s)`` that avoids the origin. That arc
    passes through infinity only for an imaginary pair; otherwise ``x = inf``
    maps to an interior point :meth:`rim_point` (a pole of ``x(w)``), so use it
    only for functions regular at infinity.
    """

    s1: object
    s2: object
    kind = "arc"

    def __post_init__(self):
        if self.s1 == 0 or self.s2 == 0 or self.s1 == self.s2:
            raise ValueError("an arc map needs two distinct non-zero branch points")

    def _y0(self):
        return _mp(self.s1) / _mp(self.s2)

    def _sign(self):
        return _phase(4 * _mp(self.s1) / (self._y0() - 1))

    def w_of_x(self, x):
        x = mpmath.mpmathify(x)
        s1, s2 = _mp(self.s1), _mp(self.s2)
        y = (x - s1) / (x - s2)
        r = mpmath.sqrt(y / self._y0())
        return _mp(self._sign() * (r - 1) / (r + 1))

    def x_of_w(self, w):
        w = mpmath.mpmathify(w) / self._sign()
        y0 = self._y0()
        return _mp(4 * _mp(self.s1) * w / (y0 * (1 + w) ** 2 - (1 - w) ** 2))

    def x_series(self, n: int, dps: int) -> list:
        y0 = self._y0()
        sg = self._sign()
        num = [mpmath.mpf(0), 4 * _mp(self.s1) / sg]
        den = [y0 - 1, (2 * y0 + 2) / sg, (y0 - 1) / sg ** 2]
        out = rational_series(num, den, n, dps)
        out[0] = mpmath.mpf(0)
        return [_real_if_close(c, dps) for c in out]

    def branch_points(self) -> tuple:
        return (_mp(self.s1), _mp(self.s2))

    def rim_point(self):
        """``w`` for ``x = infinity``."""
        return self.w_of_x(mpmath.mpf(10) ** (mpmath.mp.dps + 5))

    def describe(self) -> str:
        return (f"one cut joining {mpmath.nstr(_mp(self.s1), 12)} and {mpmath.nstr(_mp(self.s2), 12)}"
                " through the far side")

    def to_dict(self) -> dict:
        from ..results import num_to_str
        return {"kind": "arc", "s1": num_to_str(_mp(self.s1), 30), "s2": num_to_str(_mp(self.s2), 30)}


@dataclass(frozen=True)
class PairMap(ConformalMap):
    """A complex-conjugate pair ``s, conj(s)`` with cuts running to infinity.

    The cuts lie on the vertical line ``Re x = Re s``: from ``s`` up to ``+i infinity`` and
    from ``conj(s)`` down to ``-i infinity``; together with ``x = infinity`` they form one arc,
    the circle through ``s``, ``conj(s)`` and infinity. The real axis crosses the line in the
    gap between the pair, so every real point lies inside the disk, and ``x = infinity`` is a
    rim point: the map suits functions singular at infinity (powers, logarithms), which
    :class:`ArcMap` with a pair off the imaginary axis does not. Construction::

        y = (x - s)/(x - conj(s)),  r = sqrt(-y) (Re r > 0),  w = c (r - r0)/(r + conj(r0))

    with ``r0 = r(0)`` and ``c`` the phase that makes ``dx/dw`` at 0 positive. ``x(w)`` is
    rational (quadratic over quadratic), so the re-expansion is exact in the arithmetic used.
    The coefficients in ``w`` of a real series are complex.
    """

    s: object
    kind = "pair"

    def __post_init__(self):
        s = mpmath.mpmathify(self.s)
        if not isinstance(s, mpmath.mpc) or s.imag == 0:
            raise ValueError("a pair map needs a complex branch point off the real axis")

    def _parts(self):
        s = mpmath.mpc(_mp(self.s))
        if s.imag < 0:
            s = mpmath.conj(s)
        y0 = s / mpmath.conj(s)
        r0 = mpmath.sqrt(-y0)
        c = _phase(-4j * s.imag / (1 + r0 ** 2))
        return s, r0, c

    def w_of_x(self, x):
        s, r0, c = self._parts()
        x = mpmath.mpmathify(x)
        r = mpmath.sqrt(-(x - s) / (x - mpmath.conj(s)))
        w = c * (r - r0) / (r + mpmath.conj(r0))
        # real x gives real w (the map is symmetric under conjugation): drop the rounding
        return _real_if_close(w, mpmath.mp.dps - 3) if not isinstance(x, mpmath.mpc) else w

    def x_of_w(self, w):
        s, r0, c = self._parts()
        u = mpmath.mpmathify(w) / c
        r = (r0 + mpmath.conj(r0) * u) / (1 - u)
        x = (s + r ** 2 * mpmath.conj(s)) / (1 + r ** 2)
        return _real_if_close(x, mpmath.mp.dps - 3) if not isinstance(mpmath.mpmathify(w), mpmath.mpc) else x

    def x_series(self, n: int, dps: int) -> list:
        s, r0, c = self._parts()
        rb = mpmath.conj(r0)
        num = [mpmath.mpc(0), -4j * s.imag / c, (s - mpmath.conj(s) ** 2 / s) / c ** 2]
        den = [1 + r0 ** 2, mpmath.mpc(0), (1 + rb ** 2) / c ** 2]
        out = rational_series(num, den, n, dps)
        out[0] = mpmath.mpf(0)
        return [_real_if_close(v, dps - 3) for v in out]     # real: the map is conjugation-symmetric

    def branch_points(self) -> tuple:
        s = mpmath.mpc(_mp(self.s))
        return (s, mpmath.conj(s))

    def rim_point(self):
        """``w`` for ``x = infinity`` (on the unit circle; 1 with the chosen phase)."""
        s, r0, c = self._parts()
        return _real_if_close(c * (1j - r0) / (1j + mpmath.conj(r0)), mpmath.mp.dps - 3)

    def describe(self) -> str:
        s = mpmath.mpc(_mp(self.s))
        return (f"two cuts from {mpmath.nstr(s, 12)} and its conjugate along Re x = "
                f"{mpmath.nstr(s.real, 12)} to infinity")

    def to_dict(self) -> dict:
        from ..results import num_to_str
        return {"kind": "pair", "s": num_to_str(mpmath.mpc(_mp(self.s)), 30)}


@dataclass(frozen=True)
class StarMap(ConformalMap):
    """A complex-conjugate pair ``s, conj(s)`` with radial cuts ``{t s, t >= 1}`` and
    ``{t conj(s), t >= 1}``: the star of the origin, where the value is the continuation
    along the straight line from 0 (the principal branch of ``(1 - x/s)^p (1 - x/conj(s))^q``).

    With ``theta = |arg s|`` and ``a = 2 theta / pi``::

        x(w) = w / (C (1 - w)^a (1 + w)^(2 - a))

    (``x = 1/f(1/w)`` with ``f`` the exterior map of a V-shaped slit with its vertex at 0,
    a Schwarz-Christoffel map; ``C > 0`` puts the tips of the slit at ``1/s, 1/conj(s)``).
    The cuts' images are the arcs of the unit circle through the tips ``exp(+-i beta)``,
    ``cos beta = 1 - a``; ``x = +infinity`` maps to ``w = 1``, ``x = -infinity`` to ``w = -1``.
    ``x(w)`` has real Taylor coefficients, so a real series stays real in ``w``; ``w(x)`` is
    found by Newton steps along the segment from 0 to ``x`` (which lies in the star).
    ``a = 1`` (an imaginary pair) gives ``x = w / (C (1 - w^2))``; ``a -> 0`` the
    :class:`RayMap` of a cut on the positive axis. Real points lie a little nearer the rim
    than with :class:`PairMap` (``|w| = 0.766`` against ``0.732`` at ``x = 2`` for the pair
    ``exp(+-i pi/3)``), so ``evaluate`` takes this map only for points that need it.
    """

    s: object
    kind = "star"

    def __post_init__(self):
        s = mpmath.mpmathify(self.s)
        if not isinstance(s, mpmath.mpc) or s.imag == 0:
            raise ValueError("a star map needs a complex branch point off the real axis")

    def _parts(self):
        s = mpmath.mpc(_mp(self.s))
        if s.imag < 0:
            s = mpmath.conj(s)
        a = 2 * mpmath.arg(s) / mpmath.pi
        cb = 1 - a
        tip = mpmath.mpc(cb, mpmath.sqrt(1 - cb ** 2))
        C = abs(tip / ((1 - tip) ** a * (1 + tip) ** (2 - a))) / abs(s)
        return s, a, C

    def x_of_w(self, w):
        s, a, C = self._parts()
        w = mpmath.mpmathify(w)
        x = w / (C * (1 - w) ** a * (1 + w) ** (2 - a))
        return _real_if_close(x, mpmath.mp.dps - 3) if not isinstance(w, mpmath.mpc) else x

    def _newton(self, x, parts):
        """Continuation along ``t x``, ``t`` from 0 to 1: an Euler predictor (``dw/dt = x / x'(w)``)
        and Newton correctors; the step in ``t`` halves when Newton does not settle within 8
        iterations or leaves the disk, and grows by half after a success."""
        s, a, C = parts
        eps = mpmath.mpf(2) ** (-mpmath.mp.prec + 10)

        def xw_dxw(w):
            xw = w / (C * (1 - w) ** a * (1 + w) ** (2 - a))
            return xw, xw * (1 / w + a / (1 - w) + (a - 2) / (1 + w))

        t, w = mpmath.mpf(0), x * 0
        h = mpmath.mpf(1) / 8
        while t < 1:
            h = min(h, 1 - t)
            t1 = t + h
            if w == 0:
                wn = x * t1 * C
            else:
                _, d = xw_dxw(w)
                wn = w + h * x / d
            ok = False
            for _ in range(8):
                if wn == 0 or abs(wn) >= 1:
                    break
                xv, d = xw_dxw(wn)
                dw = (xv - x * t1) / d
                wn -= dw
                if abs(dw) <= eps * abs(wn):
                    ok = abs(wn) < 1
                    break
            if ok:
                t, w = t1, wn
                h = h * 3 / 2
            else:
                h = h / 2
                if h < mpmath.mpf(10) ** -12:
                    raise ArithmeticError(f"the star map could not be inverted at x = {point_text(x, 10)}")
        return w

    def w_of_x(self, x):
        x = mpmath.mpmathify(x)
        if x == 0:
            return mpmath.mpf(0)
        if self.on_cut(x):
            return mpmath.mpf(1)            # on a cut: the rim (the caller refuses the point)
        try:
            w = self._newton(x, self._parts())
        except ArithmeticError:
            return mpmath.mpf(1)            # numerically on the rim (a hair from a cut, or a thin wedge far out)
        return _real_if_close(w, mpmath.mp.dps - 3) if not isinstance(x, mpmath.mpc) else w

    def on_cut(self, x, tol=mpmath.mpf(10) ** -12) -> bool:
        x = mpmath.mpc(mpmath.mpmathify(x))
        s = mpmath.mpc(_mp(self.s))
        for z in (s, mpmath.conj(s)):
            t = x / z                      # on the cut when t is real and >= 1
            if abs(t.imag) <= tol * max(1, abs(t)) and t.real >= 1 - tol:
                return True
        return False

    def x_series(self, n: int, dps: int) -> list:
        s, a, C = self._parts()
        u = [mpmath.mpf(1)]                # (1 - w)^(-a)
        v = [mpmath.mpf(1)]                # (1 + w)^(a - 2)
        for k in range(1, n):
            u.append(u[-1] * (a + k - 1) / k)
            v.append(v[-1] * (a - 2 - (k - 1)) / k)
        out = [mpmath.mpf(0)]
        for m in range(n - 1):
            out.append(sum(u[i] * v[m - i] for i in range(m + 1)) / C)
        return out

    def branch_points(self) -> tuple:
        s = mpmath.mpc(_mp(self.s))
        return (s, mpmath.conj(s))

    def rim_point(self):
        """``w`` for ``x = +infinity``."""
        return mpmath.mpf(1)

    def large_x_exponent(self):
        """``x ~ (1 - w)^(-a)`` at the rim point: a power ``x^p`` is ``(1 - w)^(-a p)`` there."""
        return self._parts()[1]

    def describe(self) -> str:
        s = mpmath.mpc(_mp(self.s))
        return f"two cuts from {mpmath.nstr(s, 12)} and its conjugate radially to infinity"

    def to_dict(self) -> dict:
        from ..results import num_to_str
        return {"kind": "star", "s": num_to_str(mpmath.mpc(_mp(self.s)), 30)}


def crosses_pair_cut(cmap, x) -> bool:
    """Does the straight line from 0 to ``x`` cross a cut of a :class:`PairMap` (the vertical
    lines from the pair outwards)? Beyond such a cut the pair map's value is another branch
    than the continuation along the straight line."""
    if not isinstance(cmap, PairMap):
        return False
    x = mpmath.mpc(mpmath.mpmathify(x))
    s = mpmath.mpc(cmap.branch_points()[0])
    s = s if s.imag > 0 else mpmath.conj(s)
    if x.real == 0:
        return False
    t = s.real / x.real
    return bool(0 < t <= 1 and abs(t * x.imag) >= s.imag)


def pull_back(coeffs: Sequence, cmap: ConformalMap, dps: int, n: int | None = None) -> list:
    """Coefficients in ``w`` of ``f(x(w))`` from the coefficients of ``f`` in ``x``.

    The first ``n`` coefficients in ``w`` need exactly the first ``n``
    coefficients in ``x`` (``x(w) = O(w)``), so nothing is lost or invented.
    Exact input and an exact :class:`RayMap` stay exact.
    """
    n = len(coeffs) if n is None else n
    return compose_series(list(coeffs)[:n], cmap.x_series(n, dps), n, dps)


def rim_factor(alpha, n: int, rim=1) -> list:
    """Coefficients of ``(1 - w/rim)^alpha`` to ``n`` terms (binomial series).

    Multiplying ``f(x(w))`` by this factor absorbs a known power behaviour at
    the rim point ``w = rim`` (for :class:`RayMap`, ``x -> infinity`` sits at
    ``w = 1`` and ``x^p`` behaves like ``(1 - w)^(-2p)``).
    """
    alpha = mpmath.mpmathify(alpha)
    rim = mpmath.mpmathify(rim)
    out = [mpmath.mpf(1)]
    for k in range(1, n):
        out.append(out[-1] * (k - 1 - alpha) / k / rim)
    return out


def choose_map(singularities, *, rel_tol=0.05) -> ConformalMap | None:
    """A map from the singularities found by an analysis (nearest first).

    ``singularities``: :class:`resum.results.Singularity` objects or numbers
    (locations in the expansion variable). Rules (common practice, no source):
    a complex-conjugate nearest pair on the imaginary axis -> :class:`ArcMap`
    joining the pair through infinity; a pair off the imaginary axis ->
    :class:`PairMap` (cuts from the pair to infinity along ``Re x = Re s``: the
    arc of :class:`ArcMap` would not pass through infinity, which would then land
    inside the disk); a real nearest singularity with a real one of the opposite
    sign no farther than three times away (within ``rel_tol``) -> :class:`ArcMap` with the two real
    cuts; otherwise a :class:`RayMap` from the nearest. Returns ``None`` for an
    empty list. (``evaluate`` gives a point beyond a vertical cut of the pair map the radial
    cuts of :class:`StarMap` instead, so that its value is the continuation along the
    straight line from 0.) A real point and a pair on the same circle (to 1e-6) count as a
    nearest pair.
    """
    locs = []
    for s in singularities:
        z = s.location if hasattr(s, "location") else mpmath.mpmathify(s)
        z = mpmath.mpc(z)
        if z != 0:
            locs.append(z)
    if not locs:
        return None
    locs.sort(key=abs)
    z = locs[0]
    r = abs(z)
    if abs(z.imag) <= rel_tol * r:
        # a real point and a complex pair on the same circle (to 1e-6): which comes first is
        # the rounding of the estimates; take the pair, whose map removes two of the three points
        # (the approximants of a real series cut from the real one along the axis). Measured:
        # (1 - x + x^2)^(-1/2) + (1 + x)^(3/2) from 80 terms at 50 digits, x = 3 + 3i: the ray
        # map from -1 gave the other branch of the pair's root (band 0.036 off by 0.5), the pair
        # map 12.7 digits when the real point is moved out to -1.03.
        tie = [u for u in locs[1:] if abs(u.imag) > rel_tol * abs(u) and abs(u) - r <= mpmath.mpf(10) ** -6 * r]
        if tie:
            z = tie[0]
            r = abs(z)
    if abs(z.imag) > rel_tol * r:
        if abs(z.real) <= rel_tol * r:
            return ArcMap(z, mpmath.conj(z))     # imaginary pair: the arc passes through infinity
        return PairMap(z if z.imag > 0 else mpmath.conj(z))   # cuts to infinity on Re x = Re z
    xr = z.real
    for u in locs[1:]:
        if abs(u.imag) <= rel_tol * abs(u) and u.real * xr < 0 and abs(u) <= 3 * r * (1 + rel_tol):
            return ArcMap(xr, u.real)
    return RayMap(xr)
