"""The speed benchmark's floor draws what a kit's PDF draws (#12).

``benchmarks/batch_speed.py`` measures kitgen against bare reportlab
drawing each kit's pages from primitives recorded through kitgen's own
PDF backend.  A floor that missed some of a kit's drawing (a new kind of
page furniture, say) would make kitgen look slower than it is; one that
drew some twice, faster.  Reference: the text that pypdf (an independent
PDF reader) extracts from kitgen's own PDF of the same kit, page by page.
"""

from __future__ import annotations

import importlib.util
import io
from collections import Counter
from pathlib import Path

import pypdf

from kitgen.kit import build_kit
from kitgen.recipe.load import validate_recipe
from kitgen.render.pdf import build_pdf

BENCHMARK = Path(__file__).resolve().parents[1] / "benchmarks" / "batch_speed.py"


def _benchmark():
    spec = importlib.util.spec_from_file_location("batch_speed", BENCHMARK)
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


def _letters(text: str) -> Counter:
    """The characters of ``text`` but white space (pypdf reads a no-break
    space as a space, and sets spaces and line ends of its own)."""
    return Counter(ch for ch in text if not ch.isspace())


def _recorded_letters(page: dict) -> Counter:
    out = Counter()
    for item in page["items"]:
        if "text" in item:
            out += _letters(item["text"])
        for el in item.get("elements", ()):
            if el["shape"] == "text":
                out += _letters(el["text"])
    return out


def test_the_floor_draws_every_page_and_every_word_of_the_kit():
    kit = build_kit(validate_recipe({"latitude": -33.9, "language": "fr", "owner": "Élodie",
                                     "title": "Club des Étoiles du Port"}))
    recorded = _benchmark()._page_primitives(kit)
    _, pdf = build_pdf(kit)
    pages = pypdf.PdfReader(io.BytesIO(pdf)).pages
    assert len(recorded) == len(pages)
    for k, (page, read) in enumerate(zip(recorded, pages)):
        assert _recorded_letters(page) == _letters(read.extract_text()), f"page {k + 1}"
    # the parts' own lines are there too: every element of every part, as
    # often as the pages place the part (a tiled part's pieces may repeat some)
    drawn = sum(len(item["elements"]) for page in recorded for item in page["items"] if "elements" in item)
    assert drawn >= sum(len(part.elements) for part in kit.parts)
