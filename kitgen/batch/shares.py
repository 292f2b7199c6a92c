"""Deal a class set's kits to its workers (#12): which worker builds which
school's pupils, in what order, and whose plates another worker draws.

A school's pupils (kits whose recipes are equal but for the owner,
:func:`kitgen.kit.school_of`) share their parts, so they stay together
where they can; the shares follow the longest-processing-time rule
(R. L. Graham, "Bounds on multiprocessing timing anomalies", SIAM J.
Appl. Math. 17, 1969).  Schools of one family (one language, sheet and
hemisphere: :func:`family_of`) share their rete, maters, rule and
alidade too, so a deal that keeps a family on one worker is taken where
it leaves the busiest worker no busier.  These are only the workers'
first plans: :mod:`kitgen.batch.dispatch` hands a school still waiting
to a worker that runs out of work.  Which worker builds a kit never
changes its bytes.
"""

from __future__ import annotations

from dataclasses import replace
from itertools import groupby

from ..kit import school_of
from ..paper import SHEET_SIZES_MM


#: A later pupil's kit (ms of CPU in a warm worker: the name laid over the
#: school's shared PDF; measured 4 December 2026).
PUPIL_MS = 5.0
#: A school's first kit (ms of CPU, in a warm worker whose language is
#: already loaded, nothing kept from an earlier kit), by latitude from
#: 75 S to 75 N every 5 degrees: the whole kit, then its plate alone; on
#: an A4 or Letter sheet, and on a small sheet (A5).  Measured on 5
#: December 2026 at 04:36 UTC, after the rete's names were placed faster,
#: with ``benchmarks/school_costs.py`` (kitgen's own kits in
#: English and French, the least of three builds each; only their ratios
#: matter here): the crowded plates of high latitudes and small sheets
#: and the crowded southern retes of low latitudes cost up to twice the
#: least, and a plan that took every school as costing the same left
#: one worker up to a tenth of a second idle at the end of a set of five.
FIRST_KIT_MS = (326, 287, 247, 220, 190, 183, 197, 220, 236, 270, 302, 405, 384, 359, 364, 243,
                264, 243, 265, 260, 240, 236, 226, 211, 207, 212, 200, 253, 278, 341, 332)
PLATE_MS = (221, 181, 134, 111, 83, 74, 75, 91, 100, 114, 111, 123, 128, 109, 117, 110,
            129, 107, 131, 136, 123, 117, 103, 91, 86, 86, 85, 121, 140, 227, 214)
SMALL_FIRST_KIT_MS = (429, 406, 435, 409, 305, 276, 326, 443, 307, 303, 302, 326, 341, 319, 313, 288,
                      286, 284, 293, 302, 262, 268, 266, 362, 281, 267, 292, 378, 393, 374, 417)
SMALL_PLATE_MS = (238, 241, 242, 206, 136, 119, 130, 214, 97, 98, 100, 123, 130, 109, 111, 117,
                  125, 120, 132, 129, 103, 104, 103, 204, 128, 123, 132, 218, 235, 236, 254)
#: How much a school's first kit costs in each language against English
#: (its words' lengths and scripts: longer names to place, more lines to
#: set; measured on 5 December 2026 as the mean over eight latitudes from
#: 33 S to 60 N, each language already read, then the mean of two such
#: runs, which differed by up to a tenth), and for a language of the
#: user's own.
LANGUAGE_FACTOR = {"en": 1.0, "fr": 1.04, "de": 1.09, "es": 0.986, "pt": 1.02, "it": 1.01, "el": 1.14,
                   "ru": 1.01, "ar": 1.1, "hi": 1.05}
OTHER_LANGUAGE_FACTOR = 1.15
#: A sheet whose shorter side is under this (mm) draws the smaller kit.
SMALL_SHEET_MM = 180.0
#: What a school's first kit costs more where its worker first reads its
#: language (ms; measured: 40 to 90 in Latin, Greek and Cyrillic script,
#: about 150 where the words are shaped, in Arabic and Devanagari).
LANGUAGE_MS = 50.0
SHAPED_LANGUAGE_MS = 150.0
SHAPED_LANGUAGES = ("ar", "hi")
#: What drawing a school's plates costs more where the drawing worker
#: first reads its language for them (ms; measured on 5 December 2026:
#: a worker's first plate in each of nine languages cost no more than
#: 20 ms above its next two, within the runs' spread, where a whole first
#: kit costs :data:`LANGUAGE_MS` more: a plate's words are few).
PLATE_LANGUAGE_MS = 15.0
#: What a school's first kit costs less on a worker that has already
#: built a school of its family (:func:`family_of`), by latitude as the
#: tables above and measured with them: the rete, the maters, the rule
#: and the alidade it takes kept (kitgen.parts.reuse); the crowded
#: southern retes of low latitudes most.
FAMILY_MS = (28, 32, 41, 38, 35, 34, 38, 50, 63, 91, 123, 213, 181, 172, 181, 59,
             63, 63, 62, 48, 42, 40, 48, 31, 39, 36, 25, 32, 28, 22, 45)
