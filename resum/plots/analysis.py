"""Figures of one singularity analysis.

Each ``plot_x(result, ax=None) -> ax`` takes an
:class:`~resum.analysis.AnalysisResult` (fresh or read back with
``from_dict``) and draws on ``ax`` (a new figure if None):

* :func:`plot_domb_sykes` -- ratios ``c_n/c_(n-s)`` against ``1/n`` with the fitted
  line ``mu^s (1 - s (1 + theta)/n)`` from the extrapolated intercept and exponent;
* :func:`plot_extrapolation` -- the Neville-table estimate of the singular point
  against the extrapolation order, with the chosen order and its band;
* :func:`plot_complex_plane` -- Padé poles and zeros (kept ones filled, Froissart
  doublets as crosses), the estimated singularities with their error boxes and
  the disk of convergence (the band as a shaded annulus);
* :func:`write_analysis_plots` -- all figures that have data, as PNG files.

Bands drawn are the result's bands: estimates from the spread of stable
approximations, not rigorous bounds.
"""
from __future__ import annotations

import os
import re
from typing import List

import mpmath

from . import save_figure

__all__ = ["plot_domb_sykes", "plot_extrapolation", "plot_complex_plane", "write_analysis_plots"]


def _ax(ax):
    if ax is None:
        import matplotlib
        matplotlib.use("Agg", force=False)
        import matplotlib.pyplot as plt
        _, ax = plt.subplots(figsize=(6, 4.5))
    return ax


def _c(x) -> complex:
    if isinstance(x, str):
        x = x.replace(" ", "")
        return complex(mpmath.mpmathify(x)) if "j" in x else complex(float(mpmath.mpf(x)))
    return complex(x)


def _f(x) -> float:
    return _c(x).real


def _method(result, name):
    m = result.methods.get(name)
    return m if (m is not None and m.success) else None


def plot_domb_sykes(result, ax=None):
    """Domb-Sykes plot of the ratio method, with the extrapolated line."""
    ax = _ax(ax)
    m = _method(result, "ratio")
    if m is None:
        ax.text(0.5, 0.5, "ratio method did not converge", ha="center", transform=ax.transAxes)
        return ax
    d = m.diagnostics
    s = int(d.get("step", 1))
    pts = [(int(n), _f(z)) for n, z in d.get("ratios", [])]
    xs = [1 / n for n, _ in pts]
    ys = [z for _, z in pts]
    ax.plot(xs, ys, "o", ms=3, label=f"c_n / c_(n-{s})")
    sing = m.singularities[0] if m.singularities else None
    if sing is not None and sing.exponent is not None:
        xc = _c(complex(float(sing.re.value), float(sing.im.value)))
        mus = (1 / xc) ** s
        th = float(sing.exponent.value)
        line_x = [0] + xs
        line_y = [(mus * (1 - s * (1 + th) * h)).real for h in line_x]
        ax.plot(line_x, line_y, "-", lw=1, label=f"intercept mu^{s}, slope from theta = {sing.exponent}")
        ax.plot([0], [mus.real], "s", color="C3")
    ax.set_xlabel("1/n")
    ax.set_ylabel(f"c_n / c_(n-{s})")
    ax.set_xlim(left=0)
    ax.set_title("Domb-Sykes plot")
    _legend(ax, fontsize=8)
    return ax


