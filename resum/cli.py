"""The ``resum`` command line: thin subcommands over the library.

Results go to stdout (or files), logs and progress to stderr. Exit codes:
0 ok, 1 some estimates failed, 2 usage or input error.
"""
from __future__ import annotations

import argparse
import importlib
import re
import signal
import sys
from typing import List, Optional

from . import __version__
from .errors import InputError

# subcommand name -> module under resum.commands
COMMANDS = {
    "tour": "tour",
    "analyze": "analyze",
    "evaluate": "evaluate",
    "strong": "strong",
    "generate": "generate",
    "scan": "family",
}


def _negative_value_pattern():
    """What a negative number or expression given as an option value looks like: '-' then a
    digit, '(', '.', or a name the coefficient parser knows (``-1/2``, ``-(1/3)``, ``-.5``,
    ``-sqrt(2)``, ``-pi/4``). argparse alone takes only plain negative numbers (``-2``,
    ``-0.5``) for values and reads the rest as unknown options."""
    from .series.expr import NAMES
    names = "|".join(re.escape(n) for n in sorted(NAMES, key=len, reverse=True))
    return re.compile(rf"-(?:[0-9(.]|(?:{names})(?![A-Za-z0-9_]))")


_NEGATIVE_VALUE = _negative_value_pattern()


class _Parser(argparse.ArgumentParser):
    last_error = None     # the last usage error (for the JSON error document of main)
    last_where = ""       # the option or argument it names ("where" of that document)

    def error(self, message):  # one line, exit 2
        line = f"{message} (see '{self.prog} --help')"
        _Parser.last_error = line
        _Parser.last_where = _usage_where(message) or self.prog
        self.exit(2, f"{self.prog}: error: {line}\n")

    def _parse_optional(self, arg_string):
        # a negative number or expression is a value, never an option (no option of ours
        # starts with '-' and a digit, '(', '.' or a function/constant name)
        if _NEGATIVE_VALUE.match(arg_string):
            return None
        return super()._parse_optional(arg_string)


def _usage_where(message: str) -> str:
    """The option or argument an argparse message names: 'argument --dps: invalid int value'
    gives '--dps', 'the following arguments are required: FILE' gives 'FILE', 'unrecognized
    arguments: --x --y' gives '--x'; '' for any other message."""
    m = re.match(r"argument ([^:]+):", message)
    if m:
        return m.group(1).strip()
    for head in ("the following arguments are required:", "unrecognized arguments:"):
        if message.startswith(head):
            rest = message[len(head):].strip()
            return rest if head.startswith("the following") else (rest.split() or [""])[0]
    return ""


def build_parser() -> argparse.ArgumentParser:
    p = _Parser(prog="resum", description="Singularity analysis and resummation of long "
                                          "perturbative series, with error bands.")
    p.add_argument("--version", action="version", version=f"resum {__version__}")
    p.commands = {}       # name -> its parser, to word an unknown option under its command
    sub = p.add_subparsers(dest="command", metavar="COMMAND", parser_class=_Parser)
    for name, modname in COMMANDS.items():
        try:
            mod = importlib.import_module(f"resum.commands.{modname}")
        except ModuleNotFoundError as exc:
            if exc.name and exc.name.startswith("resum.commands"):
                continue          # command not built yet in this checkout
            raise
        sp = sub.add_parser(name, help=mod.HELP, description=getattr(mod, "DESCRIPTION", mod.HELP))
        mod.add_arguments(sp)
        sp.set_defaults(_run=mod.run)
        p.commands[name] = sp
    return p


def _json_asked(argv) -> bool:
    """Whether ``--json`` is among the options (before a ``--`` that ends them)."""
    argv = sys.argv[1:] if argv is None else list(argv)
    if "--" in argv:
        argv = argv[:argv.index("--")]
    return "--json" in argv


