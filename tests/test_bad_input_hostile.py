"""Hostile recipes and language files: refused, each with its own message,
before they can exhaust the machine (the structural attacks before YAML
builds a single value); no code runs and no network is touched.

The attacks are the well-known ones against YAML loaders: the "billion
laughs" alias expansion (named after the XML entity attack of the same
shape), deep nesting that exhausts a recursive composer, tags that make
an unsafe loader construct Python objects (PyYAML's documented
``!!python/object/apply``), huge files and huge numbers.
"""

from __future__ import annotations

import os

import socket
from pathlib import Path

import pytest
import yaml

from kitgen.errors import UserError
from kitgen.recipe.load import MAX_DEPTH, MAX_EVENTS, MAX_LIST_ITEMS, MAX_RECIPE_BYTES, load_recipe

BILLION_LAUGHS = """\
a: &a ["lol","lol","lol","lol","lol","lol","lol","lol","lol"]
b: &b [*a,*a,*a,*a,*a,*a,*a,*a,*a]
c: &c [*b,*b,*b,*b,*b,*b,*b,*b,*b]
d: &d [*c,*c,*c,*c,*c,*c,*c,*c,*c]
e: &e [*d,*d,*d,*d,*d,*d,*d,*d,*d]
f: &f [*e,*e,*e,*e,*e,*e,*e,*e,*e]
g: &g [*f,*f,*f,*f,*f,*f,*f,*f,*f]
h: &h [*g,*g,*g,*g,*g,*g,*g,*g,*g]
i: &i [*h,*h,*h,*h,*h,*h,*h,*h,*h]
latitude: 40
title: *i
"""


def refused(tmp_path: Path, text, *needles, before_building: bool = False) -> str:
    """Load the recipe ``text``; assert a one-line UserError holding every
    needle.  With ``before_building``, the refusal must come before YAML
    builds a single value (the safe loader and the composer are made to
    fail if called): the attack never reaches the code it targets."""
    p = tmp_path / "hostile.yaml"
    if isinstance(text, bytes):
        p.write_bytes(text)
    else:
        p.write_text(text, encoding="utf-8")
    with pytest.MonkeyPatch.context() as mp:
        if before_building:
            def never(*a, **k):
                raise AssertionError("a hostile document reached the YAML loader")
            mp.setattr(yaml, "safe_load", never)
            mp.setattr(yaml, "compose", never)
        with pytest.raises(UserError) as err:
            load_recipe(p)
    msg = str(err.value)
    assert "\n" not in msg and len(msg) < 700, msg[:200]
    for needle in needles:
        assert needle in msg, (needle, msg)
    return msg


# -- YAML structure --------------------------------------------------------------------------

def test_billion_laughs(tmp_path):
    refused(tmp_path, BILLION_LAUGHS, "line 1", "YAML anchors and aliases (& and *) are not allowed in a recipe",
            before_building=True)


def test_a_lone_alias_or_anchor(tmp_path):
    refused(tmp_path, "latitude: &x 40\n", "anchors and aliases", before_building=True)
    refused(tmp_path, "latitude: *x\n", "line 1")


def test_deep_nesting_list(tmp_path):
    refused(tmp_path, "latitude: 40\ntitle: " + "[" * 100_000 + "]" * 100_000 + "\n", "line 2",
            f"nested deeper than {MAX_DEPTH} levels", before_building=True)


def test_deep_nesting_mapping(tmp_path):
    text = "latitude: 40\n" + "".join("  " * k + f"k{k}:\n" for k in range(40)) + "  " * 40 + "v: 1\n"
    refused(tmp_path, text, f"nested deeper than {MAX_DEPTH} levels", before_building=True)


def test_huge_file(tmp_path):
    refused(tmp_path, "latitude: 40\n# " + "x" * MAX_RECIPE_BYTES + "\n", "larger than 256 KiB; is it a recipe?",
            before_building=True)


def test_device_without_end(tmp_path):
    """A recipe path that never ends (``/dev/zero``) is not read at all: a
    device is no regular file (#11)."""
    with pytest.raises(UserError) as err:
        load_recipe("/dev/zero")
    assert "is not a regular file" in str(err.value)


