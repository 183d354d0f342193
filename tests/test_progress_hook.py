"""Long source computations report their progress to a listener, and the command line's bar
draws it on a terminal only (infrastructure; no outside reference involved)."""
import io

from resum.commands._common import FractionBar
from resum.progress import listening
from resum.sources.bes import weak_coupling_coefficients
from resum.sources.oscillator import rs_coefficients


def _check(fractions):
    assert fractions, "no progress reported"
    assert all(0 <= a <= b <= 1 for a, b in zip(fractions, fractions[1:]))     # never backwards
    assert fractions[-1] > 0.85


def test_sources_report_rising_fractions():
    seen = []
    with listening(seen.append):
        weak_coupling_coefficients("pi/3", 30)
    _check(seen)
    seen2 = []
    with listening(seen2.append):
        rs_coefficients(0, 40)
    _check(seen2)
    rs_coefficients(0, 5)           # no listener: nothing is reported anywhere
    assert len(seen2) == 39


class _Tty(io.StringIO):
    def isatty(self):
        return True


def test_bar_draws_on_a_terminal_only_and_clears():
    tty = _Tty()
    bar = FractionBar("work", stream=tty)
    bar(0.5)
    bar.close()
    text = tty.getvalue()
    assert "work [" in text and " 50%" in text and text.endswith("\r\x1b[K")
    plain = io.StringIO()
    bar = FractionBar("work", stream=plain)
    bar(0.5)
    bar.close()
    assert plain.getvalue() == ""
