"""Worker processes for one analysis (resum.parallel): same results as one process.

Reference: the same analysis run in one process (RESUM_JOBS=1); the series is
log(1+x)/x, whose radius 1 is known in closed form (common practice, no source).
"""
import os
import signal
import time

import mpmath
import pytest

from resum import parallel
from resum.analysis import analyze
from resum.context import Context
from resum.errors import InputError
from resum.series import Series
from fractions import Fraction


def _square(x, y):
    return x * x + y


def _ball(x):
    import flint
    return flint.arb(x)          # FLINT balls do not pickle


def test_jobs_for_reads_the_environment(monkeypatch):
    monkeypatch.setenv(parallel.ENV, "3")
    assert parallel.jobs_for(10, 8) == 3          # asked for: even a short series
    assert parallel.jobs_for(500, 2) == 2         # never more than the tasks
    monkeypatch.setenv(parallel.ENV, "1")
    assert parallel.jobs_for(500, 8) == 1
    for bad in ("many", "0", "-2"):
        monkeypatch.setenv(parallel.ENV, bad)
        with pytest.raises(InputError, match="RESUM_JOBS"):
            parallel.jobs_for(500, 8)
    monkeypatch.delenv(parallel.ENV)
    parallel.allow_auto(False)
    assert parallel.jobs_for(500, 8) == 1         # from Python: one process unless allowed


def test_run_tasks_in_order_and_refuses_what_cannot_be_sent():
    assert parallel.run_tasks(_square, [(k, 1) for k in range(6)], 2) == [k * k + 1 for k in range(6)]
    assert parallel.run_tasks(lambda x: x, [(1,), (2,)], 2) is None     # a lambda is not picklable
    assert parallel.run_tasks(_square, [(2, 1)], 2) is None              # one task: nothing to share
    assert parallel.run_tasks(_ball, [(1,), (2,)], 2) is None            # a result that cannot come back


@pytest.mark.parametrize("methods", [["ratio", "pade", "dlog"]])
def test_analysis_same_in_worker_processes(monkeypatch, methods):
    s = Series([Fraction((-1) ** k, k + 1) for k in range(110)])           # log(1+x)/x
    ctx = Context(dps=40)
    monkeypatch.setenv(parallel.ENV, "1")
    one = analyze(s, ctx, methods=methods, verify=True)
    monkeypatch.setenv(parallel.ENV, "2")
    used = []
    real = parallel.run_tasks

    def spy(fn, args, jobs):
        out = real(fn, args, jobs)
        used.append(out is not None)
        return out
    monkeypatch.setattr(parallel, "run_tasks", spy)
    two = analyze(s, ctx, methods=methods, verify=True)
    assert used and all(used)                    # the worker processes did run
    assert one.radius.contains(1) and two.radius.contains(1)
    with mpmath.workdps(40):
        assert (one.radius.value, one.radius.lower, one.radius.upper) == \
            (two.radius.value, two.radius.lower, two.radius.upper)
    assert [s.location for s in one.singularities] == [s.location for s in two.singularities]


def test_progress_messages_name_each_stage():
    # the stages an analysis and an evaluation report (the command line prints them on a terminal)
    from resum.resummation import evaluate
    s = Series([Fraction((-1) ** k, k + 1) for k in range(30)])           # log(1+x)/x
    seen = []
    analyze(s, Context(dps=30), methods=["ratio", "pade"], verify=True, progress=seen.append)
    assert seen[0].startswith("main run: 2 estimators on 30 terms") and seen[1].startswith("main run done")
    assert any(m.startswith("verification, fewer terms done") for m in seen)
    seen.clear()
    r = evaluate(s, ["2"], Context(dps=20), progress=seen.append)
    assert seen[0].startswith("choosing the method") and seen[-1].endswith(" s)")
    with mpmath.workdps(30):
        assert r.points[0].value.contains(mpmath.log(3) / 2)


@pytest.mark.skipif(not hasattr(signal, "pthread_sigmask") or
                    parallel._mp_context().get_start_method() != "forkserver",
                    reason="needs POSIX signal masks and the forkserver start method")
def test_ctrl_c_while_the_server_starts_is_not_lost(monkeypatch):
    # A Ctrl-C that reaches the caller while it starts the fork server (the server must not
    # see it) is delivered when the start is done: the run stops as the user asked. It used
    # to be ignored for that span, i.e. lost (common practice, no source: a process-directed
    # signal that finds SIGINT blocked stays pending until it is unblocked, POSIX sigprocmask).
    from multiprocessing import forkserver
    start = forkserver.ensure_running

    def start_and_press():
        os.kill(os.getpid(), signal.SIGINT)
        start()

    monkeypatch.setattr(forkserver, "ensure_running", start_and_press)
    with pytest.raises(KeyboardInterrupt):
        parallel._start_server()
        # the kernel may hand the signal to another thread (a numerical library's pool, with
        # SIGINT unblocked), whose handler runs when it is next scheduled: wait up to 2 s
        for _ in range(100):
            time.sleep(0.02)
    assert signal.getsignal(signal.SIGINT) is signal.default_int_handler
    assert signal.SIGINT not in signal.pthread_sigmask(signal.SIG_BLOCK, set())
