"""Figures of a family study: estimates with their bands against a parameter.

Every function takes the point records of a run (the dicts in
``DIR/points/*.json``, e.g. ``RunFolder(DIR).records()``) and an axis name
``x``, draws on ``ax`` (a new figure if None) and returns ``ax``. Points
that differ in other axes are drawn as separate lines, labelled by those
values (where a colour stands for a coupling or a kind of fit, they differ
in marker and line style). Error bars are the recorded bands (estimates from the spread of
stable approximations, not rigorous bounds); a band too narrow to see is
still drawn. Failed points and estimates that did not converge are left
out of the line and marked with a cross at the bottom of the panel, in the
colour of the estimate and named after it in the legend. A legend that
would cover a point wherever it sat inside its panel is put beside it.

* :func:`plot_radius` -- radius of convergence (analysis and/or ratio estimate);
* :func:`plot_band_digits` -- digits supported by the radius band;
* :func:`plot_singularity_locations` -- real and imaginary parts of the nearest singularities;
* :func:`plot_beyond` -- the nearest singular point and those further along its cut;
* :func:`plot_exponents` -- their exponents;
* :func:`plot_borel` -- distance of the nearest Borel-plane singularity;
* :func:`plot_borel_exponent` -- the Gamma-function shift b of the large-order growth;
* :func:`plot_values` -- resummed values at fixed couplings, with the source's truth;
* :func:`plot_value_errors` -- resummed minus true values in units of the band;
* :func:`plot_value_digits` -- digits claimed by the bands and digits that agree with the truth;
* :func:`plot_strong` -- one strong-coupling coefficient;
* :func:`plot_terms_used` -- terms each point ended with when a goal in digits was asked;
* :func:`write_family_plots` -- all figures that have data, as PNG and PDF.
"""
from __future__ import annotations

import math
import re
from pathlib import Path
from typing import Callable, Optional

from . import save_figure

__all__ = ["plot_radius", "plot_band_digits", "plot_singularity_locations", "plot_exponents",
           "plot_borel", "plot_borel_exponent", "plot_values", "plot_value_errors", "plot_value_digits", "plot_strong", "strong_panels", "plot_terms_used", "write_family_plots",
           "family_x"]


# ----------------------------------------------------------------------------
# reading records
# ----------------------------------------------------------------------------

def _f(v) -> float:
    if v is None:
        return math.nan
    if isinstance(v, (int, float)):
        return float(v)
    s = str(v).strip()
    if "/" in s:
        a, b = s.split("/", 1)
        return float(a) / float(b)
    try:
        return float(s)
    except ValueError:
        return math.nan


def _band(e):
    """(value, lo, hi) floats from an estimate dict, or None."""
    if not isinstance(e, dict) or "value" not in e:
        return None
    v = _f(e["value"])
    lo = _f(e.get("lo", e["value"]))
    hi = _f(e.get("hi", e["value"]))
    if math.isnan(v):
        return None
    return v, lo, hi


def family_x(records, x: Optional[str] = None) -> str:
    """The axis to plot against: ``x`` or the first axis of the records."""
    if x:
        return x
    for r in records:
        if r.get("axes"):
            return r["axes"][0]
    raise ValueError("records name no axis; pass x=")


def _group_label(rec, x):
    labels = rec.get("labels", {})
    return ", ".join(f"{k}={labels[k]}" for k in rec.get("axes", sorted(labels))
                     if k != x and k in labels)


MISS = "miss"   # a getter's answer for "asked for, but failed or not converged"


def _series(records, x, get: Callable, task: Optional[str] = None):
    """{group label: ([x], [v], [lo], [hi], [x of missing])} for one quantity.

    ``get(record)`` returns (value, lo, hi), None (not asked for: nothing
    drawn) or MISS (asked for but failed or not converged: a cross)."""
    out = {}
    for r in sorted(records, key=lambda r: r["index"]):
        g = _group_label(r, x)
        xv = _f(r.get("params", {}).get(x))
        if r.get("status") == "ok":
            b = get(r)
        else:   # a failed point: a cross where the task was asked for
            b = MISS if task is None or task in r.get("task_names", [task]) else None
        # every group gets its entry (empty if it has nothing to draw), so that a group has the
        # same position, and so the same style, in every quantity drawn from these records
        xs, vs, los, his, miss = out.setdefault(g, ([], [], [], [], []))
        if b is None:
            continue
        if b is MISS:
            miss.append(xv)
            continue
        xs.append(xv)
        vs.append(b[0])
        los.append(b[1])
        his.append(b[2])
    return out


