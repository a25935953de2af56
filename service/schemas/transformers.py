"""Requests for the stepped-transformer synthesis endpoints."""

from __future__ import annotations

from typing import Literal

from pydantic import Field, model_validator

from service.constants import DEFAULT_POINTS, EXACT, MAX_SECTIONS, SMALL_REFLECTION
from service.schemas.common import (
    Band,
    ImpedanceOhm,
    MaxReflection,
    MaxVswr,
    MinReturnLossDb,
    Points,
    StrictModel,
    VelocityFactor,
)
from service.schemas.loads import Load
from service.schemas.media import MediumSpec

DEFAULT_SPEC_REFLECTION = 0.1  # 20 dB return loss, used when a request states no spec

TheoryName = Literal[SMALL_REFLECTION, EXACT]
SPEC_FIELDS = ("max_reflection", "min_return_loss_db", "max_vswr")


class MatchRequest(StrictModel):
    """What every design request states: source, load, band, spec and the curve wanted.

    The spec is at most one of `max_reflection`, `min_return_loss_db` or `max_vswr` (the same
    requirement in three units); without any, designs are judged against |reflection| <= 0.1
    (20 dB return loss).
    """

    source_ohm: ImpedanceOhm
    load: Load
    band: Band
    max_reflection: MaxReflection | None = None
    min_return_loss_db: MinReturnLossDb | None = None
    max_vswr: MaxVswr | None = None
    points: Points = DEFAULT_POINTS
    velocity_factor: VelocityFactor = Field(
        1.0, description="Velocity factor of the ideal line, when no `medium` is given."
    )
    medium: MediumSpec | None = Field(
        None, description="The line the sections are built in; the ideal line of `velocity_factor` by default."
    )
    junction_effects: Literal["ignore", "include", "compensate"] = Field(
        "ignore",
        description="The step discontinuities at the junctions (feed line to section 1, and between sections), "
        "in microstrip, stripline or coax: `ignore` them (ideal steps), `include` them in the exact check, or "
        "`compensate` them (section lengths adjusted so that the design with its steps meets the spec).",
    )

    input_power_w: float | None = Field(
        None,
        gt=0.0,
        le=1e7,
        description="Incident RF power from a source matched to `source_ohm`, in watts: the response then gives "
        "each section's peak voltage and current over the band (and the coax field or the strip current density).",
    )
    dielectric_strength_v_per_m: float | None = Field(
        None,
        gt=0.0,
        le=1e10,
        description="Breakdown field of the coax dielectric, V/m; by default 3 MV/m for air and 60 MV/m for PTFE.",
    )

    @model_validator(mode="after")
    def _consistent(self) -> MatchRequest:
        if self.medium is not None and "velocity_factor" in self.model_fields_set:
            raise ValueError("give velocity_factor at the top level or a medium, not both")
        if self.junction_effects != "ignore" and getattr(self.medium, "kind", "ideal") == "ideal":
            raise ValueError(
                "junction_effects needs a microstrip, stripline or coax medium: the ideal line has no geometry, "
                "so no steps"
            )
        given = [name for name in SPEC_FIELDS if getattr(self, name) is not None]
        if len(given) > 1:
            raise ValueError(f"give the spec once, as one of {', '.join(SPEC_FIELDS)}; got {' and '.join(given)}")
        return self

    @property
    def spec_given(self) -> bool:
        """Whether the request states a spec (in any of its three forms)."""
        return any(getattr(self, name) is not None for name in SPEC_FIELDS)

    @property
    def spec_reflection(self) -> float:
        """The spec as |reflection|: from whichever form the request gives, or the default."""
        if self.min_return_loss_db is not None:
            return 10.0 ** (-self.min_return_loss_db / 20.0)
        if self.max_vswr is not None:
            return (self.max_vswr - 1.0) / (self.max_vswr + 1.0)
        return DEFAULT_SPEC_REFLECTION if self.max_reflection is None else self.max_reflection


class SynthesisRequest(MatchRequest):
    """A request the service designs sections for: the section impedances it may use.

    Without limits, sections stay within 10 to 200 ohm widened to take in the source and a
    resistive load (README, Impedance limits); limits given here are hard.
    """

    min_impedance_ohm: ImpedanceOhm | None = Field(
        None, description="Lowest section impedance allowed (default: see the README, Impedance limits)."
    )
    max_impedance_ohm: ImpedanceOhm | None = Field(
        None, description="Highest section impedance allowed (default: see the README, Impedance limits)."
    )
    outside_limits: Literal["refuse", "refine"] = Field(
        "refuse",
        description=(
            "What to do when the theory's design needs a section outside min_impedance_ohm .. "
            "max_impedance_ohm: refuse with a 422 naming the section, or refine the design within them."
        ),
    )

    @property
    def limits_given(self) -> bool:
        """Whether the request sets either impedance limit (only limits it sets are hard)."""
        return self.min_impedance_ohm is not None or self.max_impedance_ohm is not None

    @model_validator(mode="after")
    def _ordered_limits(self) -> SynthesisRequest:
        low, high = self.min_impedance_ohm, self.max_impedance_ohm
        if low is not None and high is not None and not low < high:
            raise ValueError("min_impedance_ohm must be below max_impedance_ohm")
        return self


class TransformerRequest(SynthesisRequest):
    """Match `load` to a line of `source_ohm` over `band` with a multi-section transformer.

    Give `sections`, a spec, both or neither. Without `sections` the smallest section
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


class QuarterWaveRequest(SynthesisRequest):
    """A single quarter-wave section of impedance sqrt(Z0 RL)."""

    sections: Literal[1] | None = Field(
        None, description="A quarter-wave transformer has exactly one section; omit or give 1."
    )
