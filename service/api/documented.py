"""OpenAPI descriptions shared by the routers."""

from __future__ import annotations

from typing import Any

from service.schemas.errors import ErrorBody


def error_responses() -> dict[int | str, dict[str, Any]]:
    """The error statuses every design endpoint may answer, in the one error shape."""
    return {
        422: {
            "model": ErrorBody,
            "description": "Invalid or unmeetable request; each problem names its field.",
        },
    }
