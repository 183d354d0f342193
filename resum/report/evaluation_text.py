"""Plain-text report of an :class:`~resum.resummation.EvaluationResult`.

One row per point: where, the resummed value with its band in value(error)
notation (only supported digits), the digits the band supports, the method,
the optimal-truncation baseline beside it, and the status; then the
lateral-sum ambiguities, comparisons with reference values, warnings, and a
paragraph saying what the band means.
"""
from __future__ import annotations

import math
from typing import Optional, Sequence

import mpmath

from ..context import workdps
from ..estimators.resum_conformal import COVER_CENTRE_RATIO
from ..results import format_value_error, point_text, sig_text

__all__ = ["render_evaluation", "describe_map", "band_meanings", "BAND_MEANING", "BAND_MEANING_ODE",
           "BAND_MEANING_BOREL_ODE"]

BAND_MEANING = (
    "What the band means: the value is the median of the three highest-order approximants; the band is "
    "4 x the larger of their spread and the error extrapolated from how fast lower orders approach the "
    "value, never below the quadrature error and the working precision, widened to cover a rerun at "
    "higher precision (inexact coefficients moved by 10^-digits relative, up to a unit in their last digit). A rerun with fewer "
    "terms must reach the value within its own band. For a conformal map, a point closer to the rim of "
    "the disk than 1/(terms) has its band widened by 1/((1 - |w|) x terms). It is an estimate, not a "
    "proof. Optimal truncation sums up to the smallest non-zero term (an exact polynomial: all its "
    "terms; 'none' where the terms grow from the first); its band is +- that term, never below the "
    "input's precision.")


BAND_MEANING_ODE = (
    "What the band means (method ode): the series obeys the linear differential equation in the "
    "diagnostics exactly (checked on every coefficient beyond those fitted); the value follows it by "
    "Taylor steps along the straight line from 0, each step at most half the distance to the nearest "
    "zero of the leading coefficient. The band is 10 x the larger change when the continuation is rerun "
    "with 20 more digits and from the series with five fewer terms, widened to cover the reruns of the "
    "whole evaluation. It is an estimate, not a proof. Optimal truncation sums up to the smallest "
    "non-zero term (an exact polynomial: all its terms); its band is +- that term, never below the "
    "input's precision.")


BAND_MEANING_BOREL_ODE = (
    "What the band means (method borel-ode): the Borel transform B(t) = sum c_n t^n / n! obeys the linear "
    "differential equation in the diagnostics exactly (checked on every coefficient beyond those fitted); B "
    "is followed along the Laplace ray by Taylor steps, each at most half the distance to the nearest zero of "
    "the leading coefficient, and f(x) = int_0^inf exp(-u) B(x u) du is done by tanh-sinh quadrature. When a "
    "zero lies on the ray, the integral is done along two rays turned to either side (the lateral sums); the "
    "value is their mean and the imaginary part the ambiguity. The band is 10 x the larger change when all "
    "of it is rerun with 20 more digits and from the series with five fewer terms, plus the quadrature's "
    "error estimate, widened to cover the reruns of the whole evaluation. It is an estimate, not a proof.")


def describe_map(m: dict, variable: str = "x") -> str:
    """A conformal map recorded in provenance (``{"kind": "ray", "x0": "-1.0"}``) in words, its
    branch points to 12 significant digits (the map's own precision is in the JSON document).

    >>> describe_map({"kind": "ray", "x0": "-1.00002309505835963665553700021"})
    'one cut from x0 = -1.00002309506 radially to infinity'
    """
    def num(key):
        try:
            return mpmath.nstr(mpmath.mpmathify(m[key]), 12)
        except (KeyError, ValueError, TypeError):
            return str(m.get(key, "?"))
    kind = m.get("kind")
    if kind == "ray":
        return f"one cut from {variable}0 = {num('x0')} radially to infinity"
    if kind == "arc":
        return f"one cut joining {num('s1')} and {num('s2')} through the far side"
    if kind == "pair":
        try:
            re_s = mpmath.nstr(mpmath.re(mpmath.mpmathify(m["s"])), 12)
        except (KeyError, ValueError, TypeError):
            re_s = "?"
        return f"two cuts from {num('s')} and its conjugate along Re {variable} = {re_s} to infinity"
    if kind == "star":
        return f"two cuts from {num('s')} and its conjugate radially to infinity"
    return ", ".join(f"{k} = {v}" for k, v in m.items())


