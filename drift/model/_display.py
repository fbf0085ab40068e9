"""How a :class:`~drift.model.RoleModel` shows itself: one line, a short terminal text, a notebook table.

Mixed into the estimator so it stays about fitting and placing. Nothing here computes: it only
reads the learned attributes (roles with names, sizes and stability, the pool, the components).
"""

from __future__ import annotations

__all__ = ["DisplayMethods"]


class DisplayMethods:
    """``summary()``, ``__repr__`` and ``_repr_html_`` of a fitted or unfitted model."""

    def _is_fitted(self) -> bool:
        return hasattr(self, "centroids_")

    def summary(self) -> str:
        """One line: roles, the pool they were fitted on, components and features."""
        if not self._is_fitted():
            return (f"not fitted (roles={self.roles}, components={self.components}, "
                    f"noise_policy={self.noise_policy})")
        seasons = list(self.reference_seasons_)
        span = f"{seasons[0]} to {seasons[-1]}" if len(seasons) > 1 else seasons[0]
        return (f"{len(self.role_ids_)} roles fitted on {self.n_pool_:,} player-seasons of "
                f"{len(seasons)} season(s) ({span}); {self.components_.shape[0]} components of "
                f"{len(self.features_)} features")

    def _weak_roles(self) -> list:
        from drift.constants import STABLE_JACCARD

        return [f"role {rid} ({name}) does not reproduce on resamples (stability {s:.2f} < {STABLE_JACCARD}); "
                "read it with care"
                for rid, name, s in zip(self.role_ids_, self.role_names_, self.role_stability_)
                if s < STABLE_JACCARD]

    def __repr__(self) -> str:
        from drift.messages import text_summary

        if not self._is_fitted():
            return text_summary("RoleModel", self.summary())
        roles = ", ".join(f"{rid} {name} ({int(n):,})"
                          for rid, name, n in zip(self.role_ids_, self.role_names_, self.role_sizes_))
        weak = self._weak_roles()
        return text_summary("RoleModel", self.summary(),
                            parts=[("roles", roles), ("warnings", f"{len(weak)}: {weak[0]}" if weak else "none")])

    def _repr_html_(self) -> str:
        from drift.messages import html_summary

        if not self._is_fitted():
            return html_summary("drift RoleModel", self.summary())
        rows = [(rid, name, int(n), f"{s:.2f}", desc) for rid, name, n, s, desc in zip(
            self.role_ids_, self.role_names_, self.role_sizes_, self.role_stability_, self.role_descriptions_)]
        return html_summary("drift RoleModel", self.summary(),
                            tables=[("Roles (size: player-seasons of the pool)",
                                     ("role", "name", "size", "stability", "profile"), rows)],
                            lists=[("Warnings", self._weak_roles())])
