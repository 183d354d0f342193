"""Family runs: runners agree, failures are recorded, interrupted runs resume.

The series come from tests/batch/family_sources.py: (1 - x/R)^-a, whose
radius is R and whose sum is known in closed form (common practice, no
source); mpmath evaluates the closed form for the checks.
"""
import json
import multiprocessing
import os
import signal
import subprocess
import sys
import time
from pathlib import Path

import mpmath
import pytest

from resum.batch import (ProcessRunner, SerialRunner, parse_spec, run_family, strip_run)
from resum.commands.family import main
from resum.errors import InputError

from .family_sources import wait_until_held

ROOT = Path(__file__).resolve().parents[2]
SRC = "tests.batch.family_sources:binomial"


def spec_text(radii, orders=40, extra_fixed="", gate=None, free=0):
    """A spec of the binomial source; ``gate`` (a folder) and ``free``: the run holds after
    ``free`` points until the test opens the gate (tests/batch/family_sources.py)."""
    vals = ", ".join(f'"{r}"' if isinstance(r, str) else str(r) for r in radii)
    if gate is not None:
        Path(gate).mkdir(parents=True, exist_ok=True)
        extra_fixed = f"gate = {json.dumps(str(gate))}\nfree = {free}\n{extra_fixed}"
    return f"""
[study]
name = "runs"
source = "{SRC}"
dps = 30
[fixed]
orders = {orders}
{extra_fixed}
[axes]
radius = {{ values = [{vals}] }}
exponent = {{ values = ["1/2", 2] }}
[tasks.coefficients]
at = [0.5]
"""


def records(folder):
    return {p.name: json.loads(p.read_text()) for p in sorted(Path(folder, "points").glob("*.json"))}


SMALL = spec_text([1, "3/2", "pi/2", -1])


def test_serial_run_records_and_truth(tmp_path):
    spec = parse_spec(SMALL, path="spec.toml")
    out = run_family(spec, tmp_path / "o", runner=SerialRunner(), quiet=True, plots=False)
    assert out.counts == {"points": 8, "recorded": 8, "ok": 6, "failed": 2, "missing": 0}
    recs = records(tmp_path / "o")
    assert len(recs) == 8
    with mpmath.workdps(40):
        for r in recs.values():
            if r["status"] != "ok":
                # R = -1 is refused by the source; the error is kept, the run went on
                assert r["params"]["radius"] == "-1"
                assert r["error"]["step"] == "build"
                assert "radius must be positive" in r["error"]["message"]
                continue
            R = mpmath.mpf(r["params"]["radius"])
            a = mpmath.mpf(r["params"]["exponent"])
            rad = r["tasks"]["coefficients"]["ratio"]["radius"]
            # honest: the band holds R; sharp: the band is narrow
            assert mpmath.mpf(rad["lo"]) <= R <= mpmath.mpf(rad["hi"])
            assert mpmath.mpf(rad["hi"]) - mpmath.mpf(rad["lo"]) < mpmath.mpf(10) ** -20
            # partial sum at x = 1/2 against the closed form (1 - x/R)^-a; the
            # tail after 40 terms is below (x/R)^40 * 40^a / (1 - x/R) (common practice)
            ps = mpmath.mpf(r["tasks"]["coefficients"]["partial_sums"][0]["partial_sum"])
            x = mpmath.mpf("0.5")
            tail = (x / R) ** 40 * 40 ** a / (1 - x / R)
            assert abs(ps - (1 - x / R) ** (-a)) < tail
    summary = json.loads((tmp_path / "o" / "summary.json").read_text())
    assert summary["counts"]["failed"] == 2 and len(summary["rows"]) == 8
    assert "not a proof" in summary["bands"] and "guard digits" in summary["bands"]
    csv = (tmp_path / "o" / "summary.csv").read_text().splitlines()
    assert csv[0].startswith("key,index,status,param_radius,exponent") and len(csv) == 9


def test_runners_give_identical_records(tmp_path):
    spec = parse_spec(SMALL, path="spec.toml")
    run_family(spec, tmp_path / "serial", runner=SerialRunner(), quiet=True, plots=False)
    run_family(spec, tmp_path / "pool", runner=ProcessRunner(jobs=2), quiet=True, plots=False)
    a, b = records(tmp_path / "serial"), records(tmp_path / "pool")
    assert a.keys() == b.keys() and len(a) == 8
    for k in a:
        assert strip_run(a[k]) == strip_run(b[k]), k
    assert {r["run"]["runner"] for r in b.values()} == {"process"}