def plot_extrapolation(result, ax=None):
    """Neville-table estimate of |x_c| against extrapolation order (ratio method)."""
    ax = _ax(ax)
    m = _method(result, "ratio")
    if m is None:
        ax.text(0.5, 0.5, "ratio method did not converge", ha="center", transform=ax.transAxes)
        return ax
    d = m.diagnostics
    s = int(d.get("step", 1))
    tab = d.get("neville_intercept", {})
    cols = tab.get("columns", [])
    ks, vals, errs = [], [], []
    for col in cols:
        mus = _f(col["last"])
        if mus <= 0 and s == 2:
            continue
        r = abs(mus) ** (-1.0 / s)
        ks.append(int(col["k"]))
        vals.append(r)
        # spread of the column translated to the radius
        errs.append(r * _f(col["spread"]) / (s * abs(mus)) if mus else 0)
    ax.errorbar(ks, vals, yerr=errs, fmt="o-", ms=4, capsize=2, label="|x_c| from column k")
    ch = int(tab.get("chosen_k", -1))
    if m.radius is not None and ch >= 0:
        rv, lo, hi = float(m.radius.value), float(m.radius.lower), float(m.radius.upper)
        ax.axhspan(lo, hi, color="C2", alpha=0.25, label=f"band (order {ch})")
        ax.axhline(rv, color="C2", lw=1)
        pad = max(hi - lo, abs(rv) * 1e-12) * 20
        ax.set_ylim(rv - pad, rv + pad)
    ax.set_xlabel("extrapolation order k (Neville column)")
    ax.set_ylabel("radius estimate")
    ax.set_title("Extrapolation-table convergence")
    ax.legend(fontsize=8)
    return ax


def plot_complex_plane(result, ax=None, method=None):
    """Padé poles/zeros, estimated singularities with error boxes, disk of convergence."""
    ax = _ax(ax)
    from matplotlib.patches import Circle, Rectangle
    names = [method] if method else ["pade", "dlog"]
    drawn = False
    for i, name in enumerate(names):
        m = _method(result, name)
        if m is None:
            continue
        apps = m.diagnostics.get("approximants", [])
        px, py, zx, zy, sx, sy = [], [], [], [], [], []
        for a in apps:
            for z in a.get("poles", []):
                z = _c(z)
                px.append(z.real)
                py.append(z.imag)
            for z in a.get("zeros", []):
                z = _c(z)
                zx.append(z.real)
                zy.append(z.imag)
            for z in a.get("spurious", []):
                z = _c(z)
                sx.append(z.real)
                sy.append(z.imag)
        col = f"C{i}"
        ax.plot(px, py, "o", ms=3, color=col, label=f"{name} poles")
        ax.plot(zx, zy, "o", ms=3, mfc="none", color=col, alpha=0.6, label=f"{name} zeros")
        if sx:
            ax.plot(sx, sy, "x", ms=5, color="k", label=f"{name} Froissart doublets (removed)")
        drawn = True
    rad = result.radius
    scale = 1.0
    if rad is not None and mpmath.isfinite(rad.value) and rad.value > 0:
        rv, lo, hi = float(rad.value), float(rad.lower), float(rad.upper)
        nb = getattr(result, "natural_boundary", None) is not None
        ax.add_patch(Circle((0, 0), rv, fill=False, color="C2", lw=2 if nb else 1, ls="--" if nb else "-",
                            label="natural boundary suspected" if nb else "disk of convergence"))
        if nb and hi > lo:
            from matplotlib.patches import Annulus
            ax.add_patch(Annulus((0, 0), hi, hi - max(lo, 0), color="C2", alpha=0.12, lw=0))
        if hi > lo:
            ax.add_patch(Circle((0, 0), hi, fill=False, color="C2", lw=0.5, ls=":"))
            ax.add_patch(Circle((0, 0), max(lo, 0), fill=False, color="C2", lw=0.5, ls=":"))
        scale = rv
    for s in result.singularities:
        x, y = float(s.re.value), float(s.im.value)
        w = max(float(s.re.width), scale * 4e-3)
        h = max(float(s.im.width), scale * 4e-3)
        ax.add_patch(Rectangle((x - w / 2, y - h / 2), w, h, color="C3", alpha=0.4))
        ax.plot([x], [y], "*", ms=10, color="C3")
        ax.annotate(f"{s.kind}", (x, y), textcoords="offset points", xytext=(5, 5), fontsize=8)
    lim = 2.5 * scale
    ax.set_xlim(-lim, lim)
    ax.set_ylim(-lim, lim)
    ax.set_aspect("equal")
    ax.axhline(0, color="0.8", lw=0.5)
    ax.axvline(0, color="0.8", lw=0.5)
    var = result.diagnostics.get("variable", "x")
    ax.set_xlabel(f"Re {var}")
    ax.set_ylabel(f"Im {var}")
    ax.set_title("Complex plane: singularities (boxes: bands)" + ("" if drawn else " -- no Padé data"))
    _legend(ax, fontsize=7, loc="upper right")
    return ax


