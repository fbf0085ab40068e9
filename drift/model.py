"""The reference model: fitted once on a pool of seasons, then used to place any season.

Pipeline (all constants learned on the pool only):

    features --(shrink small samples toward the pool mean)--> processed
             --(standardise, weight by reliability)--> z
             --(principal components, fixed signs)--> scores
             --(K-means)--> roles
"""

from __future__ import annotations

from dataclasses import dataclass

from .errors import ModelFileError, ModelQualityWarning, NotFittedError

__all__ = ["RoleModel", "NoiseState", "SCHEMA_VERSION"]

SCHEMA_VERSION = 1
_FITTED = "centroids_"
_DEFAULT_INTAKE = {
    "min_games": 20, "min_minutes_per_game": 10.0, "total_marker": "TOT",
    "shares_missing": "not used: 0",
    "efficiency_missing": "no sample: pool mean",
    "other_missing": "pool mean",
    "stint_rule": "games, minutes, possessions summed; features averaged with sample weights",
}


@dataclass(frozen=True)
class NoiseState:
    """Per-value sampling variance ``var``, shrinkage ``factor`` and share term ``u``, each (n, p).

    ``u`` is non-zero for play-type shares only: their noise covariance is
    -u_a u_b off the diagonal (multinomial), so a share's rise is partly
    another's fall.
    """

    var: object
    factor: object
    u: object
    base: object  # (n,) minutes or possessions of each row

    def take(self, index) -> "NoiseState":
        return NoiseState(self.var[index], self.factor[index], self.u[index], self.base[index])


