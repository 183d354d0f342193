"""Shared preparation and result helpers for the singularity estimators.

:func:`prepare` turns a :class:`~resum.series.Series` into the coefficient
list the estimators work on: a series in ``x^k`` (only every k-th term
non-zero) is rewritten as ``x^r F(u)`` with ``u = x^k``; the estimators then
analyse ``F`` and :func:`lift` maps singularities in ``u`` back to the ``k``
points in ``x``.

>>> from resum.series import Series
>>> p = prepare(Series([1, 0] * 10), None)   # 1/(1 - x^2)
>>> p.stride, p.offset, len(p.c)
(2, 0, 10)
"""
from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Optional

import mpmath

from ..context import DEFAULT, Context
from ..errors import InputError
from ..results import Estimate, MethodResult, Provenance, Singularity, Status, band_digits, sig_text
from ..uncertainty.ensemble import modulus_band

__all__ = ["Prepared", "prepare", "lift", "classify_kind", "failed", "MIN_TERMS"]

#: fewest non-zero terms any estimator accepts
MIN_TERMS = 8


@dataclass(frozen=True)
class Prepared:
    """Coefficients ready for analysis.

    ``c`` are the coefficients of ``F(u) = sum c_m u^m`` with
    ``f(x) = x^offset F(x^stride)``, as mpmath numbers at ``dps`` digits.
    ``digits`` is the number of decimal digits the coefficients are trusted to
    (the smaller of the input's digits and the working precision).
    """

    c: list
    stride: int
    offset: int
    dps: int
    digits: int
    is_complex: bool
    n_terms: int
    input_hash: str
    ctx: Context

    @property
    def eps(self):
        """Relative noise level of the coefficients."""
        return mpmath.mpf(10) ** (-self.digits)


def _detect_stride(nz_idx):
    if len(nz_idx) < 2:
        return 1, (nz_idx[0] if nz_idx else 0)
    r = nz_idx[0]
    g = 0
    for i in nz_idx[1:]:
        g = math.gcd(g, i - r)
    return max(g, 1), r


