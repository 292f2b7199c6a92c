"""Class-set jobs for the tests of how work is dealt and sent (#12):
invented pupils of schools told apart by their latitude."""

from __future__ import annotations

from kitgen.batch.work import KitJob
from kitgen.recipe.load import validate_recipe


def school_jobs(schools) -> list[KitJob]:
    """Jobs numbered in order: ``schools`` is a list of (latitude, pupils)."""
    jobs, n = [], 0
    for lat, pupils in schools:
        for _ in range(pupils):
            n += 1
            jobs.append(KitJob(n, validate_recipe({"latitude": lat, "owner": f"Pupil {n}"})))
    return jobs


def recipe_jobs(schools) -> list[KitJob]:
    """Jobs numbered in order: ``schools`` is a list of (recipe keys, pupils)."""
    jobs, n = [], 0
    for keys, pupils in schools:
        for _ in range(pupils):
            n += 1
            jobs.append(KitJob(n, validate_recipe({**keys, "owner": f"Pupil {n}"})))
    return jobs
