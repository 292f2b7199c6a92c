"""Errors that reach the user as one line.

:class:`UserError` is a mistake in the input (exit status 2); anything else
that escapes is an internal fault (exit status 1).  :func:`one_line` makes
any message safe to print as a single line on a terminal, and
:func:`shown` quotes a value from the input briefly for a message.
"""

import unicodedata

EXIT_OK = 0
EXIT_INTERNAL = 1
EXIT_USER = 2
EXIT_INTERRUPTED = 130  # 128 + SIGINT, the shells' convention
EXIT_TERMINATED = 143   # 128 + SIGTERM

#: Longest message printed, in characters.
MAX_MESSAGE_CHARS = 600
#: Longest quoted input value inside a message, in characters.
MAX_SHOWN_CHARS = 60


class UserError(Exception):
    """A problem the user can fix; its message is printed as one line."""


def _visible(ch: str) -> str:
    if ch in "\t\n\r\v\f":
        return " "
    cat = unicodedata.category(ch)
    # Control, surrogate, private-use and the bidirectional and other
    # format characters could reorder or hide what the terminal shows.
    if cat in ("Cc", "Cs", "Co") or (cat == "Cf" and ch not in "\u200c\u200d"):
        return f"\\u{ord(ch):04x}" if ord(ch) > 0xFF else f"\\x{ord(ch):02x}"
    return ch


def one_line(message: str) -> str:
    """``message`` as one printable line: line breaks become spaces,
    control and bidirectional characters are shown escaped, and the whole
    is cut to :data:`MAX_MESSAGE_CHARS`."""
    text = " ".join("".join(_visible(c) for c in str(message)).split())
    if len(text) > MAX_MESSAGE_CHARS:
        text = text[: MAX_MESSAGE_CHARS - 3] + "..."
    return text


def shown(value) -> str:
    """A short quotation of an input value for a message: its ``repr``,
    cut to :data:`MAX_SHOWN_CHARS` characters."""
    try:
        text = repr(value)
    except Exception:  # a value whose repr fails is still reported
        text = f"<{type(value).__name__}>"
    if len(text) > MAX_SHOWN_CHARS:
        text = text[: MAX_SHOWN_CHARS - 3] + "..."
    return text
