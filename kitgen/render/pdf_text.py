"""All text drawing of the PDF: fonts, shaping, direction, paragraphs.

Each line is set once by :func:`kitgen.words.shaping.set_line` (font runs
in visual order, HarfBuzz glyphs for Arabic, Devanagari and every
right-to-left run) and drawn here run by run: plain runs as reportlab
strings, shaped runs as reportlab ``ShapedStr`` built from those very
glyphs, so the printed glyphs and advances are the measured ones.  A line
with shaped or right-to-left runs is wrapped in a marked-content span whose
``/ActualText`` is the line in logical order (ISO 32000-1:2008, 14.9.4), so
a reader that copies or searches the text gets the words, not the glyphs.

Paragraphs (the instructions page) are broken at spaces into lines that
fit the measured width, aligned to the left for left-to-right languages
and to the right for right-to-left ones, with their bullets on the
starting side.
"""

from __future__ import annotations

import hashlib
import math
import zlib
from fnmatch import fnmatch
from weakref import WeakKeyDictionary

from reportlab import rl_config
from reportlab.lib.rl_accel import fp_str
from reportlab.lib.units import mm
from reportlab.pdfbase import pdfmetrics
from reportlab.pdfbase.pdfdoc import PDFName
from reportlab.pdfbase.ttfonts import ShapedStr, ShapeData, TTEncoding, TTFont, makeToUnicodeCMap

from ..layout.paragraphs import width_pt
from ..words import fonts
from ..words.shaping import Line, Run, set_line
from .face_reading import WholeTableFace
from .font_hints import without_hinting
from .font_names import without_mac_names


def register_fonts(faces=None) -> None:
    """Register shipped fonts with reportlab, each once per process:
    ``faces``, or the DejaVu faces that every page starts with.  A
    script's own font (Arabic, Devanagari) is registered when a line first
    needs it (:func:`draw_line`), so a kit pays for reading only the fonts
    its language uses (#12)."""
    for face in fonts.DEJAVU.values() if faces is None else faces:
        _register(face)


def _register(face) -> None:
    if face.name in _REGISTERED or face.name in pdfmetrics.getRegisteredFontNames():
        _REGISTERED.add(face.name)
        return
    with fonts.font_path(face) as path:
        ttf = TaggedTTFont(face.name, str(path))
    ttf.hbFont()  # installs reportlab's registry of glyphs that no character maps to
    pdfmetrics.registerFont(ttf)
    _REGISTERED.add(face.name)


_REGISTERED: set[str] = set()


def subset_tag(font_name: str, subset, taken: set) -> str:
    """A subset's tag: six upper-case letters drawn from the SHA-256 of the
    font's name and the subset's characters, so different subsets get
    different tags even across kits merged into one file (a class set's
    print files), and the same kit the same bytes; a tag already ``taken``
    in the document moves on to the next."""
    digest = hashlib.sha256((font_name + ":" + ",".join(map(str, subset))).encode()).digest()
    k = int.from_bytes(digest[:8], "big") % 26 ** 6
    while True:
        letters, n = [], k
        for _ in range(6):
            n, r = divmod(n, 26)
            letters.append(chr(ord("A") + r))
        tag = "".join(reversed(letters))
        if tag not in taken:
            return tag
        k = (k + 1) % 26 ** 6


class TaggedTTFont(TTFont):
    """A TrueType font whose embedded subsets each get a tag of their own.
    ISO 32000-1:2008, 9.6.4 (font subsets): the tag is six upper-case
    letters, and "different subsets in the same PDF file shall have
    different tags"; reportlab numbers the subsets of each font from
    AAAAAA, so two fonts (regular and bold), or two kits merged into one
    file, would share a tag.  Here each tag comes from the subset itself
    (:func:`subset_tag`).  A subset holds only the characters the document
    draws: reportlab's ``ttfAsciiReadable`` put every printable ASCII
    character of the font in its first subset as well, drawn or not, so
    that a content stream's codes read as ASCII; that was the whole Latin
    alphabet in each Latin face of an Arabic or Hindi kit, a fifth of its
    bytes (#12: 163 KB to 140 KB in Arabic, 162 KB to 132 KB in Hindi).
    Its subsets' font files, and those files and character maps
    compressed, are kept for the next document (:class:`_KeptSubsets`,
    :class:`_KeptFlate`)."""

    def __init__(self, name: str, filename: str):
        # reportlab's TTFont.__init__ (5.1) but for the face, which reads
        # its character tables whole (:mod:`.face_reading`; #12).
        self.fontName = name
        self.face = WholeTableFace(filename)
        self.encoding = TTEncoding()
        self.state = WeakKeyDictionary()
        self._asciiReadable = False   # the characters drawn, no others
        self.shapable = not any(fnmatch(name, pattern) for pattern in rl_config.unShapedFontGlob)
        self.face.makeSubset = _KeptSubsets(self.face.makeSubset)

    def addObjects(self, doc):
        state = self.state[doc]   # reportlab drops it once the objects are made
        subsets = [list(s) for s in state.subsets]
        names = [self.getSubsetInternalName(n, doc)[1:] for n in range(len(subsets))]
        super().addObjects(doc)
        fonts_dict = doc.idToObject["BasicFonts"].dict
        for name, subset in zip(names, subsets):
            font = fonts_dict[name]
            old = font.BaseFont
            taken = doc.__dict__.setdefault("_kitgen_subset_tags", set())
            tag = subset_tag(old[7:], subset, taken)
            taken.add(tag)
            new = tag + old[6:]
            font.BaseFont = new
            doc.idToObject["fontDescriptor:" + old].dict["FontName"] = PDFName(new)
            doc.idToObject["toUnicodeCMap:" + old].content = makeToUnicodeCMap(new, subset)
            if doc.compression:
                for key in ("toUnicodeCMap:" + old, f"fontFile:{self.face.filename}({old})"):
                    doc.idToObject[key].filters = [_KEPT_FLATE]


