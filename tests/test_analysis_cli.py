"""`resum analyze` in process: text report, JSON contract, plots, exit codes."""
import json
from fractions import Fraction

import mpmath

from resum import Series
from resum.analysis import AnalysisResult, analyze
from resum.cli import main
from resum.context import Context
from resum.series.io import write_series

from tests.estimators.refs import binomial_power, catalan, complex_pair


def test_text_report_states_bands(tmp_path, capsys):
    # Catalan g.f.: radius 1/4, exponent 1/2 (common practice, no source)
    p = write_series(Series(catalan(40), name="catalan"), tmp_path / "c.json")
    assert main(["analyze", str(p), "--no-verify"]) == 0
    out = capsys.readouterr().out
    assert "radius of convergence in x: 0.25" in out
    assert "algebraic branch point" in out
    assert "how to read the bands" in out and "not a proof" in out


def test_json_contract_only_on_stdout(tmp_path, capsys):
    p = write_series(Series(binomial_power(Fraction(-1, 3), 40, scale=2)), tmp_path / "a.txt")
    assert main(["analyze", str(p), "--json", "--methods", "ratio,dlog"]) == 0
    cap = capsys.readouterr()
    doc = json.loads(cap.out)
    assert mpmath.mpf(doc["radius"]["lo"]) <= 0.5 <= mpmath.mpf(doc["radius"]["hi"])
    s = doc["singularities"][0]
    assert mpmath.mpf(s["exponent"]["lo"]) <= mpmath.mpf(-1) / 3 <= mpmath.mpf(s["exponent"]["hi"])
    assert s["kind"] == "branch"
    assert "resum:" in cap.err          # logs go to stderr


def test_unknown_method_exit_2(tmp_path, capsys):
    p = write_series(Series(catalan(30)), tmp_path / "c.json")
    assert main(["analyze", str(p), "--methods", "ratio,bogus"]) == 2
    err = capsys.readouterr().err
    assert "bogus" in err and "diff-approx" in err and len(err.strip().splitlines()) == 1


def test_plots_written(tmp_path, capsys):
    # 1/(1 - x + x^2)^(2/5): a conjugate pair on the unit circle (common practice)
    s = Series(complex_pair(40, 60), digits=50, name="pair")
    p = write_series(s, tmp_path / "pair.json")
    out = tmp_path / "figs"
    assert main(["analyze", str(p), "--plot", str(out), "--no-verify", "--json"]) == 0
    files = sorted(f.name for f in out.iterdir())
    assert any("complex_plane" in f for f in files)
    assert all((out / f).stat().st_size > 1000 for f in files)


def test_plots_from_round_tripped_result(tmp_path):
    from resum.plots.analysis import write_analysis_plots
    r = analyze(Series(catalan(40), name="cat"), Context(dps=40), verify=False)
    back = AnalysisResult.from_dict(json.loads(json.dumps(r.to_dict())))
    paths = write_analysis_plots(back, Series(catalan(40), name="cat"), tmp_path)
    assert len(paths) == 3
