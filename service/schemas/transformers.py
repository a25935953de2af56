"""Requests for the stepped-transformer synthesis endpoints."""

from __future__ import annotations

from typing import Literal

from pydantic import Field

from service.design.small_reflection import MAX_SECTIONS
from service.schemas.common import (
    DEFAULT_POINTS,
    Band,
    ImpedanceOhm,
    Load,
    MaxReflection,
    Points,
    StrictModel,
    VelocityFactor,
)

DEFAULT_SPEC_REFLECTION = 0.1  # 20 dB return loss, used when a request states no spec


class TransformerRequest(StrictModel):
    """Match `load` to a line of `source_ohm` over `band` with a multi-section transformer.

    Give `sections`, `max_reflection`, both or neither. Without `max_reflection` the spec that
    `verified.meets_spec` is judged against is |reflection| <= 0.1 (20 dB return loss).
    Without `sections` the smallest section count that meets the spec over the band is used.
    """

    source_ohm: ImpedanceOhm
    load: Load
    band: Band
    sections: int | None = Field(None, ge=1, le=MAX_SECTIONS, description="Number of quarter-wave sections.")
    max_reflection: MaxReflection | None = None
    points: Points = DEFAULT_POINTS
    velocity_factor: VelocityFactor = 1.0

    @property
    def spec_reflection(self) -> float:
        """The reflection the design is judged against: the request's, or the default."""
        return DEFAULT_SPEC_REFLECTION if self.max_reflection is None else self.max_reflection


class QuarterWaveRequest(TransformerRequest):
    """A single quarter-wave section of impedance sqrt(Z0 RL)."""

    sections: Literal[1] | None = Field(
        None, description="A quarter-wave transformer has exactly one section; omit or give 1."
    )
