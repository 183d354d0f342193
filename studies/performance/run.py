"""Speed and accuracy of resum's kernels against general-purpose baselines.

One command:  python studies/performance/run.py [--quick] [--out DIR]

Prints tables (and writes them to DIR/performance.txt, default
studies/performance/out/): for each case the time of resum's kernel, the
time of the baseline, their ratio, the digits each gets right, and the peak
Python memory (tracemalloc) of each.

"Digits correct" is normwise: -log10(max|x - x_ref| / max|x_ref|) over the
coefficients (or roots), against a reference computed independently:

* Padé: the Toeplitz system for q solved by FLINT's ball LU (arb_mat.solve)
  at much higher precision, for the *same* input (the coefficients rounded
  to the working digits), with its certified radius checked to be far below
  the errors measured. So the digits measure the method, not the rounding of
  the input.
* roots: resum's certified roots of the same polynomial at 3x the digits.
* double precision Padé: the exact Padé coefficients of exp(x) (closed form,
  Baker and Graves-Morris, "Padé Approximants", 2nd ed., CUP 1996, sec. 1.2).
* differential approximants (``--only da``): the dense system solved by FLINT
  at 2 dps + 100 digits, on the same rounded input.

Baselines are run with a time cap: a case whose predicted baseline time
(extrapolated as N^3 dps^1.6 from the smallest case measured) exceeds
--cap seconds is not run and is marked "skipped (cap)".

The test series is -log(1-x)/x = sum x^k/(k+1) with alternating sign
(log(1+x)/x), a Stieltjes series whose Toeplitz systems grow ill-conditioned
like the Hilbert matrix (the hard, common case).
"""
from __future__ import annotations

import argparse
import gc
import math
import sys
import time
import tracemalloc
from pathlib import Path

import mpmath

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE.parent.parent))

import flint  # noqa: E402

from resum._kernels import flint_bridge as fb  # noqa: E402
from resum._kernels.pade import pade, pade_fp, pade_table  # noqa: E402
from resum._kernels.roots import poly_roots  # noqa: E402
from resum._kernels.aberth import refined_roots  # noqa: E402
from resum.context import workdps  # noqa: E402


def series_log(n, dps):
    with workdps(dps):
        return [mpmath.mpf((-1) ** k) / (k + 1) for k in range(n)]


def timed(fn, repeat=1):
    """Best wall time of ``repeat`` calls, with Python's garbage collector paused during each
    call (as the standard timeit does: a collection triggered by the previous call's garbage,
    for instance the baseline's matrices, otherwise lands in whichever call runs next)."""
    best = math.inf
    out = None
    for _ in range(repeat):
        gc.collect()
        gc.disable()
        try:
            t = time.perf_counter()
            out = fn()
            best = min(best, time.perf_counter() - t)
        finally:
            gc.enable()
    return best, out


def peak_mem(fn):
    tracemalloc.start()
    try:
        fn()
        _, peak = tracemalloc.get_traced_memory()
    finally:
        tracemalloc.stop()
    return peak


def digits(x, ref):
    with workdps(2000):
        x = [mpmath.mpmathify(v) for v in x]
        ref = [mpmath.mpmathify(v) for v in ref]
        n = max(len(x), len(ref))
        x = x + [mpmath.mpf(0)] * (n - len(x))
        ref = ref + [mpmath.mpf(0)] * (n - len(ref))
        big = max(abs(v) for v in ref)
        err = max(abs(a - b) for a, b in zip(x, ref))
        if err == 0:
            return math.inf
        return float(mpmath.log10(big / err))


