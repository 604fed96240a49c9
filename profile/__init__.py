"""Files and geometry: read alignments and grade profiles, sample them into stations.

Knows nothing of concrete or soil.
"""

from .sampling import WallStations, sample_wall
from .stationing import format_station, parse_station

__all__ = ["WallStations", "format_station", "parse_station", "sample_wall"]
