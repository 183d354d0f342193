"""Runners: where the points of a family are computed.

A runner knows nothing about the mathematics. It is handed the validated
spec and the indices of the points still to do, calls
:func:`resum.batch.worker.compute_point` for each (in this process, in a
local process pool, or on a dask cluster) and hands every record back to
the caller as soon as it arrives, in the caller's process, which writes
it. Records are therefore the same whichever runner made them, apart from
their ``run`` part (host, process, timings).

* :class:`SerialRunner` -- one point after another in this process (for
  debugging: breakpoints and tracebacks work).
* :class:`ProcessRunner` -- local processes, at most ``jobs`` at a time
  (default: all cores), one per point, so "running" is exact and a worker
  that dies (killed, out of memory) takes only its own point with it: that
  point is computed once more alone, and recorded as failed if its process
  dies again. Worker processes end with the main process, even when it is
  killed with SIGKILL.
* :class:`DaskRunner` -- a dask.distributed cluster: ``address`` joins a
  running scheduler (``tcp://host:8786``); ``local:N`` starts a LocalCluster
  with N single-threaded worker processes for the span of the run. Every
  task carries the spec itself (a few kilobytes), so no task depends on
  data held by one worker, and a worker that dies takes only the points it
  held with it. A point dask gives up on (``KilledWorker``) while other
  points ran is computed once more alone, and recorded as failed if its
  worker dies again, as with :class:`ProcessRunner`; a local cluster gives
  up at the first death (a remote scheduler after its own
  ``allowed-failures``).
"""
from __future__ import annotations

import multiprocessing
import multiprocessing.connection
import os
import signal
import sys
import threading
from typing import Callable, Optional, Sequence

from ..errors import InputError
from .worker import compute_point, failure_record

__all__ = ["SerialRunner", "ProcessRunner", "DaskRunner", "make_runner", "default_jobs"]


def default_jobs() -> int:
    from ..parallel import cores
    return cores()


class SerialRunner:
    name = "serial"
    jobs = 1

    def run(self, spec, indices: Sequence[int], on_start: Callable, on_record: Callable) -> None:
        for i in indices:
            on_start(i)
            on_record(compute_point(spec, i, self.name))


#: exit code of a point process in which importing the caller's main script ran the family again
NESTED_EXIT = 86
NESTED_MESSAGE = ("the script calls run_family outside 'if __name__ == \"__main__\":'; each point's "
                  "process imports the script and would start the family again: put the call under "
                  "that guard (or run with SerialRunner)")


def refuse_nested_run() -> None:
    """Called by :func:`resum.batch.run_family` first: in a process that multiprocessing is still
    starting (it imports the caller's main script to unpickle the task), a family run can only be
    the script's own unguarded call. End this process at once, before it touches any folder, with
    :data:`NESTED_EXIT`, which the parent turns into one error for the whole run."""
    if getattr(multiprocessing.current_process(), "_inheriting", False):
        sys.stderr.write(f"resum: {NESTED_MESSAGE}\n")
        sys.stderr.flush()
        os._exit(NESTED_EXIT)


def _mp_context():
    methods = multiprocessing.get_all_start_methods()
    # forkserver: no fork of a process that may hold threads; workers fork
    # from a small server that has imported resum once
    if "forkserver" in methods:
        ctx = multiprocessing.get_context("forkserver")
        ctx.set_forkserver_preload(["resum.batch.runners"])
        return ctx
    return multiprocessing.get_context("spawn")


def _watch_parent() -> None:
    """End this process when the process that started it ends (even by SIGKILL).

    The parent holds the write end of the pipe behind ``parent_process().sentinel``;
    the system closes it when the parent dies, whatever killed it.
    """
    parent = multiprocessing.parent_process()
    if parent is None:  # pragma: no cover - not started by multiprocessing
        return

    def watch():
        multiprocessing.connection.wait([parent.sentinel])
        os._exit(1)

    threading.Thread(target=watch, name="resum-parent-watch", daemon=True).start()


def _one_process_per_point() -> None:
    """The points fill the cores: no worker processes inside one point's analysis
    (:mod:`resum.parallel`), unless the user asked for them with ``RESUM_JOBS``."""
    os.environ.setdefault("RESUM_JOBS", "1")


def _cluster_point(spec, index: int, runner: str):
    """compute_point on a cluster worker, without worker processes of its own."""
    _one_process_per_point()
    return compute_point(spec, index, runner)


def _point_process(conn, spec, index: int, runner: str) -> None:
    """Body of the process computing one point: send its record back and end."""
    _one_process_per_point()
    # Ctrl-C at a terminal reaches the whole process group: the main process
    # decides (it stops this process); no traceback from here
    signal.signal(signal.SIGINT, signal.SIG_IGN)
    _watch_parent()
    rec = compute_point(spec, index, runner)
    conn.send(rec)
    conn.close()


