"""Progress display for family runs (stderr only).

On a terminal a one-line bar is redrawn in place::

    bes-angles [##########..........]  12/25 done, 1 failed, 2 running  0:41 elapsed, ~0:44 left

On a terminal the line is also redrawn every ``refresh`` seconds (default
1) by a small timer thread, so the elapsed time moves during long points;
the thread ends with :meth:`Progress.close`. When stderr is not a terminal
(logs, CI) at most one plain line is written every ``log_every`` seconds
and one at the end, and no thread is started. ``quiet=True`` (``--json``)
writes nothing at all. After an interrupt (``close(stopped=True)``) the last
line counts the points that were running as stopped.
"""
from __future__ import annotations

import sys
import threading
import time

__all__ = ["Progress"]


def is_tty(stream) -> bool:
    """Whether ``stream`` is a terminal (False for anything that cannot say)."""
    try:
        return bool(stream.isatty())
    except (AttributeError, ValueError):
        return False


def _clock(seconds: float) -> str:
    seconds = int(round(max(0.0, seconds)))
    h, rest = divmod(seconds, 3600)
    m, s = divmod(rest, 60)
    return f"{h}:{m:02d}:{s:02d}" if h else f"{m}:{s:02d}"


class Progress:
    """Counts of done, failed and running points, with elapsed and remaining time.

    The estimate of the time left is the mean seconds per point finished in
    this run times the points left, divided by the number running at once;
    points skipped because an earlier run finished them do not count.
    """

    def __init__(self, total: int, label: str = "", stream=None, quiet: bool = False,
                 width: int = 24, log_every: float = 30.0, skipped: int = 0,
                 refresh: float = 1.0):
        self.total = total
        self.label = label
        self.stream = sys.stderr if stream is None else stream
        self.quiet = quiet
        self.width = width
        self.log_every = log_every
        self.done = skipped
        self.failed = 0
        self.running = 0
        self.skipped = skipped
        self.start = time.monotonic()
        self._last_log = self.start
        self._finished_here = 0
        self.stopped = 0
        self.closed = False
        self.tty = is_tty(self.stream)
        self._lock = threading.Lock()
        self._halt = threading.Event()
        self._ticker = None
        if self.tty and not quiet and refresh and refresh > 0:
            self._ticker = threading.Thread(target=self._tick, args=(float(refresh),),
                                            name="resum-progress", daemon=True)
            self._ticker.start()

    def _tick(self, every: float) -> None:
        while not self._halt.wait(every):
            self._show()

    # counters ---------------------------------------------------------------
    def started(self, n: int = 1) -> None:
        self.running += n
        self._show()

    def finished(self, ok: bool, running: int = None) -> None:
        self.running = max(0, self.running - 1) if running is None else running
        self.done += 1
        self._finished_here += 1
        if not ok:
            self.failed += 1
        self._show()

    def set_running(self, n: int) -> None:
        self.running = n
        self._show()

    # text -----------------------------------------------------------------
    def line(self) -> str:
        el = time.monotonic() - self.start
        frac = self.done / self.total if self.total else 1.0
        fill = int(round(frac * self.width))
        bar = "#" * fill + "." * (self.width - fill)
        left = ""
        todo = self.total - self.done
        if self._finished_here and todo > 0 and not self.stopped:
            per = el / self._finished_here
            left = f", ~{_clock(per * todo)} left"
        head = f"{self.label} " if self.label else ""
        now = f"{self.stopped} stopped" if self.stopped else f"{self.running} running"
        return (f"{head}[{bar}] {self.done}/{self.total} done, {self.failed} failed, "
                f"{now}  {_clock(el)} elapsed{left}")

    def _show(self, force: bool = False) -> None:
        if self.quiet:
            return
        with self._lock:
            if self.closed:
                return
            now = time.monotonic()
            if self.tty:
                self.stream.write("\r" + self.line() + "\x1b[K")
                self.stream.flush()
            elif force or now - self._last_log >= self.log_every:
                self._last_log = now
                self.stream.write(self.line() + "\n")
                self.stream.flush()

    def close(self, message: str = "", stopped: bool = False) -> None:
        """Write the last line (and ``message``) and stop the redraw thread.

        ``stopped=True`` (the run was interrupted): the points still counted
        as running were abandoned; the line says so."""
        self._halt.set()
        if self._ticker is not None and self._ticker is not threading.current_thread():
            self._ticker.join()
        with self._lock:
            if self.closed:
                return
            self.closed = True
            if stopped:
                self.stopped, self.running = self.running, 0
            if self.quiet:
                return
            if self.tty:
                self.stream.write("\r" + self.line() + "\x1b[K\n")
            else:
                self.stream.write(self.line() + "\n")
            if message:
                self.stream.write(message + "\n")
            self.stream.flush()
