"""resum: high-precision resummation and singularity analysis of long series.

Public entry points: :func:`analyze` (radius, singularities, growth, with bands),
:func:`evaluate` (resummed values with bands), :func:`probe_strong_coupling`,
:func:`read_series` / :func:`write_series`, and the built-in sources in
:mod:`resum.sources` (``get_source("bes").build(ctx, angle=..., loops=...)``).
"""
from ._version import __version__
from .context import Context, DEFAULT
from .results import Estimate, Status, Singularity, Provenance, MethodResult
from .series import Series, Coupling
from .series.io import read_series, write_series
from .analysis import analyze, AnalysisResult
from .resummation import evaluate, probe_strong_coupling, EvaluationResult

__all__ = ["__version__", "Context", "DEFAULT", "Estimate", "Status", "Singularity",
           "Provenance", "MethodResult", "Series", "Coupling", "read_series", "write_series",
           "analyze", "AnalysisResult", "evaluate", "EvaluationResult", "probe_strong_coupling"]
