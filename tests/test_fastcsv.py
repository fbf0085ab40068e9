"""The fast CSV writer gives exactly pandas' bytes."""

from __future__ import annotations

import numpy as np
import pandas as pd
from hypothesis import given, settings
from hypothesis import strategies as st

from drift.output._fastcsv import write_frame

TEXT = st.one_of(st.none(), st.text(alphabet=st.sampled_from(list('ab ,"\n\'=-x1.')), max_size=6))
FLOAT = st.one_of(st.floats(allow_nan=True, allow_infinity=True),
                  st.sampled_from([0.0, -0.0, 1e-5, 1e-4, 1e16, 1e15, 123456789.0, 0.1 + 0.2]))


def _same_bytes(frame, tmp_path):
    write_frame(frame, tmp_path / "fast.csv")
    frame.to_csv(tmp_path / "pandas.csv", index=False)  # reference: pandas itself
    return (tmp_path / "fast.csv").read_bytes() == (tmp_path / "pandas.csv").read_bytes()


@settings(max_examples=60, deadline=None)
@given(st.lists(st.tuples(FLOAT, st.integers(-10 ** 12, 10 ** 12), st.booleans(), TEXT), max_size=12))
def test_random_tables_are_written_byte_for_byte_as_pandas(tmp_path_factory, rows):
    tmp = tmp_path_factory.mktemp("csv")
    frame = pd.DataFrame(rows, columns=["x", "n", "flag", "name"])
    frame["n"] = frame["n"].astype("int64")
    frame["x"] = frame["x"].astype("float64")
    frame["label"] = pd.array([r[3] for r in rows], dtype="str")
    assert _same_bytes(frame, tmp)


def test_blocks_and_odd_columns_match_pandas(tmp_path, monkeypatch):
    import drift.output._fastcsv as fastcsv

    monkeypatch.setattr(fastcsv, "BLOCK_ROWS", 7)
    rng = np.random.default_rng(0)
    frame = pd.DataFrame({"a,b": rng.standard_normal(30) * 10.0 ** rng.integers(-8, 20, 30),
                          "count": np.arange(30, dtype=np.int32), "obj": [1.5, None, "x", True, 2] * 6})
    assert _same_bytes(frame, tmp_path)
    frame["when"] = pd.Timestamp("2024-01-01")  # a dtype it leaves to pandas
    assert _same_bytes(frame, tmp_path)
    assert _same_bytes(pd.DataFrame({"only": ["", "a"]}), tmp_path)
    assert _same_bytes(pd.DataFrame({"a": ["x\ry", "z"], "b": [1, 2]}), tmp_path)
