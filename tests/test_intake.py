"""Intake: every input shape, column mapping, feature detection and each bad input."""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest
from conftest import small_table

from drift.config import Config
from drift.errors import InputError
from drift.intake.read import read_seasons


def test_folder_of_csv_season_from_file_name(tmp_path):
    t = small_table()
    for s, block in t.groupby("season"):
        block.drop(columns="season").to_csv(tmp_path / f"{s}.csv", index=False)
    (tmp_path / "notes.txt").write_text("ignored")
    raw = read_seasons(tmp_path)
    assert sorted(raw.table["season"].unique()) == ["2021-22", "2022-23"]
    assert raw.features == ("share_spot_up", "ppp_spot_up", "usage_pct", "ts_pct")
    assert len(raw.table) == len(t)


def test_season_from_prefixed_file_name(tmp_path):
    small_table(seasons=("2023-24",)).drop(columns="season").to_csv(tmp_path / "export_2023-24_final.csv", index=False)
    assert set(read_seasons(tmp_path).table["season"]) == {"2023-24"}


def test_long_file_with_season_column(write_csv):
    path = write_csv(small_table(seasons=("2020", "2021", "2022")), "all.csv")
    raw = read_seasons(path)
    assert sorted(raw.table["season"].unique()) == ["2020", "2021", "2022"]


def test_excel_and_parquet_read_like_csv(tmp_path):
    t = small_table()
    t.to_excel(tmp_path / "seasons.xlsx", index=False)
    t.to_parquet(tmp_path / "seasons.parquet", index=False)
    a = read_seasons(tmp_path / "seasons.xlsx").table
    b = read_seasons(tmp_path / "seasons.parquet").table
    for frame in (a, b):
        assert len(frame) == len(t)
        np.testing.assert_allclose(frame["usage_pct"].to_numpy(), t["usage_pct"].to_numpy())


def test_config_maps_column_names_and_excludes(tmp_path, write_csv):
    t = small_table().rename(columns={"player_id": "PID", "minutes": "MP", "games": "G"})
    t["age"] = 25
    t["position"] = "wing"
    path = write_csv(t, "x.csv")
    config = Config(columns={"player_id": "PID", "minutes": "MP", "games": "G"}, exclude=("age",))
    raw = read_seasons(path, config)
    assert "age" not in raw.features and "position" not in raw.features
    assert raw.ignored_columns == ("age", "position")  # age: a descriptor; position: text
    assert raw.table["minutes"].iloc[0] == 1500


def test_config_feature_list_is_used_exactly(write_csv):
    path = write_csv(small_table(), "x.csv")
    raw = read_seasons(path, Config(features=("usage_pct", "ts_pct")))
    assert raw.features == ("usage_pct", "ts_pct")


def test_empty_efficiency_stays_missing(write_csv):
    t = small_table()
    t.loc[2, "ppp_spot_up"] = np.nan
    raw = read_seasons(write_csv(t, "x.csv"))
    assert raw.table["ppp_spot_up"].isna().sum() == 1


# ----------------------------------------------------------------- bad inputs
def _error(path, config=None):
    with pytest.raises(InputError) as info:
        read_seasons(path, config)
    return str(info.value)


def test_missing_path(tmp_path):
    assert "path not found" in _error(tmp_path / "nope")


def test_missing_required_column_names_it_and_the_fix(write_csv):
    msg = _error(write_csv(small_table().drop(columns="minutes"), "x.csv"))
    assert "minutes" in msg and "[columns]" in msg


def test_text_in_numeric_column_gives_file_row_column_value(write_csv):
    t = small_table().astype({"usage_pct": object})
    t.loc[3, "usage_pct"] = "abc"
    msg = _error(write_csv(t, "x.csv"))
    assert "x.csv" in msg and "row 5" in msg and "usage_pct" in msg and "'abc'" in msg


def test_blank_player_id(write_csv):
    t = small_table().astype({"player_id": object})
    t.loc[2, "player_id"] = "   "
    msg = _error(write_csv(t, "x.csv"))
    assert "row 4" in msg and "player_id" in msg and "empty" in msg


def test_duplicate_player_season_team(write_csv):
    t = small_table()
    t = pd.concat([t, t.iloc[[0]]])
    msg = _error(write_csv(t, "x.csv"))
    assert "appears twice" in msg and "P0" in msg


@pytest.mark.parametrize("column", ["games", "minutes"])
def test_negative_games_or_minutes(write_csv, column):
    t = small_table()
    t.loc[1, column] = -3
    msg = _error(write_csv(t, "x.csv"))
    assert column in msg and "-3" in msg and ">= 0" in msg and "row 3" in msg


def test_infinite_value(write_csv):
    t = small_table()
    t.loc[0, "ts_pct"] = np.inf
    msg = _error(write_csv(t, "x.csv"))
    assert "infinite" in msg and "ts_pct" in msg


def test_empty_season_file(tmp_path):
    small_table(seasons=("2021-22",)).to_csv(tmp_path / "2021-22.csv", index=False)
    small_table().iloc[:0].to_csv(tmp_path / "2022-23.csv", index=False)
    msg = _error(tmp_path)
    assert "2022-23.csv" in msg and "no rows" in msg


def test_zero_byte_file(tmp_path):
    (tmp_path / "2021-22.csv").write_bytes(b"")
    assert "empty" in _error(tmp_path)


