"""The source registry's parameter limits match what each build function accepts."""
import pytest

from resum.errors import InputError
from resum.sources import SOURCES


def test_limits_match_the_build_functions():
    from resum.series.io import MAX_TERMS
    from resum.sources import bes, oscillator
    assert SOURCES["bes"].param("loops").maximum == bes.MAX_LOOPS
    assert SOURCES["oscillator"].param("orders").maximum == oscillator.MAX_ORDERS
    from resum.sources import EULER_MAX_ORDERS, PHI4_MAX_ORDERS
    # the exact sources stop where their file would pass the readers' 200 MiB (before MAX_TERMS)
    assert SOURCES["phi4"].param("orders").maximum == PHI4_MAX_ORDERS <= MAX_TERMS
    assert SOURCES["euler"].param("orders").maximum == EULER_MAX_ORDERS <= MAX_TERMS
    from resum.sources import CATALAN_MAX_ORDERS
    assert SOURCES["catalan"].param("orders").maximum == CATALAN_MAX_ORDERS <= MAX_TERMS


@pytest.mark.parametrize("name, params, word", [
    ("phi4", {"orders": 10 ** 9}, "at most 8000"),        # refused at once, not computed for hours
    ("euler", {"orders": 10 ** 9}, "at most 10000"),
    ("bes", {"loops": 5, "dps": 10 ** 6}, "at most 5000"),
    ("oscillator", {"state": -1}, "at least 0"),
])
def test_build_refuses_values_outside_the_limits(name, params, word):
    with pytest.raises(InputError, match=word) as err:
        SOURCES[name].build(None, **params)
    assert next(iter(params)) in str(err.value) or "dps" in str(err.value)


def test_values_at_the_limits_are_accepted():
    s = SOURCES["oscillator"].build(None, state=0, orders=1)
    assert s.coefficients == (1,)          # E_0 = 1 for p^2 + x^2 (common practice, no source)
    assert SOURCES["bes"].param("dps").check(5) == 5
    assert SOURCES["euler"].param("orders").check(10000) == 10000