def _task(r, name):
    t = (r.get("tasks") or {}).get(name)
    return t if isinstance(t, dict) else None


def _converged(d) -> bool:
    st = d.get("status") if isinstance(d, dict) else None
    return st in (None, "converged", "ok", True) or d.get("success") is True


def _or_miss(b):
    return MISS if b is None else b


def _get_radius_analysis(r):
    a = _task(r, "analyze")
    if a is None:
        return None
    if a.get("success") is False or a.get("growth") == "factorial":
        return MISS
    return _or_miss(_band(a.get("radius")))


def _get_radius_ratio(r):
    c = _task(r, "coefficients")
    if c is None:
        return None
    ratio = c.get("ratio") or {}
    if ratio.get("growth") == "factorial":
        return None
    if ratio.get("growth") != "finite radius" or not _converged(ratio):
        return MISS
    return _or_miss(_band(ratio.get("radius")))


def _borel_part(a, part):
    """A ("A") or b ("b") of the analysis record (contract layout ``borel: {A, b}``,
    or the full layout ``borel_singularity`` / ``borel_exponent``)."""
    b = a.get("borel")
    if isinstance(b, dict) and b.get(part) is not None:
        return b[part]
    return a.get("borel_singularity" if part == "A" else "borel_exponent")


def _get_borel_analysis(r, part="A"):
    a = _task(r, "analyze")
    if a is None or a.get("growth") != "factorial":
        return None
    e = _borel_part(a, part)
    if e is None:
        return MISS
    b = _band(e)
    if b is None or part != "A":
        return _or_miss(b)
    # the distance |A| (A is negative for alternating series)
    v, lo, hi = b
    return (abs(v), min(abs(lo), abs(hi)), max(abs(lo), abs(hi))) if lo * hi > 0 else (abs(v), 0.0, max(abs(lo), abs(hi)))


def _get_borel_exponent(r):
    return _get_borel_analysis(r, "b")


def _get_borel_ratio(r):
    c = _task(r, "coefficients")
    ratio = (c or {}).get("ratio") or {}
    if ratio.get("growth") != "factorial":
        return None
    if not _converged(ratio):
        return MISS
    return _or_miss(_band(ratio.get("borel_distance")))


def _sings(r):
    a = _task(r, "analyze")
    if not a:
        return []
    return [s for s in (a.get("singularities") or []) if isinstance(s, dict)]


def _sing_part(s, part):
    band = s.get(f"{part}_band")
    if isinstance(band, dict):
        return _band(band)
    v = s.get(part)
    if isinstance(v, dict):
        return _band(v)
    if v is not None:
        f = _f(v)
        return (f, f, f) if not math.isnan(f) else None
    return None


def _at_key(a) -> str:
    """Couplings compared by value, whatever their spelling ("1", "1.0")."""
    f = _f(a)
    return str(a) if math.isnan(f) else f"{f:.12g}"


def _values(r, task):
    t = _task(r, task)
    return {_at_key(v.get("at")): v for v in (t or {}).get("values", []) if isinstance(v, dict)}


# ----------------------------------------------------------------------------
# drawing
# ----------------------------------------------------------------------------

def _ax(ax):
    if ax is None:
        import matplotlib
        matplotlib.use("Agg", force=False)
        import matplotlib.pyplot as plt
        _, ax = plt.subplots(figsize=(6.4, 4.2))
    return ax


_GROUP_MARKERS = ("o", "s", "^", "v", "P", "X", "<", ">")
_GROUP_LINES = ("-", "--", ":", "-.")


def _open_marker(gi, n_groups):
    """Marker of the open symbols (the source's values): a diamond with one group, else the
    shape of the group's filled markers (drawn with base marker "o")."""
    if n_groups <= 1:
        return "D"
    others = [m for m in _GROUP_MARKERS if m != "o"]
    return "o" if gi == 0 else others[(gi - 1) % len(others)]


