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
from ..paper import SHEET_SIZES_MM


#: A later pupil's kit (ms of CPU in a warm worker: the name laid over the
#: school's shared PDF; measured 4 December 2026).
PUPIL_MS = 5.0
#: A school's first kit (ms of CPU, in a warm worker whose language is
#: already loaded), by latitude from 75 S to 75 N every 5 degrees: the
#: whole kit, then its plate alone; on an A4 or Letter sheet, and on a
#: small sheet (A5).  Measured on 4 December 2026 (kitgen's own kits in
#: English and French, the least of two builds each; only their ratios
#: matter here): the crowded plates of high latitudes and small sheets
#: and the crowded southern retes of low latitudes cost up to twice the
#: least, and a plan that took every school as costing the same left
#: one worker up to a tenth of a second idle at the end of a set of five.
FIRST_KIT_MS = (274, 258, 226, 200, 174, 167, 178, 194, 209, 224, 247, 316, 331, 317, 322, 215,
                228, 205, 232, 229, 215, 216, 201, 188, 176, 180, 188, 227, 251, 300, 300)
PLATE_MS = (185, 162, 124, 102, 78, 70, 68, 84, 96, 110, 109, 121, 121, 102, 113, 108,
            121, 103, 123, 129, 113, 106, 92, 84, 74, 72, 81, 106, 126, 193, 193)
SMALL_FIRST_KIT_MS = (360, 329, 357, 326, 255, 251, 277, 375, 303, 282, 290, 307, 313, 277, 292, 255,
                      272, 252, 274, 264, 246, 244, 245, 317, 271, 257, 265, 349, 366, 355, 384)
SMALL_PLATE_MS = (212, 206, 217, 178, 126, 116, 131, 198, 97, 100, 102, 125, 132, 103, 118, 110,
                  127, 114, 134, 127, 102, 102, 102, 188, 130, 124, 129, 204, 218, 231, 238)
#: How much a school's first kit costs in each language against English
#: (its words' lengths and scripts: longer names to place, more lines to
#: set; measured on 4 December 2026 as the mean over eight latitudes from
#: 33 S to 60 N, each language already read), and for a language of the
#: user's own.
LANGUAGE_FACTOR = {"en": 1.0, "fr": 1.035, "de": 1.12, "es": 1.02, "pt": 1.04, "it": 1.09, "el": 1.30,
                   "ru": 1.21, "ar": 1.16, "hi": 1.10}
OTHER_LANGUAGE_FACTOR = 1.15
#: A sheet whose shorter side is under this (mm) draws the smaller kit.
SMALL_SHEET_MM = 180.0
#: What a school's first kit costs more where its worker first reads its
#: language (ms; measured: 40 to 90 in Latin, Greek and Cyrillic script,
#: about 150 where the words are shaped, in Arabic and Devanagari).
LANGUAGE_MS = 50.0
SHAPED_LANGUAGE_MS = 150.0
SHAPED_LANGUAGES = ("ar", "hi")


def school_cost(recipe) -> float:
    """What drawing the shared parts of ``recipe``'s school costs, in a
    later pupil's kits: its first kit by latitude and sheet
    (:data:`FIRST_KIT_MS`) and language (:data:`LANGUAGE_FACTOR`), with
    its language read (:func:`language_cost`)."""
    first = _by_latitude(SMALL_FIRST_KIT_MS if _small(recipe) else FIRST_KIT_MS, recipe.latitude_deg)
    factor = OTHER_LANGUAGE_FACTOR if recipe.language_file else LANGUAGE_FACTOR.get(recipe.language,
                                                                                   OTHER_LANGUAGE_FACTOR)
    return first * factor / PUPIL_MS + language_cost(recipe)


def language_cost(recipe) -> float:
    """What reading ``recipe``'s language costs a worker that has not yet
    (:data:`LANGUAGE_MS`), in a later pupil's kits."""
    return (SHAPED_LANGUAGE_MS if recipe.language in SHAPED_LANGUAGES else LANGUAGE_MS) / PUPIL_MS


