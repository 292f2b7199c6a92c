"""Test settings shared by every test file.

In CI (the environment sets CI=true) hypothesis runs derandomized: the same
examples every run, so that a red CI always means a change broke something
and can be reproduced, never that a new random draw found an old fault.
Locally it draws afresh each run and keeps what it finds in .hypothesis/.
"""

from hypothesis import settings

from tests.ci import IN_CI

settings.register_profile("ci", derandomize=True, database=None)
if IN_CI:
    settings.load_profile("ci")
