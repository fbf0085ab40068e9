"""drift: season-over-season role drift for basketball front offices.

Public names are loaded on first use so that ``import drift`` (and ``drift --help``)
costs nothing.
"""

__version__ = "0.1.0"

__all__ = [
    "RoleModel", "Config", "load_config", "read_seasons", "prepare", "run", "place_files",
    "align_models", "DriftError", "InputError", "ConfigError", "ModelFileError",
    "NotFittedError", "DriftWarning", "DataQualityWarning", "ModelQualityWarning",
    "__version__",
]

_WHERE = {
    "RoleModel": "model", "Config": "config", "load_config": "config", "read_seasons": "intake",
    "prepare": "api", "run": "api", "place_files": "api", "align_models": "align",
}


def __getattr__(name):
    import importlib

    if name in _WHERE:
        return getattr(importlib.import_module(f".{_WHERE[name]}", __name__), name)
    if name in __all__:
        return getattr(importlib.import_module(".errors", __name__), name)
    raise AttributeError(f"module 'drift' has no attribute {name!r}")
