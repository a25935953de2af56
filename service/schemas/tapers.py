"""Request for a continuously tapered line, discretized into steps."""

from __future__ import annotations

from typing import Literal

from pydantic import Field

from service.constants import DEFAULT_SEGMENTS, MAX_SEGMENTS
from service.schemas.transformers import SynthesisRequest


class TaperRequest(SynthesisRequest):
    """A taper from the source line to the load, returned as `segments` equal steps.

    Give a spec (or none, for the default 0.1) and the length follows from the lower band edge (the shortest taper
    of this profile within the spec there and above); give `length_m` and the achieved
    reflection is reported. Klopfenstein's taper puts its passband edge on the lower band limit.
    """

    profile: Literal["exponential", "triangular", "klopfenstein"] = "klopfenstein"
    length_m: float | None = Field(None, gt=0.0, le=1e4, description="Physical length of the taper.")
    segments: int = Field(DEFAULT_SEGMENTS, ge=2, le=MAX_SEGMENTS, description="Equal steps the taper is cut into.")
