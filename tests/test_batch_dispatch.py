"""How a class set's work reaches its workers as they come free (#12):
every kit is sent exactly once, a worker is sent its next school only
when it has finished the last, a worker that runs out of its own takes a
school still waiting from the end of the busiest worker's queue (work
stealing: R. D. Blumofe and C. E. Leiserson, "Scheduling multithreaded
computations by work stealing", J. ACM 46, 1999), and a school whose
plates another worker draws waits for them and gets them.  The workers
are stand-ins whose tasks the test finishes one at a time, in the order
it chooses; the real processes are in test_batch.py."""

from __future__ import annotations

from concurrent.futures import Future

import pytest

from kitgen.batch import dispatch as dispatch_module
from kitgen.batch.dispatch import dispatch
from kitgen.batch.shares import plate_moves, worker_shares
from kitgen.batch.work import KitResult, build_one, draw_for

from .school_jobs import school_jobs


@pytest.fixture(autouse=True)
def no_waiting(monkeypatch):
    """The dispatcher's wait for finished work, which here never blocks: a
    dispatcher that waits while nothing it sent is finished is a fault
    (with stand-in workers nothing would ever finish), not a hang."""
    def done_now(futures, return_when=None):
        done = {f for f in futures if f.done()}
        assert done, "the dispatcher waits, and nothing it sent is finished"
        return done, set(futures) - done

    monkeypatch.setattr(dispatch_module, "wait", done_now)


class _Worker:
    """A pool of one that runs nothing: it keeps what it is sent, in order,
    unfinished until the test finishes it; once ``eager``, it finishes
    each task as it is sent (a kit's result is its number), and with
    ``draws_at_once`` each drawing of another worker's plates."""

    def __init__(self, draws_at_once: bool = False):
        self.sent: list[tuple[object, object, Future]] = []
        self.eager = False
        self.draws_at_once = draws_at_once

    def submit(self, fn, arg):
        future = Future()
        future.set_running_or_notify_cancel()
        self.sent.append((fn, arg, future))
        if self.eager:
            self.finish_all()
        elif self.draws_at_once and fn is draw_for:
            future.set_result({})
        return future

    def unfinished(self):
        return [(fn, arg, f) for fn, arg, f in self.sent if not f.done()]

    def finish_all(self, plates=None):
        """Finish what this worker was sent so far; a kit's result is its
        number, plates are ``plates``."""
        for fn, arg, future in self.unfinished():
            future.set_result(KitResult(arg.number) if fn is build_one else plates)


def _numbers(worker):
    return [arg.number for fn, arg, _ in worker.sent if fn is build_one]


def _latitudes(worker):
    return list(dict.fromkeys(arg.recipe.latitude_deg for fn, arg, _ in worker.sent if fn is build_one))


def test_an_idle_worker_takes_the_busiest_ones_waiting_school():
    # four schools of ten on two workers: two schools each
    # (kitgen.batch.shares); worker 1 finishes both while worker 0 is
    # still on its first, so worker 1 builds worker 0's second school
    jobs = school_jobs([(51.5, 10), (45.8, 10), (-33.9, 10), (38.0, 10)])
    shares = worker_shares(jobs, 2)
    assert plate_moves(shares) == []
    planned = [[j.recipe.latitude_deg for j in share] for share in shares]
    first0, second0 = list(dict.fromkeys(planned[0]))
    workers = [_Worker(), _Worker()]
    results = dispatch(jobs, workers)
    # each worker is sent its first school's ten kits, and nothing more yet
    workers[1].finish_all()
    got = [next(results).number for _ in range(10)]
    assert sorted(got) == sorted(_numbers(workers[1])[:10])
    assert len(workers[0].sent) == 10 and _latitudes(workers[0]) == [first0]
    workers[1].finish_all()
    got += [next(results).number for _ in range(10)]
    # worker 1's own second school done: it takes worker 0's waiting one
    assert _latitudes(workers[1])[-1] == second0
    workers[1].finish_all()
    workers[0].finish_all()
    got += [r.number for r in results]
    assert sorted(got) == [j.number for j in jobs]
    sent = _numbers(workers[0]) + _numbers(workers[1])
    assert sorted(sent) == [j.number for j in jobs]   # each kit sent once
    assert _latitudes(workers[0]) == [first0]