def _draw(ax, series, label_prefix="", marker="o", color=None, offset=0.0, lines=True):
    """Draw grouped (x, value, band) series; return the number of points drawn.

    With a fixed ``color`` (one colour per coupling, or per kind of fit) and several groups
    (points differing in another axis), the groups differ in marker and line style: in one
    colour they would be indistinguishable, in the figure and in the legend."""
    n = 0
    styled = color is not None and len(series) > 1
    for gi, (g, (xs, vs, los, his, miss)) in enumerate(series.items()):
        lab = ", ".join(t for t in (label_prefix, g) if t)
        mk, ls = marker, "-"
        if styled:
            others = [m for m in _GROUP_MARKERS if m != marker]
            mk = marker if gi == 0 else others[(gi - 1) % len(others)]
            ls = _GROUP_LINES[gi % len(_GROUP_LINES)]
        top = [xv for xv, v in zip(xs, vs) if v == math.inf]
        if top:
            # an infinite value (the radius of an entire function, a polynomial): an arrow at the
            # top edge, not a point the axis would have to reach
            keep = [i for i, v in enumerate(vs) if v != math.inf]
            xs, vs, los, his = ([t[i] for i in keep] for t in (xs, vs, los, his))
            seen = "infinite (entire)" in ax.get_legend_handles_labels()[1]
            ax.plot(top, [1] * len(top), "^", color=color or "0.3", transform=ax.get_xaxis_transform(),
                    clip_on=False, ms=6, label=None if seen else "infinite (entire)")
            n += len(top)
        if xs:
            n += len(xs)
            if lines and miss:
                # a failed point breaks the line (NaN), so no segment bridges it
                pts = sorted([(xv, v, lo, hi) for xv, v, lo, hi in zip(xs, vs, los, his)]
                             + [(xv, math.nan, math.nan, math.nan) for xv in miss])
                xs, vs, los, his = (list(t) for t in zip(*pts))
            yerr = [[max(0.0, v - lo) for v, lo in zip(vs, los)],
                    [max(0.0, hi - v) for v, hi in zip(vs, his)]]
            xo = [xv + offset for xv in xs]
            eb = ax.errorbar(xo, vs, yerr=yerr, fmt=mk, ls=ls if lines else "none", ms=4, lw=1,
                             capsize=2.5, label=lab or None, color=color)
            drawn_colour = eb.lines[0].get_color()
        else:
            drawn_colour = color
        if miss:
            # the cross says whose estimate is missing (in its colour): a bare "failed" under a
            # panel with two estimates, or several groups, does not tell which one failed
            miss_label = f"{lab}: failed or not converged" if lab else "failed or not converged"
            seen = miss_label in ax.get_legend_handles_labels()[1]
            # crosses of several estimates at one x are stacked upwards, not drawn over each other
            # (only the last one would show)
            before = [xv for ln in ax.get_lines() if ln.get_marker() == "x" for xv in ln.get_xdata()]
            ys = [0.045 * before.count(xv) for xv in miss]
            ax.plot(miss, ys, "x", color=drawn_colour or "0.5",
                    transform=ax.get_xaxis_transform(), clip_on=False, ms=6,
                    label=None if seen else miss_label)
    return n


def _finish(ax, x, ylabel, title=""):
    ax.set_xlabel(x)
    ax.set_ylabel(ylabel)
    if title:
        ax.set_title(title, fontsize=10)
    h, labels = ax.get_legend_handles_labels()
    if labels:
        ax.legend(fontsize=6 if len(labels) > 6 else 7, loc="best",
                  ncol=2 if len(labels) > 6 else 1, framealpha=0.6)
    ax.grid(alpha=0.3)
    try:
        ax.ticklabel_format(axis="y", useOffset=False)
    except AttributeError:  # not a scalar formatter
        pass
    return ax


def plot_radius(records, x=None, ax=None):
    """Radius of convergence against ``x``: the analysis estimate and the plain
    ratio estimate, each with its band."""
    x = family_x(records, x)
    ax = _ax(ax)
    _draw(ax, _series(records, x, _get_radius_analysis, "analyze"), "analysis", "o")
    _draw(ax, _series(records, x, _get_radius_ratio, "coefficients"), "ratio estimate", "s",
          lines=False)
    return _finish(ax, x, "radius of convergence")


