"""The Borel-plane figure draws what the Borel transform's Padé approximant has."""
import mpmath
import pytest

from resum.context import Context
from resum.plots.evaluation import plot_borel_plane
from resum.sources import get_source

matplotlib = pytest.importorskip("matplotlib")
matplotlib.use("Agg")


def _points(ax, label):
    out = []
    for line in ax.get_lines():
        if line.get_label() == label:
            out += [complex(x, y) for x, y in zip(line.get_xdata(), line.get_ydata())]
    return out


def test_oscillator_borel_plane_shows_the_cut_from_minus_two_thirds():
    """Ground state of p^2 + x^2 + g x^4, 80 exact orders: the Borel transform
    is analytic off a cut on the negative axis starting at t = -2/3 (Bender
    and Wu, Phys. Rev. D 7 (1973) 1620, large-order formula rescaled to this
    Hamiltonian; Borel summability: Graffi, Grecchi and Simon, Phys. Lett. B 32
    (1970) 631). At the 85 digits the resummation works at, every drawn pole
    lies in the left half plane, none is a Froissart doublet, and the nearest
    is within 1 % of -2/3; at the 45 digits of a 30-digit context the
    rounding alone puts pole-zero pairs in the right half plane, which is why
    the figure takes the precision and marks such pairs."""
    import matplotlib.pyplot as plt
    ctx = Context(dps=30)
    s = get_source("oscillator").build(ctx, orders=80)
    ax = plot_borel_plane(s, ctx, dps=85)
    poles = _points(ax, "poles")
    assert poles and all(p.real < 0 for p in poles)
    nearest = min(poles, key=abs)
    assert abs(nearest + 2 / 3) < 0.01 * 2 / 3
    assert not _points(ax, "Froissart doublets")
    assert "85 digits" in ax.get_title()
    noisy = plot_borel_plane(s, ctx)            # the context's own 45 digits
    assert any(z.real > 0 for z in _points(noisy, "Froissart doublets"))
    plt.close("all")


def test_euler_series_single_pole():
    """sum (-1)^n n! x^n has the Borel transform 1/(1 + t): one pole at t = -1,
    no zero (closed form, common practice, no source)."""
    import matplotlib.pyplot as plt
    from resum.series import Series
    s = Series([(-1) ** n * int(mpmath.factorial(n)) for n in range(20)])
    ax = plot_borel_plane(s, Context(dps=30))
    poles = _points(ax, "poles")
    assert len(poles) == 1 and abs(poles[0] + 1) < 1e-12
    assert not _points(ax, "Froissart doublets")
    plt.close("all")


def test_off_scale_baseline_is_counted_not_drawn():
    """log(1+x)/x = sum (-1)^k x^k/(k+1) (common practice, no source): at x = 5,
    outside the radius 1, the smallest term is of order 1, wider than the range of
    the resummed values (log(1.5)/0.5 = 0.81 to log(6)/5 = 0.36), so the
    optimal-truncation bar is left out and counted; at x = 1/2 it is drawn."""
    from fractions import Fraction

    import matplotlib.pyplot as plt
    from resum.plots.evaluation import plot_evaluation
    from resum.resummation import evaluate
    from resum.series import Series
    s = Series([Fraction((-1) ** k, k + 1) for k in range(30)])
    r = evaluate(s, ["1/2", "5"], Context(dps=20), method="pade", verify=False)
    ax = plot_evaluation(r)
    labels = ax.get_legend_handles_labels()[1]
    base = [lab for lab in labels if lab.startswith("optimal truncation")]
    assert base and "1 off scale" in base[0], labels
    plt.close("all")


