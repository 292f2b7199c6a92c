"""Build a kit: the one way through the pipeline.

recipe -> plan -> sky, dimensions -> parts.  :func:`build_kit` is a pure
function of the recipe (and of the shipped catalogue and templates): the
same recipe gives the same kit, byte for byte, whoever builds it and
wherever.  :func:`build_from_plan` does the same from a plan.
"""

from __future__ import annotations

from dataclasses import dataclass, field, replace
from functools import lru_cache
from typing import TYPE_CHECKING

from .errors import Message, UserError
from .geometry.model import Part
from .kept import keep_last, kept_for
from .parts import PART_BUILDERS, breaks
from .parts.clock_scale import clock_ring_notes
from .parts.context import PartContext
from .parts.dimensions import Dimensions, dimensions
from .parts.legibility import plan_scales, shortened_notes
from .parts.owner import ADD_OWNER, plate_owner, plate_slot
from .parts.rete import rim_notes
from .parts.reuse import reused_or_drawn
from .plan.model import Plan
from .plan.resolve import plan_kit, site_notes
from .recipe.schema import Recipe
from .sky.almanac import SkyForKit
from .words.templates import Words

if TYPE_CHECKING:   # kitgen check's figures are worked out only for a kit that prints them
    from .check.accuracy import Accuracy


@dataclass(frozen=True)
class Kit:
    """A whole kit as geometry: the plan it was built from, its dimensions
    and its parts in mm, with what the build has to tell the user."""

    plan: Plan
    dims: Dimensions
    parts: tuple[Part, ...]
    #: What the build thinned or shortened to keep every scale legible at
    #: this size, for the command line to tell (kitgen.parts.legibility):
    #: messages of the templates' ``notes`` section, said with ``words``.
    notes: tuple[Message, ...] = ()
    #: kitgen check's figures, when the recipe asks for them as a page of
    #: the kit (``accuracy_page``, #10); None otherwise.
    accuracy: Accuracy | None = None
    #: The same kit drawn with room for its owner's name but without the
    #: name (kitgen.parts.owner): every element but the name's own, the
    #: same part ids and bounds; its pages serve this kit too
    #: (kitgen.layout.pages.layout_kit), and its PDF, the name laid over
    #: it (kitgen.render.pdf_owner).  None for a kit without owner.
    nameless: Kit | None = field(default=None, compare=False, repr=False)

    @property
    def words(self) -> Words:
        return self.plan.words

    @property
    def sky(self) -> SkyForKit:
        return self.plan.sky

    def part(self, key: str) -> Part:
        """The part with this id, or the first of this kind."""
        return next((p for p in self.parts if p.id == key), None) or next(p for p in self.parts if p.kind == key)

    def parts_of(self, kind: str) -> list[Part]:
        return [p for p in self.parts if p.kind == kind]


def part_id(kind: str) -> str:
    """The id of the one part of a kind (``mater_front`` -> ``mater-front``)."""
    return kind.replace("_", "-")


def on_material(part: Part, plan: Plan) -> Part:
    """The part on transparency film when the plan's ``film_parts`` lists
    it (the rete is drawn for film always)."""
    if part.kind in plan.printing.film_parts and part.material != "film":
        return replace(part, material="film")
    return part


def build_from_plan(plan: Plan) -> Kit:
    """Every part of the planned kit, as geometry in mm: one plate per
    planned plate (ids ``plate-1``...), one of every other part.

    The parts are drawn without the owner's name (:func:`_nameless`,
    kept for the last few plans), then given room for a name whatever it
    is (:func:`_named_base`), and the name is set into that room
    (kitgen.parts.owner): a class set's kits that differ only in whose
    they are (#12) share all but the name's own words, and each is the
    same, byte for byte, as when built alone."""
    base = _nameless(replace(plan, owner=""))
    if not plan.owner:
        return base.kit
    room = _named_base(base, plan)
    parts = []
    for part, whole in zip(room.parts, base.kit.parts):
        plate = next((p for p in plan.plates if p.id == part.id), None)
        if part.kind == "plate":   # the lines in the name's slot drawn again round the name
            ctx = PartContext(plan, room.dims, base.scales[part.id], plate)
            parts.append(plate_owner(part, ctx, whole))
        elif part.kind in ADD_OWNER:
            ctx = PartContext(plan, room.dims, base.scales.get(part.id, base.scales[""]), plate)
            parts.append(ADD_OWNER[part.kind](part, ctx))
        else:   # the rule and the alidade: drawn again with the name
            ctx = PartContext(plan, room.dims, base.scales[""])
            parts.append(replace(on_material(PART_BUILDERS[part.kind](ctx), plan), id=part.id))
    parts = tuple(parts)
    notes = base.other_notes + shortened_notes(parts, room.dims, plan.words)
    return replace(room, plan=plan, parts=parts, notes=notes, nameless=room)


#: A stand-in name: the parts drawn for an owner depend on there being
#: one, never on the name itself (kitgen.parts.owner).
_ANY_OWNER = "X"

_NAMED_BASE: dict[int, tuple] = {}


def _named_base(base: "_Nameless", plan: Plan) -> Kit:
    """The nameless kit with room for an owner's name (the plate's slot,
    the rule's and the alidade's room) but no name: every element of a
    named kit but the name's own (role ``owner``) and the lines drawn
    again beside it (``beside_owner``).  Kept for the last few
    nameless kits (by identity), so a school's pupils share it."""
    return kept_for(_NAMED_BASE, base, lambda: _with_room(base, plan), 4)