def reference_q(c, N, dps_ref, need):
    """Denominator of [N/N] by ball LU on the Toeplitz system at high
    precision, raised until the certified digits reach ``need``; returns
    (q, certified digits)."""
    prec = fb.prec_for_dps(dps_ref)
    while True:
        with fb.flint_prec(prec):
            T = flint.arb_mat(N, N, [fb.to_arb(c[N + i - j]) if N + i - j >= 0 else flint.arb(0)
                                     for i in range(1, N + 1) for j in range(1, N + 1)])
            rhs = flint.arb_mat(N, 1, [-fb.to_arb(c[N + i]) for i in range(1, N + 1)])
            try:
                x = T.solve(rhs)
            except ZeroDivisionError:
                x = None
            if x is not None:
                q = [flint.arb(1)] + [x[i, 0] for i in range(N)]
                from resum._kernels.pade import _rel_digits
                cert = _rel_digits(q)
                if cert >= need:
                    return [fb.arb_to_mpf(v) for v in q], cert
        prec *= 2


def fmt_t(t):
    if t is None:
        return "-"
    return f"{t * 1e3:.1f} ms" if t < 1 else f"{t:.2f} s"


def fmt_d(d):
    if d is None:
        return "-"
    return "exact" if d == math.inf else f"{d:.0f}"


def fmt_m(m):
    return "-" if m is None else f"{m / 2 ** 20:.1f} MB"


class Table:
    def __init__(self, title, cols):
        self.title, self.cols, self.rows = title, cols, []

    def add(self, *row):
        self.rows.append([str(x) for x in row])
        print("  " + " | ".join(str(x) for x in row), flush=True)

    def render(self):
        w = [max(len(c), *(len(r[i]) for r in self.rows)) if self.rows else len(c)
             for i, c in enumerate(self.cols)]
        lines = [self.title, ""]
        lines.append("| " + " | ".join(c.ljust(w[i]) for i, c in enumerate(self.cols)) + " |")
        lines.append("|" + "|".join("-" * (x + 2) for x in w) + "|")
        for r in self.rows:
            lines.append("| " + " | ".join(v.ljust(w[i]) for i, v in enumerate(r)) + " |")
        return "\n".join(lines)


def study_pade(sizes, digit_levels, cap):
    tab = Table("[N/N] Padé of log(1+x)/x: resum.pade (dps = working digits asked as correct digits) "
                f"vs mpmath.pade at mp.dps = dps (mpmath's {mpmath.libmp.BACKEND} backend); digits correct: "
                "the smaller of p and q (resum), q (mpmath)",
                ["N", "dps", "resum check", "resum", "claimed", "digits", "mem", "mpmath.pade",
                 "digits", "mem", "speed-up"])
    base_rate = None     # seconds per N^3 dps^1.6
    for N in sizes:
        for dps in digit_levels:
            c = series_log(2 * N + 1, dps)
            qref, cert = reference_q(c, N, dps + int(3 * N) + 100, need=dps + 120)
            with workdps(dps + int(3 * N) + 100):      # p = first N+1 terms of c q
                pref = [sum(c[i - j] * qref[j] for j in range(i + 1)) for i in range(N + 1)]
            rows = []
            for check, label in (("ball", "certified (ball)"), ("rerun", "verified by rerun"),
                                 ("residual", "estimated by residual")):
                t_r, r = timed(lambda: pade(c, N, N, dps, check=check), repeat=2)
                m_r = peak_mem(lambda: pade(c, N, N, dps, check=check))
                d_r = min(digits(r.q, qref), digits(r.p, pref))
                rows.append((label, t_r, r, m_r, d_r))
            pred = None if base_rate is None else base_rate * N ** 3 * dps ** 1.6
            if pred is not None and pred > cap:
                t_m = d_m = m_m = None
                ratio = f"skipped (cap: predicted {pred:.0f} s)"
            else:
                def run_m():
                    with workdps(dps):
                        return mpmath.pade(c, N, N)
                try:
                    t_m, (pm, qm) = timed(run_m)
                    d_m = digits(qm, qref)
                    m_m = peak_mem(run_m) if t_m < cap / 4 else None
                except ZeroDivisionError:
                    t_m, d_m, m_m = None, None, None
                    ratio = "baseline failed (singular matrix at mp.dps)"
                else:
                    ratio = None
                    rate = t_m / (N ** 3 * dps ** 1.6)
                    base_rate = rate if base_rate is None else max(base_rate, rate)
            for label, t_r, r, m_r, d_r in rows:
                sp = ratio if ratio is not None else f"{t_m / t_r:.0f}x"
                tab.add(N, dps, label, fmt_t(t_r), fmt_d(r.digits), fmt_d(d_r), fmt_m(m_r), fmt_t(t_m),
                        fmt_d(d_m), fmt_m(m_m), sp)
    return tab