class _KeptSubsets:
    """A font face's ``makeSubset``, each subset's font file made once,
    its naming table's Macintosh copies (:mod:`.font_names`) and its
    hinting (:mod:`.font_hints`) left out, and kept (the last few): a class set's kits of one language embed the
    same subsets again and again (#12).  A subset is its characters in
    code order, and a character, once the face maps it to a glyph (a
    private-use one included), keeps that glyph, so the same characters
    make the same file."""

    MOST = 16

    def __init__(self, make):
        self.make, self.kept = make, {}

    def __call__(self, subset) -> bytes:
        key = tuple(subset)
        made = self.kept.get(key)
        if made is None:
            if len(self.kept) >= self.MOST:
                self.kept.clear()
            made = self.kept[key] = without_hinting(without_mac_names(self.make(subset)))
        return made


class _KeptFlate:
    """reportlab's Flate filter (``pdfdoc.PDFZCompress``: the content, as
    UTF-8 if text, through ``zlib.compress`` at its default level), each
    content compressed once and kept (the last few): for the font files
    and character maps, which a class set's kits of one language repeat
    (#12)."""

    pdfname = "FlateDecode"
    MOST = 64

    def __init__(self):
        self.kept: dict[bytes, bytes] = {}

    def encode(self, content) -> bytes:
        if isinstance(content, str):
            content = content.encode("utf8")
        packed = self.kept.get(content)
        if packed is None:
            if len(self.kept) >= self.MOST:
                self.kept.clear()
            packed = self.kept[content] = zlib.compress(content)
        return packed

    def decode(self, encoded: bytes) -> bytes:
        return zlib.decompress(encoded)


_KEPT_FLATE = _KeptFlate()


def _shaped_str(run: Run) -> tuple[ShapedStr, dict]:
    """The run's HarfBuzz glyphs as a reportlab ShapedStr: each glyph by a
    character reportlab maps to it (a private-use one for glyphs, such as
    contextual forms, that no character maps to), with its advance and
    offsets in thousandths of the size; with it, the store of its
    operators (:func:`_shaped_operators`).  Kept per run and font object:
    the private-use characters, once given, stay the font's (#12).  Found
    by the run's identity, else by its value: a run of another line with
    the same face, text and glyphs (a comma, a word that recurs) makes
    the same string, and shares its operators."""
    ttf = pdfmetrics.getFont(run.face.name)
    kept = _SHAPED.get(id(run))
    if kept is not None and kept[0] is run and kept[1] is ttf:
        return kept[2], kept[3]
    if len(_SHAPED) >= _SHAPED_MOST:
        _SHAPED.clear()
        _SHAPED_BY_VALUE.clear()
    same = _SHAPED_BY_VALUE.get(run)
    if same is not None and same[1] is ttf:
        _SHAPED[id(run)] = (run, ttf, same[2], same[3])
        return same[2], same[3]
    face = ttf.face
    chars, data = [], []
    for g in run.glyphs:
        mapped = face.glyphToChar.get(g.gid)
        if mapped:
            uchar = mapped[0]
        else:
            uchar = _private_char(ttf, g.gid, fonts.glyph_advance_em(run.face, g.gid) * 1000.0)
        chars.append(chr(uchar))
        data.append(ShapeData(g.cluster, g.x_advance_em * 1000.0, 0, g.x_offset_em * 1000.0,
                              g.y_offset_em * 1000.0, face.charWidths[uchar]))
    shaped = ShapedStr("".join(chars), shapeData=data)
    _SHAPED[id(run)] = _SHAPED_BY_VALUE[run] = (run, ttf, shaped, {})
    return shaped, _SHAPED[id(run)][3]


