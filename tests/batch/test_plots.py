"""Family figures are drawn from the records, with the recorded values."""
import pytest

from resum.batch import SerialRunner, parse_spec, run_family, RunFolder

from .test_runs import spec_text

matplotlib = pytest.importorskip("matplotlib")


def test_family_plots_written_and_faithful(tmp_path):
    spec = parse_spec(spec_text([1, "3/2", 2, -1]), path="spec.toml")
    out = run_family(spec, tmp_path / "o", runner=SerialRunner(), quiet=True, plots=True)
    names = sorted(p.name for p in out.plots)
    assert names == ["radius.pdf", "radius.png"]
    for p in out.plots:
        assert p.stat().st_size > 1000

    from resum.plots.family import plot_radius
    recs = RunFolder(tmp_path / "o").records()
    ax = plot_radius(recs, x="radius")
    # the drawn points are the recorded ratio estimates; for (1 - x/R)^-a they
    # are R (closed form, common practice, no source); the failed R = -1 is a cross
    drawn = sorted(y for line in ax.get_lines() if line.get_marker() == "s"
                   for y in line.get_ydata())
    assert drawn == pytest.approx([1, 1, 1.5, 1.5, 2, 2], abs=1e-12)
    crosses = [x for line in ax.get_lines() if line.get_marker() == "x" for x in line.get_xdata()]
    assert sorted(crosses) == [-1, -1]
    import matplotlib.pyplot as plt
    plt.close("all")


def test_value_errors_are_pulls_computed_at_the_recorded_precision():
    """Agreement to 30 digits must not cancel to 0 in floats: the pull is
    (value - truth) / (band towards the truth + the truth's own band), plain
    arithmetic on the recorded decimals (common practice, no source)."""
    from resum.plots.family import _pull
    one = "1." + "0" * 29
    v = {"value": one + "3", "lo": one + "1", "hi": one + "5"}      # 1 + 3e-30, band [-2e-30, +2e-30]
    t = {"value": one + "2", "lo": one + "2", "hi": one + "2"}      # exact truth 1 + 2e-30
    assert _pull(v, t) == pytest.approx(0.5)                        # 1e-30 / 2e-30
    t_out = {"value": one + "0", "lo": one + "0", "hi": one + "0"}  # truth 3e-30 below: outside
    assert _pull(v, t_out) == pytest.approx(1.5)
    t_wide = {"value": one + "0", "lo": "0.999999999999999999999999999999", "hi": one + "1"}
    assert _pull(v, t_wide) == pytest.approx(3 / 3)                 # 3e-30 / (2e-30 + 1e-30)
    assert _pull({"value": "nan", "lo": "nan", "hi": "nan"}, t) is None


def test_a_failed_point_breaks_the_line():
    """A point that failed is a cross, and no line segment bridges it."""
    import math
    import matplotlib.pyplot as plt
    from resum.plots.family import _draw
    fig, ax = plt.subplots()
    _draw(ax, {"": ([1.0, 3.0], [1.0, 3.0], [0.9, 2.9], [1.1, 3.1], [2.0])}, "value", "o")
    line = next(ln for ln in ax.get_lines() if ln.get_marker() == "o")
    assert list(line.get_xdata()) == [1.0, 2.0, 3.0]
    y = list(line.get_ydata())
    assert y[0] == 1.0 and math.isnan(y[1]) and y[2] == 3.0
    plt.close(fig)


def test_a_whole_number_axis_gets_whole_number_ticks():
    """A level or a loop count has no value between 0 and 1: its ticks are whole numbers;
    an axis with fractional values keeps the default ticks."""
    import matplotlib.pyplot as plt
    from resum.plots.family import integer_ticks
    recs = [{"index": i, "params": {"state": str(i)}} for i in (-1, 0, 1)]
    fig, (a1, a2) = plt.subplots(2, 1, sharex=True)
    a1.plot([-1, 0, 1], [1, 2, 3])
    assert integer_ticks(fig, recs, "state")
    fig.canvas.draw()
    ticks = [t for t in a2.get_xticks() if -1 <= t <= 1]
    assert ticks and all(t == int(t) for t in ticks), ticks
    plt.close(fig)
    frac = [{"index": 0, "params": {"angle": "0"}}, {"index": 1, "params": {"angle": "0.5236"}}]
    fig, ax = plt.subplots()
    assert not integer_ticks(fig, frac, "angle")
    plt.close(fig)