_PURE_PYTHON_PADE = r"""
import gc, sys, time, mpmath, mpmath.libmp
N, dps = int(sys.argv[1]), int(sys.argv[2])
with mpmath.workdps(dps):
    c = [mpmath.mpf((-1) ** k) / (k + 1) for k in range(2 * N + 1)]
    gc.collect(); gc.disable()
    t = time.perf_counter(); mpmath.pade(c, N, N); t = time.perf_counter() - t
print(mpmath.libmp.BACKEND, t)
"""


def pure_python_pade_time(N, dps):
    """Seconds of the same mpmath.pade call in a fresh interpreter with mpmath's pure-Python
    backend (MPMATH_NOGMPY=1: mpmath as installed without gmpy2); None if that fails."""
    import os
    import subprocess
    env = dict(os.environ, MPMATH_NOGMPY="1")
    try:
        out = subprocess.run([sys.executable, "-c", _PURE_PYTHON_PADE, str(N), str(dps)], env=env,
                             capture_output=True, text=True, timeout=600, check=True).stdout.split()
    except (OSError, subprocess.SubprocessError):
        return None
    return float(out[1]) if len(out) == 2 and out[0] == "python" else None


def study_matched(cases):
    """resum asked for exactly the digits mpmath.pade delivers at mp.dps = dps."""
    tab = Table("[N/N] at matched accuracy: mpmath.pade at mp.dps = dps vs resum.pade asked for "
                "the digits mpmath delivered (at least 10), certified (ball) and estimated by residual. "
                f"mpmath.pade runs on mpmath's {mpmath.libmp.BACKEND} backend (the speed-up is against "
                "it); the last two columns time the same call on mpmath's pure-Python backend "
                "(MPMATH_NOGMPY=1, mpmath installed without gmpy2), for comparison only",
                ["N", "mp.dps", "mpmath.pade", "digits", "resum check", "resum (dps asked)", "claimed",
                 "digits", "speed-up", "mpmath.pade (pure Python)", "speed-up vs pure Python"])
    for N, dps in cases:
        c = series_log(2 * N + 1, dps)
        qref, _ = reference_q(c, N, dps + int(3 * N) + 100, need=dps + 120)

        def run_m():
            with workdps(dps):
                return mpmath.pade(c, N, N)
        t_m, (pm, qm) = timed(run_m)
        d_m = digits(qm, qref)
        ask = max(10, int(d_m))
        t_py = pure_python_pade_time(N, dps)
        for label, check in (("certified (ball)", "ball"), ("estimated by residual", "residual")):
            t_r, r = timed(lambda: pade(c, N, N, ask, check=check), repeat=2)
            tab.add(N, dps, fmt_t(t_m), fmt_d(d_m), label, f"{fmt_t(t_r)} ({ask})", fmt_d(r.digits),
                    fmt_d(digits(r.q, qref)), f"{t_m / t_r:.0f}x", fmt_t(t_py),
                    "-" if t_py is None else f"{t_py / t_r:.0f}x")
    return tab


