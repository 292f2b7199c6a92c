"""The instructions' words: what the first page says, as paragraphs.

Written here, from the kit's plan and its laid-out pages, with the kit's
:class:`~kitgen.words.templates.Words`; :mod:`kitgen.layout.paragraphs`
sets them into lines and pages, and a backend only draws those lines.
"""

from __future__ import annotations

import functools
import unicodedata

from ..kept import kept_for
from ..parts.clock_scale import signed
from ..parts.format import IN_SENTENCE, WITHIN_LINE, latitude_text
from ..parts.plate import keyed
from ..paper import CHECK_BAR_MM, content_area_mm
from ..sky.constants import TWILIGHT_DEG
from .figures import kit_figures
from ..words.locale import format_date, true_minus, zone_place
from .paragraphs import PAGE_BREAK, Block


def kit_title(kit) -> str:
    return kit.plan.title or kit.words("kit.default_title")


def kit_latitudes(kit) -> str:
    """The latitude of each plate, as a list in the kit's language."""
    w = kit.words
    return w("page.list_separator").join(latitude_text(w, p.latitude_deg) for p in kit.plan.plates)


def kit_line(kit, fits=None) -> str:
    """The kit's title, its plates' latitudes and its epoch, in one line;
    with ``fits`` (a test of a line: whether it fits its room), the title
    shortened with "…", word by word, then letter by letter, until the
    line fits, or as short as it goes: a long title in a page's footer
    (#12), whose whole title the first page and the mater print."""
    w = kit.words
    latitude, year = kit_latitudes(kit), w.number(kit.plan.epoch)
    title = kit_title(kit)
    line = w("page.kit_line", title=title, latitude=latitude, year=year)
    if fits is None or fits(line):
        return line
    for shorter in _shortened(title):
        line = w("page.kit_line", title=shorter, latitude=latitude, year=year)
        if fits(line):
            break
    return line


def _shortened(text: str):
    """``text`` cut ever shorter, each ending in "…": by whole words from
    the end, then the first word letter by letter (never just before a
    combining mark, nor just after a virama, which would change how the
    letter before it is drawn)."""
    words = text.split()
    for k in range(len(words) - 1, 0, -1):
        yield _closed(" ".join(words[:k]).rstrip(",;:·-–—") + "\u2026")
    first = words[0] if words else ""
    for k in range(len(first) - 1, 0, -1):
        if unicodedata.category(first[k])[0] == "M" or unicodedata.name(first[k - 1], "").endswith("VIRAMA"):
            continue
        yield _closed(first[:k] + "\u2026")
    yield "\u2026"


#: Quotation marks and brackets a shortened title may leave open, and
#: what closes each.
_PAIRS = {"«": "»", "‹": "›", "“": "”", "„": "“", "‘": "’", "(": ")", "[": "]"}


def _closed(text: str) -> str:
    """``text`` with the quotation marks and brackets it opens and does not
    close closed at its end, innermost first ("«Северная…" becomes
    "«Северная…»")."""
    open_ = []
    for ch in text:
        if open_ and ch == _PAIRS[open_[-1]]:
            open_.pop()
        elif ch in _PAIRS:
            open_.append(ch)
    return text + "".join(_PAIRS[ch] for ch in reversed(open_))


def plates_blocks(kit) -> list[Block]:
    """On a kit of several plates, which plate to put in for which place."""
    plates = kit.plan.plates
    if len(plates) < 2:
        return []
    w = kit.words
    intro = (w("plate.plates_intro") if keyed(kit.plan)   # a duplex plate has no key (#9)
             else w("plate.plates_intro_duplex", noon=w.number(12)))
    out = [Block("body", intro)]
    for p in plates:
        latitude = latitude_text(w, p.latitude_deg, WITHIN_LINE)   # named plate or not
        text = (w("plate.plates_item_place", number=w.number(p.number), place=p.place, latitude=latitude) if p.place
                else w("plate.plates_item", number=w.number(p.number), latitude=latitude))
        out.append(Block("item", text, "\u2022"))
    return out


def _page_list(words, pages, kind) -> tuple[int, str]:
    numbers = [words.number(p.number) for p in pages if p.kind == kind]
    return len(numbers), words("page.list_separator").join(numbers)


