"""Request for the exact analysis of a user's own list of line sections."""

from __future__ import annotations

from typing import Annotated

from pydantic import Field, model_validator

from service.constants import MAX_SEGMENTS
from service.schemas.common import (
    FrequencyHz,
    ImpedanceOhm,
    StrictModel,
)
from service.schemas.transformers import MatchRequest

MAX_ANALYZED_SECTIONS = MAX_SEGMENTS + 1  # any design the service makes: the longest taper and a rotating section


class SectionSpec(StrictModel):
    """One section: its impedance or its dimension (a strip's width, a coax's inner diameter), and
    either its physical or its electrical length."""

    impedance_ohm: ImpedanceOhm | None = Field(None, description="Characteristic impedance at the band centre.")
    width_m: float | None = Field(
        None, gt=0.0, le=1.0, description="Strip width (microstrip, stripline), instead of the impedance."
    )
    inner_diameter_m: float | None = Field(
        None, gt=0.0, le=1.0, description="Inner conductor diameter (coax), instead of the impedance."
    )
    length_m: float | None = Field(None, gt=0.0, le=1e6, description="Physical length.")
    electrical_length_deg: float | None = Field(
        None, gt=0.0, le=36000.0, description="Electrical length at `reference_hz`."
    )
    reference_hz: FrequencyHz | None = Field(
        None, description="Frequency of `electrical_length_deg`; the band centre when omitted."
    )

    @model_validator(mode="after")
    def _one_length(self) -> SectionSpec:
        given = [n for n in ("impedance_ohm", "width_m", "inner_diameter_m") if getattr(self, n) is not None]
        if len(given) != 1:
            raise ValueError("give exactly one of impedance_ohm, width_m or inner_diameter_m")
        if (self.length_m is None) == (self.electrical_length_deg is None):
            raise ValueError("give exactly one of length_m and electrical_length_deg")
        if self.reference_hz is not None and self.electrical_length_deg is None:
            raise ValueError("reference_hz applies only with electrical_length_deg")
        return self


class AnalyzeRequest(MatchRequest):
    """Check a list of sections, source side first, between the source and the load."""

    sections: Annotated[list[SectionSpec], Field(min_length=1, max_length=MAX_ANALYZED_SECTIONS)]

    @model_validator(mode="after")
    def _checked_as_given(self) -> AnalyzeRequest:
        if self.junction_effects == "compensate":
            raise ValueError("an analysis checks the sections as given: junction_effects may be ignore or include")
        kind = getattr(self.medium, "kind", "ideal")
        for name, kinds in (("width_m", ("microstrip", "stripline")), ("inner_diameter_m", ("coax",))):
            if kind not in kinds and any(getattr(s, name) is not None for s in self.sections):
                raise ValueError(f"sections given by {name} need a {' or '.join(kinds)} medium; this one is {kind}")
        return self