def plot_band_digits(records, x=None, ax=None):
    """Relative digits supported by the radius band, -log10(half-width/|value|)."""
    x = family_x(records, x)
    ax = _ax(ax)

    import mpmath

    def digits(get, raw):
        def g(r):
            b = get(r)
            if b is None or b is MISS:
                return b
            e = raw(r)
            with mpmath.workdps(max(60, *(len(str(e.get(k, ""))) + 10 for k in ("value", "lo", "hi")))):
                v, lo, hi = (mpmath.mpf(str(e[k])) for k in ("value", "lo", "hi"))
                if mpmath.isinf(v):
                    return None       # an infinite radius (entire function): no digits to show
                err = max(hi - v, v - lo)
                if err > 0 and v != 0:
                    d = float(-mpmath.log10(err / abs(v)))
                elif v != 0:    # band below the written digits: at least that many
                    d = float(len(str(e["value"]).lstrip("-0.").replace(".", "")))
                else:
                    d = math.nan
            return (d, d, d) if not math.isnan(d) else MISS
        return g

    def raw_a(r):
        return _task(r, "analyze")["radius"]

    def raw_r(r):
        return _task(r, "coefficients")["ratio"]["radius"]

    _draw(ax, _series(records, x, digits(_get_radius_analysis, raw_a), "analyze"), "analysis", "o")
    _draw(ax, _series(records, x, digits(_get_radius_ratio, raw_r), "coefficients"),
          "ratio estimate", "s", lines=False)
    return _finish(ax, x, "digits of the radius band")


def plot_singularity_locations(records, x=None, ax=None, n=2):
    """Real and imaginary parts of the ``n`` nearest singularities against ``x``."""
    x = family_x(records, x)
    ax = _ax(ax)
    for k in range(n):
        for part, mk in (("re", "o"), ("im", "^")):
            def get(r, k=k, part=part):
                s = _sings(r)
                return _sing_part(s[k], part) if len(s) > k else None
            _draw(ax, _series(records, x, get, "analyze"), f"sing. {k + 1} {part}", mk)
    return _finish(ax, x, "singularity location (expansion variable)")


def plot_exponents(records, x=None, ax=None, n=2):
    """Exponents of the ``n`` nearest singularities against ``x``."""
    x = family_x(records, x)
    ax = _ax(ax)
    for k in range(n):
        def get(r, k=k):
            s = _sings(r)
            return _band(s[k].get("exponent")) if len(s) > k else None
        _draw(ax, _series(records, x, get, "analyze"), f"singularity {k + 1}", "o")
    return _finish(ax, x, "exponent")


def _beyond(r):
    a = _task(r, "analyze")
    return [p for p in ((a or {}).get("beyond") or []) if isinstance(p, dict)]


def _distance(b):
    """(|v|, lo, hi) of a band on one side of 0."""
    if b is None:
        return None
    v, lo, hi = b
    if v < 0:
        return -v, -hi, -lo
    return b


def plot_beyond(records, x=None, ax=None, n=5):
    """Distance from 0 of the nearest singularity and of the points found further along its cut
    (:mod:`resum.estimators.cut_scan`) against ``x``, on a log scale; the k-th point beyond is
    the k-th found at that parameter, so no line joins them."""
    x = family_x(records, x)
    ax = _ax(ax)

    def nearest(r):
        s = _sings(r)
        return _distance(_sing_part(s[0], "re")) if s and _beyond(r) else None
    _draw(ax, _series(records, x, nearest, "analyze"), "nearest", "s", lines=False)
    for k in range(n):
        def get(r, k=k):
            b = _beyond(r)
            return _distance(_band(b[k].get("x"))) if len(b) > k else None
        _draw(ax, _series(records, x, get), f"beyond {k + 1}", "o", lines=False)
    ax.set_yscale("log")
    return _finish(ax, x, "|singular point| on the cut (in the variable scanned)")


def plot_borel_exponent(records, x=None, ax=None):
    """``b`` of ``c_n ~ S A^-n Gamma(n + b)`` against ``x`` (analysis)."""
    x = family_x(records, x)
    ax = _ax(ax)
    _draw(ax, _series(records, x, _get_borel_exponent, "analyze"), "analysis", "o")
    return _finish(ax, x, "b in c_n ~ S A^-n Gamma(n+b)")


def plot_borel(records, x=None, ax=None):
    """Distance |A| of the nearest Borel-plane singularity against ``x``."""
    x = family_x(records, x)
    ax = _ax(ax)
    _draw(ax, _series(records, x, _get_borel_analysis, "analyze"), "analysis", "o")
    _draw(ax, _series(records, x, _get_borel_ratio, "coefficients"), "ratio estimate", "s",
          lines=False)
    return _finish(ax, x, "nearest Borel-plane singularity |A|")


def _points_at(records, task):
    ats = []
    for r in records:
        for a in _values(r, task):
            if a not in ats:
                ats.append(a)
    return sorted(ats, key=_f)


