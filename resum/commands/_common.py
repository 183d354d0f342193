"""Helpers shared by the subcommands: options, loading, output."""
from __future__ import annotations

import json
import sys
import time
from dataclasses import replace
from typing import Optional, Tuple

from ..context import DEFAULT, Context
from ..errors import InputError
from ..series.core import Series
from ..series.io import (atomic_write_text, declared_digits_location, double_location,
                         least_precise_location, read_series)

__all__ = ["add_common_options", "load_series", "context_for", "emit_json", "atomic_write",
           "fail", "log", "prepare_plot_dir", "require_power_series", "at_file", "write_figures"]

atomic_write = atomic_write_text


# what --dps defaults to in evaluate and strong (context_for below)
DPS_DEFAULT_HELP = (f"default {DEFAULT.dps}, fewer (at least 5) when the least precise decimal "
                    "coefficient carries fewer digits")


def add_common_options(parser, json_flag: bool = True, dps: bool = True,
                       dps_default: str = DPS_DEFAULT_HELP) -> None:
    """``--dps N`` (digits to report) and ``--json`` (stdout holds one JSON document).
    ``dps_default`` says in words what the command does without ``--dps``."""
    if dps:
        parser.add_argument("--dps", type=_positive_int, default=None, metavar="N",
                            help=f"decimal digits the results are computed to, guard digits "
                                 f"come on top ({dps_default})")
    if json_flag:
        parser.add_argument("--json", action="store_true",
                            help="print one JSON document on stdout and nothing else")


def _positive_int(text):
    import argparse
    try:
        v = int(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"{text!r} is not an integer") from None
    if v < 5:
        raise argparse.ArgumentTypeError(f"{v} is too small; use at least 5 digits")
    if v > 20000:
        raise argparse.ArgumentTypeError(f"{v} is too large; use at most 20000 digits")
    return v


def context_for(series: Optional[Series], dps: Optional[int], where: str = "") -> Context:
    """The working context for a series: ``dps`` if given (checked against the
    digits the coefficients carry), else the default capped by those digits."""
    carried = None if series is None else series.digits
    if dps is None:
        d = DEFAULT.dps if carried is None else min(DEFAULT.dps, carried)
        return Context(dps=max(5, d))
    if carried is not None and carried < dps:
        declared = declared_digits_location(series)
        if declared is not None:
            # the file says how many digits its coefficients carry: declaring more would be
            # untrue, so the advice is a lower --dps or a longer-digit series
            more = ("regenerate it with 'resum generate ... --dps N'"
                    if series.provenance.get("source") else "write the coefficients with more digits")
            raise InputError(f"the file declares {carried} digit{'' if carried == 1 else 's'} but --dps {dps} "
                             f"was asked; lower --dps to at most {carried}, or {more}", where=declared)
        loc = least_precise_location(series) or where or "input"
        lower = f"lower --dps to at most {carried}, " if carried >= 5 else ""
        raise InputError(f"coefficient carries only {carried} digit{'' if carried == 1 else 's'} but --dps {dps} was "
                         f"asked; {lower}write it with more digits, or declare 'digits: N' or "
                         "'exact: true' in the file if its decimals are known better", where=loc)
    return Context(dps=dps)


def note_limited_precision(series: Series) -> Optional[str]:
    """Say on stderr when a short decimal literal (``0.5``, ``1.0``) caps the default precision:
    every band then reflects the digits it carries, which surprises anyone who meant it exactly.
    Returns the note (the commands add it to the warnings of their JSON), or None."""
    loc = least_precise_location(series)
    if loc is None or series.digits is None or series.digits >= DEFAULT.dps:
        return None
    n = series.digits
    text = (f"{loc}: the least precise coefficient carries only {n} significant "
            f"digit{'' if n == 1 else 's'}, which limits every result; declare 'digits: N' or "
            "'exact: true' in the file if its decimals are known better")
    if double_location(series):
        text = (f"{double_location(series)} and the other coefficients written as JSON numbers are read "
                f"as doubles ({n} significant digits), which limits every result; write them as strings "
                "to give more digits, or declare 'digits: N' or 'exact: true' in the file")
    log("note: " + text)
    return text


