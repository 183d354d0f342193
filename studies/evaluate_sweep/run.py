"""Coverage of resum.resummation.evaluate on closed-form functions, far beyond the radius.

Run from the repository root:

    python studies/evaluate_sweep/run.py              # 40 and 80 terms (a few minutes)
    python studies/evaluate_sweep/run.py --terms 20   # one term count
    python studies/evaluate_sweep/run.py --json out.json
    python studies/evaluate_sweep/run.py --digits 16  # coefficients rounded to 16 digits, as from doubles

Every function below has a closed form (binomial series, logarithms, arctan, products and
sums of them, Stieltjes integrals; common practice, no source), evaluated by mpmath at 50
digits as the truth. For each point the table prints whether the band holds the truth,
the digits reached, the digits the band claims, and band/error. `evaluate` runs as a user
runs it: method `auto`, verification on, 20 digits asked. The totals are the coverage and
the number of bands more than 100 times the error (bands at the 20-digit floor excluded).
"""
from __future__ import annotations

import argparse
import json
import math
import os
import sys
import time
from fractions import Fraction

ROOT = os.path.abspath(os.path.join(os.path.dirname(__file__), os.pardir, os.pardir))
sys.path.insert(0, ROOT)

import mpmath  # noqa: E402

from resum.context import Context, workdps  # noqa: E402
from resum.resummation import evaluate  # noqa: E402
from resum.series import Series  # noqa: E402

DPS = 20


def binom(p, n, s=1):
    """Coefficients of (1 + s x)^p."""
    c = [Fraction(1)]
    for k in range(1, n):
        c.append(c[-1] * (p - (k - 1)) / k)
    return [v * Fraction(s) ** k for k, v in enumerate(c)]


def conv(a, b):
    return [sum(a[j] * b[k - j] for j in range(k + 1)) for k in range(len(a))]


def power_of_poly(poly, p, n):
    """Coefficients of poly(x)^p, poly[0] = 1 (J. C. P. Miller's recurrence, exact)."""
    a = [Fraction(v) for v in poly] + [Fraction(0)] * n
    b = [Fraction(1)]
    for k in range(1, n):
        b.append(sum((p * j - (k - j)) * a[j] * b[k - j] for j in range(1, k + 1)) / k)
    return b


def log1p_coeffs(n):
    return [Fraction(0)] + [Fraction((-1) ** (k + 1), k) for k in range(1, n)]


def _third():
    return mpmath.mpf(1) / 3          # at the caller's (the truth's) precision


