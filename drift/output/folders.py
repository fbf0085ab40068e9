"""Outputs drift owns: folders replaced whole or not at all, never a file drift did not write.

An output folder carries a marker file, ``.drift-output.json``, naming the files drift wrote
there and the kind of output (the command that wrote it). A rerun of the same command replaces
only a folder with a valid marker of its own kind (or an empty one), removes only the files the
marker names, and keeps everything else the user put in the folder; another command's output
folder is refused, and so is a single file (``drift place --out FILE``) that a marker lists. No output may
be, contain or lie inside an input (data files and folders, the model, the config).

How a folder is replaced (Linux): the new outputs are written into a hidden staging folder
beside ``out`` (``.<name>.drift-new-<pid>-<random>``); the user's own files are carried in
as hard links; then one ``renameat2(RENAME_EXCHANGE)`` swaps the two folders, so at every
instant ``out`` is either the complete old output or the complete new one. Where that call
is missing, ``out`` is first moved to ``.<name>.drift-old-<pid>-<random>`` and the next run
puts it back if it was interrupted between the two renames. A run killed at any point leaves
hidden litter whose process is gone; the next run removes it, but only what it can prove is
its own (the files its marker names, files it wrote while staging, and links whose twin is
in ``out``).
"""

from __future__ import annotations

import os
import secrets
import signal
from contextlib import contextmanager
from pathlib import Path

from drift.errors import InputError
from drift.output._marker import (
    KINDS,
    MARKER,
    clean_litter,
    files_under,
    marker_kind,
    read_marker,
    remove_owned,
    write_marker,
)

__all__ = ["MARKER", "check_inputs", "check_output_folder", "atomic_folder", "check_output_file",
           "atomic_file"]

_TEST_KILL = "_DRIFT_TEST_KILL_AT"  # test-only: SIGKILL ourselves at a named step
_TEST_NO_EXCHANGE = "_DRIFT_TEST_NO_EXCHANGE"  # test-only: use the two-rename fallback


def _test_point(name):
    # Tests kill a subprocess at a chosen step to prove what an interruption leaves behind.
    if os.environ.get(_TEST_KILL) == name:
        os.kill(os.getpid(), signal.SIGKILL)


def _abs(path) -> Path:
    return Path(os.path.abspath(os.fspath(path)))


def check_inputs(out, inputs, *, what="--out"):
    """Refuse an output that is, contains or lies inside one of ``inputs``."""
    out_abs = _abs(out)
    out_real = Path(os.path.realpath(out_abs))
    for given in inputs:
        if given is None:
            continue
        real = Path(os.path.realpath(_abs(given)))
        if out_real == real:
            raise InputError(f"{what} is the input {given}; drift never overwrites its inputs, "
                             "choose another path", file=out)
        if out_real in real.parents:
            raise InputError(f"{what} contains the input {given}; replacing it would delete the "
                             "input, choose another path", file=out)
        if real in out_real.parents:
            raise InputError(f"{what} lies inside the input folder {given}; the next run would read "
                             "it as data, choose a path outside it", file=out)


def _nearest_existing(path: Path) -> Path:
    while not os.path.lexists(path) and path != path.parent:
        path = path.parent
    return path


def _check_parent(out: Path, what: str) -> None:
    base = _nearest_existing(out.parent)
    if not base.is_dir():
        raise InputError(f"{what} cannot be created: {base} is a file, not a folder", file=out)
    if not os.access(base, os.W_OK | os.X_OK):
        raise InputError(f"{what} cannot be written: no write permission in {base}", file=out)


def _check_not_csv(out: Path, kind: str) -> None:
    if out.suffix.lower() == ".csv" and not out.is_dir():
        alone = " (without --against, drift place writes one CSV)" if kind == "inseason" else ""
        raise InputError(f"--out {out.name} ends in .csv, but `{KINDS[kind]}` writes a folder{alone}; "
                         f"give a folder name such as {out.stem}", file=out)


def _check_kind(out: Path, marker: dict, kind: str) -> None:
    found = marker_kind(marker)
    if found != kind:
        writer = KINDS.get(found, f"a drift command ({found})")
        raise InputError(f"--out is the output folder of `{writer}`; `{KINDS[kind]}` never replaces "
                         "another command's output, choose another folder", file=out)


