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


def figure(records, stem):
    """Exponents of every singularity found within 1 % of x = -1/16,
    against the angle, with the line 2a/pi drawn as a guide to the eye."""
    import matplotlib
    matplotlib.use("Agg")
    import matplotlib.pyplot as plt
    fig, ax = plt.subplots(figsize=(6.4, 4.4))
    xs, ys, lo, hi = [], [], [], []
    for r in records:
        a = float(mpmath.mpf(r["params"]["angle"]))
        for s in (r["tasks"].get("analyze") or {}).get("singularities") or []:
            re, ex = s.get("re_band") or {}, s.get("exponent")
            if not ex or not re:
                continue
            if abs(float(re["value"]) + 1 / 16) > 0.01 / 16:
                continue
            xs.append(a)
            ys.append(float(ex["value"]))
            lo.append(float(ex["value"]) - float(ex["lo"]))
            hi.append(float(ex["hi"]) - float(ex["value"]))
    ax.errorbar(xs, ys, yerr=[lo, hi], fmt="o", ms=4, capsize=2.5,
                label="exponent at x = -1/16 (analysis, with band)")
    grid = [k * float(mpmath.pi) / 200 for k in range(101)]
    ax.plot(grid, [2 * g / float(mpmath.pi) for g in grid], "k--", lw=0.8,
            label="2a/pi (guide to the eye)")
    ax.set_ylim(-0.2, 1.6)
    ax.set_xlabel("angle a")
    ax.set_ylabel("exponent of (1 + 16 x)")
    ax.legend(fontsize=8)
    ax.grid(alpha=0.3)
    fig.tight_layout()
    for ext in ("png", "pdf"):
        fig.savefig(f"{stem}.{ext}", dpi=130)
    plt.close(fig)


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
    figure(records, HERE / "out" / "plots" / "exponent_vs_angle")
    print(f"\n{len(records)} points, {seconds:.0f} s; records in {HERE / 'out'}, "
          f"figures in {HERE / 'out' / 'plots'}")
    return rc


if __name__ == "__main__":
    sys.exit(main())
