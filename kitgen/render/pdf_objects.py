"""The objects of a PDF that kitgen's reportlab canvas wrote, read and
written again by hand (#12).

A class set lays each pupil's name over the school's shared PDF
(:mod:`kitgen.render.pdf_owner`) and copies a school's pages into the
print files (:mod:`kitgen.batch.printfiles`).  A general PDF library
reads every object of the shared file and writes every object again, for
each pupil; but kitgen's PDFs all come from one writer (reportlab,
through :mod:`kitgen.render.pdf_canvas`), whose files have a known
shape: a classic cross-reference table (ISO 32000-1:2008, 7.5.4) with
one subsection, objects in the order of their numbers, direct
``/Length`` values, dictionaries written out inline.  So a file is read
here from its table and trailer alone (:class:`Written`); an object is
copied as its bytes, its references ``N 0 R`` renumbered in its
dictionary and its stream data left as it is (:class:`Copier`); and new
objects go after an existing file as an incremental update (7.5.6) or
make a new file, each with its own cross-reference section
(:class:`Out`).
"""

from __future__ import annotations

import re
from functools import lru_cache

_REF = re.compile(rb"(\d+) 0 R\b")
_BRACKET = re.compile(rb"<<|>>|\[|\]")
_VALUE_END = re.compile(rb"\s*(/|>>)")
_NAME = re.compile(rb"/[^\s/<>\[\]()]*")
_ENTRY = re.compile(rb"(\d{10}) (\d{5}) ([nf])")
#: The header of a new file: the version and a comment of four bytes
#: above 127, so that a transfer program treats the file as binary (7.5.2).
HEADER = b"%PDF-1.4\n%\xe2\xe3\xcf\xd3\n"


class Written:
    """A PDF as reportlab writes it: where each object stands, and the
    trailer's ``/Root``, ``/Info``, ``/ID`` (its text) and ``/Size``."""

    def __init__(self, data: bytes):
        self.data = data
        self.xref_at = int(data[data.rindex(b"startxref") + 9:].split()[0])
        table, trailer = data[self.xref_at:].split(b"trailer", 1)
        first, count = (int(v) for v in table.split(b"\n")[1].split())
        entries = _ENTRY.findall(table)
        if len(entries) != count:
            raise ValueError("a cross-reference table of more than one subsection")
        offsets = {first + k: int(at) for k, (at, _, kind) in enumerate(entries) if kind == b"n"}
        self.trailer = trailer[:trailer.index(b"startxref")]
        self.root, self.info = self._ref(b"/Root"), self._ref(b"/Info")
        self.size = int(re.search(rb"/Size (\d+)", self.trailer).group(1))
        found = re.search(rb"/ID\s*(\[[^\]]*\])", self.trailer)
        self.id_text = found.group(1) if found else b""
        ends = sorted(offsets.values()) + [self.xref_at]
        after = dict(zip(ends, ends[1:]))
        self._spans = {n: (at, after[at]) for n, at in offsets.items()}
        self._pages: list[int] | None = None

    def _ref(self, key: bytes) -> int | None:
        found = re.search(re.escape(key) + rb" (\d+) 0 R", self.trailer)
        return int(found.group(1)) if found else None

    def body(self, number: int) -> bytes:
        """The object's bytes between ``N 0 obj`` and ``endobj``."""
        start, end = self._spans[number]
        text = self.data[start:end]
        text = text[text.index(b"obj") + 3:].rstrip()
        if not text.endswith(b"endobj"):
            raise ValueError(f"object {number} does not end with endobj")
        return text[:-6].strip()

    def head(self, number: int) -> bytes:
        """The object's dictionary (or whole value), without stream data."""
        return _head(self.body(number))

    def pages(self) -> list[int]:
        """The page objects' numbers in page order (reportlab's page tree
        is one ``/Pages`` node holding every page)."""
        if self._pages is None:
            tree = self.head(int(value(self.head(self.root), b"/Pages").split()[0]))
            self._pages = [int(n) for n in _REF.findall(value(tree, b"/Kids"))]
            if int(value(tree, b"/Count")) != len(self._pages):
                raise ValueError("a page tree of more than one level")
        return self._pages


def _head(body: bytes) -> bytes:
    if not body.endswith(b"endstream"):
        return body
    return body[:body.index(b"\nstream\n")]


def value(head: bytes, key: bytes) -> bytes:
    """The value of ``key`` in the dictionary ``head``, at the key's first
    occurrence in the text (kitgen asks only for keys that occur once):
    a dictionary or an array as written, brackets matched, a name, or
    else up to the next key or the dictionary's end (a number, a
    reference); empty if the key is not there."""
    start = _after(head, key)
    if start is None:
        return b""
    if head.startswith((b"<<", b"["), start):
        return head[start:_matched(head, start)]
    if head.startswith(b"/", start):
        return _NAME.match(head, start).group()
    return head[start:_VALUE_END.search(head, start).start()]


