"""What intake understood: per-column summary, features.csv's reading columns, warnings."""

from __future__ import annotations

import pandas as pd
import pytest

from drift.errors import DataQualityWarning
from drift.intake._column_table import emit_notes


def test_features_csv_says_family_play_type_unit_and_rule(demo_prepared, demo_model):
    table = demo_prepared.reading.feature_table(demo_model.noise_).set_index("feature")
    assert list(table.columns[:5]) == ["family", "play_type", "unit", "source_column", "detected_by"]
    assert table.loc["share_isolation", ["family", "play_type", "unit"]].tolist() == ["share", "isolation", "fraction"]
    assert table.loc["ppp_cut", "unit"] == "points per possession"
    assert table.loc["usage_pct", "unit"] == "percent" and table.loc["ts_pct", "unit"] == "fraction"
    assert table.loc["share_cut", "detected_by"] == "name pattern 'share_<type>'"
    assert len(table) == len(demo_model.features_) and table["signal_share"].notna().all()


def test_summary_has_one_row_per_column_and_reading(demo_prepared):
    summary = demo_prepared.reading.summary()
    assert summary["column"].is_unique and (summary["files"] == 6).all()
    assert summary["role"].iloc[0] == "standard"


def test_notes_are_warned_once_per_kind_with_their_files():
    columns = pd.DataFrame({"column": ["x"], "role": ["feature"], "how": ["name"]})
    notes = [("a.csv", "minutes per game, multiplied by games to season totals"),
             ("b.csv", "minutes per game, multiplied by games to season totals")]
    with pytest.warns(DataQualityWarning) as record:
        emit_notes(notes, columns)
    assert [str(w.message) for w in record] == [
        "minutes per game, multiplied by games to season totals (a.csv, b.csv)"]
