"""Self-check: would drift recover roles and role changes on data like the user's?

From a fitted model and the data it was fitted on, simulate leagues like the
user's and rerun the pipeline on each:

* the same players, seasons and real sample sizes (games, minutes, possessions);
* each simulated player holds one of the model's roles; his true style is the
  shrunk profile of a real pool player-season of that role (so within-role
  spread and the links between features are the data's own, slightly narrowed
  by the shrinkage);
* every season's observed values are the true style plus sampling noise at the
  real sample sizes, from the model's own noise table (sigma2 x level / sample),
  plus the typical true yearly change (``drift_var``);
* a returning player changes role with the rate the run itself found (share of
  consecutive season pairs reported *changed*), at least 2%.

The pipeline (role count selection, fit, placement, moves) reruns with the
run's own settings; the truth is known, so the report can say: "on data like
yours, drift recovers 7 roles in 9 of 10 simulations; role changes: precision
0.97, recall 0.93". This costs one full fit per simulation; it is an option
(``drift run --self-check N``), not part of every run.
"""

from __future__ import annotations

from dataclasses import dataclass

__all__ = ["SelfCheck", "simulate_like", "self_check"]


@dataclass(frozen=True)
class SelfCheck:
    """Result of :func:`self_check`.

    Attributes
    ----------
    runs : DataFrame
        One row per simulation: ``simulation``, ``roles_true``, ``roles_found``,
        ``ari`` (roles against the simulated truth), ``precision``, ``recall``,
        ``f1`` (role changes), ``n_changes`` (real ones simulated), ``false_flag``
        (share of pairs without a real change reported changed).
    roles : int
        The model's role count (the truth of every simulation).
    exact : int
        Simulations in which the role count was recovered exactly.
    within_one : int
        ... within one role.
    precision, recall, f1, false_flag, ari : float
        Means over the simulations (NaN where undefined, e.g. no change flagged).
    change_rate : float
        Yearly chance of a real role change used in the simulations.
    sentence : str
        The summary line the report shows.
    """

    runs: object
    roles: int
    exact: int
    within_one: int
    precision: float
    recall: float
    f1: float
    false_flag: float
    ari: float
    change_rate: float
    sentence: str


def _true_styles(model, pool):
    """Pool rows' role (nearest centroid) and shrunk feature values: the styles simulated players take."""
    processed, _ = model.processed(pool)
    roles = model.distances(model.scores_from_processed(processed)).argmin(axis=1)
    return roles, processed


def simulate_like(model, kept, *, change_rate: float = 0.05, seed: int = 0):
    """Season rows like ``kept`` (same players, seasons, samples) drawn from ``model``'s roles.

    Parameters
    ----------
    model : RoleModel
        Fitted; its pool should be (part of) ``kept``.
    kept : DataFrame
        The qualifying season rows the model was fitted on.
    change_rate : float
        Chance a returning player's true role changes from one season to the next.
    seed : int

    Returns
    -------
    table : DataFrame
        ``kept``'s identity and sample columns with simulated features.
    truth : DataFrame
        ``player_id``, ``season``, ``true_role`` (role index), ``changed``.
    """
    import numpy as np
    import pandas as pd

    from drift.intake.features import exposure_matrix, feature_spec
    from drift.model.noise import level_term

    rng = np.random.default_rng(seed)
    pool_mask = kept["season"].isin(model.reference_seasons_).to_numpy()
    pool = kept[pool_mask].reset_index(drop=True)
    roles, styles = _true_styles(model, pool)
    k = len(model.role_ids_)
    members = [np.flatnonzero(roles == r) for r in range(k)]
    weights = np.array([len(m) for m in members], float)
    weights /= weights.sum()
    noise = model.noise_
    sigma2 = noise["sigma2"].to_numpy(float)
    drift_sd = np.sqrt(np.clip(noise["drift_var"].to_numpy(float), 0, None))
    families = list(model.families_)
    is_share = np.array([f == "share" for f in families])

    table = kept.reset_index(drop=True).copy()
    order = np.lexsort((table["season"].astype(str).to_numpy(), table["player_id"].astype(str).to_numpy()))
    true = np.empty((len(table), len(model.features_)))
    role_of = np.empty(len(table), int)
    changed = np.zeros(len(table), bool)
    last_pid, role, style = None, 0, None
    for i in order:
        pid = table.at[i, "player_id"]
        if pid != last_pid:
            role = int(rng.choice(k, p=weights))
            style = styles[rng.choice(members[role])].copy()
        elif rng.random() < change_rate:
            role = int(rng.choice([r for r in range(k) if r != role], p=_renorm(weights, role)))
            style = styles[rng.choice(members[role])].copy()
            changed[i] = True
        else:
            style = style + rng.normal(0.0, drift_sd)
        last_pid = pid
        true[i], role_of[i] = style, role
    true[:, is_share] = np.clip(true[:, is_share], 0.0, 1.0)
    table[list(model.features_)] = true  # exposure of efficiencies uses the true shares
    exposure = exposure_matrix(table, feature_spec(model.features_))
    level = np.column_stack([level_term(true[:, j], exposure[:, j], fam) for j, fam in enumerate(families)])
    with np.errstate(divide="ignore", invalid="ignore"):
        sd = np.sqrt(np.where(exposure > 0, sigma2 * level / exposure, 0.0))
    observed = true + rng.normal(size=true.shape) * sd
    observed[:, is_share] = np.clip(observed[:, is_share], 0.0, 1.0)
    observed[exposure <= 0] = np.nan
    observed[:, is_share] = np.nan_to_num(observed[:, is_share])
    table[list(model.features_)] = observed
    truth = pd.DataFrame({"player_id": table["player_id"], "season": table["season"],
                          "true_role": role_of, "changed": changed})
    return table, truth


