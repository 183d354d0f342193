"""The clustering of ensemble points: the numpy screen decides exactly as the plain mpmath
comparison does (a fast path checked against the slow one, as DEVELOPERS.md asks)."""
import random

import mpmath

from resum.uncertainty import ensemble


def _brute(groups, rel_tol, scale=None):
    # the same algorithm with every distance in mpmath (the code before the numpy screen)
    orig = ensemble._near_finder

    def slow(allpts, used):
        exact = [z for _, z, _ in allpts]
        return lambda c, tol: [b for b in range(len(exact)) if not used[b] and abs(exact[b] - c) <= tol]
    ensemble._near_finder = slow
    try:
        return ensemble.cluster_points(groups, rel_tol=rel_tol, scale=scale)
    finally:
        ensemble._near_finder = orig


def _same(a, b):
    assert len(a) == len(b)
    for x, y in zip(a, b):
        assert x["center"] == y["center"] and x["fraction"] == y["fraction"]
        assert [(i, z) for i, z, _ in x["members"]] == [(i, z) for i, z, _ in y["members"]]


def test_numpy_screen_gives_the_mpmath_clusters():
    rng = random.Random(7)
    with mpmath.workdps(40):
        for trial in range(20):
            # a few true points seen by most approximants with scatter, plus noise points
            true = [mpmath.mpc(rng.uniform(-2, 2), rng.uniform(-2, 2)) for _ in range(3)]
            groups = []
            for i in range(12):
                g = [(t + mpmath.mpc(rng.gauss(0, 1e-3), rng.gauss(0, 1e-3)), i) for t in true if rng.random() < 0.9]
                g += [(mpmath.mpc(rng.uniform(-3, 3), rng.uniform(-3, 3)), -1) for _ in range(rng.randint(0, 4))]
                groups.append(g)
            _same(ensemble.cluster_points(groups, rel_tol=0.02), _brute(groups, 0.02))


def test_points_exactly_at_the_tolerance_are_decided_in_mpmath():
    # distances equal to the tolerance up to far less than double precision resolves:
    # 1 and 1.02 +- 10^-30 around tolerance 0.02 * |1| (rel_tol 0.02)
    with mpmath.workdps(50):
        eps = mpmath.mpf(10) ** -30
        for d in (-eps, 0, eps):
            groups = [[(mpmath.mpc(1), 0)], [(mpmath.mpc(mpmath.mpf("1.02") + d), 1)]]
            _same(ensemble.cluster_points(groups, rel_tol=0.02, scale=mpmath.mpf(1)),
                  _brute(groups, 0.02, scale=mpmath.mpf(1)))


def test_points_beyond_double_range_still_cluster():
    with mpmath.workdps(30):
        big = mpmath.mpf(10) ** 400
        groups = [[(mpmath.mpc(big), 0)], [(mpmath.mpc(big * (1 + mpmath.mpf(10) ** -5)), 1)]]
        out = ensemble.cluster_points(groups, rel_tol=0.02)
        assert len(out) == 1 and out[0]["fraction"] == 1
        _same(out, _brute(groups, 0.02))
