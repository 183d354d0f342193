"""Plain-text rendering of an :class:`~resum.analysis.AnalysisResult`.

>>> from resum.series import Series
>>> from resum.analysis import analyze
>>> c = [1]
>>> for n in range(1, 30):
...     c.append(c[-1] * 2 * (2 * n - 1) // n)      # (1 - 4x)^(-1/2)
>>> text = render_analysis(analyze(Series(c), verify=False))
>>> "radius of convergence" in text
True

Numbers are printed as ``value(error)`` with only the digits their band
supports (see :func:`resum.results.format_value_error`).
"""
from __future__ import annotations

import mpmath

from ..context import workdps
from ..results import point_text

__all__ = ["render_analysis"]

_KIND_TEXT = {
    "pole": "pole",
    "branch": "algebraic branch point",
    "log": "logarithmic singularity",
    "essential": "essential singularity",
    "branch-log": "branch point with logarithm",
    "unknown": "singularity of undetermined type",
}


def _ordinal(k):
    """2 -> '2nd', 3 -> '3rd', 4 -> '4th', 11 -> '11th'."""
    suffix = "th" if 10 <= k % 100 <= 20 else {1: "st", 2: "nd", 3: "rd"}.get(k % 10, "th")
    return f"{k}{suffix}"


def _fmt(e):
    if e is None:
        return "-"
    if not mpmath.isfinite(e.value):
        return "infinite" if e.value > 0 else str(e.value)
    return str(e)


def _theta(s):
    # (a bare "theta = -" read as a minus sign with its number lost)
    if s.exponent is None and s.kind == "essential":
        return "no exponent (the coefficients grow faster than any power times x_c^-n)"
    return "exponent not determined" if s.exponent is None else f"theta = {_fmt(s.exponent)}"


def _loc(s):
    if s.im.value == 0 and s.im.error == 0:
        return _fmt(s.re)
    sign = "-" if s.im.value < 0 else "+"
    im = _fmt(type(s.im)(abs(s.im.value), abs(s.im.value) - s.im.error, abs(s.im.value) + s.im.error))
    return f"{_fmt(s.re)} {sign} {im} i"


def render_analysis(result, title: str = "") -> str:
    """A readable report: verdict, radius, singularities, method table, warnings, how."""
    dps = int(result.provenance.dps if result.provenance else 30) + 10
    with workdps(dps):
        return _render(result, title)


