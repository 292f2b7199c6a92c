"""The page's language: the browser's preference among the shipped ten.

``Accept-Language`` is read as RFC 9110, section 12.5.4 defines it: a list
of language ranges, each with an optional quality ``q`` from 0 to 1
(default 1), the most preferred first when the weights tie; a range
matches a shipped template by its primary subtag (``pt-BR`` -> ``pt``),
as RFC 4647's lookup does once the subtags are removed.  English when
nothing matches.
"""

from __future__ import annotations

#: Longest header read; a browser's is far shorter.
MAX_HEADER_CHARS = 500
DEFAULT = "en"


def _quality(params: list[str]) -> float:
    for p in params:
        name, _, value = p.strip().partition("=")
        if name.strip().lower() == "q":
            try:
                q = float(value)
            except ValueError:
                return 0.0
            return q if 0.0 <= q <= 1.0 else 0.0
    return 1.0


def negotiate(header: str | None, available: list[str]) -> str:
    """The shipped language the ``Accept-Language`` header prefers most."""
    if not header:
        return DEFAULT
    ranked = []
    for position, item in enumerate(header[:MAX_HEADER_CHARS].split(",")):
        tag, *params = item.strip().split(";")
        primary = tag.strip().lower().split("-")[0]
        q = _quality(params)
        if q > 0 and primary in available:
            ranked.append((-q, position, primary))
    return min(ranked)[2] if ranked else DEFAULT


def choose(query: str | None, header: str | None, available: list[str]) -> str:
    """The page's language: ``?lang=`` when it names a shipped one (the
    page's own switch), else the browser's preference."""
    if query in available:
        return query
    return negotiate(header, available)
