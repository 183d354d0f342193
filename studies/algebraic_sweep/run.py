"""Coverage of resum.analysis.analyze on random products of algebraic branch points.

Run from the repository root:

    python studies/algebraic_sweep/run.py                 # 80 random cases, a few minutes
    python studies/algebraic_sweep/run.py --cases 20 --seed 3 --dps 60
    python studies/algebraic_sweep/run.py --evaluate  # resummed values at random complex points
    python studies/algebraic_sweep/run.py --digits 16 # coefficients rounded to 16 digits

Each case is a product of one to three factors, ``(1 - x/s)^p`` with a rational branch point
``s`` of either sign or ``(1 - 2 x cos(phi)/r + x^2/r^2)^p`` (a conjugate pair
``r e^(+-i phi)``), with rational non-integer ``p``; 40, 60 or 80 exact terms. Such products
obey a first-order linear differential equation with polynomial coefficients exactly, so the
differential approximants' exact-equation path is exercised (closed forms, common practice,
no source). The truth (branch points, exponents; factors at the same point add their
exponents) is computed at 60 digits. With ``--decimal`` the coefficients are given as
decimals (the exact-equation path then runs only where the approximants' table is
degenerate). For each case the study checks that the radius band holds ``min |s|``, that
every reported point lies in a band around a true one, and that its exponent band holds the
true exponent; it prints the failures and the totals.
"""
from __future__ import annotations

import argparse
import os
import random
import sys
import time
from fractions import Fraction

ROOT = os.path.abspath(os.path.join(os.path.dirname(__file__), os.pardir, os.pardir))
sys.path.insert(0, ROOT)

import mpmath  # noqa: E402

from resum.analysis import analyze  # noqa: E402
from resum.context import Context, workdps  # noqa: E402
from resum.series import Series  # noqa: E402

POWERS = [Fraction(-1, 2), Fraction(1, 3), Fraction(-1, 3), Fraction(2, 5), Fraction(-3, 4),
          Fraction(3, 2), Fraction(1, 2)]


def linear(p, s, n):
    """(1 - x/s)^p, exact."""
    c = [Fraction(1)]
    for k in range(1, n):
        c.append(c[-1] * (p - (k - 1)) / k * (-1) / s)
    return c


def quadratic(p, a1, a2, n):
    """(1 + a1 x + a2 x^2)^p, exact, from (1 + a1 x + a2 x^2) f' = p (a1 + 2 a2 x) f."""
    c = [Fraction(1)] + [Fraction(0)] * (n - 1)
    for m in range(1, n):
        v = (p - (m - 1)) * a1 * c[m - 1]
        if m >= 2:
            v += (2 * p - (m - 2)) * a2 * c[m - 2]
        c[m] = v / m
    return c


def product(a, b, n):
    return [sum(a[i] * b[k - i] for i in range(k + 1)) for k in range(n)]


def make_case(rng):
    """(description, coefficients, {point: exponent}) with points as 60-digit mpc."""
    n = rng.choice([40, 60, 80])
    c = [Fraction(1)] + [Fraction(0)] * (n - 1)
    truth, desc = {}, []
    for _ in range(rng.choice([1, 2, 2, 3])):
        p = rng.choice(POWERS)
        if rng.random() < 0.3:
            r = Fraction(rng.choice([1, 2, 3, 5]), rng.choice([1, 2, 3]))
            cphi = Fraction(rng.choice([-3, -1, 1, 2]), 4)
            c = product(c, quadratic(p, -2 * cphi / r, 1 / (r * r), n), n)
            with workdps(60):
                z = mpmath.mpf(r.numerator) / r.denominator * mpmath.exp(
                    1j * mpmath.acos(mpmath.mpf(cphi.numerator) / cphi.denominator))
                pts = [z, mpmath.conj(z)]
            desc.append(f"(1 - 2({cphi})x/({r}) + x^2/({r})^2)^({p})")
        else:
            s = Fraction(rng.choice([1, -1, 2, -2, 3, -3, 5]), rng.choice([1, 2, 3, 4]))
            c = product(c, linear(p, s, n), n)
            with workdps(60):
                pts = [mpmath.mpc(mpmath.mpf(s.numerator) / s.denominator)]
            desc.append(f"(1 - x/({s}))^({p})")
        for z in pts:
            key = next((k for k in truth if abs(k - z) < mpmath.mpf(10) ** -40), z)
            truth[key] = truth.get(key, 0) + p
    return " * ".join(desc), c, truth


def check(a, truth):
    """Failures of the verdict ``a`` against the true points and exponents."""
    bad = []
    with workdps(60):
        rmin = min(abs(z) for z in truth)
        if a.radius is None or not a.radius.contains(rmin):
            bad.append(f"radius {a.radius} misses {mpmath.nstr(rmin, 10)}")
        for s in a.singularities:
            z = min(truth, key=lambda t: abs(t - s.location))
            if not (s.re.contains(z.real) and s.im.contains(z.imag)):
                bad.append(f"point {mpmath.nstr(s.location, 10)}: band misses {mpmath.nstr(z, 10)}")
                continue
            th = truth[z]
            if s.exponent is not None and not s.exponent.contains(mpmath.mpf(th.numerator) / th.denominator):
                bad.append(f"exponent {s.exponent} at {mpmath.nstr(z, 6)} misses {th}")
    return bad


