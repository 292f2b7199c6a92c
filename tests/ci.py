"""Whether the tests run in CI, and how many examples a slow property test
draws there.

CI (the environment sets ``CI=true``) runs every test on a clean clone
within about a quarter of an hour on two cores, so the slowest property
tests draw fewer examples there, derandomized (tests/conftest.py): the
same examples every run.  Run locally they draw the full number afresh.
"""

import os

IN_CI = os.environ.get("CI", "").lower() in ("1", "true", "yes")


def examples(local: int, ci: int) -> int:
    """``ci`` examples in CI, ``local`` elsewhere."""
    return ci if IN_CI else local