def test_dask_local_cluster_identical(tmp_path):
    pytest.importorskip("distributed")
    from resum.batch import DaskRunner
    spec = parse_spec(spec_text([1, "pi/2"]), path="spec.toml")
    run_family(spec, tmp_path / "serial", runner=SerialRunner(), quiet=True, plots=False)
    inflight, most = set(), [0]

    class Counting(DaskRunner):
        def run(self, spec, indices, on_start, on_record):
            def start(i):
                inflight.add(i)
                most[0] = max(most[0], len(inflight))
                on_start(i)

            def record(rec):
                inflight.discard(rec["index"])
                on_record(rec)
            super().run(spec, indices, start, record)

    run_family(spec, tmp_path / "dask", runner=Counting("local:2"), quiet=True, plots=False)
    # at most one point per worker in flight: the progress line's "running" is what runs
    assert most[0] == 2
    a, b = records(tmp_path / "serial"), records(tmp_path / "dask")
    assert a.keys() == b.keys() and len(a) == 4
    for k in a:
        assert strip_run(a[k]) == strip_run(b[k]), k
    assert {r["run"]["runner"] for r in b.values()} == {"dask"}


def test_local_cluster_takes_no_fixed_port():
    # a local cluster's scheduler served its HTTP endpoints on port 8787 by default: with another
    # cluster on the machine holding it (a test suite beside this one) dask warned and moved, and
    # under warnings-as-errors the cluster failed to start ("Port 8787 is already in use"); it
    # now listens on a free loopback port and starts whoever holds 8787
    pytest.importorskip("distributed")
    from resum.batch import DaskRunner
    runner = DaskRunner("local:1")
    runner.prepare()
    try:
        http = runner._conn[1].scheduler.http_server
        assert http.port != 8787 and http.address == "127.0.0.1"
    finally:
        runner.close()


def test_dead_worker_is_recorded_and_the_rest_finish(tmp_path):
    text = spec_text([1, 2], extra_fixed="")
    text = text.replace('exponent = { values = ["1/2", 2] }',
                        'exponent = { values = ["1/2", 2] }\ncrash = { values = [false, true] }')
    spec = parse_spec(text, path="spec.toml")
    out = run_family(spec, tmp_path / "o", runner=ProcessRunner(jobs=2), quiet=True, plots=False)
    recs = records(tmp_path / "o")
    assert len(recs) == 8
    for r in recs.values():
        if r["params"]["crash"]:
            assert r["status"] == "failed" and r["error"]["type"] == "WorkerLost"
        else:
            assert r["status"] == "ok"
    assert out.counts["failed"] == 4
    # every worker process has ended and been joined: nothing is left for interpreter exit
    # to wait on (an abandoned pool worker once blocked exit after the test session)
    assert multiprocessing.active_children() == []


def test_dead_dask_worker_fails_only_its_own_point(tmp_path):
    # a point that ends its worker process must not take the others with it (a spec scattered
    # to one worker once made every point fail with "lost dependencies"); retrying the failed
    # points computes only those
    pytest.importorskip("distributed")
    from resum.batch import DaskRunner
    from resum.batch.records import RunFolder
    from resum.batch.scan import plan
    text = spec_text([2], orders=20).replace(
        'exponent = { values = ["1/2", 2] }',
        'exponent = { values = ["1/2", 2, 3] }\ncrash = { values = [false, true, false] }\n'
        '[grid]\ncombine = ["radius", ["exponent", "crash"]]')
    spec = parse_spec(text, path="spec.toml")
    out = run_family(spec, tmp_path / "o", runner=DaskRunner("local:2"), quiet=True, plots=False)
    recs = records(tmp_path / "o")
    assert len(recs) == 3 and out.counts["ok"] == 2 and out.counts["failed"] == 1
    for r in recs.values():
        if r["params"]["crash"]:
            assert r["status"] == "failed" and r["error"]["type"] == "WorkerLost", r["error"]
            assert "died" in r["error"]["message"]
        else:
            assert r["status"] == "ok", r["error"]
    todo, skipped = plan(spec, RunFolder(tmp_path / "o"), retry_failed=True)
    assert todo == sorted(r["index"] for r in recs.values() if r["params"]["crash"])


def test_bad_worker_count_stops_the_run_before_any_point(tmp_path, monkeypatch):
    # common practice, no source: a bad setting is reported once, before work starts
    monkeypatch.setenv("RESUM_JOBS", "two")
    spec = parse_spec(SMALL, path="spec.toml")
    with pytest.raises(InputError, match="RESUM_JOBS"):
        run_family(spec, tmp_path / "o", quiet=True, plots=False)
    assert not (tmp_path / "o").exists()


