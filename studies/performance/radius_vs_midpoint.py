"""How much of the Padé recursion's precision plan is paid for the certificate.

One command:  python studies/performance/radius_vs_midpoint.py [N]

Runs the continued-fraction recursion of resum._kernels.pade for [N/N] of
log(1+x)/x (default N = 100) at one flat working precision, twice:

* with Arb balls (what resum does): the digits the radii certify;
* on MPFR midpoints (gmpy2, no radii): the digits that are actually correct.

Both are scored against resum's own certified [N/N] at 250 more digits (its
ball bound is far below the errors measured here). Arb rounds each result's
midpoint to the accuracy its radius leaves, so the ball midpoints are only
as good as the radii; the MPFR column shows what the recursion itself loses.
The gap is what a radius-free recursion with a cheaper certificate could save.
"""
from __future__ import annotations

import math
import sys
from pathlib import Path

import gmpy2
import mpmath

sys.path.insert(0, str(Path(__file__).resolve().parents[2]))

from resum._kernels import flint_bridge as fb  # noqa: E402
from resum._kernels.pade import _inexact_problem, pade  # noqa: E402
from resum.context import workdps  # noqa: E402


def recursion(g, N, mul, div):
    """d_1..d_2N of the corresponding fraction and the denominator of the
    [N/N] convergent, with the number type's own + - * /."""
    n = len(g)
    u = [-x for x in g[1:]]
    v = list(g)
    ds = []
    for k in range(1, 2 * N + 1):
        dk = div(u[0], v[0])
        ds.append(dk)
        valid = n - 1 - k
        w = [mul(dk, v[i]) - (u[i] if i < len(u) else 0) for i in range(1, min(len(v), valid + 1))]
        v, u = u, w
    Bm, B = [g[0] * 0 + 1], [g[0] * 0 + 1]
    for dk in ds:
        nb = list(B) + [B[0] * 0] * (len(Bm) + 1 - len(B))
        for i, b in enumerate(Bm):
            nb[i + 1] = nb[i + 1] + mul(dk, b)
        Bm, B = B, nb
    return [div(x, B[0]) for x in B]


def to_mpfr(x):
    sign, man, exp, _ = x._mpf_
    return gmpy2.mul_2exp(gmpy2.mpfr(-man if sign else man), exp) if man else gmpy2.mpfr(0)


def digits(q, ref):
    with workdps(3000):
        q = [mpmath.mpf(x) for x in q]
        big = max(abs(x) for x in ref)
        err = max(abs(a - b) for a, b in zip(q, ref))
        return math.inf if err == 0 else float(mpmath.log10(big / err))


def main(argv=None):
    argv = sys.argv[1:] if argv is None else argv
    N = int(argv[0]) if argv else 100
    dps = 300
    with workdps(dps):
        c = [mpmath.mpf((-1) ** k) / (k + 1) for k in range(2 * N + 1)]
    g, _, _, _, _, _ = _inexact_problem(c, N, N)
    ref = pade(c, N, N, dps + 250)
    print(f"[{N}/{N}] of log(1+x)/x, input rounded to {dps} digits; "
          f"reference certified to {ref.digits:.0f} digits")
    print("| working digits | ball radii certify | ball midpoints correct | MPFR midpoints correct |")
    print("|---|---|---|---|")
    for wd in (dps + 150, dps + 250, dps + 430):
        bits = fb.prec_for_dps(wd)
        with fb.flint_prec(bits):
            qb = recursion([fb.to_arb(x) for x in g], N, lambda a, b: a * b, lambda a, b: a / b)
            finite = all(x.is_finite() for x in qb)
            if finite:
                big = max(abs(x.mid()) for x in qb)
                rad = max(x.rad() for x in qb)
                cert = max(0.0, float(mpmath.log10(fb.arb_to_mpf(big) / fb.arb_to_mpf(rad))))
                mids = [fb.arb_to_mpf(x.mid()) for x in qb]
                ball_true = f"{digits(mids, ref.q):.0f}"
            else:
                cert, ball_true = 0.0, "- (a divisor ball contained 0)"
        gmpy2.get_context().precision = bits
        qm = recursion([to_mpfr(x) for x in g], N, lambda a, b: a * b, lambda a, b: a / b)
        print(f"| {wd} | {cert:.0f} | {ball_true} | {digits(qm, ref.q):.0f} |")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
