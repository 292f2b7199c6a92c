"""Helpers for the web page's tests (#13): a real server on the loopback
address in a thread, and the checks every downloaded kit PDF passes."""

from __future__ import annotations

import contextlib
import io
import socket
import threading
import time

import pypdf
import uvicorn

#: ISO 216: A4 is 210 mm x 297 mm; 1 pt = 1/72 in = 25.4/72 mm (PDF 32000-1:2008, 8.3.2.3).
A4_PT = (210 / 25.4 * 72, 297 / 25.4 * 72)
#: ANSI/ASME Y14.1: US letter is 8.5 in x 11 in.
LETTER_PT = (8.5 * 72, 11 * 72)


@contextlib.contextmanager
def running_server(app, timeout_s: float = 20.0):
    """``app`` served by uvicorn on 127.0.0.1 at a free port, in a thread;
    yields the base URL and stops the server on leaving."""
    sock = socket.socket(socket.AF_INET, socket.SOCK_STREAM)
    sock.setsockopt(socket.SOL_SOCKET, socket.SO_REUSEADDR, 1)
    sock.bind(("127.0.0.1", 0))
    sock.listen(128)
    port = sock.getsockname()[1]
    server = uvicorn.Server(uvicorn.Config(app, log_level="warning", access_log=False, lifespan="on"))
    thread = threading.Thread(target=server.run, kwargs={"sockets": [sock]}, daemon=True)
    thread.start()
    deadline = time.monotonic() + timeout_s
    while not server.started:
        if time.monotonic() > deadline or not thread.is_alive():
            raise RuntimeError("the test server did not start")
        time.sleep(0.05)
    try:
        yield f"http://127.0.0.1:{port}"
    finally:
        server.should_exit = True
        thread.join(timeout_s)
        sock.close()


def fonts_of(resources, seen):
    """Every font dictionary a page's resources use, Form XObjects included."""
    if resources is None:
        return
    resources = resources.get_object()
    for ref in resources.get("/Font", {}).values():
        font = ref.get_object()
        yield font
        for d in font.get("/DescendantFonts", []):
            yield d.get_object()
    for ref in resources.get("/XObject", {}).values():
        xo = ref.get_object()
        if id(xo) not in seen and xo.get("/Subtype") == "/Form":
            seen.add(id(xo))
            yield from fonts_of(xo.get("/Resources"), seen)


def check_kit_pdf(data: bytes, sheet_pt: tuple[float, float]) -> pypdf.PdfReader:
    """The checks the command line's PDFs pass (tests/test_pdf_kit.py):
    pypdf reads it in strict mode; every page is the sheet, portrait or
    landscape, to 0.5 pt; every font is embedded (PDF 32000-1:2008, 9.8:
    FontFile2 for TrueType, FontFile3 for CFF; a Type0 font through its
    descendant)."""
    assert data.startswith(b"%PDF-")
    reader = pypdf.PdfReader(io.BytesIO(data), strict=True)
    assert len(reader.pages) >= 4
    fonts = 0
    for page in reader.pages:
        size = sorted((float(page.mediabox.width), float(page.mediabox.height)))
        assert abs(size[0] - min(sheet_pt)) < 0.5 and abs(size[1] - max(sheet_pt)) < 0.5, size
        for font in fonts_of(page.get("/Resources"), set()):
            fonts += 1
            if font.get("/Subtype") == "/Type0":
                continue
            descriptor = font["/FontDescriptor"].get_object()
            assert "/FontFile2" in descriptor or "/FontFile3" in descriptor, font.get("/BaseFont")
    assert fonts > 0
    return reader
