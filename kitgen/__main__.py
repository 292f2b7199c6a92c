import sys

from .start import run

sys.exit(run())