def plate_cost(recipe) -> float:
    """What drawing ``recipe``'s school's plates costs, in a later pupil's
    kits (:data:`PLATE_MS`), for each plate it prints."""
    plates = max(1, len(recipe.plates))
    return plates * _by_latitude(SMALL_PLATE_MS if _small(recipe) else PLATE_MS, recipe.latitude_deg) / PUPIL_MS


def _small(recipe) -> bool:
    sheet = SHEET_SIZES_MM.get(recipe.sheet, (0.0, 0.0)) if isinstance(recipe.sheet, str) else recipe.sheet
    return 0.0 < min(sheet) < SMALL_SHEET_MM


def _by_latitude(table, latitude_deg: float) -> float:
    """``table``'s value at the latitude, linear between its entries every
    5 degrees from 75 S to 75 N, its end's beyond them."""
    at = (min(max(latitude_deg, -75.0), 75.0) + 75.0) / 5.0
    k = min(int(at), len(table) - 2)
    return table[k] + (table[k + 1] - table[k]) * (at - k)


def worker_shares(jobs_list, jobs: int) -> list[list]:
    """The jobs dealt to ``jobs`` workers.  Kits whose recipes are equal
    but for the owner (a school's pupils) share their parts
    (kitgen.kit.build_from_plan), so they stay with one worker, which
    draws those parts once (:func:`school_cost`).  A school with
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


def plate_moves(shares: list[list]) -> list[tuple[int, int, object]]:
    """Which schools' plates another worker draws: (the school's worker,
    the drawing worker, the school) for each.  While the busiest worker's
    load (its kits, and each school's :func:`school_cost`) less its last
    school's plates not yet moved (:func:`plate_cost`) would still exceed
    the least busy one's with them (and the school's language, where that
    one reads it only for them: :func:`language_cost`), that school has
    its plates drawn by the least busy one, so that a set of few schools
    (three, five) is shared more evenly than whole schools allow.  Each
    worker keeps its first school's plates, drawn while the other draws
    its plates for it.  Which worker draws a part never changes its bytes."""
    schools = [list(dict.fromkeys(job_school(job) for job in share)) for share in shares]
    loads = [len(share) + sum(school_cost(school) for school in own) for share, own in zip(shares, schools)]
    languages = [{school.language for school in own} for own in schools]
    moved: list[tuple[int, int, object]] = []
    while True:
        busy, idle = loads.index(max(loads)), loads.index(min(loads))
        if len(schools[busy]) < 2:
            return moved
        school = schools[busy][-1]
        plates = plate_cost(school)
        # the drawing worker reads the school's language too, if it has not
        read = 0.0 if school.language in languages[idle] else language_cost(school)
        if loads[idle] + plates + read >= loads[busy]:
            return moved
        moved.append((busy, idle, schools[busy].pop()))   # its first school stays at index 0
        loads[busy] -= plates
        loads[idle] += plates + read
        languages[idle].add(school.language)


def piece_load(jobs: list, plates_elsewhere: bool = False) -> float:
    """The work of one school's ``jobs`` on one worker, in a later
    pupil's kits: the kits and the school's parts (:func:`school_cost`),
    less its plates where another worker draws them (:func:`plate_cost`)."""
    school = job_school(jobs[0])
    return len(jobs) + school_cost(school) - (plate_cost(school) if plates_elsewhere else 0.0)


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
    longest-processing-time rule, the most work first (:func:`piece_load`):
    the workers' jobs and loads (in a later pupil's kits)."""
    pieces = []
    for key, group in groups.items():
        q, r = divmod(len(group), counts[key])
        start = 0
        for i in range(counts[key]):
            pieces.append(group[start:start + q + (i < r)])
            start += q + (i < r)
    loads = [0.0] * jobs
    out: list[list] = [[] for _ in range(jobs)]
    for load, piece in sorted(((piece_load(piece), piece) for piece in pieces), key=lambda lp: -lp[0]):
        k = loads.index(min(loads))
        loads[k] += load
        out[k] += piece
    return out, loads