def _moved_case():
    """Five schools of eight on two workers, in both hemispheres: one
    worker has three, and the third one's plates are drawn by the other
    first (plate_moves)."""
    jobs = school_jobs([(51.5, 8), (-45.8, 8), (23.5, 8), (-38.0, 8), (12.0, 8)])
    moves = plate_moves(worker_shares(jobs, 2))
    assert len(moves) == 1
    return jobs, moves[0]


def _run_freely(results, workers) -> list[int]:
    """The numbers of every kit still to come, the workers finishing each
    task as it is sent."""
    for worker in workers:
        worker.eager = True
        worker.finish_all()
    return [result.number for result in results]


def _receive_finished(results, workers, received):
    """Take from the dispatcher every finished kit's result: it has then
    sent out whatever the finished work let it."""
    finished = sum(1 for w in workers for fn, _, f in w.sent if fn is build_one and f.done())
    while len(received) < finished:
        received.append(next(results).number)


def _kits_of(workers, latitude):
    return [arg for worker in workers for fn, arg, _ in worker.sent
            if fn is build_one and arg.recipe.latitude_deg == latitude]


def test_a_school_waits_for_its_plates_drawn_elsewhere_and_gets_them():
    jobs, (source, target, school) = _moved_case()
    workers = [_Worker(), _Worker()]
    results = dispatch(jobs, workers)
    # the drawing worker is sent the plates alone first
    assert [(fn, arg) for fn, arg, _ in workers[target].sent] == [(draw_for, school)]
    draw = workers[target].sent[0][2]
    # the source builds its other schools while the plates are drawn; the
    # moved school is not sent before they are back
    received = []
    for _ in range(len(jobs)):
        workers[source].finish_all()
        _receive_finished(results, workers, received)
        assert _kits_of(workers, school.latitude_deg) == []
        if not workers[source].unfinished():
            break
    assert not draw.done() and not workers[source].unfinished()   # the source has nothing it may start
    plates = {"plate-1": "drawn elsewhere"}
    workers[target].finish_all(plates)
    received += _run_freely(results, workers)
    moved = _kits_of(workers, school.latitude_deg)
    assert [job.drawn for job in moved] == [plates] + [None] * 7
    assert sorted(received) == [j.number for j in jobs]
    assert sorted(_numbers(workers[0]) + _numbers(workers[1])) == [j.number for j in jobs]


def test_a_school_whose_plates_could_not_be_drawn_elsewhere_is_built_all_the_same():
    jobs, (source, target, school) = _moved_case()
    workers = [_Worker(), _Worker()]
    results = dispatch(jobs, workers)
    workers[target].finish_all(None)   # draw_for's answer when drawing fails
    received = _run_freely(results, workers)
    moved = _kits_of(workers, school.latitude_deg)
    assert len(moved) == 8 and all(job.drawn is None for job in moved)
    assert sorted(received) == [j.number for j in jobs]


def test_one_kit_a_school_is_shared_kit_by_kit():
    # forty kits each its own latitude: each worker is sent one kit at a
    # time, and the worker that finishes faster builds more of them (the
    # plates a worker may draw for the other's school finished as sent)
    jobs = school_jobs([(-60 + 3 * k, 1) for k in range(40)])
    workers = [_Worker(draws_at_once=True), _Worker(draws_at_once=True)]
    results = dispatch(jobs, workers)
    done = []
    for step in range(40):
        assert all(len(w.unfinished()) <= 1 for w in workers)
        fast = workers[1] if workers[1].unfinished() else workers[0]
        if step % 4 == 3 and workers[0].unfinished():
            fast = workers[0]
        fast.finish_all()
        done.append(next(results).number)
    assert sorted(done) == list(range(1, 41))
    assert len(_numbers(workers[1])) > len(_numbers(workers[0]))
