"""Errors that reach the user as one line.

:class:`UserError` is a mistake in the input (exit status 2); anything else
that escapes is an internal fault (exit status 1).
"""

EXIT_OK = 0
EXIT_INTERNAL = 1
EXIT_USER = 2


class UserError(Exception):
    """A problem the user can fix; its message is printed as one line."""
