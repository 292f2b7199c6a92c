"""The web application: one page, its form and its downloads (Starlette).

Routes (every POST needs the CSRF token, :mod:`.guard`):

- ``GET /`` the page, in the browser's language or ``?lang=``;
- ``POST /kit`` the form itself: ``format`` = ``pdf``, ``svg``, ``json`` or
  ``yaml`` answers with the file as an attachment, ``preview`` with the
  page and the plate and rete drawn in it (the page works without
  JavaScript); a mistake gives the page again, each message beside its
  field, with status 422;
- ``POST /api/preview`` and ``POST /api/pages`` the same form, answered
  with JSON: the plate and rete as SVG, or the PDF's pages as PNG;
- ``GET /api/places?q=`` suggestions from the gazetteer (#10), when
  kitgen has one;
- ``POST /sets``, ``GET /sets/ID``, ``GET /sets/ID/status``,
  ``GET /sets/ID/set.zip`` a class set (:mod:`.sets`).

Builds run in the bounded pool (:mod:`.pool`); a full pool answers 503
with ``Retry-After``.  Kits are built in memory; only class sets are
written, inside the server's private temporary folder.
"""

from __future__ import annotations

import asyncio
import contextlib
import logging
import os
import re
import shutil
import tempfile
from dataclasses import MISSING
from dataclasses import fields as dataclass_fields
from functools import lru_cache
from pathlib import Path
from urllib.parse import quote

import babel
from jinja2 import Environment, PackageLoader, select_autoescape
from starlette.applications import Starlette
from starlette.datastructures import UploadFile
from starlette.requests import Request
from starlette.responses import FileResponse, HTMLResponse, JSONResponse, RedirectResponse, Response
from starlette.routing import Mount, Route
from starlette.staticfiles import StaticFiles

from ..batch.naming import kit_stem
from ..errors import Message, one_line
from ..recipe.schema import KEYS_BY_NAME, MAX_TEXT_CHARS, Recipe
from ..words.templates import available_languages, load_words
from . import form as forms
from . import jobs, sets
from .guard import CSRF_COOKIE, CSRF_HEADER, Guard, TooLarge, csrf_ok, new_token
from .language import choose
from .pool import BuildPool, Busy

try:  # the gazetteer of #10; the page asks for latitude and longitude without it
    from .. import places as gazetteer
except ImportError:
    gazetteer = None

log = logging.getLogger("kitgen.web")

#: Largest form body (a recipe's fields are a few hundred bytes).
MAX_FORM_BYTES = 64 * 1024
#: Largest class-set upload (a roster of a few hundred pupils and the form).
MAX_UPLOAD_BYTES = 512 * 1024
#: Most suggestions a search returns; longest search text.
MAX_SUGGESTIONS = 8
MAX_QUERY_CHARS = 80
FONTS = {"DejaVuSans.ttf", "DejaVuSans-Bold.ttf", "NotoSansArabic-Regular.ttf", "NotoSansDevanagari-Regular.ttf"}
#: The recipe's defaults, for the boxes ticked on a fresh page.
_DEFAULTS = {f.name: f.default for f in dataclass_fields(Recipe) if f.default is not MISSING}
FORMATS = ("pdf", "svg", "json", "yaml")
MEDIA = {"pdf": "application/pdf", "svg": "application/zip", "json": "application/json",
         "yaml": "application/yaml"}
SUFFIX = {"pdf": ".pdf", "svg": "-svg.zip", "json": ".json", "yaml": ".yaml"}


@lru_cache(maxsize=None)
def _words(language: str):
    return load_words(language)


@lru_cache(maxsize=None)
def _english_web():
    return load_words("en")


def say(words, key: str, **values) -> str:
    """A ``web.*`` entry in the language of ``words`` (English where the
    language lacks it)."""
    try:
        return words(f"web.{key}", **values)
    except KeyError:
        return _english_web()(f"web.{key}", **values)


def _has(words, key: str) -> bool:
    return words.template(f"web.{key}") is not None


def language_name(code: str) -> str:
    """A language's name in itself, from the Unicode CLDR (Babel)."""
    return babel.Locale.parse(code).get_display_name(code) or code


