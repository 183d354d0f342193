"""Padé-table, Dlog-Padé and differential-approximant estimators against closed forms,
published series and the published BES kernel family."""
import math
from fractions import Fraction

import mpmath
import pytest

from resum.context import Context, workdps
from resum.estimators.diffapprox import estimate_diffapprox
from resum.estimators.dlog import estimate_dlog
from resum.estimators.pade_sing import estimate_pade
from resum.series import Series

from .refs import binomial_power, complex_pair, confluent, lattice, log1p_series, two_singularities

CTX = Context(dps=50)


def _mp(x):
    return mpmath.mpf(x.numerator) / x.denominator if isinstance(x, Fraction) else mpmath.mpmathify(x)


def _check(est, truth, width):
    with workdps(120):
        truth = _mp(truth)
        assert est.contains(truth), (str(est), truth)
        assert est.width < width, (str(est), width)


def _near(sings, z):
    return min(sings, key=lambda s: abs(s.location - z))


def test_pade_poles_of_meromorphic_function():
    # 1/(1 - x/2) + 3/(1 + x) : simple poles at 2 and -1 (common practice, no source)
    cs = [Fraction(1, 2 ** n) + 3 * (-1) ** n for n in range(30)]
    r = estimate_pade(Series(cs), CTX)
    assert r.success
    _check(r.radius, 1, 1e-20)
    s2 = _near(r.singularities, 2)
    _check(s2.re, 2, 1e-20)
    assert s2.kind == "pole"


def test_pade_branch_point_is_marked_branch_with_wide_band():
    # (1 - x)^(-1/3): plain Padé only resolves the branch point roughly (common practice)
    r = estimate_pade(Series(binomial_power(Fraction(-1, 3), 40)), CTX)
    s = r.singularities[0]
    assert s.kind == "branch"
    _check(s.re, 1, 0.5)


def test_pade_removes_froissart_doublets_from_noisy_data():
    # geometric series 1/(1-x) with coefficients perturbed at 1e-12: Froissart doublets
    # appear near the unit circle (Gilewicz and Pindor, J. Comput. Appl. Math. 87 (1997) 199)
    import random
    rnd = random.Random(1)
    with workdps(30):
        cs = [mpmath.mpf(1) + mpmath.mpf(10) ** -12 * (2 * rnd.random() - 1) for _ in range(30)]
    r = estimate_pade(Series(cs, digits=12), Context(dps=12))
    assert r.success
    _check(r.radius, 1, 1e-6)
    assert r.singularities[0].kind == "pole"
    assert r.diagnostics["spurious_removed"] > 0


@pytest.mark.parametrize("theta", [Fraction(-1, 3), Fraction(-7, 4), Fraction(2, 5)])
def test_dlog_algebraic(theta):
    # (1 - 2x)^theta: x_c = 1/2, exponent theta (binomial series, common practice, no source)
    r = estimate_dlog(Series(binomial_power(theta, 40, scale=2)), CTX)
    s = r.singularities[0]
    _check(s.re, Fraction(1, 2), 1e-25)
    _check(s.exponent, theta, 1e-20)
    assert s.kind == "branch"


def test_dlog_log_singularity():
    # log(1+x): kind log, exponent 0 (common practice, no source)
    r = estimate_dlog(Series(log1p_series(40)), CTX)
    s = r.singularities[0]
    assert s.kind == "log"
    _check(s.re, -1, 1e-20)
    _check(s.exponent, 0, 1e-10)


def test_dlog_complex_pair():
    # 1/(1 - x + x^2)^(2/5): x_c = exp(+-i pi/3), theta = -2/5 (common practice, no source)
    r = estimate_dlog(Series(complex_pair(50, 70), digits=60), CTX)
    with workdps(60):
        z = mpmath.expjpi(mpmath.mpf(1) / 3)
        s = _near(r.singularities, z)
        _check(s.re, z.real, 1e-20)
        _check(s.im, z.imag, 1e-20)
        _check(s.exponent, Fraction(-2, 5), 1e-15)


@pytest.mark.parametrize("zeros", [0, 3])
def test_diffapprox_two_singularities(zeros):
    # (1-x)^(-1/2) + (1+x/2)^(-3/2): points 1 and -2, exponents -1/2 and -3/2; times x^3
    # (zeros = 3) the same, since a monomial factor moves no singular point and no exponent
    # (common practice, no source)
    r = estimate_diffapprox(Series([0] * zeros + two_singularities(60)), Context(dps=80), order=1)
    assert r.success, r.message
    s1, s2 = _near(r.singularities, 1), _near(r.singularities, -2)
    _check(s1.re, 1, 1e-8)
    _check(s1.exponent, Fraction(-1, 2), 1e-6)
    _check(s2.re, -2, 1e-2)
    _check(s2.exponent, Fraction(-3, 2), 1e-1)


