"""Running a family: choose the points to do, hand them to a runner, write records.

In Python::

    spec = load_spec("studies/bes_angles/spec.toml")
    outcome = run_family(spec, "out", runner=ProcessRunner(jobs=4))
    outcome.counts   # {'points': 25, 'recorded': 25, 'ok': 25, 'failed': 0, 'missing': 0}
"""
from __future__ import annotations

import sys
from dataclasses import dataclass, field

from ..parallel import env_jobs
from .progress import Progress
from .records import RunFolder
from .runners import SerialRunner, refuse_nested_run
from .spec import FamilySpec

__all__ = ["run_family", "FamilyOutcome", "plan"]


@dataclass(frozen=True)
class FamilyOutcome:
    """What a run did.

    ``computed`` are the point indices computed in this run, ``skipped`` those
    finished by an earlier run; ``counts`` are the totals over the folder
    (points, recorded, ok, failed, missing); ``interrupted`` is True when the
    run was stopped before every point was done; ``unreadable`` names the record
    files of an earlier run that held no readable record (cut short, edited by
    hand): their points were computed again.
    """

    folder: str
    computed: tuple
    skipped: tuple
    counts: dict
    interrupted: bool = False
    plots: tuple = field(default=())
    unreadable: tuple = field(default=())

    @property
    def success(self) -> bool:
        return not self.interrupted and self.counts.get("failed", 0) == 0 \
            and self.counts.get("missing", 0) == 0


def plan(spec: FamilySpec, folder: RunFolder, retry_failed: bool = False, status=None):
    """``(todo, skipped)``: indices to compute and indices already recorded (``status``: the
    folder's ``{key: status}`` when already read)."""
    status = folder.statuses() if status is None else status
    todo, skipped = [], []
    for i in range(spec.n_points):
        key = spec.point(i).key
        st = status.get(key)
        if st == "ok" or (st is not None and not retry_failed):
            skipped.append(i)
        else:
            todo.append(i)
    return todo, skipped


def run_family(spec: FamilySpec, outdir, runner=None, resume: bool = False,
               retry_failed: bool = False, quiet: bool = False, stream=None,
               plots: bool = True, on_record=None) -> FamilyOutcome:
    """Compute every point of ``spec`` not yet recorded in ``outdir``.

    Parameters
    ----------
    spec : FamilySpec
    outdir : path
        The run folder (see :mod:`resum.batch.records`). A folder holding a
        run of another spec is refused; one holding records of this spec
        needs ``resume=True``.
    runner : SerialRunner, ProcessRunner or DaskRunner
    resume : bool
        Continue a run: points with a record are skipped.
    retry_failed : bool
        With ``resume``, compute again the points whose record says failed.
    quiet : bool
        No progress display (``--json``).
    plots : bool
        Draw the family figures into ``outdir/plots`` at the end.

    Returns
    -------
    FamilyOutcome
        Ctrl-C stops the run after writing what has finished; the outcome
        then has ``interrupted=True`` (and the summary covers what is on disk).
    """
    refuse_nested_run()           # a worker importing an unguarded script: end it, touch nothing
    env_jobs()                    # a bad RESUM_JOBS stops the run here, not at every point
    runner = runner or SerialRunner()
    folder = RunFolder(outdir)
    folder.check(spec, resume=resume or retry_failed)
    if hasattr(runner, "prepare"):
        runner.prepare()          # e.g. reach the cluster before writing anything
    try:
        folder.prepare(spec, resume=resume or retry_failed)
        recs, bad = folder.read_all()
        todo, skipped = plan(spec, folder, retry_failed=retry_failed,
                             status=folder.statuses(recs))
        unreadable = tuple(p.name for p in bad)
    except BaseException:
        if hasattr(runner, "close"):
            runner.close()
        raise
    if not todo and hasattr(runner, "close"):
        runner.close()
    if unreadable:     # said even under quiet: the run replaces what was there
        names = ", ".join(unreadable[:5]) + (f" and {len(unreadable) - 5} more" if len(unreadable) > 5 else "")
        print(f"resum: {len(unreadable)} record file(s) in {folder.points} hold no readable record "
              f"(cut short or edited by hand) and their points are computed again: {names}",
              file=stream or sys.stderr)
    prog = Progress(spec.n_points, label=spec.name, stream=stream, quiet=quiet,
                    skipped=len(skipped))
    running = set()
    computed = []

    def started(i):
        running.add(i)
        prog.set_running(len(running))

    def record(rec):
        folder.write_record(rec)
        running.discard(rec["index"])
        computed.append(rec["index"])
        prog.finished(rec["status"] == "ok", running=len(running))
        if on_record is not None:
            on_record(rec)

    interrupted = completed = False
    try:
        if todo:
            runner.run(spec, todo, started, record)
        completed = True
    except KeyboardInterrupt:
        interrupted = True
    finally:     # the runner has ended the points still running: the last line says stopped
        counts = folder.write_summary(spec)
        prog.close("interrupted: finished points are saved; rerun with --resume to go on"
                   if interrupted else "", stopped=not completed)
    made = ()
    if plots and not interrupted:
        made = tuple(_plots(spec, folder))
    return FamilyOutcome(str(folder.path), tuple(sorted(computed)), tuple(skipped), counts,
                         interrupted, made, unreadable)


def _plots(spec, folder):
    try:
        import matplotlib  # noqa: F401
    except ImportError:  # pragma: no cover - plot extra not installed
        return []
    from ..plots.family import write_family_plots
    return write_family_plots(folder.records(), folder.plots, x=spec.plot_against,
                              title=spec.name)