def test_strong_panel_says_why_it_is_empty():
    """Records whose strong-coupling fits all failed: the panel says so instead of an empty frame
    (the leading power still has its band, so the panel exists)."""
    import matplotlib.pyplot as plt
    from resum.plots.family import plot_strong, strong_keys
    recs = [{"index": i, "key": f"p{i:05d}", "status": "ok", "params": {"angle": str(a)},
             "labels": {"angle": str(a)}, "axes": ["angle"],
             "tasks": {"strong": {"resummed": {
                 "success": False, "status": "not converged", "coefficients": {},
                 "leading_power": {"value": "1.0", "lo": "0.95", "hi": "1.05"},
                 "power_source": "log-derivative 1.0 rounded to 1; not confirmed by a fit"}}}}
            for i, a in enumerate((0.1, 0.2))]
    assert strong_keys(recs) == ["leading_power"]
    ax = plot_strong(recs, "leading_power", x="angle")
    assert any("no point's fit converged" in t.get_text() for t in ax.texts)
    plt.close("all")


def test_an_infinite_radius_is_an_arrow_at_the_top_not_a_number_of_digits():
    """A polynomial point (the bes angle pi/2: F = 4 g^2) has radius inf: drawn as a marker at
    the top edge of the radius panel, and left out of the digits panel (it was drawn as 3 digits,
    the length of the text 'inf')."""
    import matplotlib.pyplot as plt
    from resum.plots.family import plot_band_digits, plot_radius

    def rec(i, angle, radius):
        return {"index": i, "status": "ok", "params": {"angle": angle}, "axes": ["angle"],
                "task_names": ["analyze"], "labels": {},
                "tasks": {"analyze": {"radius": radius, "singularities": [], "growth": "finite radius"}}}
    recs = [rec(0, "0.5", {"value": "0.0625", "lo": "0.06249", "hi": "0.06251"}),
            rec(1, "1.5", {"value": "inf", "lo": "inf", "hi": "inf"})]
    ax = plot_radius(recs, x="angle")
    tops = [x for ln in ax.get_lines() if ln.get_marker() == "^" for x in ln.get_xdata()]
    assert tops == [1.5]
    ax2 = plot_band_digits(recs, x="angle")
    drawn = [x for ln in ax2.get_lines() if ln.get_marker() == "o" for x in ln.get_xdata()]
    assert drawn == [0.5]
    plt.close("all")


def test_terms_used_marks_reached_and_stopped_goals(tmp_path):
    """The goal search's record (order_search) drawn against the axis: filled where the goal
    was reached, open where the search stopped short."""
    import matplotlib.pyplot as plt
    from resum.plots.family import plot_terms_used, write_family_plots

    def rec(i, a, used, reached):
        search = {"goal_digits": "10", "rounds": [{"terms": 31, "min_digits": "5.0"},
                                                  {"terms": used, "min_digits": "11.0"}],
                  "terms_used": used, "reached": reached, "note": ""}
        return {"index": i, "status": "ok", "params": {"angle": a}, "axes": ["angle"], "labels": {},
                "task_names": ["evaluate"],
                "tasks": {"evaluate": {"values": [], "warnings": [], "order_search": search}}}
    recs = [rec(0, "0", 51, True), rec(1, "0.5", 70, False)]
    ax = plot_terms_used(recs, x="angle")
    lines = {ln.get_label(): (list(ln.get_xdata()), list(ln.get_ydata())) for ln in ax.get_lines()}
    assert lines["goal of 10 digits reached"] == ([0.0], [51.0])
    assert lines["goal not reached (search stopped)"] == ([0.5], [70.0])
    assert lines["terms given"][1] == [31.0, 31.0]
    names = sorted(p.name for p in write_family_plots(recs, tmp_path))
    assert "terms_used.png" in names
    plt.close("all")


