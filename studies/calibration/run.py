"""Calibration of resum.analysis.analyze on series with known answers.

Run from the repository root:

    python studies/calibration/run.py [--terms 60] [--dps 100] [--quick] [--json out.json]

For every case it prints the digits reached (actual error against the known
answer) and claimed (band width) for the radius and the exponent of the
nearest singularity, and whether each band contains the truth. The totals
are the coverage (fraction of bands that hold) and the median digits.
Each case names the source of its answer.
"""
from __future__ import annotations

import argparse
import json
import math
import os
import statistics
import sys
import time
from fractions import Fraction

ROOT = os.path.abspath(os.path.join(os.path.dirname(__file__), os.pardir, os.pardir))
sys.path.insert(0, ROOT)

import mpmath  # noqa: E402

from resum.analysis import analyze  # noqa: E402
from resum.context import Context, workdps  # noqa: E402
from resum.series import Series  # noqa: E402
from tests.estimators import refs  # noqa: E402


def _mp(x):
    return mpmath.mpf(x.numerator) / x.denominator if isinstance(x, Fraction) else mpmath.mpmathify(x)


def binom_case(theta, xc, n):
    """(1 - x/xc)^theta."""
    return Series(refs.binomial_power(Fraction(theta), n, scale=1 / Fraction(xc)))


def pair_case(phi, theta, n, dps):
    """(1 - 2 x cos(phi) + x^2)^theta: pair at exp(+-i phi)."""
    from resum._kernels import series_ops as ops
    with workdps(dps + 20):
        cs = ops.power([mpmath.mpf(1), -2 * mpmath.cos(phi), mpmath.mpf(1)], _mp(Fraction(theta)), n)
    return Series(cs, digits=dps + 10)