def _renorm(weights, skip):
    w = weights.copy()
    w[skip] = 0.0
    w = [x for i, x in enumerate(w) if i != skip]
    total = sum(w)
    return [x / total for x in w]


def self_check(prepared, model, config=None, *, n_sims: int = 10, seed: int = 0,
               change_rate: float | None = None) -> SelfCheck:
    """Simulate ``n_sims`` leagues like the user's and measure what drift recovers.

    Parameters
    ----------
    prepared : Prepared
        The run's prepared data (:func:`drift.api.prepare`).
    model : RoleModel
        The run's fitted model.
    config : Config, optional
        The run's settings (role-count rule, components, alpha); the simulated
        leagues are fitted with them.
    n_sims : int
    seed : int
    change_rate : float, optional
        Yearly chance of a real role change; default the share of the run's
        consecutive-season pairs reported *changed* (at least 0.02).

    Returns
    -------
    SelfCheck
    """
    import warnings

    import numpy as np
    import pandas as pd

    from drift.config import Config
    from drift.measure.moves import pair_moves
    from drift.model import RoleModel
    from drift.model.noise import consecutive_pairs as consecutive_season_pairs
    from drift.sim.family import recovery

    config = config or Config()
    kept = prepared.kept.reset_index(drop=True)
    if change_rate is None:
        placements = model.place(kept)
        i1, i2 = consecutive_season_pairs(kept)
        moves = pair_moves(model, kept, placements, i1, i2, alpha=config.alpha)
        change_rate = float(max(moves["role_changed"].mean() if len(moves) else 0.0, 0.02))
    rows = []
    for sim in range(n_sims):
        table, truth = simulate_like(model, kept, change_rate=change_rate, seed=seed + 1000 * (sim + 1))
        pool = table[table["season"].isin(model.reference_seasons_)].reset_index(drop=True)
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")  # a weak role in a simulation is not the user's concern
            sim_model = RoleModel.from_settings(config.model).fit(pool, features=prepared.features,
                                                                  intake=config.intake)
        placed = sim_model.place(table)
        j1, j2 = consecutive_season_pairs(table)
        sim_moves = pair_moves(sim_model, table, placed, j1, j2, alpha=config.alpha)
        score = recovery(placed, sim_moves, truth)
        rows.append({"simulation": sim + 1, "roles_true": len(model.role_ids_),
                     "roles_found": score["n_roles"], **{k: score[k] for k in (
                         "ari", "precision", "recall", "f1", "n_changes", "false_flag")}})
    runs = pd.DataFrame(rows)
    k = len(model.role_ids_)
    exact = int((runs["roles_found"] == k).sum())
    within = int(((runs["roles_found"] - k).abs() <= 1).sum())
    mean = {c: float(np.nanmean(runs[c])) if runs[c].notna().any() else float("nan")
            for c in ("precision", "recall", "f1", "false_flag", "ari")}
    sentence = (f"On data like yours, drift recovers {k} roles in {exact} of {n_sims} simulations "
                f"(within one role in {within}); role changes: precision {mean['precision']:.2f}, "
                f"recall {mean['recall']:.2f}.")
    return SelfCheck(runs=runs, roles=k, exact=exact, within_one=within, change_rate=change_rate,
                     sentence=sentence, **mean)