def print_notes(kit, pages) -> list[str]:
    """What the first page says about how the kit was drawn for printing:
    for grey-scale or colour, which side of the film takes the ink, for
    which print scale."""
    w = kit.words
    notes = [w("printing.colour") if kit.plan.printing.colour else w("printing.greyscale")]
    film = [p for p in pages if p.kind == "film"]
    if film:
        notes.append(w("printing.film_mirrored") if any(p.mirrored for p in film) else w("printing.film_plain"))
    front = next((p for p in pages if p.duplex == "front"), None)
    if front is not None:
        key = "printing.duplex_long" if kit.plan.printing.duplex == "long_edge" else "printing.duplex_short"
        notes.append(w(key, front=w.number(front.number), back=w.number(front.number + 1)))
    sx, sy = pages[0].print_scale
    if (sx, sy) != (1.0, 1.0):
        notes.append(w("printing.scaled", x=_percent(w, sx), y=_percent(w, sy), length=w.number(CHECK_BAR_MM)))
    return notes


def _percent(words, factor: float) -> str:
    """A scale factor as a percentage, with the fewest decimals (up to
    two) that write it."""
    p = factor * 100.0
    decimals = next((d for d in (0, 1) if abs(round(p, d) - p) < 1e-9), 2)
    return words.number(p, decimals)


#: The part kinds each item of the templates' ``instructions.stack`` list
#: puts on the pin, in the list's order (the alidade, the mater, the plate,
#: the rete, the rule).
STACK_ITEM_PARTS = (("alidade",), ("mater_front", "mater_back"), ("plate",), ("rete",), ("rule",))


def stack_blocks(kit) -> list[Block]:
    """The stack on the pin, numbered, with only the parts the kit prints;
    the mater glued back to back only when its two sides are separate pages
    (with ``duplex`` they are one sheet, and alone there is nothing to
    glue: #9)."""
    w = kit.words
    printed = set(kit.plan.parts)
    items = []
    for text, kinds in zip(w.items("instructions.stack"), STACK_ITEM_PARTS):
        if not printed & set(kinds):
            continue
        if kinds == ("mater_front", "mater_back"):
            if kit.plan.printing.duplex != "none":
                text = w("instructions.stack_mater_duplex")
            elif not set(kinds) <= printed:
                text = w("instructions.stack_mater_plain")
        if kinds == ("plate",) and not keyed(kit.plan):   # set by its noon line, no key (#9)
            text = w("instructions.stack_plate_duplex", noon=w.number(12))
        items.append(text)
    return [Block("item", s, w.number(k) + ".") for k, s in enumerate(items, start=1)]


def column_mm(pages) -> float:
    """Width (mm) of the instructions' column: the first instructions
    page's content area (every instructions page has the same)."""
    page = next(p for p in pages if p.kind == "instructions")
    x0, _, x1, _ = content_area_mm(page.sheet, page.landscape, page.print_scale)
    return x1 - x0


#: The twilight a line of each altitude (degrees) ends.
TWILIGHT_KINDS = {deg: kind for kind, deg in TWILIGHT_DEG.items()}


def twilight_altitudes(kit) -> list[float]:
    """The altitudes (degrees, below zero) of the twilight lines the kit's
    plate draws, highest first; none where the kit has no plate."""
    if "plate" not in kit.plan.parts:
        return []
    return [alt for alt in sorted(kit.plan.drawing.twilight_deg, reverse=True) if alt in TWILIGHT_KINDS]


def glossary_blocks(kit) -> list[Block]:
    """A short glossary in pupils' words: the trade's terms the plate, the
    rete and the instructions use (#9); last, what the kit's plate's own
    twilight lines mark (#12 review: a Russian kit with the -6 and -12 deg
    lines explained only the -18 deg one)."""
    w = kit.words
    items = list(w.items("instructions.glossary"))
    if _days_alike(kit):   # "a summer hour is longer than a winter one" is not so at the equator (#12 review)
        same = w("instructions.glossary_unequal_equator")
        term = same.split(":")[0]
        items = [same if item.split(":")[0] == term else item for item in items]
    lines = [w(f"instructions.twilight_line_{TWILIGHT_KINDS[alt]}", altitude=true_minus(w.number(alt)))
             for alt in twilight_altitudes(kit)]
    if lines:
        key = "instructions.glossary_twilight_line_one" if len(lines) == 1 else "instructions.glossary_twilight_lines"
        items.append(w(key, lines=w("page.list_separator").join(lines)))
    return ([Block("heading", w("instructions.glossary_heading"))]
            + [Block("item", s, "\u2022") for s in items])


#: Below this spread of the day's length over the year (minutes), the
#: unequal hours of summer and winter differ by under 2.5 minutes: about
#: 4 degrees either side of the equator.
DAYS_ALIKE_MIN = 30.0


