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
        Where. ``row`` is the row as a spreadsheet shows it (a CSV's header is row 1);
        ``column`` the export's own name for the column.
    read_as : str, optional
        drift's name for that column, shown beside the export's when they differ
        (``column 'DREB_PCT' (drift's drb_pct)``).
    """

    def __init__(self, message: str, *, file=None, row=None, column=None, read_as=None):
        self.file, self.row, self.column, self.read_as = file, row, column, read_as
        self.message = message
        where = []
        if file is not None:
            where.append(str(file))
        if row is not None:
            where.append(f"row {row}")
        if column is not None:
            named = f" (drift's {read_as})" if read_as and read_as != column else ""
            where.append(f"column '{column}'{named}")
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
