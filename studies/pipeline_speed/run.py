"""CPU time of analyze/evaluate on long series, with checks against independent truths.

One command:  python studies/pipeline_speed/run.py [--only log|bes] [--points N] [--jobs N]

Prints one table: for each call the wall time, the CPU time of this process
(``time.process_time``; the machine is shared, so CPU time is the figure to
compare between runs) and what came out, checked against a truth computed
outside the estimators:

* ``log(1+x)/x``, 200 exact coefficients ``(-1)^k/(k+1)``: radius 1, a
  logarithmic branch point at ``x = -1`` (common practice, no source); values
  at ``x = 1/2, 1, ..., 5`` from ``mpmath.log`` at 80 digits.
* the BES source at ``angle = pi/4`` with 150 loops: radius 1/16 in
  ``x = g^2`` (``|g| = 1/4``), as resum/sources/bes.py states for the
  growth of its coefficients (equation of N. Beisert, B. Eden and
  M. Staudacher, J. Stat. Mech. (2007) P01021, hep-th/0610251). The exponent
  and the values at 10 couplings are printed with their bands, not checked
  here (their check against the source's finite-coupling solver is in
  studies/bes_angles).

All runs at ``Context(dps=30)`` with verification on (the defaults). ``--jobs N``
lets one analysis or evaluation use N worker processes (resum.parallel, as the
``resum`` command does by default); the CPU column then counts this process only,
so compare wall times.
A time is one run, not a minimum over repeats: expect +-15 % between runs
on a loaded machine.
"""
from __future__ import annotations

import argparse
import os
import time
from fractions import Fraction

import mpmath

from resum.analysis import analyze
from resum.context import Context, workdps
from resum.resummation import evaluate
from resum.series import Series
from resum.sources import get_source


def timed(fn):
    t, c = time.perf_counter(), time.process_time()
    out = fn()
    return time.perf_counter() - t, time.process_time() - c, out


def row(rows, call, wall, cpu, result):
    rows.append((call, f"{wall:.1f} s", f"{cpu:.1f} s", result))
    print(f"  {call} | {wall:.1f} s | {cpu:.1f} s | {result}", flush=True)


def study_log(rows, npts):
    s = Series([Fraction((-1) ** k, k + 1) for k in range(200)], name="log1p_over_x")
    ctx = Context(dps=30)
    w, c, r = timed(lambda: analyze(s, ctx))
    row(rows, "analyze log(1+x)/x, 200 terms", w, c,
        f"radius {r.radius}; contains 1: {r.radius.contains(1) if r.radius else None}")
    xs = [Fraction(k, 2) for k in range(1, npts + 1)]
    w, c, e = timed(lambda: evaluate(s, [str(x) for x in xs], ctx))
    ok, worst = 0, None
    with workdps(80):
        for x, p in zip(xs, e.points):
            xv = mpmath.mpf(x.numerator) / x.denominator
            truth = mpmath.log(1 + xv) / xv
            if p.value is not None and p.value.contains(truth):
                ok += 1
            d = p.digits
            worst = d if worst is None else min(worst, d)
    row(rows, f"evaluate log(1+x)/x at {npts} points", w, c,
        f"bands containing the truth: {ok}/{npts}; fewest digits claimed {worst:.1f}")


def study_bes(rows, npts):
    ctx = Context(dps=30)
    src = get_source("bes")
    w, c, built = timed(lambda: src.build(ctx, angle="pi/4", loops=150))
    s = built.series if hasattr(built, "series") else built
    row(rows, "build BES pi/4, 150 loops", w, c, f"{s.n_terms} coefficients")
    w, c, r = timed(lambda: analyze(s, ctx))
    sg = r.singularities[0] if r.singularities else None
    row(rows, "analyze BES", w, c, f"radius {r.radius}; contains 1/16: "
        f"{r.radius.contains(Fraction(1, 16)) if r.radius else None}; exponent "
        f"{sg.exponent if sg is not None else None} (not checked)")
    gs = [1, 2, 3, 5, 8, 10, 15, 20, 30, 50][:npts]
    w, c, e = timed(lambda: evaluate(s, [str(g) for g in gs], ctx))
    got = ", ".join(f"{p.at}: {p.value}" for p in e.points[:3])
    row(rows, f"evaluate BES at {len(gs)} couplings", w, c, f"{got}, ...")


def main(argv=None):
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--only", choices=["log", "bes"], help="one series only")
    ap.add_argument("--points", type=int, default=10, help="evaluation points (default 10)")
    ap.add_argument("--jobs", type=int, default=1,
                    help="worker processes per analysis or evaluation (default 1: CPU times comparable)")
    args = ap.parse_args(argv)
    os.environ["RESUM_JOBS"] = str(max(1, args.jobs))
    rows = []
    if args.only in (None, "log"):
        study_log(rows, args.points)
    if args.only in (None, "bes"):
        study_bes(rows, args.points)
    head = ("call", "wall", "CPU", "result")
    wd = [max(len(str(r[i])) for r in rows + [head]) for i in range(4)]
    print()
    print(f"Pipeline CPU time at 30 digits (verification on), {max(1, args.jobs)} process(es) per call")
    print("| " + " | ".join(h.ljust(wd[i]) for i, h in enumerate(head)) + " |")
    print("|" + "|".join("-" * (w + 2) for w in wd) + "|")
    for r in rows:
        print("| " + " | ".join(str(v).ljust(wd[i]) for i, v in enumerate(r)) + " |")


if __name__ == "__main__":
    main()