def test_a_cross_names_the_estimate_that_failed():
    """Two estimates in one panel, one of them not converged at x = 2: the cross carries that
    estimate's name and colour, so it is not read as a failure of the other one."""
    import matplotlib.pyplot as plt
    from resum.plots.family import _draw
    fig, ax = plt.subplots()
    _draw(ax, {"": ([1.0, 2.0], [1.0, 1.0], [0.9, 0.9], [1.1, 1.1], [])}, "analysis", "o")
    _draw(ax, {"": ([1.0], [1.0], [0.9], [1.1], [2.0])}, "ratio estimate", "s", lines=False)
    cross = [ln for ln in ax.get_lines() if ln.get_marker() == "x"]
    assert len(cross) == 1 and list(cross[0].get_xdata()) == [2.0]
    assert cross[0].get_label() == "ratio estimate: failed or not converged"
    square = next(ln for ln in ax.get_lines() if ln.get_marker() == "s")
    assert cross[0].get_color() == square.get_color()
    plt.close(fig)


def test_a_legend_that_would_cover_points_goes_beside_the_panel():
    """Six series whose points fill the panel, so no corner is free for the legend: after
    the layout no drawn point (marker edge included) lies under any legend."""
    import matplotlib.pyplot as plt
    from resum.plots.family import _covered_points, _draw, _finish, legends_clear_of_data
    fig, ax = plt.subplots(figsize=(6.4, 3.2))
    xs = [float(i) for i in range(8)]
    for j in range(6):
        ys = [j + 0.5 * (i % 2) for i in range(8)]
        _draw(ax, {"": (xs, ys, ys, ys, [])}, f"band at {j}", "o")
    _finish(ax, "state", "digits")
    fig.tight_layout()
    fig.canvas.draw()
    covered_before = _covered_points(ax, fig.canvas.get_renderer())
    moved = legends_clear_of_data(fig)
    fig.canvas.draw()
    assert covered_before > 0 and moved == [ax]     # the case this guards: "best" found no corner
    assert _covered_points(ax, fig.canvas.get_renderer()) == 0
    plt.close(fig)
    # a panel with a free corner keeps its legend inside
    fig, ax = plt.subplots()
    ax.errorbar([1, 2], [1, 1.1], yerr=0.01, fmt="o", label="a")
    ax.legend(loc="best")
    assert legends_clear_of_data(fig) == []
    plt.close(fig)


def test_strong_figure_has_one_panel_when_no_fit_converged_and_no_unasked_fit():
    """No point's fit converged: one panel with the reason, not a column of empty frames; a
    failed point gets no cross for the fit to the source's values when no point made that fit."""
    import matplotlib.pyplot as plt
    from resum.plots.family import plot_strong, strong_keys, strong_panels
    bad = {"success": False, "status": "not converged",
           "coefficients": {"x^-3/4": {"value": "1.3", "lo": "1.2", "hi": "1.4"},
                            "x^-7/4": {"value": "0", "lo": "-10", "hi": "10"}},
           "leading_power": {"value": "-0.79", "lo": "-0.84", "hi": "-0.74"}}
    recs = [{"index": i, "key": f"p{i:05d}", "status": "ok", "params": {"orders": str(n)},
             "labels": {"orders": str(n)}, "axes": ["orders"], "task_names": ["strong"],
             "tasks": {"strong": {"resummed": bad}}} for i, n in enumerate((15, 25))]
    recs.append({"index": 2, "key": "p00002", "status": "failed", "params": {"orders": "40"},
                 "labels": {"orders": "40"}, "axes": ["orders"], "task_names": ["strong"],
                 "tasks": {}})
    assert len(strong_keys(recs)) == 3 and strong_panels(recs) == ["x^-3/4"]
    ax = plot_strong(recs, "x^-3/4", x="orders")
    labels = [ln.get_label() for ln in ax.get_lines() if ln.get_marker() == "x"]
    assert labels == ["from the resummed series: failed or not converged"]
    plt.close("all")
    good = dict(bad, success=True, status="converged")
    recs[0]["tasks"]["strong"]["resummed"] = good
    assert strong_panels(recs) == ["x^-3/4", "x^-7/4", "leading_power"]


