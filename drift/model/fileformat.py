"""The model file: plain JSON with a schema version and a declared table of fields.

Every field is listed in :data:`FIELDS` with its kind and shape; shapes name
the model's sizes (``p`` features, ``q`` components, ``k`` roles, ``n`` any
length). :func:`from_dict` checks every field against the table before any of
it is used, so a hand-edited or truncated file fails with one line saying
which field is wrong, never deep inside placement. Never pickle.
"""

from __future__ import annotations

import math

from drift.errors import ModelFileError

__all__ = ["SCHEMA", "SCHEMA_VERSION", "FIELDS", "ROLE_FIELDS", "NOISE_COLUMNS", "to_dict",
           "from_dict", "save", "load", "FileMethods"]

SCHEMA = "drift-role-model"
SCHEMA_VERSION = 3
#: what older schema versions lacked, for the refusal message
_OLDER = {2: "its features' reliability came from their names, not from the data",
          1: "its features' reliability came from their names, not from the data"}

#: field -> (kind, shape). Kinds: float (finite), int, str, and the nested kinds below.
FIELDS = {
    "schema": ("str", ()),
    "schema_version": ("int", ()),
    "drift_version": ("str", ()),
    "library_versions": ("text_map", ()),
    "settings": ("settings", ()),
    "features": ("str", ("p",)),
    "families": ("str", ("p",)),
    "intake": ("intake", ()),
    "noise": ("noise", ()),
    "weights": ("float", ("p",)),
    "scaler_mean": ("float", ("p",)),
    "scaler_scale": ("positive", ("p",)),
    "pca_mean": ("float", ("p",)),
    "components": ("float", ("q", "p")),
    "explained_variance_ratio": ("float", ("q",)),
    "roles": ("roles", ("k",)),
    "within_var": ("positive", ()),
    "within_cov": ("float", ("q", "q")),
    "distance_q99": ("float", ()),
    "noise_calibration": ("float", (2,)),
    "calibration_sample": ("positive", ()),
    "calibration_range": ("float", (2,)),
    "null_df": ("positive", ()),
    "component_diagnostics": ("records", ("n",)),
    "role_diagnostics": ("records", ("n",)),
    "reference_seasons": ("str", ("n",)),
    "n_pool": ("int", ()),
    "fingerprint": ("str", ()),
}

#: one entry of ``roles``
ROLE_FIELDS = {
    "id": ("str", ()),
    "name": ("str", ()),
    "description": ("str", ()),
    "stability": ("float", ()),
    "size": ("int", ()),
    "centroid_components": ("float", ("q",)),
    "centroid_features": ("float", ("p",)),
}

#: column of ``noise`` -> kind; every column has one value per feature
NOISE_COLUMNS = {
    "feature": "str", "family": "str", "mean": "float", "sd": "float", "sigma2": "float",
    "drift_var": "float", "tau2": "float", "transient_var": "float", "year_to_year_r": "float_or_null",
    "signal_share": "float", "median_sample": "float", "n_pairs": "int", "missing": "int",
}


def to_dict(model) -> dict:
    """Everything needed to place new data, as plain JSON types, in :data:`FIELDS` order."""
    import numpy as np
    import scipy
    import sklearn

    from drift import __version__

    def arr(a):
        return np.asarray(a, float).tolist()

    return {
        "schema": SCHEMA, "schema_version": SCHEMA_VERSION,
        "drift_version": __version__,
        "library_versions": {"numpy": np.__version__, "scikit-learn": sklearn.__version__,
                             "scipy": scipy.__version__},
        "settings": model.settings.to_dict(),
        "features": list(model.features_), "families": list(model.families_),
        "intake": model.intake_.to_model_file(),
        "noise": {c: v.tolist() for c, v in model.noise_.reset_index().items()},
        "weights": arr(model.weights_), "scaler_mean": arr(model.scaler_mean_),
        "scaler_scale": arr(model.scaler_scale_), "pca_mean": arr(model.pca_mean_),
        "components": arr(model.components_),
        "explained_variance_ratio": arr(model.explained_variance_ratio_),
        "roles": [{"id": i, "name": n, "description": d, "stability": float(s), "size": int(z),
                   "centroid_components": arr(c), "centroid_features": arr(cf)}
                  for i, n, d, s, z, c, cf in zip(
                      model.role_ids_, model.role_names_, model.role_descriptions_,
                      model.role_stability_, model.role_sizes_, model.centroids_,
                      model.centroids_features_)],
        "within_var": model.within_var_, "within_cov": arr(model.within_cov_),
        "distance_q99": model.distance_q99_,
        "noise_calibration": list(model.noise_calibration_),
        "calibration_sample": model.calibration_sample_,
        "calibration_range": list(model.calibration_range_),
        "null_df": model.null_df_,
        "component_diagnostics": _records(model.component_diagnostics_),
        "role_diagnostics": _records(model.role_diagnostics_),
        "reference_seasons": list(model.reference_seasons_), "n_pool": model.n_pool_,
        "fingerprint": model.fingerprint_,
    }