class ProcessRunner:
    """Points in separate local processes, at most ``jobs`` at a time.

    Each point runs in a process of its own (forked from a server that has
    imported resum, so starting one costs milliseconds), which sends the
    record back through a pipe and ends. A process that ends without sending
    its record (killed, crashed, out of memory) is seen at once as the end
    of its pipe; no shared queue or pool state is left behind by a death.
    A point whose process died while other points ran is computed once more
    alone; one whose process dies while it runs alone is recorded as failed.
    Worker processes end when the main process ends, even when it is killed.
    """

    name = "process"

    def __init__(self, jobs: Optional[int] = None):
        self.jobs = int(jobs) if jobs else default_jobs()
        if self.jobs < 1:
            raise InputError("--jobs must be at least 1")

    def run(self, spec, indices: Sequence[int], on_start: Callable, on_record: Callable) -> None:
        todo = list(indices)
        todo.reverse()                 # pop() from the end keeps the spec's order
        suspects = []                  # died beside others: rerun one at a time
        ctx = _mp_context()
        running = {}                   # reader -> (process, index, ran alone)

        def start(i, alone):
            reader, writer = ctx.Pipe(duplex=False)
            proc = ctx.Process(target=_point_process, args=(writer, spec, i, self.name),
                               name=f"resum-point-{i}")
            try:
                proc.start()
            finally:
                writer.close()         # the child's copy is the only writer left
            running[reader] = (proc, i, alone)
            on_start(i)

        try:
            while todo or suspects or running:
                if suspects:
                    if not running:    # isolate: only once nothing else runs
                        start(suspects.pop(0), True)
                else:
                    while todo and len(running) < self.jobs:
                        start(todo.pop(), False)
                for reader in multiprocessing.connection.wait(list(running)):
                    proc, i, alone = running.pop(reader)
                    try:
                        rec = reader.recv()
                    except (EOFError, OSError):
                        rec = None     # ended without a record
                    reader.close()
                    proc.join()
                    code = proc.exitcode
                    proc.close()
                    if rec is None and code == NESTED_EXIT:
                        # every point would end the same way: stop the run (nothing was computed)
                        raise InputError(NESTED_MESSAGE)
                    if rec is not None:
                        on_record(rec)
                    elif alone:
                        on_record(failure_record(
                            spec, i, "the worker process died while computing this point "
                            f"alone ({_death(code)})", runner=self.name))
                    else:
                        suspects.append(i)
        finally:
            _stop([proc for proc, _, _ in running.values()])
            for reader in running:
                reader.close()


def _death(code) -> str:
    """How a point process that sent no record ended, and the likely causes."""
    if code is not None and code < 0:
        try:
            name = signal.Signals(-code).name
        except ValueError:
            name = f"signal {-code}"
        return f"ended by {name}: killed, crashed or out of memory"
    return (f"exit code {code}: it failed before sending its record, for example while importing "
            "the main script (a script that calls run_family keeps that call under "
            "if __name__ == '__main__':, since each point's process imports the script)")


def _stop(procs, grace: float = 5.0) -> None:
    """Terminate ``procs`` (interrupted run) and wait for them; kill any that linger."""
    for p in procs:
        try:
            p.terminate()
        except Exception:  # pragma: no cover - already gone
            pass
    for p in procs:
        p.join(grace)
        if p.exitcode is None:  # pragma: no cover - ignores SIGTERM
            p.kill()
            p.join()


