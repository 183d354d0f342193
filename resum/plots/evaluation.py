"""Figures for resummed evaluations: the curve with its band, digits, the Borel plane.

Each function draws on a matplotlib axis (created when ``ax`` is None) and
returns it; :func:`write_evaluation_plots` writes the set to a folder.
Matplotlib is imported lazily, so resum works without it.
"""
from __future__ import annotations

import os
from typing import Optional, Sequence

import mpmath

from ..context import Context, workdps
from ..results import sig_text
from . import save_figure

__all__ = ["plot_evaluation", "plot_digits", "plot_borel_plane", "write_evaluation_plots", "curve_grid",
           "plot_strong_fit", "write_strong_plot"]


def _ax(ax):
    if ax is None:
        import matplotlib
        matplotlib.use("Agg", force=False)
        import matplotlib.pyplot as plt
        _, ax = plt.subplots(figsize=(6.4, 4.2))
    return ax


def _real_points(result):
    """Points with a value at real arguments, in increasing order: the line joining them must
    follow the axis, not the order in which the points were asked for."""
    pts = [p for p in result.points if p.value is not None and not isinstance(p.at, mpmath.mpc)]
    return sorted(pts, key=lambda p: p.at)


def _x_scale(ax, xs):
    """A logarithmic axis when the positive points span two decades or more (1, 10, 10^6
    would otherwise crowd all but the last point against the left edge)."""
    if xs and min(xs) > 0 and max(xs) >= 100 * min(xs):
        ax.set_xscale("log")


def curve_grid(points, n: int = 24) -> list:
    """``n`` real points spanning the real ones among ``points`` (the couplings asked for), at
    which to draw the resummed curve: geometric from the smallest to the largest when they are
    all positive and span two decades or more (the axis is then logarithmic), otherwise evenly
    spaced over the interval from 0 (or the smallest) to the largest, leaving out 0 itself.
    Empty when no real non-zero point is given or ``n < 1``."""
    from ..resummation import parse_points, spaced_points
    vals = parse_points(list(points), mpmath.mp.dps)
    reals = [mpmath.re(a) for a in vals if mpmath.im(a) == 0 and a != 0]
    if not reals or n < 1:
        return []
    lo, hi = min(reals), max(reals)
    if lo > 0 and hi >= 100 * lo:
        return spaced_points(lo, hi, max(n, 2), geometric=True)
    a, b = min(lo, 0), max(hi, 0)
    return [g for g in spaced_points(a, b, n + 1) if g != 0]


def _draw_curve(ax, curve, result):
    """The resummed curve on the extra grid: a line through the values and the band shaded
    (without verification reruns: the curve is drawn from one run at the working precision),
    passing through the points asked for as well. Curve points without a converged value (on
    a cut, beyond what the series supports) are left out, not drawn as if they held."""
    pts = sorted([p for p in _real_points(curve) if p.success] + _real_points(result), key=lambda p: p.at)
    if len(pts) < 2:
        return
    xs = [float(p.at) for p in pts]
    ax.fill_between(xs, [float(p.value.lower) for p in pts], [float(p.value.upper) for p in pts],
                    alpha=0.25, lw=0, label="band (curve: no verification reruns)")
    ax.plot(xs, [float(p.value.value) for p in pts], "-", lw=1.2,
            label=f"resummed curve ({pts[0].method})")


