"""Atomic outputs: a run's folder appears whole or not at all."""

from __future__ import annotations

import os
import shutil
import tempfile
from contextlib import contextmanager
from pathlib import Path

from .errors import InputError

__all__ = ["atomic_folder", "atomic_file", "MARKER_FILES"]

#: a folder holding one of these is a drift output that may be replaced
MARKER_FILES = ("model.json", "report.html")


@contextmanager
def atomic_folder(out):
    """Yield a temporary folder beside ``out``; on success it replaces ``out``.

    An existing ``out`` is replaced only if it is empty or an earlier drift output.
    On any error the temporary folder is removed and ``out`` is untouched.
    """
    out = Path(out)
    if out.exists():
        if not out.is_dir():
            raise InputError("--out exists and is a file; give a folder", file=out)
        if any(out.iterdir()) and not any((out / m).exists() for m in MARKER_FILES):
            raise InputError("--out is a non-empty folder that is not a drift output; "
                             "give a new or empty folder", file=out)
    out.parent.mkdir(parents=True, exist_ok=True)
    tmp = Path(tempfile.mkdtemp(prefix=f".{out.name}.", dir=out.parent))
    umask = os.umask(0)
    os.umask(umask)
    os.chmod(tmp, 0o777 & ~umask)  # mkdtemp makes it private; an output folder is not
    try:
        yield tmp
        if out.exists():
            old = Path(tempfile.mkdtemp(prefix=f".{out.name}.old.", dir=out.parent))
            os.replace(out, old / out.name)
            os.replace(tmp, out)
            shutil.rmtree(old, ignore_errors=True)
        else:
            os.replace(tmp, out)
    finally:
        if tmp.exists():
            shutil.rmtree(tmp, ignore_errors=True)


@contextmanager
def atomic_file(path):
    """Yield a temporary path beside ``path``; on success it replaces ``path``."""
    path = Path(path)
    path.parent.mkdir(parents=True, exist_ok=True)
    fd, tmp = tempfile.mkstemp(prefix=f".{path.name}.", dir=path.parent)
    os.close(fd)
    tmp = Path(tmp)
    umask = os.umask(0)
    os.umask(umask)
    os.chmod(tmp, 0o666 & ~umask)
    try:
        yield tmp
        os.replace(tmp, path)
    finally:
        if tmp.exists():
            tmp.unlink()
