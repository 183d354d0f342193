"""The in-place Arb kernels (ctypes into FLINT) against python-flint's own
polynomial arithmetic, and the Padé results they feed against mpmath.pade.

References
- python-flint's arb_poly arithmetic (the general-purpose path the in-place
  kernels replace): the continued-fraction coefficients and the convergents'
  denominators must agree bit for bit, midpoints and radii;
- mpmath.pade (general-purpose reference library, dense LU solve at a higher
  working precision) for the approximants built on them;
- a corresponding continued fraction of an even series has u_1(0) = 0 at the
  first step (common practice, no source): the kernel must hand such a case to
  the python-flint loop, which reports the singular block.
"""
import random

import flint
import mpmath
import pytest

from resum._kernels import arb_inplace
from resum._kernels import flint_bridge as fb
from resum._kernels import pade as P

pytestmark = pytest.mark.skipif(not arb_inplace.available(),
                                reason="FLINT's C library not reachable through ctypes here")


def _same(a, b):
    return a.mid() == b.mid() and a.rad() == b.rad()


def _cf_and_denominators(g, prec, final, ar, inplace, monkeypatch):
    with monkeypatch.context() as m:
        if not inplace:
            m.setattr(arb_inplace, "lib", None)
        with fb.flint_prec(prec):
            gb = [fb.to_arb(x) for x in g]
            try:
                d, term = P._cf_coefficients(gb, len(g) - 1, mpmath.mpf(10) ** -60, False, final, ar)
            except P._Block as e:
                return ("block", e.k, e.precision)
            end = flint.ctx.prec
        with fb.flint_prec(final or prec):
            dens = P._denominators(d, False, {len(d) - 1, len(d)}, ar)
    return d, term, end, dens


def _series():
    rng = random.Random(7)
    with mpmath.workdps(400):
        yield "log(1+x)/x", [mpmath.mpf((-1) ** k) / (k + 1) for k in range(121)]
        yield "random", [mpmath.mpf(rng.gauss(0, 1)) for _ in range(81)]
        yield "exp", [1 / mpmath.factorial(k) for k in range(61)]


@pytest.mark.parametrize("ar", ["ball", "mid"])
@pytest.mark.parametrize("name,g", list(_series()))
def test_bit_for_bit_as_python_flint(name, g, ar, monkeypatch):
    arith = P._BALL if ar == "ball" else P._MID
    for prec, final in ((1200, 500), (900, None)):
        a = _cf_and_denominators(g, prec, final, arith, True, monkeypatch)
        b = _cf_and_denominators(g, prec, final, arith, False, monkeypatch)
        if b[0] == "block":
            assert a == b, (name, prec)
            continue
        assert a[1:3] == b[1:3]
        assert len(a[0]) == len(b[0]) == len(g) - 1
        assert all(_same(x, y) for x, y in zip(a[0], b[0])), (name, ar, prec)
        assert a[3].keys() == b[3].keys()
        for k in a[3]:
            assert a[3][k].length() == b[3][k].length()
            assert all(_same(x, y) for x, y in zip(a[3][k].coeffs(), b[3][k].coeffs())), (name, k)


def test_even_series_goes_to_the_loop_and_reports_the_block(monkeypatch):
    # cos x: u_1 = (1 - cos x)/x starts with 0, a singular block at step 1
    with mpmath.workdps(60):
        g = [mpmath.mpf(0) if k % 2 else (-1) ** (k // 2) / mpmath.factorial(k) for k in range(31)]
    a = _cf_and_denominators(g, 300, None, P._BALL, True, monkeypatch)
    b = _cf_and_denominators(g, 300, None, P._BALL, False, monkeypatch)
    assert a == b and a[0] == "block" and a[1] == 1


@pytest.mark.parametrize("check", ["ball", "residual"])
def test_pade_same_with_and_without_and_matches_mpmath(check, monkeypatch):
    N, dps = 40, 60
    with mpmath.workdps(300):
        c = [mpmath.mpf((-1) ** k) / (k + 1) for k in range(2 * N + 1)]
    fast = P.pade(c, N, N, dps, check=check)
    with monkeypatch.context() as m:
        m.setattr(arb_inplace, "lib", None)
        slow = P.pade(c, N, N, dps, check=check)
    assert fast.p == slow.p and fast.q == slow.q and fast.digits == slow.digits
    with mpmath.workdps(dps + 3 * N + 60):       # mpmath.pade loses about 1.5 digits per unit of M
        _, qref = mpmath.pade(c, N, N)
        err = max(abs(a - b) for a, b in zip(fast.q, qref)) / max(abs(b) for b in qref)
    assert fast.digits >= dps
    assert err < mpmath.mpf(10) ** -dps


def test_only_declared_functions_are_reachable():
    # an undeclared C function would be called with 32-bit int arguments (a crash): the handle
    # must not offer one
    assert hasattr(arb_inplace.lib, "_arb_vec_scalar_mul")
    with pytest.raises(AttributeError):
        arb_inplace.lib.arb_rel_accuracy_bits


def test_environment_variable_turns_it_off():
    import subprocess
    import sys
    code = "from resum._kernels import arb_inplace as a; print(a.available())"
    env = dict(__import__("os").environ, RESUM_NO_CTYPES="1")
    out = subprocess.run([sys.executable, "-c", code], env=env, capture_output=True, text=True,
                         check=True).stdout.strip()
    assert out == "False"