def test_a_large_regular_file_is_read_no_further_than_the_limit(tmp_path):
    big = tmp_path / "big.yaml"
    with open(big, "wb") as fh:
        fh.truncate(10 * 1024 * 1024)   # a sparse file of zeros
    with pytest.raises(UserError) as err:
        load_recipe(big)
    assert "larger than 256 KiB" in str(err.value)


def test_a_fifo_is_refused_without_waiting(tmp_path):
    """A FIFO with no writer would block open(2) and read(2) for ever
    (POSIX fifo(7)); it is opened without blocking and refused."""
    fifo = tmp_path / "r.yaml"
    os.mkfifo(fifo)
    with pytest.raises(UserError) as err:
        load_recipe(fifo)
    assert "is not a regular file" in str(err.value)


@pytest.mark.parametrize("encoding, named", [("utf-32", "UTF-32"), ("utf-32-le", "UTF-32"), ("utf-32-be", "UTF-32"),
                                             ("utf-16", "UTF-16"), ("utf-16-le", "UTF-16"), ("utf-16-be", "UTF-16")])
def test_other_unicode_encodings_are_named(tmp_path, encoding, named):
    """With or without a byte-order mark (The Unicode Standard, 23.8), the
    encoding is named as it is: UTF-32 is not UTF-16."""
    p = tmp_path / "r.yaml"
    p.write_bytes("latitude: 52.2\nepoch: 2027\ntitle: Larkspur Valley School\n".encode(encoding))
    with pytest.raises(UserError) as err:
        load_recipe(p)
    assert f"the file is {named} text" in str(err.value)


def test_too_many_values(tmp_path):
    refused(tmp_path, "latitude: 40\nstars: [" + ", ".join(["Vega"] * (MAX_EVENTS + 10)) + "]\n",
            f"more than {MAX_EVENTS} values; is it a recipe?", before_building=True)


def test_huge_number(tmp_path):
    refused(tmp_path, "latitude: 40\nepoch: 1" + "0" * 6000 + "\n", "a value cannot be read",
            "write plain numbers")


def test_huge_hexadecimal_number(tmp_path):
    refused(tmp_path, "latitude: 40\ndiameter_mm: 0x" + "f" * 6000 + "\n", "'diameter_mm' is far outside 80 to 600")


def test_merge_key(tmp_path):
    refused(tmp_path, "<<: {latitude: 40}\n", "the YAML merge key '<<' is not allowed", before_building=True)


def test_several_documents(tmp_path):
    refused(tmp_path, "latitude: 40\n---\nlatitude: 41\n", "invalid YAML at line 2, column 1",
            "but found another document")


# -- no code runs -----------------------------------------------------------------------------

@pytest.mark.parametrize("payload", [
    '!!python/object/apply:os.system ["touch {flag}"]',
    '!!python/object/apply:subprocess.check_output [["touch", "{flag}"]]',
    '!!python/object/new:os.system ["touch {flag}"]',
    '!!python/name:os.system',
    '!!python/module:os',
    '!<tag:yaml.org,2002:python/object/apply:os.system> ["touch {flag}"]',
    '!!binary aGVsbG8=',
    '!ruby/object:Gem::Installer {}',
    '!custom 40',
])
def test_tags_are_refused_and_nothing_runs(tmp_path, payload):
    flag = tmp_path / "PWNED"
    msg = refused(tmp_path, f"latitude: 40\ntitle: {payload.replace('{flag}', str(flag))}\n", "line 2", "the YAML tag",
                  "is not allowed in a recipe; remove it", before_building=True)
    assert not flag.exists()
    assert "python" in msg or "binary" in msg or "ruby" in msg or "custom" in msg


def test_tag_in_a_key_position(tmp_path):
    flag = tmp_path / "PWNED"
    refused(tmp_path, f'? !!python/object/apply:os.system ["touch {flag}"]\n: 1\nlatitude: 40\n', "the YAML tag")
    assert not flag.exists()


