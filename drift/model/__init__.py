"""The reference model: fitted once on a pool of seasons, then used to place any season.

In
    Prepared player-seasons of the reference pool (:mod:`drift.intake`) and
    :class:`ModelSettings`.
Out
    A fitted :class:`RoleModel` (estimator style: settings in the constructor,
    learned state in trailing-underscore attributes, plain-JSON model file), its
    placements of any season (role, distances, memberships), and the
    :class:`Alignment` of its role ids with an earlier model (Hungarian matching).

Modules: ``estimator`` (:class:`RoleModel`), ``_fitting`` (the named fit steps),
``noise`` (per-feature noise and reliability), ``_shrinkage`` (processing raw
values), ``count_rules`` (the component and role-count rules) and ``counting``
(running them on bounded samples as the settings ask), ``_membership``,
``_placement``, ``movenoise`` (a move's null covariance and its calibration),
``describe`` (role names and descriptions), ``align``, ``fileformat`` (the JSON
model file) and ``settings``.
"""

from drift.model._shrinkage import NoiseState
from drift.model.align import Alignment, align_models, relabel
from drift.model.estimator import RoleModel
from drift.model.fileformat import SCHEMA_VERSION
from drift.model.movenoise import MoveCalibration, MoveNull
from drift.model.settings import ModelSettings

__all__ = ["RoleModel", "ModelSettings", "NoiseState", "MoveNull", "MoveCalibration", "SCHEMA_VERSION",
           "Alignment", "align_models", "relabel"]
