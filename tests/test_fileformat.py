"""The model file: every field is checked against the declared table before use."""

from __future__ import annotations

import json

import pytest

from drift.errors import DriftError, ModelFileError
from drift.model import RoleModel
from drift.model.fileformat import FIELDS, ROLE_FIELDS, SCHEMA_VERSION


@pytest.fixture(scope="module")
def saved(demo_model):
    return demo_model.to_dict()


def _refused(data, tmp_path, words):
    path = tmp_path / "m.json"
    path.write_text(json.dumps(data))
    with pytest.raises(ModelFileError) as info:
        RoleModel.load(path)
    message = str(info.value)
    assert words in message and "\n" not in message and str(path) in message
    assert isinstance(info.value, DriftError)


def test_every_saved_field_is_declared_in_order(saved):
    assert list(saved) == list(FIELDS)
    assert saved["schema_version"] == SCHEMA_VERSION
    assert all(list(role) == list(ROLE_FIELDS) for role in saved["roles"])


def test_a_valid_file_round_trips_to_the_same_dict(saved):
    assert RoleModel.from_dict(json.loads(json.dumps(saved))).to_dict() == saved


@pytest.mark.parametrize("mutate, words", [
    (lambda d: d["scaler_mean"].__setitem__(0, "x"), "field 'scaler_mean'[0]: expected a finite number"),
    (lambda d: d["scaler_scale"].__setitem__(2, 0.0), "positive finite number"),
    (lambda d: d["components"][1].pop(), "field 'components'[1]: expected"),
    (lambda d: d["roles"][0]["centroid_components"].append(1.0), "centroid_components"),
    (lambda d: d["roles"][1].update(id=d["roles"][0]["id"]), "role ids repeat"),
    (lambda d: d["settings"].update(speed=3), "unknown setting(s) ['speed']"),
    (lambda d: d["settings"].update(roles=1), "roles=1"),
    (lambda d: d["settings"].update(noise_policy="magic"), "noise_policy='magic'"),
    (lambda d: d["intake"].update(min_games=-5), "min_games=-5"),
    (lambda d: d["noise"]["tau2"].pop(), "field 'noise'.tau2"),
    (lambda d: d.update(extra=1), "unknown field(s) ['extra']"),
    (lambda d: d.update(n_pool=True), "field 'n_pool'"),
    (lambda d: d.update(weights={"a": 1}), "field 'weights'"),
])
def test_broken_fields_are_refused_in_one_line(saved, tmp_path, mutate, words):
    data = json.loads(json.dumps(saved))
    mutate(data)
    _refused(data, tmp_path, words)


@pytest.mark.parametrize("mutate, field", [
    (lambda d: d.update(within_var=float("nan")), "within_var"),
    (lambda d: d.update(distance_q99=float("inf")), "distance_q99"),
    (lambda d: d["scaler_mean"].__setitem__(3, float("-inf")), "scaler_mean'[3]"),
    (lambda d: d["roles"][2].update(stability=float("nan")), "stability"),
])
def test_non_finite_numbers_are_refused(saved, tmp_path, mutate, field):
    data = json.loads(json.dumps(saved))
    mutate(data)  # json writes these as NaN / Infinity, which Python's reader accepts
    _refused(data, tmp_path, field)


def test_a_folder_or_deep_nesting_is_refused(tmp_path):
    with pytest.raises(ModelFileError, match="is a folder"):
        RoleModel.load(tmp_path)
    path = tmp_path / "deep.json"
    path.write_text("[" * 100_000 + "]" * 100_000)
    with pytest.raises(ModelFileError, match="nested too deeply"):
        RoleModel.load(path)
    path.write_text(json.dumps([[[[1]]]]))
    with pytest.raises(ModelFileError, match="not a drift model file"):
        RoleModel.load(path)