def _render(r, title):
    d = r.diagnostics
    var = d.get("variable", "x")
    lines = []
    head = f"Singularity analysis{': ' + title if title else ''}"
    lines += [head, "=" * len(head)]
    lines.append(f"terms: {d.get('n_terms', '?')}   working digits: {d.get('dps', '?')}   "
                 f"status: {r.status.value}   ({r.message})")
    if d.get("coupling"):
        lines.append(f"variable: {var} ({d['coupling']}); all locations below are in {var}")
    lines.append("")
    lines.append(f"growth of the coefficients: {r.growth or 'undetermined'}")
    if r.growth == "factorial":
        lines.append("  radius of convergence: 0 (divergent series)")
        lo = r.methods.get("large-order")
        ld = (lo.diagnostics or {}) if lo is not None else {}
        stride, m = ld.get("stride", 1), ld.get("gamma_multiple", 1)
        gam = "Gamma(n + b)" if m == 1 else f"Gamma({m} n + b)"
        if r.borel_singularity is None:
            lines.append("  the Borel-plane singularity was not located (see the warnings)")
        elif stride > 1:
            lines.append(f"  only every {_ordinal(stride)} coefficient is non-zero: in u = {var}^{stride}, "
                         f"c_n u^n with c_n ~ S A^-n {gam},  A = {_fmt(r.borel_singularity)},  "
                         f"b = {_fmt(r.borel_exponent)}")
            if m == stride:
                roots = [mpmath.root(mpmath.mpc(r.borel_singularity.value), m, k) for k in range(m)]
                lines.append(f"  (in {var} the terms grow like Gamma(n + b'), with Borel-plane singularities at the "
                             f"{m} roots of A: " + ", ".join(point_text(z, 8) for z in roots) + ")")
            else:
                lines.append("  (A: nearest singularity of the Borel transform in u; A < 0 means alternating signs)")
        else:
            lines.append(f"  c_n ~ S A^-n {gam} with  A = {_fmt(r.borel_singularity)},  "
                         f"b = {_fmt(r.borel_exponent)}")
            if m > 1:
                lines.append(f"  (A: nearest singularity of the Borel-Le Roy transform sum c_n t^n / Gamma({m} n + b) "
                             "in t; A < 0 means alternating signs)")
            else:
                lines.append("  (A: nearest singularity of the Borel transform; A < 0 means alternating signs)")
    else:
        lines.append(f"radius of convergence in {var}: {_fmt(r.radius)}")
    nb = getattr(r, "natural_boundary", None)
    if nb is not None:
        lines.append(f"  natural boundary suspected at |{var}| ~ {_fmt(nb)}: the poles and zeros of the Padé "
                     "approximants crowd along this circle, more of them at higher orders (an estimate, "
                     "not a proof; no isolated singularity is reported)")
    if r.singularities:
        lines.append("")
        lines.append(f"leading singularities, f ~ A (1 - {var}/{var}_c)^theta near each:")
        for i, s in enumerate(r.singularities, 1):
            lines.append(f"  {i}. {var}_c = {_loc(s)}   |{var}_c| = {_fmt(_modulus(s))}")
            lines.append(f"     {_KIND_TEXT.get(s.kind, s.kind)}, {_theta(s)}")
            if s.note:
                lines.append(f"     ({s.note})")
    beyond = getattr(r, "beyond", ())
    if beyond:
        x0 = r.singularities[0] if r.singularities else None
        k = beyond[0].power
        start = (f"{var}_c = {_loc(x0)}" if k == 1 else
                 f"the nearest singularities (the series runs in {var}^{k}, scanned in that variable)")
        lines.append("")
        lines.append(f"further along the cut from {start if x0 is not None else '?'} (read through the "
                     f"conformal map of that cut: where the Padé approximants of the mapped derivative put a pole, "
                     f"or start a string of poles and zeros, on the rim; an estimate):")
        for p in beyond:
            at = var if p.power == 1 else f"{var}^{p.power}"
            lines.append(f"  {at} = {p.x}   {p.kind}" + (f" ({p.elements} poles and zeros in its string)"
                                                        if p.elements > 1 else ""))
    lines.append("")
    lines.append("methods:")
    for name, m in r.methods.items():
        if m.success:
            what = f"radius {_fmt(m.radius)}" if m.radius is not None else ""
            if m.borel_singularity is not None:
                what = f"A = {_fmt(m.borel_singularity)}, b = {_fmt(m.borel_exponent)}"
            elif m.singularities:
                s = m.singularities[0]
                what += f"; nearest {_loc(s)}, {_theta(s)}"
            lines.append(f"  {name:15s} ok      {what}")
        else:
            lines.append(f"  {name:15s} {m.status.value}: {m.message}")
    for name, m in r.methods.items():
        eq = (m.diagnostics or {}).get("equation") if m.success else None
        if eq:
            lines.append("")
            decimals = any(ch.isdigit() and "." in tok for tok in eq.replace("[", " ").replace("]", " ").split()
                           for ch in tok[:1])
            lines.append(f"the series obeys, to the working precision ({name}, checked on every coefficient "
                         "beyond those fitted; f = the series in x, coefficients as rationals where they match "
                         "to the working digits" + ("; decimal coefficients usually mean a function with more "
                                                    "singular points than this equation, the farther ones below "
                                                    "the precision's reach" if decimals else "") + "):")
            lines.append(f"  {eq}")
            break
    ver = d.get("verification") or {}
    if ver:
        lines.append("")
        lines.append("verification (digits agreeing with the reruns):")
        for key, v in ver.items():
            rd = v.get("radius_digits_agree")
            # two runs cannot confirm more digits than the main run worked with (the kernel
            # family's radius agreed to 65.8 digits between runs at 50 and 85): cap at those
            top = d.get("dps")
            if rd is None:
                rd_s = "-"
            elif float(rd) == float("inf") or (top is not None and float(rd) >= int(top)):
                rd_s = "all" if top is None else f"all {int(top)} working digits"
            else:
                rd_s = f"{float(rd):.1f}"
            lines.append(f"  {key.replace('_', ' ')} (n = {v.get('n_terms')}, dps = {v.get('dps')}): "
                         f"radius {rd_s}")
    if r.warnings:
        lines.append("")
        lines.append("warnings:")
        lines += [f"  - {w}" for w in r.warnings]
    lines.append("")
    lines.append("how to read the bands: value(error) means value +- error in the last digits shown. "
                 "Each band is an estimate, not a proof. " + d.get("how", ""))
    return "\n".join(_wrap(l) for l in lines) + "\n"


def _modulus(s):
    from ..uncertainty.ensemble import modulus_band
    return modulus_band(s.re, s.im)


def _wrap(line, width=100):
    if len(line) <= width:
        return line
    import textwrap
    indent = " " * (len(line) - len(line.lstrip()) + 2)
    return "\n".join(textwrap.wrap(line, width, subsequent_indent=indent))