def cases(n):
    out = [
        ("(1+x)^(1/3)", binom(Fraction(1, 3), n), lambda x: (1 + x) ** _third(), ["2", "10", "100", "1000"]),
        ("log(1+x)", log1p_coeffs(n), lambda x: mpmath.log(1 + x), ["2", "10", "100", "1000"]),
        ("((1+x)(1+x/3))^(-1/2)", conv(binom(Fraction(-1, 2), n), binom(Fraction(-1, 2), n, Fraction(1, 3))),
         lambda x: ((1 + x) * (1 + x / 3)) ** -0.5, ["2", "10", "100", "1000"]),
        ("(1+x)^(1/2) + (1+x/2)^(-1/3)",
         [a + b for a, b in zip(binom(Fraction(1, 2), n), binom(Fraction(-1, 3), n, Fraction(1, 2)))],
         lambda x: (1 + x) ** 0.5 + (1 + x / 2) ** (-_third()), ["2", "10", "100", "1000"]),
        ("atan(x)/x", [Fraction((-1) ** (k // 2), k + 1) if k % 2 == 0 else Fraction(0) for k in range(n)],
         lambda x: mpmath.atan(x) / x, ["2", "10", "100", "1000"]),
        ("exp(-x)/sqrt(1+x)", conv([Fraction((-1) ** k, math.factorial(k)) for k in range(n)],
                                   binom(Fraction(-1, 2), n)),
         lambda x: mpmath.exp(-x) / mpmath.sqrt(1 + x), ["2", "10"]),
        ("log(1+x)^2", conv(log1p_coeffs(n), log1p_coeffs(n)), lambda x: mpmath.log(1 + x) ** 2,
         ["2", "10", "100", "1000"]),
        ("(1-x+x^2)^(-1/3)", power_of_poly([1, -1, 1], Fraction(-1, 3), n),
         lambda x: (1 - x + x * x) ** (-_third()), ["0.5", "2"]),
        ("(1+x^2)^(-1/2)", power_of_poly([1, 0, 1], Fraction(-1, 2), n),
         lambda x: (1 + x * x) ** -0.5, ["2", "10", "100"]),
        ("(1-x/2)^(-1/2) (1+x)^(1/3)", conv(binom(Fraction(-1, 2), n, Fraction(-1, 2)), binom(Fraction(1, 3), n)),
         lambda x: (1 - x / 2) ** -0.5 * (1 + x) ** _third(), ["0.5", "1.5", "1.9"]),
        ("log(1+x)/(1+x/5)", conv(log1p_coeffs(n), [Fraction(-1, 5) ** k for k in range(n)]),
         lambda x: mpmath.log(1 + x) / (1 + x / 5), ["2", "3", "10"]),
        ("(1+x)^(-1/2) + 1/(1-x/3)", [a + Fraction(1, 3) ** k for k, a in enumerate(binom(Fraction(-1, 2), n))],
         lambda x: (1 + x) ** -0.5 + 1 / (1 - x / 3), ["2", "10"]),
    ]
    for b in (Fraction(1, 2), Fraction(2), Fraction(-1, 3)):
        # sum (-1)^k Gamma(k+b+1)/Gamma(b+1) x^k: Stieltjes integral of e^-t t^b/Gamma(b+1)
        c = [Fraction(1)]
        for k in range(1, n):
            c.append(c[-1] * -(k + b))
        def f(x, b=b):
            bb = mpmath.mpf(b.numerator) / b.denominator       # at the caller's precision
            return mpmath.quad(lambda t: mpmath.exp(-t) * t ** bb / (1 + x * t),
                               [0, 1, 10, mpmath.inf]) / mpmath.gamma(bb + 1)
        out.append((f"Stieltjes, b = {b}", c, f, ["0.05", "0.3", "1", "5"]))
    return out


def main(argv=None):
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--terms", type=int, action="append", help="term counts (default 40 and 80)")
    ap.add_argument("--json", help="write the rows to this file")
    ap.add_argument("--method", default="auto", help="resummation method (default auto)")
    ap.add_argument("--digits", type=int, default=None,
                    help="round every coefficient to this many significant digits (declared as the "
                         "series' digits; 20 digits asked, or fewer if the input carries fewer)")
    ap.add_argument("--far", action="store_true",
                    help="also x = 1e4 and 1e5 wherever x = 1000 is in the list (near the rim of the disk)")
    args = ap.parse_args(argv)
    rows = []
    t0 = time.time()
    for n in args.terms or [40, 80]:
        for name, c, f, xs in cases(n):
            t = time.time()
            if args.far and "1000" in xs:
                xs = xs + ["1e4", "1e5"]
            if args.method != "auto" and name.startswith("Stieltjes"):
                continue
            if args.digits:
                with workdps(args.digits):
                    c = [+mpmath.mpf(v.numerator) / v.denominator for v in c]
                s = Series(c, digits=args.digits)
            else:
                s = Series(c)
            res = evaluate(s, xs, Context(dps=DPS), method=args.method)
            for p in res.points:
                with workdps(50):
                    truth = f(mpmath.mpf(p.x))
                    row = {"case": name, "terms": n, "x": str(p.at), "method": p.method}
                    if p.value is None:
                        row.update(inside="-", digits="-", claimed="-", ratio="-", status=p.status.value)
                    else:
                        err = abs(p.value.value - truth)
                        asked = min(DPS, args.digits or DPS)
                        at_floor = p.value.error <= abs(p.value.value) * mpmath.mpf(10) ** (1 - asked)
                        row.update(inside="yes" if p.value.contains(truth) else "NO",
                                   digits=f"{float(-mpmath.log10(err / abs(truth))):.1f}" if err else ">50",
                                   claimed=f"{p.value.digits():.1f}",
                                   ratio="floor" if at_floor else (f"{float(p.value.error / err):.3g}" if err else "-"),
                                   status=p.status.value)
                rows.append(row)
            print(f"{name} ({n} terms): {time.time() - t:.1f} s", file=sys.stderr, flush=True)
    head = ["case", "terms", "x", "method", "inside", "digits", "claimed", "ratio", "status"]
    w = [max(len(str(r[k])) for r in rows + [dict(zip(head, head))]) for k in head]
    print("  ".join(h.ljust(k) for h, k in zip(head, w)))
    print("  ".join("-" * k for k in w))
    for r in rows:
        print("  ".join(str(r[h]).ljust(k) for h, k in zip(head, w)))
    banded = [r for r in rows if r["inside"] in ("yes", "NO")]
    hold = sum(r["inside"] == "yes" for r in banded)
    wide = [r for r in banded if r["ratio"] not in ("floor", "-") and float(r["ratio"]) > 100]
    print(f"\ncoverage {hold}/{len(banded)}; {len(wide)} bands wider than 100 x the error "
          f"(bands at the {DPS}-digit floor excluded); {len(rows) - len(banded)} points without a value; "
          f"{time.time() - t0:.0f} s")
    if args.json:
        with open(args.json, "w") as fh:
            json.dump(rows, fh, indent=1)


if __name__ == "__main__":
    main()
