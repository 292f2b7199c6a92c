"""The bounded build pool: at most ``workers`` builds at once, at most
``queue`` more waiting, and a clear "busy" for anything beyond.

A kit builds in a fraction of a second, so a few threads serve a class
room; a burst beyond the queue is told at once to try again (HTTP 503
with ``Retry-After``) instead of piling up unbounded work and memory.
Admission is counted under a lock before anything is submitted, so the
bound holds however many requests arrive together.
"""

from __future__ import annotations

import asyncio
import threading
from concurrent.futures import ThreadPoolExecutor


class Busy(Exception):
    """Every worker is building and the queue is full."""


class BuildPool:
    def __init__(self, workers: int = 2, queue: int = 8):
        if workers < 1 or queue < 0:
            raise ValueError("a pool needs a worker and a queue of zero or more")
        self.workers, self.queue = workers, queue
        self._executor = ThreadPoolExecutor(max_workers=workers, thread_name_prefix="kitgen-build")
        self._lock = threading.Lock()
        self._admitted = 0

    @property
    def capacity(self) -> int:
        return self.workers + self.queue

    def _admit(self) -> None:
        with self._lock:
            if self._admitted >= self.capacity:
                raise Busy()
            self._admitted += 1

    def _release(self) -> None:
        with self._lock:
            self._admitted -= 1

    def start(self, fn, *args):
        """Start ``fn(*args)`` on a worker thread and return its
        :class:`concurrent.futures.Future`; raises :class:`Busy` at once
        when the pool and its queue are full."""
        self._admit()
        try:
            job = self._executor.submit(fn, *args)
        except BaseException:
            self._release()
            raise
        # A build counts until it ends, even when its request went away.
        job.add_done_callback(lambda _: self._release())
        return job

    async def run(self, fn, *args):
        """``fn(*args)`` on a worker thread, awaited (see :meth:`start`)."""
        return await asyncio.wrap_future(self.start(fn, *args))

    def shutdown(self) -> None:
        self._executor.shutdown(wait=True, cancel_futures=True)