def test_season_lacking_a_feature_others_have(tmp_path):
    t = small_table()
    t[t.season == "2021-22"].to_csv(tmp_path / "2021-22.csv", index=False)
    t[t.season == "2022-23"].drop(columns="ts_pct").to_csv(tmp_path / "2022-23.csv", index=False)
    msg = _error(tmp_path)
    assert "2022-23.csv" in msg and "ts_pct" in msg


def test_unreadable_file(tmp_path):
    (tmp_path / "2021-22.xlsx").write_bytes(b"this is not a spreadsheet")
    assert "cannot read" in _error(tmp_path)


def test_unsupported_suffix(tmp_path):
    p = tmp_path / "s.json"
    p.write_text("{}")
    assert "unsupported" in _error(p)


def test_inputs_are_never_modified(write_csv):
    path = write_csv(small_table(), "x.csv")
    before = path.read_bytes()
    read_seasons(path)
    assert path.read_bytes() == before


from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

_CELLS = st.one_of(st.just(""), st.just("abc"), st.just("-1"), st.just("inf"), st.just("1e309"),
                   st.just("NaN"), st.just(" 12 "), st.text(max_size=6), st.floats(allow_nan=True).map(str))


@settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(row=st.integers(0, 11), column=st.sampled_from(["player_id", "team", "games", "minutes", "usage_pct",
                                                        "ts_pct", "share_spot_up"]), value=_CELLS)
def test_fuzzed_cells_either_read_or_fail_cleanly(tmp_path, row, column, value):
    t = small_table().astype(str)
    t.loc[row, column] = value
    path = tmp_path / "fuzz.csv"
    t.to_csv(path, index=False)
    try:
        raw = read_seasons(path)
    except InputError as exc:
        assert "fuzz.csv" in str(exc)
    else:
        assert np.isfinite(raw.table[["games", "minutes"]].to_numpy()).all()
        assert (raw.table[["games", "minutes"]].to_numpy() >= 0).all()


def test_demo_written_as_a_real_export_reads_like_the_demo(tmp_path, demo_prepared, demo_model,
                                                           demo_analysis):
    from conftest import DEMO
    from exports import COLUMN_MAP, write_export

    from drift.api import prepare

    write_export(DEMO, tmp_path)
    prepared = prepare(tmp_path, Config(columns=COLUMN_MAP))
    assert prepared.features == demo_prepared.features
    cols = ["player_id", "season", "team", "games", "minutes", "possessions", *demo_prepared.features]
    pd.testing.assert_frame_equal(prepared.kept[cols], demo_prepared.kept[cols], check_dtype=False)
    placed = demo_model.place(prepared.kept)
    assert (placed["role"].to_numpy() == demo_analysis.placements["role"].to_numpy()).all()
    ignored = prepared.reading.columns.drop_duplicates("column").set_index("column")
    assert ignored.loc["TEAM_ID", "role"] == "ignored" and "id" in ignored.loc["TEAM_ID", "note"]
    assert ignored.loc["AGE", "role"] == "ignored" and "age" in ignored.loc["AGE", "note"]
    assert ignored.loc["ISO_PPP", "family"] == "efficiency" and ignored.loc["ISO_PPP", "play_type"] == "isolation"


@pytest.mark.slow
def test_demo_written_as_a_european_export_with_season_totals_reads_like_the_demo(demo_prepared, tmp_path):
    """The demo league as another club's tool writes it: semicolons and decimal commas, Windows-1252,
    minutes per game to one decimal, and a '2TM' row before each traded player's stints. Every
    player-season, team and stint count comes out as from the demo's own files."""
    import warnings

    from conftest import DEMO
    from exports import with_combined_rows

    from drift.api import prepare

    for csv in sorted(DEMO.glob("*.csv")):
        frame = pd.read_csv(csv, dtype={"player_id": str})
        frame["season"] = csv.stem
        frame = with_combined_rows(frame, "{n}TM")
        frame.loc[0, "player"] = "Rémy Peñalta"  # one accented name, so the encoding matters
        frame["minutes"] = (frame["minutes"].astype(float) / frame["games"].astype(float)).round(1)
        frame.drop(columns="season").to_csv(tmp_path / csv.name, sep=";", decimal=",", index=False,
                                            encoding="cp1252")
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        read = prepare(tmp_path)
    said = " ".join(str(w.message) for w in caught)
    assert "read as semicolon-separated text" in said and "minutes per game, multiplied by games" in said
    assert "read as Windows-1252 text" in said and "Rémy Peñalta" in set(read.seasons["player"])
    traded = int((demo_prepared.seasons["n_stints"] > 1).sum())
    assert len(read.combined) == traded and set(read.combined["team"]) == {"2TM"}
    key = ["season", "player_id"]
    ours = read.seasons.sort_values(key).reset_index(drop=True)
    demo = demo_prepared.seasons.sort_values(key).reset_index(drop=True)
    pd.testing.assert_frame_equal(ours[key + ["team", "games", "n_stints"]], demo[key + ["team", "games", "n_stints"]],
                                  check_dtype=False)
    # per-game minutes to one decimal: within 0.05 a game of the season totals (rounding, no more)
    assert (np.abs(ours["minutes"] - demo["minutes"]) <= 0.05 * demo["games"] + 1e-6).all()
    single = demo["n_stints"] == 1
    np.testing.assert_allclose(ours.loc[single, list(demo_prepared.features)].to_numpy(float),
                               demo.loc[single, list(demo_prepared.features)].to_numpy(float), atol=1e-9)
    assert len(read.stints) == len(demo_prepared.stints)
