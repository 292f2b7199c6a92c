"""``kitgen serve``: bind, say where, and run the page with uvicorn.

Loopback (127.0.0.1) unless the user names another address with
``--host``, and then with a warning on stderr: the page builds kits for
whoever can reach it.  Port 0 asks the system for a free port, which is
read back from the bound socket before the address is printed.
"""

from __future__ import annotations

import ipaddress
import socket
import sys
import webbrowser

import uvicorn

from ..errors import Message, UserError, one_line
from .app import create_app

LOOPBACK = "127.0.0.1"


def is_loopback(host: str) -> bool:
    """Whether ``host`` is a loopback address or the name ``localhost``
    (127.0.0.0/8 and ::1, RFC 1122 section 3.2.1.3 and RFC 4291 section 2.5.3)."""
    if host.lower() == "localhost":
        return True
    try:
        return ipaddress.ip_address(host.strip("[]")).is_loopback
    except ValueError:
        return False


def check_bind(host: str | None, host_given: bool) -> str:
    """The address to bind: loopback by default; any other only when the
    user gave it with ``--host``.  Raises :class:`UserError` otherwise."""
    host = host or LOOPBACK
    if not is_loopback(host) and not host_given:
        raise UserError("errors.serve_not_loopback", host=host)
    return host


def bind_socket(host: str, port: int) -> socket.socket:
    family = socket.AF_INET6 if ":" in host.strip("[]") else socket.AF_INET
    sock = socket.socket(family, socket.SOCK_STREAM)
    sock.setsockopt(socket.SOL_SOCKET, socket.SO_REUSEADDR, 1)
    try:
        sock.bind((host.strip("[]"), port))
    except (OSError, OverflowError) as exc:  # OverflowError: a port beyond 65535
        sock.close()
        raise UserError("errors.serve_cannot_bind", host=host, port=port, reason=getattr(exc, "strerror", None) or exc) from None
    sock.listen(128)
    return sock


def url_of(sock: socket.socket) -> str:
    host, port = sock.getsockname()[:2]
    shown = f"[{host}]" if ":" in host else host
    return f"http://{shown}:{port}/"


def serve(host: str | None = None, port: int = 0, host_given: bool = False, open_browser: bool = False,
          workers: int = 2, queue: int = 8, log=None) -> None:
    """Run the page until interrupted; the warning goes to ``log``
    (standard error by default)."""
    host = check_bind(host, host_given)
    loopback = is_loopback(host)
    if not loopback:
        print(one_line(Message("errors.serve_beyond_loopback", host=host).text()), file=log or sys.stderr)
    sock = bind_socket(host, port)
    url = url_of(sock)
    app = create_app(workers=workers, queue=queue, loopback_only=loopback, warm=True)
    print(url, flush=True)
    if open_browser:
        webbrowser.open(url)
    config = uvicorn.Config(app, log_level="warning", access_log=False, lifespan="on", server_header=False)
    uvicorn.Server(config).run(sockets=[sock])