def plot_values(records, x=None, ax=None, at=None):
    """Resummed values at the couplings ``at`` (default: all) against ``x``,
    with the source's finite-coupling truth where recorded (open markers)."""
    x = family_x(records, x)
    ax = _ax(ax)
    ats = at if at is not None else _points_at(records, "evaluate")
    import matplotlib.pyplot as plt
    colors = plt.rcParams["axes.prop_cycle"].by_key().get("color", [None])
    for j, a in enumerate(ats):
        col = colors[j % len(colors)]
        def get(r, a=a):
            v = _values(r, "evaluate").get(_at_key(a))
            return _or_miss(_band(v)) if v else None

        def truth(r, a=a):
            v = _values(r, "truth").get(_at_key(a))
            return _band(v) if v else None
        _draw(ax, _series(records, x, get, "evaluate"), f"resummed at {a}", "o", color=col)
        tr = _series(records, x, truth, "truth")
        for gi, (g, (xs, vs, *_rest)) in enumerate(tr.items()):
            if xs:
                ax.plot(xs, vs, _open_marker(gi, len(tr)), mfc="none", color=col, ms=7, ls="none",
                        label=f"truth at {a}" + (f", {g}" if g else ""))
    return _finish(ax, x, "value")


def _pull(v, t):
    """(resummed - truth) / (half-width of the resummed band on the truth's
    side, plus the truth's own half-width), from the decimal strings at high
    precision (in floats, 30 agreeing digits would cancel to 0). |pull| <= 1:
    the truth lies in the band."""
    import mpmath
    longest = max(len(str(d.get(k, ""))) for d in (v, t) for k in ("value", "lo", "hi"))
    with mpmath.workdps(max(80, longest + 10)):
        try:
            val, ref = mpmath.mpf(str(v["value"])), mpmath.mpf(str(t["value"]))
            side = (mpmath.mpf(str(v["hi"])) - val) if ref >= val else (val - mpmath.mpf(str(v["lo"])))
            own = max(abs(mpmath.mpf(str(t.get(k, t["value"]))) - ref) for k in ("lo", "hi"))
        except (KeyError, ValueError, TypeError):
            return None
        if not (mpmath.isfinite(val) and mpmath.isfinite(ref)):
            return None
        width = side + own
        if width == 0:
            return 0.0 if val == ref else None
        return float((val - ref) / width)


def plot_value_errors(records, x=None, ax=None, at=None):
    """How far each resummed value lies from the truth, in units of its band:
    (resummed - truth) / (band half-width towards the truth + the truth's own
    half-width). Points between the dashed lines at +-1 have the truth in
    their band; points near 0 have bands much wider than their error."""
    x = family_x(records, x)
    ax = _ax(ax)
    ats = at if at is not None else _points_at(records, "evaluate")
    for a in ats:
        def pull(r, a=a):
            v = _values(r, "evaluate").get(_at_key(a))
            t = _values(r, "truth").get(_at_key(a))
            if not (_band(v) if v else None) or not (_band(t) if t else None):
                return None
            p = _pull(v, t)
            return None if p is None else (p, p, p)
        _draw(ax, _series(records, x, pull, "truth"), f"at {a}", "o")
    ax.axhline(0, color="k", lw=0.6)
    for y in (-1, 1):
        ax.axhline(y, color="0.4", lw=0.8, ls="--")
    ax.set_yscale("symlog", linthresh=1.0)
    from matplotlib.ticker import FuncFormatter
    ax.yaxis.set_major_formatter(FuncFormatter(lambda y, _: f"{y:g}"))
    return _finish(ax, x, "(resummed - truth) / band")


_STRONG_KINDS = (("resummed", "from the resummed series", "o", "C0"),
                 ("truth", "from the finite-coupling values", "D", "C1"))


def _rel_digits(v, t=None):
    """-log10 of the relative band of ``v`` (``t`` None) or of |v - t|/|t|,
    computed from the decimal strings at high precision."""
    import mpmath
    longest = max(len(str(d.get(k, ""))) for d in (v, t or v) for k in ("value", "lo", "hi"))
    with mpmath.workdps(max(80, longest + 10)):
        try:
            val = mpmath.mpf(str(v["value"]))
            if t is None:
                err = max(mpmath.mpf(str(v["hi"])) - val, val - mpmath.mpf(str(v["lo"])))
                ref = val
            else:
                ref = mpmath.mpf(str(t["value"]))
                err = abs(val - ref)
        except (KeyError, ValueError, TypeError):
            return None
        if not mpmath.isfinite(val) or ref == 0:
            return None
        if err == 0:
            # equal as written: they agree to within the wider of their bands
            widths = [mpmath.mpf(str(d[k])) - mpmath.mpf(str(d["value"])) for d in (v, t or v)
                      for k in ("hi", "lo") if k in d]
            err = max([abs(w) for w in widths] or [0])
            if err == 0:
                return float(len(str(v["value"]).lstrip("-0.").replace(".", "")))
        return float(-mpmath.log10(err / abs(ref)))