def from_dict(cls, data, *, source="model"):
    """A fitted ``cls`` rebuilt from :func:`to_dict` output, after checking every field."""
    import numpy as np
    import pandas as pd

    validate(data, source=source)
    model = cls.from_settings(_settings(data["settings"], source))
    roles = data["roles"]
    model.features_ = tuple(data["features"])
    model.families_ = tuple(data["families"])
    model.intake_ = _intake(data["intake"], source)
    noise = pd.DataFrame(data["noise"]).set_index("feature")
    for col in noise.columns:
        if NOISE_COLUMNS.get(col) == "int":
            noise[col] = noise[col].astype(int)
        elif col != "family":
            noise[col] = noise[col].astype(float)
    model.noise_ = noise
    for name in ("weights", "scaler_mean", "scaler_scale", "pca_mean", "components",
                 "explained_variance_ratio"):
        setattr(model, f"{name}_", np.asarray(data[name], float))
    model.role_ids_ = [r["id"] for r in roles]
    model.role_names_ = [r["name"] for r in roles]
    model.role_descriptions_ = [r["description"] for r in roles]
    model.role_stability_ = np.asarray([r["stability"] for r in roles], float)
    model.role_sizes_ = [int(r["size"]) for r in roles]
    model.centroids_features_ = np.asarray([r["centroid_features"] for r in roles], float)
    model.within_var_ = float(data["within_var"])
    model.within_cov_ = np.asarray(data["within_cov"], float)
    model.distance_q99_ = float(data["distance_q99"])
    model.noise_calibration_ = [float(v) for v in data["noise_calibration"]]
    model.calibration_sample_ = float(data["calibration_sample"])
    model.calibration_range_ = [float(v) for v in data["calibration_range"]]
    model.null_df_ = float(data["null_df"])
    model.component_diagnostics_ = pd.DataFrame(data["component_diagnostics"])
    model.role_diagnostics_ = pd.DataFrame(data["role_diagnostics"])
    model.reference_seasons_ = list(data["reference_seasons"])
    model.n_pool_ = int(data["n_pool"])
    model.fingerprint_ = data["fingerprint"]
    model.centroids_ = np.asarray([r["centroid_components"] for r in roles], float)
    return model


def _settings(body, source):
    from drift.model.settings import ModelSettings

    return _build(ModelSettings, body, f"{source}: settings")


def _intake(body, source):
    from drift.intake.policy import IntakePolicy

    return IntakePolicy.from_model_file(body, where=f"{source}: intake")


def _build(kind, body, where):
    import dataclasses

    from drift.errors import DriftError

    known = {f.name for f in dataclasses.fields(kind)}
    unknown = sorted(set(body) - known)
    if unknown:
        raise ModelFileError(f"{where}: unknown setting(s) {unknown}; known: {sorted(known)}")
    try:
        return kind.from_dict(body)
    except DriftError as exc:
        raise ModelFileError(f"{where}: {exc}") from None


