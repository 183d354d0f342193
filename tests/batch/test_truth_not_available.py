"""A point whose source has no finite-coupling value keeps everything else.

Euler's series sum s^n n! x^n: for s = -1 the Borel sum is
int_0^oo e^-t/(1 + x t) dt = e^(1/x) E_1(1/x) / x (x > 0), from the definition
E_1(z) = int_z^oo e^-u/u du (DLMF 6.2.1) with u = z (1 + x t), z = 1/x.
For s = +1 the Borel transform 1/(1 - t) has a pole on the integration path:
the lateral sums are e^(-1/x) Ei(1/x) / x -+ i pi e^(-1/x) / x, complex, and the
source has no finite-coupling value to compare with. (Euler series, Borel sum
through the exponential integral: common practice, no source.)
"""
import csv
import io
import json

import mpmath
import pytest

from resum.batch import RunFolder, SerialRunner, parse_spec, run_family

SPEC = """
[study]
name = "euler-signs"
source = "euler"
dps = 20
[fixed]
orders = 24
[axes]
sign = { values = [-1, 1] }
[tasks.analyze]
verify = false
[tasks.evaluate]
at = [0.1, "1/5"]
verify = false
[tasks.truth]
at = [0.1, "1/5"]
"""


def _mpf(s):
    return mpmath.mpf(s)


def test_missing_truth_is_recorded_and_the_point_keeps_its_estimates(tmp_path):
    spec = parse_spec(SPEC, path="spec.toml")
    out = run_family(spec, tmp_path / "o", runner=SerialRunner(), quiet=True, plots=False)
    assert out.counts["ok"] == 2 and out.counts["failed"] == 0
    recs = {r["labels"]["sign"]: r for r in RunFolder(tmp_path / "o").records()}

    with mpmath.workdps(40):
        # sign = -1: resummed values and the source's truth agree with mpmath's E_1
        alt = recs["-1"]
        assert alt["status"] == "ok" and alt["tasks"]["truth"]["status"] == "ok"
        for ev, tr in zip(alt["tasks"]["evaluate"]["values"], alt["tasks"]["truth"]["values"]):
            x = _mpf(ev["at"])
            ref = mpmath.exp(1 / x) * mpmath.e1(1 / x) / x
            assert _mpf(ev["lo"]) <= ref <= _mpf(ev["hi"])
            assert abs(_mpf(tr["value"]) - ref) < abs(ref) * mpmath.mpf(10) ** -18

        # sign = +1: the point is ok, analysis and lateral sums kept, the truth says why not
        same = recs["1"]
        assert same["status"] == "ok" and same["error"] is None
        assert same["tasks"]["analyze"]["growth"] == "factorial"
        for ev in same["tasks"]["evaluate"]["values"]:
            x = _mpf(ev["at"])
            re_ref = mpmath.exp(-1 / x) * mpmath.ei(1 / x) / x
            im_ref = mpmath.pi * mpmath.exp(-1 / x) / x
            assert _mpf(ev["lo"]) <= re_ref <= _mpf(ev["hi"])
            assert _mpf(ev["im_lo"]) <= im_ref <= _mpf(ev["im_hi"])
        truth = same["tasks"]["truth"]
        assert truth["status"] == "not available"
        assert truth["message"].startswith("not available: ")
        assert "Borel summable" in truth["message"]
        assert [v["value"] for v in truth["values"]] == [None, None]

    # summary: the point is ok, its values are there, its truth cells are empty
    rows = {r["sign"]: r for r in csv.DictReader(io.StringIO((tmp_path / "o" / "summary.csv").read_text()))}
    assert rows["1"]["status"] == "ok" and rows["1"]["truth_status"] == "not available"
    assert rows["1"]["value@0.1"] and rows["1"]["value_im@0.1"]
    assert rows["1"]["truth@0.1"] == "" and rows["1"]["truth@0.2"] == ""
    assert rows["-1"]["truth@0.1"] and rows["-1"]["truth_status"] == "ok"
    assert json.loads((tmp_path / "o" / "summary.json").read_text())["counts"]["failed"] == 0

    # plots: the resummed values at both signs, the truth only where there is one
    pytest.importorskip("matplotlib")
    import matplotlib.pyplot as plt
    from resum.plots.family import plot_values
    ax = plot_values(list(recs.values()), x="sign")
    truth_x = sorted(x for line in ax.get_lines() if str(line.get_label()).startswith("truth")
                     for x in line.get_xdata())
    assert truth_x == [-1, -1]
    assert not [line for line in ax.get_lines() if line.get_marker() == "x"]    # no crosses
    plt.close("all")