def _attachment(tree: dict, suffix: str) -> str:
    """The ``Content-Disposition`` of a download, named after the place or
    title (else ``astrolabe-`` and the latitude as typed): the name in its
    own letters as RFC 6266 allows (``filename*``, RFC 8187's UTF-8
    encoding, made safe by the class sets' own rule), and a plain ASCII
    one for older browsers."""
    named = str(tree.get("place") or tree.get("title") or "") or f"astrolabe {tree.get('latitude', '')}"
    plain = re.sub(r"[^A-Za-z0-9.]+", "-", named).strip("-.")[:40].lower() or "astrolabe"
    own = kit_stem(named) or plain
    return f"attachment; filename=\"{plain}{suffix}\"; filename*=UTF-8''{quote(own + suffix, safe='')}"


class Web:
    """The application's settings and the handlers that use them."""

    def __init__(self, workdir: Path, pool: BuildPool, set_pool: BuildPool, loopback_only: bool):
        self.workdir, self.pool, self.set_pool = workdir, pool, set_pool
        self.loopback_only = loopback_only
        self.languages = available_languages()
        self.jinja = Environment(loader=PackageLoader("kitgen.web", "templates"),
                                 autoescape=select_autoescape(["html"]), trim_blocks=True, lstrip_blocks=True)

    # Helpers.

    def page_language(self, request: Request) -> str:
        return choose(request.query_params.get("lang") or request.query_params.get("ui"),
                      request.headers.get("accept-language"), self.languages)

    def words(self, request: Request):
        return _words(self.page_language(request))

    def render(self, request: Request, name: str, status: int = 200, **context) -> HTMLResponse:
        language = self.page_language(request)
        words = _words(language)
        token = request.cookies.get(CSRF_COOKIE) or new_token()
        html = self.jinja.get_template(name).render(
            t=lambda key, **v: say(words, key, **v), has=lambda key: _has(words, key), words=words,
            lang=language, rtl=words.rtl, languages=[(c, language_name(c)) for c in self.languages],
            csrf=token, places=gazetteer is not None, sets_available=sets.batch_available(), **context)
        response = HTMLResponse(html, status_code=status, headers={"Cache-Control": "no-store"})
        response.set_cookie(CSRF_COOKIE, token, httponly=True, samesite="strict", path="/")
        return response

    def field_view(self, language: str, values: dict, errors: dict) -> list[dict]:
        """What the page template needs of each field: label, hint, choices,
        the value to show again and the message beside it."""
        words = _words(language)
        out = []
        for f in forms.fields(self.languages):
            label = say(words, f"label.{f.name}") if _has(words, f"label.{f.name}") else f.name
            checked = (values[f.name] == "true") if f.name in values else bool(_DEFAULTS.get(f.key.attr))
            out.append({"name": f.name, "widget": f.widget, "main": f.main, "label": label,
                        "hint": forms.hint(f, words), "choices": [(c, self.choice_text(words, f, c)) for c in f.choices],
                        "error": errors.get(f.name, ""), "value": values.get(f.name, ""),
                        "values": values.get(f.name + "[]", []), "checked": checked,
                        "x": values.get(f.name + ".x", ""), "y": values.get(f.name + ".y", "")})
        return out

    @staticmethod
    def choice_text(words, f, choice: str) -> str:
        if f.name == "language":
            return language_name(choice)
        if f.widget == "checkboxes" and words.template(f"{choice}.title"):
            return words(f"{choice}.title")
        return say(words, f"choice.{f.name}.{choice}") if _has(words, f"choice.{f.name}.{choice}") else choice

    async def read_form(self, request: Request, upload: bool = False):
        """``(form, error response)``: the parsed form after the CSRF check."""
        try:
            form = await request.form(max_files=1 if upload else 0, max_fields=120,
                                      max_part_size=MAX_UPLOAD_BYTES if upload else MAX_FORM_BYTES)
        except TooLarge:
            raise
        except Exception:  # not a form at all (a bad encoding, a stray file)
            return None, self.plain(request, "error.bad_form", 400)
        sent = form.get(forms.CSRF_FIELD) or request.headers.get(CSRF_HEADER)
        if not csrf_ok(request.cookies.get(CSRF_COOKIE), sent if isinstance(sent, str) else None):
            return None, self.plain(request, "error.csrf", 403)
        return form, None

    def plain(self, request: Request, key: str, status: int, **values) -> Response:
        text = say(self.words(request), key, **values)
        if "application/json" in request.headers.get("accept", ""):
            return JSONResponse({"ok": False, "errors": {"": text}}, status_code=status)
        return Response(text, status_code=status, media_type="text/plain; charset=utf-8",
                        headers={"Retry-After": "2"} if status == 503 else None)

    def internal(self, request: Request, exc: Exception) -> Response:
        """An internal fault: the traceback to the server's log, and to the
        user the command line's one line (``errors.internal``), status 500."""
        if isinstance(exc, jobs.Internal):
            log.error("building a kit failed:\n%s", exc.trace)
            kind, detail = exc.kind, exc.detail
        else:
            log.error("building a kit failed", exc_info=exc)
            kind, detail = type(exc).__name__, str(exc)
        text = one_line(Message("errors.internal", kind=kind, detail=detail).text(self.words(request)))
        if "application/json" in request.headers.get("accept", "") or request.url.path.startswith("/api/"):
            return JSONResponse({"ok": False, "errors": {"": text}}, status_code=500)
        return Response(text, status_code=500, media_type="text/plain; charset=utf-8")

    def tree_and_recipe(self, request: Request, form):
        """``(tree, recipe, errors, values)`` of a submitted form."""
        items = [(k, v) for k, v in form.multi_items() if isinstance(v, str)]
        values: dict = {}
        for k, v in items:
            if k in forms.CONTROL_FIELDS:
                continue
            values.setdefault(k + "[]", []).append(v)
            values[k] = v
        tree = forms.form_tree(items)
        recipe, errors = forms.check_form(tree, self.words(request))
        return tree, recipe, errors, values

    # Handlers.

    async def index(self, request: Request) -> Response:
        """The page; recipe keys in the query fill its fields (the page's
        language switch carries the form over that way), nothing is built."""
        language = self.page_language(request)
        values = {"language": language}
        for name, value in list(request.query_params.multi_items())[:forms.MAX_QUERY_VALUES]:
            base = name.split(".", 1)[0]
            if base in KEYS_BY_NAME and base not in forms.PATH_KEYS and len(value) <= MAX_TEXT_CHARS:
                values.setdefault(name + "[]", []).append(value)
                values[name] = value
        return self.render(request, "page.html", fields=self.field_view(language, values, {}), errors={},
                           previews=None)

    async def kit(self, request: Request) -> Response:
        form, refused = await self.read_form(request)
        if refused:
            return refused
        language = self.page_language(request)
        words = _words(language)
        try:
            tree, recipe, errors, values = self.tree_and_recipe(request, form)
        except forms.FormError as exc:
            return self.plain(request, exc.key, 400, name=exc.field)
        fmt = form.get("format", "pdf")
        previews = None
        if recipe is not None:
            try:
                if fmt in FORMATS:
                    heading = say(words, "recipe_heading")
                    data = await self.pool.run(jobs.download, recipe, language, fmt, tree, heading)
                    return Response(data, media_type=MEDIA[fmt], headers={
                        "Content-Disposition": _attachment(tree, SUFFIX[fmt]), "Cache-Control": "no-store"})
                previews = await self.pool.run(jobs.preview, recipe, language)
            except Busy:
                return self.plain(request, "busy", 503)
            except jobs.Refused as exc:
                errors = {exc.field: exc.text}
            except Exception as exc:  # kitgen's own fault: one line to the user, the traceback to the log
                return self.internal(request, exc)
        status = 422 if errors else 200
        return self.render(request, "page.html", status, fields=self.field_view(language, values, errors),
                           errors=errors, previews=previews)

    async def api(self, request: Request, what: str) -> Response:
        form, refused = await self.read_form(request)
        if refused:
            return refused
        language = self.page_language(request)
        words = _words(language)
        try:
            tree, recipe, errors, _ = self.tree_and_recipe(request, form)
        except forms.FormError as exc:
            return JSONResponse({"ok": False, "errors": {exc.field: say(words, exc.key, name=exc.field)}}, 400)
        if errors:
            return JSONResponse({"ok": False, "errors": errors}, status_code=422)
        try:
            if what == "preview":
                return JSONResponse({"ok": True, **await self.pool.run(jobs.preview, recipe, language)})
            return JSONResponse({"ok": True, "pages": await self.pool.run(jobs.pages, recipe, language)})
        except Busy:
            return JSONResponse({"ok": False, "busy": True, "errors": {"": say(words, "busy")}}, status_code=503,
                                headers={"Retry-After": "2"})
        except jobs.Refused as exc:
            return JSONResponse({"ok": False, "errors": {exc.field: exc.text}}, 422)
        except Exception as exc:  # kitgen's own fault: one line to the user, the traceback to the log
            return self.internal(request, exc)

    async def preview(self, request: Request) -> Response:
        return await self.api(request, "preview")

    async def pages(self, request: Request) -> Response:
        return await self.api(request, "pages")

    async def search(self, request: Request) -> Response:
        if gazetteer is None:
            return JSONResponse({"places": []}, status_code=404)
        query = request.query_params.get("q", "")[:MAX_QUERY_CHARS].strip()
        if not query:
            return JSONResponse({"places": []})
        found = gazetteer.search(query, limit=MAX_SUGGESTIONS)
        return JSONResponse({"places": [
            {"name": p.name, "label": gazetteer.query_for(p), "region": p.region, "country_code": p.country_code,
             "latitude": p.latitude_deg, "longitude": p.longitude_deg, "timezone": p.timezone}
            for p in found]})

    async def start_set(self, request: Request) -> Response:
        if not sets.batch_available():
            return self.plain(request, "sets_unavailable", 404)
        form, refused = await self.read_form(request, upload=True)
        if refused:
            return refused
        language = self.page_language(request)
        words = _words(language)
        roster = form.get("roster")
        items = [(k, v) for k, v in form.multi_items() if isinstance(v, str)]
        try:
            tree = forms.form_tree(items)
        except forms.FormError as exc:
            return self.plain(request, exc.key, 400, name=exc.field)
        errors = {}
        text = ""
        if not isinstance(roster, UploadFile) or not roster.filename:
            errors["roster"] = say(words, "error.roster_required")
        else:
            data = await roster.read(MAX_UPLOAD_BYTES + 1)
            if len(data) > MAX_UPLOAD_BYTES:
                return self.plain(request, "error.too_large", 413)
            try:
                text = data.decode("utf-8-sig")
            except UnicodeDecodeError:
                text = ""
            if not text.strip() or "\x00" in text:
                errors["roster"] = say(words, "error.roster_not_text")
            elif sets.roster_rows(text) > sets.MAX_ROSTER_ROWS:
                errors["roster"] = say(words, "error.roster_too_long", limit=sets.MAX_ROSTER_ROWS)
        located = {"latitude", "place", "plates"} & (set(tree) | sets.roster_columns(text))
        if not located:  # the site must come from the form or from the roster's own columns
            tree["latitude"] = ""
        check = tree if "latitude" in tree or "place" in tree or "plates" in tree else {**tree, "latitude": 0}
        _, field_errors = forms.check_form(check, words)
        errors.update(field_errors)
        if errors:
            values = {k: v for k, v in items if k not in forms.CONTROL_FIELDS}
            return self.render(request, "page.html", 422, fields=self.field_view(language, values, errors),
                               errors=errors, previews=None)
        sets.sweep(self.workdir)
        set_id, folder = sets.prepare(self.workdir, tree, text)
        try:
            self.set_pool.start(sets.run, folder)
        except Busy:
            shutil.rmtree(folder, ignore_errors=True)
            return self.plain(request, "busy", 503)
        return RedirectResponse(f"/sets/{set_id}?lang={language}", status_code=303)

    def _set(self, request: Request):
        return sets.set_folder(self.workdir, request.path_params["set_id"])

    async def set_page(self, request: Request) -> Response:
        folder = self._set(request)
        if folder is None:
            return self.render(request, "set.html", 404, state=None, set_id="")
        return self.render(request, "set.html", state=sets.read_state(folder),
                           set_id=request.path_params["set_id"])

    async def set_status(self, request: Request) -> Response:
        folder = self._set(request)
        if folder is None:
            return JSONResponse({"state": "unknown"}, status_code=404)
        state = sets.read_state(folder)
        words = self.words(request)
        state["text"] = (say(words, "set_progress", done=state.get("done", 0), total=state.get("total", 0))
                         if state["state"] == "running" else
                         say(words, "set_done") if state["state"] == "done" else
                         say(words, "set_failed", message=state.get("message", "")))
        return JSONResponse(state, headers={"Cache-Control": "no-store"})

    async def set_zip(self, request: Request) -> Response:
        folder = self._set(request)
        if folder is None or not (folder / "set.zip").is_file():
            return self.plain(request, "set_unknown", 404)
        return FileResponse(folder / "set.zip", media_type="application/zip", filename="class-set.zip",
                            headers={"Cache-Control": "no-store"})

    async def font(self, request: Request) -> Response:
        name = request.path_params["name"]
        if name not in FONTS:
            return Response(status_code=404)
        path = Path(__file__).resolve().parent.parent / "fonts" / name
        return FileResponse(path, media_type="font/ttf", headers={"Cache-Control": "max-age=86400"})

    async def too_large(self, request: Request, exc: Exception) -> Response:
        return self.plain(request, "error.too_large", 413)


