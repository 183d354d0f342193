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
    p = Progress(2, stream=s)
    p.started()
    p.finished(True, running=0)
    p.close()
    out = s.getvalue()
    assert out.count("\r") >= 3 and out.endswith("\n")
    assert "2/2 done" not in out.split("\r")[1]
