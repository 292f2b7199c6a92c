"""From a validated recipe to the frozen plan of one build.

:func:`plan_kit` is the one place where the recipe is read after
validation: it resolves the plates and their ids, the hemisphere, the sky
(epoch, obliquity, calendar, chosen stars), the mater's diameter, the
words and the printing options.  Everything below takes what it needs
from the plan.
"""

from __future__ import annotations

from ..errors import Message, UserError
from ..paper import SheetError, default_diameter_mm, make_sheet
from ..recipe.load import load_language_file
from ..recipe.schema import Recipe
from ..recipe.twilight import twilight_altitudes_deg
from ..sky.almanac import sky_for_kit
from ..sky.clock import clock_longitude_deg
from ..sky.rete_rim import kit_rim_deg
from ..sky.site_almanac import almanac_for_site
from ..sky.all_night import all_night_twilights
from ..sky.horizon_lead import horizon_lead_min
from ..sky.worked_example import worked_examples
from ..sky.worksheet import worksheet_questions
from ..words.templates import Words, load_words, words_from_tree
from .model import Drawing, Plan, PlatePlan, Printing, Site


def plan_words(recipe: Recipe) -> Words:
    """The words of the recipe's language, or of its own language file."""
    if recipe.language_file:
        return words_from_tree(load_language_file(recipe.language_file), recipe.native_digits)
    return load_words(recipe.language, recipe.native_digits)


def plan_plates(recipe: Recipe) -> tuple[PlatePlan, ...]:
    """The plates, numbered from 1 in the recipe's order; the one-plate
    form takes the recipe's latitude and place."""
    specs = recipe.plates or ((recipe.latitude_deg, recipe.place),)
    plates = []
    for k, spec in enumerate(specs, start=1):
        latitude, place = (spec if isinstance(spec, tuple) else (spec.latitude_deg, spec.place))
        plates.append(PlatePlan(f"plate-{k}", k, float(latitude), place))
    return tuple(plates)


def hemisphere_of(plates) -> int:
    """+1 for a northern instrument, -1 for a southern one: southern as soon
    as one plate lies south of the equator (an equator plate goes with
    either; the recipe refuses a mix)."""
    return -1 if any(p.latitude_deg < 0 for p in plates) else 1


def plan_site(recipe: Recipe, plates) -> Site:
    """The site (#10): the first plate's latitude, and the recipe's
    longitude and time zone (given, or its place's as looked up by
    kitgen.recipe.site); the place's name as printed."""
    longitude = None if recipe.longitude_deg is None else float(recipe.longitude_deg)
    return Site(plates[0].latitude_deg, longitude, recipe.timezone or None, recipe.place, recipe.clock_place)


def site_notes(plan) -> tuple[Message, ...]:
    """The build's note where a place is named beside a latitude and no
    longitude: the name is then only printed, not looked up (kitgen.recipe.site),
    so the kit tells local mean time where its user, a class set's roster
    above all, most likely meant the place's own clock."""
    site = plan.site
    if not site.place or site.longitude_deg is not None:
        return ()
    return (Message("notes.place_not_looked_up", place=site.place),)


def plan_kit(recipe: Recipe) -> Plan:
    """Everything the build of ``recipe`` needs, resolved once."""
    plates = plan_plates(recipe)
    sign = hemisphere_of(plates)
    try:
        sheet = make_sheet(recipe.sheet, recipe.margin_mm)
    except SheetError as exc:
        raise UserError.of(exc) from None
    scale = tuple(recipe.print_scale)
    stars = recipe.stars
    site = plan_site(recipe, plates)
    diameter = float(recipe.diameter_mm or default_diameter_mm(sheet, scale))
    latitudes = tuple(p.latitude_deg for p in plates)
    rim = kit_rim_deg(recipe.rete_limit_deg, latitudes, sign, recipe.epoch, diameter)
    sky = sky_for_kit(recipe.epoch, sign, stars.names, stars.brightest, stars.magnitude_limit,
                      clock_longitude_deg(recipe.epoch, site.longitude_deg, site.timezone), rim, latitudes)
    almanac = almanac_for_site(recipe.epoch, site.latitude_deg, site.longitude_deg, site.timezone)
    return Plan(
        title=recipe.title,
        epoch=recipe.epoch,
        hemisphere_sign=sign,
        plates=plates,
        site=site,
        sky=sky,
        diameter_mm=diameter,
        words=plan_words(recipe),
        drawing=Drawing(float(recipe.altitude_step_deg), float(recipe.azimuth_step_deg),
                        twilight_altitudes_deg(recipe.twilight), recipe.unequal_hours),
        printing=Printing(sheet, recipe.sheet, scale, recipe.film_mirror, tuple(recipe.film_parts), recipe.colour,
                          recipe.duplex, tuple(recipe.cutter_colours), float(recipe.pin_hole_mm),
                          float(recipe.sight_hole_mm)),
        parts=tuple(recipe.parts),
        almanac=almanac,
        examples=worked_examples(site.latitude_deg, sky, almanac, float(recipe.altitude_step_deg)),
        worksheet=worksheet_questions(site.latitude_deg, sky, almanac) if recipe.worksheet else (),
        accuracy_page=recipe.accuracy_page,
        owner=recipe.owner,
        all_night=all_night_twilights(site.latitude_deg, sky, twilight_altitudes_deg(recipe.twilight)),
        horizon_lead_min=horizon_lead_min(site.latitude_deg, sky),
    )
