"""ASGI middleware: body size and read-time limits, optional API key, structured access log with a
request id, and an answer in the error shape for requests cut off by a shutdown."""

from __future__ import annotations

import asyncio
import hmac
import json
import logging
import re
import sys
import time
import uuid

from starlette.exceptions import HTTPException
from starlette.types import ASGIApp, Message, Receive, Scope, Send

from service.schemas.errors import ErrorBody, Problem

access_log = logging.getLogger("stepline.access")
REQUEST_ID = re.compile(r"^[A-Za-z0-9._-]{1,64}$")
OPEN_PATHS = ("/v1/health",)


async def send_error(send: Send, status: int, title: str, field: str, message: str, extra: list | None = None) -> None:
    body = ErrorBody(status=status, title=title, problems=[Problem(field=field, message=message)])
    payload = body.model_dump_json().encode()
    headers = [(b"content-type", b"application/json"), (b"content-length", str(len(payload)).encode())]
    await send({"type": "http.response.start", "status": status, "headers": headers + (extra or [])})
    await send({"type": "http.response.body", "body": payload})


class StartWatch:
    """A send that notes whether the response has started: until it has, an error can still be answered."""

    def __init__(self, send: Send) -> None:
        self.send = send
        self.started = False

    async def __call__(self, message: Message) -> None:
        self.started = self.started or message["type"] == "http.response.start"
        await self.send(message)


class BodyLimit:
    """Refuse bodies over the limit with 413, whether announced by Content-Length or streamed, and
    bodies that do not arrive whole within the read time with 408 (a client that declares a body
    and never sends it must not hold the request open)."""

    def __init__(self, app: ASGIApp, max_bytes: int, read_timeout_s: float) -> None:
        self.app = app
        self.max_bytes = max_bytes
        self.read_timeout_s = read_timeout_s

    async def __call__(self, scope: Scope, receive: Receive, send: Send) -> None:
        if scope["type"] != "http":
            await self.app(scope, receive, send)
            return
        declared = dict(scope.get("headers", [])).get(b"content-length")
        if declared is not None and declared.isdigit() and int(declared) > self.max_bytes:
            await self._refuse(send)
            return
        received = 0
        body_done = False
        deadline = time.monotonic() + self.read_timeout_s

        async def counted() -> Message:
            nonlocal received, body_done
            if body_done:  # after the body, receive only waits for a disconnect
                return await receive()
            try:
                message = await asyncio.wait_for(receive(), max(deadline - time.monotonic(), 0.0))
            except TimeoutError:
                raise BodyTimeoutError(self.read_timeout_s) from None
            if message["type"] == "http.request":
                received += len(message.get("body", b""))
                if received > self.max_bytes:
                    raise BodyTooLargeError(self.max_bytes)
                body_done = not message.get("more_body", False)
            return message

        watched = StartWatch(send)
        try:
            await self.app(scope, counted, watched)
        except BodyTooLargeError:
            if not watched.started:
                await self._refuse(send)

    async def _refuse(self, send: Send) -> None:
        await send_error(send, 413, "body too large", "body", BodyTooLargeError(self.max_bytes).detail)


class BodyTooLargeError(HTTPException):
    """Raised while a streamed body is read; an HTTPException so the framework answers 413 with it."""

    def __init__(self, max_bytes: int) -> None:
        super().__init__(status_code=413, detail=f"the body may be at most {max_bytes} bytes")


class BodyTimeoutError(HTTPException):
    """Raised when a body has not arrived whole within the read time: 408."""

    def __init__(self, read_timeout_s: float) -> None:
        super().__init__(status_code=408, detail=f"the body did not arrive within {read_timeout_s:g} s")


class ShutdownAnswer:
    """A request still running when the server's graceful shutdown runs out is cancelled; answer it
    with a 503 in the error shape (the server would otherwise send a plain-text 500)."""

    def __init__(self, app: ASGIApp) -> None:
        self.app = app

    async def __call__(self, scope: Scope, receive: Receive, send: Send) -> None:
        if scope["type"] != "http":
            await self.app(scope, receive, send)
            return
        watched = StartWatch(send)
        try:
            await self.app(scope, receive, watched)
        except asyncio.CancelledError:
            if not watched.started:
                message = "the server is shutting down; send the request again"
                await send_error(send, 503, "shutting down", "request", message, [(b"connection", b"close")])
            raise


class ApiKey:
    """With a key set, every /v1 path except health needs `Authorization: Bearer <key>`."""

    def __init__(self, app: ASGIApp, key: str) -> None:
        self.app = app
        self.key = key.encode()

    async def __call__(self, scope: Scope, receive: Receive, send: Send) -> None:
        path = scope.get("path", "")
        if scope["type"] != "http" or not self.key or not path.startswith("/v1/") or path in OPEN_PATHS:
            await self.app(scope, receive, send)
            return
        given = dict(scope.get("headers", [])).get(b"authorization", b"")
        scheme, _, token = given.partition(b" ")
        if scheme.lower() == b"bearer" and hmac.compare_digest(token.strip(), self.key):
            await self.app(scope, receive, send)
            return
        challenge = [(b"www-authenticate", b'Bearer realm="stepline"')]
        await send_error(send, 401, "unauthorized", "authorization", "a valid API key is required", challenge)


def configure_access_log(enabled: bool) -> None:
    """Send the access log to standard output as bare JSON lines, unless the operator's logging
    configuration already handles it; a disabled log builds no lines at all."""
    if not enabled:
        access_log.setLevel(logging.WARNING)
        return
    access_log.setLevel(logging.INFO)
    if not access_log.handlers:
        access_log.addHandler(_StandardOutput())


class _StandardOutput(logging.Handler):
    """Writes each record's message as a line to whatever sys.stdout is at the time."""

    def emit(self, record: logging.LogRecord) -> None:
        sys.stdout.write(record.getMessage() + "\n")
        sys.stdout.flush()  # a log read through a pipe must not wait for a buffer to fill


class AccessLog:
    """One JSON line per request (method, path, status, duration, request id; never the body)."""

    def __init__(self, app: ASGIApp) -> None:
        self.app = app

    async def __call__(self, scope: Scope, receive: Receive, send: Send) -> None:
        if scope["type"] != "http":
            await self.app(scope, receive, send)
            return
        incoming = dict(scope.get("headers", [])).get(b"x-request-id", b"").decode("latin-1")
        request_id = incoming if REQUEST_ID.match(incoming) else uuid.uuid4().hex
        start = time.perf_counter()
        status = 500

        async def stamped(message: Message) -> None:
            nonlocal status
            if message["type"] == "http.response.start":
                status = message["status"]
                message["headers"] = [*message.get("headers", []), (b"x-request-id", request_id.encode())]
            await send(message)

        try:
            await self.app(scope, receive, stamped)
        finally:
            if access_log.isEnabledFor(logging.INFO):  # the line is built only when someone will see it
                access_log.info(json.dumps(self._record(scope, request_id, status, start)))

    @staticmethod
    def _record(scope: Scope, request_id: str, status: int, start: float) -> dict[str, object]:
        """The fields of one access-log line."""
        return {
            "request_id": request_id,
            "method": scope.get("method"),
            "path": scope.get("path"),
            "status": status,
            "duration_ms": round((time.perf_counter() - start) * 1e3, 3),
            "client": (scope.get("client") or ("", 0))[0],
        }
