"""Computing one grid point: the function every runner calls.

:func:`compute_point` is a plain top-level function of picklable arguments
(the validated spec and a point index) that returns the point's record as a
JSON-ready dict. It never raises for a failure inside the computation: the
error (type, message, traceback and the step it happened in) is recorded
and the record's ``status`` is ``"failed"``. Only interrupts
(KeyboardInterrupt, SystemExit) pass through.

Everything that depends on where and when the point ran (host, process,
start time, seconds per step) sits under the record's ``"run"`` key; the
rest of the record is the same whichever runner computed it.
"""
from __future__ import annotations

import os
import platform
import socket
import time
import traceback

from .._version import __version__
from ..context import workdps
from .spec import FamilySpec, value_json, value_text

__all__ = ["compute_point", "failure_record", "RECORD_FORMAT", "strip_run"]

RECORD_FORMAT = "resum-family-point/1"


def _base(spec: FamilySpec, index: int) -> dict:
    point = spec.point(index)
    return {
        "format": RECORD_FORMAT,
        "study": spec.name,
        "spec_digest": spec.digest,
        "index": index,
        "key": point.key,
        "source": spec.source,
        "dps": spec.dps,
        "axes": [a.name for a in spec.axes],
        "params": {k: value_json(v, spec.dps) for k, v in point.params.items()},
        "labels": {k: value_text(v) for k, v in point.params.items()},
        "axis_index": dict(point.axis_index),
        "fixed": {k: value_json(v, spec.dps) for k, v in spec.fixed.items()},
        "task_names": list(spec.tasks),
        "version": __version__,
    }


def _run_info(started: float, seconds: dict, runner: str = "") -> dict:
    return {"host": socket.gethostname(), "pid": os.getpid(), "python": platform.python_version(),
            "started": time.strftime("%Y-%m-%dT%H:%M:%SZ", time.gmtime(started)),
            "seconds": {k: round(v, 4) for k, v in seconds.items()}, "runner": runner}


def compute_point(spec: FamilySpec, index: int, runner: str = "") -> dict:
    """Build the series at grid point ``index`` and run every task of ``spec``.

    Returns the record (see the module docstring). ``status`` is ``"ok"``
    when every task ran, ``"failed"`` when a step raised; tasks that ran
    before the failure keep their results.
    """
    from .tasks import TASKS
    from .spec import _find_source

    started = time.time()            # when (for the record); durations by the monotonic clock
    t0 = time.perf_counter()
    rec = _base(spec, index)
    seconds = {}
    rec["tasks"] = {}
    rec["series"] = None
    rec["status"] = "ok"
    rec["error"] = None
    ctx = spec.context
    point = spec.point(index)
    step = "build"
    try:
        source, why = _find_source(spec.source)
        if source is None:
            raise LookupError(f"source {spec.source!r} is not available in this process"
                              + (f": {why}" if why else ""))
        build = source["build"] if isinstance(source, dict) else source.build
        kwargs = spec.source_kwargs(point)
        from ..sources import default_digits_for
        digits = default_digits_for(source, kwargs)
        if digits is not None:
            # no dps for the source in the spec: the digits its series need for their length,
            # never fewer than the study works to (as resum generate does)
            kwargs["dps"] = max(ctx.dps, digits)
        t = time.perf_counter()
        series = build(ctx, **kwargs)
        seconds["build"] = time.perf_counter() - t
        rec["series"] = {"n_terms": series.n_terms, "digits": series.digits,
                         "variable": series.variable, "start": series.start,
                         "input_hash": series.input_hash(),
                         "coupling": None if series.coupling is None else
                         {"symbol": series.coupling.symbol, "power": series.coupling.power,
                          "scale": str(series.coupling.scale)}}
        for name, opts in spec.tasks.items():
            step = name
            t = time.perf_counter()
            # serialise inside the working precision so the text of every
            # number is the same whichever process computed it
            with workdps(ctx.work_dps):
                if TASKS[name].wants_rebuild:
                    from ..sources import rebuilder
                    rebuild = rebuilder(source, kwargs, series.n_terms, ctx, build, digits=series.digits)
                    rec["tasks"][name] = TASKS[name].run(series, point.params, ctx, opts, source,
                                                         rebuild=rebuild)
                else:
                    rec["tasks"][name] = TASKS[name].run(series, point.params, ctx, opts, source)
            seconds[name] = time.perf_counter() - t
    except Exception as exc:  # recorded, the study goes on
        rec["status"] = "failed"
        rec["error"] = {"step": step, "type": type(exc).__name__, "message": str(exc).strip()
                        .splitlines()[0] if str(exc).strip() else type(exc).__name__,
                        "traceback": traceback.format_exc()}
    seconds["total"] = time.perf_counter() - t0
    rec["run"] = _run_info(started, seconds, runner)
    return rec


def failure_record(spec: FamilySpec, index: int, message: str, kind: str = "WorkerLost",
                   runner: str = "") -> dict:
    """Record for a point whose computation never returned (worker died, cancelled)."""
    rec = _base(spec, index)
    rec.update(tasks={}, series=None, status="failed",
               error={"step": "runner", "type": kind, "message": message, "traceback": ""})
    rec["run"] = _run_info(time.time(), {}, runner)
    return rec


def strip_run(record: dict) -> dict:
    """The record without its ``run`` part (what must agree between runners)."""
    return {k: v for k, v in record.items() if k != "run"}
