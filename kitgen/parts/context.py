"""What every part function receives: the plan, the sky, the sizes, the
words and, for a plate, which plate.  Parts are pure functions of this
context; none reads the recipe."""

from __future__ import annotations

from dataclasses import dataclass

from ..plan.model import Plan, PlatePlan
from ..sky.almanac import SkyForKit
from ..words.templates import Words
from .dimensions import Dimensions
from .legibility import Scales


@dataclass(frozen=True)
class PartContext:
    """What a part's builder is given: the plan, the kit's dimensions, what
    each scale carries at this size, and the plate being drawn."""

    plan: Plan
    dims: Dimensions
    scales: Scales                 # what each scale carries at this size (kitgen.parts.legibility)
    plate: PlatePlan | None = None  # the plate being drawn (plate parts only)

    @property
    def sky(self) -> SkyForKit:
        return self.plan.sky

    @property
    def words(self) -> Words:
        return self.plan.words

    @property
    def hemisphere_sign(self) -> int:
        return self.plan.hemisphere_sign
