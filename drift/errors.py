"""drift's exceptions and warnings.

::

    DriftError                  base class; the CLI turns it into one line, exit 2
    ├── InputError              a data file or folder cannot be used as given
    ├── ConfigError             the TOML config is unreadable or inconsistent
    ├── ModelFileError          model.json is broken, of another schema, or mismatched
    └── NotFittedError          a model method needs ``fit`` first

    DriftWarning                base class of drift's warnings
    ├── DataQualityWarning      input accepted but worth a look (imputed values, few rows)
    └── ModelQualityWarning     fitted, but a diagnostic is weak (an unstable role)
"""

from __future__ import annotations

__all__ = [
    "DriftError",
    "InputError",
    "ConfigError",
    "ModelFileError",
    "NotFittedError",
    "DriftWarning",
    "DataQualityWarning",
    "ModelQualityWarning",
]


class DriftError(Exception):
    """Base class of every error drift raises on purpose."""


class InputError(DriftError, ValueError):
    """A data file, folder or column cannot be used as given.

    Parameters
    ----------
    message : str
        What is wrong and how to fix it.
    file, row, column : optional
        Where. ``row`` is the 1-based data row in the file (header excluded).
    """

    def __init__(self, message: str, *, file=None, row=None, column=None):
        self.file, self.row, self.column = file, row, column
        where = []
        if file is not None:
            where.append(str(file))
        if row is not None:
            where.append(f"row {row}")
        if column is not None:
            where.append(f"column '{column}'")
        prefix = ", ".join(where)
        super().__init__(f"{prefix}: {message}" if prefix else message)


class ConfigError(DriftError, ValueError):
    """The configuration file is unreadable or inconsistent."""


class ModelFileError(DriftError, ValueError):
    """A model file is broken, of an unknown schema, or does not fit the data."""


class NotFittedError(DriftError, AttributeError):
    """A model method was called before ``fit``."""


class DriftWarning(UserWarning):
    """Base class of drift's warnings."""


class DataQualityWarning(DriftWarning):
    """The input was accepted but something in it deserves a look."""


class UnreliableFeatureWarning(DataQualityWarning):
    """A feature's measured reliability is near zero: it was down-weighted to near zero."""


class ModelQualityWarning(DriftWarning):
    """The model was fitted but one of its diagnostics is weak."""
