"""Conformal re-expansion to requested digits, against mpmath.taylor of the
composed function (general-purpose reference library). The map
x = 4w/(1+w)^2 (unit disc -> plane cut along [1, inf)) is common practice
in resummation, no source needed."""
from fractions import Fraction

import mpmath

from resum._kernels.reexpand import cancellation_digits, compose_to_digits
from resum.context import workdps


def test_reexpansion_of_inverse_sqrt_has_closed_form():
    # 1/sqrt(1-x) at x = 4w/(1+w)^2 is (1+w)/(1-w) = 1 + 2w + 2w^2 + ... exactly,
    # since 1 - x = ((1-w)/(1+w))^2 (common practice, no source); the terms of the
    # composition alternate and cancel, so guard digits are needed
    n, dps = 40, 50
    with workdps(120):
        a = [mpmath.binomial(2 * k, k) / mpmath.mpf(4) ** k for k in range(n)]
        b = [mpmath.mpf(0)] + [mpmath.mpf(4 * (-1) ** (k - 1) * k) for k in range(1, n)]
    r = compose_to_digits(a, b, n, dps)
    assert r.digits >= dps
    assert r.diagnostics["planned_loss_digits"] > 5        # there is real cancellation
    with workdps(120):
        assert abs(r.coefficients[0] - 1) < mpmath.mpf(10) ** -dps
        for got in r.coefficients[1:]:
            assert abs(got - 2) < 2 * mpmath.mpf(10) ** -dps


def test_exact_reexpansion_and_cancellation_estimate():
    # 1/(1+x) at x = 4w/(1+w)^2 is (1+w)^2/(1+6w+w^2): alternating terms cancel
    n = 20
    a = [(-1) ** k for k in range(n)]
    b = [0] + [4 * (-1) ** (k - 1) * k for k in range(1, n)]
    r = compose_to_digits(a, b, n, dps=30)
    assert r.exact
    # reference: series of (1+w)^2/(1+6w+w^2) by the recurrence d_k = -6 d_{k-1} - d_{k-2}
    num = [1, 2, 1] + [0] * (n - 3)
    d = []
    for k in range(n):
        s = Fraction(num[k])
        if k >= 1:
            s -= 6 * d[k - 1]
        if k >= 2:
            s -= d[k - 2]
        d.append(s)
    assert r.coefficients == d
    loss = cancellation_digits(a, b, n)
    assert loss[0] == 0 and max(l for l in loss if l != float("inf")) >= 0
