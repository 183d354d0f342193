"""``resum scan SPEC -o DIR``: run a family study.

Reads the family spec (see docs/families.md), validates it completely,
then computes every grid point not yet recorded in DIR, one JSON record per
point written as it finishes, and finally the summary table and figures.

Exit codes: 0 every point ok, 1 some points failed (or the run was
incomplete), 2 spec or usage error, 130 interrupted (finished points kept).
"""
from __future__ import annotations

import argparse
import sys
from typing import List, Optional

from ..errors import InputError

HELP = "run a family study: a parameter grid of one source, one record per point"
DESCRIPTION = (
    "Run the family study described by SPEC (a TOML file) and write one JSON record per grid "
    "point into DIR/points/ as each finishes, then DIR/summary.csv, DIR/summary.json and the "
    "figures in DIR/plots/. A rerun with --resume skips finished points. Exit code 0 when "
    "every point is ok, 1 when some failed, 2 for a spec or usage error.")


def _jobs(text):
    try:
        v = int(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"{text!r} is not a whole number") from None
    if v < 1:
        raise argparse.ArgumentTypeError("use at least 1 job")
    return v


def add_arguments(parser) -> None:
    parser.add_argument("spec", metavar="SPEC", help="family spec (TOML)")
    parser.add_argument("-o", "--out", metavar="DIR", required=True,
                        help="output folder (created; a rerun needs --resume)")
    where = parser.add_mutually_exclusive_group()
    where.add_argument("--jobs", type=_jobs, default=None, metavar="N",
                       help="local worker processes (default: all cores; 1 = in this process)")
    where.add_argument("--cluster", metavar="ADDRESS", default=None,
                       help="dask scheduler to use (tcp://host:8786), or local:N to start a "
                            "local dask cluster of N worker processes")
    parser.add_argument("--resume", action="store_true",
                        help="continue a run in DIR: points already recorded are skipped")
    parser.add_argument("--retry-failed", action="store_true",
                        help="with --resume, compute the failed points again")
    parser.add_argument("--no-plots", action="store_true", help="do not draw the family figures")
    parser.add_argument("--check", action="store_true",
                        help="validate the spec, list the points and exit")
    parser.add_argument("--json", action="store_true",
                        help="print one JSON document (the summary) on stdout; no progress bar")


def run(args) -> int:
    from ..batch import load_spec, make_runner, run_family
    if args.out is not None and not str(args.out).strip():
        # Path("") is the current folder: an unset variable in '-o "$DIR"' must not fill it
        raise InputError("empty folder name; give a folder for the results", where="-o")
    spec = load_spec(args.spec)
    if args.retry_failed and not args.resume:
        raise InputError("--retry-failed continues an earlier run; give --resume too")
    if args.check:
        pts = spec.points()
        if args.json:
            _emit({"study": spec.name, "n_points": str(len(pts)),
                   "points": [{"key": p.key, "label": p.label()} for p in pts]})
        else:
            print(f"{spec.name}: {len(pts)} points, tasks: {', '.join(spec.tasks)}")
            for p in pts:
                print(f"  {p.key}  {p.label()}")
        return 0
    runner = make_runner(jobs=args.jobs, cluster=args.cluster)
    outcome = run_family(spec, args.out, runner=runner, resume=args.resume,
                         retry_failed=args.retry_failed, quiet=args.json, plots=False)
    plots, plot_error = [], None
    if not args.no_plots and not outcome.interrupted:
        try:
            from ..batch.scan import _plots
            from ..batch.records import RunFolder
            plots = _plots(spec, RunFolder(args.out))
        except Exception as exc:   # figures are extras: say so, keep the records
            plot_error = f"{type(exc).__name__}: {exc}".splitlines()[0]
    c = outcome.counts
    if args.json:
        # every number a decimal string, as in the other commands' JSON
        _emit({"study": spec.name, "folder": outcome.folder, "counts": {k: str(v) for k, v in c.items()},
               "computed": str(len(outcome.computed)), "skipped": str(len(outcome.skipped)),
               "interrupted": outcome.interrupted, "plots": [str(p) for p in plots],
               "plot_error": plot_error, "summary": f"{outcome.folder}/summary.csv",
               "recomputed_unreadable": list(outcome.unreadable)})
    else:
        print(f"{spec.name}: {c['ok']} ok, {c['failed']} failed, {c['missing']} missing of "
              f"{c['points']} points ({len(outcome.computed)} computed now, "
              f"{len(outcome.skipped)} from earlier runs); summary: {outcome.folder}/summary.csv")
        if plots:
            print(f"figures: {len(plots)} files in {outcome.folder}/plots")
    if plot_error:
        print(f"resum scan: figures not drawn: {plot_error}", file=sys.stderr)
    if outcome.interrupted:
        return 130
    return 0 if outcome.success and not plot_error else 1


def _emit(obj) -> None:
    from ._common import emit_json
    emit_json(obj)


def main(argv: Optional[List[str]] = None) -> int:
    """Run ``resum scan`` alone (``python -m resum.commands.family``)."""
    parser = argparse.ArgumentParser(prog="resum scan", description=DESCRIPTION)
    add_arguments(parser)
    try:
        args = parser.parse_args(argv)
    except SystemExit as exc:
        return int(exc.code or 0)
    try:
        return run(args)
    except InputError as exc:
        print(f"resum scan: error: {exc}", file=sys.stderr)
        return 2
    except KeyboardInterrupt:
        return 130


if __name__ == "__main__":
    sys.exit(main())