class RoleModel:
    """Role groups fitted on a pooled reference set of seasons.

    Parameters
    ----------
    components : {"parallel", "elbow", "variance"}, int or float
        Rule for the number of principal components, a fixed count, or a
        fraction of variance to reach.
    variance_threshold : float
        Used by the ``"variance"`` rule.
    roles : "auto" or int
        Number of roles, or ``"auto"`` to choose it (see :mod:`drift.selection`).
    max_roles : int
        Largest k tried by ``"auto"``.
    noise_policy : {"shrink", "weight", "shrink+weight", "none"}
        How small samples are kept from dominating (see README, "Noise policy").
    seed : int
    n_init : int
        K-means restarts.
    n_bootstrap : int
        Resamples for role stability.
    role_names : dict, optional
        Role id -> name given by the user.

    Attributes
    ----------
    features_ : tuple of str, length p
    intake_ : dict
        Filters and missing-value rules the pool went through.
    noise_ : DataFrame, one row per feature (see :func:`drift.noise.fit_noise`)
    weights_ : ndarray of shape (p,)
    scaler_mean_, scaler_scale_ : ndarray of shape (p,)
    components_ : ndarray of shape (q, p)
    pca_mean_ : ndarray of shape (p,)
    explained_variance_ratio_ : ndarray of shape (q,)
    centroids_ : ndarray of shape (k, q)
        Role centres in component space.
    centroids_features_ : ndarray of shape (k, p)
        Role centres in feature units.
    role_ids_, role_names_, role_descriptions_ : list of str, length k
    role_stability_ : ndarray of shape (k,)
        Mean bootstrap Jaccard overlap of each role.
    within_var_ : float
        Pooled within-role variance per component (for membership probabilities).
    distance_q99_ : float
        99th percentile of the pool's distances to their nearest role.
    noise_calibration_ : list of two floats
        (a, b): the move noise model's covariance is multiplied by a + b x, x being
        1/m1 + 1/m2 of the two samples over its pool median ``calibration_sample_``;
        fitted on the pool's returning players ((1, 0) = as modelled).
    calibration_sample_ : float
    calibration_range_ : list of two floats
        The range of x seen in the pool; x is clipped to it.
    component_diagnostics_, role_diagnostics_ : DataFrame
    reference_seasons_ : list of str
    n_pool_ : int
    fingerprint_ : str
    """

    def __init__(self, *, components="parallel", variance_threshold=0.8, roles="auto",
                 max_roles=10, noise_policy="shrink", seed=0, n_init=10, n_bootstrap=20,
                 role_names=None):
        self.components = components
        self.variance_threshold = variance_threshold
        self.roles = roles
        self.max_roles = max_roles
        self.noise_policy = noise_policy
        self.seed = seed
        self.n_init = n_init
        self.n_bootstrap = n_bootstrap
        self.role_names = role_names

    @property
    def _shrinks(self) -> bool:
        return self.noise_policy in ("shrink", "shrink+weight")

    # ------------------------------------------------------------------ fitting
    def fit(self, pool, *, features=None, intake=None):
        """Fit on the pool's qualifying season rows.

        Parameters
        ----------
        pool : DataFrame
            One row per player-season: ``player_id``, ``season``, ``minutes``
            (and ``possessions`` if known) and the features; missing play-type
            shares already set to 0 (:func:`drift.features.fill_unused_shares`).
        features : sequence of str, optional
            Feature columns in order; default every column the intake found.
        intake : dict, optional
            The intake policy the pool went through (filters, total marker),
            saved with the model so placement applies the same rules.

        Returns
        -------
        self
        """
        import warnings

        import numpy as np

        from .describe import describe_role, name_role
        from .features import exposure_matrix, feature_spec
        from .noise import fit_noise
        from .selection import STABLE_JACCARD, choose_components, choose_roles

        names = tuple(features) if features is not None else tuple(pool.attrs.get("features", ()))
        if not names:
            raise ValueError("fit needs the feature names: pass features=[...]")
        k_min = self.roles if isinstance(self.roles, int) else 2
        if len(pool) < max(10, 3 * k_min):
            raise ValueError(f"the pool has {len(pool)} player-seasons; at least {max(10, 3 * k_min)} "
                             "are needed (add seasons with --reference or lower the filters)")
        spec = feature_spec(names)
        exposure = exposure_matrix(pool, spec)
        self.features_ = names
        self.families_ = spec.families
        self.intake_ = {**_DEFAULT_INTAKE, **(intake or {})}
        self.noise_ = fit_noise(pool, spec, exposure)
        processed, _ = self._process(pool[list(names)].to_numpy(float), exposure,
                                     _base(pool), shrink=self._shrinks)
        self.scaler_mean_ = processed.mean(axis=0)
        scale = processed.std(axis=0)
        # a feature shrunk flat (all noise) carries nothing: unit scale keeps it harmless
        flat = scale <= 1e-9 * np.maximum(1.0, np.abs(self.scaler_mean_))
        self.scaler_scale_ = np.where(flat, 1.0, scale)
        if self.noise_policy in ("weight", "shrink+weight"):
            r = self.noise_["year_to_year_r"].fillna(self.noise_["signal_share"]).to_numpy(float)
            self.weights_ = np.sqrt(np.clip(r, 0.05, 1.0))
        else:
            self.weights_ = np.ones(len(names))
        z = (processed - self.scaler_mean_) / self.scaler_scale_ * self.weights_
        q, self.component_diagnostics_ = choose_components(
            z, self.components, variance_threshold=self.variance_threshold, seed=self.seed)
        self.pca_mean_ = z.mean(axis=0)
        _, s, vt = np.linalg.svd(z - self.pca_mean_, full_matrices=False)
        # sign convention: each component's largest-magnitude loading is positive
        signs = np.sign(vt[np.arange(len(vt)), np.argmax(np.abs(vt), axis=1)])
        vt = vt * signs[:, None]
        self.components_ = vt[:q]
        ev = s ** 2 / len(z)
        self.explained_variance_ratio_ = (ev / ev.sum())[:q]
        scores = (z - self.pca_mean_) @ self.components_.T

        choice = choose_roles(scores, self.roles, max_roles=self.max_roles, seed=self.seed,
                              n_init=self.n_init, n_boot=self.n_bootstrap)
        k, km, self.role_diagnostics_ = choice.k, choice.kmeans, choice.diagnostics
        order = np.argsort(-km.cluster_centers_[:, 0], kind="stable")
        self.centroids_ = km.cluster_centers_[order]
        self.role_stability_ = choice.stability[order]
        labels = np.argsort(order)[km.labels_]
        self.within_var_ = float(km.inertia_ / (len(scores) * q))
        self.role_ids_ = [f"R{i + 1}" for i in range(k)]
        self.centroids_features_ = np.vstack(
            [processed[labels == r].mean(axis=0) for r in range(k)])
        raw_sd = self.noise_["sd"].to_numpy(float)
        raw_sd = np.where(raw_sd > 0, raw_sd, 1.0)
        z_roles = [dict(zip(names, (c - self.noise_["mean"].to_numpy(float)) / raw_sd))
                   for c in self.centroids_features_]
        self.role_descriptions_ = [describe_role(z) for z in z_roles]
        given = self.role_names or {}
        self.role_names_ = [given.get(rid, name_role(z)) for rid, z in zip(self.role_ids_, z_roles)]
        self.role_sizes_ = np.bincount(labels, minlength=k).tolist()
        self.distance_q99_ = float(np.quantile(self.distances(scores).min(axis=1), 0.99))
        self.reference_seasons_ = sorted(map(str, pool["season"].unique()))
        self.n_pool_ = int(len(pool))
        self.fingerprint_ = _fingerprint(pool, names)
        self._calibrate_noise(pool, scores, exposure)
        weak = [rid for rid, s in zip(self.role_ids_, self.role_stability_) if s < STABLE_JACCARD]
        if weak:
            warnings.warn(f"role(s) {weak} do not reproduce on resamples "
                          f"(stability < {STABLE_JACCARD}); read them with care",
                          ModelQualityWarning, stacklevel=2)
        return self

    def _process(self, values, exposure, base, *, shrink):
        """Processed features (shrunk or mean-filled), shape (n, p), and their :class:`NoiseState`."""
        import numpy as np

        from .noise import level_term

        mean = self.noise_["mean"].to_numpy(float)
        sigma2 = self.noise_["sigma2"].to_numpy(float)
        tau2 = self.noise_["tau2"].to_numpy(float)
        has = np.isfinite(values) & (exposure > 0)
        level = np.column_stack([level_term(values[:, j], exposure[:, j], fam)
                                 for j, fam in enumerate(self.families_)])
        with np.errstate(divide="ignore", invalid="ignore"):
            v = np.where(has, sigma2 * level / np.where(has, exposure, 1.0), 0.0)
            factor = np.where(has, tau2 / (tau2 + v), 0.0) if shrink else has.astype(float)
        factor = np.nan_to_num(factor, nan=1.0)
        y = np.where(has, values, mean)
        processed = mean + factor * (y - mean)
        # shares of one player's possessions are multinomial: Cov(a, b) = -u_a u_b
        is_share = np.array([f == "share" for f in self.families_])
        with np.errstate(divide="ignore", invalid="ignore"):
            p_smooth = (np.nan_to_num(values) * exposure + 0.5) / (exposure + 1.0)
            u = np.where(has & is_share, np.sqrt(sigma2 / np.where(has, exposure, 1.0)) * p_smooth, 0.0)
        return processed, NoiseState(v, factor, np.nan_to_num(u), base)

    def _calibrate_noise(self, pool, scores, exposure):
        """Fit the move-noise calibration a + b x on the pool's returning players.

        Sets ``noise_calibration_`` (a, b), ``calibration_sample_`` (the pool's median
        1/m1 + 1/m2) and ``calibration_range_`` (the x range seen; x is clipped to it,
        so the line is never extrapolated).
        """
        import numpy as np
        from scipy.stats import chi2

        from .noise import consecutive_pairs

        self.noise_calibration_, self.calibration_sample_ = [1.0, 0.0], 1.0
        self.calibration_range_ = [0.0, 1e12]  # no pool pairs: no clipping
        i1, i2 = consecutive_pairs(pool)
        if len(i1) < 30:
            return
        _, nv = self._process(pool[list(self.features_)].to_numpy(float), exposure, _base(pool),
                              shrink=self._shrinks)
        raw_x = 1 / nv.base[i1] + 1 / nv.base[i2]
        median = float(np.median(raw_x))
        x = raw_x / median
        d2 = self.move_statistic(scores[i2] - scores[i1], nv.take(i1), nv.take(i2))
        q = scores.shape[1]
        null_median = chi2.ppf(0.5 * 0.999, q)  # median of the null truncated at its 99.9th pct.
        keep = np.ones(len(d2), bool)
        a, b = 1.0, 0.0
        for _ in range(5):
            # in bins of sample size, the scale that puts the median on the null's median;
            # then a line through the bins; clear movers (beyond 99.9%) are left out
            edges = np.quantile(x[keep], np.linspace(0, 1, 6))
            which = np.clip(np.searchsorted(edges, x, side="right") - 1, 0, 4)
            xs, cs, ws = [], [], []
            for bin_ in range(5):
                sel = keep & (which == bin_)
                if sel.sum() >= 10:
                    xs.append(x[sel].mean())
                    cs.append(np.median(d2[sel]) / null_median)
                    ws.append(sel.sum())
            b, a = (np.polyfit(xs, cs, 1, w=np.sqrt(ws)) if len(xs) >= 2 and np.ptp(xs) > 0
                    else (0.0, float(np.median(d2[keep]) / null_median)))
            if min(a + b * x.min(), a + b * x.max()) <= 0:
                a, b = float(np.median(d2[keep]) / null_median), 0.0
            keep = d2 / (a + b * x) <= chi2.ppf(0.999, q)
        self.noise_calibration_ = [float(a), float(b)]
        self.calibration_sample_ = median
        self.calibration_range_ = [float(x.min()), float(x.max())]

    # ------------------------------------------------------------------ using
    def _check_fitted(self):
        if not hasattr(self, _FITTED):
            raise NotFittedError(
                f"This {type(self).__name__} instance is not fitted yet. Call 'fit' with a pool of "
                "seasons, or load a saved model with RoleModel.load(path).")

    def _matrix(self, table):

        from .features import exposure_matrix, feature_spec

        missing = [f for f in self.features_ if f not in table.columns]
        if missing:
            raise ModelFileError(
                f"the data lacks {len(missing)} feature(s) the model was fitted on: {missing}; "
                "give the same feature columns (or refit)")
        exposure = exposure_matrix(table, feature_spec(self.features_))
        return table[list(self.features_)].to_numpy(float), exposure

    def processed(self, table):
        """Processed feature values, shape (n, p), and their :class:`NoiseState`."""
        self._check_fitted()
        values, exposure = self._matrix(table)
        return self._process(values, exposure, _base(table), shrink=self._shrinks)

    def scores_from_processed(self, processed):
        """Component scores, shape (n, q), of processed feature values of shape (n, p)."""
        z = (processed - self.scaler_mean_) / self.scaler_scale_ * self.weights_
        return (z - self.pca_mean_) @ self.components_.T

    def transform(self, table):
        """Component scores of a season table, shape (n_rows, n_components)."""
        processed, _ = self.processed(table)
        return self.scores_from_processed(processed)

    def distances(self, scores):
        """Euclidean distances to every role, shape (n, k)."""
        import numpy as np

        self._check_fitted()
        return np.sqrt(((scores[:, None, :] - self.centroids_[None]) ** 2).sum(axis=2))

    def predict(self, table):
        """Nearest role id of every row, shape (n_rows,)."""
        import numpy as np

        return np.asarray(self.role_ids_)[self.distances(self.transform(table)).argmin(axis=1)]

    def score_noise_cov(self, feature_var):
        """Covariance in component space, shape (n, q, q), of independent feature noise (n, p)."""
        import numpy as np

        load = self.components_ * (self.weights_ / self.scaler_scale_)  # (q, p)
        return np.einsum("qp,np,rp->nqr", load, feature_var, load)

    def move_feature_var(self, noise_from, noise_to):
        """Null variance of each processed feature's change between two placements, shape (n, p).

        Var = B1^2 v1 + B2^2 v2 + (B2 - B1)^2 tau2 + B1 B2 drift: the sampling noise of
        both, the change that unequal shrinkage alone makes for a player away from
        the mean, and the typical true yearly change of a returning player.
        """
        b1, b2 = noise_from.factor, noise_to.factor
        tau2 = self.noise_["tau2"].to_numpy(float)
        drift = self.noise_["drift_var"].to_numpy(float)
        return (b1 ** 2 * noise_from.var + b2 ** 2 * noise_to.var
                + (b2 - b1) ** 2 * tau2 + b1 * b2 * drift)

    def move_cov(self, noise_from, noise_to):
        """Null covariance of moves in component space, shape (n, q, q), calibrated on the pool."""
        import numpy as np

        load = self.components_ * (self.weights_ / self.scaler_scale_)  # (q, p)
        cov = self.score_noise_cov(self.move_feature_var(noise_from, noise_to))
        for state in (noise_from, noise_to):
            u = state.factor * state.u
            lu = u @ load.T  # (n, q)
            cov = cov + self.score_noise_cov(u ** 2) - lu[:, :, None] * lu[:, None, :]
        a, b = self.noise_calibration_
        x = (1 / noise_from.base + 1 / noise_to.base) / self.calibration_sample_
        x = np.clip(x, *self.calibration_range_)
        return (a + b * x)[:, None, None] * cov

    def move_statistic(self, delta, noise_from, noise_to):
        """Squared Mahalanobis length of moves (n, q) under the null: chi-square with q d.o.f."""
        import numpy as np

        cov = self.move_cov(noise_from, noise_to)
        cov = cov + np.eye(cov.shape[1])[None] * 1e-9
        solved = np.linalg.solve(cov, delta[..., None])[..., 0]
        return (delta * solved).sum(axis=1)

    def place(self, table):
        """Place season rows: see :func:`drift.place.place`."""
        from .place import place

        return place(self, table)

    # ------------------------------------------------------------------ files
    def to_dict(self) -> dict:
        """Everything needed to place new data, as plain JSON types."""
        import sklearn
        import numpy as np
        import scipy

        from . import __version__

        self._check_fitted()
        arr = lambda a: np.asarray(a, float).tolist()  # noqa: E731
        return {
            "schema": "drift-role-model", "schema_version": SCHEMA_VERSION,
            "drift_version": __version__,
            "library_versions": {"numpy": np.__version__, "scikit-learn": sklearn.__version__,
                                 "scipy": scipy.__version__},
            "settings": {"components": self.components, "variance_threshold": self.variance_threshold,
                         "roles": self.roles, "max_roles": self.max_roles,
                         "noise_policy": self.noise_policy, "seed": self.seed,
                         "n_init": self.n_init, "n_bootstrap": self.n_bootstrap,
                         "role_names": dict(self.role_names or {})},
            "features": list(self.features_), "families": list(self.families_),
            "intake": dict(self.intake_),
            "noise": {c: v.tolist() for c, v in self.noise_.reset_index().items()},
            "weights": arr(self.weights_), "scaler_mean": arr(self.scaler_mean_),
            "scaler_scale": arr(self.scaler_scale_), "pca_mean": arr(self.pca_mean_),
            "components": arr(self.components_),
            "explained_variance_ratio": arr(self.explained_variance_ratio_),
            "roles": [{"id": i, "name": n, "description": d, "stability": float(s), "size": int(z),
                       "centroid_components": arr(c), "centroid_features": arr(cf)}
                      for i, n, d, s, z, c, cf in zip(
                          self.role_ids_, self.role_names_, self.role_descriptions_,
                          self.role_stability_, self.role_sizes_, self.centroids_,
                          self.centroids_features_)],
            "within_var": self.within_var_, "distance_q99": self.distance_q99_,
            "noise_calibration": list(self.noise_calibration_),
            "calibration_sample": self.calibration_sample_,
            "calibration_range": list(self.calibration_range_),
            "component_diagnostics": _records(self.component_diagnostics_),
            "role_diagnostics": _records(self.role_diagnostics_),
            "reference_seasons": list(self.reference_seasons_), "n_pool": self.n_pool_,
            "fingerprint": self.fingerprint_,
        }

    @classmethod
    def from_dict(cls, data: dict, *, source="model") -> "RoleModel":
        """Rebuild a fitted model from :meth:`to_dict` output, validating it."""
        import numpy as np
        import pandas as pd

        if not isinstance(data, dict) or data.get("schema") != "drift-role-model":
            raise ModelFileError(f"{source}: not a drift model file (no 'schema': 'drift-role-model')")
        if data.get("schema_version") != SCHEMA_VERSION:
            raise ModelFileError(
                f"{source}: schema_version {data.get('schema_version')!r} is not supported "
                f"(this drift reads {SCHEMA_VERSION}); refit with this version")
        try:
            s = data["settings"]
            model = cls(components=s["components"], variance_threshold=s["variance_threshold"],
                        roles=s["roles"], max_roles=s["max_roles"], noise_policy=s["noise_policy"],
                        seed=s["seed"], n_init=s["n_init"], n_bootstrap=s["n_bootstrap"],
                        role_names=s["role_names"])
            p = len(data["features"])
            model.features_ = tuple(data["features"])
            model.families_ = tuple(data["families"])
            model.intake_ = dict(data["intake"])
            noise = pd.DataFrame(data["noise"]).set_index("feature")
            model.noise_ = noise
            for col in model.noise_.columns:
                if col in ("n_pairs", "missing"):
                    model.noise_[col] = model.noise_[col].astype(int)
                elif col != "family":
                    model.noise_[col] = model.noise_[col].astype(float)
            model.weights_ = np.asarray(data["weights"], float)
            model.scaler_mean_ = np.asarray(data["scaler_mean"], float)
            model.scaler_scale_ = np.asarray(data["scaler_scale"], float)
            model.pca_mean_ = np.asarray(data["pca_mean"], float)
            model.components_ = np.asarray(data["components"], float).reshape(-1, p)
            model.explained_variance_ratio_ = np.asarray(data["explained_variance_ratio"], float)
            roles = data["roles"]
            model.role_ids_ = [r["id"] for r in roles]
            model.role_names_ = [r["name"] for r in roles]
            model.role_descriptions_ = [r["description"] for r in roles]
            model.role_stability_ = np.asarray([r["stability"] for r in roles], float)
            model.role_sizes_ = [int(r["size"]) for r in roles]
            model.centroids_features_ = np.asarray([r["centroid_features"] for r in roles], float)
            model.within_var_ = float(data["within_var"])
            model.distance_q99_ = float(data["distance_q99"])
            model.noise_calibration_ = [float(v) for v in data["noise_calibration"]]
            model.calibration_sample_ = float(data["calibration_sample"])
            model.calibration_range_ = [float(v) for v in data["calibration_range"]]
            model.component_diagnostics_ = pd.DataFrame(data["component_diagnostics"])
            model.role_diagnostics_ = pd.DataFrame(data["role_diagnostics"])
            model.reference_seasons_ = list(data["reference_seasons"])
            model.n_pool_ = int(data["n_pool"])
            model.fingerprint_ = data["fingerprint"]
            model.centroids_ = np.asarray([r["centroid_components"] for r in roles], float)
        except (KeyError, TypeError, ValueError) as exc:
            raise ModelFileError(f"{source}: model file is incomplete or malformed ({exc!r}); "
                                 "refit and save it again") from None
        shapes_ok = (len(model.noise_) == p and model.weights_.shape == (p,)
                     and model.centroids_.shape[1:] == (model.components_.shape[0],)
                     and list(model.noise_.index) == list(model.features_))
        if not shapes_ok:
            raise ModelFileError(f"{source}: model arrays do not agree in shape; refit and save again")
        return model

    def save(self, path):
        """Write the model as JSON."""
        import json
        from pathlib import Path

        text = json.dumps(_plain(self.to_dict()), indent=1, allow_nan=False)
        Path(path).write_text(text + "\n", encoding="utf-8")

    @classmethod
    def load(cls, path) -> "RoleModel":
        """Read a model written by :meth:`save`."""
        import json
        from pathlib import Path

        path = Path(path)
        try:
            data = json.loads(path.read_text(encoding="utf-8"))
        except FileNotFoundError:
            raise ModelFileError(f"{path}: model file not found") from None
        except (json.JSONDecodeError, UnicodeDecodeError) as exc:
            raise ModelFileError(f"{path}: not valid JSON ({exc}); the file is broken, refit") from None
        return cls.from_dict(data, source=str(path))

    def check_features(self, features):
        """Refuse data whose feature columns differ from the model's, listing both sides."""
        features = list(features)
        missing = [f for f in self.features_ if f not in features]
        unexpected = [f for f in features if f not in self.features_]
        if missing or unexpected:
            raise ModelFileError(
                f"the data does not match the model: missing features {missing}, unexpected "
                f"features {unexpected}; give the model's feature columns (drop extras with "
                "[intake] exclude in the config) or fit a new model")


