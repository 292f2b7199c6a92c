"""Deal a class set's kits to its workers (#12): which worker builds which
school's pupils, in what order, and whose plates another worker draws.

A school's pupils (kits whose recipes are equal but for the owner,
:func:`kitgen.kit.school_of`) share their parts, so they stay together
where they can; the shares follow the longest-processing-time rule
(R. L. Graham, "Bounds on multiprocessing timing anomalies", SIAM J.
Appl. Math. 17, 1969).  These are only the workers' first plans:
:mod:`kitgen.batch.dispatch` hands a school still waiting to a worker that
runs out of work.  Which worker builds a kit never changes its bytes.
"""

from __future__ import annotations

from ..kit import school_of


#: What drawing a school's shared parts costs a worker, in its pupils'
#: kits' time: a school's first kit took about 60 times a later pupil's
#: (0.37 to 0.5 s against 6 to 11 ms of CPU in Latin and Greek scripts,
#: 0.8 to 1 s in Arabic and Hindi; eight schools of ten languages).
SCHOOL_COST_KITS = 60


def worker_shares(jobs_list, jobs: int) -> list[list]:
    """The jobs dealt to ``jobs`` workers.  Kits whose recipes are equal
    but for the owner (a school's pupils) share their parts
    (kitgen.kit.build_from_plan), so they stay with one worker, which
    draws those parts once (:data:`SCHOOL_COST_KITS`).  A school with
    more kits than a worker's share may be split evenly into as many
    pieces as make the busiest worker's load least, each piece paying
    the school's cost again.  The pieces go largest first to the least
    loaded worker (the longest-processing-time rule, Graham 1969), each
    worker's kits school by school (:func:`_school_order`).  Which
    worker builds a kit never changes its bytes."""
    groups: dict = {}
    for job in jobs_list:
        groups.setdefault(job_school(job), []).append(job)
    share = -(-len(jobs_list) // jobs)
    counts = {key: 1 for key in groups}
    for key in sorted((k for k in groups if len(groups[k]) > share), key=lambda k: -len(groups[k])):
        tried = [(max(_deal(groups, {**counts, key: n}, jobs)[1]), n)
                 for n in range(1, min(jobs, len(groups[key])) + 1)]
        counts[key] = min(tried)[1]
    return [_school_order(share_) for share_ in _deal(groups, counts, jobs)[0] if share_]


#: What drawing a school's plates costs, in its pupils' kits' time (part of
#: :data:`SCHOOL_COST_KITS`; measured as it, 0.15 to 0.3 s).
PLATE_COST_KITS = 25


def plate_moves(shares: list[list]) -> list[tuple[int, int, object]]:
    """Which schools' plates another worker draws: (the school's worker,
    the drawing worker, the school) for each.  While the busiest worker's
    load (its kits, and :data:`SCHOOL_COST_KITS` a school) less a school's
    plates (:data:`PLATE_COST_KITS`) would still exceed the least busy
    one's with them, the busiest worker's last school not yet moved has
    its plates drawn by the least busy one, so that a set of few schools
    (three, five) is shared more evenly than whole schools allow.  Each
    worker keeps its first school's plates, drawn while the other draws
    its plates for it.  Which worker draws a part never changes its bytes."""
    schools = [list(dict.fromkeys(job_school(job) for job in share)) for share in shares]
    loads = [len(share) + SCHOOL_COST_KITS * len(own) for share, own in zip(shares, schools)]
    moved: list[tuple[int, int, object]] = []
    while True:
        busy, idle = loads.index(max(loads)), loads.index(min(loads))
        if len(schools[busy]) < 2 or loads[idle] + PLATE_COST_KITS >= loads[busy]:
            return moved
        moved.append((busy, idle, schools[busy].pop()))   # its first school stays at index 0
        loads[busy] -= PLATE_COST_KITS
        loads[idle] += PLATE_COST_KITS


def piece_load(kits: int, plates_elsewhere: bool = False) -> int:
    """The work of one school's ``kits`` on one worker, in a later
    pupil's kits: the kits and the school's parts (:data:`SCHOOL_COST_KITS`),
    less its plates where another worker draws them."""
    return kits + SCHOOL_COST_KITS - (PLATE_COST_KITS if plates_elsewhere else 0)


def job_school(job):
    """The school of a job's kit (kitgen.kit.school_of)."""
    return school_of(job.recipe)


def _school_order(share: list) -> list:
    """A worker's jobs school by school, each school where its first kit
    is in the set, its pupils in kit order: a roster that lists its
    schools' pupils mixed is built with each school's parts drawn once,
    where kit order would draw them again whenever the worker's few kept
    schools (kitgen.kit's caches) were pushed out by others."""
    first: dict = {}
    for job in sorted(share, key=lambda job: job.number):
        first.setdefault(job_school(job), job.number)
    return sorted(share, key=lambda job: (first[job_school(job)], job.number))


def _deal(groups: dict, counts: dict, jobs: int):
    """Each group cut into ``counts[key]`` even pieces, dealt by the
    longest-processing-time rule: the workers' jobs and loads (in kits)."""
    pieces = []
    for key, group in groups.items():
        q, r = divmod(len(group), counts[key])
        start = 0
        for i in range(counts[key]):
            pieces.append(group[start:start + q + (i < r)])
            start += q + (i < r)
    loads = [0] * jobs
    out: list[list] = [[] for _ in range(jobs)]
    for piece in sorted(pieces, key=len, reverse=True):
        k = loads.index(min(loads))
        loads[k] += piece_load(len(piece))
        out[k] += piece
    return out, loads