def _refusal_words(scope) -> dict:
    words = _words(choose(None, dict((k.decode("latin-1").lower(), v.decode("latin-1"))
                                     for k, v in scope.get("headers", [])).get("accept-language"),
                          available_languages()))
    return {"too_large": say(words, "error.too_large"), "wrong_host": say(words, "error.wrong_host")}


def create_app(workdir: str | Path | None = None, workers: int = 2, queue: int = 8, loopback_only: bool = True,
               allowed_hosts: tuple[str, ...] = (), warm: bool = False):
    """The ASGI application.  ``workdir`` is the private folder for class
    sets (a new temporary one, removed at shutdown, when not given; give
    several workers one shared folder); ``workers`` and ``queue`` bound
    the build pool; ``loopback_only`` answers only requests addressed to
    the loopback names, ``allowed_hosts`` only those addressed to these
    names (a service behind a reverse proxy); ``warm`` starts the build
    workers at once rather than with the first request."""
    own = workdir is None
    root = Path(tempfile.mkdtemp(prefix="kitgen-serve-")) if own else Path(workdir)
    root.mkdir(parents=True, exist_ok=True, mode=0o700)
    web = Web(root, BuildPool(workers, queue, processes=True), BuildPool(1, 2), loopback_only)

    @contextlib.asynccontextmanager
    async def lifespan(app):
        if warm:
            web.pool.warm(jobs.warm)
            if gazetteer is not None:  # its index is read once; the first search should not wait for it
                await asyncio.to_thread(gazetteer.search, "a", limit=1)
        try:
            yield
        finally:
            web.pool.shutdown()
            web.set_pool.shutdown()
            if own:
                shutil.rmtree(root, ignore_errors=True)

    routes = [
        Route("/", web.index),
        Route("/kit", web.kit, methods=["POST"]),
        Route("/api/preview", web.preview, methods=["POST"]),
        Route("/api/pages", web.pages, methods=["POST"]),
        Route("/api/places", web.search),
        Route("/sets", web.start_set, methods=["POST"]),
        Route("/sets/{set_id}", web.set_page),
        Route("/sets/{set_id}/status", web.set_status),
        Route("/sets/{set_id}/set.zip", web.set_zip),
        Route("/fonts/{name}", web.font),
        Mount("/static", StaticFiles(packages=[("kitgen.web", "static")]), name="static"),
    ]
    app = Starlette(routes=routes, lifespan=lifespan, exception_handlers={TooLarge: web.too_large})
    app.state.web = web
    limits = {"/": MAX_FORM_BYTES, "/sets": MAX_UPLOAD_BYTES + MAX_FORM_BYTES}
    guarded = Guard(app, limits, loopback_only, _refusal_words, allowed_hosts)
    guarded.web = web
    return guarded


def service():
    """The application for several workers behind a reverse proxy, set up
    from the environment (``uvicorn --factory kitgen.web.app:service``):
    ``KITGEN_WEB_DIR`` the class sets' folder that every worker shares
    (required), ``KITGEN_WEB_HOSTS`` the host names the proxy passes on
    (comma-separated, required), ``KITGEN_WEB_BUILDS`` and
    ``KITGEN_WEB_QUEUE`` each worker's pool (default 2 and 8)."""
    folder, hosts = os.environ.get("KITGEN_WEB_DIR"), os.environ.get("KITGEN_WEB_HOSTS", "")
    if not folder or not hosts.strip():
        raise SystemExit("kitgen.web.app:service needs KITGEN_WEB_DIR and KITGEN_WEB_HOSTS (see README.md)")
    return create_app(folder, int(os.environ.get("KITGEN_WEB_BUILDS", "2")), int(os.environ.get("KITGEN_WEB_QUEUE", "8")),
                      loopback_only=False, allowed_hosts=tuple(hosts.split(",")), warm=True)