def _with_room(base: "_Nameless", plan: Plan) -> Kit:
    """:func:`_named_base`, made."""
    stand_in = replace(plan, owner=_ANY_OWNER)
    parts = []
    for part in base.kit.parts:
        if part.kind == "plate":
            plate = next(p for p in plan.plates if p.id == part.id)
            parts.append(plate_slot(part, PartContext(stand_in, base.kit.dims, base.scales[part.id], plate)))
        elif part.kind in ADD_OWNER:
            parts.append(part)
        else:
            drawn = PART_BUILDERS[part.kind](PartContext(stand_in, base.kit.dims, base.scales[""]))
            drawn = replace(drawn, elements=tuple(e for e in drawn.elements if e.role != "owner"))
            parts.append(replace(on_material(drawn, stand_in), id=part.id))
    return replace(base.kit, parts=tuple(parts))


@dataclass(frozen=True)
class _Nameless:
    """A kit drawn without an owner's name, with what adding one needs:
    each part's scales (by part id; ``""`` the kit's own) and the notes
    that do not depend on the parts' words."""

    kit: Kit
    scales: dict
    other_notes: tuple[Message, ...]


#: The last few nameless kits, by plan: a class set's schools one after
#: another (a kit's geometry is megabytes).
_NAMELESS: dict[Plan, _Nameless] = {}


def _nameless(plan: Plan, drawn: dict | None = None) -> _Nameless:
    """The kit of ``plan`` drawn without an owner's name, kept for the last
    few plans.  ``drawn``: parts of it already drawn by another worker of
    a class set (:func:`draw_plates`), by id, used instead of drawing them
    again; they are the same, part for part."""
    kept = _NAMELESS.get(plan)
    if kept is not None:
        return kept
    breaks.let_go()
    dims, scales = _sizes(plan)
    drawn = drawn or {}
    notes = list(scales[""].notes)
    parts = []
    for kind in PART_BUILDERS:
        if kind not in plan.parts:
            continue
        for plate in plan.plates if kind == "plate" else (None,):
            key = plate.id if plate is not None else part_id(kind)
            if plate is not None and plate is not plan.plates[0]:
                notes += [n for n in scales[key].notes if n.values.get("part") is not None
                          and n.values["part"].key == "notes.part.plate_numbered"]
            parts.append(drawn[key] if key in drawn else _draw(plan, dims, scales, kind, plate))
    parts = tuple(parts)
    notes += rim_notes(plan)
    notes += site_notes(plan)   # a place not looked up: local mean time
    notes += clock_ring_notes(parts, dims)  # the back without its clock ring says so (#10)
    kit = Kit(plan, dims, parts, tuple(notes) + shortened_notes(parts, dims, plan.words))
    if plan.accuracy_page:
        from .check.accuracy import check_kit
        from .check.reading import READING_PARTS
        missing = [k for k in READING_PARTS if k not in plan.parts]
        if missing:
            raise UserError("errors.accuracy_page_parts", parts=list(READING_PARTS), missing=missing)
        kit = replace(kit, accuracy=check_kit(kit))
    return keep_last(_NAMELESS, plan, _Nameless(kit, scales, tuple(notes)), 4)


def _sizes(plan: Plan) -> tuple[Dimensions, dict]:
    """The kit's dimensions and each part's scales (kitgen.parts.legibility)
    by part id: a plate's own, ``""`` the kit's (its first plate's)."""
    dims = dimensions(plan.diameter_mm, plan.sky.obliquity_rad, plan.sky.rim_deg, plan.hemisphere_sign)
    kit_scales = plan_scales(plan, plan.plates[0], dims)
    scales = {"": kit_scales}
    for plate in plan.plates:
        scales[plate.id] = kit_scales if plate is plan.plates[0] else plan_scales(plan, plate, dims)
    return dims, scales


def _draw(plan: Plan, dims: Dimensions, scales: dict, kind: str, plate=None) -> Part:
    """One part of the nameless kit, with its id: drawn, or the same part
    kept from another plan that draws it the same (kitgen.parts.reuse)."""
    ctx = PartContext(plan, dims, scales[""] if plate is None else scales[plate.id], plate)
    part = reused_or_drawn(kind, ctx, PART_BUILDERS[kind])
    return replace(on_material(part, plan), id=part_id(kind) if plate is None else plate.id)


def school_of(recipe: Recipe) -> Recipe:
    """The recipe but for its owner: what a class set's kits of one
    school share, and build once (#12)."""
    return replace(recipe, owner="")


def draw_plates(recipe: Recipe) -> dict[str, Part]:
    """The plates of the recipe's kit drawn without an owner's name, by
    id, as :func:`build_kit` draws them: a class set's worker draws them
    for a school that another worker builds (#12), which passes them to
    :func:`build_kit` as ``drawn``."""
    plan = _plan(school_of(recipe))
    if "plate" not in plan.parts:
        return {}
    dims, scales = _sizes(plan)
    return {plate.id: _draw(plan, dims, scales, "plate", plate) for plate in plan.plates}


def build_kit(recipe: Recipe, drawn: dict | None = None) -> Kit:
    """Every part of the kit the recipe describes, as geometry in mm;
    ``drawn``, the parts of it another worker has drawn already
    (:func:`draw_plates`)."""
    plan = _plan(school_of(recipe))
    if drawn:
        _nameless(plan, drawn)
    return build_from_plan(replace(plan, owner=recipe.owner))


@lru_cache(maxsize=4)
def _plan(recipe: Recipe) -> Plan:
    """The plan of a recipe (kept for the last few: a class set's pupils
    share their school's)."""
    return plan_kit(recipe)
