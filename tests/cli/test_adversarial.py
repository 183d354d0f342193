"""Adversarial command-line input: each bad input gives exit code 2, exactly one line on stderr
naming the file, option or field, nothing on stdout and no file left behind. The commands run in
process via main(argv); every case is refused before any computation, so the file stays fast."""
import math
from fractions import Fraction

import pytest

from resum import Series
from resum.cli import main
from resum.series.io import write_series


def catalan(n=30):
    # Catalan numbers (common practice, no source)
    return Series([Fraction(math.comb(2 * k, k), k + 1) for k in range(n)], name="catalan")


def _refused(argv, capsys, needle):
    code = main(argv)
    out, err = capsys.readouterr()
    assert code == 2, err
    assert out == ""
    lines = err.strip().splitlines()
    assert len(lines) == 1, err                 # no progress line before the error, no traceback
    assert needle in lines[0], lines[0]
    return lines[0]


@pytest.fixture
def files(tmp_path):
    good = write_series(catalan(), tmp_path / "cat.txt")
    (tmp_path / "three.txt").write_text("1\n2\n3\n")
    (tmp_path / "neg.csv").write_text("order,coefficient\n" + "".join(f"{k},{k + 5}\n" for k in range(-3, 12)))
    (tmp_path / "afile").write_text("not a folder")
    return tmp_path, str(good)


@pytest.mark.parametrize("cmd", [["analyze"], ["evaluate", "--at", "0.1"], ["strong"]])
def test_too_few_terms_and_negative_powers_name_the_file(files, capsys, cmd):
    d, _ = files
    for name, needle in (("three.txt", "only 3"), ("neg.csv", "starts at x^-3")):
        line = _refused([cmd[0], str(d / name), *cmd[1:]], capsys, needle)
        assert name in line


@pytest.mark.parametrize("cmd", [["evaluate", "--at", "0.1"], ["strong"]])
def test_unknown_method_lists_valid_ones_before_any_work(files, capsys, cmd):
    _, good = files
    line = _refused([cmd[0], good, *cmd[1:], "--method", "no-such"], capsys, "--method")
    assert "borel-pade" in line and "auto" in line


def test_at_not_a_number_names_the_option(files, capsys):
    _, good = files
    _refused(["evaluate", good, "--at", "0.1", "--at", "abc"], capsys, "--at abc")
    _refused(["evaluate", good, "--at", "0.1", "--large-power", "two"], capsys, "--large-power")


@pytest.mark.parametrize("cmd", [["analyze"], ["evaluate", "--at", "0.1"]])
@pytest.mark.parametrize("plot, needle", [("afile", "is not a folder"),
                                          ("afile/sub", "cannot write figures"),
                                          ("", "empty folder name")])
def test_plot_folder_unusable_is_refused_first(files, capsys, cmd, plot, needle):
    d, good = files
    target = str(d / plot) if plot else ""
    _refused([cmd[0], good, *cmd[1:], "--plot", target], capsys, needle)
    assert (d / "afile").read_text() == "not a folder"


@pytest.mark.parametrize("out, needle", [("folder", "is a folder"),
                                         ("missing/x.json", "folder does not exist"),
                                         ("afile/x.json", "is not a folder"),
                                         ("", "empty output file name")])
def test_generate_output_errors_leave_nothing(files, capsys, out, needle):
    d, _ = files
    (d / "folder").mkdir()
    before = sorted(p.name for p in d.iterdir())
    target = str(d / out) if out else ""
    _refused(["generate", "euler", "--orders", "5", "-o", target], capsys, needle)
    assert sorted(p.name for p in d.iterdir()) == before
    assert list((d / "folder").iterdir()) == []


def test_generate_bad_integer_option_says_so_once(capsys):
    line = _refused(["generate", "euler", "--orders", "abc", "-o", "x.json"], capsys, "'abc'")
    assert line.count("--orders") == 1


