"""resum: high-precision resummation and singularity analysis of long series."""
from ._version import __version__
from .context import Context, DEFAULT
from .results import Estimate, Status, Singularity, Provenance, MethodResult
from .series import Series, Coupling

__all__ = ["__version__", "Context", "DEFAULT", "Estimate", "Status", "Singularity",
           "Provenance", "MethodResult", "Series", "Coupling"]
