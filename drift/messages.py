"""What the command line prints: one line per failure or warning, never a traceback by default.

``run_guarded`` runs one command and turns every way it can end into a short, safe message:

- ``DriftError`` -> ``drift: error: <what, where, fix>``, exit 2;
- any other exception -> one ``drift: error: internal error ...`` line pointing to ``--debug``
  (which prints the traceback too), exit 2;
- Ctrl-C -> ``drift: interrupted``, exit 130; SIGTERM -> the same, exit 143;
- a closed pipe on standard output (``drift ... | head``) -> nothing more, exit 141.

Warnings raised while the command runs (drift's own and those of numpy, scikit-learn,
matplotlib ...) are recorded once, counted, and printed as one ``drift: warning:`` line each
after the command and before its final line. They are printed with ``print``, never re-shown
through :mod:`warnings` (a re-shown warning inside the recording block would be recorded
again, and a loop over the records would never end).

Text that reaches the terminal has control characters escaped (``\\x1b`` ...), so a player
name or path cannot move the cursor, recolour the screen or hide the rest of the line.

The result objects' short summaries in a notebook and a terminal are built here too
(:func:`html_summary` for ``_repr_html_``, :func:`text_summary` for ``__repr__``): every
value is escaped, since names, teams and paths are the user's text.
"""

from __future__ import annotations

import sys

__all__ = ["printable", "one_line", "run_guarded", "Terminated", "html_summary", "text_summary"]

_BIDI = set(range(0x202A, 0x202F)) | set(range(0x2066, 0x206A))


class Terminated(KeyboardInterrupt):
    """Raised in the main thread by SIGTERM, so clean-up code runs as on Ctrl-C."""


def printable(text) -> str:
    """``text`` with control, bidi-override and unpaired-surrogate characters escaped."""
    import unicodedata

    out = []
    for ch in str(text):
        code = ord(ch)
        if code in _BIDI or unicodedata.category(ch) in ("Cc", "Cs"):
            out.append(f"\\x{code:02x}" if code < 0x100 else f"\\u{code:04x}")
        else:
            out.append(ch)
    return "".join(out)


def one_line(text) -> str:
    """The non-empty lines of ``text`` joined by spaces, made printable."""
    return printable(" ".join(part.strip() for part in str(text).splitlines() if part.strip()))


def warning_lines(records) -> list:
    """One line per kind of warning, in first-seen order, with a count when repeated.

    Messages that differ only in their numbers ("6 clusters" / "7 clusters") are one kind;
    the line shows the first of them.
    """
    import re

    from drift.errors import DriftWarning

    counts, order, first = {}, [], {}
    for w in records:
        message = one_line(w.message)
        if len(message) > 400:
            message = message[:400] + "..."
        if issubclass(w.category, DriftWarning):
            line = f"drift: warning: {message}"
        else:
            line = f"drift: warning: {w.category.__name__}: {message}"
        kind = re.sub(r"\d+(\.\d+)?", "#", line)
        if kind not in counts:
            order.append(kind)
            counts[kind] = 0
            first[kind] = line
        counts[kind] += 1
    return [first[k] if counts[k] == 1 else f"{first[k]} ({counts[k]} times)" for k in order]


def _on_sigterm(signum, frame):
    raise Terminated()


def _install_sigterm():
    import signal
    import threading

    if threading.current_thread() is not threading.main_thread():
        return None
    try:
        return signal.signal(signal.SIGTERM, _on_sigterm)
    except (ValueError, OSError):
        return None


def _restore_sigterm(previous):
    import signal

    if previous is not None:
        signal.signal(signal.SIGTERM, previous)


def _silence_stdout():
    """After a broken pipe, point stdout at /dev/null so the exit flush cannot complain."""
    import os

    try:
        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, sys.stdout.fileno())
    except (OSError, ValueError, AttributeError):
        pass


