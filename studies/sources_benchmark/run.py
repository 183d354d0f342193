"""Timing table for the series sources (one command: python studies/sources_benchmark/run.py).

Prints, for each case, the wall time and what was obtained (digits, sizes), plus one
side-by-side baseline: the same Bender-Wu recursion in plain Python Fractions.
Numbers depend on the machine; run it on an otherwise idle one.
"""
from __future__ import annotations

import argparse
import time
from fractions import Fraction

import mpmath

from resum.context import Context, workdps
from resum.sources import bes, oscillator


_CPU = {}


def _timed(f, *a, **k):
    """Run f; return (result, wall seconds). CPU seconds of the call are kept in _CPU
    under the id of the result (the machine may be shared; CPU time is steadier)."""
    t, c = time.perf_counter(), time.process_time()
    out = f(*a, **k)
    _CPU[id(out)] = time.process_time() - c
    return out, time.perf_counter() - t


def _fraction_bender_wu(orders, n=0):
    """Baseline: the monomial recursion of resum.sources.oscillator in Python Fractions."""
    a0 = {n: Fraction(1)}
    for j in range(n - 2, -1, -2):
        a0[j] = a0[j + 2] * (j + 2) * (j + 1) / (2 * (j - n))
    phis = [dict(a0)]
    E = [Fraction(2 * n + 1)]
    for k in range(1, orders):
        R = {}
        for j, v in phis[k - 1].items():
            R[j + 4] = R.get(j + 4, 0) - v
        for l in range(1, k):
            for j, v in phis[k - l].items():
                R[j] = R.get(j, 0) + E[l] * v
        coef, nxt = {}, Fraction(0)
        for j in range(n + 4 * k, n, -2):
            nxt = coef[j] = (nxt * (j + 2) * (j + 1) + R.get(j, 0)) / (2 * (j - n))
        Ek = -(nxt * (n + 2) * (n + 1) + R.get(n, 0))
        E.append(Ek)
        coef[n] = Fraction(0)
        for j in range(n - 2, -1, -2):
            coef[j] = (coef[j + 2] * (j + 2) * (j + 1) + R.get(j, 0) + Ek * a0[j]) / (2 * (j - n))
        phis.append(coef)
    return E


def main(argv=None):
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--quick", action="store_true", help="smaller cases (a smoke run)")
    args = ap.parse_args(argv)
    rows = []

    def add(label, out, dt, txt):
        rows.append((label, dt, _CPU.get(id(out), float("nan")), txt))

    loops_list = (20, 50) if args.quick else (50, 100, 150)
    for loops in loops_list:
        cs, dt = _timed(bes.weak_coupling_coefficients, "pi/4", loops, Context(dps=100))
        with workdps(120):
            worst = max(c.error / abs(c.value) for c in cs[1:])
        add(f"BES weak, a = pi/4, {loops} loops, 100 digits", cs, dt,
            f"certified; worst relative radius {mpmath.nstr(worst, 2)}")
    for g in ((1, 5) if args.quick else (1, 5, 20)):
        r, dt = _timed(bes.finite_coupling, g, "pi/4", Context(dps=20))
        with workdps(30):
            txt = (f"F = {mpmath.nstr(r.value.value, 22)}, band {mpmath.nstr(r.value.error, 2)}, "
                   f"size {r.size}, nodes {r.nodes}+{r.nodes_check}, success {r.success}")
        add(f"BES finite coupling, a = pi/4, g = {g}, 20 digits", r, dt, txt)
    r, dt = _timed(bes.finite_coupling, 5, 0, Context(dps=20))
    with workdps(30):
        err = abs(r.value.value - bes.zero_angle_closed_form(5, Context(dps=30)))
    add("BES finite coupling, a = 0, g = 5, 20 digits", r, dt,
        f"error against (2/pi^2) log cosh(2 pi g): {mpmath.nstr(err, 2)}")
    orders = 100 if args.quick else 300
    E, dt = _timed(oscillator.rs_coefficients, 0, orders)
    add(f"oscillator ground state, {orders} exact orders", E, dt,
        f"E_{orders - 1} has {len(str(E[-1].numerator))} digits")
    base_orders = 60 if args.quick else 120
    E1, dt1 = _timed(oscillator.rs_coefficients, 0, base_orders)
    E2, dt2 = _timed(_fraction_bender_wu, base_orders)
    assert E1 == E2
    c1, c2 = _CPU[id(E1)], _CPU[id(E2)]
    add(f"oscillator {base_orders} orders: resum vs plain Fractions", E1, dt1,
        f"baseline {c2:.2f} CPU s, ratio {c2 / c1:.1f}x, identical coefficients")
    r, dt = _timed(oscillator.energy, 1, 0, Context(dps=34))
    add("oscillator E_0(g = 1) to 34 digits", r, dt, f"basis {r.basis}, success {r.success}")
    w = max(len(a) for a, _, _, _ in rows)
    print(f"{'case'.ljust(w)}  {'wall s':>7}  {'CPU s':>7}  result")
    for a, dt, cpu, txt in rows:
        print(f"{a.ljust(w)}  {dt:7.2f}  {cpu:7.2f}  {txt}")


if __name__ == "__main__":
    main()
