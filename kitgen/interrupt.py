"""The signals that end a run of kitgen, turned into exceptions so that
an ended run cleans up as an interrupted one does.

Ctrl-C (SIGINT) raises ``KeyboardInterrupt`` as Python's own handler
does; hang-up (SIGHUP, the terminal closed), quit (SIGQUIT, Ctrl-\\),
SIGTERM and the other signals whose default action ends the process
(POSIX.1-2017, <signal.h>: "T" and "A" actions) raise :class:`Stopped`.
Either unwinds the stack, so ``outfile`` removes its temporary file or
folder on the way out, and ``cli.main`` says so in one line and exits
128 + the signal's number, the shells' convention.  SIGPIPE and SIGXFSZ
stay ignored, as Python sets them: a closed pipe and a file too large are
reported where the write fails.  SIGKILL cannot be caught; what it leaves
is removed by the next run (``outfile.clean_stale``).
"""

from __future__ import annotations

import signal

#: The signals turned into :class:`Stopped` (those this system has).
STOPPING = tuple(getattr(signal, name) for name in
                 ("SIGTERM", "SIGHUP", "SIGQUIT", "SIGALRM", "SIGUSR1", "SIGUSR2", "SIGXCPU", "SIGVTALRM",
                  "SIGPROF", "SIGPOLL", "SIGPWR", "SIGSTKFLT") if hasattr(signal, name))


class Stopped(BaseException):
    """Raised by the handler of a terminating signal; ``signum`` is the
    signal's number.  A ``BaseException``, as ``KeyboardInterrupt`` is, so
    that no ``except Exception`` swallows it."""

    def __init__(self, signum: int):
        super().__init__(signum)
        self.signum = int(signum)

    @property
    def exit_status(self) -> int:
        return 128 + self.signum


def _on_signal(signum, frame):
    raise Stopped(signum)


def _on_interrupt(signum, frame):
    raise KeyboardInterrupt()


def install() -> dict | None:
    """Install the handlers; returns the handlers they replace (for
    :func:`restore`), or ``None`` outside the main thread, where Python
    lets no handler be set."""
    previous = {}
    try:
        previous[signal.SIGINT] = signal.signal(signal.SIGINT, _on_interrupt)
        for signum in STOPPING:
            previous[signum] = signal.signal(signum, _on_signal)
    except ValueError:  # not the main thread
        restore(previous)
        return None
    return previous


def restore(previous: dict | None) -> None:
    """Put back the handlers :func:`install` replaced."""
    for signum, handler in (previous or {}).items():
        try:
            signal.signal(signum, handler if handler is not None else signal.SIG_DFL)
        except (ValueError, TypeError, OSError):
            pass