def plot_evaluation(result, ax=None, reference: Optional[Sequence] = None, curve=None):
    """Resummed value against the point, with its band, the optimal-truncation
    baseline (band +- smallest term) and any reference values. ``curve``: an
    evaluation of the same series at more points (see :func:`curve_grid`), drawn
    as a line with its band shaded; the points asked for are then markers."""
    ax = _ax(ax)
    with workdps((result.provenance.dps if result.provenance else 50) + 10):
        if curve is not None:
            _draw_curve(ax, curve, result)
        pts = _real_points(result)
        xs = [float(p.at) for p in pts]
        ys = [float(p.value.value) for p in pts]
        lo = [float(p.value.value - p.value.lower) for p in pts]
        hi = [float(p.value.upper - p.value.value) for p in pts]
        ax.errorbar(xs, ys, yerr=[lo, hi], fmt="o" if curve is not None else "o-", ms=4, capsize=3,
                    label=f"resummed ({result.points[0].method})" if result.points else "resummed")
        bs = [p for p in result.points if p.baseline is not None and not isinstance(p.at, mpmath.mpc)]
        if bs:
            # the window: the values asked for and those of the curve
            yw = ys + ([float(p.value.value) for p in _real_points(curve) if p.success] if curve is not None else [])
            span = max(yw) - min(yw) if len(yw) > 1 else (abs(yw[0]) if yw else 1)
            pad = span if curve is None else span / 8     # a curve fills its window itself
            lo_y, hi_y = (min(yw) - pad, max(yw) + pad) if yw else (None, None)
            # a baseline whose error bar is wider than the window says nothing it can show:
            # it is counted in the legend instead of drawn across the figure
            # (nor does one that sums no non-zero term: beyond the radius the first term is
            # already the smallest, and "0 +- that term" is no value)
            # (nor one whose error is as large as its value: no digit, e.g. 1 +- 1 beyond the radius)
            shown = [p for p in bs if (lo_y is None or float(p.baseline.value.error) <= span)
                     and p.baseline.n_terms > 0 and p.baseline.value.value != 0
                     and p.baseline.value.error < abs(p.baseline.value.value)]
            off = len(bs) - len(shown)
            label = "optimal truncation" + (f" ({off} off scale: error > {span:.3g})" if off else "")
            if shown:
                ax.errorbar([float(p.at) for p in shown], [float(p.baseline.value.value) for p in shown],
                            yerr=[float(p.baseline.value.error) for p in shown], fmt="s", ms=3, alpha=0.6,
                            capsize=2, label=label)
            elif off:
                ax.plot([], [], "s", ms=3, alpha=0.6, label=label)
            if lo_y is not None and lo_y != hi_y:
                ax.set_ylim(lo_y, hi_y)
        if reference:
            ax.plot([float(a) for a, _, _ in reference], [float(v) for _, v, _ in reference], "x", ms=7,
                    label="reference")
    _x_scale(ax, xs)
    ax.set_xlabel(result.at_symbol)
    ax.set_ylabel("f")
    n_cplx = sum(1 for p in result.points if isinstance(p.at, mpmath.mpc))
    ax.set_title("Resummed function with band" + (f" ({n_cplx} complex point{'s' if n_cplx > 1 else ''} "
                                                  "not drawn: see the report)" if n_cplx else ""))
    ax.legend(fontsize=8)
    return ax


def plot_digits(result, ax=None, reference: Optional[Sequence] = None, curve=None):
    """Digits supported by each band (and, with references, digits actually agreeing).
    ``curve``: an evaluation at more points (:func:`curve_grid`), whose digits are drawn as a
    line (how fast the series' reach falls off with the coupling); the points asked for are then
    markers."""
    ax = _ax(ax)
    with workdps((result.provenance.dps if result.provenance else 50) + 10):
        pts = _real_points(result)
        if curve is not None:
            cp = sorted([p for p in _real_points(curve) if p.success] + pts, key=lambda p: p.at)
            if len(cp) >= 2:
                ax.plot([float(p.at) for p in cp], [min(p.value.digits(), 200) for p in cp], "-", lw=1.2,
                        label="band (curve: no verification reruns)")
        ax.plot([float(p.at) for p in pts], [min(p.value.digits(), 200) for p in pts],
                "o" if curve is not None else "o-", label="band")
        if reference:
            xs, ds = [], []
            for a, v, _ in reference:
                near = [p for p in pts if abs(p.at - a) <= mpmath.mpf(10) ** -10 * max(1, abs(a))]
                if near and v != 0:
                    err = abs(near[0].value.value - v)
                    xs.append(float(a))
                    ds.append(float(-mpmath.log10(err / abs(v))) if err else 200.0)
            if xs:
                ax.plot(xs, ds, "x", ms=7, label="agreeing with reference")
    _x_scale(ax, [float(p.at) for p in pts])
    ax.set_xlabel(result.at_symbol)
    ax.set_ylabel("significant digits")
    ax.set_title("Digits supported by the band")
    ax.legend(fontsize=8)
    return ax