def _days_alike(kit) -> bool:
    """Whether the site's days, by its sunrise table, differ in length by
    less than :data:`DAYS_ALIKE_MIN` over the year (none in polar day or
    night)."""
    lengths = [r.day_length_min for r in kit.plan.almanac.sun_rise_set]
    return all(r.reason is None for r in kit.plan.almanac.sun_rise_set) and max(lengths) - min(lengths) < DAYS_ALIKE_MIN


#: The mater's two faces: what the thread, the knife and the glue are for.
MATER_KINDS = {"mater_front", "mater_back"}


def need_blocks(kit, pages) -> list[Block]:
    """What a pupil needs at hand, for this kit's options (#9): film only
    for film pages, glue only for a mater glued from two pages, tape only
    for a part in pieces, thread and a knife only with a mater."""
    w = kit.words
    printed, kinds = set(kit.plan.parts), {p.kind for p in pages}
    glued = MATER_KINDS <= printed and kit.plan.printing.duplex == "none"
    tiled = any(pl.piece is not None for p in pages for pl in p.placements)
    wanted = (("card", "card" in kinds), ("film", "film" in kinds), ("fastener", True),
              ("thread", bool(printed & MATER_KINDS)), ("glue", glued), ("tape", tiled), ("scissors", True),
              ("knife", "mater_front" in printed and keyed(kit.plan)), ("pin", True))
    return ([Block("heading", w("instructions.need_heading"))]
            + [Block("item", w("instructions.need_" + k), "\u2022") for k, on in wanted if on])


def cut_blocks(kit) -> list[Block]:
    """The cutting step's own cases (#9): the key slot, cut with a knife
    (before gluing, and kept clear of glue: the key's pocket), the thread
    hole, which has no pin's cross, and the reading edge."""
    w = kit.words
    printed = set(kit.plan.parts)
    out = []
    if "mater_front" in printed and keyed(kit.plan):   # no slot in a duplex kit (#9)
        glued = MATER_KINDS <= printed and kit.plan.printing.duplex == "none"
        key = "instructions.cut_key_slot" if glued else "instructions.cut_key_slot_unglued"
        out.append(Block("body", w(key, label=w("mater_front.key_slot"))))
    if printed & MATER_KINDS:
        out.append(Block("body", w("instructions.cut_hang_hole")))
    if printed & {"rule", "alidade"}:
        out.append(Block("body", w("instructions.read_edge_step", label=w("rule.reading_edge"))))
    return out


def story(kit, pages) -> list[Block]:
    """The instructions, as paragraphs for kitgen.layout.paragraphs to set."""
    w = kit.words
    length = w.number(CHECK_BAR_MM)

    def numbered(key):
        return [Block("item", s, w.number(k) + ".") for k, s in enumerate(w.items(key), start=1)]

    out = [Block("title", w("instructions.title")),
           Block("body", kit_line(kit))]
    out += plates_blocks(kit)
    out.append(Block("heading", w("instructions.cautions_heading")))
    out += [Block("caution", s, "!") for s in w.items("instructions.cautions")]
    out += need_blocks(kit, pages)
    out.append(Block("heading", w("instructions.print_heading")))
    # Which pages go on which stock, by the kit's own page numbers: the
    # instructions on plain paper, the parts on card and film (#9).
    # A worksheet's answer key, for the teacher only, is left out of the
    # pupils' pages.
    answers = answer_key_page(kit, pages)
    plain = [p for p in pages if p.kind == "instructions" and p is not answers]
    for kind, key in (("instructions", "instructions.print_plain"), ("card", "instructions.print_card"),
                      ("film", "instructions.print_film")):
        n, listed = _page_list(w, plain if kind == "instructions" else pages, kind)
        if n:
            out.append(Block("item", w(key + ("_one" if n == 1 else "_many"), pages=listed), "\u2022"))
        if kind == "instructions" and answers is not None:
            out.append(Block("item", w("instructions.print_answers", page=w.number(answers.number)), "\u2022"))
    out.append(Block("item", w("instructions.print_scale", length=length, percent=w.number(100)), "\u2022"))
    out += [Block("item", s, "\u2022") for s in print_notes(kit, pages)]
    cut = w("instructions.cut")
    if "plate" in kit.plan.parts:   # (its zenith's small ×, no hole: said only where a plate is printed)
        cut += " " + w("instructions.cut_zenith")
    out += [Block("heading", w("instructions.cut_heading")), Block("body", cut)]
    out += cut_blocks(kit)
    if any(pl.piece is not None for p in pages for pl in p.placements):
        out.append(Block("body", w("printing.tiles")))
        out.append(Block("body", w("printing.tiles_pierce")))
    out.append(Block("heading", w("instructions.stack_heading")))
    plate_fig, stack_fig = kit_figures(kit, column_mm(pages))
    if stack_fig is not None:   # the stack drawn, in the order of the steps below (#9)
        out.append(Block("figure", w("instructions.figure_stack"), figure=stack_fig))
    # (the steps' lead-in right above them, never parted from them by the picture: #12 review)
    out.append(Block("body", w("instructions.stack_intro")))
    out += stack_blocks(kit)
    out.append(Block("body", w("instructions.fastener")))
    if {"mater_front", "mater_back"} & set(kit.plan.parts):
        out.append(Block("body", w("instructions.hang")))  # the plumb's thread (#9)
    out.append(Block("heading", w("instructions.time_heading")))
    out += numbered("instructions.time_steps")
    out += clock_step(kit, len(w.items("instructions.time_steps")) + 1)
    out.append(Block("body", w("instructions.time_note_standard" if _zoned(kit) and not _summer(kit)
                               else "instructions.time_note")))
    out += reading_between_blocks(kit)
    out += sun_example_blocks(kit) + correction_blocks(kit)
    out.append(Block("heading", w("instructions.height_heading")))
    out += numbered("instructions.height_steps")
    glossary = glossary_blocks(kit)
    if plate_fig is not None:   # the plate's lines named (#9), under the glossary's heading
        glossary.insert(1, Block("figure", w("instructions.figure_plate"), figure=plate_fig))
    out += glossary
    out += sunrise_blocks(kit) + unequal_blocks(kit) + star_blocks(kit)
    out += accuracy_blocks(kit)
    out += worksheet_blocks(kit)   # last: its answer key is the last page (answer_key_page)
    return out


