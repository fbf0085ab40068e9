"""Facts kept in one place: role ids and filter reason wording."""

from __future__ import annotations

from drift.constants import FILTER_REASONS, reason_text, role_id, role_number


def test_role_ids_round_trip_and_user_ids_have_no_number():
    assert [role_id(i) for i in range(3)] == ["R1", "R2", "R3"]
    assert all(role_number(role_id(i)) == i + 1 for i in range(20))
    assert role_number("Wing") is None and role_number("R") is None


def test_every_reason_code_has_wording_and_joined_codes_read_as_one_phrase():
    assert reason_text("few_games") == FILTER_REASONS["few_games"]
    assert reason_text("few_games+few_minutes") == "too few games and too few minutes per game"


def test_every_feature_family_has_a_missing_value_rule():
    from drift.constants import MISSING_ACTIONS
    from drift.intake.features import FAMILIES

    assert set(MISSING_ACTIONS) == set(FAMILIES)
