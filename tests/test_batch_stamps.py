"""Where a class set's stamps are drawn (#12): the worker that builds a
school's first kit draws the school's stamps too, and they are the very
bytes the main process draws when no worker brought them back (a school
whose first kit failed).  The stamps' text itself, read back with pypdf
from the print files, is checked in test_batch.py against the shipped
template ``batch.stamp``."""

from __future__ import annotations

import io

from pypdf import PdfReader

from kitgen.batch.setfile import SetKit
from kitgen.batch.stamp import SchoolStamps, stamps_pdf
from kitgen.batch import work
from kitgen.batch.work import KitJob, build_one
from kitgen.errors import Message, UserError
from kitgen.recipe.load import validate_recipe
from kitgen.words.templates import load_words

# an invented school and pupils
SCHOOL = {"latitude": 46.2, "language": "fr", "epoch": 2027, "sheet": "a4", "title": "Collège du Lac Gris",
          "diameter_mm": 80}
PUPILS = ("Élise Marron", "Jonas Pétrel", "Inès Vallon")


def _set_kits():
    return [SetKit(k, Message("errors.none"), {}, 1, validate_recipe({**SCHOOL, "owner": name}))
            for k, name in enumerate(PUPILS, 1)]


def test_the_first_kits_worker_draws_the_schools_stamps_as_the_main_process_would():
    kits = _set_kits()
    stamps = SchoolStamps(kits)
    lists = stamps.lists()
    assert lists == {1: ((1, PUPILS[0]), (2, PUPILS[1]), (3, PUPILS[2]))}
    result = build_one(KitJob(1, kits[0].recipe, stamps=lists[1]))
    assert not result.error and result.stamps
    # a later pupil's job asks for none, and its worker draws none
    later = build_one(KitJob(2, kits[1].recipe))
    assert not later.error and later.stamps == b""
    # the same bytes as drawn in the main process, from the same words
    assert result.stamps == stamps_pdf(load_words("fr"), list(lists[1]))
    drawn_here = SchoolStamps(kits).of(3)
    assert drawn_here == (result.stamps, 2)
    # given back, they are the ones the print files use
    stamps.give(1, result.stamps)
    assert stamps.of(2) == (result.stamps, 1)
    # a page a pupil, each with the shipped template's words (templates/fr.yaml: batch.stamp)
    pages = PdfReader(io.BytesIO(result.stamps)).pages
    template = load_words("fr")
    assert [p.extract_text().strip() for p in pages] == [
        template("batch.stamp", number=template.number(k), name=name) for k, name in enumerate(PUPILS, 1)]


def test_stamps_come_back_with_a_failed_kit_and_are_drawn_by_the_main_process_where_they_fail(monkeypatch):
    kits = _set_kits()
    lists = SchoolStamps(kits).lists()
    expected = stamps_pdf(load_words("fr"), list(lists[1]))

    def fails(recipe):
        raise UserError(Message("errors.none"))

    # the school's first kit fails in its worker: its school's stamps still come back
    monkeypatch.setattr(work, "_kit_pdf", fails)
    result = build_one(KitJob(1, kits[0].recipe, stamps=lists[1]))
    assert result.error and result.stamps == expected
    monkeypatch.undo()

    # the stamps cannot be drawn in the worker: none come back, the kit is
    # built, and the main process draws them itself, the same bytes
    def cannot(words, stamps):
        raise OSError("no room")

    monkeypatch.setattr(work, "stamps_pdf", cannot)
    result = build_one(KitJob(1, kits[0].recipe, stamps=lists[1]))
    assert not result.error and result.stamps == b""
    stamps = SchoolStamps(kits)
    stamps.give(1, result.stamps)
    assert stamps.of(2) == (expected, 1)