def plot_borel_plane(series, ctx, ax=None, b=0, dps=None, doublet_tol=1e-6):
    """Poles and zeros of the top near-diagonal Padé approximant of the Borel transform.

    ``dps`` is the working precision of the approximant; pass the one the
    evaluation used (``result.provenance.dps``): at too few digits the
    rounding of the Borel coefficients itself creates pole-zero pairs. A cut
    shows as a line of poles interleaved with zeros; a pole with a zero closer
    than ``doublet_tol`` (relative) is drawn as a Froissart doublet (grey),
    a heuristic, not a proof. The window is sized from the nearest other
    pole; the title counts what falls outside. The Laplace integral runs
    along the positive real axis (drawn in green).
    """
    from ..estimators._num import nearest_distances
    from ..estimators.resum_band import rational_fit
    from ..transforms.borel import borel_coefficients
    ax = _ax(ax)
    work = int(dps) if dps else ctx.work_dps
    outside = 0
    with workdps(work):
        c = series.dense(Context(dps=work, guard=0))
        d = borel_coefficients(c, b)
        n = len(d)
        M = (n - 1) // 2
        r = rational_fit(d, n - 1 - M, M, work)
        if r is not None:
            ps, zs = r.poles(work), r.zeros(work)
            pair = [d <= doublet_tol * max(1, abs(z)) for z, d in zip(ps, nearest_distances(ps, zs))]
            good = [z for z, b in zip(ps, pair) if not b]
            bad = [z for z, b in zip(ps, pair) if b]
            near = min((abs(z) for z in good or ps), default=mpmath.mpf(1))
            half = float(6 * near) if near > 0 else 1.0
            inside = lambda z: abs(float(mpmath.re(z))) <= half and abs(float(mpmath.im(z))) <= half  # noqa: E731
            outside = sum(1 for z in ps + zs if not inside(z))
            for pts, style, kw in ((good, "x", {"label": "poles", "color": "C0"}),
                                   (zs, "o", {"label": "zeros", "mfc": "none", "ms": 4, "color": "C1"}),
                                   (bad, "s", {"label": "Froissart doublets", "mfc": "none", "ms": 7,
                                               "color": "0.5"})):
                pts = [z for z in pts if inside(z)]
                if pts:
                    ax.plot([float(mpmath.re(z)) for z in pts], [float(mpmath.im(z)) for z in pts],
                            style, **kw)
            ax.set_xlim(-half, half)
            ax.set_ylim(-half, half)
            ax.plot([0, half], [0, 0], color="C2", lw=2.5, alpha=0.6, label="Laplace integration ray",
                    zorder=0)
    ax.axhline(0, color="0.7", lw=0.6)
    ax.axvline(0, color="0.7", lw=0.6)
    ax.set_aspect("equal")
    ax.set_xlabel("Re t")
    ax.set_ylabel("Im t")
    more = f"; {outside} outside the window" if outside else ""
    ax.set_title(f"Borel plane (b = {sig_text(b, 6)}): [{n - 1 - M}/{M}] Padé at {work} digits{more}",
                 fontsize=9)
    ax.legend(fontsize=8)
    return ax


def write_evaluation_plots(result, series, ctx, folder, reference=None, curve=None) -> list:
    """Write evaluation.png, digits.png and (for Borel methods) borel_plane.png; returns the paths.
    ``curve``: an evaluation at more points, drawn in evaluation.png (see :func:`plot_evaluation`)."""
    import matplotlib
    matplotlib.use("Agg", force=False)
    import matplotlib.pyplot as plt
    os.makedirs(folder, exist_ok=True)
    out = []
    for name, fn in (("evaluation.png", lambda ax: plot_evaluation(result, ax, reference, curve)),
                     ("digits.png", lambda ax: plot_digits(result, ax, reference, curve))):
        fig, ax = plt.subplots(figsize=(6.4, 4.2))
        fn(ax)
        fig.tight_layout()
        path = os.path.join(folder, name)
        save_figure(fig, path, dpi=110)
        plt.close(fig)
        out.append(path)
    method = result.provenance.method if result.provenance else ""
    if method.startswith("borel"):
        fig, ax = plt.subplots(figsize=(5.6, 5.0))
        b = result.provenance.options.get("borel_b", "0")
        plot_borel_plane(series, ctx, ax, b=mpmath.mpf(b), dps=result.provenance.dps)
        fig.tight_layout()
        path = os.path.join(folder, "borel_plane.png")
        save_figure(fig, path, dpi=110)
        plt.close(fig)
        out.append(path)
    return out