def evaluate_case(c, truth, rng, dps):
    """Resummed values at three random points (0.5 to 10 times the radius, any direction)
    against the continuation along the straight line from 0 (the product of the principal
    powers of the factors, each cut radially). Returns (lines, n_points, n_miss, n_flagged_miss,
    n_no_value, {method: [digits correct of each value]})."""
    from resum.resummation import evaluate
    with workdps(60):
        rmin = min(abs(z) for z in truth)
        pts = [rmin * mpmath.mpf(rng.choice([0.5, 1.5, 3, 10])) * mpmath.expj(rng.uniform(-3.1, 3.1))
               for _ in range(3)]
    r = evaluate(Series(c), [mpmath.nstr(p, 25) for p in pts], Context(dps=dps))
    lines, n, miss, flagged, none = [], 0, 0, 0, 0
    digits = {}
    with workdps(60):
        for p in r.points:
            x = mpmath.mpc(p.x)
            f = mpmath.mpf(1)
            for z, e in truth.items():
                f *= (1 - x / z) ** (mpmath.mpf(e.numerator) / e.denominator)
            if p.value is None or not p.success:
                none += 1
                lines.append(f"{mpmath.nstr(x, 6)}: no value ({p.status.value})")
                continue
            n += 1
            v = mpmath.mpc(p.value.value, p.imag.value if p.imag is not None else 0)
            err = abs(v - f) / abs(f)
            digits.setdefault(p.method, []).append(float(-mpmath.log10(err)) if err else 60.0)
            ok = p.value.contains(f.real) and (p.imag.contains(f.imag) if p.imag is not None
                                               else abs(f.imag) <= mpmath.mpf(10) ** -30 * abs(f))
            if not ok:
                miss += 1
                note = "branch" in p.diagnostics
                flagged += note
                lines.append(f"{mpmath.nstr(x, 6)}: MISS {mpmath.nstr(v, 10)} vs {mpmath.nstr(f, 10)} (claimed "
                             f"{p.value.digits():.1f} digits{'; flagged: may be another branch' if note else ''})")
    return lines, n, miss, flagged, none, digits


def main(argv=None):
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--cases", type=int, default=80)
    ap.add_argument("--seed", type=int, default=7)
    ap.add_argument("--dps", type=int, default=40)
    ap.add_argument("--evaluate", action="store_true",
                    help="instead of the analysis: resummed values at three random complex points per "
                         "case against the continuation along the straight line from 0")
    ap.add_argument("--decimal", action="store_true",
                    help="give the coefficients as decimals with dps + 20 digits instead of exact "
                         "rationals (the exact-equation path then runs only on a degenerate table)")
    ap.add_argument("--digits", type=int, default=None,
                    help="give the coefficients as decimals rounded to this many digits (16: as from double "
                         "precision); the analysis asks for at most that many")
    args = ap.parse_args(argv)
    rng = random.Random(args.seed)
    t0 = time.time()
    if args.evaluate:
        tot = [0, 0, 0, 0]
        by_method = {}
        for i in range(args.cases):
            desc, c, truth = make_case(rng)
            t = time.time()
            lines, n, miss, flagged, none, digits = evaluate_case(c, truth, rng, 20)
            for m, ds in digits.items():
                by_method.setdefault(m, []).extend(ds)
            for k, v in enumerate((n, miss, flagged, none)):
                tot[k] += v
            print(f"{i:3d} {len(c):3d} terms {time.time() - t:5.1f}s {desc}: "
                  f"{'; '.join(lines) if lines else 'ok'}", flush=True)
        print(f"\n{tot[0]} values, {tot[0] - tot[1]} inside their band; {tot[1]} misses, of which {tot[2]} "
              f"flagged as possibly another branch; {tot[3]} points without a value; "
              f"{time.time() - t0:.0f} s")
        for m, ds in sorted(by_method.items()):
            ds.sort()
            print(f"  {m}: {len(ds)} values, digits correct min {ds[0]:.1f}, median {ds[len(ds) // 2]:.1f}")
        return 0

    n_bad, n_exact = 0, 0
    for i in range(args.cases):
        desc, c, truth = make_case(rng)
        t = time.time()
        dps = args.dps
        if args.decimal or args.digits:
            d = args.digits or args.dps + 20
            with workdps(d):
                c = [+mpmath.mpf(v.numerator) / v.denominator for v in c]
            series = Series(c, digits=d)
            dps = min(dps, d)
        else:
            series = Series(c)
        a = analyze(series, Context(dps=dps))
        exact = any((r.diagnostics or {}).get("exact_equation") for r in a.methods.values())
        n_exact += exact
        bad = check(a, truth)
        n_bad += bool(bad)
        status = "ok" if not bad else "; ".join(bad)
        print(f"{i:3d} {len(c):3d} terms {time.time() - t:5.1f}s {'exact' if exact else '     '} "
              f"{desc}: {status}", flush=True)
    print(f"\n{args.cases - n_bad}/{args.cases} verdicts hold (radius, every point, every exponent); "
          f"exact equation found in {n_exact}; {time.time() - t0:.0f} s")
    return 0 if n_bad == 0 else 1


if __name__ == "__main__":
    sys.exit(main())
