"""Writing outputs safely: output folders, the ownership marker and CSV tables.

In
    DataFrames and rendered pages from the earlier stages, and an output path.
Out
    Files on disk, written atomically (a folder swapped in whole, or a file
    renamed into place), with a marker that records what drift wrote so that
    drift only ever replaces or removes its own files; CSV text cells are
    neutralised for spreadsheets; tables in CSV or Parquet, each role id with
    its role's name beside it.
"""

from drift.output.folders import atomic_file, atomic_folder, check_output_file, check_output_folder
from drift.output._marker import KINDS, MARKER
from drift.output.tables import check_parquet, with_role_names, write_csv, write_parquet, write_table

__all__ = ["atomic_folder", "atomic_file", "check_output_folder", "check_output_file", "write_csv", "write_parquet",
           "write_table", "with_role_names", "check_parquet", "MARKER", "KINDS"]