def plot_value_digits(records, x=None, ax=None, at=None):
    """Digits claimed by the resummed band (filled) and digits that agree with
    the source's finite-coupling values (open), per coupling, against ``x``.
    An honest band claims no more digits than agree."""
    x = family_x(records, x)
    ax = _ax(ax)
    ats = at if at is not None else _points_at(records, "evaluate")
    import matplotlib.pyplot as plt
    colors = plt.rcParams["axes.prop_cycle"].by_key().get("color", [None])
    for j, a in enumerate(ats):
        col = colors[j % len(colors)]

        def claimed(r, a=a):
            v = _values(r, "evaluate").get(_at_key(a))
            if not v:
                return None
            d = _rel_digits(v) if _band(v) else None
            return MISS if d is None else (d, d, d)

        def agree(r, a=a):
            v = _values(r, "evaluate").get(_at_key(a))
            t = _values(r, "truth").get(_at_key(a))
            if not v or not t or _band(v) is None or _band(t) is None:
                return None
            d = _rel_digits(v, t)
            return None if d is None else (d, d, d)
        _draw(ax, _series(records, x, claimed, "evaluate"), f"band at {a}", "o", color=col)
        ag = _series(records, x, agree, "truth")
        for gi, (g, (xs, vs, *_rest)) in enumerate(ag.items()):
            if xs:
                ax.plot(xs, vs, _open_marker(gi, len(ag)), mfc="none", color=col, ms=7, ls="none",
                        label=f"agreeing at {a}" + (f", {g}" if g else ""))
    return _finish(ax, x, "digits (relative)")


def strong_keys(records, max_terms: int = 3) -> list:
    """The ``max_terms`` leading fitted strong-coupling coefficients found in
    the records (labels such as ``"g^1"``, ``"g^0"``; ``"leading"`` first when some
    point's power was read as a decimal, not a simple fraction), and the leading power
    last if it was estimated."""
    keys, power, leading = [], False, False
    for r in records:
        t = _task(r, "strong") or {}
        for kind, _, _, _ in _STRONG_KINDS:
            d = t.get(kind) or {}
            for k, v in (d.get("coefficients") or {}).items():
                if "." in k:
                    leading = True       # a power read as a decimal: one panel per point otherwise
                elif _band(v) is not None and k not in keys:
                    keys.append(k)
            lp = d.get("leading_power")
            if _band(lp) is not None and not str(d.get("power_source", "")).startswith("given"):
                power = True

    def order(k):
        try:
            return -_f(k.split("^", 1)[1].split()[0]), "log" in k
        except (IndexError, ValueError):
            return 0, True
    keys.sort(key=order)
    if leading:
        keys = ["leading"] + keys
    return keys[:max_terms] + (["leading_power"] if power else [])


def _strong_getter(kind, key):
    """A getter for :func:`_series`: the coefficient ``key`` of the ``kind`` fit."""
    def get(r):
        d = (_task(r, "strong") or {}).get(kind)
        if d is None or d.get("status") == "not available":
            return None     # not asked, or the source has no values to fit here: nothing drawn
        if d.get("success") is False:
            return MISS
        if key == "leading_power":
            return _or_miss(_band(d.get("leading_power")))
        co = d.get("coefficients") or {}
        if key == "leading":
            from ..estimators.strong_coupling import leading_label
            lead = leading_label(co)       # by power: the record's keys are sorted
            return _band(co[lead]) if lead is not None else None
        return _band(co[key]) if key in co else None     # absent: that form had no such term
    return get


def strong_panels(records, max_terms: int = 3) -> list:
    """The keys of :func:`strong_keys` that some point has a value for; when none has, only
    the first (one panel saying why it is empty, not a column of empty frames)."""
    keys = strong_keys(records, max_terms)
    drawn = [k for k in keys if any(_has(records, _strong_getter(kind, k))
                                    for kind, *_ in _STRONG_KINDS)]
    return drawn or keys[:1]


