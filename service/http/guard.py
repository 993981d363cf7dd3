"""The request guard: bearer token on every path but health, and a request-body limit.

Both are decided before the app reads a byte of the body (ASGI middleware).
"""

from __future__ import annotations

import hmac

from starlette.types import ASGIApp, Message, Receive, Scope, Send

from stanchion.service.http.errors import error_response
from stanchion.service.http.settings import Settings

HEALTH_PATH = "/v1/health"
UPLOAD_PATH = "/v1/models"


class _BodyTooLarge(Exception):
    pass


class Guard:
    """ASGI middleware: bearer token on every path but health, and a request-body limit.

    Both are decided before the app reads a byte of the body.  The upload route counts its
    own body (:func:`stanchion.service.http.upload.receive_form`); every other route is limited
    here, by Content-Length up front, or by counting what it reads when the body is sent
    without one (chunked).
    """

    def __init__(self, app: ASGIApp, settings: Settings) -> None:
        """Wrap ``app`` with the token and the body limit of ``settings``."""
        self.app = app
        self.token = settings.api_token.encode() if settings.api_token else None
        self.max_bytes = settings.max_upload_bytes

    async def __call__(self, scope: Scope, receive: Receive, send: Send) -> None:
        """Refuse or pass the request on."""
        if scope["type"] != "http":
            await self.app(scope, receive, send)
            return
        path = scope.get("path", "")
        if self.token is not None and path != HEALTH_PATH and not self._authorized(scope):
            await error_response(401, "missing or wrong bearer token",
                         headers={"WWW-Authenticate": "Bearer"})(scope, receive, send)
            return
        if path == UPLOAD_PATH:
            await self.app(scope, receive, send)
            return
        length = _content_length(scope)
        if length is not None:
            # The declared length frames the body (the HTTP server reads no more), so a
            # declared body within the limit needs no counting.
            if length > self.max_bytes:
                await self._too_large(scope, receive, send)
            else:
                await self.app(scope, receive, send)
            return
        seen = 0
        started = False

        async def counting_receive() -> Message:
            nonlocal seen
            message = await receive()
            if message["type"] == "http.request":
                seen += len(message.get("body", b""))
                if seen > self.max_bytes:
                    raise _BodyTooLarge
            return message

        async def tracking_send(message: Message) -> None:
            nonlocal started
            started = started or message["type"] == "http.response.start"
            await send(message)

        try:
            await self.app(scope, counting_receive, tracking_send)
        except _BodyTooLarge:
            if started:
                raise
            await self._too_large(scope, receive, send)

    def _authorized(self, scope: Scope) -> bool:
        for name, value in scope.get("headers", []):
            if name == b"authorization":
                scheme, _, given = value.partition(b" ")
                return (scheme.lower() == b"bearer"
                        and hmac.compare_digest(given.strip(), self.token or b""))
        return False

    async def _too_large(self, scope: Scope, receive: Receive, send: Send) -> None:
        mb = self.max_bytes / (1024 * 1024)
        await error_response(413, f"the request body is larger than {mb:g} MiB "
                     "(STANCHION_MAX_UPLOAD_MB)")(scope, receive, send)


def _content_length(scope: Scope) -> int | None:
    """The declared body length.

    None when there is none, it is not a number, or the body is also declared chunked (then
    the length does not frame it).
    """
    length = None
    for name, value in scope.get("headers", []):
        if name == b"transfer-encoding":
            return None
        if name == b"content-length":
            try:
                length = int(value)
            except ValueError:
                return None
    return length
