"""Prepared tables: filters with reason codes, the missing-value table, the reference pool."""

from __future__ import annotations

import pytest

from drift.constants import MISSING_ACTIONS
from drift.errors import InputError
from drift.intake.prepare import reference_pool


def test_excluded_rows_carry_a_code_that_matches_their_numbers(demo_prepared):
    ex = demo_prepared.excluded
    few_games = ex["games"] < 20
    few_minutes = ex["minutes_per_game"] < 10
    codes = ex["reason_code"].str.split("+")
    assert (codes.map(lambda c: "few_games" in c) == few_games).all()
    assert (codes.map(lambda c: "few_minutes" in c) | ~few_minutes).all()


def test_missing_table_states_the_rule_of_each_family(demo_prepared):
    m = demo_prepared.missing
    assert (m["action"] == m["family"].map(MISSING_ACTIONS)).all()


def test_reference_pool_refuses_unknown_seasons(demo_prepared):
    with pytest.raises(InputError, match="1999-00"):
        reference_pool(demo_prepared, ["1999-00"])
    pool = reference_pool(demo_prepared, ["2024-25"])
    assert set(pool["season"]) == {"2024-25"}
