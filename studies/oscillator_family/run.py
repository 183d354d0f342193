"""Borel-plane singularity, resummed energies and strong-coupling coefficients of the quartic
oscillator.

    python studies/oscillator_family/run.py [--jobs N | --cluster ADDRESS] [--fresh]

Runs spec.toml with `resum scan` into out/ (resuming), then prints the
large-order data per level, the resummed energies against diagonalisation and
the strong-coupling coefficients against the levels of p^2 + y^4, computed
here by finite differences. Figures: out/plots/borel.png, out/plots/values.png,
out/plots/strong.png, out/plots/strong_vs_quartic.png.
"""
import sys
from pathlib import Path

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE.parents[1]))          # run from a checkout

import mpmath  # noqa: E402

from resum.batch.studyrun import bands_overlap, est, run_study, table  # noqa: E402


def _quartic_levels(k, n, lam=0.0):
    """The k lowest levels of p^2 + y^4 + lam y^2 by finite differences (scipy), the tests' own
    outside reference (tests/known_series.py: quartic_levels)."""
    from tests.known_series import quartic_levels
    return quartic_levels(k, n, lam)


def quartic_reference(k):
    """Levels e_n of p^2 + y^4 and <y^2> in them (n < k), independently of the project.

    H = p^2 + x^2 + g x^4 with x = g^(-1/6) y is g^(1/3) (p^2 + y^4 + g^(-2/3) y^2), so
    E_n(g) = e_n g^(1/3) + <y^2>_n g^(-1/3) + ... (scaling and first-order perturbation theory,
    common practice, no source). e_n: grids of 2000 and 4000 points on [-8, 8], extrapolated in
    h^4 (Richardson); the error quoted is the whole change from 2000 to 4000 points (at most
    2.3e-7, level 5), far below the fitted bands. <y^2>_n = de_n/dlam at lam = 0
    (Hellmann-Feynman), central difference with dlam = 1e-4 on 4000 points; the error quoted is
    the change from 2000 points. Returns two lists of (value, error) floats."""
    a, b = _quartic_levels(k, 2000), _quartic_levels(k, 4000)
    e = [((16 * y - x) / 15, abs(y - x)) for x, y in zip(a, b)]
    d = 1e-4
    c2 = (_quartic_levels(k, 2000, d) - _quartic_levels(k, 2000, -d)) / (2 * d)
    c4 = (_quartic_levels(k, 4000, d) - _quartic_levels(k, 4000, -d)) / (2 * d)
    return e, [(y, abs(y - x)) for x, y in zip(c2, c4)]


def _ref(v, err):
    """A finite-difference reference as value(error) text, digits as its error allows."""
    return est({"value": repr(float(v)), "lo": repr(float(v - err)), "hi": repr(float(v + err))})


def _coef(s, power):
    """The strong-coupling fit's coefficient of g^power (a record dict), or None."""
    co = (s or {}).get("coefficients") or {}
    return co.get(f"g^{power}")


def _dev(d, ref):
    """(fit - reference) and the band's half-widths below and above, as floats."""
    v = float(d["value"])
    return v - ref, v - float(d["lo"]), float(d["hi"]) - v


def strong_figure(records, refs, stem):
    """Fitted coefficients of g^(1/3) and g^(-1/3) minus the levels of p^2 + y^4 and <y^2> in
    them, relative to those, with the fitted bands; the chosen spacing beside each point."""
    import matplotlib
    matplotlib.use("Agg")
    import matplotlib.pyplot as plt
    fig, axes = plt.subplots(2, 1, figsize=(6.4, 6.4), sharex=True)
    for ax, power, which, name in ((axes[0], "1/3", 0, "e_n (levels of p^2 + y^4)"),
                                   (axes[1], "-1/3", 1, "<y^2>_n")):
        xs, ys, lo, hi = [], [], [], []
        for r in records:
            k = int(r["params"]["state"])
            s = (r["tasks"].get("strong") or {}).get("resummed")
            d = _coef(s, power)
            if d is None:
                continue
            ref = refs[which][k][0]
            dv, dl, dh = _dev(d, ref)
            xs.append(k)
            ys.append(dv / ref)
            lo.append(dl / ref)
            hi.append(dh / ref)
            if which == 0:
                ax.annotate(f"S = {s.get('spacing')}", (k, dv / ref + dh / ref), fontsize=7,
                            ha="center", xytext=(0, 4), textcoords="offset points")
        ax.errorbar(xs, ys, yerr=[lo, hi], fmt="o", ms=4, capsize=2.5,
                    label=f"fit to the resummed series (band) against {name}")
        ax.axhline(0, color="k", lw=0.8, ls="--")
        ax.set_ylabel(f"g^{power} coefficient: (fit - {name.split(' ')[0]}) / {name.split(' ')[0]}",
                      fontsize=8)
        ax.margins(y=0.18)
        ax.legend(fontsize=8, loc="lower left")
        ax.grid(alpha=0.3)
    axes[1].set_xlabel("level n")
    axes[1].set_xticks(sorted({int(r["params"]["state"]) for r in records}))
    fig.suptitle("E_n(g) = e_n g^(1/3) + <y^2>_n g^(-1/3) + ...: fit against finite differences",
                 fontsize=9)
    fig.tight_layout()
    for ext in ("png", "pdf"):
        fig.savefig(f"{stem}.{ext}", dpi=130)
    plt.close(fig)


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
    # the strong-coupling fit against the levels of p^2 + y^4 (finite differences, above)
    levels = [int(r["params"]["state"]) for r in records]
    refs = quartic_reference(max(levels) + 1) if levels else ([], [])
    rows = []
    for r in records:
        k = int(r["params"]["state"])
        s = (r["tasks"].get("strong") or {}).get("resummed") or {}
        e, c = _coef(s, "1/3"), _coef(s, "-1/3")
        (ek, ek_err), (ck, ck_err) = refs[0][k], refs[1][k]

        def inside(d, ref, err):
            if d is None:
                return "-"
            return "yes" if float(d["lo"]) - err <= ref <= float(d["hi"]) + err else "NO"
        # the power as the probe settled it ("log-derivative 0.333299 rounded to 1/3")
        rows.append([k, s.get("status", "-"), s.get("power_source") or est(s.get("leading_power")),
                     s.get("spacing") or "-", s.get("trusted_up_to") or "-", est(e), _ref(ek, ek_err),
                     inside(e, ek, ek_err), est(c), _ref(ck, ck_err), inside(c, ck, ck_err)])
    print()
    table(rows, ["level", "strong fit", "leading power", "spacing", "trusted to g", "g^1/3 coef.",
                 "e_n (p^2+y^4)", "inside", "g^-1/3 coef.", "<y^2>_n", "inside"])
    print("e_n, <y^2>_n: finite differences on 2000 and 4000 points, error = the change between them")
    if records:
        (HERE / "out" / "plots").mkdir(parents=True, exist_ok=True)
        strong_figure(records, refs, HERE / "out" / "plots" / "strong_vs_quartic")
    print(f"\n{len(records)} points, {seconds:.0f} s; records in {HERE / 'out'}, "
          f"figures in {HERE / 'out' / 'plots'}")
    return rc


if __name__ == "__main__":
    sys.exit(main())