def _private_char(ttf, gid: int, advance: float) -> int:
    """The private-use character (Unicode's Private Use Area, from U+E000)
    that stands for glyph ``gid`` of the font ``ttf``, which no character
    maps to (a contextual form, a conjunct), made the font's with the
    glyph's ``advance`` (thousandths of the size) where it is not yet.
    Each such glyph has its own character, fixed by the font alone: the
    font's unmapped glyphs in glyph order take the private-use characters
    in order, those the font maps itself passed over
    (:func:`_private_chars`).  reportlab's own registry hands them out in
    the order a process first draws the glyphs, so a class set's pupil
    whose name held a conjunct that an earlier pupil's did not got other
    characters, and so other font subsets and other bytes, than a lone
    ``kitgen build`` of the same recipe (#12)."""
    uchar = _private_chars(ttf)[gid]
    face = ttf.face
    if uchar not in face.charToGlyph:
        face.charToGlyph[uchar] = gid
        face.glyphToChar.setdefault(gid, []).append(uchar)
        face.charWidths[uchar] = advance
    return uchar


def _private_chars(ttf) -> dict[int, int]:
    """{glyph id: its private-use character} for every glyph of ``ttf``
    that its character map leaves out (worked out before any is added,
    once per font)."""
    table = _PRIVATE.get(ttf.fontName)
    if table is None or table[0] is not ttf:
        face = ttf.face
        codes = (c for c in range(PRIVATE_USE_FIRST, PRIVATE_USE_END) if c not in face.charToGlyph)
        table = _PRIVATE[ttf.fontName] = (ttf, {gid: next(codes) for gid in range(face.numGlyphs)
                                                if gid not in face.glyphToChar})
    return table[1]


#: The Private Use Area of Unicode's Basic Multilingual Plane: its first
#: character and the one after its last (U+E000 to U+F8FF).
PRIVATE_USE_FIRST, PRIVATE_USE_END = 0xE000, 0xF900
#: Each font's table of :func:`_private_chars`, by font name, with the font.
_PRIVATE: dict[str, tuple] = {}


#: Shaped runs as reportlab strings, by the run's identity: (run, font,
#: string, {(size, pieces, subset names): operators}); and the same by
#: the run's value.
_SHAPED: dict[int, tuple] = {}
_SHAPED_BY_VALUE: dict[Run, tuple] = {}
_SHAPED_MOST = 20_000


def _actual_text(text: str) -> str:
    return "<FEFF" + text.encode("utf-16-be").hex().upper() + ">"


def _run_operators(c, run: Run, size_pt: float) -> str:
    """A run's text operators between its text matrix and ``T*``, as
    reportlab's text object formats them for the canvas's font (its
    subsets' fonts and codes, its glyphs' positions).  Kept in the
    document per run (by identity) and size: a character's code in its
    subset, once given, stays, so a run written again is written the
    same (#12)."""
    kept = c._doc.__dict__.setdefault("_kitgen_run_operators", {})
    key = (id(run), size_pt)
    got = kept.get(key)
    if got is not None and got[0] is run:
        return got[1]
    code = _shaped_operators(c, run, size_pt) if run.shaped else _plain_operators(c, run.text, size_pt)
    kept[key] = (run, code)
    return code


def _shaped_operators(c, run: Run, size_pt: float) -> str:
    """A shaped run's operators as the text object's ``_formatText``
    writes them.  What it writes follows from the run's glyphs, the size,
    and the pieces of the run in the document's subsets with their codes
    and font names; so the operators are kept with the run for each of
    those pieces and names, and a later document (a class set's next
    kit) that gives the run the same codes reuses them (#12).  The pieces
    are found and the subsets' names asked for here as ``_formatText``
    does, so that the document's codes and fonts are the same."""
    shaped, codes = _shaped_str(run)
    font = pdfmetrics.getFont(c._fontname)
    doc = c._doc
    pieces = tuple(_split(font, shaped, doc))
    key = (size_pt, pieces, tuple(font.getSubsetInternalName(subset, doc) for subset, _ in pieces))
    code = codes.get(key)
    if code is None:
        code = codes[key] = c.beginText()._formatText(shaped)
    return code


def _split(font, text: str, doc) -> list[tuple[int, bytes]]:
    """``font.splitString(text, doc)``: the pieces of ``text`` in one
    subset each, with their codes.  Where every character already has
    its code and all are in the first subset (a kit's few hundred
    characters mostly are), the codes are read in one pass
    (``str.translate`` by the font's assignments) rather than character
    by character (#12); else reportlab gives them."""
    state = font.state.get(doc)
    if state is not None and text:
        assignments = state.assignments
        if all(map(assignments.__contains__, map(ord, text))):
            codes = text.translate(assignments)
            if max(codes) < "\u0100":
                return [(0, codes.encode("latin-1"))]
    return font.splitString(text, doc)