def study_inplace(cases):
    """The in-place recursion (resum._kernels.arb_inplace) against the python-flint polynomial
    loop it replaces, same call, same numbers (checked here): an internal comparison."""
    from resum._kernels import arb_inplace
    tab = Table("[N/N] of log(1+x)/x with the recursion in place (FLINT's vector functions through "
                "ctypes) and on python-flint polynomials (the fallback); min of 12 calls each",
                ["N", "dps asked", "check", "in place", "python-flint loop", "ratio", "same result"])
    if not arb_inplace.available():
        tab.add("-", "-", "-", "not available here", "-", "-", "-")
        return tab
    lib = arb_inplace.lib
    for N, dps in cases:
        c = series_log(2 * N + 1, dps)
        for check in ("ball", "residual"):
            out = {}
            for label in ("in place", "loop"):
                arb_inplace.lib = lib if label == "in place" else None
                try:
                    t, r = timed(lambda: pade(c, N, N, dps, check=check), repeat=12)
                finally:
                    arb_inplace.lib = lib
                out[label] = (t, r)
            (t1, r1), (t2, r2) = out["in place"], out["loop"]
            same = r1.p == r2.p and r1.q == r2.q and r1.digits == r2.digits
            tab.add(N, dps, check, fmt_t(t1), fmt_t(t2), f"{t2 / t1:.2f}x", "yes" if same else "NO")
    return tab


def study_table(N, dps):
    tab = Table(f"Near-diagonal table (offsets -2..2, all orders up to [{N}/{N}]) at {dps} digits "
                f"vs one mpmath.pade [{N}/{N}]",
                ["entries", "resum.pade_table", "min claimed digits", "mem", f"mpmath.pade [{N}/{N}]",
                 "ratio"])
    c = series_log(2 * N + 1, dps)
    t_t, T = timed(lambda: pade_table(c, dps))
    m_t = peak_mem(lambda: pade_table(c, dps))

    def run_m():
        with workdps(dps):
            return mpmath.pade(c, N, N)
    t_m, _ = timed(run_m)
    tab.add(len(T), fmt_t(t_t), fmt_d(min(r.digits for r in T.values())), fmt_m(m_t), fmt_t(t_m),
            f"table {t_m / t_t:.1f}x faster")
    return tab


def study_roots(sizes, dps, cap):
    tab = Table(f"Roots of the [N/N] denominator of log(1+x)/x at {dps} digits: digits correct "
                "(worst root, relative)",
                ["N", "resum.poly_roots", "digits", "mpmath.polyroots", "digits", "numpy.roots",
                 "digits", "speed-up vs mpmath", "refined_roots (estimators)", "digits",
                 "acb_poly.roots, same tolerance", "speed-up vs acb_poly.roots"])
    import numpy as np
    for N in sizes:
        c = series_log(2 * N + 1, dps + 2 * N + 40)
        q = list(pade(c, N, N, dps + 10).q)
        t_r, roots = timed(lambda: poly_roots(q, dps))
        ref = poly_roots(q, 3 * dps)

        def worst(got):
            worst_d = math.inf
            with workdps(3 * dps):
                for z, _ in ref:
                    e = min(abs(mpmath.mpmathify(g) - z) for g in got)
                    worst_d = min(worst_d, float(mpmath.log10(abs(z) / e)) if e else math.inf)
            return worst_d
        d_r = worst([z for z, _ in roots])
        t_n, nr = timed(lambda: np.roots([complex(x) for x in reversed(q)]))
        d_n = worst(list(nr))
        if N > 60 and cap < 600:
            t_m = d_m = None
            sp = "skipped (cap)"
        else:
            def run_m():
                with workdps(dps):
                    return mpmath.polyroots(list(reversed(q)), maxsteps=500, extraprec=4 * dps)
            try:
                t_m, mr = timed(run_m)
                d_m = worst(mr)
                sp = f"{t_m / t_r:.0f}x"
            except mpmath.libmp.NoConvergence:
                t_m, d_m, sp = None, None, "baseline did not converge"
        # the estimators' path: Aberth sweeps and Newton steps proved by inclusion discs, against
        # Arb's isolation from scratch, both to an absolute 10^-dps on the same exact midpoints
        with fb.flint_prec(fb.prec_for_dps(dps + 10)):
            qa = flint.acb_poly([fb.to_arb(v) for v in q])
            tol = flint.arb(10) ** -dps
            t_a, fr = timed(lambda: refined_roots(qa, flint.ctx.prec, tol), repeat=2)
            t_f, _ = timed(lambda: qa.roots(tol=tol, maxprec=4 * flint.ctx.prec), repeat=2)
        d_a = None if fr is None else worst([fb.acb_to_mpc(z) for z in fr])
        tab.add(N, fmt_t(t_r), fmt_d(d_r), fmt_t(t_m), fmt_d(d_m), fmt_t(t_n), fmt_d(max(d_n, 0)), sp,
                fmt_t(t_a) if fr is not None else f"refused ({fmt_t(t_a)})", fmt_d(d_a), fmt_t(t_f),
                f"{t_f / t_a:.1f}x" if fr is not None else "-")
    return tab