def test_reuse_of_a_folder(tmp_path):
    spec = parse_spec(SMALL, path="spec.toml")
    run_family(spec, tmp_path / "o", quiet=True, plots=False)
    with pytest.raises(InputError, match="--resume"):
        run_family(spec, tmp_path / "o", quiet=True, plots=False)
    other = parse_spec(SMALL.replace("dps = 30", "dps = 31"), path="spec.toml")
    with pytest.raises(InputError, match="different spec"):
        run_family(other, tmp_path / "o", resume=True, quiet=True, plots=False)
    # resume with nothing to do computes nothing; --retry-failed redoes the failed ones
    again = run_family(spec, tmp_path / "o", resume=True, quiet=True, plots=False)
    assert again.computed == () and len(again.skipped) == 8
    retry = run_family(spec, tmp_path / "o", resume=True, retry_failed=True, quiet=True, plots=False)
    assert retry.computed == (6, 7)
    (tmp_path / "junk").mkdir()
    (tmp_path / "junk" / "x.txt").write_text("x")
    with pytest.raises(InputError, match="not empty"):
        run_family(spec, tmp_path / "junk", quiet=True, plots=False)


@pytest.mark.parametrize("how", ["kill", "interrupt"])
def test_killed_run_resumes_without_loss(tmp_path, how):
    spec_path = tmp_path / "spec.toml"
    gate = tmp_path / "gate"
    # three points pass, the fourth waits at the gate until the test opens it: the signal
    # reaches the run there, however slowly a loaded machine got it that far
    spec_path.write_text(spec_text([1, 2, 3, 4, 5], gate=gate, free=3))
    out = tmp_path / "o"
    # Ctrl-C as at a terminal: a test run started in the background by a shell without job
    # control inherits SIGINT ignored, and Python then never raises KeyboardInterrupt
    proc = subprocess.Popen([sys.executable, "-m", "resum.commands.family", str(spec_path),
                             "-o", str(out), "--jobs", "1", "--no-plots"], cwd=ROOT,
                            stdout=subprocess.DEVNULL, stderr=subprocess.PIPE,
                            preexec_fn=lambda: signal.signal(signal.SIGINT, signal.SIG_DFL))
    try:
        held = wait_until_held(gate, out / "points", free=3, waiting=1, proc=proc)
        proc.send_signal(signal.SIGKILL if how == "kill" else signal.SIGINT)
        rc = proc.wait(timeout=120)
    finally:
        if proc.poll() is None:
            proc.kill()
            proc.wait()
        proc.stderr.close()
    assert held, "the run did not reach the gate with 3 points done"
    assert rc == (-signal.SIGKILL if how == "kill" else 130)
    before = {p.name: (p.read_bytes(), p.stat().st_mtime_ns) for p in (out / "points").glob("p*.json")}
    assert len(before) == 3
    for raw, _ in before.values():
        json.loads(raw)   # every record on disk is complete
    (gate / "open").touch()
    rc = main([str(spec_path), "-o", str(out), "--jobs", "1", "--resume", "--no-plots", "--json"])
    assert rc == 0
    after = {p.name: (p.read_bytes(), p.stat().st_mtime_ns) for p in (out / "points").glob("p*.json")}
    assert len(after) == 10
    for name, val in before.items():
        assert after[name] == val, f"{name} was recomputed"
    assert not list((out / "points").glob(".*.tmp"))


def _descendants(pid):
    """Process ids below ``pid`` (Linux /proc)."""
    parent = {}
    for d in os.listdir("/proc"):
        if d.isdigit():
            try:
                with open(f"/proc/{d}/stat") as fh:
                    parent[int(d)] = int(fh.read().rsplit(")", 1)[1].split()[1])
            except (OSError, IndexError, ValueError):
                pass
    out, frontier = set(), {pid}
    while frontier:
        frontier = {c for c, p in parent.items() if p in frontier} - out
        out |= frontier
    return out


