"""A kit as printed: built from recipe text, laid out, rendered to PDF and
read back with pypdf, for the tests that inspect the pages themselves."""

from __future__ import annotations

import io
from functools import cached_property

import pypdf

from kitgen.kit import build_kit
from kitgen.recipe.load import parse_recipe_text
from kitgen.render.pdf import build_pdf

from .pdf_paths import read_page


def page_text(reader, k: int = 0) -> str:
    """Page ``k``'s text in one line, bullets left out (pypdf reads them in
    among the lines)."""
    return " ".join(reader.pages[k].extract_text().replace("\u2022", " ").split())


class PrintedKit:
    def __init__(self, recipe_text: str):
        self.kit = build_kit(parse_recipe_text(recipe_text))
        self.pages, self.pdf = build_pdf(self.kit)   # the instructions on as many pages as they need
        self.reader = pypdf.PdfReader(io.BytesIO(self.pdf))

    def text(self, k: int = 0) -> str:
        return page_text(self.reader, k)

    @cached_property
    def read(self):
        """Each page's (paths, texts), as pdf_paths.read_page reads them."""
        return [read_page(self.reader, p) for p in self.reader.pages]