def check_output_folder(out, *, kind, inputs=(), names=()) -> dict:
    """Check before any work that ``out`` may be written; return what it holds.

    Parameters
    ----------
    out : path
    kind : str
        The kind of output (a key of :data:`drift.output._marker.KINDS`); a folder another kind
        of output owns is refused.
    inputs : paths that the output must not be, contain or lie inside
    names : file names the run may write (a user's file of one of these names is refused)

    Returns
    -------
    dict
        ``owned`` (relative paths of the files drift wrote there before).

    Raises
    ------
    InputError
        With the reason and the fix.
    """
    out = _abs(out)
    if out.parent == out:
        raise InputError("--out cannot be the root of the file system; give a folder", file=out)
    check_inputs(out, inputs)
    _check_not_csv(out, kind)
    _check_parent(out, "--out")
    clean_litter(out)
    if out.is_symlink():
        raise InputError("--out is a symbolic link; give the folder itself", file=out)
    if not out.exists():
        return {"owned": set()}
    if not out.is_dir():
        raise InputError("--out exists and is a file; give a folder", file=out)
    if not os.access(out, os.W_OK | os.X_OK):
        raise InputError("--out cannot be written: no write permission", file=out)
    present = {p.name for p in out.iterdir()} - {MARKER}
    marker = read_marker(out)
    if marker is None or marker["state"] != "complete":
        if present or (out / MARKER).exists():
            raise InputError(f"--out is a non-empty folder that is not a drift output (no valid {MARKER}); "
                             "give a new or empty folder", file=out)
        return {"owned": set()}
    _check_kind(out, marker, kind)
    owned = set(marker["files"])
    # a folder drift wrote (report-data/) is owned through the files in it
    held = owned | {f.split("/", 1)[0] for f in owned if "/" in f}
    clash = sorted(n for n in set(names) - held if os.path.lexists(out / n))
    if clash:
        raise InputError(f"--out holds {', '.join(clash)}, which drift did not write there; move it "
                         "away or choose another folder", file=out)
    return {"owned": owned}


def _carry(src: Path, dst: Path, owned, rel="") -> None:
    """Recreate in ``dst`` what ``src`` holds that drift does not own: files as hard links,
    symbolic links as equal links, folders as folders. A name taken by a new output is refused.
    """
    for entry in sorted(src.iterdir()):
        r = rel + entry.name
        target = dst / entry.name
        if entry.is_dir() and not entry.is_symlink():
            if os.path.lexists(target) and not (target.is_dir() and not target.is_symlink()):
                raise InputError(f"--out holds the folder {r}, which drift did not write there and "
                                 "now writes a file of that name; move it away", file=src)
            target.mkdir(exist_ok=True)
            _carry(entry, target, owned, r + "/")
            continue
        if r == MARKER or r in owned:
            continue
        if os.path.lexists(target):
            raise InputError(f"--out holds {r}, which drift did not write there; move it away "
                             "or choose another folder", file=src)
        if entry.is_symlink():
            os.symlink(os.readlink(entry), target)
        elif entry.is_file():
            os.link(entry, target)
        else:
            raise InputError(f"--out holds {r}, a special file drift cannot keep; move it away", file=src)


_EXCHANGE = None


def _exchange(a: Path, b: Path) -> bool:
    """Atomically swap two paths (Linux renameat2); False when the system cannot."""
    global _EXCHANGE  # a cached libc handle, not state of a run
    if os.environ.get(_TEST_NO_EXCHANGE):
        return False
    if _EXCHANGE is None:
        import ctypes
        import ctypes.util

        try:
            libc = ctypes.CDLL(ctypes.util.find_library("c") or None, use_errno=True)
            _EXCHANGE = libc.renameat2
        except (OSError, AttributeError):
            _EXCHANGE = False
    if not _EXCHANGE:
        return False
    at_cwd, rename_exchange = -100, 2
    if _EXCHANGE(at_cwd, os.fsencode(a), at_cwd, os.fsencode(b), rename_exchange) == 0:
        return True
    return False


@contextmanager
def _signals_held():
    """Hold Ctrl-C and SIGTERM during the swap; they act right after it."""
    held = {signal.SIGINT, signal.SIGTERM}
    try:
        old = signal.pthread_sigmask(signal.SIG_BLOCK, held)
    except (AttributeError, OSError, ValueError):
        yield
        return
    try:
        yield
    finally:
        signal.pthread_sigmask(signal.SIG_SETMASK, old)


