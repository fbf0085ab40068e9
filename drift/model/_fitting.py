"""The named steps of :meth:`RoleModel.fit`, in the order they run.

Each step learns one group of trailing-underscore attributes from the pool;
:class:`FittingSteps` is mixed into :class:`drift.model.RoleModel` only to keep
the estimator's file short.
"""

from __future__ import annotations

from drift.errors import InputError, ModelQualityWarning

__all__ = ["FittingSteps"]


class FittingSteps:
    """Fitting steps of the reference model (see :meth:`drift.model.RoleModel.fit`)."""

    def _checked_settings(self):
        from drift.errors import ConfigError

        try:
            return self.settings
        except ConfigError as exc:
            raise ConfigError(f"RoleModel setting {exc}") from None

    def _check_pool(self, pool, names):
        if not names:
            raise InputError("fit needs the feature names: pass features=[...]")
        k_min = self.roles if isinstance(self.roles, int) else 2
        need = max(10, 3 * k_min)
        if len(pool) < need:
            raise InputError(f"the pool has {len(pool)} player-seasons; at least {need} are needed "
                             "(add seasons with --reference or lower the filters)")

    def _fit_noise(self, pool):
        """Noise table of every feature, then the pool's processed values and their noise state."""
        from drift.intake.features import exposure_matrix, feature_spec
        from drift.model.noise import fit_noise

        spec = feature_spec(self.features_)
        self.families_ = spec.families
        exposure = exposure_matrix(pool, spec)
        self.noise_ = fit_noise(pool, spec, exposure)
        self._warn_unreliable()
        return self._process(pool[list(self.features_)].to_numpy(float), exposure, pool)

    def _fit_scaler(self, processed):
        """Standardise on the pool and weight by reliability; returns the pool's z, (n, p)."""
        import numpy as np
        from sklearn.preprocessing import StandardScaler

        from drift.intake.features import safe_scale

        scaler = StandardScaler().fit(processed)
        self.scaler_mean_ = scaler.mean_
        # shrunk features keep the pool's raw scale, so a noisy feature pulled toward its mean
        # keeps only its reliable share of the variance; re-standardising would undo that
        keep_raw = self.noise_policy in ("shrink", "shrink+weight")
        spread = self.noise_["sd"].to_numpy(float) if keep_raw else scaler.scale_
        # a feature shrunk flat (all noise) carries nothing: unit scale keeps it harmless
        self.scaler_scale_ = safe_scale(spread, scaler.mean_)
        if self.noise_policy in ("weight", "shrink+weight"):
            r = self.noise_["year_to_year_r"].fillna(self.noise_["signal_share"]).to_numpy(float)
            self.weights_ = np.sqrt(np.clip(r, 0.05, 1.0))
        else:
            self.weights_ = np.ones(len(self.features_))
        return (processed - self.scaler_mean_) / self.scaler_scale_ * self.weights_

    def _fit_components(self, z):
        """Principal components with the sign rule; returns the pool's scores, (n, q)."""
        import numpy as np
        from sklearn.decomposition import PCA

        from drift.model.counting import select_components

        q, self.component_diagnostics_ = select_components(
            z, self.components, variance_threshold=self.variance_threshold, seed=self.seed)
        pca = PCA(svd_solver="full").fit(z)  # every component: the ratios are of the total
        self.pca_mean_ = pca.mean_
        # sign convention: each component's largest-magnitude loading is positive (recent
        # scikit-learn flips signs the same way; applied here so every version agrees)
        vt = pca.components_
        signs = np.sign(vt[np.arange(len(vt)), np.argmax(np.abs(vt), axis=1)])
        vt = vt * signs[:, None]
        self.components_ = np.ascontiguousarray(vt[:q])  # the layout a loaded model has
        ev = pca.singular_values_ ** 2 / len(z)
        self.explained_variance_ratio_ = (ev / ev.sum())[:q]
        return (z - self.pca_mean_) @ self.components_.T

    def _fit_roles(self, scores, processed, settings):
        """K-means roles ordered by their first component; returns the pool's role positions."""
        import numpy as np

        from drift.constants import role_id
        from drift.model.counting import select_roles

        choice = select_roles(scores, self.roles, max_roles=self.max_roles, seed=self.seed,
                              n_init=self.n_init, n_boot=self.n_bootstrap)
        k, km, self.role_diagnostics_ = choice.k, choice.kmeans, choice.diagnostics
        order = np.argsort(-km.cluster_centers_[:, 0], kind="stable")
        self.centroids_ = km.cluster_centers_[order]
        self.role_stability_ = choice.stability[order]
        labels = np.argsort(order)[km.labels_]
        self.within_var_ = float(km.inertia_ / (len(scores) * scores.shape[1]))
        self.role_ids_ = [role_id(i) for i in range(k)]
        self.centroids_features_ = np.vstack(
            [processed[labels == r].mean(axis=0) for r in range(k)])
        self.role_sizes_ = np.bincount(labels, minlength=k).tolist()
        self._describe_roles(settings.role_names)
        return labels

    def _fit_membership(self, scores, labels, state):
        """Within-role covariance of true styles: the pool's scatter less its placement noise."""
        from drift.model._membership import placement_cov, true_within_cov
        from drift.model.counting import MEMBERSHIP_ROWS, subsample

        noise = placement_cov(self.loadings(), state)
        # a q x q covariance is pinned down by a bounded seeded sample; larger pools only cost time
        idx = subsample(len(scores), MEMBERSHIP_ROWS, self.seed)
        if idx is not None:
            scores, labels, noise = scores[idx], labels[idx], noise[idx]
        self.within_cov_ = true_within_cov(scores, labels, self.centroids_, noise)

    def _describe_roles(self, given):
        from drift.model.describe import describe_role, name_roles

        sd_units = self.in_pool_sd(self.centroids_features_)
        z_roles = [dict(zip(self.features_, row)) for row in sd_units]
        self.role_descriptions_ = [describe_role(z) for z in z_roles]
        self.role_names_ = name_roles(z_roles, given=[given.get(rid) for rid in self.role_ids_])

    def _fit_reference(self, pool, scores):
        import numpy as np

        self.distance_q99_ = float(np.quantile(self.distances(scores).min(axis=1), 0.99))
        self.reference_seasons_ = sorted(map(str, pool["season"].unique()))
        self.n_pool_ = int(len(pool))
        self.fingerprint_ = _fingerprint(pool, self.features_)

    def _calibrate_moves(self, pool, scores, state):
        """Fit the move-noise calibration on the pool's returning players (see :mod:`.movenoise`)."""
        from drift.model.movenoise import MoveCalibration, MoveNull, fit_calibration, null_in_blocks
        from drift.model.noise import consecutive_pairs

        i1, i2 = consecutive_pairs(pool)
        calibration = MoveCalibration()
        if len(i1) >= 30:
            def null(nf, nt):
                return MoveNull.between(self.loadings(), self.noise_, nf, nt)
            d2, _ = null_in_blocks(null, state.take(i1), state.take(i2), scores[i2] - scores[i1])
            raw_x = 1 / state.base[i1] + 1 / state.base[i2]
            calibration = fit_calibration(d2, raw_x, scores.shape[1])
        self.noise_calibration_ = [calibration.a, calibration.b]
        self.null_df_ = calibration.df
        self.calibration_sample_ = calibration.sample
        self.calibration_range_ = [calibration.low, calibration.high]

    def _warn_unreliable(self):
        """Name the features whose measured signal share is near zero (they are shrunk nearly flat)."""
        import warnings

        from drift.errors import UnreliableFeatureWarning
        from drift.model.noise import LOW_SIGNAL_SHARE, low_signal_features

        low = low_signal_features(self.noise_)
        if low:
            listed = ", ".join(f"{f} (signal share {self.noise_.loc[f, 'signal_share']:.2f}, year-to-year r "
                               f"{self.noise_.loc[f, 'year_to_year_r']:.2f})" for f in low)
            warnings.warn(f"{len(low)} feature(s) carry almost no signal that persists from season to season "
                          f"(measured signal share below {LOW_SIGNAL_SHARE:g}) and were down-weighted to near "
                          f"zero: {listed}; check each is the column its name says (give its sample with "
                          "[intake.read]) or leave it out with [intake] exclude", UnreliableFeatureWarning,
                          stacklevel=4)

    def _warn_unstable(self):
        import warnings

        from drift.constants import STABLE_JACCARD

        weak = [rid for rid, s in zip(self.role_ids_, self.role_stability_) if s < STABLE_JACCARD]
        if weak:
            warnings.warn(f"role(s) {weak} do not reproduce on resamples "
                          f"(stability < {STABLE_JACCARD}); read them with care",
                          ModelQualityWarning, stacklevel=3)


def _fingerprint(pool, names) -> str:
    import hashlib

    import numpy as np

    h = hashlib.sha256()
    order = np.lexsort((pool["player_id"].astype(str).to_numpy(), pool["season"].astype(str).to_numpy()))
    h.update("|".join(pool["player_id"].astype(str).to_numpy()[order]).encode())
    h.update("|".join(names).encode())
    h.update(np.ascontiguousarray(np.nan_to_num(pool[list(names)].to_numpy(float)[order])).tobytes())
    return h.hexdigest()[:16]
