"""Small closed-form sources for testing the family machinery.

``binomial``: f(x) = (1 - x/R)^(-a), coefficients binom(a+n-1, n) R^-n, exact
for rational a and R; radius R, a branch point (pole for integer a) at x = R
(closed form, common practice, no source). ``R <= 0`` is refused by the
build, which gives the tests a point that fails for a reason of its own.
``crash = true`` ends the process computing the point (dead-worker tests).

``gate`` (a folder) and ``free`` hold a run at a known place for the interrupt
tests, whatever the load of the machine: each build takes the next numbered
ticket in ``gate`` (``ticket-0``, ``ticket-1``, ... created atomically, so
processes never share one); the first ``free`` builds go on at once, the others
wait until the test creates ``gate/open``. A test waits for the tickets (the
run is then blocked with exactly ``free`` points done) instead of sleeping and
hoping the run is where it expects; see :func:`wait_until_held`.
"""
from __future__ import annotations

import os
import time
from fractions import Fraction

import mpmath

from resum.errors import InputError
from resum.series import Series


def _take_ticket(gate: str) -> int:
    k = 0
    while True:
        try:
            os.close(os.open(os.path.join(gate, f"ticket-{k}"), os.O_CREAT | os.O_EXCL | os.O_WRONLY))
            return k
        except FileExistsError:
            k += 1


def _hold(gate: str, free: int) -> None:
    if _take_ticket(gate) < free:
        return
    while not os.path.exists(os.path.join(gate, "open")):
        time.sleep(0.02)       # waits for the test, not for work: ends when the test opens the gate


def tickets(gate) -> int:
    """Builds that have started (passed or waiting) under ``gate``."""
    return len([n for n in os.listdir(gate) if n.startswith("ticket-")])


def wait_until_held(gate, records, free: int, waiting: int, proc=None, timeout: float = 240):
    """Wait until ``free`` points are recorded in the folder ``records`` and ``waiting`` builds
    wait at the gate (a run then stays put until killed or the gate opens); True when so.
    ``proc`` (a Popen): stop waiting if it ended. The timeout is only a bound for a broken run:
    a loaded machine merely gets there later (below the 300 s of tests/conftest.py's hang guard)."""
    from pathlib import Path
    end = time.monotonic() + timeout
    while time.monotonic() < end:
        done = len(list(Path(records).glob("p*.json"))) if Path(records).is_dir() else 0
        if done >= free and tickets(gate) >= free + waiting:
            return done == free
        if proc is not None and proc.poll() is not None:
            return False
        time.sleep(0.05)
    return False


def _build(ctx, radius=2, exponent=1, orders=30, crash=False, gate="", free=0):
    if crash:       # the worker process dies (as if killed or out of memory)
        os._exit(3)
    if gate:
        _hold(gate, free)
    if radius <= 0:
        raise InputError(f"radius must be positive, got {radius}")
    exact = all(isinstance(v, (int, Fraction)) for v in (radius, exponent))
    if exact:
        a, r = Fraction(exponent), Fraction(radius)
        cs, c = [], Fraction(1)
        for n in range(orders):
            cs.append(c)
            c = c * (a + n) / ((n + 1) * r)
        cs = [int(x) if x.denominator == 1 else x for x in cs]
        digits = None
    else:
        with ctx.working():
            a, r = mpmath.mpf(exponent), mpmath.mpf(radius)
            cs, c = [], mpmath.mpf(1)
            for n in range(orders):
                cs.append(+c)
                c = c * (a + n) / ((n + 1) * r)
        digits = ctx.dps
    return Series(cs, variable="x", digits=digits, name="binomial",
                  provenance={"radius": str(radius), "exponent": str(exponent)})


PARAMS = [
    {"name": "radius", "type": "float", "default": 2, "help": "radius of convergence R"},
    {"name": "exponent", "type": "float", "default": 1, "help": "a in (1 - x/R)^-a"},
    {"name": "orders", "type": "int", "default": 30, "help": "number of terms"},
    {"name": "crash", "type": "bool", "default": False, "help": "end the process (tests)"},
    {"name": "gate", "type": "str", "default": "", "help": "folder of the tickets that hold a run (tests)"},
    {"name": "free", "type": "int", "default": 0, "help": "builds that pass the gate at once (tests)"},
]

binomial = {"name": "binomial", "help": "(1 - x/R)^-a", "params": PARAMS, "build": _build}
