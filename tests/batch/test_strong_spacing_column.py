"""The family summary says which spacing the strong-coupling fit used.

H = p^2 + x^2 + g x^4 with x = g^(-1/6) y is g^(1/3) (p^2 + y^4 + g^(-2/3) y^2), so
E_n(g) = g^(1/3) (e_n + <y^2>_n g^(-2/3) + ...): powers 1/3, -1/3, -1, ... spaced by 2/3
(scaling, common practice, no source). e_n, the levels of p^2 + y^4, come from an independent
finite-difference diagonalization (scipy; tests/resummation/test_strong_spacing.py::_quartic,
checked there against e_0 = 1.0603620905, e_1 = 3.7996730298, from memory).
"""
import csv
import io

import mpmath

from resum.batch import RunFolder, SerialRunner, parse_spec, run_family
from tests.resummation.test_strong_spacing import FD_TOL, _quartic

# the fit to the source's diagonalisation at large g (from_truth, no resummation): about a
# second; 10 digits asked, so that a fit of a few powers matches the values within their bands
SPEC = """
[study]
name = "osc-strong-spacing"
source = "oscillator"
dps = 20
[fixed]
orders = 10
[axes]
state = { values = [0, 1] }
[tasks.strong]
couplings = [100, 200, 400, 800, 1600, 3200, 6400]
resummed = false
from_truth = true
truth_dps = 10
"""


def test_summary_has_the_chosen_spacing_and_the_fit_holds_the_quartic_levels(tmp_path):
    spec = parse_spec(SPEC, path="spec.toml")
    out = run_family(spec, tmp_path / "o", runner=SerialRunner(), quiet=True, plots=False)
    assert out.counts["ok"] == 2, out.counts
    rows = {r["state"]: r for r in csv.DictReader(io.StringIO((tmp_path / "o" / "summary.csv").read_text()))}
    recs = {r["labels"]["state"]: r for r in RunFolder(tmp_path / "o").records()}
    fd = _quartic()
    with mpmath.workdps(30):
        for k in (0, 1):
            row, fit = rows[str(k)], recs[str(k)]["tasks"]["strong"]["truth"]
            # the column is the record's spacing, chosen automatically (none was given)
            assert fit["spacing_source"].startswith("automatic"), fit["spacing_source"]
            assert row["strong_truth_spacing"] == fit["spacing"] == "2/3", row
            assert "strong_resummed_spacing" not in row           # resummed = false: no fit
            lo, hi = mpmath.mpf(row["strong_truth_g^1/3_lo"]), mpmath.mpf(row["strong_truth_g^1/3_hi"])
            assert lo - FD_TOL <= fd[k] <= hi + FD_TOL, (k, lo, hi, fd[k])
            assert hi - lo < 1e-6, (lo, hi)                           # measured: 6e-8 wide
