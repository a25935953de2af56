"""Every error type of the service, and the handlers that turn each into the one error shape.

Which error becomes which answer (all in the shape of schemas/errors.py):

    RequestValidationError (pydantic, at the schema)  -> 422 "invalid request", one problem per field
    UnmeetableRequestError (valid, but cannot be met)  -> 422 "request cannot be met"
      InvalidFieldError (a field unreadable past the schema, e.g. Touchstone text)
                                                       -> 422 "invalid request"
    ComputeTimeoutError (accepted work past the hard deadline, its worker stopped)
                                                       -> 503 "computation stopped"
    ClientGoneError (the client disconnected while its work ran; the work is stopped)
                                                       -> 499 in the access log; nobody reads it
    HTTPException 400 / 404 / 405 / 408 / 413 (starlette)
                                                       -> that status (408: body not sent in time;
                                                          413: body over the size limit)
    cancellation at the end of a graceful shutdown     -> 503 "shutting down" (api/middleware.py)
    401 (missing or wrong API key), 406 (a format the route lacks)
                                                       -> answered by api/middleware.py and
                                                          api/negotiation.py in the same shape
    any other Exception (a bug)                        -> 500 "internal error", logged; no input should reach it

Errors raised by the layers below (synthesis.InfeasibleDesignError, physics.media.RealizationError)
are turned into UnmeetableRequestError by the pipeline, which knows the field they concern.
"""

from __future__ import annotations

import logging
from collections.abc import Sequence
from typing import Any

from fastapi import FastAPI, Request
from fastapi.exceptions import RequestValidationError
from fastapi.responses import JSONResponse
from starlette.exceptions import HTTPException

from service.schemas.errors import ErrorBody, Problem

logger = logging.getLogger("stepline")
CLIENT_GONE_STATUS = 499  # the common log convention for a request its client closed; never on the wire
HTTP_TITLES = {
    400: "unreadable body",
    404: "not found",
    405: "method not allowed",
    408: "body too slow",
    413: "body too large",
}


class UnmeetableRequestError(Exception):
    """A request that is well formed but asks for something that cannot be given."""

    def __init__(self, field: str, message: str) -> None:
        super().__init__(f"{field}: {message}")
        self.field = field
        self.message = message

    title = "request cannot be met"

    def __reduce__(self) -> tuple:
        """Pickle by field and message: the error crosses from a worker process to the server."""
        return type(self), (self.field, self.message)


class ComputeTimeoutError(Exception):
    """Accepted work that ran past the hard deadline and was stopped: a 503."""

    def __init__(self, deadline_s: float) -> None:
        super().__init__(deadline_s)
        self.deadline_s = deadline_s


class ClientGoneError(Exception):
    """The client disconnected before its answer was ready; its work was stopped."""


class InvalidFieldError(UnmeetableRequestError):
    """A field the schema accepted whose content turns out unreadable (a Touchstone text, a sweep
    path that names no field): a 422 like any invalid input."""

    title = "invalid request"


UNION_TAGS = frozenset({"quarter-wave", "binomial", "chebyshev", "taper", "ideal", "microstrip", "stripline", "coax"})


def field_path(location: Sequence[Any]) -> str:
    """('body', 'sections', 2, 'impedance_ohm') -> 'sections[2].impedance_ohm'.

    The tags pydantic puts in the location of a discriminated union (a method or medium kind)
    are dropped, so the path names the field as the client wrote it.
    """
    parts = list(location)
    if parts and parts[0] == "body":
        parts = parts[1:]
    path = ""
    for part in (p for p in parts if p not in UNION_TAGS):
        if isinstance(part, int):
            path += f"[{part}]"
        else:
            path += f".{part}" if path else str(part)
    return path or "body"


def plain_message(error: dict[str, Any]) -> str:
    """Pydantic's message for one error, reworded where it is not plain enough."""
    kind = error.get("type", "")
    if kind == "json_invalid":
        reason = error.get("ctx", {}).get("error", "cannot be parsed")
        return f"the body is not valid JSON: {reason}"
    if kind == "missing" and list(error.get("loc", ())) == ["body"]:
        return "a JSON request body is required"
    message = str(error.get("msg", "is invalid"))
    return message.removeprefix("Value error, ")


def error_response(status: int, title: str, problems: list[Problem]) -> JSONResponse:
    """A JSONResponse in the API's error shape."""
    body = ErrorBody(status=status, title=title, problems=problems)
    return JSONResponse(status_code=status, content=body.model_dump())


def validation_problems(errors: Sequence[dict[str, Any]]) -> list[Problem]:
    """Pydantic/FastAPI validation errors as Problems, one per error."""
    return [
        Problem(
            field="body" if error.get("type") == "json_invalid" else field_path(error.get("loc", ())),
            message=plain_message(error),
        )
        for error in errors
    ]


def install_error_handlers(app: FastAPI) -> None:
    """Register the handlers that give every error the same shape."""

    @app.exception_handler(RequestValidationError)
    async def _invalid(request: Request, exc: RequestValidationError) -> JSONResponse:
        problems = validation_problems(exc.errors())
        content_type = request.headers.get("content-type", "")
        if "json" not in content_type and any(p.field == "body" for p in problems):
            sent = f"'{content_type}'" if content_type else "no content-type"
            problems = [
                Problem(
                    field="body", message=f"send the body as JSON with 'content-type: application/json' (got {sent})"
                )
            ]
        return error_response(422, "invalid request", problems)

    @app.exception_handler(UnmeetableRequestError)
    async def _unmeetable(_: Request, exc: UnmeetableRequestError) -> JSONResponse:
        problem = Problem(field=exc.field, message=exc.message)
        return error_response(422, exc.title, [problem])

    @app.exception_handler(ComputeTimeoutError)
    async def _timed_out(_: Request, exc: ComputeTimeoutError) -> JSONResponse:
        message = (
            f"the computation ran past this server's limit of {exc.deadline_s:g} s and was stopped; "
            "split the request or ask for less (fewer sections, points or trials)"
        )
        return error_response(503, "computation stopped", [Problem(field="request", message=message)])

    @app.exception_handler(ClientGoneError)
    async def _gone(_: Request, __: ClientGoneError) -> JSONResponse:
        problem = Problem(field="request", message="the client disconnected; the work was stopped")
        return error_response(CLIENT_GONE_STATUS, "client gone", [problem])

    @app.exception_handler(HTTPException)
    async def _http(_: Request, exc: HTTPException) -> JSONResponse:
        field = "body" if exc.status_code in (400, 408, 413) else "request"
        problem = Problem(field=field, message=str(exc.detail))
        return error_response(exc.status_code, HTTP_TITLES.get(exc.status_code, str(exc.detail).lower()), [problem])

    @app.exception_handler(Exception)
    async def _unexpected(_: Request, exc: Exception) -> JSONResponse:
        logger.exception("unexpected error", exc_info=exc)
        problem = Problem(field="request", message="an unexpected error occurred")
        return error_response(500, "internal error", [problem])
