"""drift: season-over-season role drift for basketball front offices.

Public names are loaded on first use so that ``import drift`` (and ``drift --help``)
costs nothing.
"""

__version__ = "0.1.0"

__all__ = [
    "run", "analyse", "fit_model", "check", "place", "prepare", "place_files", "check_files",
    "RoleModel", "Config", "load_config", "read_seasons", "Database", "align_models", "DriftError", "InputError", "ConfigError", "ModelFileError",
    "NotFittedError", "DriftWarning", "DataQualityWarning", "ModelQualityWarning",
    "__version__",
]

_WHERE = {
    "run": "api", "analyse": "api", "fit_model": "api", "check": "api", "place": "api", "prepare": "api",
    "place_files": "api", "check_files": "api",
    "RoleModel": "model", "Config": "config", "load_config": "config", "read_seasons": "intake",
    "Database": "intake",
    "align_models": "model.align",
}


def __getattr__(name):
    import importlib

    if name in _WHERE:
        return getattr(importlib.import_module(f".{_WHERE[name]}", __name__), name)
    if name in __all__:
        return getattr(importlib.import_module(".errors", __name__), name)
    raise AttributeError(f"module 'drift' has no attribute {name!r}")
