"""The recipe: what one kit is, as validated plain values.

A recipe is the whole input of a build; the build is a pure function of it.
Each key has a type, a range and a default here, in one table, so that the
loader, the starter recipe (``kitgen new``) and the contributor guide all
read the same facts.
"""

from __future__ import annotations

import datetime as _dt
from dataclasses import dataclass, field
from typing import Any, Callable

from .longitude import parse_longitude
from .site import parse_timezone
from .twilight import DEFAULT as DEFAULT_TWILIGHT, parse_twilight

from .cutter import parse_cutter_colours
from .print_scale import parse_print_scale
from .rete_limit import parse_rete_limit
from ..geometry.style import CUTTER_COLOURS, PIN_HOLE_MM, SIGHT_HOLE_MM
from ..paper import DEFAULT_MARGIN_MM, MAX_MARGIN_MM, MIN_MARGIN_MM, SHEET_SIZES_MM, parse_sheet

SHEETS = tuple(SHEET_SIZES_MM)
PARTS = ("plate", "rete", "mater_front", "mater_back", "rule", "alidade")
#: How the mater's front and back are printed: on separate pages glued back
#: to back, or on the two sides of one sheet turned over on its long or
#: short edge (kitgen.layout.pages).
DUPLEX = ("none", "long_edge", "short_edge")

#: Limits on the epoch: the Sun's and the precession's series are used
#: well inside the span for which their authors give them.
EPOCH_MIN, EPOCH_MAX = 1900, 2100


@dataclass(frozen=True)
class StarChoice:
    """Which stars go on the rete: named stars, or a rule."""

    names: tuple[str, ...] = ()
    brightest: int | None = None
    magnitude_limit: float | None = None


#: The most plates one kit carries (a travelling show's towns; the
#: classical instrument came with a handful).
MAX_PLATES = 8


@dataclass(frozen=True)
class PlateSpec:
    """One plate the recipe asks for: its latitude and the place named on it."""

    latitude_deg: float
    place: str = ""


@dataclass(frozen=True)
class Recipe:
    """A validated recipe: every key of the recipe file (kitgen.recipe.load),
    checked and with its defaults, under its field name: what the plan is
    resolved from (nothing below the plan reads it)."""

    latitude_deg: float
    epoch: int
    sheet: str | tuple[float, float] = "a4"  # a name, or (width_mm, height_mm) of a custom sheet
    language: str = "en"
    language_file: str = ""        # absolute path of the recipe's own language file, if any
    native_digits: bool = False
    title: str = ""
    place: str = ""
    owner: str = ""                # whose kit it is: a pupil's name in a class set (#9, #12)
    stars: StarChoice = field(default_factory=lambda: StarChoice(brightest=32))
    rete_limit_deg: float | None = None  # the rim's declination; None: from the latitude (#9)
    altitude_step_deg: float = 5.0
    azimuth_step_deg: float = 15.0
    diameter_mm: float | None = None
    twilight: tuple[str, ...] = DEFAULT_TWILIGHT  # civil, nautical, astronomical (kitgen.recipe.twilight)
    unequal_hours: bool = True
    worksheet: bool = False        # questions for the class, with an answer key (#10)
    accuracy_page: bool = False    # kitgen check's report as a page of the kit (#10)
    parts: tuple[str, ...] = PARTS
    margin_mm: float = DEFAULT_MARGIN_MM
    print_scale: tuple[float, float] = (1.0, 1.0)  # measured print scale (x, y) the kit compensates
    film_mirror: bool = False
    film_parts: tuple[str, ...] = ()  # parts printed on film besides the rete
    colour: bool = False              # colour accents (kitgen.geometry.style.ACCENTS)
    duplex: str = "none"
    #: Laser cutters (#9): the SVG's colours of cut, score and engraved
    #: lines, as ((name, "#RRGGBB"), ...), and the diameters (mm) of the
    #: cut holes at the pins (defaults: kitgen.geometry.style).
    cutter_colours: tuple[tuple[str, str], ...] = tuple(CUTTER_COLOURS.items())
    pin_hole_mm: float = PIN_HOLE_MM
    sight_hole_mm: float = SIGHT_HOLE_MM
    #: The site (#10): longitude (east positive) and IANA time zone, as
    #: given or looked up from ``place`` (kitgen.recipe.site); None unknown.
    longitude_deg: float | None = None
    timezone: str | None = None
    #: The looked-up town whose zone the kit's clocks keep, as printed
    #: (kitgen.recipe.site), by which the kit names its clock; empty where
    #: the recipe gives the zone or coordinates itself.
    clock_place: str = ""
    #: The plates, when the recipe lists them under ``plates:``; empty for
    #: the one-plate form (``latitude:`` and ``place:``).
    plates: tuple[PlateSpec, ...] = ()


def current_year() -> int:
    return _dt.date.today().year


@dataclass(frozen=True)
class Key:
    """One recipe key: its YAML name, the Recipe field, a check and a help line."""

    name: str
    attr: str
    kind: str  # "number", "integer", "string", "choice", "bool", "stars", "parts", "parsed"
    help: str
    low: float | None = None
    high: float | None = None
    choices: tuple[str, ...] = ()
    example: Any = None
    #: For kind "parsed": checks the value and returns it, or raises
    #: ValueError with a one-line message.
    parse: Callable[[Any], Any] | None = None


