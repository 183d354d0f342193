"""Worker processes for the independent parts of one analysis.

An analysis runs several estimators on the same series (ratio, Padé, Dlog-Padé,
differential approximants of order 1 and 2, ...), then reruns those that made the
verdict with fewer terms and with more digits. The estimators do not depend on
each other, so on a machine with several cores they can run side by side: on the
200-loop series of the angle-deformed kernel family at 120 digits the two orders of
differential approximants and the Dlog-Padé table take 6-9 s each.

How many processes: :func:`jobs_for` -- the environment variable ``RESUM_JOBS``
if set (``1`` turns this off); otherwise, in the ``resum`` command (which calls
:func:`allow_auto`), the cores this process may use, at most :data:`MAX_JOBS`, and
1 for short series, where starting processes costs more than it saves. From Python
the default is one process: worker processes re-import the caller's main module,
which a script without an ``if __name__ == "__main__":`` guard does not survive;
scripts with the guard may call :func:`allow_auto` or set ``RESUM_JOBS``. The
family runners set ``RESUM_JOBS=1`` in their point processes (the points already
fill the cores).

The processes fork from a server process that has imported resum once (the
``forkserver`` start method: no fork of a process that may hold threads), so after
the first call starting them costs milliseconds. Each task runs at the mpmath and
FLINT precisions of the caller. Results are the same as in one process (the same
computations); anything that goes wrong with the processes themselves (a worker
killed, an object that cannot be sent) makes the caller fall back to running the
tasks one after the other. Ctrl-C belongs to the caller: the fork server and its workers
ignore it, and the caller ends the workers and waits for them before its
KeyboardInterrupt goes on.
"""
from __future__ import annotations

import multiprocessing
import os
import pickle
import signal
import threading
from concurrent.futures import ProcessPoolExecutor
from contextlib import contextmanager
from typing import Callable, Optional, Sequence

import flint
import mpmath

__all__ = ["allow_auto", "cores", "env_jobs", "jobs_for", "run_tasks", "ENV", "MAX_JOBS", "PARALLEL_FROM_TERMS"]

#: environment variable: number of worker processes for one analysis (1: none)
ENV = "RESUM_JOBS"
#: at most this many processes by default (there are rarely more heavy estimators)
MAX_JOBS = 4
#: series shorter than this run in one process (their estimators take well under a second)
PARALLEL_FROM_TERMS = 100


def cores() -> int:
    """Cores this process may use."""
    try:
        return max(1, len(os.sched_getaffinity(0)))
    except (AttributeError, OSError):  # pragma: no cover - not Linux
        return max(1, os.cpu_count() or 1)


_AUTO = False


def allow_auto(flag: bool = True) -> None:
    """Let long analyses use worker processes without ``RESUM_JOBS`` being set (the
    command line does this; a script may, under an ``if __name__ == "__main__":`` guard)."""
    global _AUTO
    _AUTO = bool(flag)


def env_jobs() -> Optional[int]:
    """The process count ``RESUM_JOBS`` asks for, or None when it is unset or empty; an
    InputError naming the variable when it is not a whole number 1 or more (callers that
    start long work check this first, so a bad value stops them before any point runs)."""
    env = os.environ.get(ENV)
    if env is None or not env.strip():
        return None
    try:
        jobs = int(env)
    except ValueError:
        jobs = 0
    if jobs < 1:
        from .errors import InputError
        raise InputError(f"must be a whole number of processes, 1 or more (1: none), got {env!r}",
                         where=f"environment variable {ENV}")
    return jobs


def jobs_for(n_terms: int, n_tasks: int) -> int:
    """Worker processes for ``n_tasks`` independent tasks on a series of ``n_terms`` terms."""
    jobs = env_jobs()
    if jobs is None:
        if not _AUTO or n_terms < PARALLEL_FROM_TERMS:
            return 1
        jobs = min(cores(), MAX_JOBS)
    return max(1, min(jobs, n_tasks))


_CONTEXT = None


def _mp_context():
    global _CONTEXT
    if _CONTEXT is None:
        methods = multiprocessing.get_all_start_methods()
        if "forkserver" in methods:
            ctx = multiprocessing.get_context("forkserver")
            ctx.set_forkserver_preload(["resum.analysis"])
        else:  # pragma: no cover - not Linux
            ctx = multiprocessing.get_context("spawn")
        _CONTEXT = ctx
    return _CONTEXT


@contextmanager
def _sigint_ignored():
    """Ctrl-C (SIGINT) ignored for the span, in the main thread (elsewhere Python cannot set
    signal handlers, and nothing is changed)."""
    if threading.current_thread() is not threading.main_thread():
        yield
        return
    old = signal.signal(signal.SIGINT, signal.SIG_IGN)
    try:
        yield
    finally:
        signal.signal(signal.SIGINT, signal.SIG_DFL if old is None else old)