class FileMethods:
    """``to_dict``/``from_dict``/``save``/``load`` of :class:`drift.model.RoleModel`."""

    def to_dict(self) -> dict:
        """Everything needed to place new data, as plain JSON types (see :mod:`.fileformat`)."""
        self._check_fitted()
        return to_dict(self)

    @classmethod
    def from_dict(cls, data: dict, *, source="model"):
        """Rebuild a fitted model from :meth:`to_dict` output, validating every field first."""
        return from_dict(cls, data, source=source)

    def save(self, path):
        """Write the model as JSON."""
        self._check_fitted()
        save(self, path)

    @classmethod
    def load(cls, path):
        """Read a model written by :meth:`save`."""
        return load(cls, path)


# ---------------------------------------------------------------------------- checks
#: no number a fit writes comes near this; beyond it arithmetic on it overflows (placements NaN)
MAX_MAGNITUDE = 1e12


def validate(data, *, source="model") -> None:
    """Check ``data`` against :data:`FIELDS`; raise :class:`ModelFileError` with one line if not."""
    if not isinstance(data, dict) or data.get("schema") != SCHEMA:
        raise ModelFileError(f"{source}: not a drift model file (no 'schema': '{SCHEMA}')")
    if data.get("schema_version") in _OLDER:
        raise ModelFileError(
            f"{source}: schema_version {data['schema_version']} was written by an older drift "
            f"({_OLDER[data['schema_version']]}); this drift reads {SCHEMA_VERSION}: refit the model "
            "with this version (drift run on the same seasons)")
    if data.get("schema_version") != SCHEMA_VERSION:
        raise ModelFileError(
            f"{source}: schema_version {data.get('schema_version')!r} is not supported "
            f"(this drift reads {SCHEMA_VERSION}); refit with this version")
    missing = [f for f in FIELDS if f not in data]
    if missing:
        raise ModelFileError(f"{source}: model file is incomplete: missing field(s) {missing}; "
                             "refit and save it again")
    unknown = sorted(set(data) - set(FIELDS))
    if unknown:
        raise ModelFileError(f"{source}: unknown field(s) {unknown} in the model file; "
                             "it was not written by this drift")
    sizes = {"p": len(data["features"]) if isinstance(data["features"], list) else -1}
    components = data["components"]
    sizes["q"] = len(components) if isinstance(components, list) else -1
    sizes["k"] = len(data["roles"]) if isinstance(data["roles"], list) else -1
    for name, (kind, shape) in FIELDS.items():
        _check(data[name], kind, shape, sizes, f"{source}: field '{name}'")
    if min(sizes.values()) < 1:
        raise ModelFileError(f"{source}: the model has no features, components or roles; refit")
    ids = [r["id"] for r in data["roles"]]
    if len(set(ids)) != len(ids):
        raise ModelFileError(f"{source}: field 'roles': role ids repeat ({ids}); each must be unique")
    if data["noise"]["feature"] != data["features"]:
        raise ModelFileError(f"{source}: field 'noise': its features differ from 'features'; refit")
    if len(set(data["features"])) != len(data["features"]):
        raise ModelFileError(f"{source}: field 'features': names repeat; refit")
    for i, row in enumerate(data["components"]):  # principal axes have unit length
        if abs(math.sqrt(sum(x * x for x in row)) - 1) > 1e-6:
            raise ModelFileError(f"{source}: field 'components'[{i}]: not of unit length, so not a fitted "
                                 "component; the file was changed, refit")


def _check(value, kind, shape, sizes, where):
    if shape:
        want = shape[0] if isinstance(shape[0], int) else sizes.get(shape[0])
        if not isinstance(value, list) or (want is not None and len(value) != want):
            size = f"{want} entries" if want is not None else "a list"
            raise ModelFileError(f"{where}: expected {size} (shape {_shape_text(shape, sizes)}), "
                                 f"got {_describe(value)}; refit and save it again")
        for i, item in enumerate(value):
            _check(item, kind, shape[1:], sizes, f"{where}[{i}]")
        return
    _check_scalar(value, kind, sizes, where)


