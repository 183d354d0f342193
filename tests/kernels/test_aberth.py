"""The fast root refinement (resum._kernels.aberth.refined_roots) against outside references:
Gauss-Legendre nodes (mpmath's quadrature nodes) as the poles of Padé approximants of a
Stieltjes function, and FLINT/Arb's own root isolation (acb_poly.roots, python-flint).
Where it cannot prove isolation it must return None, never a wrong root."""
import random
from fractions import Fraction

import flint
import mpmath
import pytest

from resum._kernels.aberth import refined_roots
from resum._kernels.pade import pade


def _acb_poly(coeffs, prec):
    old = flint.ctx.prec
    flint.ctx.prec = prec
    try:
        return flint.acb_poly([flint.acb(c) if not isinstance(c, Fraction) else
                               flint.acb(flint.arb(c.numerator) / c.denominator) for c in coeffs])
    finally:
        flint.ctx.prec = old


def test_pade_poles_of_log1p_are_gauss_legendre_nodes():
    # [n-1/n] of log(1+x)/x = int_0^1 dt/(1 + x t) is the n-point Gauss-Legendre rule on [0, 1]:
    # its poles are x_k = -1/t_k, t_k the shifted nodes (Baker and Graves-Morris, Padé
    # Approximants, 2nd ed., ch. 5; from memory). Nodes: mpmath's Gauss-Legendre (12 nodes).
    n = 12
    c = [Fraction((-1) ** k, k + 1) for k in range(2 * n)]
    q = pade(c, n - 1, n, 60).q
    prec = 700
    rts = refined_roots(_acb_poly(q, prec), prec, flint.arb(2) ** -600)
    assert rts is not None and len(rts) == n
    with mpmath.workdps(200):
        nodes = mpmath.calculus.quadrature.GaussLegendre(mpmath.mp).calc_nodes(3, mpmath.mp.prec)
        want = sorted(-2 / (1 + x) for x, _ in nodes)
        assert len(want) == n
        got = sorted(mpmath.mpf(r.real.mid().str(190, radius=False)) for r in rts)
        for g, w in zip(got, want):
            assert abs(g - w) < mpmath.mpf(10) ** -170 * abs(w)
    for r in rts:                               # real roots: balls around the real axis
        assert abs(r.imag.mid()) <= r.imag.rad() + flint.arb(2) ** -590


@pytest.mark.parametrize("seed", [1, 2, 3])
def test_random_polynomials_agree_with_arb_isolation(seed):
    # degree 60, roots scattered in the unit disc and a few outside; reference: acb_poly.roots
    rnd = random.Random(seed)
    prec = 400
    flint.ctx.prec = prec
    try:
        roots = [flint.acb(rnd.uniform(-1, 1), rnd.uniform(-1, 1)) * (3 if k % 7 == 0 else 1)
                 for k in range(60)]
        p = flint.acb_poly.from_roots(roots)
        p = flint.acb_poly([c.mid() for c in p.coeffs()])
        tol = flint.arb(2) ** -300
        fast = refined_roots(p, prec, tol)
        ref = p.roots(tol=tol, maxprec=4 * prec)
    finally:
        flint.ctx.prec = 53
    assert fast is not None and len(fast) == 60
    for f in fast:
        assert f.real.rad() <= tol and f.imag.rad() <= tol
        assert sum(1 for r in ref if f.overlaps(r)) == 1
    for r in ref:
        assert sum(1 for f in fast if f.overlaps(r)) == 1


def test_double_root_is_refused():
    # (x - 1)^2 (x + 2): no disc can be proved to hold one root; the caller falls back
    p = _acb_poly([2, -3, 0, 1], 200)
    assert refined_roots(p, 200, flint.arb(2) ** -150) is None


def test_wilkinson_polynomial_roots_or_none():
    # prod (x - k), k = 1..20: badly conditioned (Wilkinson, Rounding Errors in Algebraic
    # Processes, 1963); at 300 bits the roots are either proved to 2^-200 or refused
    flint.ctx.prec = 300
    try:
        p = flint.acb_poly.from_roots([flint.acb(k) for k in range(1, 21)])
    finally:
        flint.ctx.prec = 53
    rts = refined_roots(p, 300, flint.arb(2) ** -200)
    if rts is not None:
        got = sorted(int(round(float(r.real.mid()))) for r in rts)
        assert got == list(range(1, 21))
        assert all(r.contains(flint.acb(k)) for r, k in zip(sorted(rts, key=lambda r: float(r.real.mid())),
                                                              range(1, 21)))