def test_tour_output_unwritable(files, capsys):
    d, _ = files
    _refused(["tour", "-o", str(d / "afile" / "sub")], capsys, "--output")


def test_generate_long_exact_coefficients_round_trip(tmp_path, capsys):
    # Euler's series: coefficient k is (-1)^k k!, and 1999! has more than 4300 digits (the most
    # Python's str() converts by default); the file must hold them exactly
    from resum.series.io import read_series
    p = tmp_path / "euler.json"
    assert main(["generate", "euler", "--orders", "2000", "-o", str(p)]) == 0
    s = read_series(p)
    assert s.coefficients[1999] == -math.factorial(1999)
    assert s.coefficients[10] == math.factorial(10)


@pytest.mark.parametrize("extra, needle", [
    (["--at", "2", "--at", "-1"], "--at -1: a strong-coupling coupling must be real and positive"),
    (["--at", "0"], "--at 0: a strong-coupling coupling must be real and positive"),
    (["--at", "1+I"], "--at 1+I: a strong-coupling coupling must be real and positive"),
    (["--at", "3:-1:5"], "--at 3:-1:5: a strong-coupling coupling must be real and positive"),
    (["--at", "2", "--at", "1:3:3"], "coupling 2.0 is given twice (also by --at 2)"),
    (["--power", "1+I"], "--power: the leading power must be a real number"),
])
def test_strong_couplings_and_power_refused_before_any_work(files, capsys, extra, needle):
    # _refused also checks there is no progress line before the error
    _, good = files
    _refused(["strong", good, *extra], capsys, needle)


def test_huge_exponent_coefficient_names_its_line(tmp_path, capsys):
    p = tmp_path / "huge.txt"
    p.write_text("1\n2\n1e999999\n" + "".join(f"{k}\n" for k in range(4, 30)))
    line = _refused(["analyze", str(p)], capsys, "huge.txt: line 3: '1e999999' is about 10^999999 in size")
    assert "rescale" in line


@pytest.mark.parametrize("out, needle", [("missing/x.json", "folder does not exist"),
                                         ("afile/x.json", "is not a folder"),
                                         ("folder", "is a folder")])
def test_generate_checks_the_output_before_computing(files, capsys, monkeypatch, out, needle):
    # a mistyped -o must not cost the (possibly long) computation of the series first
    import dataclasses
    from resum.sources import SOURCES
    d, _ = files
    (d / "folder").mkdir()

    def no_build(*a, **k):
        raise AssertionError("the series was computed before the output was checked")
    monkeypatch.setitem(SOURCES, "euler", dataclasses.replace(SOURCES["euler"], build=no_build))
    _refused(["generate", "euler", "--orders", "5", "-o", str(d / out)], capsys, needle)
    assert list((d / "folder").iterdir()) == []


@pytest.mark.parametrize("cmd", [["evaluate", "--at", "0.5"], ["strong"],
                                 ["evaluate", "--at", "0.5", "--method", "conformal-pade"]])
def test_too_few_terms_for_the_planning_analysis_refused_first(tmp_path, capsys, cmd):
    # 1/(1-x) to 6 terms: enough for a resummation (6), not for the singularity analysis
    # (8 usable terms) that auto and the conformal methods plan with; it used to be refused
    # after the progress line, in the analysis's words
    p = tmp_path / "six.txt"
    p.write_text("1\n" * 6)
    line = _refused([cmd[0], str(p), *cmd[1:]], capsys, "six.txt: only 6 usable terms")
    assert "needs at least 8" in line and "--method pade" in line


def test_few_terms_still_fine_for_methods_without_the_analysis(tmp_path, capsys):
    # 1/(1-x) at x = 1/2 is 2 (geometric series, common practice, no source); [2/2] Padé of six
    # terms of 1/(1-x) is exact
    import json
    import mpmath
    p = tmp_path / "six.txt"
    p.write_text("1\n" * 6)
    assert main(["evaluate", str(p), "--at", "1/2", "--method", "pade", "--json", "--no-verify"]) == 0
    v = json.loads(capsys.readouterr().out)["values"][0]
    assert mpmath.mpf(v["lo"]) <= 2 <= mpmath.mpf(v["hi"])


