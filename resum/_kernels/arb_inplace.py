"""In-place Arb vector arithmetic through FLINT's C library (ctypes).

python-flint's polynomial operations each allocate and fill a new
polynomial: in a recursion that does ``O(N)`` steps of ``O(N)`` work on
polynomials of a few hundred coefficients, the copies, allocations and
Python calls cost about twice the arithmetic (``resum.pade`` at [100/100]:
about 45 us per step of the continued-fraction recursion, of which the
products take 20). This module calls the same Arb functions (``arb_mul``,
``arb_sub``, ``arb_div`` through ``_arb_vec_scalar_mul``, ``_arb_vec_sub``,
...) on vectors it owns, in place, so a step costs its arithmetic plus a few
foreign calls. The numbers are the same: each coefficient goes through the
same Arb operation at the same precision as in python-flint's polynomial
arithmetic, so results agree bit for bit (tests/kernels/test_arb_inplace.py).

It loads the FLINT library python-flint itself has loaded (found in
``/proc/self/maps``, so the same allocator and the same copy of the code),
finds where python-flint keeps an ``arb``'s C struct inside the Python object
and checks the vector layout on known values. Anything unexpected (another
platform, another python-flint layout, no ``/proc``) leaves
:func:`available` False and callers use python-flint's own operations.

Real balls only (``arb``); complex series use python-flint's ``acb_poly``.
"""
from __future__ import annotations

import ctypes
import os
import types

import flint

__all__ = ["available", "Vec", "lib", "addr", "to_arb"]

#: sizeof(arb_struct) on 64-bit platforms: arf (exponent, size, two limbs) + mag (exponent, limb)
ARB_SIZE = 48

_VP = ctypes.c_void_p
_SL = ctypes.c_long

_SIGS = {
    "_arb_vec_init": ([_SL], _VP),
    "_arb_vec_clear": ([_VP, _SL], None),
    "_arb_vec_scalar_mul": ([_VP, _VP, _SL, _VP, _SL], None),
    "_arb_vec_scalar_mul_2exp_si": ([_VP, _VP, _SL, _SL], None),
    "_arb_vec_sub": ([_VP, _VP, _VP, _SL, _SL], None),
    "_arb_vec_add": ([_VP, _VP, _VP, _SL, _SL], None),
    "arb_set": ([_VP, _VP], None),
    "arb_set_si": ([_VP, _SL], None),
    "arb_set_round": ([_VP, _VP, _SL], None),
    "arb_neg": ([_VP, _VP], None),
    "arb_div": ([_VP, _VP, _VP, _SL], None),
    "arb_get_mid_arb": ([_VP, _VP], None),
    "arb_contains_zero": ([_VP], ctypes.c_int),
    "arf_abs_bound_lt_2exp_si": ([_VP], _SL),
    "arf_get_d": ([_VP, ctypes.c_int], ctypes.c_double),
}

lib = None          # the declared functions of the loaded library (None if unavailable)
_OFFSET = None      # byte offset of the arb_struct inside a python-flint arb object


def _flint_path():
    """The one FLINT library mapped into this process (None if none, or if two copies are:
    then which one python-flint uses is not known)."""
    found = set()
    try:
        with open("/proc/self/maps") as fh:
            for line in fh:
                path = line.split()[-1] if line.strip() else ""
                name = os.path.basename(path)
                if name.startswith("libflint") and ".so" in name and os.path.exists(path):
                    found.add(path)
    except OSError:
        return None
    return found.pop() if len(found) == 1 else None


def _load():
    global lib, _OFFSET
    if os.environ.get("RESUM_NO_CTYPES"):
        return
    path = _flint_path()
    if path is None or ctypes.sizeof(ctypes.c_void_p) != 8:
        return
    try:
        h = ctypes.CDLL(path)
        for name, (args, res) in _SIGS.items():
            f = getattr(h, name)
            f.argtypes = args
            f.restype = res
    except (OSError, AttributeError):
        return
    # where the arb_struct sits in python-flint's object: after the object header (and a
    # vtable pointer, if the class has one); confirmed on three values, read and written.
    # The probes have small exponents: read at a wrong offset, a large exponent would be
    # taken for a limb count and the next word for a pointer
    probes = (3.0, -0.75, 5.0)
    for off in (16, 24, 32):
        try:
            if all(h.arf_get_d(id(x) + off, 0) == v for v, x in ((v, flint.arb(v)) for v in probes)):
                y = flint.arb(0)
                x = flint.arb(-0.75)
                h.arb_set(id(y) + off, id(x) + off)
                if y == x:
                    _OFFSET = off
                    break
        except Exception:       # pragma: no cover - a foreign layout
            return
    if _OFFSET is None:
        return
    # the vector layout: element 1 sits ARB_SIZE bytes after element 0
    v = h._arb_vec_init(3)
    try:
        h.arb_set_si(v + ARB_SIZE, 7)
        h.arb_set_si(v + 2 * ARB_SIZE, -5)
        h._arb_vec_scalar_mul_2exp_si(v, v, 3, 1)
        ok = (h.arf_get_d(v + ARB_SIZE, 0) == 14.0 and h.arf_get_d(v + 2 * ARB_SIZE, 0) == -10.0
              and h.arf_get_d(v, 0) == 0.0)
    finally:
        h._arb_vec_clear(v, 3)
    if ok:
        # only the declared functions: an undeclared one would be called with 32-bit int
        # arguments and crash the interpreter, so it must fail as a missing attribute instead
        lib = types.SimpleNamespace(**{name: getattr(h, name) for name in _SIGS})
    else:                       # pragma: no cover
        _OFFSET = None


def available() -> bool:
    """Whether the in-place kernels can run here."""
    return lib is not None


def addr(x) -> int:
    """Address of the arb_struct inside a python-flint ``arb``. Keep a reference to ``x``
    while the address is in use: ``addr(make_ball())`` points into freed memory."""
    return id(x) + _OFFSET


def to_arb(p: int):
    """A new python-flint ``arb`` holding a copy of the ball at address ``p``."""
    y = flint.arb()
    lib.arb_set(id(y) + _OFFSET, p)
    return y


class Vec:
    """A vector of ``n`` balls owned by this object (freed with it). ``v[i]`` is
    the address of element ``i``."""

    __slots__ = ("p", "n")

    def __init__(self, n: int):
        self.n = max(int(n), 1)
        self.p = lib._arb_vec_init(self.n)

    def __getitem__(self, i: int) -> int:
        return self.p + i * ARB_SIZE

    def __del__(self):
        if self.p and lib is not None:
            lib._arb_vec_clear(self.p, self.n)
            self.p = 0

    @classmethod
    def of(cls, balls, neg=False):
        v = cls(len(balls))
        f = lib.arb_neg if neg else lib.arb_set
        for i, x in enumerate(balls):
            f(v.p + i * ARB_SIZE, id(x) + _OFFSET)
        return v

    def to_list(self, start: int, n: int):
        return [to_arb(self.p + (start + i) * ARB_SIZE) for i in range(n)]


_load()
