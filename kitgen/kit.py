"""Build a kit: the one way through the pipeline.

recipe -> sky -> dimensions -> parts.  :func:`build_kit` is a pure function
of the recipe (and of the shipped catalogue and templates): the same recipe
gives the same kit, byte for byte, whoever builds it and wherever.
"""

from __future__ import annotations

from dataclasses import dataclass, replace

from .errors import Message
from .geometry.model import Part
from .layout.pages import default_diameter_mm, kit_sheet
from .parts import PART_BUILDERS
from .parts.context import PartContext
from .parts.dimensions import Dimensions, dimensions
from .parts.legibility import plan_scales, shortened_notes
from .recipe.schema import Recipe
from .sky.almanac import SkyForKit, sky_for_kit
from .words.templates import Words, load_words, load_words_file


@dataclass(frozen=True)
class Kit:
    recipe: Recipe
    sky: SkyForKit
    dims: Dimensions
    words: Words
    parts: tuple[Part, ...]
    #: What the build thinned or shortened to keep every scale legible at
    #: this size, for the command line to tell (kitgen.parts.legibility):
    #: messages of the templates' ``notes`` section, said with ``words``.
    notes: tuple[Message, ...] = ()

    def part(self, kind: str) -> Part:
        return next(p for p in self.parts if p.kind == kind)


def on_material(part: Part, recipe: Recipe) -> Part:
    """The part on transparency film when the recipe's ``film_parts``
    lists it (the rete is drawn for film always)."""
    if part.kind in recipe.film_parts and part.material != "film":
        return replace(part, material="film")
    return part


def build_kit(recipe: Recipe) -> Kit:
    """Every part of the kit the recipe describes, as geometry in mm."""
    sky = sky_for_kit(recipe)
    words = (load_words_file(recipe.language_file, recipe.native_digits) if recipe.language_file
             else load_words(recipe.language, recipe.native_digits))
    diameter = recipe.diameter_mm or default_diameter_mm(kit_sheet(recipe), recipe.print_scale)
    dims = dimensions(diameter, sky.obliquity_rad)
    scales = plan_scales(recipe, sky, dims, words)
    ctx = PartContext(recipe, sky, dims, words, scales)
    parts = tuple(on_material(build(ctx), recipe) for kind, build in PART_BUILDERS.items() if kind in recipe.parts)
    return Kit(recipe, sky, dims, words, parts, scales.notes + shortened_notes(parts, dims, words))
