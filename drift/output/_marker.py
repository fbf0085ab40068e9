"""What drift can prove it owns: the marker file of an output folder and the litter of killed runs.

The marker, ``.drift-output.json``, says ``written_by: drift``, a ``state`` (``staging`` while a
run writes, ``complete`` once done), the ``kind`` of output (``run``, ``inseason``, ``demo``: the
command that wrote it) and the relative paths of the files drift wrote. Litter is
a hidden sibling ``.<name>.drift-(new|old|tmp)-<pid>-<random>`` left by a run that was killed;
it is removed only when its process is gone, and then only what the rules of
:func:`remove_owned` prove to be drift's.
"""

from __future__ import annotations

import json
import os
from pathlib import Path

__all__ = ["MARKER", "KINDS", "read_marker", "marker_kind", "write_marker", "files_under", "remove_owned",
           "clean_litter"]

#: the marker file drift writes into every output folder
MARKER = ".drift-output.json"

#: each kind of output folder and the command that writes it (named in refusals)
KINDS = {"run": "drift run", "inseason": "drift place --against", "demo": "drift demo"}


def _pid_alive(pid: int) -> bool:
    if pid == os.getpid():
        return True
    try:
        os.kill(pid, 0)
    except ProcessLookupError:
        return False
    except (PermissionError, OverflowError):
        return True
    return True


def _litter_pid(name: str, target: str):
    """The pid in a litter name ``.<target>.drift-(new|old|tmp)-<pid>-<hex>``, else None."""
    prefix = f".{target}.drift-"
    if not name.startswith(prefix):
        return None
    parts = name[len(prefix):].split("-")
    if len(parts) != 3 or parts[0] not in ("new", "old", "tmp") or not parts[1].isdigit():
        return None
    return parts[0], int(parts[1])


def read_marker(folder: Path):
    """The marker's dict, or None when there is none or it is not drift's."""
    path = folder / MARKER
    try:
        if path.is_symlink() or not path.is_file() or path.stat().st_size > 1_000_000:
            return None
        data = json.loads(path.read_text(encoding="utf-8"))
    except (OSError, ValueError):
        return None
    if (not isinstance(data, dict) or data.get("written_by") != "drift"
            or data.get("state") not in ("staging", "complete")
            or not isinstance(data.get("files"), list)
            or not all(isinstance(f, str) and _safe_relative(f) for f in data["files"])
            or not isinstance(data.get("kind", ""), str)):
        return None
    return data


def marker_kind(marker: dict) -> str:
    """The kind of output a marker describes.

    A marker without ``kind`` (written before drift recorded it) is read by its files:
    ``model.json`` or ``report.html`` is a run, ``inseason.csv`` or ``inseason.html`` an
    in-season check, anything else the demo league.
    """
    if marker.get("kind"):
        return marker["kind"]
    files = set(marker["files"])
    if files & {"model.json", "report.html"}:
        return "run"
    if files & {"inseason.csv", "inseason.html"}:
        return "inseason"
    return "demo"


def _safe_relative(path: str) -> bool:
    parts = path.split("/")
    return bool(path) and not path.startswith("/") and all(p not in ("", ".", "..") for p in parts)


def files_under(folder: Path, rel="") -> list:
    """Relative paths ('a.csv', 'truth/t.csv') of the regular files drift wrote under ``folder``."""
    found = []
    for entry in sorted(folder.iterdir()):
        r = rel + entry.name
        if entry.is_dir() and not entry.is_symlink():
            found += files_under(entry, r + "/")
        elif entry.is_file() and not entry.is_symlink() and r != MARKER:
            found.append(r)
    return found


def write_marker(folder: Path, state: str, files=(), *, kind=None):
    data = {"written_by": "drift", "state": state, "files": sorted(files)}
    if kind is not None:
        data["kind"] = kind
    text = json.dumps(data, indent=1)
    (folder / MARKER).write_text(text + "\n", encoding="utf-8")


def _twins(a: Path, b: Path) -> bool:
    """True when ``a`` and ``b`` are the same file (hard links) or equal symbolic links."""
    try:
        if a.is_symlink():
            return b.is_symlink() and os.readlink(a) == os.readlink(b)
        sa, sb = os.lstat(a), os.lstat(b)
    except OSError:
        return False
    return (sa.st_dev, sa.st_ino) == (sb.st_dev, sb.st_ino)


def remove_owned(folder: Path, owned, twin_root, rel="") -> None:
    """Remove from ``folder`` only what drift can prove is its own, then the folder if empty.

    ``owned`` is a set of relative paths, or None for a staging folder (every regular file in
    it was written by drift). Anything else is removed only when ``twin_root`` holds its twin.
    """
    for entry in list(folder.iterdir()):
        r = rel + entry.name
        twin = twin_root / entry.name if twin_root is not None else None
        if entry.is_dir() and not entry.is_symlink():
            remove_owned(entry, owned, twin, r + "/")
            continue
        mine = ((r == MARKER) or (owned is not None and r in owned)
                or (owned is None and entry.is_file() and not entry.is_symlink()))
        if mine or (twin is not None and _twins(entry, twin)):
            entry.unlink()
    try:
        folder.rmdir()
    except OSError:
        pass  # something we cannot prove is ours is still there: leave it


def clean_litter(out: Path) -> None:
    """Restore an output moved away by an interrupted run, and remove provable litter."""
    parent = out.parent
    if not parent.is_dir():
        return
    found = []
    for entry in parent.iterdir():
        tag = _litter_pid(entry.name, out.name)
        if tag is not None and not _pid_alive(tag[1]) and not entry.is_symlink():
            found.append((tag[0], entry))
    if not os.path.lexists(out):
        backups = [e for kind, e in found if kind == "old" and e.is_dir()
                   and (read_marker(e) or {}).get("state") == "complete"]
        if backups:
            newest = max(backups, key=lambda e: e.stat().st_mtime)
            os.rename(newest, out)
            found = [(k, e) for k, e in found if e != newest]
    for kind, entry in found:
        if entry.is_dir():
            marker = read_marker(entry)
            if marker is None:
                if not any(entry.iterdir()):
                    entry.rmdir()
                continue
            owned = None if marker["state"] == "staging" else set(marker["files"])
            remove_owned(entry, owned, out if out.is_dir() else None)
        elif kind == "tmp" and entry.is_file():
            entry.unlink()