@pytest.mark.parametrize("shift", [0, 1, -1])
def test_warm_seeds_from_a_neighbouring_approximant_give_the_same_nodes(shift):
    # the Gauss-Legendre poles of [n-1/n] of log(1+x)/x (reference as above: mpmath's nodes),
    # found from the roots of the neighbouring denominator [n-2/n-1 + shift] as seeds: more, as
    # many and fewer seeds than roots all end at the same certified roots
    n = 12
    c = [Fraction((-1) ** k, k + 1) for k in range(2 * n + 2)]
    prec = 700
    tol = flint.arb(2) ** -600
    q = pade(c, n - 1, n, 60).q
    m = n - 1 + shift
    seeds = [complex(float(r.real.mid()), float(r.imag.mid()))
             for r in refined_roots(_acb_poly(pade(c, m - 1, m, 60).q, prec), prec, tol)]
    assert len(seeds) == m
    rts = refined_roots(_acb_poly(q, prec), prec, tol, seeds=seeds)
    assert rts is not None and len(rts) == n
    with mpmath.workdps(200):
        nodes = mpmath.calculus.quadrature.GaussLegendre(mpmath.mp).calc_nodes(3, mpmath.mp.prec)
        want = sorted(-2 / (1 + x) for x, _ in nodes)
        got = sorted(mpmath.mpf(r.real.mid().str(190, radius=False)) for r in rts)
        for g, w in zip(got, want):
            assert abs(g - w) < mpmath.mpf(10) ** -170 * abs(w)


def test_useless_seeds_fall_back_to_the_usual_start():
    # seeds that coincide (Aberth needs distinct starting values) or sit far from every root:
    # the same roots as without seeds (reference: Arb's isolation, as in the random test)
    rnd = random.Random(7)
    prec = 300
    flint.ctx.prec = prec
    try:
        p = flint.acb_poly.from_roots([flint.acb(rnd.uniform(-1, 1), rnd.uniform(-1, 1)) for _ in range(30)])
        p = flint.acb_poly([c.mid() for c in p.coeffs()])
        tol = flint.arb(2) ** -200
        ref = p.roots(tol=tol, maxprec=4 * prec)
        for seeds in ([0.5 + 0.5j] * 30, [1e6 * (k + 1) for k in range(30)]):
            got = refined_roots(p, prec, tol, seeds=seeds)
            assert got is not None and len(got) == 30
            for f in got:
                assert sum(1 for r in ref if f.overlaps(r)) == 1
    finally:
        flint.ctx.prec = 53


def test_wide_inclusion_discs_get_more_bits_before_the_fallback(monkeypatch):
    # ten roots on a line 0.1 apart, asked to 2^-180 at 200 bits: the first inclusion discs are
    # wider than that (the product over close neighbours magnifies |p(z_i)|); without the
    # retries the fast path gives up, with them it proves every root. Reference: Arb's own
    # isolation of the same midpoint polynomial (acb_poly.roots)
    import resum._kernels.aberth as aberth
    prec = 200
    flint.ctx.prec = prec
    try:
        rts = [flint.acb(1 + k * flint.arb("0.1"), flint.arb(k) / 70) for k in range(10)]
        p = flint.acb_poly([c.mid() for c in flint.acb_poly.from_roots(rts).coeffs()])
        tol = flint.arb(2) ** -180
        monkeypatch.setattr(aberth, "INCLUSION_RETRIES", 0)
        assert refined_roots(p, prec, tol) is None
        monkeypatch.setattr(aberth, "INCLUSION_RETRIES", 2)
        got = refined_roots(p, prec, tol)
        assert got is not None and len(got) == 10
        ref = p.roots(tol=tol, maxprec=4 * prec)
        for f in got:
            assert f.real.rad() <= tol and f.imag.rad() <= tol
            assert sum(1 for r in ref if f.overlaps(r)) == 1
    finally:
        flint.ctx.prec = 53