def _plain_operators(c, text: str, size_pt: float) -> str:
    """Plain text's operators, as reportlab's text object writes them for
    a TrueType font (``PDFTextObject._formatText``): each piece of the
    text in one subset of the font after that subset's font, size and
    leading (1.2 times the size, the canvas's ``setFont``)."""
    font = pdfmetrics.getFont(c._fontname)
    doc = c._doc
    size = f"{fp_str(size_pt)} Tf {fp_str(size_pt * 1.2)} TL"
    code, current = [], -1
    for subset, chunk in _split(font, text, doc):
        if subset != current:
            code.append(f"{font.getSubsetInternalName(subset, doc)} {size}")
            current = subset
        code.append(f"({c._escape(chunk)}) Tj")
    return " ".join(code)


def draw_line(c, line: Line, x_pt: float, baseline_pt: float, size_pt: float) -> None:
    """Draw a set line with its left end at ``x_pt`` on ``baseline_pt``:
    each run as one text object, as the canvas's ``drawString`` writes it."""
    code = c._code
    tagged = line.rtl or any(r.shaped for r in line.runs)
    if tagged:
        code.append(f"/Span <</ActualText {_actual_text(line.text)}>> BDC")
    x = x_pt
    for run in line.runs:
        _register(run.face)
        c.setFont(run.face.name, size_pt)
        code.append("BT 1 0 0 1 %s Tm %s T* ET" % (fp_str(x, baseline_pt), _run_operators(c, run, size_pt)))
        x += run.width_em * size_pt
    if tagged:
        code.append("EMC")


def draw_text(c, x_mm: float, y_mm: float, string: str, size_pt: float, words, style: str = "label",
              anchor: str = "middle", angle_deg: float = 0.0) -> None:
    """One line whose ink's middle sits on (x, y) mm, turned ``angle_deg``
    counter-clockwise; ``anchor`` says where (x, y) falls along the line as
    it is seen: its left end (``start``), middle or right end (``end``)."""
    line = set_line(string, words.script, style, words.rtl)
    w = line.width_em * size_pt
    code = c._code
    # The canvas's saveState, translate, rotate, setFillGray(0) and
    # restoreState, written as they write them (#12); of the state they
    # keep, only the font is changed in between (draw_line), so only the
    # font is put back.
    font = (c._fontname, c._fontsize, c._leading)
    code.append("q")
    code.append(_placed_cm(x_mm * mm, y_mm * mm, angle_deg))
    code.append("0 g")
    x0 = {"start": 0.0, "middle": -w / 2, "end": -w}[anchor]
    draw_line(c, line, x0, -line.ink_middle_em * size_pt, size_pt)
    code.append("Q")
    c._fontname, c._fontsize, c._leading = font


def _placed_cm(x_pt: float, y_pt: float, angle_deg: float) -> str:
    """The ``cm`` operator the canvas writes for ``translate(x, y)`` then,
    if ``angle_deg``, ``rotate(angle_deg)`` after a ``q``: the rotation
    is folded into the translation's operator, from that operator's
    numbers as written (``Canvas.transform``)."""
    moved = "1 0 0 1 %s cm" % fp_str(x_pt, y_pt)
    if not angle_deg:
        return moved
    a, b = math.cos(angle_deg * math.pi / 180), math.sin(angle_deg * math.pi / 180)
    c, d, e, f = -b, a, 0, 0
    a0, b0, c0, d0, e0, f0 = map(float, moved.split()[:6])
    return "%s cm" % fp_str(a0 * a + c0 * b, b0 * a + d0 * b, a0 * c + c0 * d, b0 * c + d0 * d,
                            a0 * e + c0 * f + e0, b0 * e + d0 * f + f0)


def draw_at_baseline(c, x_pt: float, y_pt: float, string: str, size_pt: float, words, style: str = "body",
                     align: str = "left") -> float:
    """One line on the baseline ``y_pt``, its left end (``align='left'``) or
    right end (``'right'``) at ``x_pt``; returns its width (pt)."""
    line = set_line(string, words.script, style, words.rtl)
    w = line.width_em * size_pt
    draw_line(c, line, x_pt - w if align == "right" else x_pt, y_pt, size_pt)
    return w


def fitted_pt(string: str, size_pt: float, width_limit_pt: float, words, style: str = "body",
              min_pt: float = 5.0) -> float:
    """The size, at most ``size_pt`` and at least ``min_pt``, at which
    ``string`` fits ``width_limit_pt``."""
    w = width_pt(string, size_pt, words, style)
    return size_pt if w <= width_limit_pt else max(min_pt, size_pt * width_limit_pt / w)
