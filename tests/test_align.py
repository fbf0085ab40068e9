"""Hungarian alignment of roles across refits."""

from __future__ import annotations

import itertools
import types

import numpy as np
import pytest

from drift.model.align import align_models, relabel


def _fake_model(centroids, ids=None):
    centroids = np.asarray(centroids, float)
    k, p = centroids.shape
    ids = ids or [f"R{i + 1}" for i in range(k)]
    return types.SimpleNamespace(
        features_=tuple(f"f{j}" for j in range(p)), scaler_mean_=np.zeros(p), scaler_scale_=np.ones(p),
        centroids_features_=centroids, role_ids_=list(ids), role_names_=[f"name {i}" for i in ids],
        role_descriptions_=[f"desc {i}" for i in ids])


@pytest.mark.parametrize("k", range(2, 7))
def test_matching_has_the_least_total_cost(k):
    """With no threshold every role is kept, and the pairing is the cheapest of all k! pairings."""
    rng = np.random.default_rng(k)
    for _ in range(3):
        a, b = rng.normal(0, 3, (k, 4)), rng.normal(0, 3, (k, 4))
        al = align_models(_fake_model(a), _fake_model(b), threshold=np.inf)
        assert (al.table["status"] == "kept").all()
        cost = np.sqrt(((a[:, None] - b[None]) ** 2).mean(axis=2))  # RMS difference in SDs
        best = min(sum(cost[i, p[i]] for i in range(k)) for p in itertools.permutations(range(k)))
        assert al.table["cost"].sum() == pytest.approx(best)  # exhaustive check, no source needed


def test_permuted_and_perturbed_centroids_map_back():
    rng = np.random.default_rng(0)
    base = rng.normal(0, 3, (6, 10))
    perm = rng.permutation(6)
    moved = base[perm] + rng.normal(0, 0.1, base.shape)
    prev, new = _fake_model(base), _fake_model(moved)
    al = align_models(prev, new)
    kept = al.table[al.table["status"] == "kept"]
    assert len(kept) == 6
    for _, row in kept.iterrows():
        assert row["previous_id"] == f"R{perm[int(row['new_id'][1:]) - 1] + 1}"


def test_rectangular_new_and_retired_roles():
    rng = np.random.default_rng(1)
    base = rng.normal(0, 3, (5, 8))
    more = np.vstack([base, rng.normal(0, 3, (1, 8)) + 20])  # one genuinely new role
    al = align_models(_fake_model(base), _fake_model(more))
    assert (al.table["status"] == "new").sum() == 1 and al.ids["R6"] == "R6"
    fewer = base[:3]
    al = align_models(_fake_model(base), _fake_model(fewer))
    assert set(al.table.loc[al.table["status"] == "retired", "previous_id"]) == {"R4", "R5"}


def test_poor_match_is_not_called_the_same_role():
    base = np.array([[0.0, 0.0], [10.0, 0.0], [0.0, 10.0]])
    new = np.array([[0.1, 0.0], [10.0, 0.1], [6.0, 6.0]])  # the third role is elsewhere
    al = align_models(_fake_model(base), _fake_model(new))
    status = dict(zip(al.table["new_id"], al.table["status"]))
    assert status["R1"] == "kept" and status["R2"] == "kept" and status["R3"] == "new"
    assert "R3" in set(al.table.loc[al.table["status"] == "retired", "previous_id"])
    assert al.ids["R3"] == "R4"  # a new id, never a reused one


def test_relabel_carries_ids_names_descriptions():
    base = np.array([[0.0, 0.0], [10.0, 0.0]])
    prev = _fake_model(base, ["R1", "R2"])
    prev.role_names_ = ["Lead", "Wing"]
    new = _fake_model(base[::-1] + 0.01)
    fitted_ids = list(new.role_ids_)
    out = relabel(new, prev, align_models(prev, new), keep_names={"R1": "Primary"})
    assert out.role_ids_ == ["R2", "R1"] and out.role_names_ == ["Wing", "Primary"]
    assert new.role_ids_ == fitted_ids  # the fitted model is left as it was


def test_refit_on_shifted_pool_keeps_roles(demo_prepared, demo_model):
    """Demo league: the session's model (pool 2019-25), then a refit on 2021-25 with it as --previous."""
    from drift.api import fit_model
    from drift.config import Config

    first = demo_model
    second = fit_model(demo_prepared, Config(reference=("2021-22", "2022-23", "2023-24", "2024-25")))
    al = align_models(first, second)
    second = relabel(second, first, al)
    shared = demo_prepared.kept[demo_prepared.kept["season"].isin(["2021-22", "2022-23"])]
    same = (first.predict(shared) == second.predict(shared)).mean()
    print(f"refit on a shifted pool: {same:.1%} of shared player-seasons keep their role id")
    assert (al.table["status"] == "kept").sum() == len(first.role_ids_)
    assert same >= 0.90


from hypothesis import given, settings
from hypothesis import strategies as st


@settings(max_examples=40, deadline=None)
@given(k=st.integers(2, 7), seed=st.integers(0, 10_000))
def test_property_permutation_is_undone(k, seed):
    rng = np.random.default_rng(seed)
    base = rng.normal(0, 4, (k, 6))
    perm = rng.permutation(k)
    new = base[perm] + rng.normal(0, 0.01, base.shape)
    al = align_models(_fake_model(base), _fake_model(new))
    for j in range(k):
        assert al.ids[f"R{j + 1}"] == f"R{perm[j] + 1}"