def _fmt(e) -> str:
    if e is None:
        return "-"
    return format_value_error(e.value, e.lower, e.upper)


def _complex_point(p) -> bool:
    """The imaginary part belongs to the value (a complex point, or a complex-valued function
    at a real point), as opposed to the ambiguity of lateral Borel sums."""
    if isinstance(p.at, mpmath.mpc) and p.at.imag != 0:
        return True
    return p.imag is not None and "S_plus" not in p.diagnostics


def _complex_digits(p) -> str:
    """Digits of a complex value, relative to its modulus (a real part that vanishes, as at
    x = 2 for 1/(1 - x/(1+i)) = -i, has no relative digit of its own): ``p.digits``, the same
    number as the JSON ``digits``."""
    d = p.digits
    return "all" if not math.isfinite(d) else f"{d:.1f}"


def _abs_est(e):
    """The band of -v as that of v when v < 0 (for printing "- i*|v|")."""
    from ..results import Estimate
    return e if e.value >= 0 else Estimate(-e.value, -e.upper, -e.lower)


def compare_reference(result, reference) -> list:
    """Each reference ``(at, value, error_or_None)`` against the resummed point at the same place:
    dicts with ``at``, ``value``, ``error``, ``difference``, ``digits_agree`` (None: identical)
    and ``inside`` (None when no resummed value is there)."""
    with workdps((result.provenance.dps if result.provenance else 50) + 10):
        return _compare_reference(result, reference)


def _compare_reference(result, reference) -> list:
    out = []
    for at, val, err in reference:
        best = min(result.points, key=lambda p: abs(p.at - at))
        row = {"at": at, "value": val, "error": err, "difference": None, "digits_agree": None, "inside": None}
        if abs(best.at - at) <= mpmath.mpf(10) ** -10 * max(1, abs(at)) and best.value is not None:
            diff = best.value.value - val
            slack = 0 if err is None else err
            rel = abs(diff / val) if val != 0 else abs(diff)
            row.update(difference=diff, digits_agree=float(-mpmath.log10(rel)) if rel != 0 else None,
                       inside=bool(best.value.lower - slack <= val <= best.value.upper + slack))
        out.append(row)
    return out


def render_evaluation(result, title: str = "", reference: Optional[Sequence] = None) -> str:
    """The report as text.

    ``reference``: optional list of ``(at, value, error_or_None)`` to compare
    with (for example read by :func:`resum.commands.evaluate.read_reference`).
    """
    dps = (result.provenance.dps if result.provenance else 50) + 10
    with workdps(dps):
        return _render(result, title, reference)


