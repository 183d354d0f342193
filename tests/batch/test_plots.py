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
