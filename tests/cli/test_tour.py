"""`resum tour` end to end (about 8 s): every file it lists is written, each resummed band
holds the finite-coupling value of the kernel source (its own tests check it against the
published cusp values and the closed form at angle 0), and the strong-coupling section is
there with its figure. The tour's scenario is our own."""
import json

from resum.cli import main


def test_tour_writes_its_report_and_every_band_holds(tmp_path, capsys):
    out = tmp_path / "t"
    assert main(["tour", "-o", str(out)]) == 0
    report = (out / "report.md").read_text()
    assert report.strip() in capsys.readouterr().out          # printed as well
    assert "5 of 5 bands contain the independent value." in report
    comp = json.loads((out / "comparison.json").read_text())
    assert all(r["in_band"] for r in comp["rows"])
    assert "## Strong coupling" in report and "leading power p = 1 " in report
    strong = json.loads((out / "strong.json").read_text())
    assert strong["success"] and strong["coefficients"][0][0] == "g^1"
    for name in ("series.json", "analysis.json", "evaluation.json", "strong.json", "strong.png",
                 "evaluation.png"):
        assert (out / name).stat().st_size > 0, name
    assert "- strong.png" in report and "- strong.json: the strong-coupling probe" in report
