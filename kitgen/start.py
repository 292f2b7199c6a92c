"""The ``kitgen`` program's entry point: the signal handlers go in before
anything else is imported, so that Ctrl-C or a hang-up in the first
moments ends the run in one line, as it does later (:mod:`kitgen.interrupt`)."""

from __future__ import annotations

import sys

from . import interrupt


def run() -> int:
    """Install the handlers, then import and run :func:`kitgen.cli.main`."""
    previous = interrupt.install()
    try:
        from .cli import main
    except (KeyboardInterrupt, interrupt.Stopped) as exc:
        return _stopped_while_starting(exc)
    return main(handlers_installed=previous is not None)


def _stopped_while_starting(exc: BaseException) -> int:
    status = exc.exit_status if isinstance(exc, interrupt.Stopped) else 130  # 128 + SIGINT
    try:
        from .errors import Message

        said = Message("errors.terminated") if isinstance(exc, interrupt.Stopped) else Message("errors.interrupted")
        print(said.text(), file=sys.stderr)
    except BaseException:  # nothing more can be said, even if a second signal comes
        pass
    return status
