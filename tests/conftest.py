import os

os.environ.setdefault("MPLBACKEND", "Agg")

import faulthandler
import signal

import pytest

# A run started in the background by a shell without job control (`cmd &`) inherits SIGINT
# ignored, and Python then installs no KeyboardInterrupt handler, in this process or in the
# `resum` processes the tests start: the tests of Ctrl-C (tests/cli/test_interrupt.py,
# tests/test_parallel.py) would see no Ctrl-C at all. They test what a terminal delivers, so
# the run gets the handler an interactive Python has.
if signal.getsignal(signal.SIGINT) == signal.SIG_IGN:
    signal.signal(signal.SIGINT, signal.default_int_handler)


@pytest.fixture(autouse=True)
def _hang_guard():
    """A test that hangs dumps every thread's stack and ends the run after 5 minutes instead
    of blocking CI."""
    faulthandler.dump_traceback_later(300, exit=True)
    yield
    faulthandler.cancel_dump_traceback_later()


_EXIT_GRACE = 60.0


def pytest_sessionfinish(session, exitstatus):
    # Safety net. Interpreter shutdown once hung after every test had passed: with the
    # ProcessPoolExecutor the family runner used then, a worker's death raced the pool's
    # teardown, an idle worker started meanwhile was never stopped and the pool's manager
    # thread blocked exit joining it. The runner now starts one process per point and sees a
    # death as the end of that process's pipe (resum/batch/runners.py, ProcessRunner), so
    # no pool thread is left to wait on. Should anything else ever block exit for more than
    # a minute, dump every thread's stack to stderr, so the cause can be found, and leave
    # with the session's own status instead of blocking CI.
    import threading

    def _leave():
        import sys
        sys.stderr.write(f"\ninterpreter shutdown still blocked after {_EXIT_GRACE:.0f} s; "
                         "thread stacks follow\n")
        faulthandler.dump_traceback(all_threads=True)
        os._exit(int(exitstatus))

    t = threading.Timer(_EXIT_GRACE, _leave)
    t.daemon = True
    t.start()