def refused_polynomial_degree(series, ctx: Optional[Context] = None, min_terms: int = MIN_TERMS) -> Optional[int]:
    """The degree when the analysis refuses ``series`` as a polynomial (fewer than
    ``min_terms`` non-zero coefficients in the variable of its stride, followed by at least
    ``min_terms`` zero ones: the zeros at the top are data, not missing terms); else None.
    (Evaluation sums a polynomial by its own rule,
    :func:`resum.estimators.resum_truncation.polynomial_degree`.)"""
    dense = series.dense(ctx or DEFAULT)
    nz = [i for i, c in enumerate(dense) if c != 0]
    if not nz or len(dense) - 1 - nz[-1] < min_terms:
        return None
    k, r = _detect_stride(nz)
    if k == 1:
        r = 0
    n_nonzero = sum(1 for m in range((len(dense) - 1 - r) // k + 1) if dense[r + m * k] != 0)
    return series.start + nz[-1] if n_nonzero < min_terms else None


def prepare(series, ctx: Optional[Context], min_terms: int = MIN_TERMS) -> Prepared:
    """Validate ``series`` and build the :class:`Prepared` coefficient list.

    Raises :class:`~resum.errors.InputError` for a series with negative powers,
    a zero series or fewer than ``min_terms`` usable terms.
    """
    ctx = ctx or DEFAULT
    if series.start < 0:
        raise InputError(f"series starts at {series.variable}^{series.start}; singularity analysis "
                         "needs a power series (multiply by a power of the variable first)",
                         where="series.start")
    if series.is_zero():
        raise InputError("all coefficients are zero; nothing to analyse", where="series.coefficients")
    dense = series.dense(ctx)
    nz = [i for i, c in enumerate(dense) if c != 0]
    k, r = _detect_stride(nz)
    if k == 1:
        r = 0         # keep leading zeros: derivatives and log-derivatives need the true f
    # the last non-zero index fixes how many terms of F we trust
    last_full = (len(dense) - 1 - r) // k
    with ctx.working():
        c = [dense[r + m * k] for m in range(last_full + 1)]
        # drop trailing terms beyond the last one the series actually determines
        if c:
            cplx = any(isinstance(v, mpmath.mpc) and v.imag != 0 for v in c)
            c = [mpmath.mpc(v) if cplx else mpmath.mpf(v.real if isinstance(v, mpmath.mpc) else v)
                 for v in c]
        else:
            cplx = False
    n_nonzero = sum(1 for v in c if v != 0)
    if refused_polynomial_degree(series, ctx, min_terms) is not None:
        # a polynomial: the many zero coefficients at the top are data, not missing terms
        raise InputError(f"the series is a polynomial of degree {series.start + nz[-1]} in {series.variable} "
                         f"(the {len(dense) - 1 - nz[-1]} coefficients above it are zero): an entire function "
                         "with no singularity to analyse ('resum evaluate' sums it exactly)",
                         where="series.coefficients")
    if n_nonzero < min_terms:
        raise InputError(f"only {n_nonzero} usable terms (in {series.variable}"
                         f"{'^' + str(k) if k > 1 else ''}); singularity analysis needs at least "
                         f"{min_terms}; give more coefficients", where="series.coefficients")
    # noise floors are set at the digits the caller asked for (the guard digits only protect them)
    digits = ctx.dps if series.digits is None else min(series.digits, ctx.dps)
    return Prepared(c=c, stride=k, offset=r, dps=ctx.work_dps, digits=int(digits), is_complex=cplx,
                    n_terms=series.n_terms, input_hash=series.input_hash(), ctx=ctx)


def _root_band(u_re: Estimate, u_im: Estimate, k: int, j: int):
    """re/im Estimates of the j-th k-th root of u (branch by angle)."""
    def root(z):
        z = mpmath.mpc(z)
        return mpmath.root(abs(z), k) * mpmath.expjpi((mpmath.arg(z) + 2 * mpmath.pi * j) / (k * mpmath.pi))
    v = root(mpmath.mpc(u_re.value, u_im.value))
    ref = mpmath.arg(mpmath.mpc(u_re.value, u_im.value))
    pts = []
    for x in (u_re.lower, u_re.value, u_re.upper):
        for y in (u_im.lower, u_im.value, u_im.upper):
            z = mpmath.mpc(x, y)
            if z == 0:
                pts.append(mpmath.mpc(0))
                continue
            # keep the branch continuous with the centre across the negative axis
            a = mpmath.arg(z)
            if a - ref > mpmath.pi:
                a -= 2 * mpmath.pi
            elif ref - a > mpmath.pi:
                a += 2 * mpmath.pi
            pts.append(mpmath.root(abs(z), k) * mpmath.expj((a + 2 * mpmath.pi * j) / k))
    re = Estimate(v.real, min(p.real for p in pts), max(p.real for p in pts))
    im = Estimate(v.imag, min(p.imag for p in pts), max(p.imag for p in pts))
    return re, im


def lift(sings, k: int):
    """Map singularities of ``F(u)`` to those of ``f(x) = x^r F(x^k)``."""
    if k == 1:
        return tuple(sings)
    out = []
    for s in sings:
        for j in range(k):
            re, im = _root_band(s.re, s.im, k, j)
            note = (s.note + "; " if s.note else "") + f"from u = x^{k}"
            out.append(Singularity(re, im, s.kind, s.exponent, s.method, note))
    out.sort(key=lambda s: abs(s.location))
    return tuple(out)


def lift_radius(radius: Optional[Estimate], k: int) -> Optional[Estimate]:
    if radius is None or k == 1:
        return radius
    f = lambda v: mpmath.root(v, k) if v > 0 else mpmath.mpf(0)  # noqa: E731
    return Estimate(f(radius.value), f(radius.lower), f(radius.upper))


def complex_exponent_note(theta_complex, half) -> Optional[str]:
    """A note when an exponent estimate has an imaginary part its real band cannot hold, else
    None. Complex coefficients can have a complex exponent: 2F1(1/2 + i, 1/3; 3/2; x) has
    theta = c - a - b = 2/3 - i at x = 1 (Gauss' connection formula, from memory); its real part
    alone, banded to 28 digits, was reported as the exponent."""
    ti = mpmath.im(theta_complex) if isinstance(theta_complex, mpmath.mpc) else 0
    if abs(ti) <= max(10 * half, mpmath.mpf(10) ** -8):
        return None
    # each part to the digits the real part's half-width supports (at most 8)
    tr = mpmath.re(theta_complex)
    return (f"complex exponent about {sig_text(tr, band_digits(tr, half, 8))} "
            f"{'-' if ti < 0 else '+'} {sig_text(abs(ti), band_digits(ti, half, 8))} i: no real exponent is claimed")


def classify_kind(theta: Optional[Estimate]) -> str:
    """Kind of singularity from its exponent band.

    A band (no wider than 0.2) containing a negative integer: ``pole``; zero or
    a positive integer: ``log`` (an analytic power cannot be singular, so an
    integer exponent >= 0 means a logarithm multiplies it); otherwise
    ``branch``; ``unknown`` when the band is too wide to decide.
    """
    if theta is None:
        return "unknown"
    n = int(mpmath.nint(theta.value))
    tol = max(theta.error, mpmath.mpf(10) ** -6)
    if theta.width > 0.4:
        return "unknown"
    if abs(theta.value - n) <= tol:
        return "pole" if n < 0 else "log"
    return "branch"


def radius_from(sings) -> Optional[Estimate]:
    """Radius band from the nearest singularity."""
    if not sings:
        return None
    s = min(sings, key=lambda s: abs(s.location))
    return modulus_band(s.re, s.im)


def provenance(method: str, prep: Prepared, **options) -> Provenance:
    return Provenance(method=method, options=options, n_terms=prep.n_terms, dps=prep.dps,
                      input_hash=prep.input_hash)


def failed(method: str, status: Status, message: str, prep: Optional[Prepared] = None,
           diagnostics: Optional[dict] = None, **options) -> MethodResult:
    """A failed :class:`MethodResult` with its reason."""
    return MethodResult(method=method, success=False, status=status, message=message,
                        diagnostics=dict(diagnostics or {}),
                        provenance=None if prep is None else provenance(method, prep, **options))


def finish(method: str, prep: Prepared, sings_u, growth: str = "finite radius", message: str = "",
           diagnostics: Optional[dict] = None, status: Status = Status.CONVERGED,
           borel=None, borel_b=None, radius_u: Optional[Estimate] = None, **options) -> MethodResult:
    """Wrap estimates found in ``u`` into a result in the series' variable."""
    sings = lift(sorted(sings_u, key=lambda s: abs(s.location)), prep.stride)
    if radius_u is None:
        radius_u = radius_from(sings_u)
    radius = lift_radius(radius_u, prep.stride)
    diag = dict(diagnostics or {})
    if prep.stride > 1:
        diag["stride"] = prep.stride
        diag["how"] = (diag.get("how", "") + f" The series has only every {prep.stride}-th term "
                       f"non-zero; the analysis ran in u = x^{prep.stride} and the singular points "
                       f"were mapped back to the {prep.stride} roots.").strip()
    return MethodResult(method=method, success=status == Status.CONVERGED, status=status,
                        message=message, radius=radius, singularities=sings, growth=growth,
                        borel_singularity=borel, borel_exponent=borel_b, diagnostics=diag,
                        provenance=provenance(method, prep, **options))


def first_term_scale(c, x):
    """|c_k x^k| for the first non-zero coefficient: the natural size of the function at x
    (the scale of an absolute statement where the value itself vanishes)."""
    for k, v in enumerate(c):
        if v != 0:
            return abs(v) * abs(mpmath.mpmathify(x)) ** k
    return mpmath.mpf(0)
