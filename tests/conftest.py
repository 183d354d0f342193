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
