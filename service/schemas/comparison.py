"""Request and response for designing every applicable method side by side."""

from __future__ import annotations

from pydantic import Field

from service.constants import DEFAULT_SEGMENTS, MAX_SECTIONS, MAX_SEGMENTS
from service.schemas.glossary import DescribedModel
from service.schemas.results import TransformerDesign, VerifiedFigures
from service.schemas.transformers import SynthesisRequest


class CompareRequest(SynthesisRequest):
    """One matching problem, designed by every method and theory that applies.

    `sections` fixes the stepped designs' section count (the quarter-wave joins only for 1);
    without it each stepped method takes its smallest count for the spec. Tapers are always
    spec-driven, cut into `taper_segments` steps.
    """

    sections: int | None = Field(None, ge=1, le=MAX_SECTIONS, description="Section count for stepped designs.")
    include_tapers: bool = Field(True, description="Whether to include the three taper profiles.")
    taper_segments: int = Field(DEFAULT_SEGMENTS, ge=2, le=MAX_SEGMENTS)


class Candidate(DescribedModel):
    """One design in the ranking."""

    rank: int = Field(description="1 is best: meets the spec with the shortest line.")
    method: str
    theory: str
    profile: str | None
    section_count: int
    total_length_m: float
    meets_spec: bool
    verified: VerifiedFigures
    design: TransformerDesign


class Excluded(DescribedModel):
    """A method that could not give a design for this request, and why."""

    method: str
    theory: str
    profile: str | None
    reason: str


class Comparison(DescribedModel):
    """All designs ranked: those meeting the spec first, then by total length, then by reflection."""

    spec_max_reflection: float
    candidates: list[Candidate]
    excluded: list[Excluded]
