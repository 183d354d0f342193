"""``resum generate SOURCE [options] -o FILE``: write a series from a built-in source.

Each source of :data:`resum.sources.SOURCES` becomes a sub-command with its own
options (``resum generate bes --help``). Numbers may be expressions
(``--angle pi/3``). The file format follows the extension (``.json``,
``.csv``, anything else: plain text); the file is written atomically. A
one-line summary goes to stderr.

Fixed invocation used by other tools::

    resum generate bes --angle A --loops L --dps D -o FILE.json

writes a JSON series document whose ``coefficients[k]`` multiplies ``x^k``,
``x = g^2``, from ``k = 0``, each correct to ``D`` significant digits.
"""
from __future__ import annotations

import argparse
import sys

from ..errors import InputError

from ..sources import SOURCES as _SOURCES     # the registry imports no numerics

HELP = f"write a series from a built-in source ({', '.join(_SOURCES)})"
DESCRIPTION = ("Compute the series of one built-in source and write it to FILE (.json, .csv or "
               "text by extension), atomically. Exit code 0 on success, 2 for a usage or input "
               "error.")


def _int_arg(name):
    def conv(text):
        try:
            return int(text)
        except ValueError:
            raise argparse.ArgumentTypeError(f"{text!r} is not a whole number") from None
    return conv


def _bool_flag(parser, p):
    parser.add_argument(f"--{p.name}", action="store_true", default=bool(p.default), help=p.help)


def add_arguments(parser) -> None:
    from ..sources import SOURCES
    sub = parser.add_subparsers(dest="source", metavar="SOURCE", parser_class=type(parser))
    for name, spec in SOURCES.items():
        sp = sub.add_parser(name, help=spec.help, description=spec.help)
        for p in spec.params:
            if p.type == "bool":
                _bool_flag(sp, p)
                continue
            kw = {"default": None, "metavar": p.name.upper()}
            if p.type == "int":
                kw["type"] = _int_arg(p.name)
            extra = []
            if p.minimum is not None and p.maximum is not None:
                extra.append(f"{p.minimum}..{p.maximum}")
            elif p.minimum is not None:
                extra.append(f"at least {p.minimum}")
            elif p.maximum is not None:
                extra.append(f"at most {p.maximum}")
            if p.default is not None:
                extra.append(f"default {p.default}")
            dflt = f" ({', '.join(extra)})" if extra else ""
            if p.choices:
                kw["choices"] = p.choices
            sp.add_argument(f"--{p.name}", help=p.help + dflt, **kw)
        sp.add_argument("-o", "--out", metavar="FILE", required=True,
                        help="output file (.json, .csv, or text)")


def _values(spec, args, dps_for_parse: int) -> dict:
    from ..series.expr import evaluate_expression
    kw = {}
    for p in spec.params:
        v = getattr(args, p.name, None)
        if p.type == "bool":
            if v:
                kw[p.name] = True
            continue
        if v is None:
            continue
        if p.type == "float":
            text = v
            try:
                val = evaluate_expression(text, dps=dps_for_parse)
            except InputError as exc:
                raise exc.at(f"--{p.name}") from None
            p.check(val.value, f"--{p.name}")
            # keep the text for sources that re-evaluate it at their own precision
            kw[p.name] = text if not val.exact else val.value
        else:
            kw[p.name] = v          # whole numbers were checked by run() before the precision was set
    return kw


def run(args) -> int:
    from ..context import DEFAULT, Context
    from ..series.io import check_output_file, write_series
    from ..sources import SOURCES, get_source
    if not getattr(args, "source", None):
        raise InputError("name a source: " + ", ".join(sorted(SOURCES)))
    spec = get_source(args.source)
    dps = getattr(args, "dps", None)
    for p in spec.params:         # whole numbers first: --dps sets the precision of the rest
        if p.type == "int":
            p.check(getattr(args, p.name, None), f"--{p.name}")
    chosen = None
    if dps is None:
        # the source's own default: enough digits for the series' length (see its help)
        from ..sources import default_digits_for
        given = {p.name: getattr(args, p.name, None) for p in spec.params if p.type == "int"}
        dps = chosen = default_digits_for(spec, given)
    ctx = Context(dps=dps) if dps is not None else DEFAULT
    kw = _values(spec, args, ctx.work_dps + 10)
    check_output_file(args.out)       # a mistyped -o is told before the (maybe long) computation
    from ..progress import listening
    from ._common import FractionBar
    bar = FractionBar(f"resum generate {spec.name}")
    try:
        with listening(bar):
            series = spec.build(ctx, **kw)
    finally:
        bar.close()
    path = write_series(series, args.out)
    kind = "exact" if series.is_exact else f"{series.digits} digits"
    if chosen is not None and not series.is_exact:
        kind += ", the default for this length; --dps sets it"
    print(f"resum generate: wrote {series.n_terms} coefficients ({kind}) of {series.name or spec.name} "
          f"to {path}", file=sys.stderr)
    return 0
