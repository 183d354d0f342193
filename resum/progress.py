"""Progress of long computations inside the library, reported to whoever listens.

A long routine calls :func:`report` with the fraction of its work done; nothing
happens unless a listener was installed with :func:`listening` (the command
line installs a progress bar on stderr). The listener lives in a context
variable, so threads and nested calls do not see each other's.

>>> seen = []
>>> with listening(seen.append):
...     report(0.5)
>>> seen
[0.5]
>>> report(0.7)          # no listener: nothing happens
"""
from __future__ import annotations

import contextlib
import contextvars
from typing import Callable, Optional

__all__ = ["report", "listening"]

_LISTENER: contextvars.ContextVar[Optional[Callable[[float], None]]] = contextvars.ContextVar(
    "resum_progress", default=None)


def report(fraction: float) -> None:
    """Tell the listener (if any) that ``fraction`` (0..1) of the work is done."""
    fn = _LISTENER.get()
    if fn is not None:
        fn(min(1.0, max(0.0, float(fraction))))


@contextlib.contextmanager
def listening(fn: Callable[[float], None]):
    """Install ``fn`` as the listener for the duration of the block."""
    token = _LISTENER.set(fn)
    try:
        yield
    finally:
        _LISTENER.reset(token)
