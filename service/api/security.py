"""Security headers: for every response, and a strict content policy for the lab page."""

from __future__ import annotations

from starlette.types import ASGIApp, Message, Receive, Scope, Send

PAGE_PREFIXES = ("/static/",)


def page_policy(frame_ancestors: list[str]) -> str:
    """Only this origin's scripts, styles and connections; framing only by the allowed origins."""
    ancestors = " ".join(["'self'", *frame_ancestors])
    return (
        "default-src 'self'; script-src 'self'; style-src 'self'; img-src 'self' blob: data:; "
        f"connect-src 'self'; object-src 'none'; base-uri 'none'; frame-ancestors {ancestors}"
    )


class SecurityHeaders:
    """ASGI middleware adding the headers; the page's policy goes on the page and its static files."""

    def __init__(self, app: ASGIApp, frame_ancestors: list[str]) -> None:
        self.app = app
        self.policy = page_policy(frame_ancestors).encode()

    async def __call__(self, scope: Scope, receive: Receive, send: Send) -> None:
        if scope["type"] != "http":
            await self.app(scope, receive, send)
            return
        path = scope.get("path", "")
        is_page = path == "/" or path.startswith(PAGE_PREFIXES)

        async def with_headers(message: Message) -> None:
            if message["type"] == "http.response.start":
                headers = list(message.get("headers", []))
                headers += [(b"x-content-type-options", b"nosniff"), (b"referrer-policy", b"no-referrer")]
                if is_page:
                    headers.append((b"content-security-policy", self.policy))
                message["headers"] = headers
            await send(message)

        await self.app(scope, receive, with_headers)