def _legend(ax, **kw):
    """A legend only when something carries a label (matplotlib warns on stderr otherwise)."""
    if ax.get_legend_handles_labels()[0]:
        ax.legend(**kw)


def plot_large_order(result, ax=None):
    """Factorial growth: z_n / n = c_n / (n c_(n-1)) against 1/n (for Gamma(m n + b) growth,
    z_n / (m n)^m), with the extrapolated 1/A at 1/n = 0 and its band."""
    ax = _ax(ax)
    m = _method(result, "large-order")
    if m is None or result.borel_singularity is None:
        ax.text(0.5, 0.5, "the large-order fit did not converge", ha="center", transform=ax.transAxes)
        return ax
    d = m.diagnostics
    k = int(d.get("gamma_multiple", 1))
    pts = [(int(n), _f(z) / (k * int(n)) ** k) for n, z in d.get("ratios", [])]
    ax.plot([1 / n for n, _ in pts], [y for _, y in pts], "o", ms=3,
            label="c_n / (n c_(n-1))" if k == 1 else f"c_n / (({k} n)^{k} c_(n-1))")
    A = result.borel_singularity
    inv = [1 / _f(A.value)] + [1 / _f(v) for v in (A.lower, A.upper) if _f(v) != 0]
    ax.errorbar([0], [inv[0]], yerr=[[max(0, inv[0] - min(inv))], [max(0, max(inv) - inv[0])]], fmt="s",
                color="C3", capsize=3, label=f"1/A, A = {A}")
    ax.set_xlabel("1/n")
    ax.set_ylabel("ratio / n" if k == 1 else f"ratio / ({k} n)^{k}")
    ax.set_xlim(left=0)
    ax.set_title("Large-order ratios (factorial growth)")
    _legend(ax, fontsize=8)
    return ax


def figure_stem(name) -> str:
    """A file-name stem from a series name that needs no quoting in a shell: letters, digits,
    ``.``, ``+`` and ``-`` kept, every other run of characters one ``_`` ("bes(angle=pi/3)" ->
    "bes_angle_pi_3", "ising chi" -> "ising_chi"); "series" when nothing is left.

    >>> figure_stem("bes(angle=pi/3)"), figure_stem("ising chi"), figure_stem(None)
    ('bes_angle_pi_3', 'ising_chi', 'series')
    """
    stem = re.sub(r"[^A-Za-z0-9.+-]+", "_", name or "").strip("_.")
    return stem or "series"


def write_analysis_plots(result, series, outdir) -> List[str]:
    """Write every figure that has data to ``outdir`` as PNG; returns the paths."""
    import matplotlib
    matplotlib.use("Agg", force=False)
    import matplotlib.pyplot as plt
    os.makedirs(outdir, exist_ok=True)
    stem = figure_stem(series.name if series is not None else None)
    out = []
    jobs = [("complex_plane", plot_complex_plane)]
    if result.growth == "factorial":
        # no singular points of the series itself: the Borel-plane distance from the ratios
        jobs = [("large_order", plot_large_order)] if result.borel_singularity is not None else []
    elif _method(result, "ratio") is not None:
        jobs = [("domb_sykes", plot_domb_sykes), ("extrapolation", plot_extrapolation)] + jobs
    for name, fn in jobs:
        fig, ax = plt.subplots(figsize=(6, 4.5))
        try:
            fn(result, ax=ax)
            path = os.path.join(str(outdir), f"{stem}_{name}.png")
            save_figure(fig, path, dpi=110, bbox_inches="tight")
            out.append(path)
        finally:
            plt.close(fig)
    return out
