"""Build one kit of a set, in a worker process or in the calling one (#12).

A worker is long-lived: :func:`warm` (in the main process before the
workers fork, or a spawned pool's initializer) registers the fonts and
reads their glyph bounds and the star catalogue once, a language's
templates are read by its first kit, and every kit after that is built
with those caches warm.  The kit
goes through the very entry points ``kitgen build`` uses
(:func:`kitgen.kit.build_kit`, :func:`kitgen.layout.pages.layout_kit` and
:func:`kitgen.render.pdf.render_layers`, as :func:`kitgen.render.pdf.build_pdf`), so its
PDF is byte for byte the one a single build of the same recipe writes.
Identical recipes in one worker (a kits list without owners, say) are
built once (:func:`_kit_pdf`).  A worker may also draw another's school's
plates (:func:`draw_for`), which that worker's kits then take as drawn,
and draws a school's stamps with its first kit (:class:`KitJob` ``stamps``).
"""

from __future__ import annotations

import re
import sys
import traceback
from dataclasses import dataclass, field, replace
from functools import lru_cache

from ..errors import Message, UserError, one_line, speaking
from ..kit import build_kit, draw_plates, school_of
from ..plan.resolve import plan_words
from ..render import pdf_text
from ..layout.instructions import answer_key_page
from ..layout.pages import layout_kit
from ..render.pdf import render_layers
from ..sky import stars
from ..words import fonts
from ..words.templates import available_languages, load_words
from .stamp import stamps_pdf

try:
    import resource
except ImportError:   # Windows: no peak memory to tell
    resource = None


@dataclass(frozen=True)
class KitJob:
    """One kit of a class set for a worker to build: its number in the set,
    its recipe, and what else the worker needs for it."""

    number: int
    recipe: object          # kitgen.recipe.schema.Recipe
    #: Parts of the kit's school drawn by another worker (:func:`draw_for`),
    #: by id, or None.
    drawn: dict | None = field(default=None, compare=False)
    #: The set's language, which a failed kit's reason is said in (a
    #: shipped template's code), or None for English.
    speak: str | None = None
    #: With a school's first kit: the school's stamps, (kit number, name)
    #: of each of its kits in order, for the worker to draw
    #: (kitgen.batch.stamp.stamps_pdf).
    stamps: tuple = ()
    #: ``--debug``: a fault of kitgen's own comes back with its traceback.
    debug: bool = False


@dataclass(frozen=True)
class KitResult:
    """What a worker sends back: the kit's PDF, the material of each page
    (:func:`page_stocks`), the sheet's
    margin (where the print files' stamp goes), or the reason it failed."""

    number: int
    pdf: bytes = b""
    materials: tuple[str, ...] = ()
    margin_mm: float = 0.0
    error: str = ""
    internal: bool = False
    peak_rss_kib: int = 0
    #: For a named kit on its school's shared pages: the shared PDF, the
    #: pages that carry the name and the name's PDF (kitgen.render.pdf_owner),
    #: so that the print files share the school's pages among its pupils.
    shared: bytes = b""
    owner_pages: tuple[int, ...] = ()
    overlay: bytes = b""
    #: The school's stamps (kitgen.batch.stamp.stamps_pdf), with its first kit.
    stamps: bytes = b""
    #: What the build thinned or left out to keep every scale legible, a
    #: line a note in the kit's language (as ``kitgen build`` says them).
    notes: tuple[str, ...] = ()
    #: The traceback of an internal fault, with ``--debug`` (KitJob.debug).
    trace: str = ""


def warm() -> None:
    """Fonts (registered, their metrics and glyph bounds read) and the
    catalogue loaded once (before a set's workers fork, and a spawned
    worker's initializer); a language is loaded when a kit first needs
    it, in the process that builds the kit, and kept."""
    pdf_text.register_fonts()
    for face in fonts.DEJAVU.values():
        fonts.preload(face)
    stars.catalogue()


def draw_for(recipe) -> dict | None:
    """The plates of ``recipe``'s school drawn for another worker, by id
    (kitgen.kit.draw_plates); None when drawing them fails, which the
    school's own worker then meets and reports itself."""
    try:
        return draw_plates(recipe)
    except Exception:
        return None


def build_one(job: KitJob) -> KitResult:
    """Build the kit of ``job``, then its school's stamps if it asks for
    them; a failure is its one-line reason."""
    result = _built(job)
    return replace(result, stamps=_stamps(job)) if job.stamps else result


def _built(job: KitJob) -> KitResult:
    try:
        with speaking(job.recipe.language, job.recipe.language_file or None):
            if job.drawn:   # the school's kit without a name, with the parts drawn elsewhere, kept
                build_kit(school_of(job.recipe), job.drawn)
            kit, layers, materials, margin = _kit_pdf(job.recipe)
            notes = tuple(one_line(note.text(kit.words)) for note in kit.notes)
        return KitResult(job.number, layers.pdf, materials, margin, peak_rss_kib=_peak_rss_kib(),
                         shared=layers.shared, owner_pages=layers.indices, overlay=layers.overlay, notes=notes)
    except UserError as exc:
        return KitResult(job.number, error=one_line(exc.text(_speak(job))), peak_rss_kib=_peak_rss_kib())
    except Exception as exc:  # an internal fault of this kit: the others go on
        text = Message("errors.internal", kind=type(exc).__name__, detail=exc).text(_speak(job))
        return KitResult(job.number, error=one_line(without_program(text)), internal=True,
                         peak_rss_kib=_peak_rss_kib(), trace=traceback.format_exc() if job.debug else "")


def without_program(text: str) -> str:
    """A message without the program's name it starts with ("kitgen: ",
    "kitgen : " in French), to stand as a kit's reason in the line that
    names the program already ("kitgen: kit 3 not built: ...")."""
    return _PROGRAM.sub("", text, count=1)


_PROGRAM = re.compile(r"^kitgen\s*:\s*")


def _stamps(job: KitJob) -> bytes:
    """The stamps the job asks for (its school's, with its first kit), in
    the school's words, which its kit has loaded; none where they cannot
    be drawn here (the main process then draws them, and meets the fault
    itself)."""
    try:
        return stamps_pdf(plan_words(job.recipe), job.stamps)
    except Exception:
        return b""


def _speak(job: KitJob):
    """The words a failed kit's reason is said in."""
    return load_words(job.speak) if job.speak in available_languages() else None


@lru_cache(maxsize=2)   # a kit and its geometry are megabytes: keep only the last two
def _kit_pdf(recipe):
    kit = build_kit(recipe)
    pages = layout_kit(kit)   # as build_pdf does: the same bytes
    layers = render_layers(kit, pages)
    materials = page_stocks(kit, pages)
    return kit, layers, materials, pages[0].sheet.margin_mm


def page_stocks(kit, pages) -> tuple[str, ...]:
    """The stock of each of the kit's pages (kitgen.batch.printfiles.MATERIALS),
    as the kit's own printing steps name them (kitgen.layout.instructions):
    the worksheet's answer key (for the teacher), the two sides of a
    duplex mater, and otherwise by the page's kind."""
    key = answer_key_page(kit, pages)
    return tuple("answers" if p is key else "duplex" if p.duplex else _STOCKS.get(p.kind, "card") for p in pages)


#: The stock of a page of each kind (kitgen.layout.pages).
_STOCKS = {"instructions": "paper", "film": "film"}


def _peak_rss_kib() -> int:
    """This process's peak resident memory (KiB; macOS reports bytes), or
    0 where the system does not tell (Windows)."""
    if resource is None:
        return 0
    peak = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss
    return peak // 1024 if sys.platform == "darwin" else peak