def study_fp():
    import warnings
    from scipy.interpolate import pade as scipy_pade
    tab = Table("Double-precision [N/N] Padé of exp(x): resum.pade_fp (SVD, degree reduction) vs "
                "scipy.interpolate.pade; max relative error of the approximant on [-1, 1] "
                "(201 points) against mpmath.exp, as digits",
                ["[N/N]", "pade_fp", "degrees returned", "digits", "scipy", "digits"])
    xs = [mpmath.mpf(k) / 100 - 1 for k in range(201)]

    def val_digits(f):
        err = max(abs(f(float(x)) - float(mpmath.exp(x))) / float(mpmath.exp(x)) for x in xs)
        return math.inf if err == 0 else -math.log10(err)
    for N in (4, 8, 12, 16):
        cf = [1.0 / math.factorial(k) for k in range(2 * N + 1)]
        t_r, r = timed(lambda: pade_fp(cf, N, N), repeat=3)

        def fr(x, r=r):
            return sum(a * x ** k for k, a in enumerate(r.p)) / sum(b * x ** k for k, b in enumerate(r.q))
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")          # scipy warns on ill-conditioning
            t_s, (ps, qs) = timed(lambda: scipy_pade(cf, N), repeat=3)
        tab.add(f"[{N}/{N}]", fmt_t(t_r), f"[{r.L}/{r.M}]", fmt_d(val_digits(fr)), fmt_t(t_s),
                fmt_d(val_digits(lambda x: ps(x) / qs(x))))
    return tab


def _da_series(n, dps):
    """f = (1 - x)^(-1/3) + (1 + 2x)^(1/2) to ``n`` terms, exact rationals rounded to ``dps``
    digits: two algebraic branch points (radius 1/2), and, being a sum of two functions with
    different exponents, no first-order linear equation with polynomial coefficients, so the
    first-order approximant tables are regular (common practice, no source)."""
    from fractions import Fraction
    a, b, out = Fraction(1), Fraction(1), []
    for k in range(n):
        if k:
            a *= Fraction(3 * k - 2, 3 * k)                 # (1 - x)^(-1/3)
            b *= Fraction(2 * (3 - 2 * k), 2 * k)           # (1 + 2x)^(1/2): binom(1/2, k) 2^k
        out.append(a + b)
    with workdps(dps):
        return [mpmath.mpf(v.numerator) / v.denominator for v in out]


def _da_system(D, L, M):
    """The dense system of the first-order approximant (L; M, M), Q_1(0) = 1 (as in
    resum.estimators.diffapprox.fit_diffapprox)."""
    unknowns = [(j, i) for j in range(2) for i in range(M + 1) if not (j == 1 and i == 0)]
    S = len(unknowns)
    rows = [[D[j][n - i] if n - i >= 0 else 0 for j, i in unknowns] for n in range(L + 1, L + S + 1)]
    rhs = [-D[1][n] for n in range(L + 1, L + S + 1)]
    return rows, rhs


def _ratio(r):
    return f"{r:.0f}x" if r >= 10 else f"{r:.1f}x"