def answer_key_page(kit, pages):
    """The page of ``pages`` that holds the worksheet's answer key, for the
    teacher only, or None: the last instructions page, as the key's page
    break puts it on a page of its own after everything else
    (:func:`worksheet_blocks`, the story's last blocks)."""
    plain = [p for p in pages if p.kind == "instructions"]
    return plain[-1] if kit.plan.worksheet and len(plain) > 1 else None


def _per_kit(make):
    """``make(kit)``'s paragraphs kept for the last few kits, by the kit's
    identity (a kit is frozen): the pages' split asks for the story once
    for each count of pages it tries, and these depend on the kit alone
    (#12).  Each call gets a list of its own."""
    kept: dict[int, tuple] = {}

    @functools.wraps(make)
    def made(kit) -> list[Block]:
        return list(kept_for(kept, kit, lambda: tuple(make(kit)), 4))
    return made


# Clock time, sunrise and the stars (#10): from the plan's almanac
# (kitgen.sky.site_almanac) and worked examples (kitgen.sky.worked_example);
# every word from the templates' almanac section.

#: Days of the correction table: every seventh day from 1 January.
WEEK_DAYS = 7


def clock_text(words, hours: float) -> str:
    """A time of day, ``H:MM`` to the nearest minute, in the kit's digits."""
    minutes = int(round(hours * 60.0)) % 1440
    h, m = divmod(minutes, 60)
    return f"{words.number(h)}:{words.number(m // 10)}{words.number(m % 10)}"


def _date(kit, month: int, day: int, with_year: bool = True) -> str:
    w = kit.words
    return format_date(kit.plan.epoch, month, day, w.language, w.native_digits, with_year)


def _place(kit, title: bool = False) -> str:
    """The place the kit was made for, as the examples name it: its name,
    or its latitude in words that read in the sentence (#10), or as a
    heading names it (``title``: "latitude 0.2° S", where a sentence has
    "la latitud", "der Breite", "на широте")."""
    if kit.plan.site.place:
        return kit.plan.site.place
    return latitude_text(kit.words, kit.plan.site.latitude_deg, WITHIN_LINE if title else IN_SENTENCE)


def _zoned(kit) -> bool:
    return kit.plan.almanac.time == "zone"


def _summer(kit) -> bool:
    """Whether the site's clocks change for summer time in the epoch year
    (the zone database, kitgen.sky.site_almanac)."""
    return _zoned(kit) and kit.plan.almanac.summer_time


def zone_name(kit) -> str:
    """The site's clock in words pupils know: the looked-up town's, or the
    zone's city in the kit's language, or its UTC offset
    (kitgen.words.locale.zone_place)."""
    site = kit.plan.site
    return zone_place(site.timezone, kit.words.language, site.clock_place)


