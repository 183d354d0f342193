"""Helpers for study scripts: run a study folder's spec and print tables.

A study folder holds ``spec.toml``, a ``run.py`` that calls :func:`run_study`
and writes to ``out/`` (resuming an earlier run), and a README.
"""
from __future__ import annotations

import argparse
import time
from pathlib import Path

def run_study(here: Path, argv=None):
    """Run ``here/spec.toml`` into ``here/out`` (resuming), return (records, seconds, rc)."""
    from resum.cli import main
    from resum.batch import RunFolder
    p = argparse.ArgumentParser(description=f"run the study in {here.name}")
    p.add_argument("--jobs", default=None, help="worker processes (default: all cores)")
    p.add_argument("--cluster", default=None, help="dask scheduler address or local:N")
    p.add_argument("--fresh", action="store_true", help="delete out/ first")
    a = p.parse_args(argv)
    out = here / "out"
    if a.fresh and out.exists():
        import shutil
        shutil.rmtree(out)
    cmd = ["scan", str(here / "spec.toml"), "-o", str(out), "--resume"]
    if a.jobs:
        cmd += ["--jobs", str(a.jobs)]
    if a.cluster:
        cmd += ["--cluster", a.cluster]
    t = time.monotonic()
    rc = main(cmd)
    return RunFolder(out).records(), time.monotonic() - t, rc


def est(d):
    """An estimate dict as value(error) text, or '-'."""
    from resum.results import Estimate
    if not isinstance(d, dict) or d.get("value") in (None, "nan"):
        return "-"
    from resum.context import workdps
    with workdps(60):
        return str(Estimate.from_dict(d))


def table(rows, head):
    widths = [max(len(str(h)), *(len(str(r[i])) for r in rows)) for i, h in enumerate(head)]
    line = "  ".join(str(h).ljust(w) for h, w in zip(head, widths))
    print(line)
    print("-" * len(line))
    for r in rows:
        print("  ".join(str(c).ljust(w) for c, w in zip(r, widths)))


def _ulp_of_text(s: str):
    """One unit in the last written decimal place of ``s`` (as an mpf)."""
    import mpmath
    s = str(s).strip().lower()
    mant, _, exp = s.partition("e")
    dec = len(mant.split(".", 1)[1]) if "." in mant else 0
    return mpmath.mpf(10) ** (-dec + (int(exp) if exp else 0))


def bands_overlap(a: dict, b: dict) -> bool:
    """True when two recorded bands ``{"value", "lo", "hi"}`` overlap, each end
    widened by one unit in its last written digit (the records round their
    decimals to the digits the band supports plus guard digits)."""
    import mpmath
    with mpmath.workdps(80):
        def ends(d):
            v = d["value"]
            lo, hi = d.get("lo", v), d.get("hi", v)
            return (mpmath.mpf(lo) - _ulp_of_text(lo), mpmath.mpf(hi) + _ulp_of_text(hi))
        (alo, ahi), (blo, bhi) = ends(a), ends(b)
        return bool(alo <= bhi and blo <= ahi)
