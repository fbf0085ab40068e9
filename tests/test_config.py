"""Config files: tables, keys, values, and command-line overrides."""

from __future__ import annotations

import pytest

from drift.config import load_config
from drift.errors import ConfigError


def test_defaults():
    c = load_config(None)
    assert (c.min_games, c.min_minutes_per_game, c.components, c.roles) == (20, 10.0, "variance", "auto")
    # chosen on the simulated-league family (benchmarks/role_count.py): 90% variance, up to 14 roles
    assert (c.variance_threshold, c.max_roles) == (0.9, 14)


def test_full_file(tmp_path):
    p = tmp_path / "c.toml"
    p.write_text("""
[columns]
player_id = "PID"
[intake]
total_marker = "2TM"
exclude = ["age"]
[filters]
min_games = 15
min_minutes_per_game = 12.5
[model]
reference = ["2021-22"]
components = 0.85
roles = 6
noise_policy = "weight"
[moves]
alpha = 0.05
compare = ["2021-22", "2023-24"]
[roles.names]
R1 = "Lead creator"
""")
    c = load_config(p)
    assert c.columns == {"player_id": "PID"} and c.total_marker == "2TM" and c.exclude == ("age",)
    assert c.min_games == 15 and c.components == 0.85 and c.roles == 6 and c.noise_policy == "weight"
    assert c.compare == ("2021-22", "2023-24") and c.role_names == {"R1": "Lead creator"}
    assert c.replace(min_games=None, roles=4).roles == 4


@pytest.mark.parametrize("text, words", [
    ("[wrong]\nx = 1\n", "unknown table [wrong]"),
    ("[model]\nroles = 0\n", "roles=0"),
    ("[model]\ncomponents = 1.5\n", "components=1.5"),
    ("[model]\nnoise_policy = 'magic'\n", "noise_policy"),
    ("[filters]\nmin_games = -1\n", "min_games=-1"),
    ("[filters]\nspeed = 1\n", "unknown key 'speed'"),
    ("[columns]\nheight = 'H'\n", "unknown drift names"),
    ("not toml = = =", "not valid TOML"),
])
def test_bad_files_say_what_is_wrong(tmp_path, text, words):
    p = tmp_path / "c.toml"
    p.write_text(text)
    with pytest.raises(ConfigError, match=None) as info:
        load_config(p)
    assert words in str(info.value) and str(p) in str(info.value)


def test_missing_file(tmp_path):
    with pytest.raises(ConfigError, match="not found"):
        load_config(tmp_path / "none.toml")


def test_config_is_built_from_parts_and_reads_flat():
    from drift.config import Config, IntakePolicy, ModelSettings, MoveSettings

    c = Config(intake=IntakePolicy(min_games=15), model=ModelSettings(roles=5), roles=6, alpha=0.05)
    assert isinstance(c.moves, MoveSettings) and c.moves.alpha == 0.05
    assert (c.min_games, c.roles, c.model.roles) == (15, 6, 6)
    assert c == Config(min_games=15, roles=6, alpha=0.05)
    with pytest.raises(ConfigError, match="unknown setting"):
        Config(speed=3)


@pytest.mark.parametrize("key, value, words", [
    ("alpha", float("nan"), "alpha=nan"),
    ("min_minutes_per_game", float("inf"), "min_minutes_per_game=inf"),
    ("variance_threshold", 1.5, "variance_threshold=1.5"),
    ("roles", 1, "roles=1"),
    ("roles", True, "roles=True"),
    ("seed", -1, "seed=-1"),
    ("max_roles", 2.5, "max_roles=2.5"),
    ("compare", ("2021-22", "2021-22"), "two different seasons"),
    ("compare", ("2021-22",), "exactly two seasons"),
    ("total_marker", 7, "total_marker=7"),
])
def test_out_of_range_values_are_refused_not_clamped(key, value, words):
    from drift.config import Config

    with pytest.raises(ConfigError) as info:
        Config(**{key: value})
    assert words in str(info.value)


def test_a_single_name_is_one_name_not_ignored(tmp_path):
    p = tmp_path / "c.toml"
    p.write_text('[intake]\nexclude = "age"\n[model]\nreference = "2021-22"\n')
    c = load_config(p)
    assert c.exclude == ("age",) and c.reference == ("2021-22",)


def test_replace_ignores_not_given_values_only():
    from drift.config import Config

    c = Config(total_marker=None)
    assert c.total_marker is None  # no marker: every row is a team row, never silently "TOT"
    assert c.replace(min_games=None, roles=3) == Config(total_marker=None, roles=3)


def test_a_file_saved_with_a_byte_order_mark_reads(tmp_path):
    p = tmp_path / "c.toml"
    p.write_bytes("\ufeff[filters]\nmin_games = 15\n".encode("utf-8"))
    assert load_config(p).min_games == 15


def test_csv_separator_and_encoding_are_read_and_checked(tmp_path):
    p = tmp_path / "c.toml"
    p.write_text('[intake.csv]\nseparator = "tab"\nencoding = "windows-1252"\n')
    assert load_config(p).csv == {"separator": "\t", "encoding": "windows-1252"}
    p.write_text('[intake.csv]\nseparator = "\\t"\n')
    assert load_config(p).csv == {"separator": "\t"}


@pytest.mark.parametrize("text, words", [
    ('[intake.csv]\nseparator = ":"\n', "separator=':' must be one of"),
    ('[intake.csv]\nencoding = "klingon"\n', "encoding='klingon' is not an encoding Python knows"),
    ('[intake.csv]\ndelimiter = ";"\n', "unknown key(s) ['delimiter']"),
    ('[intake]\ncsv = ";"\n', "[intake] csv must be a table like [intake.csv]"),
])
def test_bad_csv_settings_are_refused(tmp_path, text, words):
    p = tmp_path / "c.toml"
    p.write_text(text)
    with pytest.raises(ConfigError) as info:
        load_config(p)
    assert words in str(info.value)
