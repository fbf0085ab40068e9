"""The reference model, in four modules (see DEVELOPERS.md, "Map of the modules").

* :mod:`.estimator` -- :class:`RoleModel`: settings, ``fit`` as named steps, placement maths;
* :mod:`.shrinkage` -- processing raw values: a pure function over the noise table;
* :mod:`.movenoise` -- the null covariance of a move and its calibration;
* :mod:`.fileformat` -- the JSON model file: schema version, field table, checks.
"""

from .estimator import RoleModel
from .fileformat import SCHEMA_VERSION
from .movenoise import MoveCalibration, MoveNull
from .shrinkage import NoiseState

__all__ = ["RoleModel", "NoiseState", "MoveNull", "MoveCalibration", "SCHEMA_VERSION"]