def with_input_notes(doc: dict, series: Series) -> dict:
    """``doc`` with the input's precision note (see :func:`load_series`) first in its warnings."""
    note = series.provenance.get("precision_note")
    if note:
        doc["warnings"] = [note] + [w for w in doc.get("warnings", []) if w != note]
    return doc


def load_series(path: str, dps: Optional[int] = None) -> Tuple[Series, Context]:
    """Read a series file and choose its working context (see :func:`context_for`)."""
    probe = Context(dps=max(dps or DEFAULT.dps, DEFAULT.dps))
    s = read_series(path, probe)
    if s.n_terms < 2:
        raise InputError(f"only {s.n_terms} coefficient; give at least 2 (most methods need 10 or more)",
                         where=str(path))
    ctx = context_for(s, dps, where=str(path))
    if ctx.work_dps > probe.work_dps:
        s = read_series(path, ctx)
    if dps is None:
        note = note_limited_precision(s)
        if note:
            s = replace(s, provenance={**s.provenance, "precision_note": note})
    return s, ctx


def require_power_series(series: Series, path: str, min_terms: int, what: str) -> None:
    """Refuse, naming the file, a series with negative powers or fewer than ``min_terms`` terms,
    before any progress line is printed (the library refuses them too, later)."""
    if series.start < 0:
        raise InputError(f"series starts at {series.variable}^{series.start}; {what} needs a power "
                         f"series: multiply by {series.variable}^{-series.start} first", where=str(path))
    if series.n_terms < min_terms:
        raise InputError(f"only {series.n_terms} terms; {what} needs at least {min_terms}; give more "
                         "coefficients", where=str(path))


def check_plan_terms(series: Series, ctx: Context, method: str, path: str, given: bool = False) -> None:
    """``--method auto`` and the conformal methods choose their map from a singularity analysis,
    which needs more terms than the resummation itself: refuse too few before the progress line,
    naming the file and what to do (the analysis refused them after it, in its own words).
    ``given``: singular points were given (``--singularity``), so a conformal method needs no
    analysis."""
    from ..estimators._common import MIN_TERMS as ANALYSIS_TERMS, prepare
    from ..resummation import _CONFORMAL, polynomial_degree
    if method not in ("auto",) + _CONFORMAL or (given and method != "auto"):
        return
    if polynomial_degree(series.dense(Context(dps=ctx.work_dps, guard=0))) is not None:
        return              # summed exactly, no analysis
    try:
        prepare(series, ctx)
    except InputError as exc:
        if "usable terms" not in exc.bare:
            return          # the evaluation says it in its own words
        raise InputError(f"{exc.bare.split(';')[0]}; --method {method} chooses its map from a singularity "
                         f"analysis, which needs at least {ANALYSIS_TERMS}: give more coefficients, or use "
                         "--method pade or borel-pade", where=str(path)) from None


def at_file(exc: InputError, path: str) -> InputError:
    """An input error about the series itself (``series...``) relocated to its file."""
    if not exc.where or exc.where.startswith("series"):
        return InputError(exc.bare, where=str(path))
    return exc


def prepare_plot_dir(folder: str) -> str:
    """Create ``folder`` for figures (before any computation) and check it can be written."""
    import os
    import tempfile
    where = f"--plot {folder}"
    if not str(folder).strip():
        raise InputError("empty folder name; give a folder for the figures", where="--plot")
    if os.path.exists(folder) and not os.path.isdir(folder):
        raise InputError("is not a folder; give a folder for the figures", where=where)
    try:
        os.makedirs(folder, exist_ok=True)
        with tempfile.TemporaryFile(dir=folder):
            pass
    except OSError as e:
        raise InputError(f"cannot write figures there ({e.strerror or e}); choose another folder",
                         where=where) from None
    return folder


