"""An embedded font subset's naming table, once (#12: bytes per kit).

A TrueType font's 'name' table holds its strings (copyright, family,
trademark, licence and its address...) once for each platform that
reads them; the shipped DejaVu fonts carry them for the Macintosh
platform (ID 1) and again for Windows (ID 3), the licence text included,
about 7.8 KB of each subset a kit embeds.  A PDF reader takes a font's
name from the PDF's font dictionary, not from this table (ISO 32000-1:2008,
9.6.3 and 9.9), so the subsets keep the Windows records, every notice
among them, and leave out the Macintosh copies: about 8 KB less a kit.

The file is rebuilt as the OpenType specification lays it out ("The
OpenType Font File": the table directory, each table on a four-byte
boundary with its checksum, and the 'head' table's ``checkSumAdjustment``
set so that the whole font sums to 0xB1B0AFBA); every table but 'name'
keeps its bytes.
"""

from __future__ import annotations

import struct

import numpy as np

#: The platform whose name records a subset leaves out (OpenType 'name':
#: platform ID 1, Macintosh).
DROPPED_PLATFORM = 1
#: What the whole font's checksum is made to be (OpenType, 'head').
_FONT_CHECKSUM = 0xB1B0AFBA


def without_mac_names(font: bytes) -> bytes:
    """``font`` (a TrueType file) without its Macintosh name records; the
    font as it was where it has none, or where its tables are not as
    this reads them (a 'name' table of format 1)."""
    tables = font_tables(font)
    name = tables.get(b"name")
    if name is None or b"head" not in tables:
        return font
    trimmed = _name_without(name, DROPPED_PLATFORM)
    if trimmed is None or trimmed == name:
        return font
    tables[b"name"] = trimmed
    return font_file(font[:4], tables)


def font_tables(font: bytes) -> dict[bytes, bytes]:
    """The font's tables by tag, in the directory's order."""
    count = struct.unpack_from(">H", font, 4)[0]
    out = {}
    for k in range(count):
        tag, _, offset, length = struct.unpack_from(">4sIII", font, 12 + 16 * k)
        out[tag] = font[offset:offset + length]
    return out


def _name_without(table: bytes, platform: int) -> bytes | None:
    """A 'name' table (format 0) without the records of ``platform``, its
    strings stored anew; None for another format."""
    fmt, count, start = struct.unpack_from(">HHH", table, 0)
    if fmt != 0:
        return None
    records, strings = [], bytearray()
    for k in range(count):
        rec = struct.unpack_from(">HHHHHH", table, 6 + 12 * k)
        if rec[0] == platform:
            continue
        length, offset = rec[4], rec[5]
        records.append(struct.pack(">HHHHHH", *rec[:4], length, len(strings)))
        strings += table[start + offset:start + offset + length]
    head = struct.pack(">HHH", 0, len(records), 6 + 12 * len(records))
    return head + b"".join(records) + bytes(strings)


def _checksum(data: bytes) -> int:
    """The OpenType table checksum: the sum of its big-endian 32-bit
    words, the last padded with zeros."""
    padded = data + b"\0" * (-len(data) % 4)
    # summed as unsigned 64-bit integers: exact for any font under 16 GB
    return int(np.frombuffer(padded, dtype=">u4").sum(dtype=np.uint64)) & 0xFFFFFFFF


def font_file(version: bytes, tables: dict[bytes, bytes]) -> bytes:
    """A font file of ``tables`` (in their order), each on a four-byte
    boundary, with 'head''s checkSumAdjustment made anew."""
    count = len(tables)
    power = 1 << (count.bit_length() - 1)
    directory = version + struct.pack(">HHHH", count, power * 16, power.bit_length() - 1, count * 16 - power * 16)
    head = tables[b"head"]
    tables = {**tables, b"head": head[:8] + b"\0\0\0\0" + head[12:]}
    offset = len(directory) + 16 * count
    records, body = [], bytearray()
    for tag, data in tables.items():
        if tag == b"head":
            head_at = offset + len(body)
        records.append(struct.pack(">4sIII", tag, _checksum(data), offset + len(body), len(data)))
        body += data + b"\0" * (-len(data) % 4)
    font = bytearray(directory + b"".join(records) + body)
    struct.pack_into(">I", font, head_at + 8, (_FONT_CHECKSUM - _checksum(bytes(font))) & 0xFFFFFFFF)
    return bytes(font)
