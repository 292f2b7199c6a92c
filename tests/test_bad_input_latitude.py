"""Latitudes as people write them, read from a recipe file.

The expected values follow the definition of sexagesimal degrees, one
degree = 60 minutes = 3600 seconds, south negative (common knowledge; the
forms are those printed on maps, in atlases and by GPS receivers).  Each
form goes through the whole YAML loader, since YAML itself reads some of
them (``40:26:46`` is a base-60 integer in YAML 1.1).
"""

from __future__ import annotations

import pytest

from kitgen.errors import UserError
from kitgen.recipe.latitude import ACCEPTED_FORMS, parse_latitude
from kitgen.recipe.load import parse_recipe_text


def dms(d, m=0.0, s=0.0, south=False) -> float:
    value = d + m / 60.0 + s / 3600.0
    return -value if south else value


ACCEPTED = [
    # plain numbers
    ("48.2", 48.2),
    ("-33.9", -33.9),
    ("0", 0.0),
    ("90", 90.0),
    ("-90", -90.0),
    ("+12.5", 12.5),
    # decimal degrees with a hemisphere letter
    ("33.9S", -33.9),
    ("33.9 S", -33.9),
    ("51.48N", 51.48),
    ("'40.4461° N'", 40.4461),
    # degrees, minutes, seconds with the typographic marks of an atlas
    ("40°26′46″N", dms(40, 26, 46)),
    ("40° 26′ 46″ N", dms(40, 26, 46)),
    ("33°52′S", dms(33, 52, south=True)),
    # the same with the keyboard's ASCII marks
    ("40°26'46\"N", dms(40, 26, 46)),
    ("'40d26m46sN'", dms(40, 26, 46)),
    # space separated, as copied from a table
    ("40 26 46 N", dms(40, 26, 46)),
    ("40 26 46", dms(40, 26, 46)),
    ("33 52 S", dms(33, 52, south=True)),
    ("40 26 46 North", dms(40, 26, 46)),
    ("33 52 south", dms(33, 52, south=True)),
    # decimal minutes and seconds
    ("40°26.767′N", dms(40, 26.767)),
    ("40 26 46.5 N", dms(40, 26, 46.5)),
    # the hemisphere first, as GPS receivers show it
    ("N 40° 26.767′", dms(40, 26.767)),
    ("S33.9", -33.9),
    # colons, read by YAML 1.1 as a base-60 number unless kept as written
    ("40:26:46", dms(40, 26, 46)),
    ("-12:30:00", -12.5),
    ("'-12:30'", -12.5),
    # the Unicode minus sign and the ordinal indicator some keyboards give
    ("−33.9", -33.9),
    ("40º26′46″N", dms(40, 26, 46)),
]


@pytest.mark.parametrize("written, expected", ACCEPTED)
def test_accepted_forms(written, expected):
    recipe = parse_recipe_text(f"latitude: {written}\nepoch: 2027\n", "r.yaml")
    assert recipe.latitude_deg == pytest.approx(expected, abs=1e-12)


@pytest.mark.parametrize("written", ["40,5", "'40,5'", "-33,9", "40,5 N", "40°26,5′N"])
def test_decimal_comma_is_refused_with_the_accepted_forms(written):
    with pytest.raises(UserError) as err:
        parse_recipe_text(f"latitude: {written}\n", "r.yaml")
    msg = str(err.value)
    assert msg.startswith("r.yaml, line 1: 'latitude': ")
    assert "has a decimal comma; write a decimal point. Accepted forms: " + ACCEPTED_FORMS in msg


def test_the_accepted_forms_in_the_message_are_themselves_accepted():
    for form in ACCEPTED_FORMS.split(", "):
        parse_latitude(form)


@pytest.mark.parametrize("written, needle", [
    ("40 60 00 N", "minutes and seconds must be less than 60"),
    ("40 26 61", "minutes and seconds must be less than 60"),
    ("40.5 26 N", "only the last of degrees, minutes, seconds may have decimals"),
    ("-33.9S", "has both a sign and a hemisphere letter; give one of them"),
    ("33.9s", "write the hemisphere as a capital N or S"),
    ("forty", "cannot read 'forty' as a latitude. Accepted forms:"),
    ("40 26 46 12", "cannot read"),
    ("91 N", "the latitude is 91, outside -90 to 90 degrees"),
    ("89 60 1 S", "minutes and seconds must be less than 60"),
    ("90 0 1 S", "the latitude is -90.0003, outside -90 to 90 degrees"),
    # as written (a coordinator's look: 151.5 was quoted as 152, -95.25 as -95)
    ("151.5", "the latitude is 151.5, outside -90 to 90 degrees"),
    ("-95.25", "the latitude is -95.25, outside -90 to 90 degrees"),
    ("90.0000001", "the latitude is 90.0000001, outside -90 to 90 degrees"),
    ("'" + "4" * 41 + "'", "too long for a latitude"),
    ("true", "a latitude is a number or text such as"),
    ("{deg: 40}", "a latitude is a number or text such as"),
    ("1.0e+400", "the latitude must be a finite number"),
    ("0x" + "f" * 300, "far outside -90 to 90"),
])
def test_refused_forms(written, needle):
    with pytest.raises(UserError) as err:
        parse_recipe_text(f"latitude: {written}\n", "r.yaml")
    assert needle in str(err.value)
    assert "\n" not in str(err.value)
