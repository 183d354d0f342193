"""Radius of convergence and nearest singularities of F_a against the angle a.

    python studies/bes_angles/run.py [--jobs N | --cluster ADDRESS] [--fresh]

Runs spec.toml with `resum scan` into out/ (resuming), then prints one row
per angle. Figures: out/plots/radius.png, out/plots/singularities.png.
"""
import sys
from pathlib import Path

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE.parents[1]))          # run from a checkout

import mpmath  # noqa: E402

from resum.batch.studyrun import est, run_study, table  # noqa: E402


def main():
    records, seconds, rc = run_study(HERE, sys.argv[1:])
    rows = []
    for r in records:
        a = mpmath.mpf(r["params"]["angle"])
        an = r["tasks"].get("analyze") or {}
        ratio = (r["tasks"].get("coefficients") or {}).get("ratio") or {}
        s1 = (an.get("singularities") or [{}])[0]
        rows.append([
            f"{float(a):.5f}", f"{float(2 * a / mpmath.pi):.4f}",
            est(an.get("radius")), est(ratio.get("radius")),
            est(s1.get("re_band")), est(s1.get("im_band")), est(s1.get("exponent")),
            s1.get("kind", "-"), len(an.get("singularities") or []),
            an.get("status", r["status"])])
    print()
    table(rows, ["angle a", "2a/pi", "radius (analysis)", "radius (ratio)", "Re x_c", "Im x_c",
                 "exponent", "kind", "#sing", "status"])
    print(f"\n{len(records)} points, {seconds:.0f} s; records in {HERE / 'out'}, "
          f"figures in {HERE / 'out' / 'plots'}")
    return rc


if __name__ == "__main__":
    sys.exit(main())
