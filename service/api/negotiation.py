"""Content negotiation: every route answers in a format it offers, or 406 naming those it has.

Design and analysis routes offer JSON, Touchstone and CSV (chosen by ?format= or Accept);
drawings are SVG; a sweep's format is its body's `output` field; every other route is JSON.
"""

from __future__ import annotations

from urllib.parse import parse_qs

from starlette.types import ASGIApp, Receive, Scope, Send

from service.api.delivery import CSV_TYPE, NDJSON_TYPE, TOUCHSTONE_TYPE
from service.api.middleware import send_error

MEDIA_TYPES = {
    "json": "application/json",
    "touchstone": TOUCHSTONE_TYPE,
    "csv": CSV_TYPE,
    "svg": "image/svg+xml",
    "ndjson": NDJSON_TYPE,
}
EXPORTS = ("json", "touchstone", "csv")
OFFERED = {
    "/v1/transformers/quarter-wave": EXPORTS,
    "/v1/transformers/binomial": EXPORTS,
    "/v1/transformers/chebyshev": EXPORTS,
    "/v1/transformers/taper": EXPORTS,
    "/v1/networks/analyze": EXPORTS,
    "/v1/drawings": ("svg",),
    "/v1/sweeps": ("json", "csv", "ndjson"),
}
QUERY_FORMAT_ROUTES = {path for path, formats in OFFERED.items() if formats == EXPORTS}


def _accepts(accept: str, formats: tuple[str, ...]) -> bool:
    """Whether an Accept header admits any of the formats (wildcards included)."""
    wanted = [part.split(";")[0].strip().lower() for part in accept.split(",") if part.strip()]
    offered = [MEDIA_TYPES[name] for name in formats]
    for kind in wanted:
        if kind in ("*/*", "*") or kind in offered:
            return True
        if kind.endswith("/*") and any(media.startswith(kind[:-1]) for media in offered):
            return True
    return not wanted


class FormatNegotiation:
    """Refuse, with 406, a ?format= the route does not take or an Accept header it cannot meet."""

    def __init__(self, app: ASGIApp) -> None:
        self.app = app

    async def __call__(self, scope: Scope, receive: Receive, send: Send) -> None:
        path = scope.get("path", "")
        if scope["type"] != "http" or not path.startswith("/v1/"):
            await self.app(scope, receive, send)
            return
        formats = OFFERED.get(path, ("json",))
        named = ", ".join(formats)
        asked = parse_qs(scope.get("query_string", b"").decode("latin-1")).get("format")
        if asked and path not in QUERY_FORMAT_ROUTES and (path == "/v1/sweeps" or asked[-1] not in formats):
            where = "the body's `output` field" if path == "/v1/sweeps" else "this route's only format"
            message = f"?format= is not taken here; this route answers in {named} ({where})"
            await send_error(send, 406, "not acceptable", "format", message)
            return
        accept = dict(scope.get("headers", [])).get(b"accept", b"").decode("latin-1")
        if accept and not _accepts(accept, formats):
            media = ", ".join(MEDIA_TYPES[name] for name in formats)
            await send_error(send, 406, "not acceptable", "accept", f"this route answers in {named} ({media})")
            return
        await self.app(scope, receive, send)
