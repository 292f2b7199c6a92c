"""The set's ``manifest.csv``: one row a kit, what it is, where its file
and its pages are, and whether it was built (#12).

Columns (RFC 4180 CSV, UTF-8 after a byte order mark, ``\\r\\n`` line ends
as the RFC writes them; the mark is how spreadsheet programs tell UTF-8
from the system's own code page, common practice, so that a pupil's
"Ñ" or a Cyrillic title opens as written):

- ``kit``: the kit's number in the set, from 1;
- ``owner``, ``title``, ``place``, ``latitude``, ``language``, ``sheet``: as
  the merged recipe gives them (the latitude in degrees, north positive,
  to :data:`LATITUDE_DECIMALS` decimals;
  the sheet as kitgen.batch.printfiles.sheet_key names it); for a kit
  that failed, as its row and the set's defaults give them, the recipe's
  own default where both leave one out (``a4``, ``en``);
- ``copies``: how many times the kit is in the print files (its answer
  key, once for its school: kitgen.batch.printfiles.ONCE_A_SCHOOL); for
  a kit that failed, the copies its row asked for, to print once mended;
- ``file``: its PDF under ``kits/`` (empty when it failed);
- ``pages``, then ``paper_pages``, ``answers_pages``, ``duplex_pages``,
  ``card_pages``, ``film_pages``: page counts of one copy, by the stock
  the kit's own printing steps put them on
  (kitgen.batch.printfiles.MATERIALS: the instructions on plain paper,
  a worksheet's answer key for the teacher, a duplex mater's two sides);
- ``paper_print_pages`` ... ``film_print_pages``: where its copies are in
  the print file of that stock (``print-paper.pdf`` ..., or
  ``print-paper-letter.pdf`` ... for the kit's sheet where the set mixes
  sheets), such as
  ``5–8 9–12`` (:data:`SPAN_DASH`), or ``3`` for one page; for the answer
  key, its school's one key, which the school's kits all name;
- ``status``: ``ok``, or the one-line reason it was not built;
- ``notes``: what its build thinned or left out to keep every scale
  legible, as ``kitgen build`` says it, in the kit's language, the notes
  separated by `` | `` (:data:`NOTE_SEPARATOR`); empty when there are none.

A text cell that a spreadsheet would take for a formula (one starting
with ``=``, ``+``, ``-`` or ``@``) is written with a leading apostrophe.
"""

from __future__ import annotations

import csv
import io
from dataclasses import MISSING, fields

from ..recipe.load import shipped_language
from ..recipe.schema import Recipe
from .printfiles import MATERIALS, sheet_key

COLUMNS = ("kit", "owner", "title", "place", "latitude", "language", "sheet", "copies", "file", "pages",
           *(f"{m}_pages" for m in MATERIALS), *(f"{m}_print_pages" for m in MATERIALS), "status", "notes")
STATUS_OK = "ok"

#: The recipe's defaults, for a failed row's cells that its row and the
#: set's defaults leave empty (the sheet and language it would be built on).
_DEFAULTS = {f.name: f.default for f in fields(Recipe) if f.default is not MISSING}


def manifest_row(kit, file_name: str, result, spans: dict, error: str) -> dict:
    """The manifest's row for a :class:`~kitgen.batch.setfile.SetKit`, its
    file name, its :class:`~kitgen.batch.work.KitResult` (or ``None``), its
    print-file spans (``{material: [(first, last), ...]}``) and the one-line
    reason it failed (empty when it was built)."""
    recipe, tree = kit.recipe, kit.tree
    if recipe is not None:
        owner, title, place = getattr(recipe, "owner", ""), recipe.title, recipe.place
        latitude, language, sheet = degrees_text(recipe.latitude_deg), recipe.language, sheet_key(recipe.sheet)
    else:   # the row as given; a key it leaves out, the recipe's default
        owner, title, place = (_text(tree.get(k)) for k in ("owner", "title", "place"))
        latitude, language, sheet = (_text(tree.get(k, _DEFAULTS.get(k))) for k in ("latitude", "language", "sheet"))
        language = shipped_language(language) or language   # "EN" as the kits built write it, "en"
    ok = not error
    materials = result.materials if ok else ()
    status = STATUS_OK if ok else error
    return {
        "kit": kit.number, "owner": owner, "title": title, "place": place, "latitude": latitude,
        "language": language, "sheet": sheet, "copies": kit.copies, "file": f"kits/{file_name}" if ok else "",
        "pages": len(materials) if ok else "",
        **{f"{m}_pages": materials.count(m) if ok else "" for m in MATERIALS},
        **{f"{m}_print_pages": _spans(spans.get(m, [])) for m in MATERIALS},
        "status": status,
        "notes": NOTE_SEPARATOR.join(result.notes) if ok else "",
    }


#: Between two of a kit's notes in the ``notes`` cell.
NOTE_SEPARATOR = " | "


#: Columns of free text, from the set's own values or messages.
TEXT_COLUMNS = ("owner", "title", "place", "sheet", "status", "notes")
#: A cell starting so is taken for a formula by spreadsheet programs
#: (OWASP, "CSV Injection"): such a text cell gets a leading apostrophe.
_FORMULA_START = ("=", "+", "-", "@", "\t", "\r")


#: A latitude's decimals in the manifest: a tenth of a metre on the
#: ground, so that one typed with up to six decimals reads as typed, and
#: one worked out from degrees, minutes and seconds or read from a town's
#: entry in the gazetteer does not run to sixteen figures (64.13333333333334).
LATITUDE_DECIMALS = 6


def degrees_text(value_deg: float) -> str:
    """``value_deg`` to :data:`LATITUDE_DECIMALS` decimals, without
    trailing zeros: ``51.5``, ``-33.9``, ``64.133333``, ``0``."""
    text = f"{value_deg:.{LATITUDE_DECIMALS}f}".rstrip("0").rstrip(".")
    return "0" if text == "-0" else text


def manifest_csv(rows) -> bytes:
    buf = io.StringIO(newline="")
    writer = csv.DictWriter(buf, fieldnames=COLUMNS, lineterminator="\r\n")
    writer.writeheader()
    for row in rows:
        writer.writerow({k: _inert(v) if k in TEXT_COLUMNS else v for k, v in row.items()})
    return buf.getvalue().encode("utf-8-sig")


def _inert(value) -> str:
    """A text cell that a spreadsheet shows as text, never runs."""
    text = str(value)
    return "'" + text if text.startswith(_FORMULA_START) else text


#: Between a span's first and last page: the en dash (U+2013) of
#: typesetting's ranges.  Spreadsheet programs take "1-4", with a hyphen,
#: for a date (4 January) and keep "1–4" as text (common practice, no source).
SPAN_DASH = "\u2013"


def _spans(spans) -> str:
    """Print-file spans ``[(first, last), ...]`` as a cell: ``5–8 9–12``,
    one page as its number."""
    return " ".join(str(a) if a == b else f"{a}{SPAN_DASH}{b}" for a, b in spans)


def _text(value) -> str:
    return "" if value is None else str(value)
