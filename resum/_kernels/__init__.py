"""Pure numeric kernels on coefficient lists (low to high).

Kernels never print, read files, plot or set global precision; callers enter
a :class:`resum.context.Context` around them. Numbers are ``int``,
``fractions.Fraction``, mpmath ``mpf``/``mpc``, or python-flint balls where a
kernel says so.
"""
