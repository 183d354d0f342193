"""A script that calls run_family without an ``if __name__ == "__main__":`` guard: each point's
process imports the script, which would start the family again inside it. The run stops at once
with one error naming the guard, and no point process touches the folder (behaviour of Python's
multiprocessing start methods: common practice, no source)."""
import os
import subprocess
import sys
import textwrap
from pathlib import Path

SPEC = '''[study]
name = "unguarded"
source = "catalan"
[axes]
orders = [20, 24, 28]
[tasks.analyze]
'''


def test_unguarded_script_stops_with_one_error(tmp_path):
    out = tmp_path / "run"
    script = tmp_path / "scan_it.py"
    script.write_text(textwrap.dedent(f'''
        from resum.batch import run_family, parse_spec, ProcessRunner
        from resum.errors import InputError
        print("script body ran")
        try:
            run_family(parse_spec({SPEC!r}), {str(out)!r}, runner=ProcessRunner(2), quiet=True,
                       plots=False)
        except InputError as exc:
            print("ERROR:", exc)
        '''))
    root = Path(__file__).resolve().parents[2]
    env = dict(os.environ, PYTHONPATH=str(root) + os.pathsep + os.environ.get("PYTHONPATH", ""))
    r = subprocess.run([sys.executable, str(script)], capture_output=True, text=True, timeout=120,
                       env=env, cwd=tmp_path)
    errors = [ln for ln in r.stdout.splitlines() if ln.startswith("ERROR:")]
    assert len(errors) == 1 and "__name__" in errors[0], r.stdout + r.stderr
    assert "Traceback" not in r.stderr, r.stderr
    # the caller's own run wrote its folder; no point was recorded, by it or by a nested run
    assert not list((out / "points").glob("*.json"))
