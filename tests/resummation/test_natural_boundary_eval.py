"""evaluate() on a series with a natural boundary: values inside it, none beyond.

The partition generating function prod_k 1/(1 - x^k) has the unit circle as natural boundary
(Flajolet, Fusy, Gourdon, Panario and Pouyanne, Electron. J. Combin. 13 (2006) R103); inside, the
product is evaluated by mpmath.nprod (reference library)."""
import mpmath

from resum.context import Context
from resum.resummation import evaluate
from resum.series import Series
from tests.known_series import partition_numbers


def test_inside_the_boundary_a_value_beyond_it_none():
    res = evaluate(Series(partition_numbers(100)), ["0.5", "1.5", "-2"], Context(dps=20))
    assert res.points[0].method == "pade" and "natural boundary" in res.diagnostics["why"]
    inside, beyond, far = res.points
    with mpmath.workdps(30):
        truth = mpmath.nprod(lambda k: 1 / (1 - mpmath.mpf("0.5") ** k), [1, mpmath.inf])
        assert inside.value.lower <= truth <= inside.value.upper
        assert inside.value.digits() >= 15
    for p in (beyond, far):
        assert p.value is None and not p.success
        assert "natural boundary" in p.message
