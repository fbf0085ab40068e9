"""Role names in the trade's vocabulary, never repeated; descriptions from the features."""

from __future__ import annotations

from conftest import borrowed_labels

from drift.model.describe import NAME_MIN_SCORE, ROLE_VOCABULARY, describe_role, name_roles

#: the demo league's true archetypes (drift/sim/demo.py) and what a coach would call them
DEMO_NAMES = {"lead_creator": "pick-and-roll playmaker", "handoff_guard": "handoff guard",
              "spot_up_wing": "spot-up wing", "transition_wing": "transition attacker",
              "rim_runner": "rim-running big", "post_hub": "post-up big", "pick_and_pop_big": "pick-and-pop big"}


def test_demo_roles_get_the_names_of_their_true_archetypes(demo_model, demo_analysis, demo_truth):
    placed = demo_analysis.placements.merge(demo_truth.drop_duplicates(["player_id", "season"]),
                                            on=["player_id", "season"])
    majority = placed.groupby("role")["true_role"].agg(lambda s: s.value_counts().index[0])
    names = dict(zip(demo_model.role_ids_, demo_model.role_names_))
    assert {rid: names[rid] for rid in majority.index} == {rid: DEMO_NAMES[t] for rid, t in majority.items()}
    assert all(d and "," in d for d in demo_model.role_descriptions_)  # the feature list stays beside it


def test_names_never_repeat():
    z = {"share_spot_up": 1.5, "three_pa_rate": 1.2, "usage_pct": -0.8, "drb_pct": -0.4}
    names = name_roles([z, dict(z), {k: v * 0.9 for k, v in z.items()}])
    assert len(set(names)) == 3 and names[0] == "spot-up wing"


def test_weak_profiles_keep_feature_names_and_given_names_are_kept():
    weak = {"share_spot_up": 0.55, "three_pa_rate": 0.1, "usage_pct": 0.0, "drb_pct": 0.3}
    strong = {"share_spot_up": 1.5, "three_pa_rate": 1.2, "usage_pct": -0.8, "drb_pct": -0.4}
    names = name_roles([weak, strong], given=[None, "Corner specialist"])
    assert names[1] == "Corner specialist"
    assert names[0] == "spot-up heavy, high defensive rebounding"  # below NAME_MIN_SCORE: features name it
    assert NAME_MIN_SCORE > 0


def test_unknown_features_fall_back_to_distinct_feature_names():
    a = {"hustle_pct": 2.0, "deflection_rate": 1.0}
    names = name_roles([a, dict(a)])
    assert names[0] == "high hustle pct, high deflection rate" and names[1] != names[0]


def test_vocabulary_reuses_no_published_role_label():
    # the check itself catches each label, in any spelling (the names this vocabulary replaced)
    replaced = ["primary ball handler", "Combo guard", "slasher", "movement shooter", "stretch_big",
                "Perimeter-stopper", "stretch bigs"]
    assert all(borrowed_labels(name) for name in replaced)
    assert not borrowed_labels("combination lineup, combustion")  # only the whole word
    assert {name: borrowed_labels(name) for name in ROLE_VOCABULARY if borrowed_labels(name)} == {}
    assert len({name.lower() for name in ROLE_VOCABULARY}) == len(ROLE_VOCABULARY)


def test_every_vocabulary_name_can_be_reached():
    for name, recipe in ROLE_VOCABULARY.items():
        z = {f: 2.0 * w for f, w in recipe}
        assert name_roles([z])[0] == name, name


def test_description_lists_largest_differences():
    assert describe_role({"share_cut": 1.5, "stl_pct": -2.0, "ts_pct": 0.1}, n=2) == "low steal rate, cutting heavy"
