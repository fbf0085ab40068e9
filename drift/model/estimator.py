"""The reference model: fitted once on a pool of seasons, then used to place any season.

Pipeline (all constants learned on the pool only):

    features --(shrink small samples toward the pool mean)--> processed
             --(standardise, weight by reliability)--> z
             --(principal components, fixed signs)--> scores
             --(K-means)--> roles
"""

from __future__ import annotations

from drift.errors import ModelFileError, NotFittedError
from drift.model._display import DisplayMethods
from drift.model._fitting import FittingSteps
from drift.model.fileformat import FileMethods
from drift.model.settings import ModelSettings

__all__ = ["RoleModel"]

_FITTED = "centroids_"
def fitted(method):
    """Decorator: the one fitted-check of every public method that uses learned state."""
    import functools

    @functools.wraps(method)
    def checked(self, *args, **kwargs):
        self._check_fitted()
        return method(self, *args, **kwargs)

    return checked


#: the one home of every default: the settings part (the constructor reads its defaults from it)
_DEFAULTS = ModelSettings()
_SETTINGS = ("components", "variance_threshold", "roles", "max_roles", "noise_policy", "seed",
             "n_init", "n_bootstrap", "role_names")


class RoleModel(FittingSteps, FileMethods, DisplayMethods):
    """Role groups fitted on a pooled reference set of seasons.

    Parameters
    ----------
    components : {"parallel", "elbow", "variance"}, int or float
        Rule for the number of principal components, a fixed count, or a
        fraction of variance to reach.
    variance_threshold : float
        Used by the ``"variance"`` rule.
    roles : "auto" or int
        Number of roles (>= 2), or ``"auto"`` to choose it (see :mod:`drift.model.count_rules`).
    max_roles : int
        Largest k tried by ``"auto"``.
    noise_policy : {"shrink", "weight", "shrink+weight", "none"}
        How small samples are kept from dominating (see docs/method.md, "Noise policy").
    seed : int
    n_init : int
        K-means restarts.
    n_bootstrap : int
        Resamples for role stability.
    role_names : dict, optional
        Role id -> name given by the user.

    Settings are checked by :class:`drift.config.ModelSettings` when ``fit`` starts.

    Attributes
    ----------
    features_ : tuple of str, length p
    families_ : tuple of str, length p
    intake_ : IntakePolicy
        Filters and total marker the pool went through.
    noise_ : DataFrame, one row per feature (see :func:`drift.model.noise.fit_noise`)
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
    role_sizes_ : list of int, length k
    role_stability_ : ndarray of shape (k,)
        Mean bootstrap Jaccard overlap of each role.
    within_var_ : float
        Pooled within-role variance per component.
    within_cov_ : ndarray of shape (q, q)
        Within-role covariance of true styles (for membership probabilities).
    distance_q99_ : float
        99th percentile of the pool's distances to their nearest role.
    noise_calibration_ : list of two floats
        (a, b): the move noise model's covariance is multiplied by a + b x, x being
        1/m1 + 1/m2 of the two samples over its pool median ``calibration_sample_``;
        fitted on the pool's returning players ((1, 0) = as modelled).
    calibration_sample_ : float
    null_df_ : float
        Tail of the move null: d2 / q is F(q, null_df_) (1e6 = chi-square).
    calibration_range_ : list of two floats
        The range of x seen in the pool; x is clipped to it.
    component_diagnostics_, role_diagnostics_ : DataFrame
    reference_seasons_ : list of str
    n_pool_ : int
    fingerprint_ : str
    """

    def __init__(self, *, components=_DEFAULTS.components, variance_threshold=_DEFAULTS.variance_threshold,
                 roles=_DEFAULTS.roles, max_roles=_DEFAULTS.max_roles, noise_policy=_DEFAULTS.noise_policy,
                 seed=_DEFAULTS.seed, n_init=_DEFAULTS.n_init, n_bootstrap=_DEFAULTS.n_bootstrap, role_names=None):
        self.components = components
        self.variance_threshold = variance_threshold
        self.roles = roles
        self.max_roles = max_roles
        self.noise_policy = noise_policy
        self.seed = seed
        self.n_init = n_init
        self.n_bootstrap = n_bootstrap
        self.role_names = role_names

    @classmethod
    def from_settings(cls, settings) -> "RoleModel":
        """An unfitted model with the settings of a :class:`drift.config.ModelSettings`."""
        return cls(**{name: getattr(settings, name) for name in _SETTINGS})

    @property
    def settings(self):
        """The settings as a validated :class:`drift.config.ModelSettings`."""
        values = {name: getattr(self, name) for name in _SETTINGS}
        values["role_names"] = dict(values["role_names"] or {})
        return ModelSettings(**values)

    @property
    def _shrinks(self) -> bool:
        return self.noise_policy in ("shrink", "shrink+weight", "shrink+restandardise")

    # ------------------------------------------------------------------ fitting
    def fit(self, pool, *, features, intake=None):
        """Fit on the pool's qualifying season rows.

        Parameters
        ----------
        pool : DataFrame
            One row per player-season: ``player_id``, ``season``, ``minutes``
            (and ``possessions`` if known) and the features; missing play-type
            shares already set to 0 (:func:`drift.intake.features.fill_unused_shares`).
        features : sequence of str
            Feature columns in order.
        intake : IntakePolicy, optional
            The intake policy the pool went through (filters, total marker),
            saved with the model so placement applies the same rules.

        Returns
        -------
        self
        """
        from drift.intake.policy import IntakePolicy

        settings = self._checked_settings()
        names = tuple(features)
        self._check_pool(pool, names)
        self.features_ = names
        self.intake_ = intake if intake is not None else IntakePolicy()
        processed, state = self._fit_noise(pool)
        z = self._fit_scaler(processed)
        scores = self._fit_components(z)
        labels = self._fit_roles(scores, processed, settings)
        self._fit_membership(scores, labels, state)
        self._fit_reference(pool, scores)
        self._calibrate_moves(pool, scores, state)
        self._warn_unstable()
        return self

    def _process(self, values, exposure, table):
        import numpy as np

        from drift.model._shrinkage import process

        # the move calibration's sample size: minutes (rates settle with time on the floor)
        base = np.maximum(table["minutes"].to_numpy(float), 1.0)
        return process(values, exposure, base, self.noise_, self.families_, shrink=self._shrinks)

    # ------------------------------------------------------------------ using
    def _check_fitted(self):
        if not hasattr(self, _FITTED):
            raise NotFittedError(
                f"This {type(self).__name__} instance is not fitted yet. Call 'fit' with a pool of "
                "seasons, or load a saved model with RoleModel.load(path).")

    @fitted
    def processed(self, table):
        """Processed feature values, shape (n, p), and their :class:`NoiseState`."""
        from drift.intake.features import exposure_matrix, feature_spec

        missing = [f for f in self.features_ if f not in table.columns]
        if missing:
            raise ModelFileError(
                f"the data lacks {len(missing)} feature(s) the model was fitted on: {missing}; "
                "give the same feature columns (or refit)")
        exposure = exposure_matrix(table, feature_spec(self.features_))
        return self._process(table[list(self.features_)].to_numpy(float), exposure, table)

    @fitted
    def loadings(self):
        """Component scores per unit of each processed feature, shape (q, p)."""
        return self.components_ * (self.weights_ / self.scaler_scale_)

    @fitted
    def in_pool_sd(self, values):
        """Feature values (n, p) as pool standard deviations from the pool mean."""
        from drift.intake.features import safe_scale

        noise = self.noise_
        sd = safe_scale(noise["sd"].to_numpy(float))
        return (values - noise["mean"].to_numpy(float)) / sd

    @fitted
    def scores_from_processed(self, processed):
        """Component scores, shape (n, q), of processed feature values of shape (n, p)."""
        z = (processed - self.scaler_mean_) / self.scaler_scale_ * self.weights_
        return (z - self.pca_mean_) @ self.components_.T

    @fitted
    def transform(self, table):
        """Component scores of a season table, shape (n_rows, n_components)."""
        processed, _ = self.processed(table)
        return self.scores_from_processed(processed)

    @fitted
    def distances(self, scores):
        """Euclidean distances to every role, shape (n, k)."""
        from scipy.spatial.distance import cdist

        return cdist(scores, self.centroids_)

    @fitted
    def memberships(self, scores, state=None):
        """Membership probabilities (n, k) of placements ``scores`` with noise ``state``.

        Posterior of Gaussian roles with the true within-role covariance plus the
        placement's own sampling noise (see :mod:`.membership`); without a state
        the placements are taken as exact.
        """
        from drift.model._membership import membership_probabilities, placement_cov

        point = None if state is None else placement_cov(self.loadings(), state)
        return membership_probabilities(scores, self.centroids_, self.within_cov_,
                                        self.role_sizes_, point)

    @fitted
    def predict(self, table):
        """Role id of every row, shape (n_rows,): the role of highest membership (as ``place`` gives)."""
        return self.place(table)["role"].to_numpy()

    @fitted
    def predict_proba(self, table):
        """Membership probability of every role, shape (n_rows, k), columns in ``role_ids_`` order."""
        processed, state = self.processed(table)
        return self.memberships(self.scores_from_processed(processed), state)

    @fitted
    def move_null(self, noise_from, noise_to):
        """The calibrated null of moves between two :class:`NoiseState` s (see :mod:`.movenoise`)."""
        from drift.model.movenoise import MoveCalibration, MoveNull

        a, b = self.noise_calibration_
        calibration = MoveCalibration(a, b, self.calibration_sample_, *self.calibration_range_,
                                      df=self.null_df_)
        return MoveNull.between(self.loadings(), self.noise_, noise_from, noise_to, calibration)

    @fitted
    def place(self, table):
        """Place season rows: see :func:`drift.model._placement.place`."""
        from drift.model._placement import place

        return place(self, table)

    @fitted
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
