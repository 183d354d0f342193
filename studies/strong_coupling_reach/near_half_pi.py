"""Band honesty near a = pi/2: resummed values from 50-100 loops against the evaluator.

    python studies/strong_coupling_reach/near_half_pi.py [--angles 5*pi/12,7*pi/16] [--loops 50,60,...]
                                                         [--at 3,5,8]

For each angle and number of loops, `evaluate` (method auto, 30 digits asked, verification on)
at the couplings given, against `resum.sources.bes.finite_coupling` (20 digits asked, its own
size and quadrature checks). Prints digits correct, digits claimed, the error in units of the
band's half-width (above 1: the truth lies outside the band) and the variant kept. About two
minutes on 2 cores with the defaults. A record of a known limit (README, Known limits): at
these angles the approximants can converge, over every order available, to a value off by more
than their spread says.
"""
import argparse
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[2]))          # run from a checkout

import mpmath  # noqa: E402

from resum.context import Context  # noqa: E402
from resum.resummation import evaluate  # noqa: E402
from resum.sources.bes import finite_coupling, weak_coupling_series  # noqa: E402


def main(argv=None):
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--angles", default="5*pi/12,7*pi/16,15*pi/32")
    ap.add_argument("--loops", default="50,60,70,80,90,100")
    ap.add_argument("--at", default="3,5,8")
    args = ap.parse_args(argv)
    angles = args.angles.split(",")
    loops = [int(v) for v in args.loops.split(",")]
    gs = args.at.split(",")
    t0 = time.time()
    misses = total = 0
    worst = 0
    print("angle      loops  g   digits  claimed  error/half-width  variant")
    for a in angles:
        truth = {g: finite_coupling(g, a, Context(dps=25), digits=20) for g in gs}
        for n in loops:
            s = weak_coupling_series(a, n, Context(dps=n + 40))
            r = evaluate(s, gs, Context(dps=30))
            for p, g in zip(r.points, gs):
                ref = truth[g]
                if p.value is None or not ref.success:
                    print(f"{a:10} {n:5}  {g:3} no value ({p.status.value})")
                    continue
                tv = ref.value.value
                err = abs(p.value.value - tv)
                ratio = err / p.value.error if p.value.error > 0 else mpmath.inf
                total += 1
                misses += ratio > 1
                worst = max(worst, ratio)
                dig = -mpmath.log10(err / abs(tv)) if err > 0 else mpmath.inf
                claim = -mpmath.log10(p.value.error / abs(tv))
                print(f"{a:10} {n:5}  {g:3} {mpmath.nstr(dig, 3):7} {mpmath.nstr(claim, 3):8} "
                      f"{mpmath.nstr(ratio, 3):17} {p.diagnostics.get('variant') or p.method}"
                      + ("   MISS" if ratio > 1 else ""), flush=True)
    print(f"\n{total} values, {misses} outside their band (worst {mpmath.nstr(worst, 3)} half-widths); "
          f"{time.time() - t0:.0f} s")


if __name__ == "__main__":
    main()