def test_core_tags_are_allowed(tmp_path):
    p = tmp_path / "r.yaml"
    p.write_text("latitude: !!float 40\ntitle: !!str 2027\nepoch: !!int 2027\n")
    r = load_recipe(p)
    assert (r.latitude_deg, r.title, r.epoch) == (40.0, "2027", 2027)


# -- limits on lists, stars, steps, sizes, text ---------------------------------------------

def test_long_list(tmp_path):
    refused(tmp_path, "latitude: 40\nparts: [" + ", ".join(["plate"] * (MAX_LIST_ITEMS + 1)) + "]\n",
            f"'parts': the list has {MAX_LIST_ITEMS + 1} items; at most {MAX_LIST_ITEMS}")


def test_too_many_stars(tmp_path):
    refused(tmp_path, "latitude: 40\nstars: [" + ", ".join(["Vega"] * 201) + "]\n",
            "at most 200 stars, got 201", "{brightest: N}")


def test_brightest_too_many(tmp_path):
    refused(tmp_path, "latitude: 40\nstars: {brightest: 100000}\n", "'brightest' takes a whole number from 1 to 200")


def test_star_name_that_is_a_paragraph(tmp_path):
    refused(tmp_path, "latitude: 40\nstars: ['" + "Vega " * 2000 + "']\n", "is no star name",
            "`kitgen stars` lists them")


@pytest.mark.parametrize("key, value, needle", [
    ("altitude_step_deg", "1e-300", "'altitude_step_deg' is 1e-300, outside 1 to 30"),   # YAML 1.2: a number
    ("altitude_step_deg", "1.0e-300", "'altitude_step_deg' is 1e-300, outside 1 to 30"),
    ("altitude_step_deg", "1.0e+300", "outside 1 to 30"),
    ("azimuth_step_deg", "0.000001", "'azimuth_step_deg' is 1e-06, outside 5 to 90"),
    ("azimuth_step_deg", "-15", "outside 5 to 90"),
    ("diameter_mm", "1.0e+12", "'diameter_mm' is 1e+12, outside 80 to 600"),
    ("diameter_mm", "0", "'diameter_mm' is 0, outside 80 to 600"),
    ("epoch", "99999999999999999999999", "'epoch' is 99999999999999999999999, outside 1900 to 2100"),
    ("altitude_step_deg", "30.0000001", "'altitude_step_deg' is 30.0000001, outside 1 to 30"),  # never "is 30"
])
def test_extreme_steps_and_sizes(tmp_path, key, value, needle):
    refused(tmp_path, f"latitude: 40\n{key}: {value}\n", needle)


def test_long_title(tmp_path):
    refused(tmp_path, "latitude: 40\ntitle: '" + "W" * 5000 + "'\n", "'title' is 5000 characters long; at most 120")


@pytest.mark.parametrize("escape, code", [("\\0", "U+0000"), ("\\e", "U+001B"), ("\\x07", "U+0007")])
def test_control_characters_in_text(tmp_path, escape, code):
    refused(tmp_path, f'latitude: 40\ntitle: "Hilltop{escape}Club"\n', f"'title' contains the control character {code}")


@pytest.mark.parametrize("escape, code", [("\\ud800", "U+D800"), ("\\udd1e", "U+DD1E"), ("\\ud834x", "U+D834")])
def test_half_a_surrogate_pair_is_called_so(tmp_path, escape, code):
    """A lone UTF-16 surrogate (Unicode 15.0, section 3.8, D71 to D75) is not
    a control character, and the message says what it is."""
    refused(tmp_path, f'latitude: 40\ntitle: "Hilltop{escape}Club"\n',
            f"'title' contains {code}, half of a character's UTF-16 pair without its other half")