def _after(head: bytes, key: bytes) -> int | None:
    """Where the value of ``key`` starts in ``head``, if it is there."""
    at = _key_pattern(key).search(head)
    return at.end() if at else None


@lru_cache(maxsize=64)   # the few keys kitgen reads, each compiled once (a class set reads them for every page)
def _key_pattern(key: bytes):
    return re.compile(re.escape(key) + rb"(?![A-Za-z0-9])\s*")


def _matched(text: bytes, start: int) -> int:
    """The end of the dictionary or array that opens at ``start``."""
    depth = 0
    for bracket in _BRACKET.finditer(text, start):
        depth += 1 if bracket.group() in (b"<<", b"[") else -1
        if depth == 0:
            return bracket.end()
    raise ValueError("a dictionary or array without its end")


def with_value(head: bytes, key: bytes, new: bytes) -> bytes:
    """The dictionary ``head`` with ``key``'s value replaced by ``new``
    (the key added at the end if it is not there)."""
    old = value(head, key)
    if not old:
        return head[:head.rindex(b">>")] + key + b" " + new + b"\n>>"
    at = _after(head, key)
    return head[:at] + new + head[at + len(old):]


class Out:
    """Objects written after ``start`` (a whole PDF, for an incremental
    update, or :data:`HEADER` for a new file), numbered from ``size``
    on, then a cross-reference section and trailer (:meth:`finish`)."""

    def __init__(self, start: bytes, size: int):
        self.parts, self.at, self.size = [start], len(start), size
        self.offsets: dict[int, int] = {}

    def number(self) -> int:
        """A new object number, for an object put later."""
        self.size += 1
        return self.size - 1

    def put(self, number: int, body: bytes) -> int:
        """Write object ``number`` (new or, in an update, replacing one)."""
        chunk = b"%d 0 obj\n%s\nendobj\n" % (number, body)
        self.offsets[number] = self.at
        self.parts.append(chunk)
        self.at += len(chunk)
        return number

    def add(self, body: bytes) -> int:
        return self.put(self.number(), body)

    def stream(self, data: bytes) -> int:
        """A new stream object holding ``data`` as it is."""
        return self.add(b"<<\n/Length %d\n>>\nstream\n%sendstream" % (len(data), data))

    def finish(self, trailer: bytes) -> bytes:
        """The file: the objects, their cross-reference section and a
        trailer holding ``/Size`` and ``trailer``'s entries.  The section
        starts with object 0, the head of the free list, in an update too
        (as it may): readers that take a section not starting at 0 for a
        misnumbered one (pypdf) then read it as it is."""
        numbers = [0] + sorted(self.offsets)
        rows = [b"xref\n"]
        k = 0
        while k < len(numbers):
            j = k
            while j + 1 < len(numbers) and numbers[j + 1] == numbers[j] + 1:
                j += 1
            rows.append(b"%d %d\n" % (numbers[k], j - k + 1))
            rows += [b"0000000000 65535 f \n" if n == 0 else b"%010d 00000 n \n" % self.offsets[n]
                     for n in numbers[k:j + 1]]
            k = j + 1
        rows.append(b"trailer\n<<\n/Size %d %s\n>>\nstartxref\n%d\n%%%%EOF\n" % (self.size, trailer, self.at))
        return b"".join(self.parts + rows)


class Copier:
    """Objects of one :class:`Written` file copied into an :class:`Out`,
    each once, with every object it refers to (its dictionary's
    references renumbered)."""

    def __init__(self, source: Written, out: Out):
        self.source, self.out = source, out
        self.numbers: dict[int, int] = {}

    def ref(self, number: int) -> int:
        """The new number of the source's object ``number``, copied (with
        all it refers to) the first time it is asked for."""
        if number in self.numbers:
            return self.numbers[number]
        todo, found = [number], []
        while todo:
            n = todo.pop()
            if n in self.numbers:
                continue
            self.numbers[n] = self.out.number()
            found.append(n)
            todo += [int(m) for m in _REF.findall(self.source.head(n))]
        for n in found:
            self.out.put(self.numbers[n], self.renumbered(self.source.body(n)))
        return self.numbers[number]

    def renumbered(self, body: bytes) -> bytes:
        """``body`` (an object of the source, or a piece of one) with its
        dictionary's references renumbered, copying what they refer to;
        stream data untouched."""
        head = _head(body)
        return _REF.sub(lambda m: b"%d 0 R" % self.ref(int(m.group(1))), head) + body[len(head):]
