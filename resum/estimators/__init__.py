"""Singularity estimators, registered under exact method names.

Each estimator is ``f(series, ctx=None, **options) -> MethodResult``.

>>> sorted(METHODS)[:3]
['conjugate-pair', 'diff-approx', 'diff-approx2']
>>> get_method("ratio").__name__
'estimate_ratio'
"""
from __future__ import annotations


from ..errors import InputError
from .diffapprox import estimate_diffapprox
from .dlog import estimate_dlog
from .pade_sing import estimate_pade
from .ratio import (estimate_conjugate_pair, estimate_large_order, estimate_ratio,
                    estimate_root_test)

__all__ = ["METHODS", "DEFAULT_METHODS", "get_method", "validate_methods"]


def _order2(series, ctx=None, **kw):
    return estimate_diffapprox(series, ctx, order=2, **kw)


_order2.__name__ = "estimate_diffapprox2"

#: method name -> estimator
METHODS = {
    "ratio": estimate_ratio,
    "root-test": estimate_root_test,
    "conjugate-pair": estimate_conjugate_pair,
    "large-order": estimate_large_order,
    "pade": estimate_pade,
    "dlog": estimate_dlog,
    "diff-approx": estimate_diffapprox,
    "diff-approx2": _order2,
}

#: methods :func:`resum.analysis.analyze` runs by default
DEFAULT_METHODS = tuple(METHODS)


def get_method(name: str):
    """The estimator registered as ``name``; InputError listing valid names otherwise."""
    try:
        return METHODS[name]
    except KeyError:
        raise InputError(f"unknown method {name!r}; valid methods: {', '.join(METHODS)}",
                         where="methods") from None


def validate_methods(methods):
    """Check a list of method names (None means :data:`DEFAULT_METHODS`)."""
    if methods is None:
        return list(DEFAULT_METHODS)
    if isinstance(methods, str):
        methods = [m.strip() for m in methods.split(",") if m.strip()]
    out = []
    for m in methods:
        get_method(m)
        if m not in out:
            out.append(m)
    if not out:
        raise InputError(f"no method given; valid methods: {', '.join(METHODS)}", where="methods")
    return out
