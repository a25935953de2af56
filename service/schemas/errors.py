"""The one error shape of the whole API."""

from __future__ import annotations

from pydantic import BaseModel, Field


class Problem(BaseModel):
    """One thing wrong with a request."""

    field: str = Field(description="Dotted path of the offending field, e.g. band.stop_hz.")
    message: str = Field(description="What is wrong, in plain words.")


class ErrorBody(BaseModel):
    """Every 4xx (and the 5xx that must never happen) carries this body."""

    status: int
    title: str
    problems: list[Problem]
