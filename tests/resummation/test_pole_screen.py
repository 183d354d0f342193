"""The pole screen of Padé evaluation (disk tests: Rouché, Pellet, instead of the roots of Q).

Reference: the roots of the same polynomials by mpmath.polyroots at 50 digits; the screen
may answer "maybe" where no root is near (it is a sufficient test), never "none" where one is.
"""
import random

import mpmath

from resum.context import workdps
from resum.estimators.resum_pade import _pole_counts, pade_evaluate


def test_screen_never_misses_a_root():
    rng = random.Random(7)
    with workdps(50):
        for _ in range(20):
            M = rng.randint(1, 12)
            q = [mpmath.mpf(1)] + [mpmath.mpf(rng.uniform(-1, 1)) for _ in range(M)]
            roots = mpmath.polyroots(list(reversed(q)), maxsteps=200, extraprec=100)
            for _ in range(10):
                z = mpmath.mpc(rng.uniform(-3, 3), rng.uniform(-3, 3))
                tol = mpmath.mpf(rng.uniform(0.01, 0.5))
                near = any(abs(p - z) < tol for p in roots)
                if near:
                    assert _pole_counts(q, [z], [tol], 50)[0] != 0
                # with rho = d / (4 M), d the distance to the nearest root, sum |a_k| rho^k
                # <= |a_0| ((1 + 1/(4M))^M - 1) <= |a_0| (e^(1/4) - 1): the screen must answer
                d = min(abs(p - z) for p in roots)
                assert _pole_counts(q, [z], [d / (4 * M)], 50)[0] == 0


def test_approximant_with_a_pole_on_the_point_is_dropped():
    # 1/(1 - x/2) + log(1+x)/x at x = 2 exactly: every approximant has its pole at 2 (to
    # rounding), so every one is dropped and no value is given there (common practice, no source)
    with workdps(40):
        c = [mpmath.mpf(2) ** -k + mpmath.mpf(-1) ** k / (k + 1) for k in range(30)]
        out, _ = pade_evaluate(c, [mpmath.mpf(2), mpmath.mpf(1)], 40)
        assert not out[0].ok and out[0].info["dropped_for_poles"]
        assert out[1].ok and out[1].re.contains(2 + mpmath.log(2))


def test_pellet_counts_match_the_roots():
    # the disk counts of the screen against mpmath.polyroots at 50 digits: 0 only when no root
    # lies within tol of the point, a positive count at most the roots there (Pellet's theorem, M. Marden,
    # Geometry of Polynomials, AMS 1966, sec. 28, from memory); a point placed next to a root
    # (tol 100 x its distance, the other roots farther) must get the count 1
    rng = random.Random(11)
    n_counted = 0
    with workdps(50):
        for _ in range(20):
            M = rng.randint(1, 10)
            q = [mpmath.mpf(1)] + [mpmath.mpf(rng.uniform(-1, 1)) for _ in range(M)]
            roots = mpmath.polyroots(list(reversed(q)), maxsteps=200, extraprec=100)
            pts, tols = [], []
            for _ in range(8):
                pts.append(mpmath.mpc(rng.uniform(-3, 3), rng.uniform(-3, 3)))
                tols.append(mpmath.mpf(rng.uniform(0.01, 1)))
            for p in roots[:3]:
                sep = min([abs(p - o) for o in roots if o is not p] or [mpmath.mpf(1)])
                pts.append(p + sep * mpmath.mpf("0.001"))
                tols.append(sep * mpmath.mpf("0.1"))
            for z, tol, c in zip(pts, tols, _pole_counts(q, pts, tols, 50)):
                truth = sum(1 for p in roots if abs(p - z) < tol)
                if c == 0:
                    assert truth == 0
                elif c is not None:
                    assert 1 <= c <= truth
                    n_counted += 1
            for c in _pole_counts(q, pts[8:], tols[8:], 50):
                assert c == 1
    assert n_counted > 20
