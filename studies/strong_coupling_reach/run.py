"""How far into strong coupling the weak-coupling series of F_a(g) reaches.

    python studies/strong_coupling_reach/run.py [--jobs N | --cluster ADDRESS] [--fresh]

Runs spec.toml with `resum scan` into out/ (resuming), then prints the
resummed values against the finite-coupling evaluator and the fitted
strong-coupling coefficients per angle. Figures: out/plots/values.png,
out/plots/strong.png.
"""
import sys
from pathlib import Path

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE.parents[1]))          # run from a checkout

import mpmath  # noqa: E402

from resum.batch.studyrun import bands_overlap, est, run_study, table  # noqa: E402


def references(a):
    """Known strong-coupling coefficients {label: value} at special angles."""
    pi = mpmath.pi
    if a == 0:
        # F_0 = (2/pi^2) log cosh(2 pi g) = (4/pi) g - 2 log 2 / pi^2 + O(e^(-4 pi g))
        # (closed form of the source at a = 0)
        return {"g^1": 4 / pi, "g^0": -2 * mpmath.log(2) / pi ** 2}
    if abs(a - pi / 4) < mpmath.mpf(10) ** -20:
        # cusp anomalous dimension: 2 g - 3 log 2 / (2 pi) - K / (8 pi^2 g) + ...
        # (Basso, Korchemsky, Kotanski, Phys. Rev. Lett. 100 (2008) 091601; from memory)
        return {"g^1": mpmath.mpf(2), "g^0": -3 * mpmath.log(2) / (2 * pi),
                "g^-1": -mpmath.catalan / (8 * pi ** 2)}
    if abs(a - pi / 2) < mpmath.mpf(10) ** -20:
        return {"g^2": mpmath.mpf(4)}          # F_(pi/2) = 4 g^2 exactly (source docstring)
    return {}


def main():
    records, seconds, rc = run_study(HERE, sys.argv[1:])
    rows, reach = [], {}
    with mpmath.workdps(40):
        for r in records:
            a = mpmath.mpf(r["params"]["angle"])
            ev = {mpmath.mpf(v["at"]): v for v in (r["tasks"].get("evaluate") or {}).get("values", [])}
            tr = {mpmath.mpf(v["at"]): v for v in (r["tasks"].get("truth") or {}).get("values", [])}
            for g in sorted(ev):
                v, t = ev[g], tr.get(g, {})
                ok = v.get("value") not in (None, "nan") and t.get("value") not in (None, "nan")
                inside, digits = "-", "-"
                if ok:
                    tv = mpmath.mpf(t["value"])
                    lo, hi = mpmath.mpf(v["lo"]), mpmath.mpf(v["hi"])
                    # the two bands overlap: resummation and evaluator agree
                    inside = "yes" if bands_overlap(v, t) else "NO"
                    w = max(hi - mpmath.mpf(v["value"]), mpmath.mpf(v["value"]) - lo)
                    digits = f"{float(-mpmath.log10(w / abs(tv))):.1f}" if w > 0 else "all"
                    if inside == "yes" and w < abs(tv) / 1000:
                        reach[r["key"]] = max(g, reach.get(r["key"], 0))
                rows.append([f"{float(a):.4f}", mpmath.nstr(g, 3), est(v), est(t), digits, inside])
    print()
    table(rows, ["angle a", "g", "resummed", "finite-coupling evaluator", "digits (resummed)",
                 "bands overlap"])

    rows = []
    for r in records:
        a = mpmath.mpf(r["params"]["angle"])
        st = r["tasks"].get("strong") or {}
        ref = references(a)
        for kind in ("resummed", "truth"):
            d = st.get(kind) or {}
            co = d.get("coefficients") or {}
            p = d.get("leading_power")
            lead = nxt = "-"
            if p:
                pv = int(round(float(p["value"])))
                lead = f"g^{pv}: {est(co.get(f'g^{pv}'))}"
                nxt = f"g^{pv - 1}: {est(co.get(f'g^{pv - 1}'))}"
            rows.append([f"{float(a):.4f}", "resummed series" if kind == "resummed" else "evaluator",
                         est(p), lead, nxt, d.get("trusted_up_to") or "-", d.get("status", "-")])
        if ref:
            ks = sorted(ref, key=lambda k: -int(k.split("^")[1]))
            rows.append([f"{float(a):.4f}", "reference", ks[0].split("^")[1],
                         f"{ks[0]}: {mpmath.nstr(ref[ks[0]], 10)}",
                         f"{ks[1]}: {mpmath.nstr(ref[ks[1]], 10)}" if len(ks) > 1 else "-", "", ""])
        if 0 < a < mpmath.pi / 2:
            # a pattern the fits follow (an observation of this study, not a known result)
            rows.append([f"{float(a):.4f}", "8a/(pi sin 2a)", "", mpmath.nstr(
                8 * a / (mpmath.pi * mpmath.sin(2 * a)), 8), "", "", ""])
        rows.append([f"{float(a):.4f}", "reach (band < 1e-3, agrees)", "",
                     mpmath.nstr(reach.get(r["key"], 0), 3), "", "", ""])
    print()
    table(rows, ["angle a", "fitted to", "leading power p", "coefficient of g^p",
                 "next coefficient", "trusted up to g", "status"])
    print(f"\n{len(records)} points, {seconds:.0f} s; records in {HERE / 'out'}, "
          f"figures in {HERE / 'out' / 'plots'}")
    return rc


if __name__ == "__main__":
    sys.exit(main())
