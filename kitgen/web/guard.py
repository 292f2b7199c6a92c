"""Safety of every request: size limits, the host name, CSRF and headers.

- **Size.** A request body longer than its route's limit is refused with
  413 before it is read, by its ``Content-Length``, or as soon as the
  bytes that arrived pass the limit when the length is not given.
- **Host.** A server on the loopback address answers only requests whose
  ``Host`` is a loopback name, so that a web site cannot reach it through
  a name that it makes point at 127.0.0.1 (DNS rebinding).
- **CSRF.** Every POST carries a token twice, as the ``kitgen_csrf``
  cookie (SameSite=Strict, HttpOnly) and as the ``csrf_token`` form field
  or the ``X-CSRF-Token`` header; they must be equal (the double-submit
  cookie of the OWASP CSRF Prevention Cheat Sheet).  A site elsewhere can
  neither read the cookie nor set it, so it cannot send the pair.  The
  token keeps no state on the server, so any worker can check it.
- **Headers.** Every answer forbids framing (``X-Frame-Options: DENY`` and
  CSP ``frame-ancestors 'none'``), inline and foreign script (a Content
  Security Policy that allows scripts, styles, fonts and connections to
  this origin only), MIME sniffing (``nosniff``) and the referrer.
"""

from __future__ import annotations

import hmac
import secrets

from starlette.responses import PlainTextResponse

CSRF_COOKIE = "kitgen_csrf"
CSRF_HEADER = "x-csrf-token"

#: A strict policy: nothing inline, nothing from elsewhere.  Pictures may
#: be data: URLs (the PDF page previews are sent that way).
CONTENT_SECURITY_POLICY = ("default-src 'none'; script-src 'self'; style-src 'self'; img-src 'self' data:; "
                           "font-src 'self'; connect-src 'self'; form-action 'self'; base-uri 'none'; "
                           "frame-ancestors 'none'")
SECURITY_HEADERS = (
    (b"content-security-policy", CONTENT_SECURITY_POLICY.encode()),
    (b"x-frame-options", b"DENY"),
    (b"x-content-type-options", b"nosniff"),
    (b"referrer-policy", b"no-referrer"),
    (b"cross-origin-opener-policy", b"same-origin"),
    (b"cross-origin-resource-policy", b"same-origin"),
)

LOOPBACK_NAMES = ("127.0.0.1", "localhost", "[::1]", "::1")


def new_token() -> str:
    return secrets.token_urlsafe(32)


def csrf_ok(cookie: str | None, sent: str | None) -> bool:
    """Both copies of the token present, well-formed and equal (compared
    in constant time)."""
    if not cookie or not sent or len(cookie) > 100 or len(sent) > 100:
        return False
    return hmac.compare_digest(cookie.encode("utf-8", "replace"), sent.encode("utf-8", "replace"))


def host_name(host_header: str) -> str:
    """The name in a ``Host`` header, without its port."""
    host = host_header.strip().lower()
    if host.startswith("["):
        return host[: host.find("]") + 1]
    return host.rsplit(":", 1)[0] if ":" in host else host


def host_is_loopback(host_header: str) -> bool:
    return host_name(host_header) in LOOPBACK_NAMES


class TooLarge(Exception):
    """A body grew past its limit while it was read (no Content-Length);
    the application answers it with 413."""


class Guard:
    """ASGI middleware: the size limits, the host check and the headers.
    ``limits`` maps a path prefix to its largest body in bytes (the longest
    matching prefix wins); ``loopback_only`` turns the host check on, and
    ``allowed_hosts`` (names, for a service behind a reverse proxy) makes
    it check for those names instead;
    ``messages(scope)`` gives the words for a refusal,
    ``{"too_large": ..., "wrong_host": ...}``."""

    def __init__(self, app, limits: dict[str, int], loopback_only: bool, messages, allowed_hosts=()):
        self.app = app
        self.limits = sorted(limits.items(), key=lambda kv: -len(kv[0]))
        self.loopback_only = loopback_only
        self.allowed_hosts = frozenset(h.strip().lower() for h in allowed_hosts if h.strip())
        self.messages = messages

    def _host_ok(self, host_header: str) -> bool:
        if self.allowed_hosts:
            return host_name(host_header) in self.allowed_hosts
        return not self.loopback_only or host_is_loopback(host_header)

    def _limit(self, path: str) -> int:
        return next(limit for prefix, limit in self.limits if path.startswith(prefix))

    async def __call__(self, scope, receive, send):
        if scope["type"] != "http":
            return await self.app(scope, receive, send)

        async def send_with_headers(message):
            if message["type"] == "http.response.start":
                names = {name for name, _ in SECURITY_HEADERS}
                headers = [(n, v) for n, v in message.get("headers", []) if n.lower() not in names]
                message = {**message, "headers": headers + list(SECURITY_HEADERS)}
            await send(message)

        headers = {k.decode("latin-1").lower(): v.decode("latin-1") for k, v in scope.get("headers", [])}
        if not self._host_ok(headers.get("host", "")):
            return await self._refuse(scope, receive, send_with_headers, 421, "wrong_host")
        limit = self._limit(scope.get("path", "/"))
        length = headers.get("content-length")
        if length is not None:
            try:
                too_long = int(length) > limit
            except ValueError:
                too_long = True
            if too_long:
                return await self._refuse(scope, receive, send_with_headers, 413, "too_large")
        received = 0
        started = False

        async def counted_receive():
            nonlocal received
            message = await receive()
            if message["type"] == "http.request":
                received += len(message.get("body", b""))
                if received > limit:
                    raise TooLarge()
            return message

        async def tracked_send(message):
            nonlocal started
            if message["type"] == "http.response.start":
                started = True
            await send_with_headers(message)

        try:
            await self.app(scope, counted_receive, tracked_send)
        except TooLarge:
            if not started:
                await self._refuse(scope, None, send_with_headers, 413, "too_large")

    async def _refuse(self, scope, receive, send, status: int, what: str):
        text = self.messages(scope)[what]
        response = PlainTextResponse(text, status_code=status, headers={"Connection": "close"})
        await response(scope, receive, send)
