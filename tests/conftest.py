import os

os.environ.setdefault("MPLBACKEND", "Agg")

import faulthandler

import pytest


@pytest.fixture(autouse=True)
def _hang_guard():
    """A test that hangs (for example a process pool waiting on a dead worker) dumps every
    thread's stack and ends the run after 5 minutes instead of blocking CI."""
    faulthandler.dump_traceback_later(300, exit=True)
    yield
    faulthandler.cancel_dump_traceback_later()


_EXIT_GRACE = 60.0


def pytest_sessionfinish(session, exitstatus):
    # Leftover process-pool threads can block interpreter shutdown after every test has
    # passed (seen once in six full runs on Python 3.11, not reproduced on its own). If
    # exiting takes longer than a minute, dump every thread's stack to stderr, so the cause
    # can be found, and leave with the session's own status instead of blocking CI.
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