def study_da(cases, cap):
    """Linear solves of the differential approximants: resum's order basis against dense LU."""
    from resum.estimators import diffapprox
    from resum._kernels.hermite import hermite_pade
    tab = Table("First-order differential approximant (0; M, M) of (1-x)^(-1/3) + (1+2x)^(1/2): "
                "resum's order-basis recursion (two runs, for its error estimate) against one dense "
                "LU solve of the same system at the same precision (FLINT arb_mat.solve, approximate; "
                "mpmath.lu_solve). Digits correct normwise against FLINT's dense solve at "
                "2 dps + 100 digits on the same (rounded) input",
                ["unknowns", "dps", "resum", "claimed", "digits", "FLINT dense LU", "digits",
                 "mpmath.lu_solve", "digits", "speed-up vs FLINT", "vs mpmath"])
    rate = None
    for unknowns, dps in cases:
        M = unknowns // 2
        n = 2 * M + 3
        c = _da_series(n, dps)
        with workdps(dps + 10):
            D = diffapprox._deriv_coeffs(c, 1)
        sigma = 2 * M + 2
        ones = [1] + [0] * (sigma - 1)
        t_r, got = timed(lambda: hermite_pade([ones, D[0][:sigma], D[1][:sigma]], [0, M, M], dps,
                                              normalize=(2, 0)), repeat=2)
        with workdps(dps + 10):          # the negated right-hand side must not round
            rows, rhs = _da_system(D, 0, M)
        ref_dps = 2 * dps + 100
        with workdps(ref_dps), fb.flint_prec(fb.prec_for_dps(ref_dps)):
            A = flint.arb_mat([[fb.mpf_to_arb(mpmath.mpf(v)) for v in r] for r in rows])
            b = flint.arb_mat([[fb.mpf_to_arb(mpmath.mpf(v))] for v in rhs])
            xr = A.solve(b, algorithm="approx")
            ref = [fb.arb_to_mpf(xr[i, 0]) for i in range(len(rows))]
        if got is None:
            d_r, claim = None, None
        else:
            forms, err = got
            mine = forms[1] + forms[2][1:]
            d_r, claim = digits(mine, ref), -math.log10(err) if err > 0 else math.inf
        with workdps(dps + 10), fb.flint_prec(fb.prec_for_dps(dps + 10)):
            A = flint.arb_mat([[fb.mpf_to_arb(mpmath.mpf(v)) for v in r] for r in rows])
            b = flint.arb_mat([[fb.mpf_to_arb(mpmath.mpf(v))] for v in rhs])
            t_f, xf = timed(lambda: A.solve(b, algorithm="approx"), repeat=2)
            d_f = digits([fb.arb_to_mpf(xf[i, 0]) for i in range(len(rows))], ref)
        pred = None if rate is None else rate * len(rows) ** 3 * dps ** 1.6
        if pred is not None and pred > cap:
            t_m = d_m = None
            vs_m = f"skipped (cap: predicted {pred:.0f} s)"
        else:
            def run_m():
                with workdps(dps + 10):
                    return mpmath.lu_solve(mpmath.matrix(rows), mpmath.matrix(rhs))
            t_m, xm = timed(run_m)
            d_m = digits(list(xm), ref)
            rate = max(rate or 0, t_m / (len(rows) ** 3 * dps ** 1.6))
            vs_m = _ratio(t_m / t_r)
        tab.add(len(rows), dps, fmt_t(t_r), fmt_d(claim), fmt_d(d_r), fmt_t(t_f), fmt_d(d_f),
                fmt_t(t_m), fmt_d(d_m), _ratio(t_f / t_r), vs_m)
    return tab


