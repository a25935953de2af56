"""OpenAPI descriptions shared by the routers."""

from __future__ import annotations

from typing import Any

from service.schemas.errors import ErrorBody


def error_responses() -> dict[int | str, dict[str, Any]]:
    """The error statuses every /v1 design route may answer, each in the one error shape."""
    described = {
        401: "A key is set on this server and the request lacks `Authorization: Bearer <key>`.",
        406: "The route cannot answer in the format asked for (?format= or Accept); the message names those it has.",
        408: "The body did not arrive whole within the server's read time (STEPLINE_BODY_TIMEOUT_S).",
        413: "The body is larger than the server accepts.",
        422: "Invalid or unmeetable request; each problem names its field.",
        500: "An unexpected error (never intended; reported in the same shape).",
        503: "Accepted work ran past the server's deadline (STEPLINE_DEADLINE_S) and was stopped, or the "
        "server is shutting down.",
    }
    return {status: {"model": ErrorBody, "description": text} for status, text in described.items()}


def add_key_scheme(schema: dict[str, Any]) -> dict[str, Any]:
    """Declare the bearer key in an OpenAPI document, as required by every /v1 route but health."""
    schema.setdefault("components", {}).setdefault("securitySchemes", {})["apiKey"] = {
        "type": "http",
        "scheme": "bearer",
        "description": "The key the operator set in STEPLINE_API_KEY.",
    }
    for path, operations in schema.get("paths", {}).items():
        if path.startswith("/v1/") and path != "/v1/health":
            for operation in operations.values():
                operation["security"] = [{"apiKey": []}]
    return schema