def _render(result, title, reference):
    at_name = result.at_symbol
    lines = []
    head = f"Resummed values{': ' + title if title else ''}"
    lines.append(head)
    lines.append("=" * len(head))
    prov = result.provenance
    if prov is not None:
        lines.append(f"method: {prov.method} ({prov.options.get('why', '')}); {prov.n_terms} terms; "
                     f"working digits {prov.dps}")
        if prov.options.get("map"):
            borel = prov.method.startswith("borel")
            text = describe_map(prov.options["map"], "t" if borel else "x")
            if text not in prov.options.get("why", ""):       # not said on the method line already
                lines.append(f"conformal map{' of the Borel plane' if borel else ''}: {text}")
    if (result.diagnostics or {}).get("equation"):
        if prov is not None and prov.method == "borel-ode":
            lines.append("equation the Borel transform obeys exactly (B(t) = sum c_n t^n / n!): "
                         f"{result.diagnostics['equation']}")
        else:
            lines.append(f"equation the series obeys exactly (f = the series in x): {result.diagnostics['equation']}")
    if result.coupling:
        lines.append(f"points are values of the coupling ({result.coupling})")
    lines.append("")
    rows = [(at_name, "resummed value(band)", "digits", "optimal truncation (terms)", "status")]
    mixed = len({getattr(p, "method", "") for p in result.points}) > 1     # ode with fallback points
    if mixed:
        rows[0] = rows[0] + ("method",)
    for p in result.points:
        base = "-"
        if p.baseline is not None and p.baseline.empty:
            # the terms grow from the first: nothing is summed, and "0 +- the first term" is no value
            base = "none (terms grow)"
        elif p.baseline is not None:
            base = f"{_fmt(p.baseline.value)} ({p.baseline.n_terms}{'' if p.baseline.reached else ', not reached'})"
        dig = "-" if p.value is None else (f"{p.value.digits():.1f}" if p.value.error != 0 else "all")
        val = _fmt(p.value)
        if _complex_point(p) and p.imag is not None and p.value is not None:
            # at a complex point the imaginary part is part of the value, not an ambiguity
            val = f"{val} {'-' if p.imag.value < 0 else '+'} i*{_fmt(_abs_est(p.imag))}"
            dig = _complex_digits(p)
        rows.append((point_text(p.at, 12), val, dig, base, p.status.value) + ((p.method,) if mixed else ()))
    widths = [max(len(r[i]) for r in rows) for i in range(len(rows[0]))]
    for k, r in enumerate(rows):
        lines.append("  ".join(c.ljust(w) for c, w in zip(r, widths)).rstrip())
        if k == 0:
            lines.append("  ".join("-" * w for w in widths))
    for name, text in _variant_notes(result):
        pts = [p for p in result.points if p.diagnostics.get("variant") == name
               and (name != "quadratic" or p.method == "conformal-pade")]
        if pts:
            lines.append("")
            lines.append(f"{name.capitalize()} variant at " + ", ".join(point_text(p.at, 12) for p in pts)
                         + ": " + text(pts))
    reach = [p for p in result.points if p.diagnostics.get("variant_centre_covered")]
    if reach:
        lines.append("")
        lines.append("Widened to reach the other variant at " + ", ".join(point_text(p.at, 12) for p in reach)
                     + ": near the rim the band of the variant kept was widened to reach the value of the "
                     "other approximant family tried there (Padé or quadratic), whose band was at most "
                     f"{COVER_CENTRE_RATIO} times wider: the top approximants of one family can agree with "
                     "each other and share a bias that the other family shows.")
    rim = [p for p in result.points if p.diagnostics.get("rim_power_alpha")]
    if rim:
        lines.append("")
        lines.append("Growth divided out at " + ", ".join(point_text(p.at, 12) for p in rim) + ": the power of x "
                     "at large x read from the series (method line) was divided out there, the mapped function "
                     "multiplied by (1 - w/w_inf)^alpha, alpha = " + rim[0].diagnostics["rim_power_alpha"] +
                     ", before the approximants; the other points were resummed without it.")
    from ..resummation import input_limit_short
    short = [p for p in result.points if p.diagnostics.get("reach") or input_limit_short(p)]
    if short:
        lines.append("")
        lines.append("Where the band falls short of the digits asked (a projection from how fast the approximants "
                     "converged at each point, extrapolated in n and in sqrt(n), the larger count kept; not a promise):")
        for p in short:
            r = p.diagnostics.get("reach")
            lim = input_limit_short(p)
            if r is None:
                # a method without a convergence rate to project from (the Borel-plane ones)
                head = f"  {point_text(p.at, 12)}: {p.digits:.1f} digits; "
            else:
                head = (f"  {point_text(p.at, 12)}: {r['digits']} digits; about {r['digits_per_term']} digits per "
                        f"added term ({r['terms_per_digit']} terms per digit); ")
            if lim:
                lines.append(head + f"here the {lim['digits_carried']} digits the coefficients carry set the band "
                             f"(see the warnings): coefficients with at least {lim['digits_suggested']} digits, "
                             "rather than more terms")
            elif r.get("terms_needed"):
                lines.append(head + f"{r['asked_digits']} digits would need about {r['terms_needed']} terms "
                             "(coefficients carrying at least as many digits)")
            else:
                lines.append(head + f"{r['asked_digits']} digits would need more than 3 x the "
                             f"{r['terms_now']} terms at hand, too far for this projection")
    lat = [p for p in result.points if p.imag is not None and not _complex_point(p)]
    if lat:
        lines.append("")
        lines.append("Imaginary parts (lateral Borel sums S+- = value +- i*imag; imag is the ambiguity):")
        for p in lat:
            extra = ""
            if p.diagnostics.get("exp(-A/x)"):
                extra = f"; exp(-A/x) = {p.diagnostics['exp(-A/x)']} for A = {p.diagnostics.get('ray_singularity')}"
            lines.append(f"  {point_text(p.at, 12)}: imag = {_fmt(p.imag)}{extra}")
    if reference:
        lines.append("")
        lines.append("Reference values:")
        for c in compare_reference(result, reference):
            at, val, err = c["at"], c["value"], c["error"]
            if c["inside"] is None:
                lines.append(f"  {point_text(at, 12)}: reference {mpmath.nstr(val, 20)} (no resummed value here)")
                continue
            dig = "all" if c["digits_agree"] is None else f"{c['digits_agree']:.1f}"
            lines.append(f"  {point_text(at, 12)}: reference {mpmath.nstr(val, 20)}"
                         f"{'' if err is None else ' +- ' + sig_text(err, 3)}; difference "
                         f"{sig_text(c['difference'], 3)} ({dig} digits agree); "
                         f"{'inside' if c['inside'] else 'OUTSIDE'} the band{'' if err is None else ' (with the reference error)'}")
    fails = [p for p in result.points if not p.success and p.message]
    if fails or result.warnings:
        lines.append("")
        lines.append("Warnings:")
        for p in fails:
            lines.append(f"  {point_text(p.at, 12)}: {p.message}")
        for w in result.warnings:
            if not any(w.endswith(p.message) for p in fails if p.message):
                lines.append(f"  {w}")
    lines.append("")
    lines.append("\n\n".join(band_meanings(result)))
    return "\n".join(lines) + "\n"


