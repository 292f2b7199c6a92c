"""Hand a class set's work to its worker processes as they come free (#12).

Each worker starts with its share (:func:`kitgen.batch.shares.worker_shares`)
as a queue of pieces, a piece being one school's pupils on that worker,
and the plates it draws for another worker's schools first
(:func:`kitgen.batch.shares.plate_moves`).  A worker is sent its next
piece only once it has finished the last, so that no work is promised
to a worker early: one that runs out of its own takes a piece not yet
started from the end of the busiest worker's queue (work stealing, as in
R. D. Blumofe and C. E. Leiserson, "Scheduling multithreaded computations
by work stealing", J. ACM 46, 1999).  A school's first kit costs 0.3 to 1 s
and varies with its latitude and script in ways the shares cannot know,
so a plan made in advance leaves one worker idle for up to a school's
cost; handing out pieces as workers finish evens that out.  Which worker
builds a kit never changes its bytes.
"""

from __future__ import annotations

from collections import deque
from concurrent.futures import FIRST_COMPLETED, wait
from dataclasses import dataclass, replace
from itertools import groupby

from .shares import job_school, piece_load, plate_cost, plate_moves, worker_shares
from .work import build_one, draw_for


@dataclass
class _Piece:
    """One school's jobs in one worker's share; ``moved``, the key
    (worker, school) of its plates when another worker draws them."""

    jobs: list
    moved: tuple | None = None


@dataclass
class _Draw:
    """The plates of a school another worker builds (its key)."""

    moved: tuple


def dispatch(jobs_list, pools: list):
    """Each job's :class:`~kitgen.batch.work.KitResult`, as the workers
    ``pools`` (each a pool of one process) finish them; each worker is
    sent its first task at once."""
    state = _Dispatch(pools, worker_shares(jobs_list, len(pools)))
    try:
        for k in range(len(pools)):
            state.feed(k)
    except BaseException:
        state.cancel()
        raise
    return state.results()


class _Dispatch:
    """The workers' queues (each a deque of :class:`_Draw` first, then
    :class:`_Piece`), the plates drawn for moved schools, and the futures
    sent and not yet finished, with each worker's count of them."""

    def __init__(self, pools: list, shares: list[list]):
        self.pools = pools
        self.queues: list[deque] = [deque() for _ in pools]
        moves = plate_moves(shares)
        moved_keys = {(source, school) for source, _, school in moves}
        for source, target, school in moves:
            self.queues[target].append(_Draw((source, school)))
        for k, share in enumerate(shares):
            for school, jobs in groupby(share, key=job_school):
                key = (k, school) if (k, school) in moved_keys else None
                self.queues[k].append(_Piece(list(jobs), key))
        self.plates: dict = {}     # a moved school's key: its plates, once drawn (None: drawing failed)
        self.running: dict = {}    # future: (worker, its _Draw or None)
        self.busy = [0] * len(pools)

    def results(self):
        try:
            while self.running:
                done, _ = wait(self.running, return_when=FIRST_COMPLETED)
                finished = []
                for future in done:
                    k, draw = self.running.pop(future)
                    self.busy[k] -= 1
                    if draw is not None:
                        self.plates[draw.moved] = future.result()
                    else:
                        finished.append(future.result())
                for k in range(len(self.pools)):
                    self.feed(k)
                yield from finished
        except BaseException:
            self.cancel()
            raise
        if any(self.queues):   # a fault here: a kit must never go unbuilt without a word
            raise RuntimeError("class set: work left unsent")

    def cancel(self) -> None:
        """Cancel what was sent and has not started."""
        for future in self.running:
            future.cancel()

    def _ready(self, task) -> bool:
        return isinstance(task, _Draw) or task.moved is None or task.moved in self.plates

    def feed(self, k: int) -> None:
        """Send worker ``k``, if it is idle, its next task that can start:
        its own, else a piece stolen from the busiest worker's queue."""
        if self.busy[k]:
            return
        task = self._take(self.queues[k], first=True) or self._steal(k)
        if task is None:
            return   # nothing can start yet: fed again when a future finishes
        pool = self.pools[k]
        if isinstance(task, _Draw):
            self._submit(k, pool.submit(draw_for, task.moved[1]), task)
            return
        parts = self.plates.pop(task.moved) if task.moved else None   # one piece a moved school
        for i, job in enumerate(task.jobs):
            self._submit(k, pool.submit(build_one, replace(job, drawn=parts) if i == 0 and parts else job), None)

    def _submit(self, k: int, future, draw) -> None:
        self.running[future] = (k, draw)
        self.busy[k] += 1

    def _take(self, queue: deque, first: bool):
        """The first (or last) task of ``queue`` that can start, taken out
        of it; a thief takes pieces only."""
        order = range(len(queue)) if first else range(len(queue) - 1, -1, -1)
        for i in order:
            task = queue[i]
            if self._ready(task) and (first or isinstance(task, _Piece)):
                del queue[i]
                return task
        return None

    def _steal(self, k: int):
        """A piece waiting in another worker's queue, from its end: the
        queue with the most work first."""
        loads = [(sum(_load(task) for task in queue), j) for j, queue in enumerate(self.queues) if j != k]
        for _, j in sorted(loads, reverse=True):
            task = self._take(self.queues[j], first=False)
            if task is not None:
                return task
        return None


def _load(task) -> float:
    """A task's work, in a later pupil's kits (kitgen.batch.shares)."""
    if isinstance(task, _Draw):
        return plate_cost(task.moved[1])
    return piece_load(task.jobs, task.moved is not None)