def write_figures(folder: str, writer) -> Tuple[list, Optional[str]]:
    """Run ``writer()`` (which returns the paths it wrote) and log each path: ``(paths, None)``.
    A failure to write is a one-line input error naming ``--plot``; a failure to draw (numbers a
    figure cannot hold, such as values beyond the range of doubles) is a warning logged here and
    returned as ``([], warning)``: figures are extras, the results are printed all the same (the
    command then ends with exit code 1, as a scan does)."""
    import warnings
    try:
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")     # the plotting library's own, not ours
            paths = writer()
    except OSError as e:
        raise InputError(f"cannot write figures ({e.strerror or e}); choose another folder",
                         where=f"--plot {folder}") from None
    except Exception as e:  # noqa: BLE001 - a figure that cannot be drawn must not lose the results
        why = (str(e).splitlines() or [""])[0][:200]
        note = f"figures not drawn ({type(e).__name__}: {why}); the results are not affected"
        log(f"warning: {note}")
        return [], note
    for p in paths:
        log(f"wrote {p}")
    return paths, None


_JSON_EMITTED = [False]


def emit_json(obj) -> None:
    """Write one JSON document to stdout."""
    _JSON_EMITTED[0] = True
    sys.stdout.write(json.dumps(obj, indent=1) + "\n")
    sys.stdout.flush()


def json_emitted() -> bool:
    """Whether :func:`emit_json` wrote a document since :func:`reset_json_emitted`."""
    return _JSON_EMITTED[0]


def reset_json_emitted() -> None:
    _JSON_EMITTED[0] = False


def fail(message: str, where: str = ""):
    raise InputError(message, where=where)


def log(message: str) -> None:
    """A log line on stderr."""
    print(f"resum: {message}", file=sys.stderr, flush=True)


def stage_log(args):
    """Where the library's stage messages go: :func:`log` (indented) on a terminal, nowhere
    under ``--json`` or when stderr is not a terminal (as the family runs' progress line)."""
    if getattr(args, "json", False) or not sys.stderr.isatty():
        return None
    return lambda message: log("  " + message)


class FractionBar:
    """A one-line bar on stderr for one long computation that reports the fraction of its work
    done (:mod:`resum.progress`): ``label [#####.......]  42%  0:12 elapsed, ~0:16 left``,
    redrawn in place at most four times a second, on a terminal only (a log or a pipe gets the
    command's own summary line, nothing else). :meth:`close` clears it."""

    def __init__(self, label: str, stream=None, width: int = 24):
        self.label = label
        self.stream = sys.stderr if stream is None else stream
        self.width = width
        self.start = time.monotonic()
        self._last = 0.0
        self.shown = False
        from ..batch.progress import is_tty
        self.tty = is_tty(self.stream)

    def __call__(self, fraction: float) -> None:
        if not self.tty:
            return
        now = time.monotonic()
        if now - self._last < 0.25 and fraction < 1:
            return
        self._last = now
        from ..batch.progress import _clock
        el = now - self.start
        fill = int(round(fraction * self.width))
        left = f", ~{_clock(el / fraction - el)} left" if 0.02 <= fraction < 1 else ""
        self.stream.write(f"\r{self.label} [{'#' * fill}{'.' * (self.width - fill)}] {100 * fraction:3.0f}%  "
                          f"{_clock(el)} elapsed{left}\x1b[K")
        self.stream.flush()
        self.shown = True

    def close(self) -> None:
        if self.shown:
            self.stream.write("\r\x1b[K")
            self.stream.flush()


#: Most points one ``--at START:STOP:N`` may ask for.
MAX_RANGE_POINTS = 1000

AT_HELP_RANGE = ("; START:STOP:N gives N evenly spaced points from START to STOP (both included), "
                 "START:STOP:N:log geometric ones")