def _fit_terms(result):
    """``[(power as mpf, with_log, Estimate)]`` of a strong-coupling fit's coefficients, read
    from their labels (``g^1/3``, ``g^-1 log g``); labels of another form are left out."""
    from ..estimators.strong_coupling import label_power
    out = []
    for label, est in result.coefficients:
        lp = label_power(label)
        if lp is not None:
            out.append((mpmath.mpf(lp[0].numerator) / lp[0].denominator, lp[1], est))
    return out


def plot_strong_fit(result, ax=None):
    """The strong-coupling probe at a glance: the resummed values divided by ``g^p`` (p the
    leading power), with their bands, against the coupling, approaching the leading
    coefficient; the fitted form (central coefficients) divided the same way, and the leading
    coefficient's band. Values the fit did not trust (band above its limit) are drawn open."""
    ax = _ax(ax)
    var = result.variable
    lp = result.leading_power
    terms = _fit_terms(result)
    if lp is None or not result.couplings:
        ax.text(0.5, 0.5, "no strong-coupling fit", ha="center", va="center", transform=ax.transAxes)
        return ax
    with workdps(30):
        p = mpmath.mpf(lp.value)
        trusted = result.trusted_up_to
        pts = [(g, v) for g, v in zip(result.couplings, result.values) if v is not None and g > 0]
        for sharp in (True, False):
            sel = [(g, v) for g, v in pts if (trusted is not None and g <= trusted) == sharp]
            if not sel:
                continue
            xs = [float(g) for g, _ in sel]
            ys = [float(v.value / g ** p) for g, v in sel]
            err = [float((v.upper - v.lower) / 2 / g ** p) for g, v in sel]
            ax.errorbar(xs, ys, yerr=err, fmt="o", mfc=None if sharp else "none",
                        ms=4, capsize=2, lw=1,
                        label=f"resummed f / {var}^p" + ("" if sharp else " (not used by the fit)"))
        if terms:
            gs = [g for g, _ in pts]
            lo, hi = min(gs), max(gs)
            grid = [lo * (hi / lo) ** (mpmath.mpf(k) / 60) for k in range(61)] if hi > lo else [lo]

            def form(g):
                s = mpmath.mpf(0)
                for pw, lg, est in terms:
                    s += est.value * g ** pw * (mpmath.log(g) if lg else 1)
                return s / g ** p
            exp_fitted = isinstance(result.diagnostics.get("exponential"), dict)
            ax.plot([float(g) for g in grid], [float(form(g)) for g in grid], "-", lw=1.2,
                    label="fitted form / " + f"{var}^p"
                    + (" (its powers; the exponential term left out)" if exp_fitted else ""))
            from ..estimators.strong_coupling import leading_label
            e = result.coefficient(leading_label([lab for lab, _ in result.coefficients]))
            if e is not None:
                ax.axhspan(float(e.lower), float(e.upper), alpha=0.2, lw=0,
                           label=f"leading coefficient {e}")
    _x_scale(ax, [float(g) for g, _ in pts])
    ax.set_xlabel(var)
    from ..estimators.strong_coupling import leading_power_text
    ax.set_ylabel(f"f / {var}^p,  p = {leading_power_text(result.leading_power)}")
    ax.set_title(f"strong-coupling probe ({result.status.value})", fontsize=10)
    ax.legend(fontsize=7)
    return ax


def write_strong_plot(result, folder) -> list:
    """Write strong.png (:func:`plot_strong_fit`); returns the paths."""
    import matplotlib
    matplotlib.use("Agg", force=False)
    import matplotlib.pyplot as plt
    os.makedirs(folder, exist_ok=True)
    fig, ax = plt.subplots(figsize=(6.4, 4.2))
    plot_strong_fit(result, ax)
    fig.tight_layout()
    path = os.path.join(folder, "strong.png")
    save_figure(fig, path, dpi=110)
    plt.close(fig)
    return [path]