def _base(table):
    """Sample size of each row: possessions when every row has them, else minutes."""
    import numpy as np

    if "possessions" in table.columns and table["possessions"].notna().all():
        return np.maximum(table["possessions"].to_numpy(float), 1.0)
    return np.maximum(table["minutes"].to_numpy(float), 1.0)


def _plain(obj):
    """JSON-ready copy: NaN and infinities become null (strict JSON has neither)."""
    import math

    if isinstance(obj, dict):
        return {k: _plain(v) for k, v in obj.items()}
    if isinstance(obj, (list, tuple)):
        return [_plain(v) for v in obj]
    if isinstance(obj, float) and not math.isfinite(obj):
        return None
    return obj


def _records(frame):
    import numpy as np

    return [{k: (v.item() if isinstance(v, np.generic) else v) for k, v in row.items()}
            for row in frame.to_dict(orient="records")]


def _fingerprint(pool, names) -> str:
    import hashlib

    import numpy as np

    h = hashlib.sha256()
    order = np.lexsort((pool["player_id"].astype(str).to_numpy(), pool["season"].astype(str).to_numpy()))
    h.update("|".join(pool["player_id"].astype(str).to_numpy()[order]).encode())
    h.update("|".join(names).encode())
    h.update(np.ascontiguousarray(np.nan_to_num(pool[list(names)].to_numpy(float)[order])).tobytes())
    return h.hexdigest()[:16]
