"""Transforms of series: Borel(-Le Roy) and conformal maps of cut planes onto the disk."""
from .conformal import ArcMap, ConformalMap, PairMap, RayMap, StarMap, choose_map, pull_back, rim_factor

__all__ = ["ArcMap", "ConformalMap", "PairMap", "RayMap", "StarMap", "choose_map", "pull_back", "rim_factor"]
