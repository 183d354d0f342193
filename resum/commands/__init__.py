"""Subcommands of the ``resum`` command line, one module each.

Each module defines ``HELP`` (one line), ``add_arguments(parser)`` and
``run(args) -> int`` (0 ok, 1 some estimates failed, 2 input error; input
errors are raised as :class:`resum.errors.InputError`).
"""