def test_diffapprox_confluent_correction():
    # (1-x)^(-1/3) (1 + (1-x)^(1/2)): leading exponent -1/3 with a confluent correction
    r = estimate_diffapprox(Series(confluent(60)), Context(dps=80), order=1)
    assert r.success, r.message
    s = _near(r.singularities, 1)
    _check(s.re, 1, 1e-4)
    _check(s.exponent, Fraction(-1, 3), 0.05)


def test_diffapprox_degenerate_table_finds_the_exact_equation():
    # the same function, (1-x)^(-1/3) + (1-x)^(1/6), satisfies a second-order equation with
    # quadratic coefficients exactly: every large second-order approximant is singular. The
    # method finds that equation (it reproduces all 60 coefficients); x = 1 is a double zero
    # of Q_2, a regular singular point whose indicial exponents are -1/3 and 1/6, and the
    # smaller is reported (closed form; Frobenius' method, common practice, no source)
    r = estimate_diffapprox(Series(confluent(60)), Context(dps=80), order=2)
    assert r.success, r.message
    assert r.diagnostics.get("exact_equation")
    s = _near(r.singularities, 1)
    # (a double zero is located to about half the digits by each fit; 80 asked)
    _check(s.re, 1, 1e-25)
    _check(s.exponent, Fraction(-1, 3), 1e-25)
    assert len(r.singularities) == 1


def test_diffapprox_exact_equation_two_cuts():
    # (1-x)^(-1/2) (1+x/3)^(1/3) obeys Q_1 f' + Q_0 f = 0 with Q_1 = (1-x)(1+x/3): every
    # large first-order approximant is singular. The exact equation gives both branch points
    # (1 and -3, three times farther) with their exponents -1/2 and 1/3 (closed form, common
    # practice, no source); the opposite-side point must reach the analysis, which hands
    # both to the two-cut conformal map
    c = _product_series(Fraction(-1, 2), -1, Fraction(1, 3), 3, 60)
    r = estimate_diffapprox(Series(c), Context(dps=45), order=1)
    assert r.success and r.diagnostics.get("exact_equation"), r.message
    s1, s2 = _near(r.singularities, 1), _near(r.singularities, -3)
    _check(s1.re, 1, 1e-30)
    _check(s1.exponent, Fraction(-1, 2), 1e-30)
    _check(s2.re, -3, 1e-30)
    _check(s2.exponent, Fraction(1, 3), 1e-30)
    from resum.analysis import analyze
    a = analyze(Series(c), Context(dps=30), verify=False)
    locs = sorted(float(mpmath.re(s.location)) for s in a.singularities)
    assert len(locs) == 2 and abs(locs[0] + 3) < 1e-20 and abs(locs[1] - 1) < 1e-20, locs


def _product_series(p1, s1, p2, s2, n):
    """Coefficients of (1 + x/s1)^p1 (1 + x/s2)^p2, exact."""
    def binom(p, sc):
        c = [Fraction(1)]
        for k in range(1, n):
            c.append(c[-1] * (p - (k - 1)) / k / Fraction(sc))
        return c
    a, b = binom(p1, s1), binom(p2, s2)
    return [sum(a[i] * b[k - i] for i in range(k + 1)) for k in range(n)]


def test_diffapprox_saw_square_lattice():
    # I. Jensen, J. Phys. A 49 (2016) 424003 (arXiv:1607.01109): 80-term SAW series;
    # mu = 2.63815853032790(3) (Jacobsen, Scullard, Guttmann, J. Phys. A 49 (2016) 494004);
    # gamma = 43/32 (Nienhuis 1982); antiferromagnetic point -x_c with exponent 1/2
    # (Conway and Guttmann, PRL 77 (1996) 5284)
    cs, _ = lattice("saw_square_lattice")
    r = estimate_diffapprox(Series(cs), Context(dps=60), order=2)
    xc = 1 / mpmath.mpf("2.63815853032790")
    s = _near(r.singularities, xc)
    _check(s.re, xc, 1e-7)
    _check(s.exponent, Fraction(-43, 32), 2e-3)
    a = _near(r.singularities, -xc)
    _check(a.re, -xc, 1e-6)
    _check(a.exponent, Fraction(1, 2), 2e-3)