def clock_name(kit) -> str:
    """What the corrected time is: a clock of the site's zone, or local mean time."""
    w = kit.words
    return w("almanac.clock_zone", zone=zone_name(kit)) if _zoned(kit) else w("almanac.clock_mean")


def sun_place(words, longitude_deg: float) -> str:
    """The Sun's place as the back's ecliptic ring shows it: degrees within
    a sign, to the nearest degree tick (#9: 354.9 deg is 25 deg of the
    twelfth sign, where the date's tick stands, not 24), 29.5 deg and more
    the next sign's 0."""
    lon = round(longitude_deg) % 360
    sign = lon // 30
    return words("almanac.sun_place", degrees=words.number(lon - 30 * sign),
                 sign=words.items("zodiac.signs")[sign])


def has_clock_ring(kit) -> bool:
    """Whether the back carries the clock correction ring (it is left out
    on a kit too small for it, kitgen.parts.clock_scale)."""
    return _on_back(kit, "clock_run")


def _on_back(kit, role: str) -> bool:
    """Whether the drawn back carries an element of ``role`` (a clock
    change's bar, kitgen.parts.clock_scale: ``clock_change``)."""
    return any(e.role == role for p in kit.parts_of("mater_back") for e in p.elements)


def clock_step(kit, number: int) -> list[Block]:
    """The time-telling procedure's last step: to clock time, from the
    back's ring, or from the table where the kit has no ring."""
    w = kit.words
    if not has_clock_ring(kit):
        out = [Block("item", w("almanac.clock_step_table", heading=w("almanac.correction_heading"),
                               clock_name=clock_name(kit)), w.number(number) + ".")]
        return out if _zoned(kit) else out + [Block("body", w("almanac.mean_missing")), _zone_meridian(w)]
    if _zoned(kit):
        text = w("almanac.clock_step" if _summer(kit) else "almanac.clock_step_standard", zone=zone_name(kit))
        if _on_back(kit, "clock_change"):
            text += " " + w("almanac.clock_bars")
        return [Block("item", text + _unnumbered_text(kit), w.number(number) + ".")]
    return [Block("item", w("almanac.clock_step_mean") + _unnumbered_text(kit), w.number(number) + "."),
            _zone_meridian(w)]


def unnumbered_run(kit) -> tuple[int, int, int] | None:
    """(minutes before, its minutes, minutes after) of a run of the back's
    clock ring that carries no number, with the runs either side of it in
    date order, or None where every run is numbered.  A run whose two
    neighbours are numbered is taken first, the earliest in the year.

    Between the clock changes the ring steps one minute from run to run:
    each run is the days whose correction rounds to the same whole minute,
    and the correction changes by less than a minute a day (the equation
    of time by about half a minute a day at most, J. Meeus, Astronomical
    Algorithms, 2nd ed., ch. 28), so a pupil counts on from the numbers
    beside an unnumbered run (#12 review: in a fast season every second or
    third run is numbered, kitgen.parts.clock_scale)."""
    backs = kit.parts_of("mater_back")
    if not backs:
        return None
    els = backs[0].elements
    runs = [e.values for e in els if e.role == "clock_run"]
    if len(runs) < 3:
        return None
    numbered = {(e.values["month"], e.values["day"]) for e in els if e.role == "clock_number"}
    found = []
    for k, run in enumerate(runs):
        if (run["from_month"], run["from_day"]) in numbered:
            continue
        before, after = runs[k - 1], runs[(k + 1) % len(runs)]
        if abs(before["minutes"] - run["minutes"]) != 1 or abs(after["minutes"] - run["minutes"]) != 1:
            continue   # (beside a clock change's bar, or at a turn of the correction)
        both = all((r["from_month"], r["from_day"]) in numbered for r in (before, after))
        found.append((not both, k, (before["minutes"], run["minutes"], after["minutes"])))
    return min(found)[2] if found else None


def _unnumbered_text(kit) -> str:
    """The sentence on the ring's runs without a number (with a space
    before it), from a run of the kit's own ring (:func:`unnumbered_run`),
    or nothing where every run is numbered."""
    got = unnumbered_run(kit)
    if got is None:
        return ""
    w = kit.words
    before, minutes, after = (signed(w, m) for m in got)
    # (across a clock change's bar the step is the change: the sentence says so where the ring has one)
    key = "almanac.clock_unnumbered_bars" if _on_back(kit, "clock_change") else "almanac.clock_unnumbered"
    return " " + w(key, before=before, between=minutes, after=after)


