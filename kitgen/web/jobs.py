"""The builds the page asks for, run in the pool's worker processes.

Each job is a top-level function of plain values (a validated recipe, the
page's language code), so that it can be sent to another process, and it
answers with plain values: bytes, text, or one of two exceptions that
carry text only.  A mistake in the input found while building (a named
star the rete cannot carry, say) is :class:`Refused`, said in the page's
language with the recipe validation's own message; anything else is
:class:`Internal`, with the traceback for the server's log.

Builds run in processes rather than threads: the font and PDF libraries
keep caches that are not safe to fill from two threads at once, and two
processes build two kits at the same time on two cores.
"""

from __future__ import annotations

import base64
import io
import multiprocessing
import re
import traceback
import zipfile
from dataclasses import replace

from ..collect import collect_rarely
from ..errors import UserError
from ..kit import build_kit
from ..recipe.load import validate_recipe
from ..render.json_export import render_json
from ..render.pdf import build_pdf
from ..render.preview import render_previews
from ..render.svg import render_svg_files
from ..words.templates import load_words
from .form import field_of, recipe_yaml

#: Resolution of the PDF's page previews, dots per inch.
PAGES_DPI = 40.0


class Refused(Exception):
    """A mistake in the input, found while building: the field it is
    about (``""`` for the whole form) and the message in the page's
    language."""

    def __init__(self, field: str, text: str):
        super().__init__(field, text)
        self.field, self.text = field, text


class Internal(Exception):
    """kitgen's own fault: the exception's kind, its text and the
    traceback, as text."""

    def __init__(self, kind: str, detail: str, trace: str):
        super().__init__(kind, detail, trace)
        self.kind, self.detail, self.trace = kind, detail, trace


def _guarded(job, language: str, *args):
    try:
        return job(*args)
    except UserError as exc:
        raise Refused(field_of(exc) or "", exc.text(load_words(language))) from None
    except Exception as exc:
        raise Internal(type(exc).__name__, str(exc), traceback.format_exc()) from None


def _inline_svg(data: bytes) -> str:
    """An SVG document as markup to put in the page (no XML declaration)."""
    text = data.decode("utf-8")
    return text[text.index("<svg"):]


def _preview(recipe, language: str) -> dict:
    small = replace(recipe, parts=tuple(p for p in ("plate", "rete") if p in recipe.parts) or recipe.parts)
    kit = build_kit(small)
    svgs: dict[str, str] = {}
    for name, data in render_svg_files(kit).items():  # plate.svg, or plate-1.svg... for several plates
        svgs.setdefault(re.match(r"[a-z_]*", name).group(), _inline_svg(data))
    words = load_words(language)
    return {"svgs": svgs, "notes": [note.text(words) for note in kit.notes]}


def _pages(recipe) -> list[str]:
    pdf = build_pdf(build_kit(recipe))[1]
    return ["data:image/png;base64," + base64.b64encode(png).decode("ascii")
            for png in render_previews(pdf, PAGES_DPI)]


def _file(recipe, fmt: str, tree: dict, heading: str) -> bytes:
    if fmt == "yaml":
        return recipe_yaml(tree, heading)
    kit = build_kit(recipe)
    if fmt == "pdf":
        return build_pdf(kit)[1]
    if fmt == "json":
        return render_json(kit)
    out = io.BytesIO()
    with zipfile.ZipFile(out, "w", zipfile.ZIP_DEFLATED) as z:
        for name, data in render_svg_files(kit).items():
            z.writestr(name, data)
    return out.getvalue()


def preview(recipe, language: str) -> dict:
    """The plate and rete as SVG markup, and the build's notes."""
    return _guarded(_preview, language, recipe, language)


def pages(recipe, language: str) -> list[str]:
    """Each page of the PDF as a PNG ``data:`` URL."""
    return _guarded(_pages, language, recipe)


def download(recipe, language: str, fmt: str, tree: dict, heading: str) -> bytes:
    """The file of format ``fmt``: pdf, svg (a zip), json or yaml."""
    return _guarded(_file, language, recipe, fmt, tree, heading)


def warm() -> None:
    """Build one small preview, so that a new worker has loaded kitgen,
    its fonts and its catalogue before the first teacher asks; then, in a
    worker process (never the server's own, whose requests' garbage the
    collector keeps clearing), leave all that out of the collector's
    passes and make them rare, for the worker's life (kitgen.collect, as
    a class set's workers do)."""
    preview(validate_recipe({"latitude": 45.0, "epoch": 2026}), "en")
    if multiprocessing.parent_process() is not None:
        collect_rarely()