def test_diffapprox_sap_series_with_leading_zeros():
    # square-lattice polygons by perimeter in u = x^2, 66 terms starting at u^2 (Clisby and
    # Jensen, J. Phys. A 45 (2012) 115202): u_c = 1/mu^2 with mu = 2.63815853032790(3)
    # (Jacobsen, Scullard, Guttmann, J. Phys. A 49 (2016) 494004), singular part
    # (1 - u/u_c)^(3/2) (alpha = 1/2, Nienhuis, PRL 49 (1982) 1062). The two leading zeros
    # once made every first-order approximant singular ("degenerate").
    cs, _ = lattice("sap_square_lattice_perimeter")
    assert cs[0] == 0 and cs[1] == 0
    r = estimate_diffapprox(Series(cs), Context(dps=100), order=1)
    assert r.success, r.message
    uc = 1 / mpmath.mpf("2.63815853032790") ** 2
    s = _near(r.singularities, uc)
    _check(s.re, uc, 1e-9)
    _check(s.exponent, Fraction(3, 2), 1e-5)


def test_diffapprox_ising_susceptibility():
    # square-lattice Ising susceptibility, 27 terms (Sykes et al., J. Phys. A 5 (1972) 624;
    # OEIS A002906): v_c = sqrt(2) - 1 (Kramers-Wannier 1941), gamma = 7/4 (Wu, McCoy,
    # Tracy, Barouch, PRB 13 (1976) 316)
    cs, _ = lattice("ising_sq_susceptibility_hightemp")
    r = estimate_diffapprox(Series(cs), Context(dps=40), order=1)
    with workdps(40):
        vc = mpmath.sqrt(2) - 1
    s = _near(r.singularities, vc)
    _check(s.re, vc, 1e-3)
    _check(s.exponent, Fraction(-7, 4), 0.05)


@pytest.mark.parametrize("name", ["catalan", "motzkin"])
def test_exact_equation_with_a_regular_singular_point_at_the_origin(name):
    # Catalan (1 - sqrt(1-4x))/(2x) and Motzkin (1 - x - sqrt(1-2x-3x^2))/(2x^2) generating
    # functions: their first-order equations have Q_1 = x (1 - 4x) and a multiple of
    # x (1-3x)(1+x), so Q_1(0) = 0 and the usual normalisation cannot find them. Branch points
    # 1/4; 1/3 and -1, all with exponent 1/2 (closed forms, common practice, no source; Motzkin
    # numbers by their recursion, OEIS A001006, from memory)
    if name == "catalan":
        c, pts = [Fraction(math.comb(2 * n, n), n + 1) for n in range(60)], [Fraction(1, 4)]
    else:
        c = [1, 1]
        for n in range(2, 60):
            c.append(((2 * n + 1) * c[-1] + (3 * n - 3) * c[-2]) // (n + 2))
        pts = [Fraction(1, 3), -1]
    r = estimate_diffapprox(Series(c), Context(dps=60), order=1)
    assert r.success and r.diagnostics.get("exact_equation"), r.message
    assert len(r.singularities) == len(pts)
    if name == "catalan":
        # x (1 - 4x) C' + (1 - 2x) C - 1 = 0, from C = (1 - sqrt(1-4x))/(2x) (common practice)
        assert r.diagnostics["equation"] == "[x - 4 x^2] f' + [1 - 2 x] f + [-1] = 0"
    for p in pts:
        s = _near(r.singularities, p)
        _check(s.re, p, 1e-40)
        _check(s.exponent, Fraction(1, 2), 1e-40)


def test_exact_equation_drops_an_apparent_singular_point():
    # (1 + x/2) (1 - x)^(-1/2) obeys (1 + x/2)(1 - x) f' = (1 + x/2 + ... ) f with no
    # inhomogeneous term; Q_1 vanishes at -2 with exponent 1, where f is analytic (an
    # apparent singular point of the equation). Only x = 1 (exponent -1/2) is singular
    # (closed form, common practice, no source); -log(1-x), whose equation has an
    # inhomogeneous term, keeps its exponent-0 point (a logarithm)
    c = _product_series(1, 2, Fraction(-1, 2), -1, 60)
    r = estimate_diffapprox(Series(c), Context(dps=60), order=1)
    assert r.success and r.diagnostics.get("exact_equation"), r.message
    assert len(r.singularities) == 1
    _check(r.singularities[0].re, 1, 1e-40)
    _check(r.singularities[0].exponent, Fraction(-1, 2), 1e-40)
    c = [Fraction(0)] + [Fraction(1, k) for k in range(1, 60)]
    r = estimate_diffapprox(Series(c), Context(dps=60), order=1)
    assert r.success and r.diagnostics.get("exact_equation"), r.message
    (s,) = r.singularities
    _check(s.re, 1, 1e-40)
    assert s.kind == "log" and s.exponent.contains(0)