def test_strong_leading_panel_draws_the_highest_power():
    """A point whose power was read as a decimal gets a "leading coefficient" panel; it must show
    the coefficient of the highest power, not the first key of the sorted record."""
    import matplotlib.pyplot as plt
    from resum.plots.family import plot_strong, strong_keys

    def rec(i, coeffs, power):
        return {"index": i, "key": f"p{i:05d}", "status": "ok", "params": {"angle": str(i)},
                "labels": {"angle": str(i)}, "axes": ["angle"], "task_names": ["strong"],
                "tasks": {"strong": {"resummed": {
                    "success": True, "status": "converged", "power_source": "log-derivative",
                    "leading_power": {"value": power, "lo": power, "hi": power},
                    "coefficients": dict(sorted(coeffs.items()))}}}}
    recs = [rec(0, {"g^1": {"value": "1.27", "lo": "1.26", "hi": "1.28"},
                    "g^-1": {"value": "0.0004", "lo": "-0.02", "hi": "0.02"}}, "1"),
            rec(1, {"g^0.94526707": {"value": "4.79", "lo": "4.71", "hi": "4.88"},
                    "g^-0.054732927": {"value": "-2.53", "lo": "-2.81", "hi": "-2.24"}}, "0.9453")]
    assert strong_keys(recs)[0] == "leading"
    ax = plot_strong(recs, "leading", x="angle")
    ys = [y for ln in ax.get_lines() if ln.get_marker() == "o" for y in ln.get_ydata()]
    assert ys == [1.27, 4.79]
    plt.close("all")


def test_groups_in_one_colour_differ_in_marker_and_line():
    """Values at one coupling share a colour; two states on the grid must still be told apart:
    different markers and line styles for the resummed values, different open markers for the
    source's values, each labelled with its state."""
    import matplotlib.pyplot as plt
    from resum.plots.family import plot_values

    def rec(i, state, orders, v):
        return {"index": i, "key": f"p{i:05d}", "status": "ok", "axes": ["state", "orders"],
                "params": {"state": str(state), "orders": str(orders)},
                "labels": {"state": str(state), "orders": str(orders)},
                "task_names": ["evaluate", "truth"],
                "tasks": {"evaluate": {"values": [{"at": "1", "value": v, "lo": v, "hi": v}]},
                          "truth": {"values": [{"at": "1", "value": v, "lo": v, "hi": v}]}}}
    recs = [rec(0, 0, 20, "1.39"), rec(1, 0, 30, "1.39"), rec(2, 1, 20, "4.65"),
            rec(3, 1, 30, "4.65")]
    ax = plot_values(recs, x="orders")
    handles, labels = ax.get_legend_handles_labels()   # errorbar: the label is on the container
    filled = {lab: h.lines[0] for h, lab in zip(handles, labels) if lab.startswith("resummed")}
    a, b = filled["resummed at 1, state=0"], filled["resummed at 1, state=1"]
    assert a.get_color() == b.get_color()
    assert a.get_marker() != b.get_marker() and a.get_linestyle() != b.get_linestyle()
    open_ = {ln.get_label(): ln.get_marker() for ln in ax.get_lines()
             if ln.get_label().startswith("truth")}
    assert set(open_) == {"truth at 1, state=0", "truth at 1, state=1"}
    assert len(set(open_.values())) == 2
    plt.close("all")


def test_crosses_at_one_x_are_stacked():
    """Two estimates missing at the same x: both crosses are visible, one above the other."""
    import matplotlib.pyplot as plt
    from resum.plots.family import _draw
    fig, ax = plt.subplots()
    _draw(ax, {"": ([1.0], [1.0], [1.0], [1.0], [2.0])}, "analysis", "o")
    _draw(ax, {"": ([], [], [], [], [2.0])}, "ratio estimate", "s", lines=False)
    ys = sorted(y for ln in ax.get_lines() if ln.get_marker() == "x" for y in ln.get_ydata())
    assert len(ys) == 2 and ys[0] == 0 and ys[1] > 0.02
    plt.close(fig)