def plot_strong(records, key, x=None, ax=None):
    """One strong-coupling coefficient (a label from :func:`strong_keys`) against
    ``x``: fitted to the resummed values (filled) and, where recorded, to the
    source's finite-coupling values (open)."""
    x = family_x(records, x)
    ax = _ax(ax)
    drawn = False
    for kind, label, mk, colour in _STRONG_KINDS:
        if not any((_task(r, "strong") or {}).get(kind) is not None for r in records):
            continue    # a fit no point made (from_truth not asked): no crosses for failed points
        get = _strong_getter(kind, key)
        _draw(ax, _series(records, x, get, "strong"), label, mk, color=colour)
        drawn = drawn or _has(records, get)
    if not drawn:
        # an empty frame reads as a plotting bug: say why there is nothing
        ax.text(0.5, 0.5, "no point's fit converged\n(see each record's strong-coupling message)",
                transform=ax.transAxes, ha="center", va="center", fontsize=9, color="0.4")
    return _finish(ax, x, "leading power" if key == "leading_power" else
                   "leading coefficient" if key == "leading" else f"coefficient of {key}")


# ----------------------------------------------------------------------------
# all figures
# ----------------------------------------------------------------------------

def _search(r):
    ev = _task(r, "evaluate")
    return ev.get("order_search") if ev is not None and isinstance(ev.get("order_search"), dict) else None


def plot_terms_used(records, x=None, ax=None):
    """Terms each point's evaluation ended with when a goal in digits was asked
    (``goal_digits``): filled where the goal was reached, open where the search stopped short
    (at ``max_terms``, or without a projection); the first round's terms as a dashed line."""
    x = family_x(records, x)
    ax = _ax(ax)
    rows = sorted((_f(r.get("params", {}).get(x)), s) for r in records if r.get("status") == "ok"
                  for s in [_search(r)] if s is not None)
    if not rows:
        return _finish(ax, x, "terms used")
    xs = [xv for xv, _ in rows]
    used = [float(s["terms_used"]) for _, s in rows]
    first = [float(s["rounds"][0]["terms"]) for _, s in rows]
    ax.plot(xs, first, "--", color="0.6", lw=1, label="terms given")
    ok = [(xv, u) for (xv, s), u in zip(rows, used) if s.get("reached")]
    short = [(xv, u) for (xv, s), u in zip(rows, used) if not s.get("reached")]
    goal = rows[0][1].get("goal_digits", "?")
    if ok:
        ax.plot(*zip(*ok), "o", color="C0", label=f"goal of {goal} digits reached")
    if short:
        ax.plot(*zip(*short), "o", mfc="none", color="C3", label="goal not reached (search stopped)")
    return _finish(ax, x, "terms used")


def _has(records, get):
    return any(r.get("status") == "ok" and get(r) not in (None, MISS) for r in records)


def integer_ticks(fig, records, x) -> bool:
    """Whole-number ticks on the x axes of ``fig`` when the axis ``x`` takes only whole
    numbers (a level, a number of loops): no ticks at 0.25 of a state. Returns True if set."""
    from matplotlib.ticker import MaxNLocator
    vals = [r.get("params", {}).get(x) for r in records]
    if not vals or not all(isinstance(v, str) and re.fullmatch(r"-?\d+", v.strip())
                           for v in vals):
        return False
    for ax in fig.get_axes():
        ax.xaxis.set_major_locator(MaxNLocator(integer=True))
    return True


def _covered_points(ax, renderer) -> int:
    """How many drawn data points (markers and line vertices, crosses and arrows at the
    edges included) lie under the legend of ``ax``."""
    import numpy as np
    leg = ax.get_legend()
    if leg is None:
        return 0
    box = leg.get_window_extent(renderer)
    n = 0
    for line in ax.get_lines():
        xy = np.column_stack([np.asarray(line.get_xdata(), float),
                              np.asarray(line.get_ydata(), float)])
        if not len(xy):
            continue
        pts = line.get_transform().transform(xy)
        pts = pts[np.isfinite(pts).all(axis=1)]
        # a marker overlaps the legend when its edge does, not only its centre
        r = (line.get_markersize() / 2 if line.get_marker() not in (None, "", "None", " ")
             else 0.0) * ax.figure.dpi / 72
        n += int(sum(box.x0 - r <= px <= box.x1 + r and box.y0 - r <= py <= box.y1 + r
                     for px, py in pts))
    return n


