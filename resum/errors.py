"""Errors for invalid input.

:class:`InputError` is raised for anything the user can fix (malformed file,
unknown option, too few terms, precision too low). Its message is one line
that names the file, line or field and says what to do; the command line
prints it without a traceback and exits with code 2.
"""
from __future__ import annotations


class InputError(ValueError):
    """Invalid input; ``str(err)`` is a one-line message for the user."""

    def __init__(self, message: str, *, where: str = ""):
        self.where = where
        self.bare = message
        super().__init__(f"{where}: {message}" if where else message)

    def at(self, where: str) -> "InputError":
        """The same error located more precisely (prefixes ``where``)."""
        loc = f"{where}: {self.where}" if self.where else where
        return InputError(self.bare, where=loc)


class InputTypeError(InputError, TypeError):
    """An :class:`InputError` for an argument of the wrong type; also a ``TypeError``, so code
    that catches the type error Python would raise keeps working."""


def check_flag(value, where: str) -> bool:
    """``value`` if it is a bool (or numpy's), else an :class:`InputTypeError` naming ``where``: a
    text such as ``"no"`` is true to Python and would turn the option on."""
    t = type(value)
    if isinstance(value, bool) or (t.__module__ == "numpy" and t.__name__ in ("bool", "bool_")):
        return bool(value)
    raise InputTypeError(f"must be True or False, got {value!r}", where=where)
