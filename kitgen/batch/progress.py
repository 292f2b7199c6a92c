"""How far a set has got, on stderr (#12).

On a terminal, a progress bar drawn by tqdm: kits done of all, kits a
second and the time left.  When stderr is not a terminal (a log, a pipe,
the web page's subprocess), plain lines instead, at most one a second and
always the last, each one whole line that a program can read.  ``quiet``
says nothing.
"""

from __future__ import annotations

import shutil
import sys
import time

from ..errors import Message, Number


def progress(total: int, quiet: bool = False, stream=None):
    stream = stream if stream is not None else sys.stderr
    if quiet or total == 0:
        return _Silent()
    if _is_terminal(stream):
        return _Bar(total, stream)
    return _Lines(total, stream)


def _is_terminal(stream) -> bool:
    try:
        return stream.isatty()
    except (AttributeError, ValueError):
        return False


class _Silent:
    def advance(self) -> None:
        pass

    def close(self) -> None:
        pass


class _Bar:
    def __init__(self, total: int, stream):
        import tqdm   # here, not at the top: a run without a terminal never pays its import

        tqdm.tqdm.monitor_interval = 0   # no monitor thread (worker processes may be forked)
        # The terminal's size, or 80 x 24 where it reports none (a
        # pseudo-terminal of zero size), where tqdm would draw nothing.
        size = shutil.get_terminal_size((80, 24))
        self.bar = tqdm.tqdm(total=total, file=stream, unit="kit", desc="kitgen", ncols=min(size.columns, 100),
                             nrows=size.lines, leave=True)

    def advance(self) -> None:
        self.bar.update(1)

    def close(self) -> None:
        self.bar.close()


class _Lines:
    #: Least time (s) between two lines.
    EVERY_S = 1.0

    def __init__(self, total: int, stream):
        self.total, self.stream, self.done = total, stream, 0
        self.start = time.monotonic()
        self.last = self.start

    def advance(self) -> None:
        self.done += 1
        now = time.monotonic()
        if self.done == self.total or now - self.last >= self.EVERY_S:
            self.last = now
            elapsed = max(now - self.start, 1e-9)
            rate = self.done / elapsed
            left = (self.total - self.done) / rate if rate > 0 else 0.0
            line = Message("errors.batch_progress", done=self.done, total=self.total, rate=Number(rate, 1),
                           left=Number(left, 0)).text()
            try:
                print(line, file=self.stream, flush=True)
            except (OSError, ValueError):
                pass

    def close(self) -> None:
        pass