def legends_clear_of_data(fig) -> list:
    """Move every legend that covers a data point out of its panel, to the right of it.

    A legend placed with ``loc="best"`` still covers data when no corner of the panel is
    free (six entries over four columns of points); such a legend is put beside the panel
    instead. Returns the axes whose legend was moved."""
    fig.canvas.draw()
    renderer = fig.canvas.get_renderer()
    moved = []
    for ax in fig.get_axes():
        leg = ax.get_legend()
        if leg is None or not _covered_points(ax, renderer):
            continue
        handles, labels = ax.get_legend_handles_labels()
        ax.legend(handles, labels, fontsize=leg.get_texts()[0].get_fontsize() if leg.get_texts() else 7,
                  loc="upper left", bbox_to_anchor=(1.01, 1.0), borderaxespad=0.0,
                  framealpha=0.6)
        moved.append(ax)
    return moved


def write_family_plots(records, outdir, x=None, title="") -> list:
    """Draw every family figure that has data into ``outdir`` (PNG and PDF).

    Returns the paths written.
    """
    import matplotlib
    matplotlib.use("Agg", force=False)
    import matplotlib.pyplot as plt
    records = list(records)
    if not records:
        return []
    x = family_x(records, x)
    outdir = Path(outdir)
    outdir.mkdir(parents=True, exist_ok=True)
    paths = []

    def save(fig, name):
        integer_ticks(fig, records, x)
        if title:
            fig.suptitle(title, fontsize=11)
        rect = (0, 0, 1, 0.97) if title else (0, 0, 1, 1)
        fig.tight_layout(rect=rect)
        if legends_clear_of_data(fig):
            fig.tight_layout(rect=rect)     # make room for the legends moved beside the panels
        for ext in ("png", "pdf"):
            p = outdir / f"{name}.{ext}"
            save_figure(fig, p, dpi=130)
            paths.append(p)
        plt.close(fig)

    if _has(records, _get_radius_analysis) or _has(records, _get_radius_ratio):
        fig, (a1, a2) = plt.subplots(2, 1, figsize=(6.4, 6.4), sharex=True)
        plot_radius(records, x, a1)
        plot_band_digits(records, x, a2)
        a1.set_xlabel("")
        save(fig, "radius")
    if any(_sings(r) for r in records):
        fig, (a1, a2) = plt.subplots(2, 1, figsize=(6.4, 6.4), sharex=True)
        plot_singularity_locations(records, x, a1)
        plot_exponents(records, x, a2)
        a1.set_xlabel("")
        save(fig, "singularities")
    if any(_beyond(r) for r in records):
        fig, ax = plt.subplots(figsize=(6.4, 4.4))
        plot_beyond(records, x, ax)
        save(fig, "beyond")
    if _has(records, _get_borel_analysis) or _has(records, _get_borel_ratio):
        if _has(records, _get_borel_exponent):
            fig, (ax, a2) = plt.subplots(2, 1, figsize=(6.4, 6.4), sharex=True)
            plot_borel(records, x, ax)
            plot_borel_exponent(records, x, a2)
            ax.set_xlabel("")
        else:
            fig, ax = plt.subplots(figsize=(6.4, 4.2))
            plot_borel(records, x, ax)
        save(fig, "borel")
    if _points_at(records, "evaluate"):
        # a truth that is not available (values without a number) draws nothing: no empty figure
        has_truth = any(_band(v) for r in records for v in _values(r, "truth").values())
        fig, axs = plt.subplots(2, 1, figsize=(6.4, 7.4), sharex=True, squeeze=False)
        plot_values(records, x, axs[0][0])
        vals = [_band(v) for r in records for v in _values(r, "evaluate").values()]
        vals = [b for b in vals if b is not None]
        if vals and all(b[0] > 0 for b in vals) and max(b[0] for b in vals) > 20 * min(
                b[0] for b in vals):
            axs[0][0].set_yscale("log")
        plot_value_digits(records, x, axs[1][0])
        axs[0][0].set_xlabel("")
        save(fig, "values")
        if has_truth:
            fig, ax = plt.subplots(figsize=(6.4, 4.2))
            plot_value_errors(records, x, ax)
            save(fig, "value_errors")
    if any(_search(r) for r in records):
        fig, ax = plt.subplots(figsize=(6.4, 4.2))
        plot_terms_used(records, x, ax)
        save(fig, "terms_used")
    keys = strong_panels(records)
    if keys:
        fig, axs = plt.subplots(len(keys), 1, figsize=(6.4, 2.6 * len(keys) + 0.8), sharex=True,
                                squeeze=False)
        for k, a in zip(keys, axs[:, 0]):
            plot_strong(records, k, x, a)
        for a in axs[:-1, 0]:
            a.set_xlabel("")
        save(fig, "strong")
    return paths