def _zone_meridian(w) -> Block:
    """Where a zone's meridian lies, for the pupil who works out the step
    from local mean time to the clock by hand (a kit made without the
    longitude and time zone): 15 deg for each hour from UTC, by the
    definition of the standard zones (common practice)."""
    return Block("body", w("almanac.zone_meridian"))


def _finest_step(values) -> float | None:
    """The smallest gap between the distinct ``values`` (a scale's ticks
    or lines), or None with fewer than two."""
    ordered = sorted({round(v, 6) for v in values})
    steps = [b - a for a, b in zip(ordered, ordered[1:])]
    return min(steps) if steps else None


def scale_steps(kit) -> tuple[float, float, float] | None:
    """(minutes between the hour ring's finest ticks, degrees between the
    altitude scale's, degrees between the plate's almucantars), as the
    parts draw them (ticks thinned away left out), or None where the kit
    lacks one of those parts."""
    front, back, plate = (kit.parts_of(kind) for kind in ("mater_front", "mater_back", "plate"))
    if not (front and back and plate):
        return None

    def drawn(part, role, key):
        return [e.values[key] for e in part[0].elements if e.role == role and e.stroke != "none"]

    hours = _finest_step(drawn(front, "hour_tick", "hour"))
    degrees = _finest_step(drawn(back, "altitude_tick", "altitude_deg"))
    step = _finest_step(drawn(plate, "almucantar", "altitude_deg"))
    if hours is None or degrees is None or step is None:
        return None
    return hours * 60.0, degrees, step


def reading_between_blocks(kit) -> list[Block]:
    """How fine the scales are and that a reading lies between their
    marks (a teacher's look: read only to the nearest tick, ``kitgen
    check`` finds the Sun's time up to 5 to 14 minutes out, read between
    them within about a minute), with the kit's own steps."""
    steps = scale_steps(kit)
    if steps is None:
        return []
    w = kit.words
    minutes, degrees, step = steps

    def shown(value):
        return w.number(value, 0 if abs(value - round(value)) < 0.01 else 1)

    return [Block("body", w("instructions.read_between", minutes=shown(minutes), degrees=shown(degrees),
                            step=shown(step)))]


@_per_kit
def sun_example_blocks(kit) -> list[Block]:
    """The worked example by the Sun, at the site and in the epoch year."""
    ex = kit.plan.examples.sun
    if ex is None:
        return []
    w = kit.words
    solar_min = int(round(ex.solar_hours * 60.0))
    # The correction from the back's ring, or from the table where the
    # finished back has none (#10).
    key = "almanac.sun_example" if has_clock_ring(kit) else "almanac.sun_example_table"
    text = w(key, place=_place(kit), heading=w("almanac.correction_heading"), date=_date(kit, ex.month, ex.day),
             date_short=_date(kit, ex.month, ex.day, False),
             altitude=w.number(ex.altitude_deg), sun_place=sun_place(w, ex.sun_longitude_deg),
             solar=clock_text(w, solar_min / 60.0), correction=signed(w, ex.correction_min),
             clock=clock_text(w, (solar_min + ex.correction_min) / 60.0), clock_name=clock_name(kit))
    return [Block("heading", w("almanac.sun_example_heading")), Block("body", text)]


def _month_rows(kit, entries) -> list[Block]:
    """One item a month: ``entries`` is [(month, text)] in date order."""
    w = kit.words
    months = w.items("calendar.months")
    out = []
    for month in range(1, 13):
        texts = [t for m, t in entries if m == month]
        if texts:
            out.append(Block("item", w("almanac.month_row", month=months[month - 1],
                                       entries=w("page.list_separator").join(texts)), "\u2022", row=True))
    return out


@_per_kit
def correction_blocks(kit) -> list[Block]:
    """The clock correction by week, as the ring on the back gives it."""
    w = kit.words
    rows = kit.plan.almanac.clock_correction[::WEEK_DAYS]
    entries = [(m, w("almanac.correction_entry", day=w.number(d), minutes=signed(w, int(round(x)))))
               for m, d, x in rows]
    intro = w("almanac.correction_intro", clock_name=clock_name(kit), year=w.number(kit.plan.epoch))
    return [Block("heading", w("almanac.correction_heading")), Block("body", intro)] + _month_rows(kit, entries)


def _length(words, minutes: float) -> str:
    h, m = divmod(int(round(minutes)), 60)
    return words("almanac.length", hours=words.number(h), minutes=words.number(m))


