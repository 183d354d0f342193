"""Ctrl-C during a run with worker processes: one line, exit code 130, nothing left behind.

A terminal sends Ctrl-C (SIGINT) to every process of its foreground group; the test does the
same to the group of a `resum analyze` run whose estimators run in worker processes
(RESUM_JOBS=2). Exit code 128 + 2 for a program ended by SIGINT: common practice, no source.
"""
import json
import os
import signal
import subprocess
import sys
import time
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[2]

pytestmark = pytest.mark.skipif(not Path("/proc/self/stat").exists() or not hasattr(os, "killpg"),
                                reason="needs Linux process groups and /proc")


def _group(pgid):
    """(pid, command line) of the live processes in process group ``pgid``."""
    out = []
    for d in Path("/proc").iterdir():
        if not d.name.isdigit():
            continue
        try:
            stat = (d / "stat").read_text()
            fields = stat[stat.rindex(")") + 2:].split()
            if int(fields[2]) != pgid or fields[0] == "Z":
                continue
            out.append((int(d.name), (d / "cmdline").read_bytes().replace(b"\0", b" ").decode()))
        except (OSError, ValueError, IndexError):
            continue
    return out


def _wait_for(cond, timeout):
    end = time.monotonic() + timeout
    while time.monotonic() < end:
        if cond():
            return True
        time.sleep(0.02)
    return False


# when the Ctrl-C comes: as soon as the fork server exists (it is still importing resum),
# or once it has forked the two workers (they are running estimators); and a second one
# while the first is being handled (an impatient user; `timeout -s INT` sends two as well)
@pytest.mark.parametrize("servers, presses", [(1, 1), (3, 1), (3, 2)],
                         ids=["server-starting", "workers-running", "twice"])
def test_ctrl_c_with_worker_processes(tmp_path, servers, presses):
    f = tmp_path / "log.json"       # log(1+x)/x = sum (-1)^k x^k/(k+1) (common practice, no source)
    # 200 terms: long enough (~10 s) that a loaded machine cannot finish the analysis between
    # seeing the workers and the Ctrl-C (with 60 terms it once did)
    f.write_text(json.dumps({"coefficients": [f"{(-1) ** k}/{k + 1}" for k in range(200)]}))
    env = {**os.environ, "RESUM_JOBS": "2", "PYTHONPATH": str(ROOT)}
    env.pop("PYTHONWARNINGS", None)
    proc = subprocess.Popen([sys.executable, "-m", "resum", "analyze", str(f)], cwd=tmp_path, env=env,
                            stdout=subprocess.PIPE, stderr=subprocess.PIPE, start_new_session=True)
    try:
        forks = lambda: sum("forkserver" in cmd for _, cmd in _group(proc.pid))      # noqa: E731
        assert _wait_for(lambda: forks() >= servers or proc.poll() is not None, 30)
        assert proc.poll() is None, "the run ended before Ctrl-C"
        for k in range(presses):
            time.sleep(0.05 * k)
            os.killpg(proc.pid, signal.SIGINT)
        out, err = proc.communicate(timeout=30)
    finally:
        if proc.poll() is None:
            os.killpg(proc.pid, signal.SIGKILL)
            proc.communicate()
    err = err.decode()
    assert proc.returncode == 130, err
    lines = [ln for ln in err.splitlines() if not ln.startswith("resum: analyzing")]
    assert lines == ["resum: interrupted"], err
    # the fork server and multiprocessing's resource tracker go when the run has gone
    assert _wait_for(lambda: not _group(proc.pid), 10), _group(proc.pid)
