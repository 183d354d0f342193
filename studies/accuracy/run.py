"""Accuracy study: digits reached against ground truth, band width and coverage.

Run from the repository root:

    python studies/accuracy/run.py            # full table (several minutes)
    python studies/accuracy/run.py --quick    # fewer cases

Prints one row per (case, point): digits actually correct (against a truth
computed independently of the series), digits the band claims, band/error
ratio, whether the truth is inside the band, and the digits of a plain method
beside it. Truth values are cached in studies/accuracy/out/ (ignored by git).

Truths: oscillator -- basis diagonalization (resum.sources.oscillator.energy);
phi4 -- Bessel closed form; Euler series -- e^{1/x} E_1(1/x)/x (mpmath); BES
family -- (2/pi^2) log cosh(2 pi g) at a = 0, the finite-coupling kernel solver
(resum.sources.bes.finite_coupling) at other angles.
"""
from __future__ import annotations

import argparse
import json
import math
import os
import sys
import time

HERE = os.path.dirname(os.path.abspath(__file__))
sys.path.insert(0, os.path.dirname(os.path.dirname(HERE)))

import mpmath  # noqa: E402

from resum.context import Context, workdps  # noqa: E402
from resum.resummation import evaluate  # noqa: E402
from resum.series import Series  # noqa: E402

OUT = os.path.join(HERE, "out")
DPS = 30          # digits asked; a band at this floor is marked "capped" (not a width test)


def _cache():
    path = os.path.join(OUT, "truth.json")
    if os.path.exists(path):
        with open(path) as fh:
            return json.load(fh)
    return {}


def _save(cache):
    os.makedirs(OUT, exist_ok=True)
    with open(os.path.join(OUT, "truth.json"), "w") as fh:
        json.dump(cache, fh, indent=1)


def truth(cache, key, fn):
    if key not in cache:
        cache[key] = fn()
        _save(cache)
    with workdps(80):
        return mpmath.mpf(cache[key])


def t_oscillator(g):
    from resum.sources import oscillator
    r = oscillator.energy(g, 0, Context(dps=45))
    with workdps(60):
        return mpmath.nstr(r.value.value, 45)


def t_phi4(g):
    with workdps(60):
        G = mpmath.mpf(g)
        v = mpmath.exp(1 / (8 * G)) * mpmath.besselk(mpmath.mpf(1) / 4, 1 / (8 * G)) / (2 * mpmath.sqrt(mpmath.pi * G))
        return mpmath.nstr(v, 50)


def t_euler(x):
    with workdps(60):
        X = mpmath.mpf(x)
        return mpmath.nstr(mpmath.exp(1 / X) * mpmath.e1(1 / X) / X, 50)


TRUTH_DPS = {"0.5": 36, "1": 36, "2": 28, "5": 18, "20": 13}


def t_bes(angle, g):
    from resum.sources.bes import finite_coupling, zero_angle_closed_form
    if angle == "0":
        with workdps(60):
            return mpmath.nstr(zero_angle_closed_form(g, Context(dps=60)), 50)
    r = finite_coupling(g, angle, Context(dps=TRUTH_DPS[g]))
    with workdps(60):
        return mpmath.nstr(r.value.value, TRUTH_DPS[g])


def row(name, n, at, p, tv, plain=None, truth_digits=45):
    with workdps(80):
        if p.value is None:
            return [name, n, at, p.method, "fail", "-", "-", "-", "-"]
        err = abs(p.value.value - tv)
        dig = float(-mpmath.log10(err / abs(tv))) if err else 99.0
        claim = p.value.digits()
        ratio = float(p.value.error / err) if err else float("inf")
        terr = abs(tv) * mpmath.mpf(10) ** (1 - truth_digits)        # truth's own uncertainty
        inside = p.value.lower - terr <= tv <= p.value.upper + terr
        capped = claim >= DPS - 0.5
        if dig > truth_digits - 1.5:
            dig_txt, ratio_txt = f">{truth_digits - 2}", "-"
        else:
            dig_txt, ratio_txt = f"{dig:.1f}", ("capped" if capped else f"{ratio:.3g}")
        pd = "-"
        if plain is not None and plain.value is not None:
            e2 = abs(plain.value.value - tv)
            pd = f"{float(-mpmath.log10(e2 / abs(tv))):.1f}" if e2 else "99"
        meth = p.method + (f" ({p.diagnostics['variant']})"
                           if p.diagnostics.get("variant") in ("derivative", "quadratic", "two-point") else "")
        return [name, n, at, meth, dig_txt, f"{claim:.1f}", ratio_txt, "yes" if inside else "NO", pd]


