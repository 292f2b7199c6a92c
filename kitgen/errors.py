"""Errors that reach the user as one line, in the user's language.

:class:`UserError` is a mistake in the input (exit status 2); anything else
that escapes is an internal fault (exit status 1).  A message is never
English text in the code: it is a key of the ``errors`` section of the
language templates (``templates/LANG.yaml``) and the values for that
entry's ``{placeholders}``, kept as a :class:`Message` and put into words
only when shown.  ``str(exc)`` gives the English text; :meth:`Message.text`
gives it in any language.  A value may itself be a :class:`Message` (a
hint, a fragment), a :class:`Number` (written as the language writes
numbers) or a list, put into words in the same language.  The build's
notes (``notes`` section, :attr:`kitgen.kit.Kit.notes`) are messages too.

:func:`one_line` makes any message safe to print as a single line on a
terminal, and :func:`shown` quotes a value from the input briefly for a
message.
"""

from __future__ import annotations

import contextlib
import unicodedata

from .template_files import shipped_table

EXIT_OK = 0
EXIT_INTERNAL = 1
EXIT_USER = 2
EXIT_INTERRUPTED = 130  # 128 + SIGINT, the shells' convention
EXIT_TERMINATED = 143   # 128 + SIGTERM

#: Longest message printed, in characters.
MAX_MESSAGE_CHARS = 600
#: Longest quoted input value inside a message, in characters.
MAX_SHOWN_CHARS = 60


class Number:
    """A number a message says in its language's way (the CLDR decimal
    sign, the recipe's choice of digits: :meth:`Words.number
    <kitgen.words.templates.Words.number>`), with ``decimals`` decimals, or
    with as few as show it whole (at most 3) for ``None``.  Numbers the
    user typed stay as typed (plain text values); numbers kitgen works out,
    such as the sizes in the build's notes, are :class:`Number`."""

    def __init__(self, value: float, decimals: int | None = None):
        self.value = float(value)
        if decimals is None:
            tolerance = 1e-6 * max(1.0, abs(self.value))
            decimals = next((d for d in range(3) if abs(round(self.value, d) - self.value) <= tolerance), 3)
        self.decimals = int(decimals)

    def text(self, words=None) -> str:
        if words is not None:
            return words.number(self.value, self.decimals)
        return f"{self.value:.{self.decimals}f}"

    def __repr__(self) -> str:
        return f"Number({self.value!r}, {self.decimals})"


class CountryName:
    """A country, given by its ISO 3166-1 code, that a message names in its
    language: the Unicode CLDR's name for it (through Babel), "Spain" in
    English and "Espagne" in French; the code itself where CLDR has no
    name or the language is a user's own that CLDR does not know."""

    def __init__(self, code: str):
        self.code = code

    def text(self, words=None) -> str:
        language = getattr(words, "language", None) or "en"
        try:
            from babel import Locale

            return Locale.parse(language.replace("-", "_")).territories.get(self.code, self.code)   # pt-BR as BCP 47
        except Exception:   # a language CLDR does not know: the code
            return self.code

    def __repr__(self) -> str:
        return f"CountryName({self.code!r})"


class Message:
    """One entry of the templates' ``errors`` or ``notes`` section
    (``key``, such as ``"errors.unknown_key"``) and the values of its
    placeholders.

    Values are file names, key names and numbers as the user wrote them
    (numbers are shown as written in a recipe, with a decimal point),
    :class:`Number` objects (numbers kitgen works out, written as the
    language writes them), other :class:`Message` objects (hints and
    fragments, so that no English is glued on in the code),
    :class:`KeyedError` objects, or lists, joined with the language's
    ``page.list_separator``."""

    def __init__(self, key: str, /, **values):
        self.key = key
        self.values = values

    def text(self, words=None) -> str:
        """The message in the language of ``words`` (a
        :class:`kitgen.words.templates.Words`), or in English for ``None``;
        English wherever that language cannot say it."""
        if words is not None:
            try:
                said = _say(self.key, self.values, words)
            except (KeyError, ValueError, IndexError, AttributeError):
                said = None
            if said is not None:
                return said
        try:
            said = _say(self.key, self.values, None)
        except (KeyError, ValueError, IndexError, AttributeError):
            said = None  # a message is always shown, even a faulty one
        if said is None:  # no such entry: the key itself, and the values
            said = f"{self.key} {self.values!r}" if self.values else self.key
        return said

    def __str__(self) -> str:
        return self.text()

    def __repr__(self) -> str:
        return f"Message({self.key!r}, **{self.values!r})"


def _english(key: str) -> str | None:
    value = shipped_table("en").get(key)
    return value if isinstance(value, str) else None


def _say(key: str, values: dict, words) -> str | None:
    """``key``'s template in ``words``'s language (English for ``None``)
    with the values put in, or ``None`` when there is no such template."""
    template = _english(key) if words is None else words.template(key)
    if template is None:
        return None
    said = {name: _value_text(v, words) for name, v in values.items()}
    return template.format_map(said)


def _value_text(value, words) -> str:
    if isinstance(value, (Message, KeyedError, Number, CountryName)):
        return value.text(words)
    if isinstance(value, (list, tuple)):
        sep = (words.template("page.list_separator") if words is not None else None) \
            or _english("page.list_separator") or ", "
        return sep.join(_value_text(v, words) for v in value)
    return str(value)


class KeyedError(Exception):
    """An exception whose message is a :class:`Message`: raise it as
    ``KeyedError("errors.some_key", name=value, ...)``.

    ``language`` (a shipped template's code) or ``language_file`` (the path
    of a checked language file) say in which language the user asked to be
    spoken to, once the input got far enough to tell; see
    :func:`speaking`."""

    def __init__(self, key: str, /, **values):
        super().__init__(key)
        self.message = Message(key, **values)
        self.language: str | None = None
        self.language_file: str | None = None

    @property
    def key(self) -> str:
        return self.message.key

    @property
    def values(self) -> dict:
        return self.message.values

    def text(self, words=None) -> str:
        return self.message.text(words)

    def __str__(self) -> str:
        return self.message.text()