def _json_error(message: str, code: int, where: str = "") -> None:
    """Under ``--json`` an error is also the one JSON document on stdout (unless the command
    already wrote its document): ``{"error": {"message", "where", "exit_code"}}``, the exit code
    a decimal string like every number of the JSON documents."""
    from .commands import _common
    if _common.json_emitted():
        return
    _common.emit_json({"error": {"message": message, "where": where, "exit_code": str(code)}})


def main(argv: Optional[List[str]] = None) -> int:
    """Run the command line with ``argv``; returns the exit code."""
    from .commands import _common
    _common.reset_json_emitted()
    as_json = _json_asked(argv)
    parser = build_parser()
    _Parser.last_error, _Parser.last_where = None, ""
    try:
        args, extra = parser.parse_known_args(argv)
        if extra:
            # refused by the command's own parser: "resum analyze: error: ... (see 'resum
            # analyze --help')", where that command's options are listed
            parser.commands.get(getattr(args, "command", None), parser).error(
                "unrecognized arguments: " + " ".join(extra))
    except SystemExit as exc:
        code = int(exc.code or 0)
        if code and as_json and _Parser.last_error:
            _json_error(_Parser.last_error, code, _Parser.last_where)
        return code
    if not getattr(args, "_run", None):
        parser.print_help(sys.stderr)
        if as_json:
            _json_error("name a command: " + ", ".join(COMMANDS), 2)
        return 2
    try:
        return int(args._run(args) or 0)
    except InputError as exc:
        print(f"resum {args.command}: error: {exc}", file=sys.stderr)
        if as_json:
            _json_error(str(exc), 2, exc.where)
        return 2
    except KeyboardInterrupt:
        code = _interrupted()
        if as_json:
            try:
                _json_error("terminated" if code == 143 else "interrupted", code)
            except (BrokenPipeError, KeyboardInterrupt):
                pass
        return code
    except BrokenPipeError:
        return 0
    except OSError as exc:
        # stdout or a file that could not be written at the last moment (a full disk, /dev/full):
        # one line, not a traceback (files are written atomically: nothing half-written is left)
        what = f" {exc.filename}" if getattr(exc, "filename", None) else " the output"
        print(f"resum {args.command}: error: cannot write{what} ({exc.strerror or exc}); free space "
              "or choose another place", file=sys.stderr)
        _silence_stdout()
        return 2


def _silence_stdout() -> None:
    """After stdout failed, drop what it still buffers so that the exit does not fail again
    (only when the program owns the process: a caller's stdout is left alone)."""
    if not _CONSOLE:
        return
    try:
        import os
        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, sys.stdout.fileno())
        os.close(devnull)
    except (OSError, ValueError, AttributeError):
        pass


_CONSOLE = False        # set by run(): main() then owns the process, not a caller's
_TERMINATED = []        # SIGTERM received (run() turns it into the path of Ctrl-C)


class Terminated(KeyboardInterrupt):
    """SIGTERM (``kill PID``, a batch system's time limit): ends a command like Ctrl-C does, so
    that a scan keeps its finished points and ends its workers (exit code 143)."""


def _on_sigterm(signum, frame):
    if not _TERMINATED:
        _TERMINATED.append(signum)
        raise Terminated()


def _interrupted() -> int:
    """Say why the command ended early; the exit code (130 Ctrl-C, 143 SIGTERM)."""
    if _CONSOLE:
        # the program ends here: a second Ctrl-C or SIGTERM must not interrupt the exit
        # (joining the threads of worker pools), which would print a traceback and leak semaphores
        signal.signal(signal.SIGINT, signal.SIG_IGN)
        signal.signal(signal.SIGTERM, signal.SIG_IGN)
    print("resum: terminated" if _TERMINATED else "resum: interrupted", file=sys.stderr)
    return 143 if _TERMINATED else 130


def run() -> None:  # console-script entry point
    global _CONSOLE
    from .parallel import allow_auto
    allow_auto()       # long analyses may use worker processes (resum.parallel)
    _CONSOLE = True
    signal.signal(signal.SIGTERM, _on_sigterm)
    code = main()
    if _TERMINATED and code == 130:     # a scan reports its interruption as 130 itself
        code = 143
    sys.exit(code)