def goal_rows(cache, ctx, verify, t0):
    """BES rows where the loops are chosen by resum.resummation.evaluate_with_goal."""
    from resum.resummation import evaluate_with_goal
    from resum.sources.bes import weak_coupling_series
    head = ["case", "at", "goal", "loops used", "rounds (terms: digits claimed)", "digits", "claimed",
            "inside", "seconds"]
    rows = []
    for a in ("0", "pi/8", "pi/4", "3*pi/8"):
        for g, goal, cap in (("5", 10, 260), ("20", 6, 260)):
            t = time.time()
            tv = truth(cache, f"bes:{a}:{g}", lambda: t_bes(a, g))
            td = 50 if a == "0" else TRUTH_DPS[g] - 2

            def rebuild(n, a=a):
                return weak_coupling_series(a, n - 1, Context(dps=max(150, -(-150 * n // 101))))
            s = weak_coupling_series(a, 100, Context(dps=150))
            r, search, _ = evaluate_with_goal(s, [g], goal, rebuild, ctx, max_terms=cap, verify=verify)
            base = row(f"bes a={a}", search["terms_used"], g, r.points[0], tv, None, td)
            rounds = ", ".join(f"{x['terms']}: {x['min_digits']}" for x in search["rounds"])
            rows.append([base[0], g, goal, search["terms_used"] - 1, rounds, base[4], base[5], base[7],
                         f"{time.time() - t:.0f}"])
            print("  ".join(str(c) for c in rows[-1]), f"({time.time() - t0:.0f}s)", file=sys.stderr, flush=True)
    w = [max(len(str(r[i])) for r in rows + [head]) for i in range(len(head))]
    print("  ".join(h.ljust(k) for h, k in zip(head, w)))
    print("  ".join("-" * k for k in w))
    for r in rows:
        print("  ".join(str(c).ljust(k) for c, k in zip(r, w)))
    print(f"\ncoverage {sum(r[7] == 'yes' for r in rows)}/{len(rows)}; {time.time() - t0:.0f} s")
    os.makedirs(OUT, exist_ok=True)
    with open(os.path.join(OUT, "goal_table.json"), "w") as fh:
        json.dump({"head": head, "rows": rows}, fh, indent=1)


#: Strong-coupling terms of the kernel family where they are known (``--strong-terms``): at a = 0
#: from the closed form (2/pi^2) log cosh(2 pi g) = (4/pi) g - 2 log2/pi^2 + exponentially small
#: (every power of 1/g after the constant vanishes; five terms given); at a = pi/4 the cusp
#: anomalous dimension's 2 g - 3 ln2/(2 pi) - K/(8 pi^2 g) (Frolov and Tseytlin, hep-th/0204226;
#: Roiban and Tseytlin, arXiv:0709.0681; K Catalan's constant).
STRONG_TERMS = {"0": {"1": "4/pi", "0": "-2*log(2)/pi^2", "-1": "0", "-2": "0", "-3": "0"},
                "pi/4": {"1": "2", "0": "-3*log(2)/(2*pi)", "-1": "-catalan/(8*pi^2)"}}


def main(argv=None):
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--quick", action="store_true", help="fewer cases")
    ap.add_argument("--no-verify", action="store_true", help="skip the verification reruns")
    ap.add_argument("--quadratic", action="store_true",
                    help="also BES rows by method conformal-quadratic with the strong-coupling power given")
    ap.add_argument("--bes-only", action="store_true", help="only the BES family rows")
    ap.add_argument("--strong-terms", action="store_true",
                    help="also BES rows at a = 0 and pi/4 with the known strong-coupling terms given "
                         "(two-point approximants): a = 0 from the closed form, pi/4 the published "
                         "2 g - 3 ln2/(2 pi) - K/(8 pi^2 g)")
    ap.add_argument("--goal", action="store_true",
                    help="only the BES goal rows: from 100 loops, evaluate_with_goal asks for 10 digits "
                         "at g = 5 and 6 at g = 20 and regenerates the series with the loops it projects")
    args = ap.parse_args(argv)
    verify = not args.no_verify
    cache = _cache()
    ctx = Context(dps=DPS)
    rows = []
    t0 = time.time()

    def run(name, s, n, at, tv, plain_method=None, truth_digits=45, **kw):
        r = evaluate(s, [at], ctx, verify=verify, **kw)
        plain = None
        if plain_method:
            plain = evaluate(s, [at], ctx, method=plain_method, verify=False).points[0]
        rows.append(row(name, n, at, r.points[0], tv, plain, truth_digits))
        print("  ".join(str(c) for c in rows[-1]), f"({time.time() - t0:.0f}s)", file=sys.stderr, flush=True)

    if args.goal:
        return goal_rows(cache, ctx, verify, t0)
    from resum.sources import oscillator, phi4
    for n in (() if args.bes_only else (100,) if args.quick else (100, 200)):
        s = oscillator.series(0, n)
        for g in ("0.1", "1", "10"):
            tv = truth(cache, f"osc:{g}", lambda: t_oscillator(g))
            run("oscillator", s, n, g, tv, "borel-pade" if n == 100 else None)
    s = phi4.series(60)
    for g in (() if args.bes_only else ("0.5", "2")):
        run("phi4", s, 60, g, truth(cache, f"phi4:{g}", lambda: t_phi4(g)), "borel-pade")
    s = Series([(-1) ** k * math.factorial(k) for k in range(40)])
    for x in (() if args.bes_only else ("0.1", "1")):
        run("euler", s, 40, x, truth(cache, f"euler:{x}", lambda: t_euler(x)), "borel-pade")
    from resum.sources.bes import weak_coupling_series
    angles = ("0", "pi/4") if args.quick else ("0", "pi/8", "pi/4", "3*pi/8")
    for a in angles:
        s = weak_coupling_series(a, 100, Context(dps=150))
        for g in ("0.5", "1", "2", "5", "20"):
            tv = truth(cache, f"bes:{a}:{g}", lambda: t_bes(a, g))
            td = 50 if a == "0" else TRUTH_DPS[g] - 2
            run(f"bes a={a}", s, 100, g, tv, "pade", td)
            run(f"bes a={a} p off", s, 100, g, tv, None, td, large_x_power=0)
            if args.quadratic:
                run(f"bes a={a} p=1/2 quad", s, 100, g, tv, None, td, large_x_power=mpmath.mpf(1) / 2,
                    method="conformal-quadratic")
            if args.strong_terms and a in STRONG_TERMS:
                run(f"bes a={a} +strong", s, 100, g, tv, None, td, strong_terms=STRONG_TERMS[a])
    head = ["case", "terms", "at", "method", "digits", "claimed", "band/err", "inside", "plain digits"]
    w = [max(len(str(r[i])) for r in rows + [head]) for i in range(len(head))]
    print("  ".join(h.ljust(k) for h, k in zip(head, w)))
    print("  ".join("-" * k for k in w))
    for r in rows:
        print("  ".join(str(c).ljust(k) for c, k in zip(r, w)))
    cov = sum(r[7] == "yes" for r in rows) / len(rows)
    ratios = [float(r[6]) for r in rows if r[6] not in ("-", "inf", "capped")]
    print(f"\ncoverage {100 * cov:.0f}% of {len(rows)}; band/error ratio max {max(ratios):.3g}, "
          f"median {sorted(ratios)[len(ratios) // 2]:.3g}; {time.time() - t0:.0f} s; reported digits capped at {DPS}")
    os.makedirs(OUT, exist_ok=True)
    with open(os.path.join(OUT, "table.json"), "w") as fh:
        json.dump({"head": head, "rows": rows}, fh, indent=1)


if __name__ == "__main__":
    main()
