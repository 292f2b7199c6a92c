"""The plan's frozen data: plates, sky, sizes, words and printing options.

Nothing here reads the recipe; :mod:`kitgen.plan.resolve` fills these in.
Angles in degrees, lengths in millimetres.
"""

from __future__ import annotations

from dataclasses import dataclass

from ..paper import Sheet
from ..sky.almanac import SkyForKit
from ..sky.all_night import AllNight
from ..sky.site_almanac import Almanac
from ..sky.worked_example import WorkedExamples
from ..sky.worksheet import Question
from ..words.templates import Words


@dataclass(frozen=True)
class PlatePlan:
    """One plate of the kit: its id (``plate-1``, ``plate-2``...), its
    number, the latitude it is drawn for and the place named on it."""

    id: str
    number: int
    latitude_deg: float
    place: str = ""


@dataclass(frozen=True)
class Site:
    """Where the kit is used: the first plate's latitude, and the longitude
    (east positive) and IANA time zone as the recipe gives them or its
    place's gazetteer record has them (#10); ``None`` where unknown."""

    latitude_deg: float
    longitude_deg: float | None = None
    timezone: str | None = None
    place: str = ""
    #: The looked-up town whose clock the kit tells (Recipe.clock_place).
    clock_place: str = ""


@dataclass(frozen=True)
class Drawing:
    """What the plates draw, as the recipe asked (before legibility)."""

    altitude_step_deg: float = 5.0
    azimuth_step_deg: float = 15.0
    twilight_deg: tuple[float, ...] = (-18.0,)  # the Sun's altitudes of the twilight circles drawn
    unequal_hours: bool = True


@dataclass(frozen=True)
class Printing:
    """The sheet and how the kit is printed."""

    sheet: Sheet
    sheet_value: object            # the recipe's sheet: a name or (width_mm, height_mm)
    print_scale: tuple[float, float] = (1.0, 1.0)
    film_mirror: bool = False
    film_parts: tuple[str, ...] = ()
    colour: bool = False
    duplex: str = "none"
    #: Laser cutters (#9): the SVG's colours of cut, score and engraved
    #: lines, and the diameters (mm) of the cut holes at the pins.
    cutter_colours: tuple[tuple[str, str], ...] = (("cut", "#FF0000"), ("score", "#0000FF"),
                                                   ("engrave", "#000000"))
    pin_hole_mm: float = 1.8
    sight_hole_mm: float = 1.0


@dataclass(frozen=True)
class Plan:
    """Everything a build needs, resolved once."""

    title: str
    epoch: int
    hemisphere_sign: int           # +1: a northern instrument, -1: a southern one
    plates: tuple[PlatePlan, ...]
    site: Site
    sky: SkyForKit
    diameter_mm: float
    words: Words
    drawing: Drawing
    printing: Printing
    parts: tuple[str, ...]         # the kinds of part the kit prints
    almanac: Almanac               # the site's clock correction and sunrise table for the epoch year (#10)
    examples: WorkedExamples       # the instructions' worked examples by the Sun and a star (#10)
    worksheet: tuple[Question, ...] = ()  # the worksheet's questions, when the recipe asks for one (#10)
    accuracy_page: bool = False    # kitgen check's report as a page of the kit (#10)
    owner: str = ""                # whose kit it is, printed small on every part (#9)
    #: the plate's twilights that last all night round midsummer, with their dates (kitgen.sky.all_night)
    all_night: tuple[AllNight, ...] = ()
    #: the least and most minutes by which the table's sunrise comes before
    #: the plate's, over the year (kitgen.sky.horizon_lead); None at a pole
    horizon_lead_min: tuple[int, int] | None = None

    @property
    def latitude_deg(self) -> float:
        """The first plate's latitude (the kit's own, on a one-plate kit)."""
        return self.plates[0].latitude_deg