def motzkin(n):
    m = [1, 1]
    for k in range(2, n):
        m.append(((2 * k + 1) * m[-1] + (3 * k - 3) * m[-2]) // (k + 2))
    return m[:n]


def central_trinomial(n):
    t = [1, 1]
    for k in range(2, n):
        t.append(((2 * k - 1) * t[-1] + 3 * (k - 1) * t[-2]) // k)
    return t[:n]


def schroeder(n):
    s = [1, 2]
    for k in range(2, n):
        s.append((3 * (2 * k - 1) * s[-1] - (k - 2) * s[-2]) // (k + 1))
    return s[:n]


def delannoy(n):
    d = [1, 3]
    for k in range(2, n):
        d.append((3 * (2 * k - 1) * d[-1] - (k - 1) * d[-2]) // k)
    return d[:n]


def cases(n, dps):
    """(name, series, truth, source). truth: radius, point (complex), theta, kind,
    or borel A and b for factorial series; None where unknown."""
    sq2 = mpmath.sqrt(2)
    out = []
    cp = "common practice, no source (closed form)"
    for theta, xc in [(Fraction(-1, 3), 1), (Fraction(-7, 4), Fraction(1, 2)), (Fraction(2, 5), -3),
                      (Fraction(-1, 2), Fraction(1, 4)), (Fraction(1, 3), 2), (Fraction(-5, 2), Fraction(-1, 5))]:
        out.append((f"(1-x/{xc})^({theta})", binom_case(theta, xc, n),
                    dict(radius=abs(_mp(Fraction(xc))), point=_mp(Fraction(xc)), theta=_mp(theta), kind="branch"), cp))
    out.append(("1/(1-x)^2", Series([k + 1 for k in range(n)]),
                dict(radius=1, point=1, theta=-2, kind="pole"), cp))
    out.append(("1/(1-x/2)+exp(x)", Series([Fraction(1, 2 ** k) + Fraction(1, math.factorial(k)) for k in range(n)]),
                dict(radius=2, point=2, theta=-1, kind="pole"), cp))
    out.append(("Catalan g.f.", Series(refs.catalan(n)),
                dict(radius=mpmath.mpf(1) / 4, point=mpmath.mpf(1) / 4, theta=mpmath.mpf(1) / 2, kind="branch"), cp))
    out.append(("Motzkin g.f.", Series(motzkin(n)),
                dict(radius=mpmath.mpf(1) / 3, point=mpmath.mpf(1) / 3, theta=mpmath.mpf(1) / 2, kind="branch"),
                "Motzkin numbers, recursion (k+2) M_k = (2k+1) M_(k-1) + (3k-3) M_(k-2) (OEIS A001006, from memory)"))
    out.append(("central trinomial 1/sqrt(1-2x-3x^2)", Series(central_trinomial(n)),
                dict(radius=mpmath.mpf(1) / 3, point=mpmath.mpf(1) / 3, theta=-mpmath.mpf(1) / 2, kind="branch"),
                "OEIS A002426, recursion k T_k = (2k-1) T_(k-1) + 3(k-1) T_(k-2) (from memory)"))
    out.append(("large Schroeder g.f.", Series(schroeder(n)),
                dict(radius=3 - 2 * sq2, point=3 - 2 * sq2, theta=mpmath.mpf(1) / 2, kind="branch"),
                "OEIS A006318, recursion (k+1) S_k = 3(2k-1) S_(k-1) - (k-2) S_(k-2) (from memory)"))
    out.append(("central Delannoy 1/sqrt(1-6x+x^2)", Series(delannoy(n)),
                dict(radius=3 - 2 * sq2, point=3 - 2 * sq2, theta=-mpmath.mpf(1) / 2, kind="branch"),
                "OEIS A001850, recursion k D_k = 3(2k-1) D_(k-1) - (k-1) D_(k-2) (from memory)"))
    out.append(("log(1+x)", Series(refs.log1p_series(n)), dict(radius=1, point=-1, theta=0, kind="log"), cp))
    out.append(("log(1-3x)", Series([0] + [-Fraction(3 ** k, k) for k in range(1, n)]),
                dict(radius=mpmath.mpf(1) / 3, point=mpmath.mpf(1) / 3, theta=0, kind="log"), cp))
    out.append(("arctan(x)", Series([0] + [Fraction((-1) ** ((k - 1) // 2), k) if k % 2 else 0 for k in range(1, n)]),
                dict(radius=1, point=mpmath.mpc(0, 1), theta=0, kind="log"), cp))
    out.append(("(1-x+x^2)^(-2/5)", pair_case(mpmath.pi / 3, Fraction(-2, 5), n, dps),
                dict(radius=1, point=mpmath.expjpi(mpmath.mpf(1) / 3), theta=-mpmath.mpf(2) / 5, kind="branch"), cp))
    out.append(("(1-2x cos 1+x^2)^(-3/4)", pair_case(mpmath.mpf(1), Fraction(-3, 4), n, dps),
                dict(radius=1, point=mpmath.expj(1), theta=-mpmath.mpf(3) / 4, kind="branch"), cp))
    out.append(("(1+x^2)^(-1/3)", Series([c if k % 2 == 0 else 0 for k, c in enumerate(
        [x for c in refs.binomial_power(Fraction(-1, 3), n // 2 + 1, scale=-1) for x in (c, 0)])][:n]),
                dict(radius=1, point=mpmath.mpc(0, 1), theta=-mpmath.mpf(1) / 3, kind="branch"), cp))
    out.append(("(1-x)^(-1/2)+(1+x/2)^(-3/2)", Series(refs.two_singularities(n)),
                dict(radius=1, point=1, theta=-mpmath.mpf(1) / 2, kind="branch"), cp))
    out.append(("(1-x)^(-1/3)(1+(1-x)^(1/2)) confluent", Series(refs.confluent(n)),
                dict(radius=1, point=1, theta=-mpmath.mpf(1) / 3, kind="branch"), cp))
    out.append(("exp(x)", Series([Fraction(1, math.factorial(k)) for k in range(n)]),
                dict(growth="entire-like"), cp))
    out.append(("Euler series sum (-1)^n n! x^n", Series(refs.euler_series(n)),
                dict(growth="factorial", A=-1, b=1), cp))
    out.append(("quartic oscillator E(g)", Series(refs.quartic_oscillator(n)),
                dict(growth="factorial", A=-mpmath.mpf(2) / 3, b=mpmath.mpf(1) / 2),
                "Bender and Wu, Phys. Rev. 184 (1969) 1231 (recursion); Phys. Rev. D 7 (1973) 1620 (large order, "
                "rescaled to H = p^2 + x^2 + g x^4)"))
    try:
        from resum.sources.bes import weak_coupling_series
        for angle, kind in ((0, "log"), (mpmath.pi / 4, None)):
            s = weak_coupling_series(angle, n, Context(dps=dps))
            truth = dict(radius=mpmath.mpf(1) / 16, point=-mpmath.mpf(1) / 16)
            if kind:
                truth.update(theta=0, kind="log")
            out.append((f"BES kernel family a={mpmath.nstr(angle, 4)}", s, truth,
                        "Beisert, Eden, Staudacher hep-th/0610251 (radius |g| = 1/4); a = 0: (2/pi^2) log cosh(2 pi g)"))
    except ImportError:
        pass
    mu = mpmath.mpf("2.63815853032790")
    cs, _ = refs.lattice("saw_square_lattice")
    out.append(("square SAW (80 terms)", Series(cs), dict(radius=1 / mu, point=1 / mu, theta=-mpmath.mpf(43) / 32),
                "Jensen, J. Phys. A 49 (2016) 424003; mu: Jacobsen-Scullard-Guttmann J. Phys. A 49 (2016) 494004; "
                "gamma = 43/32 Nienhuis PRL 49 (1982) 1062"))
    cs, _ = refs.lattice("sap_square_lattice_perimeter")
    out.append(("square SAP (66 terms in x^2)", Series(cs),
                dict(radius=1 / mu ** 2, point=1 / mu ** 2, theta=mpmath.mpf(3) / 2),
                "Clisby and Jensen, J. Phys. A 45 (2012) 115202; alpha = 1/2 (Nienhuis 1982)"))
    cs, _ = refs.lattice("ising_sq_susceptibility_hightemp")
    out.append(("square Ising chi (27 terms)", Series(cs),
                dict(radius=sq2 - 1, point=sq2 - 1, theta=-mpmath.mpf(7) / 4),
                "Sykes et al. J. Phys. A 5 (1972) 624 / OEIS A002906; Kramers-Wannier 1941; gamma = 7/4 (Wu et al. 1976)"))
    return out


def _digits(err, ref):
    if err == 0:
        return float("inf")
    return max(0.0, float(-mpmath.log10(err / max(abs(ref), mpmath.mpf(10) ** -30))))


def run_case(name, s, truth, dps, verify):
    t0 = time.perf_counter()
    r = analyze(s, Context(dps=dps), verify=verify)
    sec = time.perf_counter() - t0
    row = {"case": name, "seconds": round(sec, 1), "status": r.status.value, "checks": []}
    with workdps(dps + 20):
        def check(label, est, true):
            true = _mp(true) if not isinstance(true, mpmath.mpc) else true
            ok = bool(est.contains(true))
            row["checks"].append({"what": label, "in_band": ok,
                                  "digits": _digits(abs(est.value - true), true),
                                  "band_digits": _digits(est.error, true) if true != 0 else None,
                                  "band": float(est.width)})
        if "growth" in truth:
            row["checks"].append({"what": "growth", "in_band": r.growth == truth["growth"], "digits": None,
                                  "band_digits": None, "band": None})
            if "A" in truth and r.borel_singularity is not None:
                check("A", r.borel_singularity, truth["A"])
                check("b", r.borel_exponent, truth["b"])
            return row
        if r.radius is None:
            row["checks"].append({"what": "radius", "in_band": False, "digits": 0, "band_digits": None, "band": None})
            return row
        check("radius", r.radius, truth["radius"])
        pt = mpmath.mpmathify(truth["point"])
        if r.singularities:
            s0 = min(r.singularities, key=lambda z: abs(z.location - pt))
            check("re x_c", s0.re, mpmath.re(pt))
            if mpmath.im(pt) != 0:
                check("im x_c", s0.im, mpmath.im(pt))
            if truth.get("theta") is not None:
                if s0.exponent is None:
                    row["checks"].append({"what": "theta", "in_band": None, "digits": None, "band_digits": None,
                                          "band": None, "note": "no exponent claimed"})
                else:
                    check("theta", s0.exponent, truth["theta"])
            if truth.get("kind"):
                row["checks"].append({"what": "kind", "in_band": s0.kind == truth["kind"], "digits": None,
                                      "band_digits": None, "band": None, "got": s0.kind})
    return row


def main(argv=None):
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--terms", type=int, default=60)
    ap.add_argument("--dps", type=int, default=100)
    ap.add_argument("--quick", action="store_true", help="no verification reruns")
    ap.add_argument("--json", default=None, help="write the per-case records here")
    args = ap.parse_args(argv)
    rows = []
    print(f"{'case':40s} {'check':8s} {'in band':8s} {'digits':>7s} {'claimed':>8s} {'band width':>11s}  sec")
    with workdps(args.dps + 30):          # the known answers at full precision
        all_cases = cases(args.terms, args.dps)
    for name, s, truth, src in all_cases:
        dps = args.dps if s.digits is None else min(args.dps, s.digits)
        try:
            row = run_case(name, s, truth, max(dps, 10), not args.quick)
        except Exception as exc:           # a failed case is recorded and the study goes on
            row = {"case": name, "status": f"error: {exc!r}", "checks": [], "seconds": 0}
        row["source"] = src
        rows.append(row)
        first = True
        for c in row["checks"] or [{"what": "-", "in_band": False, "digits": None, "band_digits": None, "band": None}]:
            fmt = lambda v: "-" if v is None else ("inf" if v == float("inf") else f"{v:.1f}")  # noqa: E731
            band = "-" if c["band"] is None else "%.1e" % c["band"]
            print(f"{(name if first else ''):40.40s} {c['what']:8s} {str(c['in_band']):8s} {fmt(c['digits']):>7s} "
                  f"{fmt(c['band_digits']):>8s} {band:>11s}  {row['seconds'] if first else ''}")
            first = False
        sys.stdout.flush()
    checks = [c for r in rows for c in r["checks"] if c["in_band"] is not None]
    held = sum(1 for c in checks if c["in_band"])
    print()
    print(f"coverage: {held}/{len(checks)} checks hold ({100 * held / max(1, len(checks)):.1f} %)")
    for what in ("radius", "theta", "re x_c", "A", "b"):
        ds = [min(c["digits"], args.dps) for c in checks if c["what"] == what and c["digits"] is not None]
        if ds:
            print(f"median digits reached, {what}: {statistics.median(ds):.1f} over {len(ds)} cases "
                  f"(exact hits counted as {args.dps})")
    fails = [(r["case"], c["what"]) for r in rows for c in r["checks"] if c["in_band"] is False]
    if fails:
        print("bands that missed:", "; ".join(f"{a} [{b}]" for a, b in fails))
    if args.json:
        with open(args.json, "w") as f:
            json.dump(rows, f, indent=1, default=str)
    return 0


if __name__ == "__main__":
    sys.exit(main())
