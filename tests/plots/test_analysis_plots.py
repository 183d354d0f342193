"""Figures of an analysis of a factorially divergent series: the large-order ratios, not an
empty complex plane, and no matplotlib warning on stderr."""
import math
import warnings

import mpmath

from resum import Context, Series, analyze
from resum.plots.analysis import write_analysis_plots


def test_factorial_series_gets_the_large_order_figure(tmp_path):
    # Euler's series sum (-1)^n n! x^n: c_n / (n c_(n-1)) -> 1/A = -1 (common practice, no source)
    s = Series([(-1) ** n * math.factorial(n) for n in range(40)], name="euler")
    r = analyze(s, Context(dps=30), verify=False)
    assert r.growth == "factorial" and r.borel_singularity.contains(-1)
    with warnings.catch_warnings():
        warnings.simplefilter("error")         # a legend without labels would warn
        paths = write_analysis_plots(r, s, tmp_path)
    names = [p.rsplit("/", 1)[-1] for p in paths]
    assert names == ["euler_large_order.png"]
    assert (tmp_path / "euler_large_order.png").stat().st_size > 5000
    assert mpmath.isfinite(r.borel_singularity.value)