SMALL_FAMILY_MS = (59, 77, 79, 96, 64, 71, 93, 204, 106, 101, 102, 86, 96, 104, 102, 71,
                   60, 68, 59, 65, 56, 54, 50, 112, 51, 45, 37, 2, 47, 42, 58)


def school_cost(recipe) -> float:
    """What drawing the shared parts of ``recipe``'s school costs, in a
    later pupil's kits: its first kit by latitude and sheet
    (:data:`FIRST_KIT_MS`) and language (:data:`LANGUAGE_FACTOR`), with
    its language read (:func:`language_cost`)."""
    return parts_cost(recipe) + language_cost(recipe)


def parts_cost(recipe) -> float:
    """:func:`school_cost` but for reading the language: its first kit by
    latitude, sheet and language, in a later pupil's kits."""
    first = _by_latitude(SMALL_FIRST_KIT_MS if _small(recipe) else FIRST_KIT_MS, recipe.latitude_deg)
    return first * _language_factor(recipe) / PUPIL_MS


def _language_factor(recipe) -> float:
    if recipe.language_file:
        return OTHER_LANGUAGE_FACTOR
    return LANGUAGE_FACTOR.get(recipe.language, OTHER_LANGUAGE_FACTOR)


def family_saving(recipe) -> float:
    """What ``recipe``'s school costs less where its worker has built a
    school of its family (:data:`FAMILY_MS`), in a later pupil's kits."""
    saved = _by_latitude(SMALL_FAMILY_MS if _small(recipe) else FAMILY_MS, recipe.latitude_deg)
    return saved * _language_factor(recipe) / PUPIL_MS


def family_of(recipe):
    """The schools whose kits share most parts but the plates with
    ``recipe``'s where one worker builds them (kitgen.parts.reuse):
    recipes equal but for the owner, title, place and latitude, in the
    same hemisphere.  Only the dealing's estimate (:data:`FAMILY_MS`):
    which parts are shared is found by the parts' own readings."""
    return replace(recipe, owner="", title="", place="", clock_place="", longitude_deg=None, timezone=None,
                   plates=(), latitude_deg=1.0 if recipe.latitude_deg >= 0 else -1.0)


def share_load(pieces: list[list]) -> float:
    """The work of a worker's ``pieces`` (each one school's jobs), in a
    later pupil's kits: the kits, each school's parts (:func:`parts_cost`),
    each language read once (:func:`language_cost`), and each family's
    shared parts drawn once (:func:`family_of`): each school's
    :func:`family_saving` less, and the largest of a family's added back,
    for the school that draws them."""
    return _load(_all_facts(pieces))


def _all_facts(pieces: list[list]) -> list[tuple]:
    """What :func:`share_load` reads of each piece: its kits and parts'
    cost, its language (a number) and that language's cost, its family
    (a number: hashed once, where a recipe's hash is worked out anew at
    each call) and its :func:`family_saving`."""
    numbers: dict = {}
    out = []
    for piece in pieces:
        school = job_school(piece[0])
        language = numbers.setdefault(_language(school), len(numbers))
        family = numbers.setdefault(family_of(school), len(numbers))
        out.append((len(piece) + parts_cost(school), language, language_cost(school), family,
                    family_saving(school)))
    return out


def _load(facts: list[tuple]) -> float:
    """:func:`share_load` of pieces by their facts (:func:`_all_facts`)."""
    load = sum(f[0] - f[4] for f in facts) + sum({f[1]: f[2] for f in facts}.values())
    drawn: dict = {}
    for f in facts:
        drawn[f[3]] = max(drawn.get(f[3], 0.0), f[4])
    return load + sum(drawn.values())


