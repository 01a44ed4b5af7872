"""Notice when the app's terminal has gone away (window closed, multiplexer session killed).

Textual's input thread spins on a hung-up terminal, and a process started under another program (``make``, a
shell script) may never receive SIGHUP. So the app polls: ``tcgetattr`` on a hung-up terminal fails with EIO.
"""

from __future__ import annotations

import os
import sys

TERMINAL_POLL_SECONDS = 1.0


def watched_terminal_fd() -> int | None:
    """The file descriptor to poll: standard input when it is a terminal, else None (pipes, tests)."""
    stream = sys.__stdin__
    if stream is None:
        return None
    try:
        fd = stream.fileno()
    except (OSError, ValueError):
        return None
    return fd if os.isatty(fd) else None


def terminal_lost(fd: int) -> bool:
    """True when ``fd`` no longer answers as a terminal (closed, or hung up)."""
    try:
        import termios
    except ImportError:  # pragma: no cover - not POSIX
        return False
    try:
        termios.tcgetattr(fd)
    except (termios.error, OSError, ValueError):
        return True
    return False
