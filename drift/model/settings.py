"""The reference model's settings: :class:`ModelSettings`, one validator per field (saved in the model file)."""

from __future__ import annotations

from dataclasses import dataclass, field

from drift import settings_rules as rules
from drift.settings_rules import SettingsPart

__all__ = ["ModelSettings", "NOISE_POLICIES", "COMPONENT_RULES"]

NOISE_POLICIES = rules.NOISE_POLICIES
COMPONENT_RULES = rules.COMPONENT_RULES


@dataclass(frozen=True)
class ModelSettings(SettingsPart):
    """The reference model's settings (see :class:`drift.model.RoleModel`)."""

    components: object = "variance"
    variance_threshold: float = 0.90
    roles: object = "auto"
    max_roles: int = 14
    noise_policy: str = "shrink"
    seed: int = 0
    n_init: int = rules.KMEANS_RESTARTS
    n_bootstrap: int = 20
    role_names: dict = field(default_factory=dict)

    _rules = {
        "components": rules.components, "variance_threshold": rules.fraction_closed,
        "roles": rules.roles, "max_roles": rules.count_from(2), "noise_policy": rules.noise_policy,
        "seed": rules.seed, "n_init": rules.count_from(1),
        "n_bootstrap": rules.count_from(1), "role_names": rules.text_map,
    }