@_per_kit
def sunrise_blocks(kit) -> list[Block]:
    """The kit's own way to sunrise, sunset and the day's length, and the
    site's table by half month to check it."""
    w = kit.words
    out = [Block("heading", w("almanac.sun_heading"))]
    out += [Block("item", s, w.number(k) + ".") for k, s in enumerate(w.items("almanac.sun_steps"), start=1)]
    drawn = twilight_altitudes(kit)
    if drawn:   # the plate's twilight lines, read as its horizon is (#12 review: drawn, and no step used them)

        def line(alt):   # as the plate names it
            return w("plate.line_twilight_short", altitude=true_minus(w.number(alt)))

        key = "almanac.twilight_step_one" if len(drawn) == 1 else "almanac.twilight_step"   # "on it", not "on one of them"
        text = w(key, lines=w("page.list_separator").join(line(alt) for alt in drawn))
        for night in kit.plan.all_night:   # a line the Sun's point never reaches round midsummer (#12 review)
            if night.altitude_deg in drawn:
                text += " " + w("almanac.twilight_all_night", first=_date(kit, *night.first, False),
                                last=_date(kit, *night.last, False), line=line(night.altitude_deg))
        out.append(Block("body", text))
    lead = kit.plan.horizon_lead_min   # how far the table's times stand from the plate's, here (#12 review)
    out.append(Block("body", w("almanac.sun_note") if lead is None else
                     w("almanac.sun_note_minutes", low=w.number(lead[0]), high=w.number(lead[1]))))
    out.append(Block("body", w("almanac.sun_table_intro", place=_place(kit), year=w.number(kit.plan.epoch),
                               clock_name=clock_name(kit))))
    entries, next_day = [], False
    for r in kit.plan.almanac.sun_rise_set:
        day = w.number(r.day)
        if r.reason == "polar_day":
            entries.append((r.month, w("almanac.polar_day", day=day)))
        elif r.reason == "polar_night":
            entries.append((r.month, w("almanac.polar_night", day=day)))
        else:
            sunset = clock_text(w, r.set_min / 60.0)
            if after_midnight(r):   # "3:32–0:08" read as a sunset before the sunrise (#12 review)
                sunset, next_day = sunset + NEXT_DAY_MARK, True
            entries.append((r.month, w("almanac.rise_set_entry", day=day, rise=clock_text(w, r.rise_min / 60.0),
                                       set=sunset, length=_length(w, r.day_length_whole_min))))
    rows = _month_rows(kit, entries)
    return out + rows + ([Block("body", NEXT_DAY_MARK + " " + w("almanac.after_midnight"))] if next_day else [])


#: Marks a sunset of the table that falls after midnight, on the next day.
NEXT_DAY_MARK = "*"


def after_midnight(entry) -> bool:
    """Whether a sunrise table entry's sunset, as printed (to the minute),
    falls after midnight: its clock time earlier than the sunrise's."""
    return int(round(entry.set_min)) % 1440 < int(round(entry.rise_min)) % 1440


def has_unequal_hours(kit) -> bool:
    """Whether the kit's plates draw the unequal hours (none where the
    recipe leaves them out, nor at a pole, where the Sun neither rises
    nor sets on a day)."""
    return any(e.role == "unequal_hour" for p in kit.parts_of("plate") for e in p.elements)


@_per_kit
def unequal_blocks(kit) -> list[Block]:
    """Reading the unequal hour of the day from the plate's lines, with the
    site's example (kitgen.sky.worked_example.unequal_example): drawn and
    named in the glossary, no step had used them (#12 review).  The Sun's
    opposite point among the lines below the horizon shows the hour, as
    the lines are drawn (kitgen.parts.plate)."""
    if not has_unequal_hours(kit):
        return []
    w = kit.words
    out = [Block("heading", w("almanac.unequal_heading"))]
    out += [Block("item", s, w.number(k) + ".") for k, s in enumerate(w.items("almanac.unequal_steps"), start=1)]
    ex = kit.plan.examples.unequal
    if ex is not None:
        out.append(Block("body", w("almanac.unequal_example", place=_place(kit), date=_date(kit, ex.month, ex.day),
                                   altitude=w.number(ex.altitude_deg), sun_place=sun_place(w, ex.sun_longitude_deg),
                                   opposite=sun_place(w, ex.sun_longitude_deg + 180.0), hour=w.number(ex.hour),
                                   minutes=w.number(round(ex.hour_minutes)))))
    return out


