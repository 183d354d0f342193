"""The progress line: counts, time left, quiet modes (common practice, no source)."""
import io

from resum.batch.progress import Progress


class _Tty(io.StringIO):
    def isatty(self):
        return True


def test_log_lines_when_not_a_terminal():
    s = io.StringIO()
    p = Progress(4, label="fam", stream=s, log_every=0, skipped=1)
    p.started(2)
    p.finished(True, running=1)
    p.finished(False, running=0)
    p.close()
    lines = s.getvalue().splitlines()
    assert lines[-1].startswith("fam [")
    assert "3/4 done, 1 failed, 0 running" in lines[-1]
    assert "left" in lines[-2]          # one point to go, time per point known
    assert all("\r" not in ln for ln in lines)


def test_quiet_and_rate_limited():
    s = io.StringIO()
    p = Progress(3, stream=s, quiet=True, log_every=0)
    p.started()
    p.finished(True)
    p.close("done")
    assert s.getvalue() == ""
    s = io.StringIO()
    p = Progress(3, stream=s, log_every=3600)
    for _ in range(3):
        p.finished(True)
    p.close()
    assert len(s.getvalue().splitlines()) == 1     # only the closing line


def test_terminal_redraws_in_place():
    s = _Tty()
    p = Progress(2, stream=s, refresh=0)      # no timer thread: only the draws of the calls below
    p.started()
    p.finished(True, running=0)
    p.close()
    out = s.getvalue()
    assert out.count("\r") >= 3 and out.endswith("\n")
    assert "2/2 done" not in out.split("\r")[1]


def _wait_for(cond, timeout=120.0):
    """Poll ``cond`` until it holds; the timeout only bounds a broken test (a loaded machine
    merely gets there later)."""
    import time
    end = time.monotonic() + timeout
    while time.monotonic() < end and not cond():
        time.sleep(0.01)
    return cond()


def _tickers(threads=None):
    """This module's redraw threads among ``threads`` (default: all alive). Counting every thread
    of the process instead (threading.active_count()) also counts threads of other tests (dask's,
    a pool's) that start or end meanwhile."""
    import threading
    return {t for t in (threading.enumerate() if threads is None else threads)
            if t.name == "resum-progress"}


def test_terminal_line_is_redrawn_while_points_run():
    # the elapsed time moves on a terminal between a point's start and its end
    s = _Tty()
    p = Progress(3, stream=s, refresh=0.05)
    p.started()
    n0 = s.getvalue().count("\r")
    assert _wait_for(lambda: s.getvalue().count("\r") >= n0 + 3)
    ticker = p._ticker
    assert ticker in _tickers()
    p.close()
    assert not ticker.is_alive()           # close() joined it: nothing can draw after the end
    done = s.getvalue()
    assert done.endswith("\n") and done.count("\n") == 1


def test_no_redraw_thread_off_a_terminal_or_when_quiet():
    import time
    before = _tickers()
    for p in (Progress(3, stream=io.StringIO(), refresh=0.01, log_every=3600),
              Progress(3, stream=_Tty(), refresh=0.01, quiet=True)):
        p.started()
        assert p._ticker is None and _tickers() <= before
        time.sleep(0.05)    # would be five redraws of a ticker, if one had been started
        assert p.stream.getvalue().count("\n") == 0 and "\r" not in p.stream.getvalue()
        p.close()


def test_interrupted_points_are_counted_as_stopped():
    s = io.StringIO()
    p = Progress(5, stream=s, log_every=3600)
    p.started(3)
    p.finished(True, running=2)
    p.close("interrupted", stopped=True)
    last = s.getvalue().splitlines()[-2]
    assert "1/5 done, 0 failed, 2 stopped" in last and "running" not in last, last


def test_run_family_interrupted_says_stopped(tmp_path):
    from resum.batch import parse_spec, run_family
    from tests.batch.test_runs import spec_text

    class Interrupted:
        name = "fake"
        jobs = 3

        def run(self, spec, indices, on_start, on_record):
            from resum.batch.worker import compute_point
            for i in indices[:3]:
                on_start(i)
            on_record(compute_point(spec, indices[0], self.name))
            raise KeyboardInterrupt

    s = io.StringIO()
    spec = parse_spec(spec_text([1, 2]), path="spec.toml")
    out = run_family(spec, tmp_path / "o", runner=Interrupted(), stream=s, plots=False)
    assert out.interrupted
    lines = s.getvalue().splitlines()
    assert "1/4 done, 0 failed, 2 stopped" in lines[-2] and "running" not in lines[-2], lines
    assert lines[-1].startswith("interrupted")
