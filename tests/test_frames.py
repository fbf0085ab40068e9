"""Tables that are not files (drift/intake/_frames.py): DataFrames, mappings of them, Arrow tables.

Each is read into the same RawTables the file readers make, so the same rules and messages apply;
a message names the frame and its row (counted as ``iloc`` counts).
"""

from __future__ import annotations

import warnings

import pandas as pd
import pytest
from conftest import small_table

import drift
from drift.errors import InputError, ModelQualityWarning

SEASONS = ("2021-22", "2022-23", "2023-24")
#: what intake adds to say where a row came from; everything else must match the file's reading
WHERE = ["source_file", "source_row"]


@pytest.fixture(scope="module")
def league():
    return small_table(n_players=12, seasons=SEASONS, seed=3)


@pytest.fixture(scope="module")
def from_csv(league, tmp_path_factory):
    path = tmp_path_factory.mktemp("csv") / "all.csv"
    league.to_csv(path, index=False)
    return drift.prepare(path)


@pytest.fixture(scope="module")
def from_folder(league, tmp_path_factory):
    folder = tmp_path_factory.mktemp("folder")
    for season, block in league.groupby("season"):
        block.drop(columns="season").to_csv(folder / f"{season}.csv", index=False)
    return drift.prepare(folder)


def _same_reading(a, b):
    pd.testing.assert_frame_equal(a.seasons.drop(columns=WHERE), b.seasons.drop(columns=WHERE))
    pd.testing.assert_frame_equal(a.excluded.drop(columns=WHERE, errors="ignore"),
                                  b.excluded.drop(columns=WHERE, errors="ignore"))
    assert a.features == b.features


def test_a_long_dataframe_reads_as_the_same_table_from_a_file(league, from_csv):
    given = league.copy()
    prepared = drift.prepare(given)
    _same_reading(prepared, from_csv)
    assert prepared.files == ("DataFrame 'seasons'",)
    assert set(prepared.seasons["source_file"]) == {"DataFrame 'seasons'"}
    pd.testing.assert_frame_equal(given, league)  # the caller's frame is untouched


def test_a_mapping_names_each_frame_and_its_key_gives_the_season(league, from_folder):
    by_season = {s: block.drop(columns="season") for s, block in league.groupby("season")}
    prepared = drift.prepare(by_season)
    _same_reading(prepared, from_folder)  # as a folder of files named by season
    assert prepared.files == tuple(f"DataFrame {s!r}" for s in SEASONS)


def test_arrow_tables_convert_through_to_pandas_and_the_stream_interface(league, from_csv):
    pa = pytest.importorskip("pyarrow", reason="pyarrow is not installed (pip install 'role-drift[parquet]')")

    class StreamOnly:  # a table from another library that offers only the Arrow PyCapsule stream
        def __init__(self, table):
            self._table = table

        def __arrow_c_stream__(self, requested_schema=None):
            return self._table.__arrow_c_stream__(requested_schema)

    table = pa.Table.from_pandas(league, preserve_index=False)
    _same_reading(drift.prepare(table), from_csv)
    prepared = drift.prepare({"all": StreamOnly(table)})
    _same_reading(prepared, from_csv)
    assert prepared.files == ("StreamOnly 'all'",)


def test_named_index_levels_are_read_as_columns(league, from_csv):
    _same_reading(drift.prepare(league.set_index(["season", "player_id"])), from_csv)


def test_a_bad_cell_is_named_by_the_frame_row_and_column(league):
    bad = league.copy()
    bad.loc[14, "games"] = -3
    with pytest.raises(InputError, match=r"^DataFrame 'seasons', row 14, column 'games': value -3 is not allowed"):
        drift.prepare(bad)
    shuffled = bad.sample(frac=1.0, random_state=1)  # the row is the position (iloc), not the index label
    position = int((shuffled["games"] < 0).to_numpy().argmax())
    with pytest.raises(InputError, match=rf"row {position}, column 'games'"):
        drift.prepare(shuffled)