def _language(recipe) -> tuple:
    return (recipe.language, recipe.language_file)


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
    load (:func:`share_load`) less its last
    school's plates not yet moved (:func:`plate_cost`) would still exceed
    the least busy one's with them (and the school's language, where that
    one reads it only for them: :data:`PLATE_LANGUAGE_MS`), that school has
    its plates drawn by the least busy one, so that a set of few schools
    (three, five) is shared more evenly than whole schools allow.  Each
    worker keeps its first school's plates, drawn while the other draws
    its plates for it.  Which worker draws a part never changes its bytes."""
    schools = [list(dict.fromkeys(job_school(job) for job in share)) for share in shares]
    loads = [share_load([list(jobs) for _, jobs in groupby(share, key=job_school)]) for share in shares]
    languages = [{school.language for school in own} for own in schools]
    moved: list[tuple[int, int, object]] = []
    while True:
        busy, idle = loads.index(max(loads)), loads.index(min(loads))
        if len(schools[busy]) < 2:
            return moved
        school = schools[busy][-1]
        plates = plate_cost(school)
        # the drawing worker reads the school's language too, if it has not
        read = 0.0 if school.language in languages[idle] else PLATE_LANGUAGE_MS / PUPIL_MS
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
    """Each group cut into ``counts[key]`` even pieces, dealt to ``jobs``
    workers: the workers' jobs and loads (:func:`share_load`, in a later
    pupil's kits).  Two deals are made and the one whose busiest worker
    has least to do kept (then the one with less work in all): the
    longest-processing-time rule over the pieces, the most work first to
    the least loaded worker (Graham 1969), and the same rule over whole
    families (:func:`family_of`), each then bettered by moves and swaps
    of pieces (:func:`_bettered`); a family kept on one worker draws its
    shared parts and reads its language once."""
    pieces = []
    for key, group in groups.items():
        q, r = divmod(len(group), counts[key])
        start = 0
        for i in range(counts[key]):
            pieces.append(group[start:start + q + (i < r)])
            start += q + (i < r)
    facts = {id(piece): f for piece, f in zip(pieces, _all_facts(pieces))}
    by_piece = _lpt([[piece] for piece in pieces], jobs, facts)
    families: dict = {}
    for piece in pieces:
        families.setdefault(facts[id(piece)][3], []).append(piece)
    by_family = _lpt(list(families.values()), jobs, facts)
    best = min((_bettered(shares, facts) for shares in (by_piece, by_family)),
               key=lambda shares: _measure(_loads(shares, facts)))
    out = [[job for piece in share for job in piece] for share in best]
    return out, _loads(best, facts)


def _lpt(units: list[list], jobs: int, facts: dict) -> list[list]:
    """Units of pieces dealt by the longest-processing-time rule, each
    whole (its pieces' load, :func:`share_load`; ``facts``, each piece's
    facts of :func:`_all_facts` by its id) to the least loaded worker:
    each worker's pieces."""
    out: list[list] = [[] for _ in range(jobs)]
    loads = [0.0] * jobs
    for unit in sorted(units, key=lambda unit: -_load([facts[id(p)] for p in unit])):
        k = min(range(jobs), key=lambda k: (loads[k], k))
        out[k] += unit
        loads[k] = _load([facts[id(p)] for p in out[k]])
    return out


def _bettered(shares: list[list], facts: dict) -> list[list]:
    """Pieces moved from the busiest worker to another, or swapped, one
    of its pieces for one of another worker's, each time the change that
    lightens the busiest load most, as long as one does: the moves and
    pairwise interchanges of local search for scheduling on identical
    machines (common practice).  Five schools on two workers, dealt two
    and three by the longest-processing-time rule, may be evened out
    only by a swap.  Swaps are tried only for sets of at most
    :data:`SWAPS_MOST_PIECES` pieces: beyond, the pieces are small beside
    a worker's share, and the tries, a pair of pieces each, grow as
    their square."""
    shares = [list(share) for share in shares]
    swaps = sum(len(share) for share in shares) <= SWAPS_MOST_PIECES
    loads = _loads(shares, facts)
    while True:
        busy = loads.index(max(loads))
        best, change = _measure(loads), None
        own = [facts[id(p)] for p in shares[busy]]
        rests = [_load(own[:i] + own[i + 1:]) for i in range(len(own))]   # the busiest less one piece
        for k in range(len(shares)):
            if k == busy:
                continue
            other = [facts[id(p)] for p in shares[k]]
            for i in range(len(own)):
                for j in [None] + (list(range(len(other))) if swaps else []):   # None: a move
                    tried = list(loads)
                    tried[busy] = rests[i] if j is None else _load(own[:i] + own[i + 1:] + [other[j]])
                    tried[k] = _load((other if j is None else other[:j] + other[j + 1:]) + [own[i]])
                    if _measure(tried) < best:
                        best, change = _measure(tried), (i, k, j, tried)
        if change is None:
            return shares
        i, k, j, loads = change
        mine = shares[busy][i]
        shares[busy] = shares[busy][:i] + shares[busy][i + 1:] + ([] if j is None else [shares[k][j]])
        shares[k] = (shares[k] if j is None else shares[k][:j] + shares[k][j + 1:]) + [mine]


#: The most pieces of a set whose deal tries swaps (:func:`_bettered`).
SWAPS_MOST_PIECES = 16


def _loads(shares: list[list], facts: dict) -> list[float]:
    return [_load([facts[id(p)] for p in share]) for share in shares]


def _measure(loads: list[float]) -> tuple:
    """The busiest worker's load, then all workers' (rounded: a tie by
    the figures stays a tie)."""
    return (round(max(loads), 9), round(sum(loads), 9))