def expand_points(texts, dps: int, where: str = "--at") -> list:
    """The ``--at`` values as mpmath numbers: each a decimal or expression, or a range
    ``START:STOP:N`` (N evenly spaced points, both ends included) or ``START:STOP:N:log``
    (geometric; START and STOP real and positive). START and STOP may be expressions."""
    import mpmath
    from ..resummation import parse_points, spaced_points
    out = []
    for text in texts:
        here = f"{where} {text[:40]}"
        if ":" not in text:
            try:
                out += parse_points([text], dps)
            except InputError as exc:
                raise InputError(exc.bare, where=here) from None
            continue
        parts = [p.strip() for p in text.split(":")]
        log_scale = len(parts) == 4 and parts[3].lower() == "log"
        if len(parts) not in (3, 4) or (len(parts) == 4 and not log_scale):
            raise InputError("write a range as START:STOP:N or START:STOP:N:log", where=here)
        try:
            n = int(parts[2])
        except ValueError:
            n = 0
        if not 2 <= n <= MAX_RANGE_POINTS:
            raise InputError(f"the number of points N must be a whole number from 2 to {MAX_RANGE_POINTS}, "
                             f"got {parts[2]!r}", where=here)
        try:
            a, b = parse_points(parts[:2], dps)
        except InputError as exc:
            raise InputError(exc.bare, where=here) from None
        if log_scale and (isinstance(a, mpmath.mpc) or isinstance(b, mpmath.mpc) or a <= 0 or b <= 0):
            raise InputError("a log range needs real positive START and STOP", where=here)
        with mpmath.workdps(dps):
            out += spaced_points(a, b, n, geometric=log_scale)
    return out


def add_map_options(parser) -> None:
    """``--singularity X``, ``--borel-singularity T`` (repeat) and ``--borel-b B``: what the user
    knows of the function, given to the resummation instead of what the analysis finds."""
    parser.add_argument("--singularity", action="append", default=None, metavar="X",
                        help="a singular point of the function in the file's expansion variable (as "
                             "'resum analyze' reports them: for a series in x = g^2, x, e.g. -1/16), "
                             "decimal or expression, complex as 1+2*I; repeat for more points. The "
                             "conformal map is built from these instead of the analysis' points")
    parser.add_argument("--borel-singularity", action="append", default=None, metavar="T",
                        help="a singular point of the Borel transform (for c_n ~ A^-n n!: t = A, the "
                             "instanton action), decimal or expression; repeat for more. The Borel plane "
                             "is mapped from these instead of the analysis' estimate; one on the positive "
                             "axis means lateral sums, no map")
    parser.add_argument("--borel-b", default=None, metavar="B",
                        help="Borel-Le Roy parameter b > -1 of the Borel methods: B(t) = sum c_n t^n / "
                             "Gamma(n + 1 + b) (default 0)")


def map_options(args, dps: int) -> dict:
    """The keywords of :func:`resum.resummation.evaluate` that ``--singularity``,
    ``--borel-singularity`` and ``--borel-b`` give, each value refused (naming its option) before
    any work."""
    from ..resummation import borel_parameter, singular_points
    out = {}
    for opt, key in (("singularity", "singularities"), ("borel_singularity", "borel_singularities")):
        texts = getattr(args, opt)
        if not texts:
            continue
        out[key] = singular_points(texts, dps,
                                   name=lambda k, o=opt, t=texts: f"--{o.replace('_', '-')} {t[k][:40]}")
    if args.borel_b is not None:
        try:
            out["borel_b"] = borel_parameter(args.borel_b, dps)
        except InputError as exc:
            raise InputError(exc.bare, where="--borel-b") from None
    return out


def power_term(item: str, series: Series, option: str, logs: bool = False):
    """``(label, power, value text)`` from ``LABEL=VALUE`` with LABEL a power of the series'
    coupling (or variable), ``g^1``, ``g^-1/2`` or ``g^(1/3)`` (with ``logs``, also ``g^P log g``);
    ``power`` the exponent as text. InputError naming ``option`` otherwise."""
    import re
    from ..estimators.strong_coupling import power_key
    label, sep, value = item.partition("=")
    var = series.coupling.symbol if series.coupling is not None else series.variable
    if not sep or not label.strip() or not value.strip():
        raise InputError(f"write {option} as LABEL=VALUE (e.g. {var}^1=2), got {item!r}", where=option)
    label = power_key(label)
    m = re.fullmatch(r"([A-Za-z_]\w*)\^(-?\d+(?:/\d+)?)( log ([A-Za-z_]\w*))?", label)
    if m is None or m.group(1) != var or (m.group(4) is not None and (m.group(4) != var or not logs)):
        form = f"{var}^P or '{var}^P log {var}'" if logs else f"{var}^P"
        raise InputError(f"write the term as {form} with P a whole number or a fraction (e.g. {var}^1=2, "
                         f"'{var}^-1/2=0.3'), got {label!r}", where=option)
    return label, m.group(2), value.strip()
