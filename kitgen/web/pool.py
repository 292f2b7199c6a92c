"""The bounded build pool: at most ``workers`` builds at once, at most
``queue`` more waiting, and a clear "busy" for anything beyond.

A kit builds in well under a second, so a few workers serve a class room;
a burst beyond the queue is told at once to try again (HTTP 503 with
``Retry-After``) instead of piling up unbounded work and memory.
Admission is counted under a lock before anything is submitted, so the
bound holds however many requests arrive together.  Kits are built in
worker processes (started fresh, not forked from the server's threads;
see :mod:`.jobs`); a worker that dies is replaced with the next build.
Class sets use a pool of threads, each waiting on its ``kitgen batch``.
"""

from __future__ import annotations

import asyncio
import multiprocessing
import threading
from concurrent.futures import ProcessPoolExecutor, ThreadPoolExecutor
from concurrent.futures.process import BrokenProcessPool


class Busy(Exception):
    """Every worker is building and the queue is full."""


class BuildPool:
    def __init__(self, workers: int = 2, queue: int = 8, processes: bool = False):
        if workers < 1 or queue < 0:
            raise ValueError("a pool needs a worker and a queue of zero or more")
        self.workers, self.queue, self.processes = workers, queue, processes
        self._lock = threading.Lock()
        self._admitted = 0
        self._executor = self._new_executor()

    def _new_executor(self):
        if self.processes:
            return ProcessPoolExecutor(max_workers=self.workers, mp_context=multiprocessing.get_context("spawn"))
        return ThreadPoolExecutor(max_workers=self.workers, thread_name_prefix="kitgen-build")

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
            try:
                job = self._executor.submit(fn, *args)
            except BrokenProcessPool:  # a worker died (out of memory, killed): start afresh
                with self._lock:
                    self._executor = self._new_executor()
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

    def warm(self, fn) -> None:
        """Run ``fn`` once on each worker, outside the admission count, so
        that the first teacher does not wait for a worker to start."""
        for _ in range(self.workers):
            self._executor.submit(fn)

    def shutdown(self) -> None:
        self._executor.shutdown(wait=True, cancel_futures=True)
