"""The web page under a burst of requests, on the loopback address only (#13).

50 kit requests at once against a real server (uvicorn on 127.0.0.1): each
is answered, with a kit or with "busy" (503 and Retry-After), never an
error, and no temporary file is left behind.  The loop is bounded: exactly
50 requests, each with a time limit, and it stops by itself.
"""

from __future__ import annotations

import http.client
import os
import tempfile
import urllib.parse
from concurrent.futures import ThreadPoolExecutor
from pathlib import Path

from kitgen.kit import build_kit
from kitgen.recipe.load import validate_recipe
from kitgen.render.pdf import build_pdf
from kitgen.web.app import create_app

from .web_support import running_server

REQUESTS = 50
TIMEOUT_S = 120


def _csrf(host: str, port: int) -> str:
    conn = http.client.HTTPConnection(host, port, timeout=TIMEOUT_S)
    conn.request("GET", "/")
    response = conn.getresponse()
    response.read()
    cookie = response.getheader("set-cookie")
    conn.close()
    return cookie.split(";", 1)[0].split("=", 1)[1]


def _ask(host: str, port: int, token: str, k: int) -> tuple[int, bytes, str | None]:
    body = urllib.parse.urlencode({"csrf_token": token, "latitude": f"{-60 + 2.5 * k:.1f}", "format": "pdf"})
    conn = http.client.HTTPConnection(host, port, timeout=TIMEOUT_S)
    try:
        conn.request("POST", "/kit", body, {"Content-Type": "application/x-www-form-urlencoded",
                                           "Cookie": f"kitgen_csrf={token}"})
        response = conn.getresponse()
        return response.status, response.read(), response.getheader("retry-after")
    finally:
        conn.close()


def test_fifty_concurrent_kit_requests_are_all_answered(tmp_path):
    before = {p.name for p in Path(tempfile.gettempdir()).iterdir() if p.name.startswith("kitgen-serve-")}
    workdir = tmp_path / "work"
    with running_server(create_app(workdir=workdir, workers=2, queue=6)) as url:
        parsed = urllib.parse.urlsplit(url)
        token = _csrf(parsed.hostname, parsed.port)
        with ThreadPoolExecutor(max_workers=REQUESTS) as ask:
            answers = list(ask.map(lambda k: _ask(parsed.hostname, parsed.port, token, k), range(REQUESTS)))
    statuses = [status for status, _, _ in answers]
    assert len(answers) == REQUESTS
    assert set(statuses) <= {200, 503}, statuses
    built = {k: body for k, (status, body, _) in enumerate(answers) if status == 200}
    assert len(built) >= 2 + 6 and all(body.startswith(b"%PDF-") for body in built.values())
    # Built side by side on the pool's threads, each kit is still the very
    # PDF that one build alone gives (the build is a pure function).
    for k, body in list(built.items())[:4]:
        alone = build_pdf(build_kit(validate_recipe({"latitude": f"{-60 + 2.5 * k:.1f}"})))[1]
        assert body == alone
    assert all(retry == "2" for status, _, retry in answers if status == 503)
    # 50 requests at once against room for 8: the pool's bound shows.
    assert statuses.count(503) > 0
    print(f"{statuses.count(200)} kits, {statuses.count(503)} busy")
    # Kits are built in memory: the server's folder is empty and no other
    # folder of a server is left in the system's temporary folder.
    assert not any(os.scandir(workdir)) if workdir.exists() else True
    after = {p.name for p in Path(tempfile.gettempdir()).iterdir() if p.name.startswith("kitgen-serve-")}
    assert after <= before


def test_a_server_cleans_its_own_temporary_folder():
    app = create_app()
    root = app.web.workdir
    assert root.is_dir() and (root.stat().st_mode & 0o777) == 0o700
    with running_server(app):
        pass
    assert not root.exists()
