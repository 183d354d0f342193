"""Borel-plane singularity and resummed energies of the quartic oscillator.

    python studies/oscillator_family/run.py [--jobs N | --cluster ADDRESS] [--fresh]

Runs spec.toml with `resum scan` into out/ (resuming), then prints the
large-order data per level and the resummed energies against
diagonalisation. Figures: out/plots/borel.png, out/plots/values.png.
"""
import sys
from pathlib import Path

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE.parents[1]))          # run from a checkout

import mpmath  # noqa: E402

from resum.batch.studyrun import bands_overlap, est, run_study, table  # noqa: E402


def main():
    records, seconds, rc = run_study(HERE, sys.argv[1:])
    rows = []
    for r in records:
        an = r["tasks"].get("analyze") or {}
        ratio = (r["tasks"].get("coefficients") or {}).get("ratio") or {}
        borel = an.get("borel") or {}
        # Bender and Wu, Phys. Rev. D 7 (1973) 1620 (from memory, in this
        # normalisation): c_n ~ (-1)^(n+1) C_K (3/2)^n Gamma(n + K + 1/2), so
        # A = -2/3 and b = K + 1/2 for every level K
        rows.append([r["params"]["state"], an.get("growth", "-"), est(borel.get("A")),
                     est(borel.get("b")), est(ratio.get("borel_distance")), "-2/3",
                     f"{int(r['params']['state']) + 0.5}", an.get("status", r["status"])])
    print()
    table(rows, ["level", "growth", "A (analysis)", "b (analysis)", "|A| (ratio)", "A expected",
                 "b expected", "status"])
    rows = []
    for r in records:
        ev = {mpmath.mpf(v["at"]): v for v in (r["tasks"].get("evaluate") or {}).get("values", [])}
        tr = {mpmath.mpf(v["at"]): v for v in (r["tasks"].get("truth") or {}).get("values", [])}
        for g in sorted(ev):
            v, t = ev[g], tr.get(g, {})
            inside = "-"
            if v.get("value") not in (None, "nan") and t.get("value") not in (None, "nan"):
                with mpmath.workdps(40):
                    tv = mpmath.mpf(t["value"])
                    # the two bands overlap: resummation and diagonalisation agree
                    inside = "yes" if bands_overlap(v, t) else "NO"
                    dev = mpmath.nstr(mpmath.mpf(v["value"]) - tv, 2)
            else:
                dev = "-"
            rows.append([r["params"]["state"], mpmath.nstr(g, 3), est(v), v.get("method", "-"),
                         est(t), dev, inside])
    print()
    table(rows, ["level", "g", "resummed", "method", "diagonalisation", "difference",
                 "bands overlap"])
    print(f"\n{len(records)} points, {seconds:.0f} s; records in {HERE / 'out'}, "
          f"figures in {HERE / 'out' / 'plots'}")
    return rc


if __name__ == "__main__":
    sys.exit(main())
