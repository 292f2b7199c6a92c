"""The starter class set and roster that ``kitgen new --set`` and
``kitgen new --roster`` write (#12): a set recipe a coordinator fills in,
and a roster a spreadsheet opens, each one that ``kitgen batch`` builds
as written (an invented school and pupils)."""

from __future__ import annotations

from ..recipe.schema import current_year

#: The roster the starter set names, beside it.
ROSTER_NAME = "pupils.csv"


def starter_set(roster: str = ROSTER_NAME) -> str:
    """A commented set recipe: defaults, a kits list of one, and the
    roster line left as a comment (``kitgen new --roster`` writes one)."""
    return f"""\
# A kitgen class set: a kit for every pupil of a class, or for every
# school of a tour.  Change what you need, then run
#   kitgen batch THIS-FILE.yaml -o FOLDER
# 'defaults' holds any keys of a recipe (`kitgen new` lists them all);
# each kit below, and each row of the roster, changes what it gives.
# A kit that says where it is for (place, latitude or plates) takes none
# of the defaults' place, latitude, longitude, timezone or plates.
defaults:
  latitude: 52.2
  language: en
  sheet: a4
  epoch: {current_year()}
  title: Larkspur Valley School
kits:
  - owner: Class teacher
    copies: 2                 # one to show, one to take apart
# A roster: a CSV file beside this one, one row a pupil, its columns
# recipe keys (owner, latitude, language, title, copies...); an empty
# cell takes the default.  `kitgen new --roster -o {roster}` writes one.
# roster: {roster}
"""


def starter_roster() -> str:
    """A roster of three invented pupils: a header of recipe keys, a row
    a kit, empty cells taking the set's defaults."""
    return ("owner,latitude,language,copies\r\n"
            "Ada Brightwater,,,\r\n"
            "Bruno Castellane,,fr,\r\n"
            "Chidi Okoro-Lane,,,2\r\n")
