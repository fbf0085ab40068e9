"""Config files: tables, keys, values, and command-line overrides."""

from __future__ import annotations

import pytest

from drift.config import load_config
from drift.errors import ConfigError


def test_defaults():
    c = load_config(None)
    assert (c.min_games, c.min_minutes_per_game, c.components, c.roles) == (20, 10.0, "parallel", "auto")


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
