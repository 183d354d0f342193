"""The dense solve of the differential approximants (resum.estimators._num.solve): the estimated
path used above CERTIFIED_MAX unknowns against mpmath's LU solve at three times the digits
(reference library), and its refusal of systems that are singular before rounding."""
import mpmath

from resum.estimators import _num
from resum.estimators._num import CERTIFIED_MAX, _solve_estimated, solve


def _toeplitz_log1p(n, dps):
    # T_ij = c_(n + i - j), c_k = (-1)^k / (k + 1): the Padé system of log(1+x)/x, as
    # ill-conditioned as a Hilbert matrix (common practice, no source)
    with mpmath.workdps(dps):
        c = [mpmath.mpf((-1) ** k) / (k + 1) for k in range(2 * n + 1)]
        rows = [[c[n + i - j] for j in range(n)] for i in range(n)]
        rhs = [-c[n + i + 1] for i in range(n)]
    return rows, rhs


def _reference(rows, rhs, dps):
    with mpmath.workdps(3 * dps):
        return mpmath.lu_solve(mpmath.matrix(rows), mpmath.matrix(rhs))


def test_estimated_error_covers_the_actual_error():
    n, dps = 40, 80
    rows, rhs = _toeplitz_log1p(n, dps)
    x, err = _solve_estimated(rows, rhs, dps)
    ref = _reference(rows, rhs, dps)
    with mpmath.workdps(3 * dps):
        actual = max(abs(a - b) / abs(b) for a, b in zip(x, ref))
    # the system loses about 1.5 digits per unknown of its 80: some digits survive, the
    # estimate (for data carrying 80 digits) is above the actual error of the 90-digit solve
    assert 1e-60 < err < 1e-10
    assert actual <= err


def test_certified_and_estimated_paths_agree():
    n, dps = 30, 60
    rows, rhs = _toeplitz_log1p(n, dps)
    xc, errc = solve(rows, rhs, dps)               # n <= CERTIFIED_MAX: Arb's certified solve
    xe, erre = _solve_estimated(rows, rhs, dps)
    assert n <= CERTIFIED_MAX
    with mpmath.workdps(dps):
        assert max(abs(a - b) / abs(b) for a, b in zip(xc, xe)) <= max(errc, erre)


def test_system_singular_before_rounding_is_refused():
    # Hankel matrix of c_k = 2^-k + 3^-k has rank 2 (a sum of two geometric sequences, Kronecker;
    # from memory); the right-hand side is in its range, so the rounded system looks regular
    # and consistent, and a rerun on the same data would agree with itself
    n, dps = 6, 40
    with mpmath.workdps(dps + 10):
        c = [mpmath.mpf(1) / 2 ** k + mpmath.mpf(1) / 3 ** k for k in range(2 * n)]
        rows = [[c[i + j] for j in range(n)] for i in range(n)]
        rhs = [sum(rows[i]) for i in range(n)]
    assert _solve_estimated(rows, rhs, dps) is None
    assert solve(rows, rhs, dps) is None


def test_large_systems_take_the_estimated_path(monkeypatch):
    called = []
    monkeypatch.setattr(_num, "_solve_estimated", lambda *a: called.append(len(a[0])) or None)
    rows, rhs = _toeplitz_log1p(CERTIFIED_MAX + 1, 30)
    assert solve(rows, rhs, 30) is None and called == [CERTIFIED_MAX + 1]