def _check_scalar(value, kind, sizes, where):
    if kind in ("float", "positive", "float_or_null"):
        if value is None and kind == "float_or_null":
            return
        ok = (isinstance(value, (int, float)) and not isinstance(value, bool) and math.isfinite(value)
              and abs(value) <= MAX_MAGNITUDE)
        if not ok or (kind == "positive" and value <= 0):
            need = "a positive finite number" if kind == "positive" else "a finite number"
            need += f" within +-{MAX_MAGNITUDE:.0e}"
            raise ModelFileError(f"{where}: expected {need}, got {_describe(value)}")
    elif kind == "int":
        if not isinstance(value, int) or isinstance(value, bool) or value < 0:
            raise ModelFileError(f"{where}: expected a whole number >= 0, got {_describe(value)}")
    elif kind == "str":
        if not isinstance(value, str):
            raise ModelFileError(f"{where}: expected text, got {_describe(value)}")
    elif kind in ("settings", "intake", "text_map"):
        if not isinstance(value, dict):
            raise ModelFileError(f"{where}: expected a table of settings, got {_describe(value)}")
        if kind == "text_map" and not all(isinstance(v, str) for v in value.values()):
            raise ModelFileError(f"{where}: expected text values")
    elif kind == "roles":
        _check_table(value, ROLE_FIELDS, sizes, where)
    elif kind == "noise":
        columns = {c: (k, ("p",)) for c, k in NOISE_COLUMNS.items()}
        _check_table(value, columns, sizes, where)
    elif kind == "records":
        if not isinstance(value, dict) or not all(
                v is None or isinstance(v, (str, int, float, bool)) for v in value.values()):
            raise ModelFileError(f"{where}: expected a row of plain values, got {_describe(value)}")
    else:  # pragma: no cover - a kind added to FIELDS without a check
        raise AssertionError(kind)


def _check_table(value, columns, sizes, where):
    if not isinstance(value, dict):
        raise ModelFileError(f"{where}: expected a table, got {_describe(value)}")
    missing = [c for c in columns if c not in value]
    unknown = sorted(set(value) - set(columns))
    if missing or unknown:
        raise ModelFileError(f"{where}: missing {missing}, unknown {unknown}; refit and save it again")
    for name, (kind, shape) in columns.items():
        _check(value[name], kind, shape, sizes, f"{where}.{name}")


def _shape_text(shape, sizes):
    return "(" + ", ".join(str(sizes.get(s, s)) for s in shape) + ")"


def _describe(value):
    text = repr(value) if not isinstance(value, (list, dict)) else f"{type(value).__name__} of {len(value)}"
    return text if len(text) <= 40 else text[:37] + "..."


# ---------------------------------------------------------------------------- files
def save(model, path) -> None:
    """Write the model as JSON (NaN written as null: strict JSON has none)."""
    import json
    from pathlib import Path

    text = json.dumps(_plain(to_dict(model)), indent=1, allow_nan=False)
    Path(path).write_text(text + "\n", encoding="utf-8")


def load(cls, path):
    """Read a model written by :func:`save`, refusing anything that is not one."""
    import json
    from pathlib import Path

    path = Path(path)
    if path.is_dir():
        raise ModelFileError(f"{path}: is a folder; give the model.json file inside it")
    try:
        data = json.loads(path.read_text(encoding="utf-8"))
    except FileNotFoundError:
        raise ModelFileError(f"{path}: model file not found") from None
    except (json.JSONDecodeError, UnicodeDecodeError) as exc:
        if path.suffix.lower() != ".json":  # most often a season file given first by mistake
            raise ModelFileError(
                f"{path}: not valid JSON, so not a model; MODEL must be the model.json written by "
                "`drift run` (drift place MODEL FILE...: the model first, then the season files)") from None
        raise ModelFileError(f"{path}: not valid JSON ({exc}); the file is broken, refit") from None
    except RecursionError:
        raise ModelFileError(f"{path}: JSON nested too deeply to be a model file") from None
    return from_dict(cls, data, source=str(path))


def _plain(obj):
    """JSON-ready copy: NaN and infinities become null (strict JSON has neither)."""
    if isinstance(obj, dict):
        return {k: _plain(v) for k, v in obj.items()}
    if isinstance(obj, (list, tuple)):
        return [_plain(v) for v in obj]
    if isinstance(obj, float) and not math.isfinite(obj):
        return None
    return obj


def _records(frame):
    import numpy as np

    return [{k: (v.item() if isinstance(v, np.generic) else v) for k, v in row.items()}
            for row in frame.to_dict(orient="records")]