@pytest.mark.parametrize("raw, needle", [
    (b"0.1 1.2\n0.2 \xe9\n", "ref.txt: not UTF-8 text"),
    (b"0.1 1.2 -0.1\n", "ref.txt:1: the error '-0.1' must be a real number >= 0"),
    (b"0.1 1.2 I\n", "ref.txt:1: the error 'I' must be a real number >= 0"),
    (b"0.1 1.2+0.1*I\n", "ref.txt:1: the reference value '1.2+0.1*I' is complex"),
])
def test_reference_file_refused_in_one_line(files, capsys, raw, needle):
    # each of these ended in a traceback (UnicodeDecodeError, TypeError in the comparison) or
    # was taken silently (a negative error)
    d, good = files
    (d / "ref.txt").write_bytes(raw)
    _refused(["evaluate", good, "--at", "0.1", "--method", "pade", "--reference", str(d / "ref.txt")],
             capsys, needle)


def test_reference_file_with_byte_order_mark_and_crlf(files, capsys):
    import json
    d, good = files
    (d / "ref.txt").write_bytes(b"\xef\xbb\xbf0.1 1.2\r\n")
    assert main(["evaluate", good, "--at", "0.1", "--method", "pade", "--no-verify", "--json",
                 "--reference", str(d / "ref.txt")]) in (0, 1)
    ref = json.loads(capsys.readouterr().out)["reference"]
    assert ref[0]["at"] == "0.1" and ref[0]["value"].startswith("1.2")


@pytest.mark.parametrize("argv, needle", [
    (["scan", "spec.toml", "-o", ""], "-o: empty folder name"),
    (["scan", "spec.toml", "-o", "  ", "--jobs", "1"], "-o: empty folder name"),
    (["tour", "-o", ""], "--output: empty folder name"),
])
def test_empty_output_folder_does_not_mean_the_current_one(tmp_path, capsys, monkeypatch, argv, needle):
    # Path("") is ".": an unset variable in -o "$DIR" filled the current folder with a run or
    # a tour's report and figures
    monkeypatch.chdir(tmp_path)
    (tmp_path / "spec.toml").write_text('[study]\nname = "e"\nsource = "euler"\ndps = 15\n[axes]\n'
                                        'orders = { values = [10, 12] }\n[tasks.coefficients]\n')
    _refused(argv, capsys, needle)
    assert [p.name for p in tmp_path.iterdir()] == ["spec.toml"]


@pytest.mark.skipif(not __import__("os").path.exists("/dev/zero"), reason="needs /dev/zero")
def test_reference_device_without_end_is_read_bounded(files, capsys, monkeypatch):
    import resum.series.io as io
    monkeypatch.setattr(io, "MAX_FILE_BYTES", 4096)
    _, good = files
    _refused(["evaluate", good, "--at", "0.1", "--reference", "/dev/zero"], capsys,
             "/dev/zero: file larger than")


@pytest.mark.parametrize("value, needle", [("", "--methods: no method given"),
                                           ("ratio,bogus", "--methods: unknown method 'bogus'")])
def test_analyze_methods_refused_naming_the_option(files, capsys, value, needle):
    # --methods '' (an unset variable) ran the default methods silently
    _, good = files
    _refused(["analyze", good, "--methods", value], capsys, needle)


def test_values_beyond_doubles_keep_the_results_when_figures_fail(tmp_path, capsys):
    # a coefficient 1e300000 is a valid number, beyond the largest double (about 1.8e308,
    # IEEE 754 binary64); the figure could not set its axis limits and the run ended in a
    # matplotlib traceback, losing the results
    import json
    pytest.importorskip("matplotlib")
    p = tmp_path / "big.txt"
    p.write_text("1e300000\n" + "".join(f"{k}\n" for k in range(1, 11)))
    code = main(["evaluate", str(p), "--at", "0.5", "--plot", str(tmp_path / "figs"), "--json", "--no-verify"])
    cap = capsys.readouterr()
    doc = json.loads(cap.out)
    assert "Traceback" not in cap.err and doc["values"][0]["at"] == "0.5"
    assert code == 1 and any(w.startswith("figures not drawn") for w in doc["warnings"])