class DaskRunner:
    name = "dask"

    def __init__(self, address: str):
        self.address = address
        if address.startswith("local:"):
            try:
                self.jobs = int(address.split(":", 1)[1])
            except ValueError:
                raise InputError(f"--cluster {address!r}: use local:N with N a whole number") from None
            if self.jobs < 1:
                raise InputError("--cluster local:N needs N >= 1")
        else:
            self.jobs = 0
        try:
            import distributed  # noqa: F401
        except ImportError:
            raise InputError("--cluster needs dask.distributed; install resum[cluster]") from None

    def _client(self):
        from distributed import Client, LocalCluster
        if self.address.startswith("local:"):
            import dask
            # one point at a time on each worker, and the scheduler gives up on a point at the
            # first death of its worker: run() decides, as ProcessRunner does, whether the point
            # is tried once more alone (dask's own retries would blame the points queued beside
            # a crashing one as well)
            with dask.config.set({"distributed.scheduler.allowed-failures": 0,
                                  "distributed.scheduler.worker-saturation": 1.0}):
                # no dashboard, and the scheduler's own HTTP endpoints (health, metrics) on a free
                # loopback port: by default they take port 8787 and, when another cluster on the
                # machine holds it (a second run, a test suite running beside this one), warn and
                # move; under warnings-as-errors (the test suite) that warning failed the start
                try:
                    cluster = LocalCluster(n_workers=self.jobs, threads_per_worker=1, processes=True,
                                           dashboard_address=None, silence_logs=50,
                                           scheduler_kwargs={"dashboard": False,
                                                             "dashboard_address": "127.0.0.1:0"})
                except RuntimeError as exc:      # "Nanny failed to start"
                    msg = f"{exc}".splitlines()[0]
                    script = getattr(sys.modules.get("__main__"), "__file__", None)
                    hint = (f"; if {script} calls run_family outside 'if __name__ == \"__main__\":', "
                            "put the call under that guard (each worker process imports the script)"
                            if script else "")
                    raise InputError(f"could not start the local dask cluster ({msg}){hint}") from None
            return Client(cluster), cluster
        try:
            return Client(self.address, timeout="10s"), None
        except Exception as exc:   # OSError, TimeoutError, ValueError for a malformed address
            msg = f"{type(exc).__name__}: {exc}".splitlines()[0]
            raise InputError(f"cannot reach the dask scheduler at {self.address} ({msg}); start "
                             "it with 'dask scheduler' or use --cluster local:N") from None

    def prepare(self) -> None:
        """Connect (or start the local cluster) before any file is written, so
        that an unreachable scheduler is an input error with nothing left behind."""
        if getattr(self, "_conn", None) is None:
            self._conn = self._client()

    def close(self) -> None:
        """Disconnect (and stop a local cluster) if :meth:`prepare` connected and
        :meth:`run` was not called."""
        conn, self._conn = getattr(self, "_conn", None), None
        if conn is not None:
            client, cluster = conn
            client.close()
            if cluster is not None:
                cluster.close()

    def run(self, spec, indices: Sequence[int], on_start: Callable, on_record: Callable) -> None:
        from distributed import as_completed
        from distributed.scheduler import KilledWorker
        self.prepare()
        client, cluster = self._conn
        self._conn = None
        try:
            remote = not self.address.startswith("local:")
            pending = list(indices)
            pending.reverse()          # pop() from the end keeps the spec's order
            suspects = []              # their worker died beside others: rerun one at a time
            futs = {}                  # future -> (index, ran alone)
            done = as_completed()
            tries = [0]

            def submit(i, alone):
                # the spec goes with every task (no scattered copy: losing the worker that held
                # it lost every point); a fresh key per try, as a key that erred stays erred
                tries[0] += 1
                f = client.submit(_cluster_point, spec, i, self.name, pure=False,
                                  key=f"resum-{spec.name}-{i}-{os.getpid()}-{id(self)}-{tries[0]}")
                futs[f] = (i, alone)
                done.add(f)
                on_start(i)

            def fill():
                if suspects:
                    if not futs:       # isolate: only once nothing else runs
                        submit(suspects.pop(0), True)
                    return
                # at most one point per worker thread in flight, so that "running" in the
                # progress line is exact and an interrupt abandons only what really runs;
                # a remote cluster's threads are counted again as workers come and go
                limit = self.jobs if not remote else _threads(client)
                while pending and len(futs) < max(1, limit):
                    submit(pending.pop(), False)

            fill()
            for fut in done:
                i, alone = futs.pop(fut)
                try:
                    rec = fut.result()
                except KilledWorker:
                    if not alone:
                        suspects.append(i)
                        fill()
                        continue
                    rec = failure_record(spec, i, "the worker process died while computing this "
                                         "point alone (killed, crashed or out of memory)",
                                         runner=self.name)
                except Exception as exc:   # lost connection, cancelled
                    rec = failure_record(spec, i, f"dask gave up on this point: "
                                         f"{type(exc).__name__}: {exc}".splitlines()[0],
                                         kind=type(exc).__name__, runner=self.name)
                on_record(rec)
                fill()
        finally:
            try:
                client.close()
            finally:
                if cluster is not None:
                    cluster.close()


def _threads(client) -> int:
    """Worker threads of a dask cluster (0 while no worker has joined)."""
    try:
        workers = client.scheduler_info().get("workers", {})
    except Exception:  # pragma: no cover - scheduler gone; the next result says why
        return 1
    return sum(int(w.get("nthreads", 1)) for w in workers.values())


def make_runner(jobs: Optional[int] = None, cluster: Optional[str] = None, serial: bool = False):
    """The runner for the command-line options (``--jobs``, ``--cluster``)."""
    if cluster:
        return DaskRunner(cluster)
    if serial or jobs == 1:
        return SerialRunner()
    return ProcessRunner(jobs)