def test_an_escaped_surrogate_pair_is_its_character():
    """RFC 8259, section 7: the G clef, U+1D11E, escaped as JSON escapes it,
    "\\uD834\\uDD1E"; YAML 1.2, a superset of JSON, reads the pair as
    that one character, in values and keys alike."""
    from kitgen.recipe.load import safe_yaml

    tree = safe_yaml('owner: "\\uD834\\uDD1E"\n"k\\uD834\\uDD1E": "a\\uD834\\uDD1Eb\\uD834"\n')
    assert tree["owner"] == "\U0001D11E"
    assert tree["k\U0001D11E"] == "a\U0001D11Eb\ud834"   # a lone half after it stays as it is


def test_a_plates_place_is_named_in_its_refusal(tmp_path):
    """A place too long, or with a control character, in the list form of
    ``plates:`` is said as that plate's 'place', not as 'plates'."""
    refused(tmp_path, "plates:\n  - latitude: 52\n    place: '" + "W" * 130 + "'\n",
            "'plates': plate 1: 'place' is 130 characters long; at most 120")
    refused(tmp_path, 'plates:\n  - 50\n  - {latitude: 52, place: "Ash\\x07Hill"}\n',
            "'plates': plate 2: 'place' contains the control character U+0007")


def test_very_long_unknown_key_is_quoted_briefly(tmp_path):
    # (YAML itself limits a plain key to 1024 characters.)
    msg = refused(tmp_path, "latitude: 40\n" + "k" * 1000 + ": 1\n", "unknown key 'kkkk")
    assert "k" * 60 not in msg and "...' ; " not in msg


# -- the language file named by a recipe -----------------------------------------------------

@pytest.fixture
def language_file_key():
    from kitgen.recipe.schema import KEYS_BY_NAME
    if "language_file" not in KEYS_BY_NAME:
        pytest.skip("this build has no 'language_file' recipe key")


@pytest.mark.parametrize("content, needle", [
    (b'language: ca\ntitle: !!python/object/apply:os.system ["touch {flag}"]\n', "the YAML tag"),
    (BILLION_LAUGHS.encode(), "anchors and aliases"),
    (b"language: ca\nx: " + b"[" * 50_000 + b"]" * 50_000 + b"\n", "nested deeper than"),
    (b"language: ca\nn: 1" + b"0" * 6000 + b"\n", "a value cannot be read"),
], ids=["python-tag", "billion-laughs", "deep-nesting", "huge-number"])
def test_hostile_language_file(tmp_path, language_file_key, content, needle):
    flag = tmp_path / "PWNED"
    (tmp_path / "lang.yaml").write_bytes(content.replace(b"{flag}", str(flag).encode()))
    refused(tmp_path, "latitude: 40\nlanguage_file: lang.yaml\n", "'language_file'", needle)
    assert not flag.exists()


def test_language_file_that_never_ends(tmp_path, language_file_key):
    refused(tmp_path, "latitude: 40\nlanguage_file: /dev/zero\n", "'language_file'", "is not a regular file")


# -- no network ------------------------------------------------------------------------------

def test_a_whole_build_touches_no_network(tmp_path, monkeypatch):
    """Every way out to the network fails loudly during a full build, PDF,
    JSON and SVG: none is used."""
    from kitgen.cli import main

    used = []

    def no_network(*a, **k):
        used.append(a)
        raise AssertionError("network access")

    for name in ("connect", "connect_ex", "sendto", "sendmsg", "bind"):
        monkeypatch.setattr(socket.socket, name, no_network)
    monkeypatch.setattr(socket, "create_connection", no_network)
    monkeypatch.setattr(socket, "getaddrinfo", no_network)
    monkeypatch.setattr(socket, "gethostbyname", no_network)
    (tmp_path / "r.yaml").write_text("latitude: 40\nepoch: 2027\ntitle: Hilltop Science Club\n"
                                     "stars: [Sirius, Vega, Polaris]\n")
    assert main(["build", str(tmp_path / "r.yaml"), "-o", str(tmp_path / "kit.pdf")]) == 0
    assert main(["geometry", str(tmp_path / "r.yaml"), "-o", str(tmp_path / "g.json")]) == 0
    assert main(["geometry", str(tmp_path / "r.yaml"), "--format", "svg", "-o", str(tmp_path / "svg")]) == 0
    assert used == []