def test_complex_points_are_named_and_no_digit_baselines_left_out():
    """log(1+x)/x (common practice, no source): a complex point cannot go on the real axis, so the
    title says how many were left out; at x = -2, on the cut beyond the radius, the smallest
    term is the first and the baseline 1 +- 1 carries no digit, so no bar is drawn for it."""
    from fractions import Fraction

    import matplotlib.pyplot as plt
    from resum.plots.evaluation import plot_evaluation
    from resum.resummation import evaluate
    from resum.series import Series
    s = Series([Fraction((-1) ** k, k + 1) for k in range(30)])
    r = evaluate(s, ["1/2", "-2", "1+I"], Context(dps=20), method="pade", verify=False)
    ax = plot_evaluation(r)
    assert "1 complex point not drawn" in ax.get_title()
    bars = [c for c in ax.containers if str(c.get_label()).startswith("optimal truncation")]
    assert len(bars) == 1
    xs = list(bars[0].lines[0].get_xdata())
    assert -2.0 not in xs and 0.5 in xs
    plt.close("all")


def test_save_figure_is_atomic(tmp_path):
    import matplotlib
    matplotlib.use("Agg", force=False)
    import matplotlib.pyplot as plt
    from resum.plots import save_figure
    fig, ax = plt.subplots()
    ax.plot([0, 1], [0, 1])
    out = tmp_path / "line.png"
    save_figure(fig, out, dpi=50)
    assert out.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"
    save_figure(fig, tmp_path / "line.pdf")
    assert (tmp_path / "line.pdf").read_bytes()[:5] == b"%PDF-"
    # a failing save leaves neither the target nor a temporary file behind
    with pytest.raises(ValueError):
        save_figure(fig, tmp_path / "bad.nosuchformat")       # matplotlib knows no such format
    plt.close(fig)
    assert sorted(p.name for p in tmp_path.iterdir()) == ["line.pdf", "line.png"]


def test_points_joined_in_order_of_the_axis():
    """Points asked for as 1000, 1, 10 are joined from left to right (a line in the order asked
    would zigzag and draw a shape the function does not have), on a logarithmic axis because they
    span three decades; each drawn value is log(1 + x)/x to the digits of its band (mpmath
    reference; series sum (-1)^k x^k/(k+1), common practice, no source)."""
    import matplotlib.pyplot as plt
    from fractions import Fraction
    from resum.plots.evaluation import plot_digits, plot_evaluation
    from resum.resummation import evaluate
    from resum.series import Series
    s = Series([Fraction((-1) ** k, k + 1) for k in range(30)])
    r = evaluate(s, ["1000", "1", "10"], Context(dps=15), verify=False)
    ax = plot_evaluation(r)
    line = ax.containers[0].lines[0]
    xs, ys = list(line.get_xdata()), list(line.get_ydata())
    assert xs == [1.0, 10.0, 1000.0]
    for x, y in zip(xs, ys):
        truth = float(mpmath.log1p(x) / x)
        band = next(float(p.value.error) for p in r.points if float(p.at) == x)
        assert abs(y - truth) <= band + 1e-15 * truth
    assert ax.get_xscale() == "log"
    ax2 = plot_digits(r)
    assert list(ax2.get_lines()[0].get_xdata()) == [1.0, 10.0, 1000.0]
    assert ax2.get_xscale() == "log"
    plt.close("all")


def test_curve_grid_spans_the_points_asked_for():
    """The figure's curve runs over the points asked for: evenly from 0 (or the smallest, when
    negative) to the largest, without 0 itself; geometric when the points span two decades or
    more (the axis is then logarithmic); nothing for complex points only (common practice, no
    source)."""
    from resum.plots.evaluation import curve_grid
    g = curve_grid(["1/2", "5"], 10)
    assert len(g) == 10 and g[-1] == 5 and all(abs((b - a) - mpmath.mpf(1) / 2) < 1e-14 for a, b in zip(g, g[1:]))
    g = curve_grid(["1", "1000"], 7)
    assert g[0] == 1 and g[-1] == 1000
    assert all(abs(b / a - mpmath.sqrt(10)) < 1e-12 for a, b in zip(g, g[1:]))
    assert [float(x) for x in curve_grid(["-2", "3"], 5)] == [-2.0, -1.0, 1.0, 2.0, 3.0]
    assert curve_grid(["1+2*I"], 5) == [] and curve_grid(["1"], 0) == []


