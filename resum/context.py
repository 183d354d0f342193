"""Working precision.

This module is the only place in resum that touches mpmath's global state.
Every numeric routine takes a :class:`Context` (or ``dps``) explicitly; the
routine enters :func:`Context.working` (or :func:`workdps`) for the span of
its computation, which sets mpmath's precision and restores it on exit, so
nothing leaks between calls.

The default is :data:`DEFAULT` (30 decimal digits for reported numbers, with
guard digits on top for the computation).

>>> ctx = Context(dps=40)
>>> with ctx.working():
...     x = mpf(1) / 3
>>> nstr(x, 20)
'0.33333333333333333333'
"""
from __future__ import annotations

import contextlib
from dataclasses import dataclass, replace

import mpmath
from mpmath import mpf, mpc, nstr  # re-exported for convenience  # noqa: F401

__all__ = ["Context", "DEFAULT", "workdps", "workprec", "bits_for", "checked_context", "mpf", "mpc", "nstr"]

DEFAULT_DPS = 30
DEFAULT_GUARD = 15


@dataclass(frozen=True)
class Context:
    """An explicit working precision.

    Parameters
    ----------
    dps : int
        Decimal digits the caller wants to be able to report.
    guard : int
        Extra decimal digits carried during the computation.
    """

    dps: int = DEFAULT_DPS
    guard: int = DEFAULT_GUARD

    def __post_init__(self):
        from .errors import InputError      # a ValueError, as before
        if isinstance(self.dps, bool) or not isinstance(self.dps, int) or self.dps < 5:
            raise InputError(f"must be an integer >= 5, got {self.dps!r}", where="dps")
        if isinstance(self.guard, bool) or not isinstance(self.guard, int) or self.guard < 0:
            raise InputError(f"must be a non-negative integer, got {self.guard!r}", where="guard")

    @property
    def work_dps(self) -> int:
        """Digits used inside computations (``dps + guard``)."""
        return self.dps + self.guard

    @property
    def prec(self) -> int:
        """Working precision in bits."""
        return bits_for(self.work_dps)

    def with_dps(self, dps: int) -> "Context":
        return replace(self, dps=int(dps))

    def higher(self, factor: float = 1.5, extra: int = 10) -> "Context":
        """A context with more digits, used for verification reruns."""
        return replace(self, dps=int(self.dps * factor) + extra)

    def working(self, extra: int = 0):
        """Context manager: mpmath works at ``dps + guard + extra`` digits inside."""
        return workdps(self.work_dps + extra)


DEFAULT = Context()


def checked_context(ctx) -> Context:
    """``ctx``, or :data:`DEFAULT` for None; anything else (a bare digit count, say) is an
    :class:`~resum.errors.InputError` naming the field, not an AttributeError deep inside."""
    if ctx is None:
        return DEFAULT
    if not isinstance(ctx, Context):
        from .errors import InputError
        raise InputError(f"expected a resum.Context such as Context(dps=30), got {ctx!r}", where="ctx")
    return ctx


def bits_for(dps: int) -> int:
    """Bits needed for ``dps`` decimal digits (plus a few)."""
    return int(dps * 3.3219280948873626) + 8


@contextlib.contextmanager
def workdps(dps: int):
    """Set mpmath's working precision to ``dps`` digits for a block, then restore it."""
    old = mpmath.mp.prec
    mpmath.mp.dps = int(dps)
    try:
        yield
    finally:
        mpmath.mp.prec = old


@contextlib.contextmanager
def workprec(prec: int):
    """Set mpmath's working precision to ``prec`` bits for a block, then restore it."""
    old = mpmath.mp.prec
    mpmath.mp.prec = int(prec)
    try:
        yield
    finally:
        mpmath.mp.prec = old