@pytest.mark.skipif(not os.path.isdir("/proc/self"), reason="needs Linux /proc")
def test_killed_pool_run_leaves_no_workers(tmp_path):
    # SIGKILL of the main process gives it no chance to clean up: the workers must notice
    # on their own and end, instead of living on (and holding the terminal's pipes)
    spec_path = tmp_path / "spec.toml"
    gate = tmp_path / "gate"
    # one point passes, the next two wait at the gate in their worker processes: the kill
    # lands with workers alive, however loaded the machine
    spec_path.write_text(spec_text([1, 2, 3, 4, 5], gate=gate, free=1))
    out = tmp_path / "o"
    proc = subprocess.Popen([sys.executable, "-m", "resum.commands.family", str(spec_path),
                             "-o", str(out), "--jobs", "2", "--no-plots"], cwd=ROOT,
                            stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    try:
        held = wait_until_held(gate, out / "points", free=1, waiting=2, proc=proc)
        below = _descendants(proc.pid)
    finally:
        proc.kill()
        proc.wait(timeout=120)
    assert held, "the run did not reach the gate with 1 point done"
    assert below, "no worker processes seen"
    # the workers end when they see their parent gone (at once; the bound is for a broken run)
    deadline = time.monotonic() + 120
    while time.monotonic() < deadline and _alive(below):
        time.sleep(0.1)
    assert not _alive(below), f"worker processes left running: {sorted(_alive(below))}"


def _alive(pids):
    out = []
    for p in pids:
        try:
            with open(f"/proc/{p}/stat") as fh:
                if fh.read().rsplit(")", 1)[1].split()[0] != "Z":
                    out.append(p)
        except OSError:
            pass
    return out


def test_cli_exit_codes(tmp_path, capsys):
    spec_path = tmp_path / "spec.toml"
    spec_path.write_text(SMALL)
    assert main([str(spec_path), "-o", str(tmp_path / "a"), "--jobs", "1", "--no-plots",
                 "--json"]) == 1          # two points fail
    doc = json.loads(capsys.readouterr().out)
    assert doc["counts"]["failed"] == "2" and doc["computed"] == "8"    # decimal strings, as elsewhere
    spec_path.write_text(spec_text([1, 2]))
    assert main([str(spec_path), "-o", str(tmp_path / "b"), "--jobs", "1", "--no-plots"]) == 0
    capsys.readouterr()
    spec_path.write_text(SMALL.replace("[tasks.coefficients]", "[tasks.nothing]"))
    assert main([str(spec_path), "-o", str(tmp_path / "c")]) == 2
    err = capsys.readouterr().err
    assert "tasks.nothing" in err and len(err.strip().splitlines()) == 1
    assert main([str(spec_path), "-o", str(tmp_path / "c"), "--retry-failed"]) == 2


def test_a_creation_killed_between_spec_and_run_json_is_taken_up(tmp_path, monkeypatch):
    import resum.batch.records as records_mod
    spec = parse_spec(spec_text([1, 2]), path="spec.toml")
    real = records_mod.atomic_write_text

    def killed_at_run_json(path, text):
        if Path(path).name == "run.json":
            # the kill lands during run.json's atomic write: its temporary file stays
            (Path(path).parent / ".run.json.k1ll3d00.tmp").write_text(text[:5])
            raise KeyboardInterrupt
        real(path, text)

    monkeypatch.setattr(records_mod, "atomic_write_text", killed_at_run_json)
    with pytest.raises(KeyboardInterrupt):
        run_family(spec, tmp_path / "o", quiet=True, plots=False)
    monkeypatch.setattr(records_mod, "atomic_write_text", real)
    assert (tmp_path / "o" / "spec.toml").exists() and not (tmp_path / "o" / "run.json").exists()
    (tmp_path / "o" / "points" / ".p00000.json.abcdefgh.tmp").write_text("{")
    out = run_family(spec, tmp_path / "o", quiet=True, plots=False)
    assert out.counts["ok"] == 4 and out.success
    assert json.loads((tmp_path / "o" / "run.json").read_text())["spec_digest"] == spec.digest
    left = sorted(p.name for p in (tmp_path / "o").rglob("*") if p.name.endswith(".tmp"))
    assert left == []


def test_a_folder_holding_another_specs_leftovers_is_refused(tmp_path):
    spec = parse_spec(spec_text([1, 2]), path="spec.toml")
    o = tmp_path / "o"
    (o / "points").mkdir(parents=True)
    (o / "spec.toml").write_text(spec_text([1, 3]))
    with pytest.raises(InputError, match="another spec"):
        run_family(spec, o, quiet=True, plots=False)
    (o / "spec.toml").write_text(spec_text([1, 2]))
    (o / "notes.txt").write_text("mine")
    with pytest.raises(InputError, match="not empty"):
        run_family(spec, o, quiet=True, plots=False)
    assert sorted(p.name for p in o.iterdir()) == ["notes.txt", "points", "spec.toml"]


def test_stale_temporary_files_are_removed_when_a_run_folder_is_opened(tmp_path):
    spec = parse_spec(spec_text([1, 2]), path="spec.toml")
    o = tmp_path / "o"
    run_family(spec, o, quiet=True, plots=False)
    stale = [o / ".summary.json.zz9plur1.tmp", o / ".run.json.a1b2c3d4.tmp",
             o / "points" / ".p00001.json.q_w_e_r_.tmp"]
    for p in stale:
        p.write_text("partial")
    theirs = [o / ".notes.abcdefgh.tmp", o / "points" / "keep.tmp"]
    for p in theirs:
        p.write_text("not ours")
    run_family(spec, o, resume=True, quiet=True, plots=False)
    assert not any(p.exists() for p in stale)
    assert all(p.exists() for p in theirs)


def test_summary_keeps_the_lateral_sum_ambiguity(tmp_path):
    # Euler's series sum n! x^n (sign +1) is not Borel summable on the positive axis: the
    # lateral Borel sums are e^(-1/x)/x (Ei(1/x) -+ i pi) (the principal value of
    # integral_0^inf e^(-t)/(1 - x t) dt and half the residue; Ei through mpmath; common
    # practice, no source), so the ambiguity is pi e^(-1/x)/x. The summary table must carry
    # it beside the real part.
    text = """
[study]
name = "lateral"
source = "euler"
dps = 20
[fixed]
orders = 30
[axes]
sign = { values = [1] }
[tasks.evaluate]
at = ["0.1"]
verify = false
"""
    spec = parse_spec(text, path="spec.toml")
    run_family(spec, tmp_path / "o", runner=SerialRunner(), quiet=True, plots=False)
    rows = json.loads((tmp_path / "o" / "summary.json").read_text())["rows"]
    row = rows[0]
    with mpmath.workdps(30):
        x = mpmath.mpf("0.1")
        amb = mpmath.pi * mpmath.exp(-1 / x) / x
        re = mpmath.exp(-1 / x) / x * mpmath.ei(1 / x)
        assert mpmath.mpf(row["value@0.1_lo"]) <= re <= mpmath.mpf(row["value@0.1_hi"])
        lo, hi = sorted(abs(mpmath.mpf(row[f"value_im@0.1_{k}"])) for k in ("lo", "hi"))
        assert lo <= amb <= hi
    csv = (tmp_path / "o" / "summary.csv").read_text().splitlines()
    assert "value_im@0.1" in csv[0].split(",")


def test_summary_columns_of_old_and_new_point_spellings_agree():
    # records written before whole-number points were echoed as given hold "3.0"; a resumed
    # run mixes them with "3": both must fill the column value@3 (plumbing, no numbers)
    from resum.batch.records import summary_rows
    old = {"key": "a", "index": 0, "tasks": {"evaluate": {"values": [
        {"at": "3.0", "value": "1.5", "lo": "1.4", "hi": "1.6"}]}}}
    new = {"key": "b", "index": 1, "tasks": {"evaluate": {"values": [
        {"at": "3", "value": "2.5", "lo": "2.4", "hi": "2.6"}]}}}
    rows = summary_rows([old, new])
    assert [r.get("value@3") for r in rows] == ["1.5", "2.5"]
    assert not any("value@3.0" in r for r in rows)


def test_an_axis_named_like_a_result_column_keeps_its_own_column(tmp_path):
    # the source's parameter `radius` is an axis and the analysis estimates a radius: both must
    # reach the summary, the parameter as param_radius (the radius of (1 - x/R)^-a is R, closed
    # form, common practice, no source)
    text = f"""
[study]
name = "clash"
source = "{SRC}"
dps = 20
[fixed]
orders = 20
[axes]
radius = {{ values = [2, 3, -1] }}
[tasks.analyze]
methods = ["ratio"]
verify = false
"""
    spec = parse_spec(text, path="spec.toml")
    run_family(spec, tmp_path / "o", runner=SerialRunner(), quiet=True, plots=False)
    rows = json.loads((tmp_path / "o" / "summary.json").read_text())["rows"]
    assert [r["param_radius"] for r in rows] == ["2", "3", "-1"]   # failed rows too
    for r, R in zip(rows[:2], (2, 3)):
        assert r["status"] == "ok"
        assert mpmath.mpf(r["radius_lo"]) <= R <= mpmath.mpf(r["radius_hi"])
    assert rows[2]["status"] == "failed" and "radius" not in rows[2]
    header = (tmp_path / "o" / "summary.csv").read_text().splitlines()[0].split(",")
    assert header[:4] == ["key", "index", "status", "param_radius"]
    assert header.count("radius") == 1 and "radius_lo" in header


def test_a_polynomial_point_of_a_family_is_an_answer_not_a_failure(tmp_path):
    # at a = pi/2 the kernel K(a) = 2 cos(a) [...] vanishes and F = 4 g^2 (the definition of the
    # family; common practice, no source): with the grid's text "pi/2" the series is that exact
    # polynomial, and the analyze task records an entire function instead of failing the point
    spec = parse_spec('[study]\nname = "p"\nsource = "bes"\ndps = 30\n[fixed]\nloops = 16\n'
                      '[axes]\nangle = { range = { start = "3*pi/8", stop = "pi/2", num = 2 } }\n'
                      '[tasks.analyze]\nverify = false\n[tasks.evaluate]\nat = [5]\n', path="spec.toml")
    out = run_family(spec, tmp_path / "o", runner=SerialRunner(), quiet=True, plots=False)
    assert out.counts["ok"] == 2 and out.counts["failed"] == 0
    last = records(tmp_path / "o")["p00001.json"]["tasks"]
    assert last["analyze"]["growth"] == "polynomial"
    assert last["analyze"]["radius"]["value"] == "inf" and last["analyze"]["singularities"] == []
    v = last["evaluate"]["values"][0]
    assert mpmath.mpf(v["lo"]) <= 100 <= mpmath.mpf(v["hi"])      # 4 g^2 at g = 5


def test_family_points_get_the_source_default_digits_unless_the_spec_gives_them(tmp_path):
    # no dps for the source: the coefficients carry max(study dps, loops + 10) digits, as from
    # resum generate; at a = 0, g = 1 from 40 loops the value is then within 1.4e-23 of the
    # truth, against 6.9e-19 with coefficients at the study's 20 digits. Truth: (2/pi^2) log cosh(2 pi g) (Belitsky-Korchemsky
    # arXiv:1907.13131). A dps under [fixed] is kept.
    text = ('[study]\nname = "d"\nsource = "bes"\ndps = 20\n[fixed]\nloops = 40\n%s'
            '[axes]\nangle = ["0"]\n[tasks.evaluate]\nat = [1]\nverify = false\n')
    run_family(parse_spec(text % "", path="spec.toml"), tmp_path / "a", runner=SerialRunner(),
               quiet=True, plots=False)
    (rec,) = records(tmp_path / "a").values()
    assert rec["series"]["digits"] == 50
    v = rec["tasks"]["evaluate"]["values"][0]
    with mpmath.workdps(40):
        truth = 2 / mpmath.pi ** 2 * mpmath.log(mpmath.cosh(2 * mpmath.pi))
        assert mpmath.mpf(v["lo"]) <= truth <= mpmath.mpf(v["hi"])
        assert abs(mpmath.mpf(v["value"]) - truth) < mpmath.mpf(10) ** -21 * truth
    run_family(parse_spec(text % "dps = 25\n", path="spec.toml"), tmp_path / "b", runner=SerialRunner(),
               quiet=True, plots=False)
    (rec,) = records(tmp_path / "b").values()
    assert rec["series"]["digits"] == 25


GOAL_SPEC = """
[study]
name = "goal"
source = "bes"
dps = 30
[fixed]
loops = 30
dps = 45
[axes]
angle = ["0"]
[tasks.evaluate]
at = [2]
verify = false
goal_digits = %s
%s
"""


def test_evaluate_with_a_goal_regenerates_the_series_with_the_projected_terms(tmp_path):
    # at a = 0, F = (2/pi^2) log cosh(2 pi g) (Belitsky and Korchemsky, arXiv:1907.13131;
    # mpmath as the reference). 30 loops give about 9 digits at g = 2; asked for 14, the task
    # rebuilds the series with the terms its convergence rate projects and evaluates again
    spec = parse_spec(GOAL_SPEC % (14, ""), path="spec.toml")
    run_family(spec, tmp_path / "o", runner=SerialRunner(), quiet=True, plots=False)
    ev = records(tmp_path / "o")["p00000.json"]["tasks"]["evaluate"]
    search = ev["order_search"]
    assert search["reached"] is True
    assert search["rounds"][0]["terms"] == 31 and float(search["rounds"][0]["min_digits"]) < 14
    assert 31 < search["terms_used"] <= 93
    v = ev["values"][0]
    assert float(v["digits"]) >= 14
    with mpmath.workdps(40):
        truth = 2 / mpmath.pi ** 2 * mpmath.log(mpmath.cosh(4 * mpmath.pi))
        lo, hi = mpmath.mpf(v["lo"]), mpmath.mpf(v["hi"])
        assert lo <= truth <= hi
        assert abs(mpmath.mpf(v["value"]) - truth) < truth * mpmath.mpf(10) ** -14
    from resum.batch.records import summary_rows
    row = summary_rows(records(tmp_path / "o").values())[0]
    assert row["value_terms_used"] == search["terms_used"]


def test_a_goal_beyond_max_terms_stops_there_and_says_so(tmp_path):
    spec = parse_spec(GOAL_SPEC % (29, "max_terms = 40"), path="spec.toml")
    run_family(spec, tmp_path / "o", runner=SerialRunner(), quiet=True, plots=False)
    search = records(tmp_path / "o")["p00000.json"]["tasks"]["evaluate"]["order_search"]
    assert search["reached"] is False
    assert search["terms_used"] == 40 and "max_terms = 40" in search["note"]


@pytest.mark.parametrize("opts,words", [
    ('goal_digits = 0', "goal_digits"),
    ('goal_digits = 10\nmax_terms = 2', "max_terms"),
    ('goal_digits = 40', "more than the study's dps"),
])
def test_goal_options_are_checked_before_any_work(opts, words):
    text = GOAL_SPEC.replace("goal_digits = %s\n%s\n", opts + "\n")
    with pytest.raises(InputError, match=words):
        parse_spec(text, path="spec.toml")


def test_a_goal_needs_a_source_that_names_its_length():
    text = spec_text([1]).replace("[tasks.coefficients]\nat = [0.5]",
                                  "[tasks.evaluate]\nat = [0.5]\ngoal_digits = 10")
    with pytest.raises(InputError, match="length"):
        parse_spec(text, path="spec.toml")


def test_summary_flags_a_suspected_natural_boundary():
    from resum.batch.records import flatten_record
    band = {"value": "0.99", "lo": "0.94", "hi": "1.03"}
    rec = {"key": "p00000", "index": 0, "status": "ok", "params": {}, "axes": [], "labels": {},
           "tasks": {"analyze": {"radius": band, "singularities": [], "natural_boundary": {"radius": band}}}}
    row = flatten_record(rec)
    assert row["analyze_natural_boundary"] is True and row["radius"] == "0.99"
    rec["tasks"]["analyze"].pop("natural_boundary")
    assert "analyze_natural_boundary" not in flatten_record(rec)


def test_rebuilder_grows_the_source_digits_with_the_terms():
    # the kernel family's conformal re-expansion cancels digits in proportion to the terms (about
    # 40 at 100 loops; common practice, no source): a series rebuilt twice as long carries twice the
    # digits, whether the spec gave the source a dps or the series carried it by default
    from resum.sources import SOURCES, rebuilder
    ctx = parse_spec(GOAL_SPEC % (10, ""), path="spec.toml").context
    for kw, digits in (({"angle": "0", "loops": 10, "dps": 40}, None), ({"angle": "0", "loops": 10}, 40)):
        rebuild = rebuilder(SOURCES["bes"], kw, 11, ctx, digits=digits)
        s = rebuild(22)
        assert s.n_terms == 22 and s.digits == 80
    assert rebuilder(SOURCES["bes"], {"angle": "0", "loops": 10}, 11, ctx)(22).digits < 80


def test_sigterm_ends_a_scan_like_ctrl_c(tmp_path):
    # SIGTERM (kill PID, a batch system's time limit) must not lose the run's bookkeeping: the
    # finished points and the summary stay, the workers end, --resume goes on. Exit code
    # 128 + 15 for a program ended by SIGTERM: common practice, no source.
    spec_path = tmp_path / "spec.toml"
    gate = tmp_path / "gate"
    # three points pass, the next two wait at the gate in their worker processes
    spec_path.write_text(spec_text([1, 2, 3, 4, 5], gate=gate, free=3))
    out = tmp_path / "o"
    env = {**os.environ, "PYTHONPATH": str(ROOT)}
    proc = subprocess.Popen([sys.executable, "-m", "resum", "scan", str(spec_path), "-o", str(out),
                             "--jobs", "2", "--no-plots"], cwd=tmp_path, env=env,
                            stdout=subprocess.PIPE, stderr=subprocess.PIPE, start_new_session=True)
    err = b""
    try:
        held = wait_until_held(gate, out / "points", free=3, waiting=2, proc=proc)
        proc.send_signal(signal.SIGTERM)
        _, err = proc.communicate(timeout=120)
    finally:
        if proc.poll() is None:
            os.killpg(proc.pid, signal.SIGKILL)
            proc.communicate()
    err = err.decode()
    assert held, "the run did not reach the gate with 3 points done"
    assert proc.returncode == 143, err
    assert "Traceback" not in err and "rerun with --resume" in err
    summary = json.loads((out / "summary.json").read_text())      # written on the way out
    before = {p.name: p.read_bytes() for p in (out / "points").glob("p*.json")}
    assert len(before) == 3 and summary["counts"]["recorded"] == len(before)
    assert not list((out / "points").glob(".*.tmp"))
    (gate / "open").touch()
    assert main([str(spec_path), "-o", str(out), "--jobs", "1", "--resume", "--no-plots", "--json"]) == 0
    after = {p.name: p.read_bytes() for p in (out / "points").glob("p*.json")}
    assert len(after) == 10 and all(after[k] == v for k, v in before.items())


@pytest.mark.parametrize("damage", ["[]", '"text"', "{}", "wrong key", "index not a number", "cut short"])
def test_resume_recomputes_a_record_that_is_not_one(tmp_path, damage, capsys):
    # a record file edited by hand or replaced: valid JSON that is no record of its point used to
    # end --resume in a TypeError traceback (or be kept under the wrong key)
    spec = parse_spec(spec_text([1, 2]), path="spec.toml")
    out = tmp_path / "o"
    run_family(spec, out, runner=SerialRunner(), quiet=True, plots=False)
    p = sorted((out / "points").glob("p*.json"))[0]
    good = json.loads(p.read_text())
    if damage == "wrong key":
        text = json.dumps({**good, "key": "p09999"})
    elif damage == "index not a number":
        text = json.dumps({**good, "index": "0"})
    elif damage == "cut short":
        text = p.read_text()[:100]
    else:
        text = damage
    p.write_text(text)
    capsys.readouterr()
    again = run_family(spec, out, runner=SerialRunner(), resume=True, quiet=True, plots=False)
    assert again.computed == (good["index"],) and again.counts["ok"] == 4
    assert json.loads(p.read_text())["key"] == p.stem
    # the replacement is said, even under quiet (it was silent)
    assert again.unreadable == (p.name,)
    err = capsys.readouterr().err
    assert "1 record file(s)" in err and p.name in err and "computed again" in err


def test_strong_leading_column_is_the_highest_power_after_the_record_is_written():
    # the fit lists its terms leading first; the record is written with sorted keys, which puts
    # "g^-1" before "g^1" (and "g^-0.05" before "g^0.95"): the leading column must still be the
    # coefficient of the highest power (plumbing, no numbers)
    import json
    from resum.batch.records import _dump, summary_rows
    from resum.estimators.strong_coupling import leading_label

    def rec(key, coeffs):
        return json.loads(_dump({"key": key, "index": 0, "tasks": {"strong": {"resummed": {
            "status": "converged", "success": True, "coefficients": dict(coeffs)}}}}))
    one = rec("a", [("g^1", {"value": "1.27", "lo": "1.26", "hi": "1.28"}),
                    ("g^0", {"value": "-0.14", "lo": "-0.15", "hi": "-0.13"}),
                    ("g^-1", {"value": "0.0004", "lo": "-0.02", "hi": "0.02"}),
                    ("g^-1 log g", {"value": "0.3", "lo": "0.2", "hi": "0.4"})])
    dec = rec("b", [("g^0.94526707", {"value": "4.79", "lo": "4.71", "hi": "4.88"}),
                    ("g^-0.054732927", {"value": "-2.53", "lo": "-2.81", "hi": "-2.24"})])
    assert next(iter(one["tasks"]["strong"]["resummed"]["coefficients"])) == "g^-1"  # the trap
    rows = summary_rows([one, dec])
    assert [r["strong_resummed_leading"] for r in rows] == ["1.27", "4.79"]
    assert leading_label(["g^-1/3", "g^1/3 log g", "g^-2/3"]) == "g^-1/3"
    assert leading_label(["x^-3/4", "x^-7/4"]) == "x^-3/4"
    assert leading_label([]) is None


def test_a_dead_point_process_says_how_it_ended(tmp_path):
    # the message said "killed, crashed or out of memory" whatever happened; an exit code
    # (here the source's os._exit(3)) points elsewhere, for example to a script without the
    # __main__ guard (common practice, no source)
    text = spec_text([2], orders=20).replace(
        'exponent = { values = ["1/2", 2] }', 'exponent = { values = ["1/2"] }\ncrash = { values = [true] }')
    spec = parse_spec(text, path="spec.toml")
    run_family(spec, tmp_path / "o", runner=ProcessRunner(jobs=1), quiet=True, plots=False)
    (rec,) = records(tmp_path / "o").values()
    assert rec["status"] == "failed" and "exit code 3" in rec["error"]["message"]
    assert "__main__" in rec["error"]["message"]


def test_a_script_without_the_main_guard_gets_a_message_that_names_it(tmp_path):
    # each point's process imports the calling script; without `if __name__ == "__main__":`
    # it would run run_family again: that process ends at once and the run stops with one
    # error naming the guard, recording nothing (common practice, no source)
    (tmp_path / "spec.toml").write_text(spec_text([2], orders=20).replace(
        'exponent = { values = ["1/2", 2] }', 'exponent = { values = ["1/2"] }'))
    (tmp_path / "script.py").write_text(
        "from resum.batch import load_spec, run_family, ProcessRunner\n"
        "run_family(load_spec('spec.toml'), 'o', runner=ProcessRunner(jobs=1), quiet=True, plots=False)\n")
    env = {**os.environ, "PYTHONPATH": os.pathsep.join([str(ROOT), os.environ.get("PYTHONPATH", "")])}
    r = subprocess.run([sys.executable, "script.py"], cwd=tmp_path, env=env, capture_output=True,
                       text=True, timeout=120)
    assert r.returncode != 0
    assert "InputError" in r.stderr and "if __name__ == \"__main__\":" in r.stderr.splitlines()[-1]
    assert not records(tmp_path / "o")
