"""Requests for the stepped-transformer synthesis endpoints."""

from __future__ import annotations

from typing import Literal

from pydantic import Field, model_validator

from service.constants import DEFAULT_POINTS, EXACT, MAX_SECTIONS, SMALL_REFLECTION
from service.schemas.common import (
    Band,
    ImpedanceOhm,
    MaxReflection,
    Points,
    StrictModel,
    VelocityFactor,
)
from service.schemas.loads import Load
from service.schemas.media import MediumSpec

DEFAULT_SPEC_REFLECTION = 0.1  # 20 dB return loss, used when a request states no spec

TheoryName = Literal[SMALL_REFLECTION, EXACT]


class MatchRequest(StrictModel):
    """What every design request states: source, load, band, spec and the curve wanted.

    Without `max_reflection` the spec that `verified.meets_spec` is judged against is
    |reflection| <= 0.1 (20 dB return loss).
    """

    source_ohm: ImpedanceOhm
    load: Load
    band: Band
    max_reflection: MaxReflection | None = None
    points: Points = DEFAULT_POINTS
    velocity_factor: VelocityFactor = Field(
        1.0, description="Velocity factor of the ideal line, when no `medium` is given."
    )
    medium: MediumSpec | None = Field(
        None, description="The line the sections are built in; the ideal line of `velocity_factor` by default."
    )

    @model_validator(mode="after")
    def _one_velocity(self) -> MatchRequest:
        if self.medium is not None and "velocity_factor" in self.model_fields_set:
            raise ValueError("give velocity_factor at the top level or a medium, not both")
        return self

    @property
    def spec_reflection(self) -> float:
        """The reflection the design is judged against: the request's, or the default."""
        return DEFAULT_SPEC_REFLECTION if self.max_reflection is None else self.max_reflection


class TransformerRequest(MatchRequest):
    """Match `load` to a line of `source_ohm` over `band` with a multi-section transformer.

    Give `sections`, `max_reflection`, both or neither. Without `sections` the smallest section
    count that meets the spec over the band is used.
    """

    sections: int | None = Field(None, ge=1, le=MAX_SECTIONS, description="Number of quarter-wave sections.")
    theory: TheoryName = Field(
        SMALL_REFLECTION,
        description=(
            "small-reflection: the classic approximate synthesis; exact: synthesis from the "
            "insertion-loss function of the commensurate cascade, which holds for any ratio."
        ),
    )


class QuarterWaveRequest(MatchRequest):
    """A single quarter-wave section of impedance sqrt(Z0 RL)."""

    sections: Literal[1] | None = Field(
        None, description="A quarter-wave transformer has exactly one section; omit or give 1."
    )