class UserError(KeyedError):
    """A problem the user can fix; its message is printed as one line."""

    @classmethod
    def of(cls, error: KeyedError, **values) -> "UserError":
        """A :class:`UserError` with the message of ``error`` (a
        :class:`KeyedError` of a lower layer), some values replaced."""
        out = cls(error.key, **{**error.values, **values})
        out.language, out.language_file = error.language, error.language_file
        return out


@contextlib.contextmanager
def speaking(language: str | None = None, language_file: str | None = None):
    """Within the block, a :class:`UserError` that does not yet know the
    user's language learns it: a shipped template's code, or the path of a
    checked language file (which wins).  Either may be ``None``, or a
    callable giving ``(language, language_file)`` when an error happens."""
    try:
        yield
    except UserError as exc:
        if exc.language is None and exc.language_file is None:
            if callable(language):
                try:
                    language, language_file = language()
                except Exception:  # telling the language never hides the error
                    language, language_file = None, None
            exc.language, exc.language_file = language, language_file
        raise


def typed(value) -> str:
    """A number from the input as the user wrote it, for a message: the
    shortest text that reads back as the same number, so that 30.0000001
    is never shown as 30 beside a bound of 30; an integer of many digits
    shortened as :func:`shown` shortens any value."""
    if isinstance(value, float):
        short = f"{value:g}"
        return short if float(short) == value else repr(value)
    if isinstance(value, int) and not isinstance(value, bool) and abs(value) < 10 ** 20:
        return str(value)
    return shown(value)


def bound(value: float, side: str, decimals: int = 2) -> str:
    """A bound for a message, rounded outward to at most ``decimals``
    decimals (``side`` "low" rounds up, "high" down), so a value shown
    beside it and refused is never on the bound's allowed side."""
    import math

    scale = 10 ** decimals
    x = math.ceil(value * scale - 1e-9) if side == "low" else math.floor(value * scale + 1e-9)
    return f"{x / scale:.{decimals}f}".rstrip("0").rstrip(".")


def short_of(value: float, needed: float) -> str:
    """A quantity that falls short of ``needed``, for a message saying so:
    rounded down, with as few decimals (up to 3) as keep it below the
    ``needed`` shown beside it (never "120 ... at least 120")."""
    import math

    for decimals in range(4):
        scale = 10 ** decimals
        text = f"{math.floor(value * scale) / scale:.{decimals}f}"
        if float(text) < needed:
            return text
    return f"{value:.3f}"


def beyond(value: float, low: float, high: float) -> str:
    """A number kitgen worked out that lies outside ``low`` to ``high``,
    for a message saying so: as written where it has at most
    :data:`WRITTEN_DECIMALS` decimals (151.5, not 152, which the user did
    not write), else with as few decimals as still show it outside
    (-90.00027777, from 90 0 1 S, as -90.0003; 90.0000001 as 90.0000001)."""
    written = repr(float(value)).removesuffix(".0")
    if "e" not in written and len(written.partition(".")[2]) <= WRITTEN_DECIMALS:
        return written
    for decimals in range(12):
        text = f"{value:.{decimals}f}"
        if not low <= float(text) <= high:
            return text
    return repr(float(value))


#: A number with at most this many decimals is shown as written.
WRITTEN_DECIMALS = 3


def few(items, most: int = 4) -> list:
    """At most ``most`` of ``items`` for a message, then how many more
    (``errors.and_more``): a long list comes after the message's reason and
    never pushes it out of the line."""
    items = list(items)
    if len(items) <= most + 1:
        return items
    return items[:most] + [Message("errors.and_more", count=len(items) - most)]


def _visible(ch: str) -> str:
    if ch in "\t\n\r\v\f":
        return " "
    if ch in _ISOLATES:
        return ""
    cat = unicodedata.category(ch)
    # Control, surrogate, private-use and the bidirectional and other
    # format characters could reorder or hide what the terminal shows.
    if cat in ("Cc", "Cs", "Co") or (cat == "Cf" and ch not in "\u200c\u200d"):
        return f"\\u{ord(ch):04x}" if ord(ch) > 0xFF else f"\\x{ord(ch):02x}"
    return ch


#: The bidirectional isolates (LRI, RLI, FSI, PDI; UAX #9, 2.4), which the
#: templates put round numbers in right-to-left words: they only group
#: text for a bidi display and hide or reorder nothing outside the group,
#: so a line drops them rather than showing them as codes.
_ISOLATES = "\u2066\u2067\u2068\u2069"


def one_line(message: str) -> str:
    """``message`` as one printable line: line breaks become spaces,
    control and bidirectional characters are shown escaped (the isolates
    dropped), and the whole is cut to :data:`MAX_MESSAGE_CHARS`."""
    text = " ".join("".join(_visible(c) for c in str(message)).split())
    if len(text) > MAX_MESSAGE_CHARS:
        text = text[: MAX_MESSAGE_CHARS - 3] + "..."
    return text


def shown(value) -> str:
    """A short quotation of an input value for a message: its ``repr``,
    cut to :data:`MAX_SHOWN_CHARS` characters."""
    try:
        text = repr(value)
    except Exception:  # a value whose repr fails is still reported
        text = f"<{type(value).__name__}>"
    if len(text) > MAX_SHOWN_CHARS:
        text = text[: MAX_SHOWN_CHARS - 3] + "..."
    return text
