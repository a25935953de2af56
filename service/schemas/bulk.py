"""Batches of design requests and parameter sweeps."""

from __future__ import annotations

from collections.abc import Mapping
from typing import Annotated, Any, Literal

from pydantic import Field, model_validator

from service.constants import DEFAULT_MAX_SWEEP_DESIGNS
from service.schemas.common import StrictModel
from service.schemas.errors import ErrorBody
from service.schemas.glossary import DescribedModel
from service.schemas.results import PredictedFigures, ResponseCurve, SectionResult, VerifiedFigures


class BatchRequest(StrictModel):
    """Design requests, each naming its `method`; each is checked on its own, so one bad item never sinks the rest."""

    requests: list[Any] = Field(description="Design requests with a `method` field, as for /v1/drawings.")
    include_curves: bool = Field(False, description="Add each design's response curve to its summary.")


class DesignSummary(DescribedModel):
    """The parts of a design a table needs; the curve only on request."""

    method: str
    theory: str
    profile: str | None
    medium: str
    center_hz: float
    total_length_m: float
    sections: list[SectionResult]
    predicted: PredictedFigures
    verified: VerifiedFigures
    unmatched_max_reflection: float
    warnings: list[str]
    response: ResponseCurve | None = None

    @classmethod
    def picked(cls, fields: Mapping[str, Any], include_curve: bool) -> DesignSummary:
        """The summary of a design given by its fields (a design's own, or those it is built from);
        a field the design does not have, such as a stepped design's profile, is None."""
        shown = {name: fields.get(name) for name in cls.model_fields}
        return cls(**shown | {"response": shown["response"] if include_curve else None})


class ItemResult(DescribedModel):
    """One item's outcome: a design summary (status 200) or an error in the API's error shape (4xx)."""

    index: int
    status: int
    design: DesignSummary | None = None
    error: ErrorBody | None = None
    parameters: dict[str, Any] | None = Field(None, description="For sweeps: the swept values of this design.")


class BatchResult(DescribedModel):
    """Every item's outcome, in the order of the request."""

    results: list[ItemResult]


class ValueRange(StrictModel):
    """`count` values from `start` to `stop`, both included, evenly spaced (or geometrically with `log`)."""

    start: float
    stop: float
    count: int = Field(ge=1, le=DEFAULT_MAX_SWEEP_DESIGNS)
    spacing: Literal["linear", "log"] = "linear"

    @model_validator(mode="after")
    def _positive_for_log(self) -> ValueRange:
        if self.spacing == "log" and (self.start <= 0 or self.stop <= 0):
            raise ValueError("a log range needs positive start and stop")
        return self


SweepValues = Annotated[list[Any] | ValueRange, Field(description="A list of values, or a range of numbers.")]


class SweepRequest(StrictModel):
    """A grid of designs: `base` is one design request (with `method`); `vary` maps dotted field paths
    (e.g. "load.resistance_ohm", "sections", "method", "theory", "band", "medium") to their values.
    The grid is every combination, expanded on the server, in the order the keys are given."""

    base: dict[str, Any]
    vary: dict[str, SweepValues] = Field(min_length=1)
    output: Literal["json", "csv", "ndjson"] = Field(
        "json", description="json: one document; csv: a table; ndjson: one line per design, streamed."
    )
    include_curves: bool = False
    offset: int = Field(
        0, ge=0, description="Index of the first grid point to design: slices share one sweep among servers."
    )
    limit: int | None = Field(None, ge=1, description="Most grid points to design from `offset`; the rest by default.")

    @model_validator(mode="after")
    def _non_empty_lists(self) -> SweepRequest:
        for key, values in self.vary.items():
            if isinstance(values, list) and not values:
                raise ValueError(f"vary.{key} has no values")
        return self


class SweepResult(DescribedModel):
    """The whole sweep as one JSON document."""

    total: int
    parameters: list[str]
    results: list[ItemResult]
