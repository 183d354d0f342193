"""The order-basis (sigma-basis) solver of Hermite-Padé forms, resum._kernels.hermite.hermite_pade,
and its use by the differential approximants above CERTIFIED_MAX unknowns: against a closed form
(the Padé approximants of exp) and against mpmath's LU solve of the dense system (reference
library)."""
import math

import mpmath
import pytest

from resum._kernels.hermite import hermite_pade
from resum.estimators import diffapprox
from resum.estimators._num import CERTIFIED_MAX


def test_pade_of_exp_matches_the_closed_form():
    # [n/n] of exp(x): p_k = (2n - k)! n! / ((2n)! k! (n - k)!), q_k = (-1)^k p_k (Baker and
    # Graves-Morris, Padé Approximants, 2nd ed., CUP 1996, sect. 1.2; from memory). The form
    # a_0 * 1 + a_1 * exp(x) = O(x^(2n+1)) with deg a_0, a_1 <= n is (-p, q) up to a factor.
    n, dps = 12, 50
    with mpmath.workdps(dps + 20):
        e = [mpmath.mpf(1) / math.factorial(k) for k in range(2 * n + 1)]
    one = [1] + [0] * (2 * n)
    forms, err = hermite_pade([one, e], [n, n], dps, normalize=(1, 0))
    actual = 0
    with mpmath.workdps(3 * dps):
        for k in range(n + 1):
            pk = mpmath.mpf(math.factorial(2 * n - k) * math.factorial(n)) / (
                math.factorial(2 * n) * math.factorial(k) * math.factorial(n - k))
            actual = max(actual, abs(forms[1][k] - (-1) ** k * pk) / pk, abs(forms[0][k] + pk) / pk)
    # the estimate (largest relative change of an entry for data moved in their 50th digit)
    # covers the actual error, and most digits survive
    assert actual <= err < 1e-30


def test_degenerate_table_is_refused():
    # 1/(1 - x) obeys (1 - x) f' - f = 0: every larger first-order form is a multiple of it
    # times an arbitrary polynomial, so the form of degrees (3; 4, 4) is not unique
    # (common practice, no source)
    N = 12
    f = [1] * N
    df = [k + 1 for k in range(N)]
    one = [1] + [0] * (N - 1)
    assert hermite_pade([one, f, df], [3, 4, 4], 30) is None


def _series(N, dps, terms):
    # f = (1 - x)^(-1/3) + (1 + 2x)^(1/2) [+ (1 - x/3)^(1/5)]: algebraic branch points; a sum of
    # k functions with different exponents, each obeying a first-order equation, obeys an
    # equation of order k and none of lower order with polynomial coefficients, so the tables of
    # order k - 1 are not degenerate (a product of powers would be: f'/f rational)
    # (common practice, no source)
    with mpmath.workdps(dps + 20):
        parts = [lambda x: (1 - x) ** (-mpmath.mpf(1) / 3), lambda x: (1 + 2 * x) ** 0.5,
                 lambda x: (1 - x / 3) ** (mpmath.mpf(1) / 5)][:terms]
        return mpmath.taylor(lambda x: sum(p(x) for p in parts), 0, N - 1)


@pytest.mark.parametrize("K, L, Ms, dps", [(1, 2, [61, 62], 120), (2, 1, [40, 41, 41], 160)])
def test_approximant_above_certified_size_matches_mpmath_lu(K, L, Ms, dps):
    # more than CERTIFIED_MAX unknowns: fit_diffapprox takes the order-basis path; reference:
    # the same dense system solved by mpmath.lu_solve at twice the digits (the systems lose
    # about 65 (first order) and 90 (second order) of them, far fewer than the reference has)
    S = sum(M + 1 for M in Ms) - 1
    assert S > CERTIFIED_MAX
    N = L + S + 2 + K
    with mpmath.workdps(dps):
        c = [mpmath.mpf(v) for v in _series(N, dps, K + 1)]
        D = diffapprox._deriv_coeffs(c, K)
    calls = []
    real_solve = diffapprox.solve
    diffapprox.solve = lambda *a: calls.append(1) or real_solve(*a)
    try:
        with mpmath.workdps(dps):
            Q, err = diffapprox.fit_diffapprox(D, K, L, Ms, dps)
    finally:
        diffapprox.solve = real_solve
    assert not calls                      # no dense solve was needed
    unknowns = [(j, i) for j in range(K + 1) for i in range(Ms[j] + 1) if not (j == K and i == 0)]
    with mpmath.workdps(2 * dps):
        rows = [[D[j][n - i] if n - i >= 0 else 0 for j, i in unknowns] for n in range(L + 1, L + S + 1)]
        rhs = [-D[K][n] for n in range(L + 1, L + S + 1)]
        x = mpmath.lu_solve(mpmath.matrix(rows), mpmath.matrix(rhs))
        ref = {u: x[k] for k, u in enumerate(unknowns)}
        top = max(abs(v) for v in ref.values())
        actual = max(abs(Q[j][i] - ref[(j, i)]) for j, i in unknowns) / top
    # the error estimate (for data carrying dps digits) covers the actual normwise error, and
    # the fit keeps at least a third of the digits
    assert actual <= err < 10.0 ** (-dps / 3)
    assert Q[K][0] == 1