def study_pipeline(dps):
    """analyze / evaluate on a 200-term series, if those modules exist."""
    tab = Table(f"Pipeline on a 200-term series at {dps} digits (with verification)",
                ["call", "time", "result"])
    try:
        from resum.analysis import analyze
        from resum.context import Context
        from resum.series import Series
    except ImportError as err:
        tab.add("analyze", "-", f"not available ({err})")
        return tab
    from fractions import Fraction
    # log(1+x)/x: radius 1, logarithmic branch point at x = -1 (common practice)
    s = Series([Fraction((-1) ** k, k + 1) for k in range(200)], name="log1p_over_x")
    ctx = Context(dps=dps)
    try:
        t, res = timed(lambda: analyze(s, ctx))
        rad = getattr(res, "radius", None)
        tab.add("analyze", fmt_t(t), f"radius {rad} (truth 1; band contains it: "
                f"{rad.contains(1) if rad is not None else None})" if rad is not None
                else str(res)[:60])
    except Exception as err:     # a study records a failure and goes on
        tab.add("analyze", "-", f"failed: {type(err).__name__}: {str(err)[:80]}")
    from resum.resummation import evaluate
    from resum.context import workdps
    # the target's ten points, from inside the disk (x = 0.5) to far beyond it (x = 20)
    xs = ["0.5", "1", "1.5", "2", "3", "4", "5", "7", "10", "20"]
    with workdps(dps + 40):
        inexact = Series([mpmath.mpf((-1) ** k) / (k + 1) for k in range(200)], name="log1p_over_x",
                         digits=dps + 30)
    for label, ser in (("exact rationals", s), (f"{dps + 30}-digit decimals", inexact)):
        try:
            t, res = timed(lambda: evaluate(ser, xs, ctx))
            with workdps(ctx.work_dps + 20):     # the truth at more digits than the bands
                inside = sum(bool(p.value.contains(mpmath.log1p(mpmath.mpf(x)) / mpmath.mpf(x)))
                             for x, p in zip(xs, res.points))
                worst = min(p.value.digits() for p in res.points)
            methods = sorted({p.method for p in res.points})
            tab.add(f"evaluate at 10 points, x = 0.5 .. 20 ({label})", fmt_t(t),
                    f"{inside}/10 bands contain log(1+x)/x; narrowest claim {worst:.1f} digits; "
                    f"method {', '.join(methods)}")
        except Exception as err:     # a study records a failure and goes on
            tab.add(f"evaluate at 10 points ({label})", "-", f"failed: {type(err).__name__}: {str(err)[:80]}")
    return tab


def main(argv=None):
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--quick", action="store_true", help="small sizes only (a smoke run)")
    ap.add_argument("--cap", type=float, default=120.0, help="baseline time cap in seconds")
    ap.add_argument("--out", default=str(HERE / "out"), help="folder for performance.txt")
    ap.add_argument("--pipeline", action="store_true", help="also time analyze/evaluate")
    ap.add_argument("--only", choices=["pade", "matched", "inplace", "table", "roots", "fp", "da",
                                       "pipeline"],
                    help="run one table only")
    args = ap.parse_args(argv)
    sizes = (25, 50) if args.quick else (25, 50, 100, 200)
    levels = (50, 100) if args.quick else (50, 100, 300)
    tables = []
    want = (lambda name: args.only in (None, name)) if args.only != "pipeline" else \
        (lambda name: name == "pipeline")
    if want("pade"):
        print("Padé [N/N]", flush=True)
        tables.append(study_pade(sizes, levels, args.cap))
    if want("matched"):
        print("matched", flush=True)
        tables.append(study_matched([(50, 100)] if args.quick else [(50, 300), (100, 300), (100, 100)]))
    if want("inplace"):
        print("in place", flush=True)
        tables.append(study_inplace([(50, 100)] if args.quick else [(50, 100), (100, 156), (100, 300),
                                                                     (200, 100)]))
    if want("table"):
        print("table", flush=True)
        tables.append(study_table(50 if args.quick else 100, 100 if args.quick else 300))
    if want("roots"):
        print("roots", flush=True)
        tables.append(study_roots((10, 25) if args.quick else (10, 25, 50, 100),
                                  50 if args.quick else 100, args.cap))
    if want("fp"):
        print("double precision", flush=True)
        tables.append(study_fp())
    if want("da"):
        print("differential approximants", flush=True)
        tables.append(study_da([(61, 60)] if args.quick else [(121, 100), (161, 150), (199, 210)],
                               args.cap))
    if args.pipeline or args.only == "pipeline":
        print("pipeline", flush=True)
        tables.append(study_pipeline(30))
    text = "\n\n".join(t.render() for t in tables) + "\n"
    out = Path(args.out)
    out.mkdir(parents=True, exist_ok=True)
    name = "performance.txt" if args.only is None else f"performance_{args.only}.txt"
    (out / name).write_text(text)
    print()
    print(text)
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