@pytest.mark.parametrize("cmd, module, name", [
    (["analyze", "--no-verify", "--methods", "ratio"], "resum.plots.analysis", "write_analysis_plots"),
    (["evaluate", "--at", "0.1", "--method", "pade", "--no-verify"], "resum.plots.evaluation",
     "write_evaluation_plots"),
])
def test_a_figure_that_cannot_be_drawn_is_a_warning(files, capsys, monkeypatch, cmd, module, name):
    import importlib
    import json
    pytest.importorskip("matplotlib")
    d, good = files

    def broken(*a, **k):
        raise ValueError("cannot draw this")
    monkeypatch.setattr(importlib.import_module(module), name, broken)
    code = main([cmd[0], good, *cmd[1:], "--plot", str(d / "figs"), "--json"])
    cap = capsys.readouterr()
    doc = json.loads(cap.out)                   # the results, as without --plot
    assert code == 1 and "Traceback" not in cap.err
    assert "figures not drawn (ValueError: cannot draw this)" in cap.err
    assert any("cannot draw this" in w for w in doc["warnings"])


@pytest.mark.parametrize("source, orders, needle", [("euler", "100000", "at most 10000"),
                                                    ("phi4", "100000", "at most 8000"),
                                                    ("catalan", "100000", "at most 20000")])
def test_exact_sources_refuse_files_too_large_to_read_back(tmp_path, capsys, source, orders, needle):
    # 100000 orders of n! (or of phi^4's rationals) is some 20 GB of digits, built in memory and
    # then refused by the readers (200 MiB)
    _refused(["generate", source, "--orders", orders, "-o", str(tmp_path / "x.txt")], capsys, needle)
    assert not (tmp_path / "x.txt").exists()


def test_euler_at_its_cap_fits_the_readers():
    # digits of k! = floor(log10 k!) + 1 (common practice, no source); one line per coefficient
    from resum.series.io import MAX_FILE_BYTES
    from resum.sources import EULER_MAX_ORDERS
    size = sum(math.floor(math.lgamma(k + 1) / math.log(10)) + 2 + (k % 2) for k in range(EULER_MAX_ORDERS))
    assert size < MAX_FILE_BYTES


def test_catalan_at_its_cap_fits_the_readers():
    # digits of c_k = binomial(2k, k)/(k + 1) from lgamma: floor(log10 c_k) + 1 (common practice,
    # no source), plus quotes, comma and space in JSON (measured at the cap: 120415297 bytes)
    from resum.series.io import MAX_FILE_BYTES
    from resum.sources import CATALAN_MAX_ORDERS
    size = sum(math.floor((math.lgamma(2 * k + 1) - 2 * math.lgamma(k + 1) - math.log(k + 1)) / math.log(10))
               + 1 + 4 for k in range(CATALAN_MAX_ORDERS))
    assert size < MAX_FILE_BYTES


def test_stdout_that_cannot_be_written_is_one_line(files, capsys, monkeypatch):
    # a full disk (ENOSPC, as /dev/full gives) under the results ended in an OSError traceback
    import errno
    import io
    import sys
    _, good = files

    class Full(io.StringIO):
        def write(self, text):
            raise OSError(errno.ENOSPC, "No space left on device")
    monkeypatch.setattr(sys, "stdout", Full())
    code = main(["analyze", good, "--methods", "ratio", "--no-verify", "--json"])
    err = capsys.readouterr().err
    assert code == 2 and "Traceback" not in err
    assert err.strip().splitlines()[-1] == ("resum analyze: error: cannot write the output (No space left "
                                            "on device); free space or choose another place")