def test_curve_drawn_through_the_points_follows_the_function():
    """log(1+x)/x = sum (-1)^k x^k/(k+1) (common practice, no source), [L/M] Padé of 30 exact
    terms: the curve drawn at 8 more points passes through the two points asked for, and every
    drawn value is mpmath's log1p(x)/x to within its band."""
    import matplotlib.pyplot as plt
    from fractions import Fraction
    from resum.plots.evaluation import curve_grid, plot_evaluation
    from resum.resummation import evaluate
    from resum.series import Series
    s = Series([Fraction((-1) ** k, k + 1) for k in range(30)])
    ctx = Context(dps=15)
    r = evaluate(s, ["1/2", "5"], ctx, method="pade", verify=False)
    curve = evaluate(s, curve_grid(["1/2", "5"], 8), ctx, method="pade", verify=False)
    ax = plot_evaluation(r, curve=curve)
    line = next(ln for ln in ax.get_lines() if ln.get_label().startswith("resummed curve"))
    xs, ys = list(line.get_xdata()), list(line.get_ydata())
    assert xs == sorted(xs) and 0.5 in xs and 5.0 in xs and len(xs) == 10     # 5 is on the grid too
    bands = {float(p.at): float(p.value.error) for p in list(r.points) + list(curve.points)}
    for x, y in zip(xs, ys):
        assert abs(y - float(mpmath.log1p(x) / x)) <= bands[x] + 1e-14
    assert any(c.get_label().startswith("band (curve") for c in ax.collections)
    from resum.plots.evaluation import plot_digits
    ax2 = plot_digits(r, curve=curve)
    dl = next(ln for ln in ax2.get_lines() if ln.get_label().startswith("band (curve"))
    assert list(dl.get_xdata()) == xs        # the digits of every drawn point, in the same order
    plt.close("all")


def test_strong_fit_figure_draws_the_reduced_values_and_the_fit():
    """(1 + x)^(1/3) = x^(1/3) (1 + 1/(3x) - 1/(9x^2) + ...) at large x (binomial series,
    common practice, no source), values from mpmath at x = 16 ... 512 with bands of 1e-6: the
    figure draws f / x^p
    with p = 1/3 at each coupling (mpmath's values divided by x^(1/3)), the fitted form divided
    the same way, and the leading coefficient's band around 1."""
    import matplotlib.pyplot as plt
    from resum.estimators.strong_coupling import probe_strong_coupling
    from resum.plots.evaluation import plot_strong_fit
    from resum.results import Estimate
    from resum.series import Series
    with mpmath.workdps(40):
        xs = [16 * mpmath.mpf(2) ** k for k in range(6)]
        vals = [Estimate(v, v * (1 - mpmath.mpf(10) ** -6), v * (1 + mpmath.mpf(10) ** -6))
                for v in (mpmath.cbrt(1 + x) for x in xs)]
        res = probe_strong_coupling(Series([1, 1, 1, 1, 1, 1, 1]), xs, Context(dps=30), values=vals,
                                    leading_power=mpmath.mpf(1) / 3, max_rel_band=mpmath.mpf("1e-5"))
        assert res.success
        ax = plot_strong_fit(res)
        drawn = [(float(x), float(y)) for ln in ax.containers for x, y in zip(*ln.lines[0].get_data())]
        want = [(float(x), float(mpmath.cbrt(1 + x) / mpmath.cbrt(x))) for x in xs]
        assert [x for x, _ in sorted(drawn)] == [x for x, _ in want]
        assert [y for _, y in sorted(drawn)] == pytest.approx([y for _, y in want], rel=1e-12)
        fit = [ln for ln in ax.get_lines() if ln.get_label().startswith("fitted form")][0]
        fx, fy = fit.get_data()
        for x, y in zip(fx, fy):
            assert y == pytest.approx(float(mpmath.cbrt(1 + x) / mpmath.cbrt(x)), rel=1e-5)
        labels = [t.get_text() for t in ax.get_legend().get_texts()]
        lead = [t for t in labels if t.startswith("leading coefficient")]
        assert lead and "p = 1/3" in ax.get_ylabel()
        band = res.coefficient("x^1/3")
        assert band.contains(1)
    plt.close("all")