@_per_kit
def star_blocks(kit) -> list[Block]:
    """Telling the time by a star, and the site's example."""
    w = kit.words
    out = [Block("heading", w("almanac.star_heading"))]
    out += [Block("item", s, w.number(k) + ".") for k, s in enumerate(w.items("almanac.star_steps"), start=1)]
    ex = kit.plan.examples.star
    if ex is None:
        return out
    star = w.star_name(kit.sky.stars[ex.star_index].star.label)
    solar_min = int(round(ex.solar_hours * 60.0))
    out.append(Block("body", w("almanac.star_example", place=_place(kit), date=_date(kit, ex.month, ex.day),
                               date_short=_date(kit, ex.month, ex.day, False),
                               star=star, altitude=w.number(ex.altitude_deg),
                               side=w("almanac.east" if ex.east else "almanac.west"),
                               sun_place=sun_place(w, ex.sun_longitude_deg), solar=clock_text(w, solar_min / 60.0),
                               correction=signed(w, ex.correction_min),
                               clock=clock_text(w, (solar_min + ex.correction_min) / 60.0),
                               clock_name=clock_name(kit))))
    return out


def _worksheet_values(kit, q) -> dict:
    """A question's numbers, dates and times as the kit's language writes them."""
    w = kit.words
    v = dict(q.values)
    out = {"place": _place(kit), "year": w.number(kit.plan.epoch), "clock_name": clock_name(kit)}
    if "month" in v:
        out["date"] = _date(kit, v["month"], v["day"], False)
    if "month2" in v:
        out["date2"] = _date(kit, v["month2"], v["day2"], False)
    if "altitude_deg" in v:
        out["altitude"] = w.number(v["altitude_deg"], 0 if float(v["altitude_deg"]).is_integer() else 1)
    if "solar_hours" in v:
        solar_min = int(round(v["solar_hours"] * 60.0))
        out["solar"] = clock_text(w, solar_min / 60.0)
        out["clock"] = clock_text(w, (solar_min + v["correction_min"]) / 60.0)
    if "correction_min" in v:
        out["correction"] = signed(w, v["correction_min"])
    if "day_length_hours" in v:
        out["length"] = _length(w, v["day_length_hours"] * 60.0)
    if "star_index" in v:
        out["star"] = w.star_name(kit.sky.stars[v["star_index"]].star.label)
    for key in ("ratio", "distance_m", "eye_m", "height_m"):
        if key in v:
            out[key.removesuffix("_m")] = w.number(v[key], 0 if float(v[key]).is_integer() else 1)
    return out


#: Lines to write on under a question that asks for more than one thing
#: (one under any other): a line for each part of the answer, as a class
#: worksheet gives (common practice): the Sun's two days in the zenith,
#: the time of sunrise and the day's length, the height's working and
#: the height.
ANSWER_LINES = {"zenith_days": 2, "sunrise": 2, "height": 2}


@_per_kit
def worksheet_blocks(kit) -> list[Block]:
    """The worksheet, when the recipe asks for one: the questions, then the
    answer key on a page of its own for the teacher."""
    questions = kit.plan.worksheet
    if not questions:
        return []
    w = kit.words
    values = [_worksheet_values(kit, q) for q in questions]
    titled = {**values[0], "place": _place(kit, title=True)}
    out = [Block(PAGE_BREAK, ""), Block("heading", w("worksheet.heading", **titled)),
           Block("body", w("worksheet.name_line")), Block("body", w("worksheet.intro", **values[0]))]
    for k, (q, v) in enumerate(zip(questions, values), start=1):
        out += [Block("item", w("worksheet.q_" + q.kind, **v), w.number(k) + "."),
                Block("answer", w("worksheet.answer_label"))]
        out += [Block("answer", "")] * (ANSWER_LINES.get(q.kind, 1) - 1)
    out += [Block(PAGE_BREAK, ""), Block("heading", w("worksheet.key_heading", **titled))]
    out += [Block("item", w("worksheet.a_" + q.kind, **v), w.number(k) + ".")
            for k, (q, v) in enumerate(zip(questions, values), start=1)]
    return out


def accuracy_blocks(kit) -> list[Block]:
    """kitgen check's report as a page of the kit, when the recipe asks
    for it (``accuracy_page``): its first line the heading, the figures
    below, in the words the terminal uses (kitgen.check.report)."""
    accuracy = getattr(kit, "accuracy", None)
    if accuracy is None:
        return []
    from ..check.report import report_lines   # only for a kit that prints its accuracy page
    lines = report_lines(kit, accuracy)
    return ([Block(PAGE_BREAK, ""), Block("heading", lines[0])]
            + [Block("body", line.strip()) for line in lines[1:]])