def _staging(out: Path, kind: str) -> Path:
    return out.parent / f".{out.name}.drift-{kind}-{os.getpid()}-{secrets.token_hex(4)}"


def _commit(tmp: Path, out: Path, inputs, kind) -> None:
    state = check_output_folder(out, kind=kind, inputs=inputs, names=files_under(tmp))
    write_marker(tmp, "complete", files_under(tmp), kind=kind)
    with _signals_held():
        if not out.exists():
            os.rename(tmp, out)
            return
        _carry(out, tmp, state["owned"])
        _test_point("carried")
        if _exchange(tmp, out):
            old = tmp
        else:
            old = _staging(out, "old")
            os.rename(out, old)
            _test_point("moved-away")
            os.rename(tmp, out)
        _test_point("swapped")
        try:
            remove_owned(old, state["owned"], out)
        except OSError:
            pass  # the new output is in place; the next run removes what is left


@contextmanager
def atomic_folder(out, *, kind, inputs=()):
    """Yield a staging folder; on success it replaces ``out`` (see the module docstring).

    ``out`` is checked first (:func:`check_output_folder`). On any error, or Ctrl-C, the
    staging folder is removed and ``out`` is untouched.
    """
    out = _abs(out)
    check_output_folder(out, kind=kind, inputs=inputs)
    out.parent.mkdir(parents=True, exist_ok=True)
    tmp = _staging(out, "new")
    tmp.mkdir()
    committed = False
    try:
        write_marker(tmp, "staging", kind=kind)
        _test_point("staging")
        os.chmod(tmp, 0o777 & ~_umask())
        yield tmp
        _test_point("written")
        _commit(tmp, out, inputs, kind)
        committed = True  # after the swap ``tmp`` may hold the old output: _commit cleaned it
    finally:
        if not committed and tmp.exists():
            remove_owned(tmp, None, out if out.is_dir() else None)


def _umask() -> int:
    mask = os.umask(0)
    os.umask(mask)
    return mask


def check_output_file(path, *, inputs=(), header=("player_id", "role"), what="--out"):
    """Check before any work that the file ``path`` may be written.

    An existing file is replaced only when empty or when its first line is a CSV header
    holding every name in ``header`` (a file drift wrote); anything else is refused. A file
    that the marker of an enclosing output folder lists belongs to that output and is refused
    whatever its header.
    """
    path = _abs(path)
    check_inputs(path, inputs, what=what)
    _check_parent(path, what)
    clean_litter(path)
    if path.is_symlink() or (path.exists() and not path.is_file()):
        raise InputError(f"{what} exists and is not a regular file; give a file path", file=path)
    _check_not_listed(path, what)
    if path.exists() and path.stat().st_size > 0:
        try:
            with open(path, encoding="utf-8", newline="") as fh:
                first = fh.readline(10_000)
        except (OSError, UnicodeDecodeError):
            first = ""
        fields = {f.strip().strip('"') for f in first.rstrip("\r\n").split(",")}
        if not set(header) <= fields:
            raise InputError(f"{what} exists and is not a file drift wrote (its header lacks "
                             f"{', '.join(header)}); choose another path or remove it", file=path)
    return path


def _check_not_listed(path: Path, what: str) -> None:
    """Refuse a file that an output folder above it lists in its marker (another output's file)."""
    rel = path.name
    for folder in path.parents:
        marker = read_marker(folder)
        if marker is not None and rel in marker["files"]:
            writer = KINDS.get(marker_kind(marker), "drift")
            raise InputError(f"{what} is {rel} of the `{writer}` output in {folder}; drift never "
                             "overwrites another output's file, choose a path outside that folder", file=path)
        rel = f"{folder.name}/{rel}"


@contextmanager
def atomic_file(path, *, inputs=(), header=("player_id", "role"), what="--out"):
    """Yield a temporary path beside ``path``; on success it replaces ``path``."""
    path = check_output_file(path, inputs=inputs, header=header, what=what)
    path.parent.mkdir(parents=True, exist_ok=True)
    tmp = _staging(path, "tmp")
    try:
        yield tmp
        if tmp.exists():
            os.chmod(tmp, 0o666 & ~_umask())
        check_output_file(path, inputs=inputs, header=header, what=what)
        with _signals_held():
            os.replace(tmp, path)
    finally:
        if tmp.exists():
            tmp.unlink()
