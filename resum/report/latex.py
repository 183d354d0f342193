"""LaTeX renderings: bands as ``value(error)`` in math mode, and the family summary as a table.

The notation ``1.2345(6)`` (the error in units of the last digit shown) is the one papers use;
``siunitx`` reads it too. Only the digits the band supports are written (the rule of
:class:`~resum.results.Estimate`), so a table copied into a paper claims no more than the run
earned. A band is an estimate, not a proof: the file says so in its header comment.

>>> estimate_tex("0.0625001", "0.0624898", "0.0625103")
'$0.062500(11)$'
>>> estimate_tex("1.2345e-7", "1.2340e-7", "1.2350e-7")
'$1.2345(5)\\\\times 10^{-7}$'
>>> label_tex("3*pi/8"), label_tex("0.25"), label_tex("sqrt(2)")
('$3\\\\pi/8$', '$0.25$', '$\\\\sqrt{2}$')
>>> estimate_tex("0", "-1.3e-24", "1.3e-24")
'$0\\\\;[-1.3\\\\times 10^{-24},\\\\,1.3\\\\times 10^{-24}]$'
>>> _header("strong_resummed_g^-1"), _header("value@1")
('strong resummed $g^{-1}$', 'value at 1')
"""
from __future__ import annotations

import re
from typing import Optional, Sequence

import mpmath

__all__ = ["estimate_tex", "label_tex", "family_table_tex"]

_SPECIAL = {"\\": r"\textbackslash{}", "&": r"\&", "%": r"\%", "$": r"\$", "#": r"\#", "_": r"\_",
            "{": r"\{", "}": r"\}", "~": r"\textasciitilde{}", "^": r"\textasciicircum{}"}


def escape(text: str) -> str:
    """``text`` with LaTeX's special characters escaped (for text mode)."""
    return "".join(_SPECIAL.get(ch, ch) for ch in str(text))


def _sci(text: str) -> str:
    """``1.23(4)e-5`` -> ``1.23(4)\\times 10^{-5}`` (math mode body)."""
    m = re.fullmatch(r"(.*?)[eE]([+-]?\d+)", text)
    if not m:
        return text
    return f"{m.group(1)}\\times 10^{{{int(m.group(2))}}}"


def estimate_tex(value, lo=None, hi=None) -> str:
    """A band (decimal strings or numbers) as ``$value(error)$`` with the digits it supports;
    a value without a band (or an exact one) as the value; empty for a missing value."""
    from ..results import Estimate
    if value in (None, "", "nan"):
        return ""
    with mpmath.workdps(60):
        v = mpmath.mpf(value)
        if lo in (None, "") or hi in (None, ""):
            return f"${_sci(mpmath.nstr(v, 15))}$"
        text = str(Estimate(v, mpmath.mpf(lo), mpmath.mpf(hi)))
    m = re.fullmatch(r"(\S+) \[(\S+), (\S+)\]", text)
    if m:
        # a band that supports no digit of the value (around 0, say): value [lo, hi]
        return f"${_sci(m.group(1))}\\;[{_sci(m.group(2))},\\,{_sci(m.group(3))}]$"
    return f"${_sci(text)}$"


_FUNCS = ("sqrt", "log", "exp", "sin", "cos", "zeta", "gamma")


def label_tex(label) -> str:
    """A parameter label as written in a spec (``3*pi/8``, ``0.25``, ``sqrt(2)``) in math mode;
    anything else (a word, a state name) as escaped text."""
    s = str(label).strip()
    if not re.fullmatch(r"[0-9a-z_.+\-*/^() ]+", s) or re.search(r"[a-z]", re.sub(
            r"\b(pi|" + "|".join(_FUNCS) + r"|catalan|euler_gamma|e)\b", "", s)):
        return escape(s)
    s = s.replace("*", " ").replace("euler_gamma", r"\gamma_E").replace("catalan", "G")
    s = re.sub(r"\bpi\b", r"\\pi", s)
    s = re.sub(r"\bsqrt\(([^()]*)\)", r"\\sqrt{\1}", s)
    for f in ("log", "exp", "sin", "cos"):
        s = re.sub(rf"\b{f}\(", rf"\\{f}(", s)
    s = re.sub(r"\bzeta\(", r"\\zeta(", s).replace("gamma(", r"\Gamma(")
    s = re.sub(r"\^(\w+)", r"^{\1}", s)
    s = re.sub(r"(\d) (\\)", r"\1\2", s)          # 3 \pi -> 3\pi
    return f"${s.strip()}$"


def _header(col: str) -> str:
    """A summary column's name as a table header: ``value@1`` -> ``value at 1``, underscores as
    spaces, a power such as ``g^-1`` in math mode."""
    name, sep, at = col.partition("@")
    words = []
    for w in name.split("_") + ([f"at {at}"] if sep else []):
        m = re.fullmatch(r"([A-Za-z]\w*)\^\(?(-?[\d/]+)\)?", w)
        words.append(f"${m.group(1)}^{{{m.group(2)}}}$" if m else escape(w))
    return " ".join(words)


def family_table_tex(rows: Sequence[dict], axes: Sequence[str], *, title: str = "",
                     note: Optional[str] = None) -> str:
    """The family summary as a LaTeX ``tabular`` (booktabs rules): one row per point, the
    parameter columns ``axes`` then every column that is a band (``X`` with ``X_lo`` and
    ``X_hi``), each as ``value(error)``; a failed point's bands are empty and its status is
    noted. ``note`` (what a band means) goes into the header comment."""
    bands = []
    for r in rows:
        for k in r:
            if k + "_lo" in r and k not in bands and k not in axes:
                bands.append(k)
    cols = list(axes) + bands
    lines = ["% " + line for line in (
        [f"{title}: family summary written by resum" if title else "family summary written by resum"]
        + _wrap(note or "") + ["Needs \\usepackage{booktabs}. Each entry value(error): the error in "
                               "units of the last digit shown."])]
    lines.append("\\begin{tabular}{" + "l" * len(axes) + "r" * len(bands) + "}")
    lines.append("\\toprule")
    lines.append(" & ".join(_header(c) for c in cols) + " \\\\")
    lines.append("\\midrule")
    for r in rows:
        cells = [label_tex(r.get(a, "")) for a in axes]
        failed = r.get("status") not in (None, "ok")
        for b in bands:
            cells.append("" if failed else estimate_tex(r.get(b), r.get(b + "_lo"), r.get(b + "_hi")))
        line = " & ".join(cells) + " \\\\"
        if failed:
            line += f"  % {escape(r.get('status', ''))}: {escape(str(r.get('error', ''))[:120])}"
        lines.append(line)
    lines.append("\\bottomrule")
    lines.append("\\end{tabular}")
    return "\n".join(lines) + "\n"


def _wrap(text: str, width: int = 96) -> list:
    out, line = [], ""
    for word in text.split():
        if line and len(line) + 1 + len(word) > width:
            out.append(line)
            line = word
        else:
            line = f"{line} {word}".strip()
    if line:
        out.append(line)
    return out