def test_a_duplicate_row_names_both_frames(league):
    by_season = {s: block.drop(columns="season") for s, block in league.groupby("season")}
    by_season["2022-23"] = pd.concat([by_season["2022-23"], by_season["2022-23"].head(1)], ignore_index=True)
    with pytest.raises(InputError, match=r"^DataFrame '2022-23', row 0: player_id 'P0' appears twice"):
        drift.prepare(by_season)


@pytest.mark.parametrize("make, expect", [
    (lambda t: t.drop(columns="season"), r"DataFrame 'seasons': there is no season column; add one, or pass "
                                         r"a mapping of season -> DataFrame"),
    (lambda t: {"regular": t.drop(columns="season")}, r"DataFrame 'regular': the name 'regular' holds no season"),
    (lambda t: {"2022-23": t}, r"DataFrame '2022-23', row 0, column 'season': season '2021-22' disagrees"),
    (lambda t: t.head(0), r"DataFrame 'seasons': has columns but no rows"),
    (lambda t: pd.DataFrame(), r"DataFrame 'seasons': has no columns"),
    (lambda t: t.rename(columns={"minutes": "games"}), r"column name\(s\) \['games'\] appear more than once"),
    (lambda t: pd.concat({"a": t}, axis=1), r"MultiIndex columns"),
    (lambda t: t.drop(columns="games"), r"DataFrame 'seasons': missing required column\(s\) \['games'\]"),
    (lambda t: {}, r"the mapping of tables is empty"),
    (lambda t: {"2021-22": [1, 2]}, r"DataFrame '2021-22': is a list, not a DataFrame"),
    (lambda t: [t, "2021-22.csv"], r"the data mix a path and a table; give paths, or one DataFrame"),
])
def test_refusals_name_the_frame(league, make, expect):
    with pytest.raises(InputError, match=expect):
        drift.prepare(make(league))


def test_a_table_that_fails_to_convert_is_refused_with_its_reason():
    class Broken:
        def to_pandas(self):
            raise RuntimeError("the connection to the cache is gone")

    class NotAFrame:
        def to_pandas(self):
            return [1, 2, 3]

    with pytest.raises(InputError, match=r"Broken 'seasons': cannot be converted to a pandas DataFrame \(the "
                                         r"connection to the cache is gone\)"):
        drift.prepare(Broken())
    with pytest.raises(InputError, match=r"to_pandas\(\) gave a list, not a DataFrame"):
        drift.prepare(NotAFrame())


@pytest.mark.slow
# the league is random numbers: a feature with no season-to-season signal is named, rightly
@pytest.mark.filterwarnings("ignore::drift.errors.UnreliableFeatureWarning")
def test_every_api_entry_point_takes_frames(league, tmp_path):
    """run, check, place and the in-season check: a DataFrame wherever files were taken."""
    config = drift.Config(roles=3, components=2)
    with warnings.catch_warnings():
        # random uniform features have no roles to reproduce: a weak role is expected here
        warnings.simplefilter("ignore", ModelQualityWarning)
        analysis = drift.run(league, tmp_path / "out", config)
    assert (tmp_path / "out" / "model.json").exists() and len(analysis.placements) == len(league)
    assert "DataFrame &#39;seasons&#39;" in (tmp_path / "out" / "report.html").read_text(encoding="utf-8")
    assert drift.check(league, config).ok
    model = tmp_path / "out" / "model.json"
    latest = league[league["season"] == SEASONS[-1]]
    placed = drift.place(model, {"2023-24": latest.drop(columns="season")}, tmp_path / "placed.csv")
    assert len(placed.placements) == len(latest)
    partial = latest.assign(season="2024-25", games=10, minutes=250)
    checked = drift.check_files(model, partial, league, tmp_path / "early")
    assert len(checked.checks) == len(partial)  # every partial player has an earlier season here
