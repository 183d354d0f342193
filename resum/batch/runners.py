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
* :class:`ProcessRunner` -- a local pool of ``jobs`` processes (default: all
  cores). At most ``jobs`` points are in flight, so "running" is exact. When
  a worker process dies (killed, out of memory) the pool is rebuilt and the
  points that were in flight are tried once more; a point that was in
  flight at two deaths is recorded as failed.
* :class:`DaskRunner` -- a dask.distributed cluster: ``address`` joins a
  running scheduler (``tcp://host:8786``); ``local:N`` starts a LocalCluster
  with N single-threaded worker processes for the span of the run. Dask
  retries tasks of dead workers itself; a point it gives up on is recorded
  as failed.
"""
from __future__ import annotations

import concurrent.futures as cf
import multiprocessing
import os
from typing import Callable, Optional, Sequence

from ..errors import InputError
from .worker import compute_point, failure_record

__all__ = ["SerialRunner", "ProcessRunner", "DaskRunner", "make_runner", "default_jobs"]


def default_jobs() -> int:
    try:
        return max(1, len(os.sched_getaffinity(0)))
    except (AttributeError, OSError):  # pragma: no cover - not Linux
        return max(1, os.cpu_count() or 1)


class SerialRunner:
    name = "serial"
    jobs = 1

    def run(self, spec, indices: Sequence[int], on_start: Callable, on_record: Callable) -> None:
        for i in indices:
            on_start(i)
            on_record(compute_point(spec, i, self.name))


def _mp_context():
    methods = multiprocessing.get_all_start_methods()
    # forkserver: no fork of a process that may hold threads; workers fork
    # from a small server that has imported resum once
    if "forkserver" in methods:
        ctx = multiprocessing.get_context("forkserver")
        ctx.set_forkserver_preload(["resum.batch.worker"])
        return ctx
    return multiprocessing.get_context("spawn")


class ProcessRunner:
    name = "process"

    def __init__(self, jobs: Optional[int] = None):
        self.jobs = int(jobs) if jobs else default_jobs()
        if self.jobs < 1:
            raise InputError("--jobs must be at least 1")

    def run(self, spec, indices: Sequence[int], on_start: Callable, on_record: Callable) -> None:
        todo = list(indices)
        todo.reverse()                 # pop() from the end keeps the spec's order
        suspects = []                  # in flight when a worker died: rerun one at a time
        ctx = _mp_context()

        def lost(i, alone):
            # a worker died: a point that ran alone is to blame and is recorded as
            # failed; one that ran beside others is rerun alone later
            if alone:
                on_record(failure_record(
                    spec, i, "the worker process died while computing this point alone "
                    "(killed, crashed or out of memory)", runner=self.name))
            else:
                suspects.append(i)

        while todo or suspects:
            pool = cf.ProcessPoolExecutor(max_workers=self.jobs, mp_context=ctx)
            inflight = {}              # future -> (index, ran alone)
            broken = False
            try:
                while (todo or suspects or inflight) and not broken:
                    try:
                        if suspects:
                            # isolate: only once nothing else runs, one suspect at a time
                            if not inflight:
                                i = suspects[0]
                                fut = pool.submit(compute_point, spec, i, self.name)
                                suspects.pop(0)
                                inflight[fut] = (i, True)
                                on_start(i)
                        else:
                            while todo and len(inflight) < self.jobs:
                                fut = pool.submit(compute_point, spec, todo[-1], self.name)
                                i = todo.pop()
                                inflight[fut] = (i, False)
                                on_start(i)
                    except (cf.process.BrokenProcessPool, OSError, RuntimeError):
                        # the pool broke (or is being torn down after a worker died)
                        broken = True      # the point stays queued; in-flight ones fail below
                    if not inflight:
                        continue
                    done, _ = cf.wait(list(inflight), timeout=0.5, return_when=cf.FIRST_COMPLETED)
                    if not done and _dead_worker(pool):
                        # a worker died but the pool has not noticed (seen as a rare
                        # hang on Python 3.11): treat the pool as broken ourselves
                        broken = True
                        for fut, (i, alone) in list(inflight.items()):
                            del inflight[fut]
                            lost(i, alone)
                        _terminate(pool)
                        continue
                    for fut in done:
                        i, alone = inflight.pop(fut)
                        try:
                            rec = fut.result()
                        except cf.process.BrokenProcessPool:
                            broken = True
                            lost(i, alone)
                            continue
                        on_record(rec)
                # a broken pool fails every future still in flight: those are suspects too
                for fut, (i, alone) in inflight.items():
                    suspects.append(i)
            except BaseException:
                pool.shutdown(wait=False, cancel_futures=True)
                _terminate(pool)
                raise
            else:
                pool.shutdown(wait=not broken, cancel_futures=True)


def _dead_worker(pool) -> bool:
    """True if a worker process of ``pool`` has ended (the pool's workers only
    end on shutdown, so an exit code while we wait means it died)."""
    procs = getattr(pool, "_processes", None) or {}
    return any(p.exitcode is not None for p in list(procs.values()))


def _terminate(pool) -> None:
    """Stop a pool's worker processes now (after Ctrl-C)."""
    procs = getattr(pool, "_processes", None) or {}
    for p in list(procs.values()):
        try:
            p.terminate()
        except Exception:  # pragma: no cover - already gone
            pass


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
            cluster = LocalCluster(n_workers=self.jobs, threads_per_worker=1, processes=True,
                                   dashboard_address=None, silence_logs=40)
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
        self.prepare()
        client, cluster = self._conn
        self._conn = None
        try:
            if not self.jobs:
                self.jobs = max(1, sum(w.get("nthreads", 1) for w in
                                       client.scheduler_info().get("workers", {}).values()))
            spec_f = client.scatter(spec, broadcast=True)
            futs = {}
            for i in indices:
                f = client.submit(compute_point, spec_f, i, self.name, pure=False,
                                  key=f"resum-{spec.name}-{i}-{os.getpid()}-{id(self)}")
                futs[f] = i
                on_start(i)
            for fut in as_completed(list(futs)):
                i = futs[fut]
                try:
                    rec = fut.result()
                except Exception as exc:   # KilledWorker, lost connection
                    rec = failure_record(spec, i, f"dask gave up on this point: "
                                         f"{type(exc).__name__}: {exc}".splitlines()[0],
                                         kind=type(exc).__name__, runner=self.name)
                on_record(rec)
        finally:
            try:
                client.close()
            finally:
                if cluster is not None:
                    cluster.close()


def make_runner(jobs: Optional[int] = None, cluster: Optional[str] = None, serial: bool = False):
    """The runner for the command-line options (``--jobs``, ``--cluster``)."""
    if cluster:
        return DaskRunner(cluster)
    if serial or jobs == 1:
        return SerialRunner()
    return ProcessRunner(jobs)