def band_meanings(result) -> list:
    """What the bands of ``result`` mean and how they were made: one paragraph per kind of
    method among its points (the text report ends with them; ``--json`` carries them too)."""
    methods = {getattr(p, "method", "") for p in result.points} or {getattr(result, "method", "")}
    texts = []
    if "ode" in methods:
        texts.append(BAND_MEANING_ODE)
    if "borel-ode" in methods:
        texts.append(BAND_MEANING_BOREL_ODE)
    if methods - {"ode", "borel-ode"}:
        texts.append(BAND_MEANING)
    return texts


def _variant_notes(result):
    """``(variant, text(points))`` for the paragraphs that say why a variant of the
    approximants was kept at some points."""
    return [
        ("derivative", lambda pts: "there the approximants resum f' in the mapped variable and integrate "
         "it from 0 (exactly, by partial fractions); chosen because its band was narrower than that of "
         "the approximants to f itself, and widened to cover their band if the two bands did not overlap."),
        ("quadratic", lambda pts: "near the rim of the mapped disk, with the growth at large x known, "
         "quadratic approximants P + Q f + R f^2 = 0 of the mapped function were tried as well (the root "
         "that equals the series at 0 followed to the point); chosen because their band was narrower, and "
         "widened to cover the Padé band if the two bands did not overlap."),
        ("two-point", lambda pts: "the approximants match the series at w = 0 and the strong-coupling terms "
         "given at w = 1 (the image of infinity); chosen because their band was narrower. Their band also "
         "covers the change when the last term given is left out (" + ", ".join(
             str(p.diagnostics.get("strong_truncation")) for p in pts) + ")" + (
             "" if not any(p.diagnostics.get("strong_terms_uncertainty") for p in pts) else
             " and the change when each term written as a decimal moves by half a unit in its last digit ("
             + ", ".join(str(p.diagnostics.get("strong_terms_uncertainty")) for p in pts) + ")")
         + "; the approximants that do not use the terms widen it only where they disagree by more than "
         "twice their own band. It trusts exact terms, and "
         "cannot see exponentially small corrections at strong coupling beyond what the series carries."),
    ]
