"""Series objects, coefficient expressions and file formats."""
from .core import Series, Coupling, is_exact_number

__all__ = ["Series", "Coupling", "is_exact_number"]
