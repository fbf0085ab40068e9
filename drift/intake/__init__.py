"""Intake: season tables in, one clean table of player-seasons out.

In
    Paths to season files (CSV, Excel, Parquet) or folders of them -- or a pandas
    DataFrame, a mapping of name -> DataFrame, an Arrow table, or a :class:`Database`
    (table or query) -- and an :class:`IntakePolicy` (column map, name rules, units, filters).
Out
    :class:`RawSeasons` (one row per file row, drift's standard names, float
    features, ``source_file``/``source_row``) and :class:`Prepared` (one row per
    player-season, stints of traded players, kept and excluded rows with reasons,
    the feature families in :class:`FeatureSpec`).

Steps: read the files (``_readers`` tells them apart by their bytes; ``_text`` decodes
and checks delimited text; ``_workbooks`` reads Excel; ``_rawtables``) or the tables that
are not files (``_frames`` for DataFrames and Arrow tables, ``_database`` for SQL; both
make the readers' ``RawTable`` s, so everything after reading is shared), parse cells
(``_cells``), understand column names (``_columns``; messages in the export's words and
the closest names in ``_names``), harmonise units (``_units``), refuse impossible values
(``_ranges``), find combined rows and combine stints (``_stints``), fill unused shares
and filter (``features``). The pre-fit checks (``preflight``) refuse settings the data
cannot honour, and the dry run (``dry_run``) is ``drift check``: intake and filters, no fit.
"""

from drift.intake._database import Database
from drift.intake.dry_run import DataCheck, check_data, format_check
from drift.intake.features import FeatureSpec, feature_spec
from drift.intake.policy import REQUIRED_COLUMNS, STANDARD_COLUMNS, IntakePolicy, intake_policy
from drift.intake.prepare import Prepared, prepare, reference_pool
from drift.intake.read import RawSeasons, read_seasons

__all__ = ["IntakePolicy", "intake_policy", "REQUIRED_COLUMNS", "STANDARD_COLUMNS", "RawSeasons", "read_seasons",
           "Prepared", "prepare", "reference_pool", "FeatureSpec", "feature_spec", "DataCheck", "check_data",
           "format_check", "Database"]
