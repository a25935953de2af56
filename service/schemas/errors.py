"""The one error shape of the whole API."""

from __future__ import annotations

from pydantic import Field

from service.schemas.glossary import DescribedModel


class Problem(DescribedModel):
    """One thing wrong with a request."""

    field: str = Field(description="Dotted path of the offending field, e.g. band.stop_hz.")
    message: str = Field(description="What is wrong, in plain words.")


class ErrorBody(DescribedModel):
    """Every 4xx (and the 5xx that must never happen) carries this body."""

    status: int
    title: str
    problems: list[Problem]
