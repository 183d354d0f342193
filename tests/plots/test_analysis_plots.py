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


def test_domb_sykes_legend_prints_theta_with_its_band():
    # Catalan numbers' generating function (1 - sqrt(1 - 4x))/(2x) from 12 terms: a square-root
    # branch point at 1/4, theta = 1/2 (common practice, no source). Few terms give a wide band;
    # the legend prints theta as value(error) holding 1/2, not with six fixed digits
    import re
    import matplotlib
    matplotlib.use("Agg")
    from resum.plots.analysis import plot_domb_sykes
    s = Series([math.comb(2 * n, n) // (n + 1) for n in range(12)], name="catalan")
    r = analyze(s, Context(dps=20), methods=["ratio", "pade"], verify=False)
    ax = plot_domb_sykes(r)
    labels = [ln.get_label() for ln in ax.get_lines() if "theta" in ln.get_label()]
    assert labels, [ln.get_label() for ln in ax.get_lines()]
    m = re.search(r"theta = (-?\d+)\.(\d+)\((\d+)\)$", labels[0])
    assert m, labels[0]
    unit = mpmath.mpf(10) ** -len(m.group(2))
    centre = mpmath.mpf(f"{m.group(1)}.{m.group(2)}")
    assert abs(centre - mpmath.mpf("0.5")) <= int(m.group(3)) * unit, labels[0]
    assert len(m.group(3)) <= 2
    import matplotlib.pyplot as plt
    plt.close(ax.figure)