KEYS: tuple[Key, ...] = (
    Key("latitude", "latitude_deg", "latitude", "degrees, north positive, -90 to 90 (48.2, 33.9S, 40 26 46 N)",
        -90.0, 90.0, example=48.2),
    Key("plates", "plates", "plates",
        f"several plates for one mater and rete, up to {MAX_PLATES}, all in one hemisphere: a list of latitudes "
        "or of {latitude: L, place: NAME} (instead of 'latitude')",
        1, MAX_PLATES, example=[{"latitude": 52.2, "place": "Hilltop"}, {"latitude": 48.9, "place": "Riverside"}]),
    Key("epoch", "epoch", "integer", f"year of the star places and calendar, {EPOCH_MIN} to {EPOCH_MAX}",
        EPOCH_MIN, EPOCH_MAX, example=2027),
    Key("sheet", "sheet", "parsed", f"paper sheet: {', '.join(SHEETS)}, or {{width_mm: W, height_mm: H}} "
        "(or width_in, height_in)", choices=SHEETS, example="a4", parse=parse_sheet),
    Key("margin_mm", "margin_mm", "number", "margin kept clear on every side of the sheet, mm",
        MIN_MARGIN_MM, MAX_MARGIN_MM, example=DEFAULT_MARGIN_MM),
    Key("print_scale", "print_scale", "parsed",
        "the printer's scale measured on `kitgen calibrate`'s page, across (x) and down (y); "
        "the kit is drawn to make up for it", example={"x": 1.0, "y": 1.0}, parse=parse_print_scale),
    Key("language", "language", "string", "language of every printed word (BCP 47 code)", example="en"),
    Key("language_file", "language_file", "string",
        "your own language file, same format as templates/en.yaml, relative to this recipe "
        "(instead of 'language')", example="my-language.yaml"),
    Key("native_digits", "native_digits", "bool",
        "print numbers in the language's own digits (Arabic-Indic for ar, Devanagari for hi)", example=False),
    Key("title", "title", "string", "title printed on the kit", example="Hilltop Science Club"),
    Key("place", "place", "string",
        "name of the place: printed on the kit, and looked up in the gazetteer (GeoNames)"
        " when no latitude is given: 'Lisbon' or 'Lisbon, PT'", example="Hilltop"),
    Key("longitude", "longitude_deg", "parsed", "degrees, east positive, -180 to 180 (-9.14, 9.14W, 9 8 24 W)",
        example=16.37, parse=parse_longitude),
    Key("timezone", "timezone", "parsed",
        "IANA time zone of the clocks at the place, such as Europe/Lisbon (default: the looked-up place's)",
        example="Europe/Vienna", parse=parse_timezone),
    Key("owner", "owner", "string", "name of the kit's owner, printed on the kit (a pupil's name in a class set)",
        example="Mira Quellstone"),
    Key("stars", "stars", "stars",
        "star names from `kitgen stars`, or {brightest: N}, or {magnitude_limit: M}",
        example={"brightest": 32}),
    Key("rete_limit_deg", "rete_limit_deg", "parsed",
        "declination of the rim of the rete and the plates, 23.5 to 80 degrees beyond the equator (-40 on a "
        "northern kit, 40 on a southern one); default: from the latitude, so that the bright stars that rise well "
        "above the horizon fit", example=-40, parse=parse_rete_limit),
    Key("altitude_step_deg", "altitude_step_deg", "number", "step between almucantars, degrees", 1.0, 30.0,
        example=5),
    Key("azimuth_step_deg", "azimuth_step_deg", "number", "step between azimuth curves, degrees", 5.0, 90.0,
        example=15),
    Key("diameter_mm", "diameter_mm", "number", "outer diameter of the mater in mm (default: fits the sheet)",
        80.0, 600.0, example=180),
    Key("film_mirror", "film_mirror", "bool",
        "print the film pages mirrored, so the ink lies under the film once it is turned over", example=False),
    Key("film_parts", "film_parts", "parts",
        "parts printed on transparency film besides the rete (which always is), e.g. [rule]", choices=PARTS,
        example=[]),
    Key("colour", "colour", "bool",
        "colour accents on the ecliptic, horizon, tropics and unequal hours (nothing depends on colour alone)",
        example=False),
    Key("duplex", "duplex", "choice",
        "mater front and back on the two sides of one sheet, for a printer that turns it over on the long or "
        "short edge, with marks to check the two sides meet; none (the default): separate pages glued back to back",
        choices=DUPLEX, example="none"),
    Key("twilight", "twilight", "parsed",
        "twilight circles to draw: civil (-6°), nautical (-12°), astronomical (-18°), a list of these, or none "
        "(true: astronomical)", example="astronomical", parse=parse_twilight),
    Key("cutter_colours", "cutter_colours", "parsed",
        "colours of the SVG's lines for a laser cutter: cut (through), score (folds) and engrave (everything "
        "else), as #RRGGBB", example=dict(CUTTER_COLOURS), parse=parse_cutter_colours),
    Key("pin_hole_mm", "pin_hole_mm", "number",
        "diameter of the hole cut at the centre of each part for the paper fastener, mm", 0.5, 8.0,
        example=PIN_HOLE_MM),
    Key("sight_hole_mm", "sight_hole_mm", "number", "diameter of the pinholes in the alidade's vanes, mm",
        0.3, 4.0, example=SIGHT_HOLE_MM),
    Key("unequal_hours", "unequal_hours", "bool", "draw the unequal (temporal) hour curves", example=True),
    Key("worksheet", "worksheet", "bool",
        "add a worksheet of questions for the site and year, with an answer key on its own page", example=False),
    Key("accuracy_page", "accuracy_page", "bool",
        "add a page with the accuracy report of `kitgen check` (how well this kit tells the time)", example=False),
    Key("parts", "parts", "parts", f"which parts to print, of: {', '.join(PARTS)}", choices=PARTS,
        example=list(PARTS)),
)

KEYS_BY_NAME = {k.name: k for k in KEYS}

#: Limits that keep a hostile or mistaken recipe from exhausting the machine.
MAX_STAR_NAMES = 200
MAX_TEXT_CHARS = 120


