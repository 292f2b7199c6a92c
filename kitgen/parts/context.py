"""What every part function receives: the recipe, the sky, the sizes and
the words.  Parts are pure functions of this context."""

from __future__ import annotations

from dataclasses import dataclass

from ..recipe.schema import Recipe
from ..sky.almanac import SkyForKit
from ..words.templates import Words
from .dimensions import Dimensions
from .legibility import Scales


@dataclass(frozen=True)
class PartContext:
    recipe: Recipe
    sky: SkyForKit
    dims: Dimensions
    words: Words
    scales: Scales       # what each scale carries at this size (kitgen.parts.legibility)
