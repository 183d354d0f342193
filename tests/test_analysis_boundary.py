"""analyze() verdicts for a natural boundary and an essential singularity.

Sources: prod_k 1/(1 - x^k) has the natural boundary |x| = 1 (P. Flajolet, E. Fusy,
X. Gourdon, D. Panario and N. Pouyanne, Electron. J. Combin. 13 (2006) R103, introduction);
exp(x/(1 - x)) has an essential singularity at x = 1 (common practice, no source).
"""
import json
from fractions import Fraction
from math import comb, factorial

import pytest

from resum.analysis import AnalysisResult, analyze
from resum.report.analysis_text import render_analysis
from resum.series import Series
from tests.known_series import partition_numbers


def test_partition_function_boundary_with_fast_methods():
    res = analyze(Series(partition_numbers(100)), methods=["ratio", "root-test", "pade"], verify=False)
    assert res.natural_boundary is not None and res.radius.contains(1)
    assert res.singularities == ()
    # the complex-plane figure draws the circle as a suspected boundary, not a disk of convergence
    pytest.importorskip("matplotlib")
    import matplotlib.pyplot as plt
    from resum.plots.analysis import plot_complex_plane
    ax = plot_complex_plane(res)
    labels = [p.get_label() for p in ax.patches]
    assert "natural boundary suspected" in labels and "disk of convergence" not in labels
    plt.close("all")


@pytest.mark.slow
def test_partition_function_natural_boundary_verdict():
    res = analyze(Series(partition_numbers(100)))
    assert res.natural_boundary is not None
    assert res.natural_boundary.contains(1) and res.radius.contains(1)
    assert res.singularities == ()          # no confident points inside the circle
    d = res.contract_dict()
    assert "natural_boundary" in d and d["singularities"] == []
    back = AnalysisResult.from_dict(json.loads(json.dumps(res.to_dict())))
    assert back.natural_boundary.contains(1)
    text = render_analysis(res)
    assert "natural boundary suspected" in text


def test_two_poles_keep_their_verdict():
    # 1/((1 - x)(1 + x/2)): poles at 1 and -2 (common practice, no source)
    c = [sum(Fraction(-1, 2) ** k for k in range(n + 1)) for n in range(60)]
    res = analyze(Series(c), verify=False)
    assert res.natural_boundary is None
    assert [s.kind for s in res.singularities][:2] == ["pole", "pole"]
    assert res.radius.contains(1)


def test_exp_x_over_one_minus_x_is_essential():
    c = [Fraction(1)] + [sum(Fraction(comb(m - 1, k - 1), factorial(k)) for k in range(1, m + 1))
                         for m in range(1, 80)]
    res = analyze(Series(c), verify=False)
    assert res.natural_boundary is None
    s = res.singularities[0]
    assert s.kind == "essential" and s.exponent is None
    assert s.re.contains(1) and s.im.contains(0)
    assert res.contract_dict()["singularities"][0]["kind"] == "essential"


def test_branch_point_stays_algebraic():
    # (1 - x)^(-1/3): theta = -1/3 (common practice, no source)
    c = [Fraction(1)]
    for k in range(1, 60):
        c.append(c[-1] * (k - 1 + Fraction(1, 3)) / k)
    res = analyze(Series(c), verify=False)
    assert res.singularities[0].kind == "branch"
    assert res.natural_boundary is None