@contextmanager
def _sigint_deferred():
    """Ctrl-C held back for the span and raised (KeyboardInterrupt) at its end, in the main
    thread: a worker whose start is cut short would still be forked, after its pool is gone."""
    if threading.current_thread() is not threading.main_thread():
        yield
        return
    got = []
    if signal.getsignal(signal.SIGINT) is signal.SIG_IGN:      # ignored already: left so
        yield
        return
    old = signal.signal(signal.SIGINT, lambda signum, frame: got.append(signum))
    try:
        yield
    finally:
        signal.signal(signal.SIGINT, signal.SIG_DFL if old is None else old)
    if got:
        raise KeyboardInterrupt


@contextmanager
def _sigint_blocked():
    """Ctrl-C (SIGINT) blocked for the span, in the main thread: one that comes meanwhile stays
    pending and is delivered (KeyboardInterrupt) when the span ends. Processes started in the
    span inherit the blocked signal across fork and exec."""
    if threading.current_thread() is not threading.main_thread() or \
            not hasattr(signal, "pthread_sigmask"):        # pragma: no cover - not POSIX
        yield
        return
    signal.pthread_sigmask(signal.SIG_BLOCK, {signal.SIGINT})
    try:
        yield
    finally:
        signal.pthread_sigmask(signal.SIG_UNBLOCK, {signal.SIGINT})


def _start_server() -> None:
    """Start the fork server (and multiprocessing's resource tracker) with Ctrl-C blocked.

    A terminal sends Ctrl-C to every process of the foreground group: the caller decides what
    it means. A blocked signal stays blocked across fork and exec, so the server never sees one
    while it imports resum (it would print a traceback); once running it ignores Ctrl-C (which
    also drops one still pending), and the workers it forks inherit the block and ignore it too
    (:func:`_quiet_worker`). In the caller the signal is only blocked, in the main thread: one
    that comes in the span is delivered when it ends (or at once to another thread's handler),
    not lost, as it was when the span ignored it (a test that interrupts the run as the server
    appears failed once on a loaded machine). The resource tracker is started first, on its
    own: its start unblocks the signal when done.
    """
    if _mp_context().get_start_method() != "forkserver":   # pragma: no cover - not Linux
        return
    from multiprocessing import forkserver, resource_tracker
    resource_tracker.ensure_running()
    with _sigint_blocked():
        forkserver.ensure_running()


def _quiet_worker():
    """Workers leave Ctrl-C to the caller, which stops them (no traceback from each)."""
    signal.signal(signal.SIGINT, signal.SIG_IGN)


def _stop(pool) -> None:
    """End a pool's workers now (their tasks are abandoned) and wait until they are gone."""
    # ProcessPoolExecutor keeps its worker processes in _processes; terminating them is the
    # only way to abandon running tasks (shutdown waits for them)
    procs = list((getattr(pool, "_processes", None) or {}).values())
    for proc in procs:
        try:
            proc.terminate()
        except (OSError, AttributeError):  # pragma: no cover - already gone
            pass
    pool.shutdown(wait=True, cancel_futures=True)
    for proc in procs:
        try:
            proc.join(5)
        except (OSError, AttributeError, ValueError):  # pragma: no cover - already reaped
            pass


class _Unsendable(Exception):
    """A task's result could not be pickled (the caller then runs the tasks itself)."""


def _call(fn, args, mp_prec, flint_prec):
    """``fn(*args)`` pickled, at the caller's precisions (in a worker process, which starts
    no worker processes of its own)."""
    os.environ[ENV] = "1"
    mpmath.mp.prec = mp_prec
    flint.ctx.prec = flint_prec
    out = fn(*args)
    try:
        return pickle.dumps(out)
    except Exception as exc:                     # noqa: BLE001 - any object pickle refuses
        raise _Unsendable(f"{type(exc).__name__}: {exc}") from None


def run_tasks(fn: Callable, arg_lists: Sequence[tuple], jobs: int) -> Optional[list]:
    """``[fn(*args) for args in arg_lists]`` in ``jobs`` worker processes, in order.

    ``fn`` must be a module-level function and its arguments and results picklable.
    Returns None when the processes could not be used (the caller then runs the
    tasks itself); an exception raised by ``fn`` itself propagates as it would in
    one process."""
    from concurrent.futures.process import BrokenProcessPool
    if jobs < 2 or len(arg_lists) < 2:
        return None
    try:
        pickle.dumps((fn, list(arg_lists)))      # what cannot be sent is found before any work
    except Exception:                            # noqa: BLE001 - any object pickle refuses
        return None
    try:
        _start_server()
        pool = ProcessPoolExecutor(max_workers=jobs, mp_context=_mp_context(), initializer=_quiet_worker)
    except (OSError, ValueError):
        return None
    try:
        with _sigint_deferred():   # submit starts the workers
            futs = [pool.submit(_call, fn, args, mpmath.mp.prec, flint.ctx.prec) for args in arg_lists]
        return [pickle.loads(f.result()) for f in futs]
    except (BrokenProcessPool, pickle.PicklingError, OSError, _Unsendable):
        _stop(pool)
        return None
    except BaseException:          # Ctrl-C, or an exception of fn itself: stop the others first
        with _sigint_ignored():    # (a second Ctrl-C must not cut that short: leaked processes)
            _stop(pool)
        raise
    finally:
        pool.shutdown(wait=True, cancel_futures=True)