def _call(func, args, debug):
    """Run ``func(args)``; return (exit code, final line or None, stream of that line)."""
    from drift.errors import DriftError

    try:
        return 0, func(args), sys.stdout
    except DriftError as exc:
        return 2, f"drift: error: {one_line(exc)}", sys.stderr
    except Terminated:
        return 143, "drift: interrupted", sys.stderr
    except KeyboardInterrupt:
        return 130, "drift: interrupted", sys.stderr
    except BrokenPipeError:
        return 141, None, None
    except OSError as exc:  # the file system said no (disk full, permissions, a vanished file)
        where = f"{exc.filename}: " if exc.filename else ""
        reason = exc.strerror or str(exc) or type(exc).__name__
        return 2, f"drift: error: {one_line(where + reason)}; check the path, free space and permissions", sys.stderr
    except (Exception, RecursionError) as exc:  # the last resort: one line, not a traceback
        if debug:
            import traceback

            traceback.print_exc()
        detail = one_line(f"{type(exc).__name__}: {exc}")[:300]
        hint = "the traceback is above" if debug else "rerun with --debug to see the traceback"
        return 2, f"drift: error: internal error ({detail}); {hint}, and please report it", sys.stderr


def run_guarded(func, args, *, debug=False) -> int:
    """Run one command; print its warnings, then its final line; return the exit code."""
    import warnings

    previous = _install_sigterm()
    try:
        with warnings.catch_warnings(record=True) as caught:
            warnings.simplefilter("always")
            code, line, stream = _call(func, args, debug)
        records = list(caught)  # a snapshot taken after recording stopped
        try:
            for text in warning_lines(records):
                print(text, file=sys.stderr)
            if line is not None:
                print(printable(line), file=stream)
                stream.flush()
        except BrokenPipeError:
            _silence_stdout()
            return 141
        if code == 141:
            _silence_stdout()
        return code
    except Terminated:
        print("drift: interrupted", file=sys.stderr)
        return 143
    except KeyboardInterrupt:
        print("drift: interrupted", file=sys.stderr)
        return 130
    finally:
        _restore_sigterm(previous)


def _cell(value) -> str:
    import numbers

    if value is None or (isinstance(value, float) and value != value):
        return ""
    return f"{value:,}" if isinstance(value, numbers.Integral) and not isinstance(value, bool) else str(value)


def html_summary(title, line, *, tables=(), lists=()) -> str:
    """A short HTML block for a notebook (``_repr_html_``); every text is escaped.

    ``tables``: ``(caption, headers, rows)`` with rows of values; ``lists``: ``(caption, items)``,
    shown as ``caption: none`` when empty.
    """
    from html import escape

    parts = [f'<div class="drift-summary"><strong>{escape(str(title))}</strong>',
             f"<p>{escape(str(line))}</p>"]
    for caption, headers, rows in tables:
        head = "".join(f'<th style="text-align:left">{escape(str(h))}</th>' for h in headers)
        body = "".join("<tr>" + "".join(f'<td style="text-align:left">{escape(_cell(v))}</td>' for v in row)
                       + "</tr>" for row in rows)
        parts.append(f"<p>{escape(str(caption))}</p><table><thead><tr>{head}</tr></thead>"
                     f"<tbody>{body}</tbody></table>")
    for caption, items in lists:
        if items:
            shown = "".join(f"<li>{escape(str(i))}</li>" for i in items)
            parts.append(f"<p>{escape(str(caption))}:</p><ul>{shown}</ul>")
        else:
            parts.append(f"<p>{escape(str(caption))}: none</p>")
    return "".join(parts) + "</div>"


def text_summary(title, line, *, parts=()) -> str:
    """A short plain-text summary for a terminal (``__repr__``): the title and line, then
    ``label: text`` lines, control characters escaped."""
    out = [f"{title}: {line}"] + [f"  {label}: {text}" for label, text in parts if text is not None]
    return "\n".join(printable(x) for x in out)
